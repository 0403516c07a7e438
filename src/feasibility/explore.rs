//! Design exploration: many annual runs of one scenario with some numbers changed — sizing
//! to a target, grid sweeps, one-at-a-time sensitivity and Monte Carlo (Latin hypercube)
//! uncertainty.
//!
//! A [`Study`] prepares the scenario's year (weather, sun, building load, heat demand) once;
//! designs that change only plant keys (`options.*`, `collectors.*`, `baseline.*`) reuse it, so
//! a design costs one hour loop per option. Designs are independent and run in parallel
//! (`rayon`).

use crate::error::{Error, Result};
use crate::feasibility::{Evaluation, Totals};
use crate::scenario::build::{self, Prepared};
use crate::scenario::edit::{Editable, is_plant_only};
use crate::scenario::schema::{Distribution, UncertainInput};
use rand::{Rng, SeedableRng};
use rayon::prelude::*;
use std::path::Path;
use std::sync::atomic::{AtomicBool, Ordering};

/// One change to the scenario: a dotted key path and its value.
pub type Edit = (String, f64);

/// A scenario ready for many designs.
pub struct Study {
    base: Editable,
    prepared: Prepared,
}

/// The names of the annual figures, as in the JSON summary.
pub fn figure_names() -> Vec<String> {
    match serde_json::to_value(Totals::default()) {
        Ok(serde_json::Value::Object(m)) => m
            .iter()
            .filter(|(_, v)| !v.is_object())
            .map(|(k, _)| k.clone())
            .collect(),
        _ => Vec::new(),
    }
}

/// An annual figure by name; `None` where it is undefined for this design (a ratio with a
/// zero denominator). An unknown name is an error listing the names.
pub fn figure(t: &Totals, name: &str) -> Result<Option<f64>> {
    let v = serde_json::to_value(t).map_err(|e| Error::Internal(format!("figures: {e}")))?;
    match v.get(name) {
        Some(serde_json::Value::Null) => Ok(None),
        Some(x) => Ok(x.as_f64()),
        None => {
            let names = figure_names();
            let hint = crate::scenario::parse::nearest(name, &names)
                .map_or(String::new(), |n| format!("did you mean `{n}`? "));
            Err(Error::input(
                "figure",
                name,
                format!("{hint}annual figures: {}", names.join(", ")),
            ))
        }
    }
}

/// Whether a larger value of a figure is better (fractions, COPs, yields, cooling) or worse
/// (energy used, backup, unmet, losses, cost).
pub fn higher_is_better(name: &str) -> bool {
    name.contains("fraction")
        || name.contains("cop_")
        || name.contains("yield")
        || name == "cooling_kwh"
        || name.contains("solar")
        || name.contains("savings")
        || name.contains("npv")
        || name == "irr"
}

impl Study {
    /// Read and prepare a scenario.
    pub fn new(path: &Path) -> Result<Study> {
        let base = Editable::read(path)?;
        let prepared = build::prepare(&base.loaded()?)?;
        Ok(Study { base, prepared })
    }

    /// The scenario's own value at `key` (for defaults of ranges and tornado centres).
    pub fn value(&self, key: &str) -> Option<f64> {
        self.base.get(key)
    }

    /// `x` as the key takes it: whole-number keys (module counts) are rounded, so a solve
    /// over them sees a step function and stops at a step.
    pub fn snap(&self, key: &str, x: f64) -> f64 {
        if self.base.is_integer(key) {
            x.round()
        } else {
            x
        }
    }

    /// Check that a key path exists in the scenario schema and accepts `value`.
    pub fn check_key(&self, key: &str, value: f64) -> Result<()> {
        let mut e = self.base.clone();
        e.set(key, value)?;
        e.loaded().map(|_| ())
    }

