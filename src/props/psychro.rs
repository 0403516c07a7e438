//! Humid-air psychrometrics by the ASHRAE Handbook—Fundamentals (2017, SI) ch. 1 formulation.
//!
//! Temperatures °C, pressures kPa, humidity ratio kg water / kg dry air, enthalpy kJ/kg dry air,
//! specific volume m³/kg dry air. Saturation pressure, humidity ratio, dew point, wet-bulb,
//! enthalpy, volume, density and whole states for the `state air` verb.
//!
//! Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1 "Psychrometrics", eqs. 3, 5, 6, 11, 20,
//! 22, 26, 32, 33, 35. The coefficients of eqs. 5 and 6 (Hyland & Wexler 1983) were checked digit
//! by digit against psychrolib 2.5.0 (PyPI), `GetSatVapPres`, SI branch: they agree.
//!
//! Conventions taken from psychrolib 2.5.0 where the Handbook leaves a choice:
//! * ice/water switch of the saturation pressure at the triple point, 0.01 °C (eq. 5 for
//!   t ≤ 0.01 °C, eq. 6 above). The Handbook gives eq. 5 for −100..0 °C and eq. 6 for 0..200 °C,
//!   which leaves a 0.05 Pa step at 0 °C; at the triple point the two fits meet, so the dew point
//!   solver sees a continuous function;
//! * the wet-bulb equation switches from eq. 33 (water) to eq. 35 (ice) below t* = 0 °C, with the
//!   saturation humidity ratio at t* from the triple-point switch above;
//! * dew point solved over −100..200 °C (the fits' range) and capped at the dry-bulb;
//! * psychrolib floors every humidity ratio at 1e-7 kg/kg; this module does not (W = 0 is dry air;
//!   a dew point of perfectly dry air does not exist and is an `OutOfRange` error).

use crate::error::{Error, Result};
use std::cmp::Ordering;

/// Ratio of molar masses water/dry air used by ASHRAE 2017 eq. 20.
const MW_RATIO: f64 = 0.621945;

/// Gas constant of dry air, kJ/(kg K) (ASHRAE 2017 ch. 1 eq. 26: `v = 0.287042 T (1 + 1.607858 W) / p`).
const R_DA_KJ_KG_K: f64 = 0.287042;

/// Ratio of molar masses dry air/water in eq. 26.
const MW_RATIO_INV: f64 = 1.607858;

/// Triple point of water, °C: the ice/water switch of the saturation pressure (psychrolib 2.5.0).
const TRIPLE_POINT_C: f64 = 0.01;

/// Validity range of the saturation-pressure fits (eqs. 5 and 6), °C.
const T_MIN_C: f64 = -100.0;
const T_MAX_C: f64 = 200.0;

/// Total pressures accepted by the functions that validate, kPa (a generous envelope around
/// the standard atmosphere of eq. 3 between −500 m and 11 000 m: 107.5 to 22.6 kPa).
const P_MIN_KPA: f64 = 10.0;
const P_MAX_KPA: f64 = 200.0;

/// Standard barometric pressure at elevation `z_m`, kPa (ASHRAE 2017 ch. 1 eq. 3):
/// `p = 101.325 (1 − 2.25577e−5 Z)^5.2559`, valid −500 m to 11 000 m.
///
/// * `z_m` – elevation above sea level, m
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 3 and Table 1.
pub fn pressure_at_elevation_kpa(z_m: f64) -> f64 {
    101.325 * (1.0 - 2.25577e-5 * z_m).powf(5.2559)
}

