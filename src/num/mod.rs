//! Numerics shared by every layer: bracketed root finding and interpolation.

use crate::error::{Error, Result};
use roots::{SimpleConvergency, find_root_brent};

/// Root of `f` in `[a, b]` by Brent's method (`roots` crate), to absolute tolerance `tol` on x.
/// `f(a)` and `f(b)` must differ in sign; otherwise an `Internal` error naming `what`.
pub fn brent(what: &str, a: f64, b: f64, tol: f64, f: impl Fn(f64) -> f64) -> Result<f64> {
    let mut conv = SimpleConvergency {
        eps: tol,
        max_iter: 200,
    };
    find_root_brent(a, b, &f, &mut conv)
        .map_err(|e| Error::Internal(format!("{what}: root not found in [{a}, {b}]: {e:?}")))
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

    #[test]
    fn brent_finds_sqrt2() {
        let r = brent("sqrt2", 0.0, 2.0, 1e-12, |x| x * x - 2.0).unwrap();
        assert!((r - 2f64.sqrt()).abs() < 1e-10);
    }

    #[test]
    fn interp_inside_and_beyond() {
        let t = [(0.0, 1.0), (10.0, 0.0)];
        assert_eq!(interp(&t, 5.0), 0.5);
        assert_eq!(interp(&t, -1.0), 1.0);
        assert_eq!(interp(&t, 11.0), 0.0);
    }
}