    /// Run one design. With `only`, just that option (and the reference) is simulated.
    pub fn evaluate(&self, edits: &[Edit], only: Option<&str>) -> Result<Evaluation> {
        let mut e = self.base.clone();
        for (k, v) in edits {
            e.set(k, *v)?;
        }
        let l = e.loaded()?;
        let fresh;
        let p = if edits.iter().all(|(k, _)| is_plant_only(k)) {
            &self.prepared
        } else {
            fresh = build::prepare(&l)?;
            &fresh
        };
        let mut built = build::build_options(&l, p)?;
        if let Some(name) = only {
            if !built.iter().any(|b| b.plant.name == name) {
                let names: Vec<String> = built.iter().map(|b| b.plant.name.clone()).collect();
                let hint = crate::scenario::parse::nearest(name, &names)
                    .map_or(String::new(), |n| format!("did you mean `{n}`? "));
                return Err(Error::input(
                    "--option",
                    name,
                    format!("{hint}options: {}", names.join(", ")),
                ));
            }
            // The reference runs too, so figures against it (savings, NPV) are defined.
            let reference = l.scenario.reference.clone();
            built.retain(|b| b.plant.name == name || b.plant.name == reference);
        }
        build::run(&l, p, &built)
    }

    /// One annual figure of one option for a design.
    pub fn figure_of(&self, edits: &[Edit], option: &str, name: &str) -> Result<Option<f64>> {
        let ev = self.evaluate(edits, Some(option))?;
        let o = ev
            .options
            .iter()
            .find(|o| o.option == option)
            .ok_or_else(|| Error::Internal(format!("option {option} not evaluated")))?;
        figure(&o.annual, name)
    }
}

/// A range `START:STOP:STEP` for a sweep (inclusive of STOP within half a step).
pub fn parse_range(key: &str, spec: &str) -> Result<Vec<f64>> {
    let parts: Vec<&str> = spec.split(':').collect();
    let bad = || {
        Error::input(
            key,
            spec,
            "give START:STOP:STEP with a positive STEP and STOP ≥ START",
        )
    };
    if parts.len() != 3 {
        return Err(bad());
    }
    let n: Vec<f64> = parts
        .iter()
        .map(|p| p.trim().parse::<f64>())
        .collect::<std::result::Result<_, _>>()
        .map_err(|_| bad())?;
    let (a, b, s) = (n[0], n[1], n[2]);
    if !(a.is_finite() && b.is_finite() && s.is_finite() && s > 0.0 && b >= a) {
        return Err(bad());
    }
    // Counted in floating point first: a tiny step would overflow an integer.
    let count_f = ((b - a) / s + 0.5).floor() + 1.0;
    if !(count_f.is_finite() && count_f <= 100_000.0) {
        return Err(Error::input(
            key,
            spec,
            "more than 100 000 values: use a larger step",
        ));
    }
    let count = count_f as usize;
    Ok((0..count).map(|i| a + s * i as f64).collect())
}

/// The full grid of several ranges: every combination, first key varying slowest.
pub fn grid(axes: &[(String, Vec<f64>)]) -> Vec<Vec<Edit>> {
    let mut designs: Vec<Vec<Edit>> = vec![Vec::new()];
    for (k, values) in axes {
        designs = designs
            .into_iter()
            .flat_map(|d| {
                values.iter().map(move |v| {
                    let mut d = d.clone();
                    d.push((k.clone(), *v));
                    d
                })
            })
            .collect();
    }
    designs
}

/// One finished design of a sweep.
pub struct SweepRow {
    pub design: usize,
    pub edits: Vec<Edit>,
    pub evaluation: Result<Evaluation>,
}