/// Saturation pressure of water vapour, kPa, over ice up to the triple point 0.01 °C (eq. 5) and
/// over liquid water above it (eq. 6), Hyland & Wexler coefficients.
///
/// * `t_c` – temperature, °C; valid −100 °C to 200 °C, outside it an `OutOfRange` error
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 5 and 6; coefficients verified
/// against psychrolib 2.5.0 `GetSatVapPres`; switch at the triple point as psychrolib does.
pub fn saturation_pressure_kpa(t_c: f64) -> Result<f64> {
    if !(T_MIN_C..=T_MAX_C).contains(&t_c) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 saturation pressure",
            quantity: "t_c",
            value: t_c,
            range: "-100 to 200 °C".into(),
        });
    }
    let t = t_c + 273.15;
    let ln_p_pa = if t_c <= TRIPLE_POINT_C {
        // eq. 5, over ice: C1..C7
        -5.674_535_9e3 / t + 6.392_524_7 - 9.677_843_0e-3 * t
            + 6.221_570_1e-7 * t * t
            + 2.074_782_5e-9 * t.powi(3)
            - 9.484_024_0e-13 * t.powi(4)
            + 4.163_501_9 * t.ln()
    } else {
        // eq. 6, over liquid water: C8..C13
        -5.800_220_6e3 / t + 1.391_499_3 - 4.864_023_9e-2 * t + 4.176_476_8e-5 * t * t
            - 1.445_209_3e-8 * t.powi(3)
            + 6.545_967_3 * t.ln()
    };
    Ok(ln_p_pa.exp() / 1000.0)
}

/// Humidity ratio from partial pressure of water vapour (eq. 20): `W = 0.621945 pw / (p − pw)`.
///
/// * `pw_kpa` – partial pressure of water vapour, kPa, `0 ≤ pw < p`
/// * `p_kpa` – total pressure, kPa
///
/// Returns kg water / kg dry air; `OutOfRange` when `pw` is negative or not below `p`.
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 20.
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

/// Partial pressure of water vapour from humidity ratio (inverse of eq. 20), kPa:
/// `pw = p W / (0.621945 + W)`.
///
/// * `w_kg_kg` – humidity ratio, kg/kg (≥ 0)
/// * `p_kpa` – total pressure, kPa
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 20 rearranged.
pub fn vapour_pressure_from_ratio(w_kg_kg: f64, p_kpa: f64) -> f64 {
    p_kpa * w_kg_kg / (MW_RATIO + w_kg_kg)
}

/// Humidity ratio from dry-bulb and relative humidity (0–100 %), via eq. 22 (`pw = φ pws`) and
/// eq. 20.
///
/// * `t_c` – dry-bulb, °C (−100..200)
/// * `rh_pct` – relative humidity, % (0..100)
/// * `p_kpa` – total pressure, kPa (above the vapour pressure)
///
/// Returns kg/kg; `OutOfRange` outside those ranges. Source: ASHRAE 2017 ch. 1 eqs. 20, 22.
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

/// Humidity ratio from dew point: `W = W_s(t_dp)` at the total pressure (eqs. 5/6, 20).
///
/// * `t_dp_c` – dew point, °C (−100..200)
/// * `p_kpa` – total pressure, kPa
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 36 with eq. 20.
pub fn ratio_from_dew_point(t_dp_c: f64, p_kpa: f64) -> Result<f64> {
    ratio_from_vapour_pressure(saturation_pressure_kpa(t_dp_c)?, p_kpa)
}

/// Relative humidity, %, from dry-bulb and humidity ratio: `φ = pw(W) / pws(t)` (eq. 22).
///
/// * `t_c` – dry-bulb, °C (−100..200); `w_kg_kg` – kg/kg; `p_kpa` – total pressure, kPa
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 20 and 22.
pub fn rh_from_ratio(t_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<f64> {
    Ok(100.0 * vapour_pressure_from_ratio(w_kg_kg, p_kpa) / saturation_pressure_kpa(t_c)?)
}

/// Dew point, °C, from the partial pressure of water vapour: the root of `ln pws(t) = ln pw`
/// (Brent, to 1e-9 K on t and 1e-9 on the log) over −100 to 200 °C.
///
/// * `pw_kpa` – partial pressure of water vapour, kPa; between pws(−100 °C) ≈ 1.4e-6 kPa and
///   pws(200 °C) ≈ 1555 kPa, otherwise `OutOfRange` (so `pw = 0`, dry air, is an error)
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 5 and 6 inverted (as psychrolib
/// 2.5.0 does, rather than the regressions eqs. 37/38).
pub fn dew_point_from_vapour_pressure(pw_kpa: f64) -> Result<f64> {
    let lo = saturation_pressure_kpa(T_MIN_C)?;
    let hi = saturation_pressure_kpa(T_MAX_C)?;
    if !(pw_kpa >= lo && pw_kpa <= hi) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 dew point",
            quantity: "pw_kpa",
            value: pw_kpa,
            range: format!("{lo:.3e} to {hi:.1} kPa"),
        });
    }
    let ln_pw = pw_kpa.ln();
    crate::num::brent("dew point", T_MIN_C, T_MAX_C, 1e-9, |t| {
        saturation_pressure_kpa(t).map_or(f64::NAN, f64::ln) - ln_pw
    })
}

