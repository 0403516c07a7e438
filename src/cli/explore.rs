//! The exploration verbs: `size`, `sweep`, `sensitivity`, `uncertainty`. Parsing and printing
//! only; the work is in `parhelion::feasibility::explore`.

use comfy_table::{Cell, CellAlignment, ContentArrangement, Table, presets::UTF8_FULL_CONDENSED};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use parhelion::Error;
use parhelion::feasibility::explore::{self, Edit, SizeResult, Study};
use std::io::IsTerminal;
use std::path::Path;
use std::sync::atomic::{AtomicBool, Ordering};

/// Set by Ctrl-C: running sweeps finish the designs under way and stop.
pub static STOP: AtomicBool = AtomicBool::new(false);

/// Install the Ctrl-C handler (first thing in `sweep` and `uncertainty`, so an early Ctrl-C is
/// caught too).
pub fn catch_interrupt() {
    let _ = ctrlc::set_handler(|| STOP.store(true, Ordering::SeqCst));
}

/// Whether Ctrl-C stopped the run (the verb then exits 130 after writing what it has).
pub fn interrupted() -> bool {
    STOP.load(Ordering::SeqCst)
}

/// Most designs a sweep, and samples an uncertainty run, may ask for (bounded work: about a
/// day of evaluations on two cores at the clinic demo's speed).
const MAX_DESIGNS: usize = 100_000;

fn progress(n: usize, quiet: bool) -> ProgressBar {
    let pb = ProgressBar::new(n as u64);
    if quiet || !std::io::stderr().is_terminal() {
        pb.set_draw_target(ProgressDrawTarget::hidden());
    } else {
        pb.set_draw_target(ProgressDrawTarget::stderr());
        if let Ok(style) = ProgressStyle::with_template(
            "{bar:40} {pos}/{len} designs, {elapsed} elapsed, {eta} left",
        ) {
            pb.set_style(style);
        }
    }
    pb
}

fn table(header: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_preset(UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Dynamic)
        .set_header(header.iter().map(Cell::new));
    t
}

fn right(t: &mut Table, from: usize) {
    for i in from..t.column_count() {
        if let Some(c) = t.column_mut(i) {
            c.set_cell_alignment(CellAlignment::Right);
        }
    }
}

fn g(x: Option<f64>) -> String {
    x.map_or("–".into(), |v| {
        if v != 0.0 && (v.abs() >= 1e5 || v.abs() < 1e-2) {
            format!("{v:.4e}")
        } else {
            format!("{v:.4}")
        }
    })
}

/// `NAME=VALUE` → (NAME, VALUE).
pub fn parse_target(s: &str) -> Result<(String, f64), Error> {
    let (k, v) = s.split_once('=').ok_or_else(|| {
        Error::input(
            "--target",
            s,
            "give FIGURE=VALUE, e.g. solar_share_of_cooling=0.3",
        )
    })?;
    let v: f64 = v
        .trim()
        .parse()
        .map_err(|_| Error::input("--target", s, "the value after = must be a number"))?;
    Ok((k.trim().to_string(), v))
}

fn check_figure(name: &str, value: Option<f64>) -> Result<(), Error> {
    explore::figure(&Default::default(), name)?;
    if let Some(v) = value
        && name.contains("fraction")
        && !(0.0..=1.0).contains(&v)
    {
        return Err(Error::input(
            "--target",
            format!("{name}={v}"),
            "a fraction's target must be within [0, 1]",
        ));
    }
    Ok(())
}

