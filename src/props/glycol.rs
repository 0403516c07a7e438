//! Aqueous propylene glycol, the antifreeze loop fluid of collector fields.
//!
//! Density and specific heat are interpolated (bilinear in temperature and mass fraction) in a
//! data table made from CoolProp 6.6.0's incompressible-fluid data "MPG", itself a fit of
//! Melinder, *Properties of Secondary Working Fluids for Indirect Systems*, IIR 2010, at
//! 200 kPa: `reference/glycol_grid_coolprop.csv` (mass fraction 0.25–0.50, 0–100 °C every
//! 10 K), embedded at build time. Outside the table: `OutOfRange`, never an extrapolation.
//! The interpolation is checked against points between the grid lines
//! (`reference/glycol_check_coolprop.csv`).

use crate::error::{Error, Result};
use std::sync::OnceLock;

const GRID: &str = include_str!("../../reference/glycol_grid_coolprop.csv");
const X: [f64; 4] = [0.25, 0.30, 0.40, 0.50];
const NT: usize = 11; // 0, 10, …, 100 °C

/// `[x][t] → (rho, cp)`.
fn table() -> &'static [[(f64, f64); NT]; 4] {
    static T: OnceLock<[[(f64, f64); NT]; 4]> = OnceLock::new();
    T.get_or_init(|| {
        let mut t = [[(f64::NAN, f64::NAN); NT]; 4];
        for line in GRID.lines().filter(|l| !l.starts_with('#')).skip(1) {
            let v: Vec<f64> = line
                .split(',')
                .filter_map(|c| c.trim().parse().ok())
                .collect();
            if let [x, tc, rho, cp] = v[..]
                && let Some(i) = X.iter().position(|&g| (g - x).abs() < 1e-9)
            {
                let j = (tc / 10.0).round() as usize;
                if j < NT {
                    t[i][j] = (rho, cp);
                }
            }
        }
        t
    })
}

/// Density (kg/m³) and specific heat (J/(kg·K)) of aqueous propylene glycol at `t_c`
/// (0–100 °C) and glycol mass fraction `x` (0.25–0.50).
pub fn properties(t_c: f64, x: f64) -> Result<(f64, f64)> {
    if !(t_c.is_finite() && (0.0..=100.0).contains(&t_c)) {
        return Err(Error::OutOfRange {
            model: "propylene glycol (CoolProp MPG table)",
            quantity: "t_c",
            value: t_c,
            range: "0 to 100 °C".into(),
        });
    }
    if !(x.is_finite() && (X[0]..=X[3]).contains(&x)) {
        return Err(Error::OutOfRange {
            model: "propylene glycol (CoolProp MPG table)",
            quantity: "mass fraction",
            value: x,
            range: "0.25 to 0.50".into(),
        });
    }
    let tb = table();
    let i = (0..3).find(|&i| x <= X[i + 1]).unwrap_or(2);
    let fx = (x - X[i]) / (X[i + 1] - X[i]);
    let j = ((t_c / 10.0).floor() as usize).min(NT - 2);
    let ft = (t_c - 10.0 * j as f64) / 10.0;
    let lerp = |a: f64, b: f64, f: f64| a + (b - a) * f;
    let at = |i: usize| {
        let (r0, c0) = tb[i][j];
        let (r1, c1) = tb[i][j + 1];
        (lerp(r0, r1, ft), lerp(c0, c1, ft))
    };
    let (ra, ca) = at(i);
    let (rb, cb) = at(i + 1);
    let (rho, cp) = (lerp(ra, rb, fx), lerp(ca, cb, fx));
    if rho.is_finite() && cp.is_finite() {
        Ok((rho, cp))
    } else {
        Err(Error::Internal("propylene glycol table incomplete".into()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_points_and_range() {
        // On a grid point the table value itself (reference/glycol_grid_coolprop.csv,
        // x = 0.30, 40 °C).
        let (rho, cp) = properties(40.0, 0.30).unwrap();
        assert!(
            rho > 1000.0 && rho < 1040.0 && cp > 3700.0 && cp < 4000.0,
            "{rho} {cp}"
        );
        assert!(properties(-5.0, 0.3).is_err());
        assert!(properties(50.0, 0.6).is_err());
        // More glycol, less heat capacity (Melinder 2010 trend).
        assert!(properties(50.0, 0.5).unwrap().1 < properties(50.0, 0.3).unwrap().1);
    }
}