/// `OutOfRange` unless the total pressure is within 10..200 kPa.
fn check_pressure(p_kpa: f64) -> Result<()> {
    if (P_MIN_KPA..=P_MAX_KPA).contains(&p_kpa) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: "ASHRAE 2017 psychrometrics",
            quantity: "p_kpa",
            value: p_kpa,
            range: format!("{P_MIN_KPA} to {P_MAX_KPA} kPa"),
        })
    }
}

/// `OutOfRange` unless `0 ≤ W ≤ W_s(t)` (allowing 1e-9 relative for rounding at saturation).
fn check_ratio(t_db_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<()> {
    let w_s = saturation_ratio(t_db_c, p_kpa)?;
    if w_kg_kg >= 0.0 && w_kg_kg <= w_s * (1.0 + 1e-9) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: "ASHRAE 2017 psychrometrics",
            quantity: "w_kg_kg",
            value: w_kg_kg,
            range: format!("0 to saturation {w_s:.6} kg/kg at {t_db_c} °C, {p_kpa} kPa"),
        })
    }
}

/// Humidity ratio of saturated air, kg/kg: `W_s = 0.621945 pws / (p − pws)` (eq. 20 with eq. 5/6).
///
/// * `t_c` – temperature, °C (−100..200)
/// * `p_kpa` – total pressure, kPa (10..200)
///
/// `OutOfRange` outside those or when `pws(t) ≥ p` (boiling: no saturated moist air).
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 23 (`W_s`) via eq. 20.
pub fn saturation_ratio(t_c: f64, p_kpa: f64) -> Result<f64> {
    check_pressure(p_kpa)?;
    ratio_from_vapour_pressure(saturation_pressure_kpa(t_c)?, p_kpa)
}

/// Eq. 33 (water on the bulb), without checks or floor.
fn ratio_wet_bulb_water(t_db_c: f64, t_wb_c: f64, w_s_star: f64) -> f64 {
    ((2501.0 - 2.326 * t_wb_c) * w_s_star - 1.006 * (t_db_c - t_wb_c))
        / (2501.0 + 1.86 * t_db_c - 4.186 * t_wb_c)
}

/// Eq. 35 (ice on the bulb), without checks or floor.
fn ratio_wet_bulb_ice(t_db_c: f64, t_wb_c: f64, w_s_star: f64) -> f64 {
    ((2830.0 - 0.24 * t_wb_c) * w_s_star - 1.006 * (t_db_c - t_wb_c))
        / (2830.0 + 1.86 * t_db_c - 2.1 * t_wb_c)
}

/// Eq. 33 for t* ≥ 0 °C, eq. 35 below, as the Handbook (and psychrolib) switch.
fn ratio_wet_bulb_raw(t_db_c: f64, t_wb_c: f64, w_s_star: f64) -> f64 {
    if t_wb_c >= 0.0 {
        ratio_wet_bulb_water(t_db_c, t_wb_c, w_s_star)
    } else {
        ratio_wet_bulb_ice(t_db_c, t_wb_c, w_s_star)
    }
}

