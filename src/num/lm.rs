//! Nonlinear least squares by Levenberg–Marquardt with a forward-difference Jacobian.
//!
//! Minimises `S(p) = Σ rᵢ(p)²` over unbounded parameters `p` (a caller with bounds maps them
//! first, e.g. through logarithms). Each iteration solves the damped normal equations
//! `(JᵀJ + λ·diag(JᵀJ)) δ = −Jᵀr` (Marquardt's scaling, D.W. Marquardt, "An algorithm for
//! least-squares estimation of nonlinear parameters", J. SIAM 11(2), 1963, 431–441), accepts
//! the step when `S` falls (λ ÷ 3) and otherwise raises λ (× 4) and tries again. A residual
//! function that fails at a trial point counts as a rise. Written here, small and dense: the
//! fits in this project have at most a handful of parameters.
//!
//! Checked against the NIST Statistical Reference Datasets for nonlinear regression
//! (`reference/num_nist_strd.csv`, evaluated in `checks::num`).

use crate::error::{Error, Result};

/// What a fit ended with.
#[derive(Debug, Clone)]
pub struct Fit {
    /// Parameters at the minimum.
    pub p: Vec<f64>,
    /// Residuals there.
    pub residuals: Vec<f64>,
    /// Sum of squared residuals there.
    pub sum_sq: f64,
    /// Accepted steps taken.
    pub iterations: u32,
}

fn sum_sq(r: &[f64]) -> f64 {
    r.iter().map(|v| v * v).sum()
}

/// Levenberg–Marquardt from `p0`.
///
/// * `residuals(p)` – the residual vector (same length at every `p`); an `Err` at a trial
///   point rejects that step, an `Err` at `p0` is returned.
/// * `max_iter` – accepted steps allowed.
///
/// Stops when a step changes no parameter by more than `1e-10·(|p|+1e-10)`, or `S` falls by
/// less than `1e-14·S` in an accepted step, or λ exceeds 1e16 (no downhill step left).
/// Jacobian columns by forward differences with step `1e-7·|pⱼ|` (1e-7 when `pⱼ = 0`), or
/// backward where the residuals fail at the forward point; an error at both is returned.
/// Errors: `Internal` naming `what` when the residuals are non-finite at `p0`, or fewer
/// residuals than parameters, or no convergence within `max_iter`.
pub fn levenberg_marquardt(
    what: &str,
    p0: &[f64],
    max_iter: u32,
    residuals: impl FnMut(&[f64]) -> Result<Vec<f64>>,
) -> Result<Fit> {
    run(what, p0, max_iter, Step::Relative(1e-7), residuals)
}

/// [`levenberg_marquardt`] for parameters of order one (logarithms, mapped bounds), with the
/// forward-difference step `h·max(|pⱼ|, 1)`. A residual that comes from an inner iterative
/// solve carries that solve's convergence noise ε; a step h gives Jacobian errors of about
/// ε/h, so such callers take a larger step than the default (the absorption datasheet fit,
/// whose cycle solve converges to 1e-9, takes 1e-5).
pub fn levenberg_marquardt_scaled(
    what: &str,
    p0: &[f64],
    max_iter: u32,
    h: f64,
    residuals: impl FnMut(&[f64]) -> Result<Vec<f64>>,
) -> Result<Fit> {
    run(what, p0, max_iter, Step::OrderOne(h), residuals)
}

#[derive(Clone, Copy)]
enum Step {
    /// `h·|pⱼ|`, `h` when `pⱼ = 0`.
    Relative(f64),
    /// `h·max(|pⱼ|, 1)`.
    OrderOne(f64),
}

