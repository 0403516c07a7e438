//! Liquid water properties from IAPWS-IF97 (through the `seuif97` crate).
//!
//! Only the compressed-liquid region (IF97 region 1) and the saturation line (region 4) are
//! exposed: storage tanks and pressurised hot-water loops never hold steam here. Inputs are in
//! °C and kPa (the project's units); `seuif97` works in °C and MPa and returns kJ/kg, kJ/(kg·K).
//!
//! Source: IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
//! Thermodynamic Properties of Water and Steam; implementation: `seuif97` 2.3.8.

use crate::error::{Error, Result};
use seuif97::{OCP, OD, OH, OP, OT};

/// Lowest liquid temperature accepted, °C (the triple point, 273.16 K).
pub const T_MIN_C: f64 = 0.01;
/// Highest liquid temperature accepted, °C (upper bound of IF97 region 1, 623.15 K).
pub const T_MAX_C: f64 = 350.0;
/// Highest pressure accepted, kPa (upper bound of IF97 region 1, 100 MPa).
pub const P_MAX_KPA: f64 = 100_000.0;
/// Critical pressure, kPa (IAPWS R7-97, eq. 2 constants: 22.064 MPa).
pub const P_CRIT_KPA: f64 = 22_064.0;
/// Triple-point pressure, kPa (611.657 Pa, IAPWS R7-97 §2; the IF97 saturation line starts at 611.213 Pa at 273.15 K).
pub const P_TRIPLE_KPA: f64 = 0.611_657;

const MODEL: &str = "IAPWS-IF97 liquid water";

/// IF97 region 1 is forced after the range check so that a state exactly on the saturation
/// line is evaluated as liquid.
const REGION_1: i32 = 1;

fn check_liquid(t_c: f64, p_kpa: f64) -> Result<()> {
    if !(t_c.is_finite() && (T_MIN_C..=T_MAX_C).contains(&t_c)) {
        return Err(Error::OutOfRange {
            model: MODEL,
            quantity: "temperature, °C",
            value: t_c,
            range: format!("{T_MIN_C}..{T_MAX_C} °C (compressed liquid, IF97 region 1)"),
        });
    }
    if !(p_kpa.is_finite() && p_kpa > 0.0 && p_kpa <= P_MAX_KPA) {
        return Err(Error::OutOfRange {
            model: MODEL,
            quantity: "pressure, kPa",
            value: p_kpa,
            range: format!("> 0 and at most {P_MAX_KPA} kPa"),
        });
    }
    let p_sat_kpa = saturation_pressure_kpa(t_c)?;
    // A relative margin of 1e-9 lets a state exactly on the saturation line through despite
    // the rounding of the region-4 equation evaluated twice.
    if p_kpa < p_sat_kpa * (1.0 - 1e-9) {
        return Err(Error::OutOfRange {
            model: MODEL,
            quantity: "pressure, kPa",
            value: p_kpa,
            range: format!(
                "at least the saturation pressure {p_sat_kpa:.4} kPa at {t_c} °C (below it the water boils)"
            ),
        });
    }
    Ok(())
}

fn finite(v: f64, what: &str, t_c: f64, p_kpa: f64) -> Result<f64> {
    if v.is_finite() && v > -1e9 {
        Ok(v)
    } else {
        Err(Error::Internal(format!(
            "seuif97 returned {v} for {what} at {t_c} °C, {p_kpa} kPa"
        )))
    }
}

/// Density of liquid water, kg/m³.
///
/// `ρ = 1/v(p, T)` from the IF97 region-1 Gibbs equation (R7-97 eq. 7).
///
/// * `t_c` – temperature, °C, 0.01..=350
/// * `p_kpa` – absolute pressure, kPa, from the saturation pressure at `t_c` up to 100 000
///   (300 kPa is the project's default for pressurised loops)
///
/// Errors with `OutOfRange` outside those limits or when `p_kpa` is below saturation (steam).
///
/// Source: IAPWS R7-97(2012) region 1; `seuif97` 2.3.8.
pub fn liquid_density_kg_m3(t_c: f64, p_kpa: f64) -> Result<f64> {
    check_liquid(t_c, p_kpa)?;
    finite(
        seuif97::pt(p_kpa / 1000.0, t_c, (OD, REGION_1)),
        "density",
        t_c,
        p_kpa,
    )
}