/// `KEY[=LO:HI]` → key and range (default: 0.2 to 5 times the scenario's value).
fn parse_vary(study: &Study, s: &str) -> Result<(String, f64, f64), Error> {
    let (key, range) = match s.split_once('=') {
        Some((k, r)) => (k.trim().to_string(), Some(r)),
        None => (s.trim().to_string(), None),
    };
    let base = study.value(&key);
    let (lo, hi) = match range {
        Some(r) => {
            let (a, b) = r
                .split_once(':')
                .ok_or_else(|| Error::input("--vary", s, "give KEY=LO:HI"))?;
            let a: f64 = a
                .trim()
                .parse()
                .map_err(|_| Error::input("--vary", s, "LO must be a number"))?;
            let b: f64 = b
                .trim()
                .parse()
                .map_err(|_| Error::input("--vary", s, "HI must be a number"))?;
            if !(a.is_finite() && b.is_finite() && a < b) {
                return Err(Error::input("--vary", s, "needs LO < HI"));
            }
            (a, b)
        }
        None => match base {
            Some(v) if v > 0.0 => (0.2 * v, 5.0 * v),
            _ => {
                return Err(Error::input(
                    "--vary",
                    s,
                    "the scenario gives no positive value for this key: give a range KEY=LO:HI",
                ));
            }
        },
    };
    study.check_key(&key, lo)?;
    Ok((key, lo, hi))
}

/// The key `size` varies when none is given: the option's gross collector area.
fn default_vary(option: &str) -> String {
    format!("options.{option}.field.gross_area_m2")
}

pub struct SizeArgs<'a> {
    pub scenario: &'a Path,
    pub option: &'a str,
    pub target: Option<&'a str>,
    pub minimize: Option<&'a str>,
    pub vary: &'a [String],
    pub tol: Option<f64>,
}

/// `parhelion size`: the text, and whether the target was met (always for `--minimize`).
pub fn size(a: SizeArgs) -> Result<(String, bool), Error> {
    let study = Study::new(a.scenario)?;
    let vary: Vec<String> = if a.vary.is_empty() {
        vec![default_vary(a.option)]
    } else {
        a.vary.to_vec()
    };
    if vary.len() > 2 {
        return Err(Error::input("--vary", vary.len(), "at most two quantities"));
    }
    let axes: Vec<(String, f64, f64)> = vary
        .iter()
        .map(|v| parse_vary(&study, v))
        .collect::<Result<_, _>>()?;
    let mut out = format!(
        "parhelion {} · size · option `{}`\n",
        env!("CARGO_PKG_VERSION"),
        a.option
    );
    let mut met = true;
    match (a.target, a.minimize) {
        (Some(t), None) => {
            let (fig, target) = parse_target(t)?;
            check_figure(&fig, Some(target))?;
            if axes.len() != 1 {
                return Err(Error::input(
                    "--vary",
                    axes.len(),
                    "a target is met by varying exactly one quantity",
                ));
            }
            let (key, lo, hi) = &axes[0];
            let tol = a.tol.unwrap_or(1e-3 * (hi - lo));
            match explore::size_to_target(&study, a.option, &fig, target, key, *lo, *hi, tol)? {
                SizeResult::Met {
                    value,
                    figure,
                    evaluations,
                } => {
                    out.push_str(&format!(
                        "{fig} = {target} is met at {key} = {value:.4} ({fig} there: {figure:.4}; ±{tol:.3e} in {key}; {evaluations} annual runs)\n"
                    ));
                    if (figure - target).abs() > 0.01 * target.abs().max(1e-9) {
                        let above = study.figure_of(
                            &[(key.clone(), study.snap(key, value + tol))],
                            a.option,
                            &fig,
                        )?;
                        out.push_str(&format!(
                            "note: {fig} moves in a step here (a field is built of whole rows of modules): just above, at {key} = {:.4}, it is {}\n",
                            value + tol,
                            g(above)
                        ));
                    }
                }
                SizeResult::Unreachable {
                    best_value,
                    best_figure,
                    lo,
                    hi,
                } => {
                    met = false;
                    out.push_str(&format!(
                        "{fig} = {target} is NOT reachable for {key} in [{:.4}, {:.4}]: {fig} runs from {:.4} to {:.4}. Best reachable: {best_figure:.4} at {key} = {best_value:.4}.\n",
                        lo.0, hi.0, lo.1, hi.1
                    ));
                }
            }
        }
        (None, Some(fig)) => {
            check_figure(fig, None)?;
            let dir = if explore::higher_is_better(fig) {
                "maximised"
            } else {
                "minimised"
            };
            let (k1, lo1, hi1) = &axes[0];
            let tol1 = a.tol.unwrap_or(1e-3 * (hi1 - lo1));
            if axes.len() == 1 {
                let (x, f) =
                    explore::optimise_1d(&study, a.option, fig, k1, *lo1, *hi1, tol1, &[])?;
                out.push_str(&format!("{fig} is {dir} at {k1} = {x:.4}: {f:.4}\n"));
            } else {
                // Two quantities: alternate one-dimensional searches (coordinate descent) until
                // both move less than their tolerances.
                let (k2, lo2, hi2) = &axes[1];
                let tol2 = 1e-3 * (hi2 - lo2);
                let mut x2 = study
                    .value(k2)
                    .unwrap_or(0.5 * (lo2 + hi2))
                    .clamp(*lo2, *hi2);
                let mut x1 = study
                    .value(k1)
                    .unwrap_or(0.5 * (lo1 + hi1))
                    .clamp(*lo1, *hi1);
                let mut f = f64::NAN;
                for _ in 0..8 {
                    let (n1, _) = explore::optimise_1d(
                        &study,
                        a.option,
                        fig,
                        k1,
                        *lo1,
                        *hi1,
                        tol1,
                        &[(k2.clone(), x2)],
                    )?;
                    let (n2, nf) = explore::optimise_1d(
                        &study,
                        a.option,
                        fig,
                        k2,
                        *lo2,
                        *hi2,
                        tol2,
                        &[(k1.clone(), n1)],
                    )?;
                    let moved = (n1 - x1).abs() > tol1 || (n2 - x2).abs() > tol2;
                    (x1, x2, f) = (n1, n2, nf);
                    if !moved {
                        break;
                    }
                }
                out.push_str(&format!(
                    "{fig} is {dir} at {k1} = {x1:.4}, {k2} = {x2:.4}: {f:.4}\n"
                ));
            }
        }
        _ => {
            return Err(Error::input(
                "--target / --minimize",
                "(both or neither)",
                "give exactly one of --target FIGURE=VALUE or --minimize FIGURE",
            ));
        }
    }
    Ok((out, met))
}

