//! Numerics shared by every layer: bracketed root finding, interpolation, and nonlinear
//! least squares (`lm`).

pub mod lm;

use crate::error::{Error, Result};

/// Solve the dense system `A x = b` in place by Gaussian elimination with partial pivoting:
/// `a` is `n × n` row-major with `n = b.len()`, and `b` is overwritten with `x`. Returns
/// `false` (with `a` and `b` spoiled) when a pivot is zero or non-finite, or `x` is not finite.
/// Used by the small Newton and least-squares solves, which own their scratch arrays.
pub fn solve_linear(a: &mut [f64], b: &mut [f64]) -> bool {
    let n = b.len();
    if a.len() != n * n {
        return false;
    }
    for k in 0..n {
        let Some(piv) = (k..n).max_by(|&i, &j| a[i * n + k].abs().total_cmp(&a[j * n + k].abs()))
        else {
            return false;
        };
        if a[piv * n + k].abs() < 1e-300 || !a[piv * n + k].is_finite() {
            return false;
        }
        if piv != k {
            for c in 0..n {
                a.swap(k * n + c, piv * n + c);
            }
            b.swap(k, piv);
        }
        for i in k + 1..n {
            let f = a[i * n + k] / a[k * n + k];
            for c in k..n {
                a[i * n + c] -= f * a[k * n + c];
            }
            b[i] -= f * b[k];
        }
    }
    for k in (0..n).rev() {
        let s: f64 = (k + 1..n).map(|c| a[k * n + c] * b[c]).sum();
        b[k] = (b[k] - s) / a[k * n + k];
    }
    b.iter().all(|v| v.is_finite())
}
/// Root of `f` in `[a, b]` by Brent's method, to absolute tolerance `tol` on x.
///
/// Brent's zeroin (R.P. Brent, *Algorithms for Minimization without Derivatives*,
/// Prentice-Hall 1973, ch. 4): inverse quadratic or secant steps, falling back to bisection,
/// one evaluation of `f` per iteration, stopping when the bracket is below
/// `2·ε·|b| + tol/2` on each side. Written here rather than taken from the `roots` crate
/// because its 0.0.8 Brent evaluates `f` three times per iteration, tests |f| and the bracket
/// against the same epsilon, and can return a point outside the final bracket (it returned
/// 10 for the root 3 of `(x − 3)/1000` on [0, 10] with ε = 0.01).
///
/// `f(a)` and `f(b)` must differ in sign (or one be zero); otherwise, or if `f` returns a
/// non-finite value, an `Internal` error naming `what`.
pub fn brent(what: &str, a: f64, b: f64, tol: f64, f: impl Fn(f64) -> f64) -> Result<f64> {
    let fail = |why: &str| Error::Internal(format!("{what}: {why} in [{a}, {b}]"));
    let (mut a, mut b) = (a, b);
    let (mut fa, mut fb) = (f(a), f(b));
    if !(fa.is_finite() && fb.is_finite()) {
        return Err(fail("non-finite function value at an end"));
    }
    if fa == 0.0 {
        return Ok(a);
    }
    if fb == 0.0 {
        return Ok(b);
    }
    if fa.signum() == fb.signum() {
        return Err(fail("no sign change (root not bracketed)"));
    }
    let (mut c, mut fc) = (a, fa);
    let (mut d, mut e) = (b - a, b - a);
    for _ in 0..200 {
        if fb.signum() == fc.signum() {
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol1 = 2.0 * f64::EPSILON * b.abs() + 0.5 * tol;
        let xm = 0.5 * (c - b);
        if xm.abs() <= tol1 || fb == 0.0 {
            return Ok(b);
        }
        if e.abs() >= tol1 && fa.abs() > fb.abs() {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * xm * s;
                q = 1.0 - s;
            } else {
                let qq = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * xm * qq * (qq - r) - (b - a) * (r - 1.0));
                q = (qq - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            }
            p = p.abs();
            if 2.0 * p < (3.0 * xm * q - (tol1 * q).abs()).min((e * q).abs()) {
                e = d;
                d = p / q;
            } else {
                d = xm;
                e = d;
            }
        } else {
            d = xm;
            e = d;
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol1 { d } else { tol1.copysign(xm) };
        fb = f(b);
        if !fb.is_finite() {
            return Err(fail("non-finite function value"));
        }
    }
    Err(fail("no convergence in 200 iterations"))
}

/// Linear interpolation in a table of `(x, y)` sorted by `x`, held constant beyond the ends.
pub fn interp(table: &[(f64, f64)], x: f64) -> f64 {
    match table {
        [] => f64::NAN,
        [(_, y)] => *y,
        _ => {
            if x <= table[0].0 {
                return table[0].1;
            }
            for w in table.windows(2) {
                let ((x0, y0), (x1, y1)) = (w[0], w[1]);
                if x <= x1 {
                    return if x1 > x0 {
                        y0 + (y1 - y0) * (x - x0) / (x1 - x0)
                    } else {
                        y1
                    };
                }
            }
            table[table.len() - 1].1
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A system that needs a row swap (zero first pivot): 2y + z = 7, x + y + z = 6,
    /// 2x + y − z = 1 has x = 1, y = 2, z = 3; a singular one is refused.
    #[test]
    fn linear_solve_pivots_and_refuses_singular() {
        let mut a = [0.0, 2.0, 1.0, 1.0, 1.0, 1.0, 2.0, 1.0, -1.0];
        let mut b = [7.0, 6.0, 1.0];
        assert!(solve_linear(&mut a, &mut b));
        for (x, e) in b.iter().zip([1.0, 2.0, 3.0]) {
            assert!((x - e).abs() < 1e-12, "{b:?}");
        }
        let mut a = [1.0, 2.0, 2.0, 4.0];
        assert!(!solve_linear(&mut a, &mut [1.0, 2.0]));
    }

    #[test]
    fn brent_finds_sqrt2() {
        let r = brent("sqrt2", 0.0, 2.0, 1e-12, |x| x * x - 2.0).unwrap();
        assert!((r - 2f64.sqrt()).abs() < 1e-10);
    }

    /// A root far from where |f| first drops below the x tolerance: f(x) = (x − 3)/1000 on
    /// [0, 10] is below 0.01 in magnitude from x = −7 onwards, yet the root is 3.
    #[test]
    fn brent_tolerance_is_on_x() {
        let r = brent("scaled", 0.0, 10.0, 0.01, |x| (x - 3.0) / 1000.0).unwrap();
        assert!((r - 3.0).abs() <= 0.01, "{r}");
    }

    #[test]
    fn interp_inside_and_beyond() {
        let t = [(0.0, 1.0), (10.0, 0.0)];
        assert_eq!(interp(&t, 5.0), 0.5);
        assert_eq!(interp(&t, -1.0), 1.0);
        assert_eq!(interp(&t, 11.0), 0.0);
    }
}