/// Isobaric specific heat capacity of liquid water, J/(kg·K).
///
/// `cp = (∂h/∂T)_p` from the IF97 region-1 Gibbs equation (R7-97 Table 3), converted from
/// kJ/(kg·K).
///
/// * `t_c` – temperature, °C, 0.01..=350
/// * `p_kpa` – absolute pressure, kPa, saturation pressure at `t_c` up to 100 000
///
/// Errors with `OutOfRange` outside those limits.
///
/// Source: IAPWS R7-97(2012) region 1; `seuif97` 2.3.8.
pub fn liquid_cp_j_kgk(t_c: f64, p_kpa: f64) -> Result<f64> {
    check_liquid(t_c, p_kpa)?;
    let cp_kj = finite(
        seuif97::pt(p_kpa / 1000.0, t_c, (OCP, REGION_1)),
        "cp",
        t_c,
        p_kpa,
    )?;
    Ok(cp_kj * 1000.0)
}

/// Specific enthalpy of liquid water, kJ/kg (IF97 reference: u = s = 0 for saturated liquid at
/// the triple point).
///
/// `h = R T τ γ_τ` from the IF97 region-1 Gibbs equation (R7-97 Table 3).
///
/// * `t_c` – temperature, °C, 0.01..=350
/// * `p_kpa` – absolute pressure, kPa, saturation pressure at `t_c` up to 100 000
///
/// Errors with `OutOfRange` outside those limits.
///
/// Source: IAPWS R7-97(2012) region 1; `seuif97` 2.3.8.
pub fn liquid_enthalpy_kj_kg(t_c: f64, p_kpa: f64) -> Result<f64> {
    check_liquid(t_c, p_kpa)?;
    finite(
        seuif97::pt(p_kpa / 1000.0, t_c, (OH, REGION_1)),
        "enthalpy",
        t_c,
        p_kpa,
    )
}

/// Saturation pressure of water, kPa.
///
/// IF97 region-4 saturation-pressure equation (R7-97 eq. 30).
///
/// * `t_c` – temperature, °C, 0.01..=373.946 (triple point to critical point, 647.096 K)
///
/// Errors with `OutOfRange` outside that range.
///
/// Source: IAPWS R7-97(2012) §8.1; `seuif97` 2.3.8.
pub fn saturation_pressure_kpa(t_c: f64) -> Result<f64> {
    const T_CRIT_C: f64 = 647.096 - 273.15;
    if !(t_c.is_finite() && (T_MIN_C..=T_CRIT_C).contains(&t_c)) {
        return Err(Error::OutOfRange {
            model: "IAPWS-IF97 saturation line",
            quantity: "temperature, °C",
            value: t_c,
            range: format!("{T_MIN_C}..{T_CRIT_C:.3} °C (triple point to critical point)"),
        });
    }
    let p_mpa = finite(seuif97::tx(t_c, 0.0, OP), "saturation pressure", t_c, 0.0)?;
    Ok(p_mpa * 1000.0)
}

/// Saturation temperature of water, °C.
///
/// IF97 region-4 saturation-temperature (backward) equation (R7-97 eq. 31).
///
/// * `p_kpa` – absolute pressure, kPa, 0.611657..=22 064 (triple point to critical point)
///
/// Errors with `OutOfRange` outside that range.
///
/// Source: IAPWS R7-97(2012) §8.2; `seuif97` 2.3.8.
pub fn saturation_temperature_c(p_kpa: f64) -> Result<f64> {
    if !(p_kpa.is_finite() && (P_TRIPLE_KPA..=P_CRIT_KPA).contains(&p_kpa)) {
        return Err(Error::OutOfRange {
            model: "IAPWS-IF97 saturation line",
            quantity: "pressure, kPa",
            value: p_kpa,
            range: format!("{P_TRIPLE_KPA}..{P_CRIT_KPA} kPa (triple point to critical point)"),
        });
    }
    finite(
        seuif97::px(p_kpa / 1000.0, 0.0, OT),
        "saturation temperature",
        0.0,
        p_kpa,
    )
}