pub struct SweepArgs<'a> {
    pub scenario: &'a Path,
    pub set: &'a [String],
    pub option: Option<&'a str>,
    pub quiet: bool,
}

/// `parhelion sweep`: returns the CSV text.
pub fn sweep(a: SweepArgs) -> Result<(Vec<u8>, String), Error> {
    if a.set.is_empty() {
        return Err(Error::input(
            "--set",
            "(none)",
            "give at least one --set KEY=START:STOP:STEP",
        ));
    }
    let study = Study::new(a.scenario)?;
    let mut axes: Vec<(String, Vec<f64>)> = Vec::new();
    for s in a.set {
        let (k, r) = s
            .split_once('=')
            .ok_or_else(|| Error::input("--set", s, "give KEY=START:STOP:STEP"))?;
        let values = explore::parse_range(k, r)?;
        study.check_key(k, values[0])?;
        axes.push((k.to_string(), values));
    }
    // Bounded work: the grid is the product of the axes.
    let n_designs = axes.iter().fold(1.0f64, |n, (_, v)| n * v.len() as f64);
    if n_designs > MAX_DESIGNS as f64 {
        return Err(Error::input(
            "--set",
            format!("{n_designs:.0} designs"),
            format!(
                "at most {MAX_DESIGNS} designs (the product of the axes' values): use larger steps or fewer axes"
            ),
        ));
    }
    let designs = explore::grid(&axes);
    let n = designs.len();
    let pb = progress(n, a.quiet);
    let rows = explore::sweep(&study, designs, a.option, &STOP, &|| pb.inc(1));
    pb.finish_and_clear();
    let figures = explore::figure_names();
    let mut w = csv::Writer::from_writer(Vec::new());
    let err = |e: csv::Error| Error::Internal(format!("sweep CSV: {e}"));
    let mut head: Vec<String> = vec!["design".into()];
    head.extend(axes.iter().map(|(k, _)| k.clone()));
    head.extend(["option".into(), "route".into(), "error".into()]);
    head.extend(figures.iter().cloned());
    w.write_record(&head).map_err(err)?;
    let mut failed = 0;
    for r in &rows {
        let mut base: Vec<String> = vec![r.design.to_string()];
        base.extend(r.edits.iter().map(|(_, v)| format!("{v}")));
        match &r.evaluation {
            Ok(ev) => {
                for o in &ev.options {
                    let mut rec = base.clone();
                    rec.extend([o.option.clone(), o.route.to_string(), String::new()]);
                    for f in &figures {
                        rec.push(
                            explore::figure(&o.annual, f)?
                                .map_or(String::new(), |v| format!("{v}")),
                        );
                    }
                    w.write_record(&rec).map_err(err)?;
                }
            }
            Err(e) => {
                failed += 1;
                let mut rec = base.clone();
                rec.extend([String::new(), String::new(), e.to_string()]);
                rec.extend(figures.iter().map(|_| String::new()));
                w.write_record(&rec).map_err(err)?;
            }
        }
    }
    let bytes = w
        .into_inner()
        .map_err(|e| Error::Internal(format!("sweep CSV: {e}")))?;
    let stopped = if STOP.load(Ordering::SeqCst) {
        " (stopped by Ctrl-C: the rest were not run)"
    } else {
        ""
    };
    let note = format!(
        "{} of {n} designs run{stopped}; {failed} refused by the scenario checks (their error is in the `error` column)\n",
        rows.len()
    );
    Ok((bytes, note))
}