/// Humidity ratio from dry-bulb and thermodynamic wet-bulb, kg/kg.
///
/// `W = ((2501 − 2.326 t*) W_s* − 1.006 (t − t*)) / (2501 + 1.86 t − 4.186 t*)` for t* ≥ 0 °C
/// (eq. 33) and `W = ((2830 − 0.24 t*) W_s* − 1.006 (t − t*)) / (2830 + 1.86 t − 2.1 t*)` for
/// t* < 0 °C (eq. 35), with `W_s*` the saturation humidity ratio at t*.
///
/// * `t_db_c` – dry-bulb, °C; `t_wb_c` – wet-bulb, °C, `t_wb ≤ t_db`
/// * `p_kpa` – total pressure, kPa (10..200)
///
/// `OutOfRange` when t_wb > t_db, outside the temperature/pressure ranges, or when the pair
/// gives W < 0 (no such state: air too dry for that wet-bulb). psychrolib floors such W at 1e-7.
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 33 and 35.
pub fn ratio_from_wet_bulb(t_db_c: f64, t_wb_c: f64, p_kpa: f64) -> Result<f64> {
    if !matches!(
        t_wb_c.partial_cmp(&t_db_c),
        Some(Ordering::Less | Ordering::Equal)
    ) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 wet-bulb",
            quantity: "t_wb_c",
            value: t_wb_c,
            range: format!("at most the dry-bulb {t_db_c} °C"),
        });
    }
    saturation_pressure_kpa(t_db_c)?;
    let w = ratio_wet_bulb_raw(t_db_c, t_wb_c, saturation_ratio(t_wb_c, p_kpa)?);
    // Rounding at the dry-air limit leaves |W| ~ 1e-14: accept down to −1e-12 as W = 0.
    if w < -1e-12 {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 wet-bulb",
            quantity: "t_wb_c",
            value: t_wb_c,
            range: format!("high enough that W ≥ 0 at dry-bulb {t_db_c} °C (gives W = {w:.3e})"),
        });
    }
    Ok(w.max(0.0))
}

/// Thermodynamic wet-bulb temperature, °C, from dry-bulb and humidity ratio: the root t* of
/// eq. 33 (t* ≥ 0, water on the bulb) or eq. 35 (t* < 0, ice) equal to `W`, solved by Brent's
/// method to 1e-9 K (the residual is scaled by 2830/1.006 so that its tolerance is also about
/// 1e-9 K). Not an approximation formula.
///
/// The two equations do not join at t* = 0: W from eq. 35 at 0 °C lies above W from eq. 33 at
/// 0 °C (by ~4.6e-4 kg/kg at 10 °C dry-bulb), so in a narrow band of dry air above freezing
/// both a water root (t* ≥ 0) and an ice root (t* < 0) exist. The Handbook does not say which
/// holds; this function takes the water root whenever it exists (a wetted wick whose liquid
/// equilibrium is at or above 0 °C never freezes). psychrolib 2.5.0's bisection returns either
/// root in that band, depending on its bracket; see reference/scripts/make_psychro_psychrolib.py.
///
/// * `t_db_c` – dry-bulb, °C (−100..200)
/// * `w_kg_kg` – humidity ratio, kg/kg, `0 ≤ W ≤ W_s(t_db)`
/// * `p_kpa` – total pressure, kPa (10..200)
///
/// Returns t_db at saturation. `OutOfRange` outside the ranges (supersaturated W included) or when
/// the wet-bulb would lie below −100 °C.
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 33 and 35 solved for t*
/// (psychrolib 2.5.0 `GetTWetBulbFromHumRatio` solves the same equations by bisection).
pub fn wet_bulb_c(t_db_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<f64> {
    check_ratio(t_db_c, w_kg_kg, p_kpa)?;
    // Residual in kelvin-like units: dW/dt* ≥ 1.006/2830 everywhere (the sensible term).
    let scale = 2830.0 / 1.006;
    let residual = |t_wb: f64, ice: bool| -> f64 {
        saturation_pressure_kpa(t_wb)
            .ok()
            .and_then(|pws| ratio_from_vapour_pressure(pws, p_kpa).ok())
            .map_or(f64::NAN, |w_s| {
                let w = if ice {
                    ratio_wet_bulb_ice(t_db_c, t_wb, w_s)
                } else {
                    ratio_wet_bulb_water(t_db_c, t_wb, w_s)
                };
                (w - w_kg_kg) * scale
            })
    };
    if t_db_c >= 0.0 {
        let at_db = residual(t_db_c, false);
        if at_db.abs() <= 1e-9 {
            return Ok(t_db_c);
        }
        if residual(0.0, false) <= 0.0 {
            return crate::num::brent("wet-bulb (water)", 0.0, t_db_c, 1e-9, |t| {
                residual(t, false)
            });
        }
    }
    let hi = t_db_c.min(0.0);
    let at_hi = residual(hi, true);
    if at_hi.abs() <= 1e-9 {
        return Ok(hi);
    }
    if at_hi < 0.0 {
        // Cannot happen for valid W: for t_db ≥ 0 eq. 35 at t* = 0 lies above eq. 33 at t* = 0,
        // and for t_db < 0 the residual at t* = t_db is W_s(t_db) − W ≥ 0.
        return Err(Error::Internal(format!(
            "wet-bulb: no root for t_db = {t_db_c} °C, W = {w_kg_kg}, p = {p_kpa} kPa"
        )));
    }
    if residual(T_MIN_C, true).partial_cmp(&0.0) != Some(Ordering::Less) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 wet-bulb",
            quantity: "w_kg_kg",
            value: w_kg_kg,
            range: format!("such that the wet-bulb at {t_db_c} °C lies above -100 °C"),
        });
    }
    crate::num::brent("wet-bulb (ice)", T_MIN_C, hi, 1e-9, |t| residual(t, true))
}

