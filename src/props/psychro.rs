//! Humid-air psychrometrics by the ASHRAE Handbook—Fundamentals (2017, SI) ch. 1 formulation.
//!
//! Temperatures °C, pressures kPa, humidity ratio kg water / kg dry air. This module holds the
//! core relations every layer needs (saturation pressure, humidity ratio, dew point, standard
//! pressure); the psychrometrics work extends it (wet-bulb, enthalpy, volume, checks).
//!
//! Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1 "Psychrometrics", eqs. 3, 5, 6, 20,
//! 22 (coefficients of eqs. 5 and 6 are Hyland & Wexler 1983 as printed there; from memory,
//! to be verified against psychrolib by the check table).

use crate::error::{Error, Result};

/// Ratio of molar masses water/dry air used by ASHRAE 2017 eq. 20.
const MW_RATIO: f64 = 0.621945;

/// Standard barometric pressure at elevation `z_m`, kPa (ASHRAE 2017 ch. 1 eq. 3):
/// `p = 101.325 (1 − 2.25577e−5 Z)^5.2559`, valid −500 m to 11 000 m.
pub fn pressure_at_elevation_kpa(z_m: f64) -> f64 {
    101.325 * (1.0 - 2.25577e-5 * z_m).powf(5.2559)
}

/// Saturation pressure of water vapour, kPa, over ice below 0 °C (eq. 5) and over liquid water
/// from 0 °C (eq. 6). Valid −100 °C to 200 °C; outside it an `OutOfRange` error.
pub fn saturation_pressure_kpa(t_c: f64) -> Result<f64> {
    if !(-100.0..=200.0).contains(&t_c) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 saturation pressure",
            quantity: "t_c",
            value: t_c,
            range: "-100 to 200 °C".into(),
        });
    }
    let t = t_c + 273.15;
    let ln_p_pa = if t_c < 0.0 {
        -5.674_535_9e3 / t + 6.392_524_7 - 9.677_843_0e-3 * t + 6.221_570_1e-7 * t * t
            + 2.074_782_5e-9 * t.powi(3)
            - 9.484_024_0e-13 * t.powi(4)
            + 4.163_501_9 * t.ln()
    } else {
        -5.800_220_6e3 / t + 1.391_499_3 - 4.864_023_9e-2 * t + 4.176_476_8e-5 * t * t
            - 1.445_209_3e-8 * t.powi(3)
            + 6.545_967_3 * t.ln()
    };
    Ok(ln_p_pa.exp() / 1000.0)
}

/// Humidity ratio from partial pressure of water vapour (eq. 20): `W = 0.621945 pw / (p − pw)`.
pub fn ratio_from_vapour_pressure(pw_kpa: f64, p_kpa: f64) -> Result<f64> {
    if !(pw_kpa >= 0.0 && pw_kpa < p_kpa) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 humidity ratio",
            quantity: "pw_kpa",
            value: pw_kpa,
            range: format!("0 to below total pressure {p_kpa} kPa"),
        });
    }
    Ok(MW_RATIO * pw_kpa / (p_kpa - pw_kpa))
}

/// Partial pressure of water vapour from humidity ratio (inverse of eq. 20), kPa.
pub fn vapour_pressure_from_ratio(w_kg_kg: f64, p_kpa: f64) -> f64 {
    p_kpa * w_kg_kg / (MW_RATIO + w_kg_kg)
}

/// Humidity ratio from dry-bulb and relative humidity (0–100 %), via eq. 22 (`pw = φ pws`).
pub fn ratio_from_rh(t_c: f64, rh_pct: f64, p_kpa: f64) -> Result<f64> {
    if !(0.0..=100.0).contains(&rh_pct) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 psychrometrics",
            quantity: "rh_pct",
            value: rh_pct,
            range: "0 to 100 %".into(),
        });
    }
    ratio_from_vapour_pressure(rh_pct / 100.0 * saturation_pressure_kpa(t_c)?, p_kpa)
}

/// Humidity ratio from dew point: `W = W_s(t_dp)` at the total pressure.
pub fn ratio_from_dew_point(t_dp_c: f64, p_kpa: f64) -> Result<f64> {
    ratio_from_vapour_pressure(saturation_pressure_kpa(t_dp_c)?, p_kpa)
}

/// Relative humidity, %, from dry-bulb and humidity ratio.
pub fn rh_from_ratio(t_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<f64> {
    Ok(100.0 * vapour_pressure_from_ratio(w_kg_kg, p_kpa) / saturation_pressure_kpa(t_c)?)
}

/// Dew point, °C, from the partial pressure of water vapour: the root of `pws(t) = pw`
/// (Brent, to 1e-6 K) over −100 to 200 °C.
pub fn dew_point_from_vapour_pressure(pw_kpa: f64) -> Result<f64> {
    let lo = saturation_pressure_kpa(-100.0)?;
    let hi = saturation_pressure_kpa(200.0)?;
    if !(pw_kpa >= lo && pw_kpa <= hi) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 dew point",
            quantity: "pw_kpa",
            value: pw_kpa,
            range: format!("{lo:.3e} to {hi:.1} kPa"),
        });
    }
    let ln_pw = pw_kpa.ln();
    crate::num::brent("dew point", -100.0, 200.0, 1e-6, |t| {
        saturation_pressure_kpa(t).map_or(f64::NAN, f64::ln) - ln_pw
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// ASHRAE Handbook—Fundamentals 2017 ch. 1 Table 3 (from memory): pws(20 °C) = 2.3393 kPa,
    /// pws(−20 °C) = 0.10326 kPa over ice.
    #[test]
    fn saturation_pressure_table3() {
        assert!((saturation_pressure_kpa(20.0).unwrap() - 2.3393).abs() < 0.001);
        assert!((saturation_pressure_kpa(-20.0).unwrap() - 0.10326).abs() < 0.0002);
    }

    #[test]
    fn dew_point_inverts_saturation() {
        let pw = saturation_pressure_kpa(12.3).unwrap();
        assert!((dew_point_from_vapour_pressure(pw).unwrap() - 12.3).abs() < 1e-5);
    }

    #[test]
    fn out_of_range_is_error() {
        assert!(saturation_pressure_kpa(250.0).is_err());
        assert!(ratio_from_rh(20.0, 140.0, 101.325).is_err());
    }
}