/// Run designs in parallel. `stop` is polled before each design (Ctrl-C sets it): designs not
/// started are skipped and the finished ones are returned. `done` is called after each design.
pub fn sweep(
    study: &Study,
    designs: Vec<Vec<Edit>>,
    only: Option<&str>,
    stop: &AtomicBool,
    done: &(dyn Fn() + Sync),
) -> Vec<SweepRow> {
    let mut rows: Vec<SweepRow> = designs
        .into_par_iter()
        .enumerate()
        .filter_map(|(design, edits)| {
            if stop.load(Ordering::Relaxed) {
                return None;
            }
            let evaluation = study.evaluate(&edits, only);
            done();
            Some(SweepRow {
                design,
                edits,
                evaluation,
            })
        })
        .collect();
    rows.sort_by_key(|r| r.design);
    rows
}

/// What `size` found.
#[derive(Debug, Clone)]
pub enum SizeResult {
    /// The value of the varied key that meets the target, and the figure there.
    Met {
        value: f64,
        figure: f64,
        evaluations: usize,
    },
    /// The target is outside what the range reaches: the best value and figure found.
    Unreachable {
        best_value: f64,
        best_figure: f64,
        lo: (f64, f64),
        hi: (f64, f64),
    },
}

/// Find the value of `key` in `[lo, hi]` at which `option`'s annual `figure` equals `target`
/// (Brent's method on `figure(x) − target`, to `tol` in x). Needs a sign change over the
/// range; otherwise reports the nearest end as the best reachable.
#[allow(clippy::too_many_arguments)]
pub fn size_to_target(
    study: &Study,
    option: &str,
    figure_name: &str,
    target: f64,
    key: &str,
    lo: f64,
    hi: f64,
    tol: f64,
) -> Result<SizeResult> {
    let count = std::sync::atomic::AtomicUsize::new(0);
    let eval = |x: f64| -> Result<f64> {
        count.fetch_add(1, Ordering::Relaxed);
        let edits = [(key.to_string(), study.snap(key, x))];
        study
            .figure_of(&edits, option, figure_name)?
            .ok_or_else(|| Error::input("figure", figure_name, format!("undefined at {key} = {x}")))
    };
    let (f_lo, f_hi) = rayon::join(|| eval(lo), || eval(hi));
    let (f_lo, f_hi) = (f_lo?, f_hi?);
    if (f_lo - target) * (f_hi - target) > 0.0 {
        let (best_value, best_figure) = if (f_lo - target).abs() <= (f_hi - target).abs() {
            (lo, f_lo)
        } else {
            (hi, f_hi)
        };
        return Ok(SizeResult::Unreachable {
            best_value,
            best_figure,
            lo: (lo, f_lo),
            hi: (hi, f_hi),
        });
    }
    let err = std::sync::Mutex::new(None);
    let x = crate::num::brent("size", lo, hi, tol, |x| match eval(x) {
        Ok(f) => f - target,
        Err(e) => {
            if let Ok(mut g) = err.lock() {
                g.get_or_insert(e);
            }
            f64::NAN
        }
    });
    if let Some(e) = err.into_inner().ok().flatten() {
        return Err(e);
    }
    let x = x?;
    let f = eval(x)?;
    Ok(SizeResult::Met {
        value: x,
        figure: f,
        evaluations: count.load(Ordering::Relaxed),
    })
}