/// Moist-air enthalpy per kg dry air, kJ/kg: `h = 1.006 t + W (2501 + 1.86 t)` (eq. 32).
///
/// * `t_db_c` – dry-bulb, °C; `w_kg_kg` – humidity ratio, kg/kg
///
/// Zero enthalpy: dry air and liquid water at 0 °C. Valid over the range of the rest of this
/// module (−100..200 °C). Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 32
/// (psychrolib 2.5.0 `GetMoistAirEnthalpy`, which floors W at 1e-7).
pub fn enthalpy_kj_kg(t_db_c: f64, w_kg_kg: f64) -> f64 {
    1.006 * t_db_c + w_kg_kg * (2501.0 + 1.86 * t_db_c)
}

/// Dry-bulb, °C, from enthalpy and humidity ratio (eq. 32 rearranged):
/// `t = (h − 2501 W) / (1.006 + 1.86 W)`.
///
/// * `h_kj_kg` – enthalpy, kJ/kg dry air; `w_kg_kg` – humidity ratio, kg/kg (≥ 0)
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 32.
pub fn dry_bulb_from_enthalpy(h_kj_kg: f64, w_kg_kg: f64) -> f64 {
    (h_kj_kg - 2501.0 * w_kg_kg) / (1.006 + 1.86 * w_kg_kg)
}

/// Specific volume of moist air per kg dry air, m³/kg:
/// `v = 0.287042 (t + 273.15)(1 + 1.607858 W) / p` (eq. 26).
///
/// * `t_db_c` – dry-bulb, °C; `w_kg_kg` – kg/kg; `p_kpa` – total pressure, kPa (> 0)
///
/// Ideal-gas mixture. Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 26.
pub fn specific_volume_m3_kg(t_db_c: f64, w_kg_kg: f64, p_kpa: f64) -> f64 {
    R_DA_KJ_KG_K * (t_db_c + 273.15) * (1.0 + MW_RATIO_INV * w_kg_kg) / p_kpa
}

/// Density of moist air (dry air plus its vapour), kg/m³: `ρ = (1 + W) / v` (eq. 11 with v of
/// eq. 26).
///
/// * `t_db_c` – dry-bulb, °C; `w_kg_kg` – kg/kg; `p_kpa` – total pressure, kPa (> 0)
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 11 and 26.
pub fn moist_air_density_kg_m3(t_db_c: f64, w_kg_kg: f64, p_kpa: f64) -> f64 {
    (1.0 + w_kg_kg) / specific_volume_m3_kg(t_db_c, w_kg_kg, p_kpa)
}