/// A water or steam state for the `parhelion state water` verb.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct WaterState {
    pub t_c: f64,
    pub p_kpa: f64,
    /// Vapour quality 0..1 on the saturation line; `None` for a single-phase state.
    pub q: Option<f64>,
    pub h_kj_kg: f64,
    pub s_kj_kg_k: f64,
    pub rho_kg_m3: f64,
    /// Isobaric specific heat; `None` inside the two-phase dome.
    pub cp_kj_kg_k: Option<f64>,
}

fn check_quality(q: f64) -> Result<()> {
    if q.is_finite() && (0.0..=1.0).contains(&q) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: "IAPWS-IF97",
            quantity: "quality",
            value: q,
            range: "0..1".into(),
        })
    }
}

/// Saturated state at temperature `t_c` (0.01..373.946 °C) and quality `q` (0 liquid .. 1
/// vapour). Enthalpy and entropy are referred, as in IF97, to zero internal energy and entropy
/// of the saturated liquid at the triple point. Source: IAPWS R7-97(2012); `seuif97` 2.3.8.
pub fn state_tq(t_c: f64, q: f64) -> Result<WaterState> {
    check_quality(q)?;
    let p_kpa = saturation_pressure_kpa(t_c)?;
    let v = finite(
        seuif97::tx(t_c, q, seuif97::OV),
        "specific volume",
        t_c,
        p_kpa,
    )?;
    Ok(WaterState {
        t_c,
        p_kpa,
        q: Some(q),
        h_kj_kg: finite(seuif97::tx(t_c, q, OH), "enthalpy", t_c, p_kpa)?,
        s_kj_kg_k: finite(seuif97::tx(t_c, q, seuif97::OS), "entropy", t_c, p_kpa)?,
        rho_kg_m3: 1.0 / v,
        cp_kj_kg_k: if q == 0.0 || q == 1.0 {
            Some(finite(seuif97::tx(t_c, q, OCP), "cp", t_c, p_kpa)?)
        } else {
            None
        },
    })
}

/// Saturated state at pressure `p_kpa` (0.611657..22 064 kPa) and quality `q`.
pub fn state_pq(p_kpa: f64, q: f64) -> Result<WaterState> {
    state_tq(saturation_temperature_c(p_kpa)?, q)
}