fn run(
    what: &str,
    p0: &[f64],
    max_iter: u32,
    step: Step,
    mut residuals: impl FnMut(&[f64]) -> Result<Vec<f64>>,
) -> Result<Fit> {
    let n = p0.len();
    let mut p = p0.to_vec();
    let mut r = residuals(&p)?;
    let m = r.len();
    if m < n {
        return Err(Error::Internal(format!(
            "{what}: {m} residuals for {n} parameters"
        )));
    }
    let mut s = sum_sq(&r);
    if !s.is_finite() {
        return Err(Error::Internal(format!(
            "{what}: non-finite residual at the start"
        )));
    }
    let mut lambda = 1e-3;
    for it in 0..max_iter {
        // Jacobian, m × n, row-major.
        let mut jac = vec![0.0; m * n];
        for j in 0..n {
            let h = match step {
                Step::Relative(h) if p[j] == 0.0 => h,
                Step::Relative(h) => h * p[j].abs(),
                Step::OrderOne(h) => h * p[j].abs().max(1.0),
            };
            // Forward difference; where the residuals fail just beyond `p` (the edge of
            // a region where an inner model solves), the backward difference.
            let mut q = p.clone();
            q[j] += h;
            let (h, rq) = match residuals(&q) {
                Ok(rq) => (q[j] - p[j], rq),
                Err(forward) => {
                    q[j] = p[j] - h;
                    match residuals(&q) {
                        Ok(rq) => (q[j] - p[j], rq),
                        Err(_) => return Err(forward),
                    }
                }
            };
            if rq.len() != m {
                return Err(Error::Internal(format!("{what}: residual count changed")));
            }
            for i in 0..m {
                jac[i * n + j] = (rq[i] - r[i]) / h;
            }
        }
        let mut jtj = vec![0.0; n * n];
        let mut jtr = vec![0.0; n];
        for i in 0..m {
            for a in 0..n {
                jtr[a] += jac[i * n + a] * r[i];
                for b in 0..n {
                    jtj[a * n + b] += jac[i * n + a] * jac[i * n + b];
                }
            }
        }
        loop {
            if lambda > 1e16 {
                return Ok(Fit {
                    p,
                    residuals: r,
                    sum_sq: s,
                    iterations: it,
                });
            }
            let mut a = jtj.clone();
            for k in 0..n {
                let d = jtj[k * n + k].max(1e-300);
                a[k * n + k] += lambda * d;
            }
            let mut delta: Vec<f64> = jtr.iter().map(|v| -v).collect();
            if !super::solve_linear(&mut a, &mut delta) {
                lambda *= 4.0;
                continue;
            }
            let q: Vec<f64> = p.iter().zip(&delta).map(|(a, d)| a + d).collect();
            let trial = residuals(&q).ok().filter(|rq| rq.len() == m);
            let sq = trial.as_deref().map(sum_sq).unwrap_or(f64::INFINITY);
            if sq.is_finite() && sq < s {
                let small_step = delta
                    .iter()
                    .zip(&p)
                    .all(|(d, a)| d.abs() <= 1e-10 * (a.abs() + 1e-10));
                let small_fall = s - sq <= 1e-14 * s;
                p = q;
                r = trial.unwrap_or_default();
                s = sq;
                lambda = (lambda / 3.0).max(1e-12);
                if small_step || small_fall {
                    return Ok(Fit {
                        p,
                        residuals: r,
                        sum_sq: s,
                        iterations: it + 1,
                    });
                }
                break;
            }
            lambda *= 4.0;
        }
    }
    Err(Error::Internal(format!(
        "{what}: no convergence in {max_iter} steps (sum of squares {s:.6e})"
    )))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Rosenbrock as least squares, r = (10(y − x²), 1 − x): minimum (1, 1), S = 0
    /// (H.H. Rosenbrock, Computer J. 3, 1960, 175–184), from the classic start (−1.2, 1).
    #[test]
    fn rosenbrock_from_classic_start() {
        let fit = levenberg_marquardt("rosenbrock", &[-1.2, 1.0], 500, |p| {
            Ok(vec![10.0 * (p[1] - p[0] * p[0]), 1.0 - p[0]])
        })
        .unwrap();
        assert!((fit.p[0] - 1.0).abs() < 1e-6, "{:?}", fit.p);
        assert!((fit.p[1] - 1.0).abs() < 1e-6, "{:?}", fit.p);
        assert!(fit.sum_sq < 1e-12);
    }

    /// Residuals defined only for p ≤ 1 with the minimum on that edge: the Jacobian at the
    /// edge is taken backward, and the fit ends there instead of failing.
    #[test]
    fn jacobian_steps_back_at_the_edge_of_the_domain() {
        let f = |p: &[f64]| {
            if p[0] > 1.0 {
                Err(Error::Internal("outside".into()))
            } else {
                Ok(vec![2.0 * (p[0] - 1.0), 0.5 * (p[0] - 1.0)])
            }
        };
        let fit = levenberg_marquardt("edge", &[0.0], 50, f).unwrap();
        assert!((fit.p[0] - 1.0).abs() < 1e-9, "{:?}", fit.p);
    }

    #[test]
    fn too_few_residuals_is_an_error() {
        let e = levenberg_marquardt("x", &[1.0, 2.0], 10, |p| Ok(vec![p[0]]));
        assert!(e.is_err());
    }
}