/// Dew point, °C, from dry-bulb, humidity ratio and pressure: the root of `pws(t_dp) = pw(W)`
/// (see [`dew_point_from_vapour_pressure`]), capped at the dry-bulb as psychrolib does.
///
/// * `t_db_c` – dry-bulb, °C; `w_kg_kg` – kg/kg, `0 < W ≤ W_s(t_db)`; `p_kpa` – kPa (10..200)
///
/// `OutOfRange` for W = 0 (dry air has no dew point), supersaturated W or out-of-range inputs.
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 5, 6, 20 inverted.
pub fn dew_point_c(t_db_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<f64> {
    check_ratio(t_db_c, w_kg_kg, p_kpa)?;
    let t_dp = dew_point_from_vapour_pressure(vapour_pressure_from_ratio(w_kg_kg, p_kpa))?;
    Ok(t_dp.min(t_db_c))
}

/// A whole humid-air state.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AirState {
    /// Dry-bulb, °C.
    pub t_c: f64,
    /// Relative humidity, %.
    pub rh_pct: f64,
    /// Humidity ratio, kg water / kg dry air.
    pub w_kg_kg: f64,
    /// Thermodynamic wet-bulb, °C.
    pub t_wb_c: f64,
    /// Dew point, °C (a state of perfectly dry air, W = 0, has none and is an error).
    pub t_dp_c: f64,
    /// Enthalpy, kJ/kg dry air.
    pub h_kj_kg: f64,
    /// Specific volume, m³/kg dry air.
    pub v_m3_kg: f64,
    /// Density of the moist air, kg/m³.
    pub rho_kg_m3: f64,
    /// Total pressure, kPa.
    pub p_kpa: f64,
}

/// The whole state from dry-bulb and humidity ratio: RH (eq. 22), wet-bulb (eqs. 33/35 solved),
/// dew point (eqs. 5/6 inverted), enthalpy (eq. 32), volume (eq. 26), density (eq. 11).
///
/// * `t_c` – dry-bulb, °C (−100..200)
/// * `w_kg_kg` – humidity ratio, kg/kg, `0 < W ≤ W_s(t)`
/// * `p_kpa` – total pressure, kPa (10..200)
///
/// `OutOfRange` outside those (W = 0 included: no dew point). Source: ASHRAE Handbook—
/// Fundamentals 2017 (SI), ch. 1, eqs. 11, 20, 22, 26, 32, 33, 35.
pub fn state_from_ratio(t_c: f64, w_kg_kg: f64, p_kpa: f64) -> Result<AirState> {
    check_ratio(t_c, w_kg_kg, p_kpa)?;
    Ok(AirState {
        t_c,
        rh_pct: rh_from_ratio(t_c, w_kg_kg, p_kpa)?,
        w_kg_kg,
        t_wb_c: wet_bulb_c(t_c, w_kg_kg, p_kpa)?,
        t_dp_c: dew_point_c(t_c, w_kg_kg, p_kpa)?,
        h_kj_kg: enthalpy_kj_kg(t_c, w_kg_kg),
        v_m3_kg: specific_volume_m3_kg(t_c, w_kg_kg, p_kpa),
        rho_kg_m3: moist_air_density_kg_m3(t_c, w_kg_kg, p_kpa),
        p_kpa,
    })
}

/// The whole state from dry-bulb and relative humidity (see [`state_from_ratio`]).
///
/// * `t_c` – dry-bulb, °C; `rh_pct` – relative humidity, % (above 0, at most 100);
///   `p_kpa` – total pressure, kPa (10..200)
///
/// Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eqs. 20 and 22, then as
/// [`state_from_ratio`].
pub fn state_from_rh(t_c: f64, rh_pct: f64, p_kpa: f64) -> Result<AirState> {
    check_pressure(p_kpa)?;
    let w = ratio_from_rh(t_c, rh_pct, p_kpa)?;
    Ok(AirState {
        rh_pct,
        ..state_from_ratio(t_c, w, p_kpa)?
    })
}

/// The whole state from dry-bulb and thermodynamic wet-bulb (see [`state_from_ratio`]).
///
/// * `t_c` – dry-bulb, °C; `t_wb_c` – wet-bulb, °C (≤ dry-bulb); `p_kpa` – kPa (10..200)
///
/// The reported wet-bulb is the given one. Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1,
/// eqs. 33/35, then as [`state_from_ratio`].
pub fn state_from_wet_bulb(t_c: f64, t_wb_c: f64, p_kpa: f64) -> Result<AirState> {
    let w = ratio_from_wet_bulb(t_c, t_wb_c, p_kpa)?;
    Ok(AirState {
        t_wb_c,
        ..state_from_ratio(t_c, w, p_kpa)?
    })
}