/// Single-phase state (liquid, vapour or supercritical) at `t_c` (0.01..800 °C) and `p_kpa`
/// (up to 100 MPa). A state within 1e-6 K of saturation is refused: give a quality instead.
pub fn state_tp(t_c: f64, p_kpa: f64) -> Result<WaterState> {
    if !(t_c.is_finite() && (T_MIN_C..=800.0).contains(&t_c)) {
        return Err(Error::OutOfRange {
            model: "IAPWS-IF97",
            quantity: "temperature, °C",
            value: t_c,
            range: "0.01..800 °C".into(),
        });
    }
    if !(p_kpa.is_finite() && p_kpa > 0.0 && p_kpa <= P_MAX_KPA) {
        return Err(Error::OutOfRange {
            model: "IAPWS-IF97",
            quantity: "pressure, kPa",
            value: p_kpa,
            range: format!("0..{P_MAX_KPA} kPa"),
        });
    }
    if (P_TRIPLE_KPA..=P_CRIT_KPA).contains(&p_kpa) {
        let ts = saturation_temperature_c(p_kpa)?;
        if (t_c - ts).abs() < 1e-6 {
            return Err(Error::OutOfRange {
                model: "IAPWS-IF97",
                quantity: "temperature, °C",
                value: t_c,
                range: format!(
                    "away from saturation at {p_kpa} kPa ({ts:.4} °C): give the quality with --q"
                ),
            });
        }
    }
    let p = p_kpa / 1000.0;
    Ok(WaterState {
        t_c,
        p_kpa,
        q: None,
        h_kj_kg: finite(seuif97::pt(p, t_c, OH), "enthalpy", t_c, p_kpa)?,
        s_kj_kg_k: finite(seuif97::pt(p, t_c, seuif97::OS), "entropy", t_c, p_kpa)?,
        rho_kg_m3: finite(seuif97::pt(p, t_c, OD), "density", t_c, p_kpa)?,
        cp_kj_kg_k: Some(finite(seuif97::pt(p, t_c, OCP), "cp", t_c, p_kpa)?),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    // Region-1 verification values, IAPWS R7-97(2012) Table 5 (from memory; widely reprinted).

    /// IAPWS R7-97(2012) Table 35 (from memory, widely reprinted): saturation at 500 K,
    /// ps = 2.63889776 MPa. Saturated liquid enthalpy and vapour enthalpy at 100 °C from the
    /// same formulation as printed in steam tables (Çengel & Boles 8th ed. Table A-4, from
    /// memory): hf = 419.17 kJ/kg, hg = 2675.6 kJ/kg.
    #[test]
    fn saturated_states() {
        let s = state_tq(500.0 - 273.15, 1.0).unwrap();
        assert!((s.p_kpa - 2638.89776).abs() < 1e-3);
        let l = state_tq(100.0, 0.0).unwrap();
        let v = state_tq(100.0, 1.0).unwrap();
        assert!((l.h_kj_kg - 419.17).abs() < 0.1 && (v.h_kj_kg - 2675.6).abs() < 0.2);
        assert!(state_tq(100.0, 0.5).unwrap().cp_kj_kg_k.is_none());
        assert!(state_tq(50.0, 1.5).is_err());
        // Superheated steam, IAPWS R7-97 Table 15 (region 2, from memory): T = 300 K,
        // p = 3.5 kPa: h = 2549.91145 kJ/kg.
        let g = state_tp(300.0 - 273.15, 3.5).unwrap();
        assert!((g.h_kj_kg - 2549.91145).abs() < 1e-4, "{}", g.h_kj_kg);
    }

    #[test]
    fn region1_3mpa_300k() {
        // T = 300 K, p = 3 MPa: v = 0.100215168e-2 m³/kg, h = 0.115331273e3 kJ/kg,
        // cp = 0.417301218e1 kJ/(kg·K).
        let t_c = 300.0 - 273.15;
        let rho = liquid_density_kg_m3(t_c, 3000.0).unwrap();
        assert!((1.0 / rho - 0.100215168e-2).abs() < 1e-11);
        let h = liquid_enthalpy_kj_kg(t_c, 3000.0).unwrap();
        assert!((h - 115.331273).abs() < 1e-6);
        let cp = liquid_cp_j_kgk(t_c, 3000.0).unwrap();
        assert!((cp - 4173.01218).abs() < 1e-4);
    }

    #[test]
    fn saturation_table35_and_36() {
        // R7-97 Table 35: p_s(500 K) = 0.263889776e1 MPa. Table 36: T_s(1 MPa) = 0.453035632e3 K.
        let p = saturation_pressure_kpa(500.0 - 273.15).unwrap();
        assert!((p - 2638.89776).abs() < 1e-4);
        let t = saturation_temperature_c(1000.0).unwrap();
        assert!((t - (453.035632 - 273.15)).abs() < 1e-6);
    }

    #[test]
    fn steam_and_bad_input_are_errors() {
        // 120 °C at 100 kPa is above the boiling point (99.6 °C): steam, not liquid.
        assert!(matches!(
            liquid_density_kg_m3(120.0, 100.0),
            Err(Error::OutOfRange { .. })
        ));
        assert!(liquid_cp_j_kgk(f64::NAN, 300.0).is_err());
        assert!(liquid_cp_j_kgk(-5.0, 300.0).is_err());
        assert!(liquid_cp_j_kgk(400.0, 30_000.0).is_err());
        assert!(liquid_cp_j_kgk(20.0, 200_000.0).is_err());
        assert!(saturation_pressure_kpa(400.0).is_err());
        assert!(saturation_temperature_c(30_000.0).is_err());
        assert!(saturation_temperature_c(0.1).is_err());
    }

    #[test]
    fn saturated_liquid_is_accepted() {
        // Exactly on the saturation line the state is liquid (x = 0).
        let p = saturation_pressure_kpa(150.0).unwrap();
        let rho = liquid_density_kg_m3(150.0, p).unwrap();
        // Saturated liquid at 150 °C: ρ ≈ 917 kg/m³ (steam tables, e.g. Wagner & Kretzschmar,
        // International Steam Tables, 2nd ed., Table 2; from memory: v' = 0.0010905 m³/kg).
        assert!((1.0 / rho - 0.0010905).abs() < 2e-7);
    }
}