/// `parhelion sensitivity`.
pub fn sensitivity(scenario: &Path, option: &str, figure: &str) -> Result<String, Error> {
    check_figure(figure, None)?;
    let study = Study::new(scenario)?;
    let l = parhelion::scenario::load(scenario)?;
    let inputs = l.scenario.uncertainty.map(|u| u.inputs).unwrap_or_default();
    if inputs.is_empty() {
        return Err(Error::input(
            "uncertainty.inputs",
            "(none)",
            "declare [[uncertainty.inputs]] (key, low, high) in the scenario",
        ));
    }
    let (base, swings) = explore::sensitivity(&study, option, figure, &inputs)?;
    let mut t = table(&[
        "input",
        "scenario value",
        "low",
        "high",
        &format!("{figure} at low"),
        &format!("{figure} at high"),
        "swing",
        "tornado",
    ]);
    let widest = swings.first().map_or(0.0, |s| s.width());
    for s in &swings {
        let bar_len = if widest > 0.0 {
            (20.0 * s.width() / widest).round() as usize
        } else {
            0
        };
        t.add_row(vec![
            s.key.clone(),
            g(s.base_value),
            g(Some(s.low)),
            g(Some(s.high)),
            g(s.figure_low),
            g(s.figure_high),
            g(Some(s.width())),
            "█".repeat(bar_len),
        ]);
    }
    right(&mut t, 1);
    Ok(format!(
        "parhelion {} · sensitivity of `{figure}` of option `{option}` (one input at a time)\nat the scenario's own values: {}\n{t}\n",
        env!("CARGO_PKG_VERSION"),
        g(base)
    ))
}

pub struct UncertaintyArgs<'a> {
    pub scenario: &'a Path,
    pub samples: usize,
    pub seed: u64,
    pub figure: &'a str,
    pub quiet: bool,
}