/// Minimise (or maximise, for figures where higher is better) `figure` over `key` in
/// `[lo, hi]` by golden-section search to `tol` in x (the figure is assumed unimodal over the
/// range; the grid of `coarse` points first brackets the best). Returns (x, figure).
#[allow(clippy::too_many_arguments)]
pub fn optimise_1d(
    study: &Study,
    option: &str,
    figure_name: &str,
    key: &str,
    lo: f64,
    hi: f64,
    tol: f64,
    fixed: &[Edit],
) -> Result<(f64, f64)> {
    let sign = if higher_is_better(figure_name) {
        -1.0
    } else {
        1.0
    };
    let eval = |x: f64| -> Result<f64> {
        let mut edits = fixed.to_vec();
        edits.push((key.to_string(), study.snap(key, x)));
        study
            .figure_of(&edits, option, figure_name)?
            .map(|f| sign * f)
            .ok_or_else(|| Error::input("figure", figure_name, format!("undefined at {key} = {x}")))
    };
    const COARSE: usize = 9;
    let xs: Vec<f64> = (0..COARSE)
        .map(|i| lo + (hi - lo) * i as f64 / (COARSE - 1) as f64)
        .collect();
    let fs: Vec<f64> = xs.par_iter().map(|&x| eval(x)).collect::<Result<_>>()?;
    let (mut ib, _) =
        fs.iter().enumerate().fold(
            (0, f64::INFINITY),
            |(bi, bf), (i, &f)| if f < bf { (i, f) } else { (bi, bf) },
        );
    ib = ib.clamp(1, COARSE - 2);
    let (mut a, mut b) = (xs[ib - 1], xs[ib + 1]);
    let g = (5f64.sqrt() - 1.0) / 2.0;
    let (mut c, mut d) = (b - g * (b - a), a + g * (b - a));
    let (fc0, fd0) = rayon::join(|| eval(c), || eval(d));
    let (mut fc, mut fd) = (fc0?, fd0?);
    while (b - a).abs() > tol {
        if fc < fd {
            b = d;
            d = c;
            fd = fc;
            c = b - g * (b - a);
            fc = eval(c)?;
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + g * (b - a);
            fd = eval(d)?;
        }
    }
    let x = 0.5 * (a + b);
    Ok((x, sign * eval(x)?))
}

/// The swing of one input in a one-at-a-time sensitivity study.
#[derive(Debug, Clone)]
pub struct Swing {
    pub key: String,
    pub low: f64,
    pub high: f64,
    pub base_value: Option<f64>,
    pub figure_low: Option<f64>,
    pub figure_high: Option<f64>,
}

impl Swing {
    /// |figure(high) − figure(low)|, 0 where undefined.
    pub fn width(&self) -> f64 {
        match (self.figure_low, self.figure_high) {
            (Some(a), Some(b)) => (b - a).abs(),
            _ => 0.0,
        }
    }
}

/// One-at-a-time: each input at its low and at its high, the others at the scenario's values.
/// Sorted widest first (the tornado order). Returns (base figure, swings).
pub fn sensitivity(
    study: &Study,
    option: &str,
    figure_name: &str,
    inputs: &[UncertainInput],
) -> Result<(Option<f64>, Vec<Swing>)> {
    let base = study.figure_of(&[], option, figure_name)?;
    let mut swings: Vec<Swing> = inputs
        .par_iter()
        .map(|inp| {
            let lo = study.figure_of(&[(inp.key.clone(), inp.low)], option, figure_name)?;
            let hi = study.figure_of(&[(inp.key.clone(), inp.high)], option, figure_name)?;
            Ok(Swing {
                key: inp.key.clone(),
                low: inp.low,
                high: inp.high,
                base_value: study.value(&inp.key),
                figure_low: lo,
                figure_high: hi,
            })
        })
        .collect::<Result<_>>()?;
    swings.sort_by(|a, b| b.width().total_cmp(&a.width()));
    Ok((base, swings))
}

/// Latin hypercube samples of the inputs: `n` designs; each input's range cut in `n` equal
/// probability strata, one sample in each, strata shuffled independently per input
/// (McKay, Beckman & Conover, Technometrics 21 (1979) 239–245). Uniform, or triangular with
/// the mode at the scenario's value (inverse CDF). Reproducible for a given seed.
pub fn latin_hypercube(
    study: &Study,
    inputs: &[UncertainInput],
    n: usize,
    seed: u64,
) -> Vec<Vec<Edit>> {
    let mut rng = rand_pcg::Pcg64::seed_from_u64(seed);
    let mut columns: Vec<Vec<f64>> = Vec::with_capacity(inputs.len());
    for inp in inputs {
        let mut strata: Vec<usize> = (0..n).collect();
        for i in (1..n).rev() {
            let j = rng.random_range(0..=i);
            strata.swap(i, j);
        }
        let mode = study
            .value(&inp.key)
            .unwrap_or(0.5 * (inp.low + inp.high))
            .clamp(inp.low, inp.high);
        columns.push(
            strata
                .iter()
                .map(|&s| {
                    let u = (s as f64 + rng.random::<f64>()) / n as f64;
                    quantile(inp.distribution, inp.low, inp.high, mode, u)
                })
                .collect(),
        );
    }
    (0..n)
        .map(|i| {
            inputs
                .iter()
                .zip(&columns)
                .map(|(inp, c)| (inp.key.clone(), c[i]))
                .collect()
        })
        .collect()
}