/// The whole state from dry-bulb and dew point (see [`state_from_ratio`]).
///
/// * `t_c` – dry-bulb, °C; `t_dp_c` – dew point, °C (−100..dry-bulb); `p_kpa` – kPa (10..200)
///
/// The reported dew point is the given one. Source: ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1,
/// eq. 36 with eq. 20, then as [`state_from_ratio`].
pub fn state_from_dew_point(t_c: f64, t_dp_c: f64, p_kpa: f64) -> Result<AirState> {
    if !matches!(
        t_dp_c.partial_cmp(&t_c),
        Some(Ordering::Less | Ordering::Equal)
    ) {
        return Err(Error::OutOfRange {
            model: "ASHRAE 2017 psychrometrics",
            quantity: "t_dp_c",
            value: t_dp_c,
            range: format!("at most the dry-bulb {t_c} °C"),
        });
    }
    check_pressure(p_kpa)?;
    let w = ratio_from_dew_point(t_dp_c, p_kpa)?;
    Ok(AirState {
        t_dp_c,
        ..state_from_ratio(t_c, w, p_kpa)?
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// ASHRAE Handbook—Fundamentals 2017 ch. 1 Table 3, as quoted in psychrolib's test
    /// suite (psychrometrics/psychrolib, tests/test_psychrolib_si.py): pws(25 °C) = 3.1697 kPa, pws(−20 °C) = 0.10324 kPa
    /// over ice; the Handbook states eqs. 5/6 agree with the table within 300 ppm.
    #[test]
    fn saturation_pressure_table3() {
        let p25 = saturation_pressure_kpa(25.0).unwrap();
        assert!((p25 - 3.1697).abs() <= 3e-4 * 3.1697, "{p25}");
        let pm20 = saturation_pressure_kpa(-20.0).unwrap();
        assert!((pm20 - 0.10324).abs() <= 3e-4 * 0.10324, "{pm20}");
    }

    /// Ice and water branches meet at the triple point (psychrolib's switch): no step there.
    #[test]
    fn saturation_pressure_continuous_at_triple_point() {
        let below = saturation_pressure_kpa(0.01).unwrap();
        let above = saturation_pressure_kpa(0.010_001).unwrap();
        assert!((below - above).abs() < 1e-6, "{below} {above}");
    }

    #[test]
    fn dew_point_inverts_saturation() {
        let pw = saturation_pressure_kpa(12.3).unwrap();
        assert!((dew_point_from_vapour_pressure(pw).unwrap() - 12.3).abs() < 1e-8);
    }

    /// psychrolib test suite (psychrometrics/psychrolib tests/test_psychrolib_si.py, values "calculated with Excel"):
    /// W(30 °C db, 25 °C wb, 95.461 kPa) = 0.0192281274241096; W(−1 °C, −5 °C) = 0.00120399819933844.
    #[test]
    fn wet_bulb_both_branches() {
        let w = ratio_from_wet_bulb(30.0, 25.0, 95.461).unwrap();
        assert!((w - 0.019_228_127_424_109_6).abs() < 3e-4 * w, "{w}");
        assert!((wet_bulb_c(30.0, w, 95.461).unwrap() - 25.0).abs() < 1e-7);
        let w = ratio_from_wet_bulb(-1.0, -5.0, 95.461).unwrap();
        assert!((w - 0.001_203_998_199_338_44).abs() < 3e-4 * w, "{w}");
        assert!((wet_bulb_c(-1.0, w, 95.461).unwrap() + 5.0).abs() < 1e-7);
    }

    /// psychrolib test suite (same file): h(30 °C, W 0.02) = 81.316 kJ/kg; v(30 °C, 0.02, 95.461 kPa)
    /// = 0.940855374352943 m³/kg; ρ = 1.08411986348219 kg/m³.
    #[test]
    fn enthalpy_volume_density() {
        assert!((enthalpy_kj_kg(30.0, 0.02) - 81.316).abs() < 1e-9);
        assert!((dry_bulb_from_enthalpy(81.316, 0.02) - 30.0).abs() < 1e-9);
        let v = specific_volume_m3_kg(30.0, 0.02, 95.461);
        assert!((v - 0.940_855_374_352_943).abs() < 1e-9, "{v}");
        let rho = moist_air_density_kg_m3(30.0, 0.02, 95.461);
        assert!((rho - 1.084_119_863_482_19).abs() < 1e-9, "{rho}");
    }

    #[test]
    fn saturated_air_wet_bulb_and_dew_point_equal_dry_bulb() {
        let s = state_from_rh(24.0, 100.0, 101.325).unwrap();
        assert!(
            (s.t_wb_c - 24.0).abs() < 1e-7 && (s.t_dp_c - 24.0).abs() < 1e-7,
            "{s:?}"
        );
    }

    #[test]
    fn out_of_range_is_error() {
        assert!(saturation_pressure_kpa(250.0).is_err());
        assert!(ratio_from_rh(20.0, 140.0, 101.325).is_err());
        assert!(wet_bulb_c(20.0, 0.05, 101.325).is_err()); // supersaturated
        assert!(wet_bulb_c(20.0, -0.001, 101.325).is_err());
        assert!(wet_bulb_c(20.0, 0.01, 0.0).is_err());
        assert!(wet_bulb_c(f64::NAN, 0.01, 101.325).is_err());
        assert!(dew_point_c(20.0, 0.0, 101.325).is_err()); // dry air: no dew point
        assert!(ratio_from_wet_bulb(20.0, 25.0, 101.325).is_err()); // wb above db
        assert!(ratio_from_wet_bulb(50.0, 5.0, 101.325).is_err()); // W < 0
        assert!(saturation_ratio(100.0, 101.325).is_err()); // boiling
        assert!(state_from_dew_point(20.0, 22.0, 101.325).is_err());
        assert!(state_from_rh(20.0, 0.0, 101.325).is_err());
    }

    /// Two roots just above freezing (10 °C, RH 10 %, 80 kPa): eq. 35 gives an ice root and
    /// eq. 33 a water root for the same W; psychrolib 2.5.0's bisection returns the ice root
    /// −0.3620256 °C here, this model the water root 0.2620798 °C (both from
    /// reference/scripts/make_psychro_psychrolib.py).
    #[test]
    fn wet_bulb_two_roots_takes_water() {
        let w = ratio_from_rh(10.0, 10.0, 80.0).unwrap();
        let t_wb = wet_bulb_c(10.0, w, 80.0).unwrap();
        assert!((t_wb - 0.262_079_775_268_659_9).abs() < 1e-7, "{t_wb}");
        let w_ice = ratio_from_wet_bulb(10.0, -0.362_025_612_391_886_6, 80.0).unwrap();
        assert!((w_ice - w).abs() < 1e-9, "{w_ice} {w}");
    }

    /// Dry air still has a wet-bulb (W = 0 is a valid input there).
    #[test]
    fn dry_air_wet_bulb() {
        let t_wb = wet_bulb_c(30.0, 0.0, 101.325).unwrap();
        let w = ratio_from_wet_bulb(30.0, t_wb, 101.325).unwrap();
        assert!(w.abs() < 1e-12 && t_wb < 12.0, "{t_wb} {w}");
    }

    proptest::proptest! {
        /// Round trips: RH → W → state; the wet-bulb and dew point of that state give back the
        /// same RH, and the W of the state gives back the same wet-bulb and dew point.
        #[test]
        fn state_round_trips(t in -10.0f64..55.0, rh in 1.0f64..100.0, p in 70.0f64..105.0) {
            let a = state_from_rh(t, rh, p).unwrap();
            let b = state_from_ratio(t, a.w_kg_kg, p).unwrap();
            proptest::prop_assert!((b.rh_pct - rh).abs() < 1e-6);
            let c = state_from_wet_bulb(t, a.t_wb_c, p).unwrap();
            proptest::prop_assert!((c.rh_pct - rh).abs() < 1e-6, "{:?} {:?}", a, c);
            proptest::prop_assert!((c.t_dp_c - a.t_dp_c).abs() < 1e-6);
            let d = state_from_dew_point(t, a.t_dp_c, p).unwrap();
            proptest::prop_assert!((d.rh_pct - rh).abs() < 1e-6, "{:?} {:?}", a, d);
            proptest::prop_assert!((d.t_wb_c - a.t_wb_c).abs() < 1e-6);
            proptest::prop_assert!((dry_bulb_from_enthalpy(a.h_kj_kg, a.w_kg_kg) - t).abs() < 1e-9);
        }
    }
}