/// `parhelion uncertainty`: the summary text and the per-sample CSV.
pub fn uncertainty(a: UncertaintyArgs) -> Result<(String, Vec<u8>), Error> {
    if a.samples == 0 || a.samples > MAX_DESIGNS {
        return Err(Error::input(
            "--samples",
            a.samples,
            format!("at least 1 sample and at most {MAX_DESIGNS}"),
        ));
    }
    check_figure(a.figure, None)?;
    let study = Study::new(a.scenario)?;
    let l = parhelion::scenario::load(a.scenario)?;
    let reference = l.scenario.reference.clone();
    let inputs = l.scenario.uncertainty.map(|u| u.inputs).unwrap_or_default();
    if inputs.is_empty() {
        return Err(Error::input(
            "uncertainty.inputs",
            "(none)",
            "declare [[uncertainty.inputs]] (key, low, high) in the scenario",
        ));
    }
    let designs: Vec<Vec<Edit>> = explore::latin_hypercube(&study, &inputs, a.samples, a.seed);
    let pb = progress(designs.len(), a.quiet);
    let rows = explore::sweep(&study, designs, None, &STOP, &|| pb.inc(1));
    pb.finish_and_clear();
    let shown = [
        "cooling_kwh",
        "electricity_kwh",
        "grid_kwh",
        "solar_share_of_cooling",
    ];
    let mut figs: Vec<&str> = shown.to_vec();
    if !figs.contains(&a.figure) {
        figs.push(a.figure);
    }
    let options: Vec<String> = l.scenario.options.keys().cloned().collect();
    // values[option][figure] over the samples that ran.
    let mut values = vec![vec![Vec::new(); figs.len()]; options.len()];
    let mut beats = vec![0usize; options.len()];
    let mut ok = 0usize;
    let mut w = csv::Writer::from_writer(Vec::new());
    let err = |e: csv::Error| Error::Internal(format!("uncertainty CSV: {e}"));
    let mut head = vec!["sample".to_string()];
    head.extend(inputs.iter().map(|i| i.key.clone()));
    head.push("option".into());
    head.extend(figs.iter().map(|f| f.to_string()));
    w.write_record(&head).map_err(err)?;
    for r in &rows {
        let Ok(ev) = &r.evaluation else { continue };
        ok += 1;
        let rf = ev
            .options
            .iter()
            .find(|o| o.option == reference)
            .and_then(|o| explore::figure(&o.annual, a.figure).ok().flatten());
        for (oi, o) in ev.options.iter().enumerate() {
            let mut rec = vec![r.design.to_string()];
            rec.extend(r.edits.iter().map(|(_, v)| format!("{v}")));
            rec.push(o.option.clone());
            for (fi, f) in figs.iter().enumerate() {
                let v = explore::figure(&o.annual, f)?;
                if let Some(v) = v {
                    values[oi][fi].push(v);
                }
                rec.push(v.map_or(String::new(), |v| format!("{v}")));
            }
            w.write_record(&rec).map_err(err)?;
            if let (Some(x), Some(rv)) = (explore::figure(&o.annual, a.figure)?, rf) {
                let better = if explore::higher_is_better(a.figure) {
                    x > rv
                } else {
                    x < rv
                };
                beats[oi] += usize::from(better && o.option != reference);
            }
        }
    }
    let csv_bytes = w
        .into_inner()
        .map_err(|e| Error::Internal(format!("uncertainty CSV: {e}")))?;
    let mut header: Vec<String> = vec!["option".into()];
    for f in &figs {
        header.push(format!("{f} P10 / P50 / P90"));
    }
    header.push(format!("P(beats `{reference}` on {})", a.figure));
    let hrefs: Vec<&str> = header.iter().map(String::as_str).collect();
    let mut t = table(&hrefs);
    for (oi, name) in options.iter().enumerate() {
        let mut row = vec![name.clone()];
        for v in &values[oi] {
            row.push(format!(
                "{} / {} / {}",
                g(explore::percentile(v, 0.1)),
                g(explore::percentile(v, 0.5)),
                g(explore::percentile(v, 0.9))
            ));
        }
        row.push(if *name == reference {
            "–".into()
        } else {
            format!("{:.0} %", 100.0 * beats[oi] as f64 / ok.max(1) as f64)
        });
        t.add_row(row);
    }
    right(&mut t, 1);
    let stopped = if STOP.load(Ordering::SeqCst) {
        " (stopped by Ctrl-C)"
    } else {
        ""
    };
    Ok((
        format!(
            "parhelion {} · uncertainty: {ok} of {} Latin-hypercube samples (seed {}){stopped} over {} inputs\n{t}\n",
            env!("CARGO_PKG_VERSION"),
            a.samples,
            a.seed,
            inputs.len()
        ),
        csv_bytes,
    ))
}