/// Inverse CDF of the uniform and triangular distributions on [a, b] (mode m).
pub fn quantile(d: Distribution, a: f64, b: f64, m: f64, u: f64) -> f64 {
    match d {
        Distribution::Uniform => a + u * (b - a),
        Distribution::Triangular => {
            let fc = (m - a) / (b - a);
            if u < fc {
                a + (u * (b - a) * (m - a)).sqrt()
            } else {
                b - ((1.0 - u) * (b - a) * (b - m)).sqrt()
            }
        }
    }
}

/// The `p`-quantile (0..1) of `values` by linear interpolation between order statistics
/// (Hyndman & Fan 1996, definition 7, as spreadsheets compute percentiles).
pub fn percentile(values: &[f64], p: f64) -> Option<f64> {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    if v.is_empty() {
        return None;
    }
    v.sort_by(f64::total_cmp);
    let h = (v.len() - 1) as f64 * p.clamp(0.0, 1.0);
    let (i, f) = (h.floor() as usize, h.fract());
    Some(if i + 1 < v.len() {
        v[i] + f * (v[i + 1] - v[i])
    } else {
        v[i]
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ranges_and_grid() {
        assert_eq!(parse_range("k", "1:2:0.5").unwrap(), vec![1.0, 1.5, 2.0]);
        assert!(parse_range("k", "1:2:0").is_err());
        assert!(parse_range("k", "1:2:-1").is_err());
        assert!(parse_range("k", "2:1:1").is_err());
        assert!(parse_range("k", "1:2").is_err());
        let g = grid(&[
            ("a".into(), vec![1.0, 2.0]),
            ("b".into(), vec![3.0, 4.0, 5.0]),
        ]);
        assert_eq!(g.len(), 6);
        assert_eq!(g[0], vec![("a".to_string(), 1.0), ("b".to_string(), 3.0)]);
        assert_eq!(g[5], vec![("a".to_string(), 2.0), ("b".to_string(), 5.0)]);
    }

    /// Percentiles by Hyndman & Fan (1996) definition 7: for 1..=10, P10 = 1.9, P50 = 5.5,
    /// P90 = 9.1 (the values spreadsheet PERCENTILE gives).
    #[test]
    fn percentiles_definition_7() {
        let v: Vec<f64> = (1..=10).map(f64::from).collect();
        assert!((percentile(&v, 0.1).unwrap() - 1.9).abs() < 1e-12);
        assert!((percentile(&v, 0.5).unwrap() - 5.5).abs() < 1e-12);
        assert!((percentile(&v, 0.9).unwrap() - 9.1).abs() < 1e-12);
    }

    /// Triangular inverse CDF: median of Tri(0, 1, 0.5) is 0.5; F(m) = (m−a)/(b−a).
    #[test]
    fn triangular_quantile() {
        assert!((quantile(Distribution::Triangular, 0.0, 1.0, 0.5, 0.5) - 0.5).abs() < 1e-12);
        assert!((quantile(Distribution::Triangular, 0.0, 4.0, 1.0, 0.25) - 1.0).abs() < 1e-12);
        assert_eq!(quantile(Distribution::Uniform, 2.0, 4.0, 3.0, 0.25), 2.5);
    }
}
