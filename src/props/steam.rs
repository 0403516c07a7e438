//! Water and steam as a Rankine working fluid ([`Fluid::Water`]), from IAPWS-IF97 through the
//! `seuif97` crate, in the same units and enthalpy/entropy convention as the Peng–Robinson
//! fluids of `fluids.rs` (which dispatches here for water: one API for the engine).
//!
//! Convention: IIR, like every other working fluid — h = 200 kJ/kg and s = 1 kJ/(kg·K) for
//! saturated liquid at 0 °C. IF97 itself refers u = s = 0 to saturated liquid at the triple
//! point; the IIR values are the IF97 values plus the constants
//! `Δh = 200 − h′(273.15 K)` and `Δs = 1 − s′(273.15 K)` (h′, s′ saturated liquid from IF97
//! regions 4 and 1: Δh ≈ 200.04 kJ/kg, Δs ≈ 1.00015 kJ/(kg·K)). Differences of h and s, and so
//! every cycle result, are those of IF97 unchanged.
//!
//! Validity (refused outside, never extrapolated): only IF97 regions 1 (liquid), 2 (vapour) and
//! 4 (saturation) are used.
//! * saturation line: [`T_MIN_C`] = 0 °C (273.15 K, the lower bound of regions 1 and 4) to
//!   [`T_SAT_MAX_C`] = 350 °C (623.15 K, where region 3 begins), i.e. 0.6112 kPa to
//!   16 529 kPa;
//! * single-phase states: 0..800 °C (the upper bound of region 2) at pressures above 0 up to
//!   [`P_MAX_KPA`] = 16 529 kPa, the saturation pressure at 350 °C: below it, no (T, p) state
//!   with T ≤ 800 °C falls in region 3.
//!
//! (p, h) and (p, s) flashes: two-phase by the lever rule between the saturated states at
//! T_sat(p) (region-4 backward equation, the exact inverse of the saturation-pressure
//! equation); single phase by Brent's method on the forward region-1 or -2 equation (1e-9 K),
//! so results are consistent with the forward equations, not limited by IF97's backward T(p, h)
//! and T(p, s) equations (tens of mK).
//!
//! Source: IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
//! Thermodynamic Properties of Water and Steam (regions 1, 2, 4; eq. 7, 15, 30, 31);
//! implementation `seuif97` 2.3.8 (crates.io). Checked against CoolProp 6.6.0 (IAPWS-95) in
//! `reference/fluid_coolprop.csv` and against the steam Rankine cycles of
//! `reference/rankine_steam.csv`.

use super::fluids::{Fluid, FluidState, Saturation, Target};
use crate::error::{Error, Result};
use seuif97::{OH, OP, OS, OT, OV};
use std::sync::OnceLock;

/// Lowest temperature, °C (273.15 K: lower bound of IF97 regions 1, 2 and 4).
pub const T_MIN_C: f64 = 0.0;
/// Highest saturation temperature, °C (623.15 K: above it the saturated states lie in IF97
/// region 3, which is not used).
pub const T_SAT_MAX_C: f64 = 350.0;
/// Highest single-phase temperature, °C (1073.15 K: upper bound of IF97 region 2).
pub const T_MAX_C: f64 = 800.0;
/// Highest pressure, kPa: the IF97 saturation pressure at 350 °C (16.5291643 MPa, R7-97 eq. 30;
/// also the lower end of the region 2/3 boundary B23).
pub const P_MAX_KPA: f64 = 16_529.164_3;
/// Critical temperature, °C (647.096 K, IAPWS R7-97 eq. 1 constants).
pub const T_CRIT_C: f64 = 647.096 - 273.15;
/// Critical pressure, kPa (22.064 MPa).
pub const P_CRIT_KPA: f64 = 22_064.0;
/// Molar mass, kg/mol (IAPWS R7-97: R = 0.461526 kJ/(kg·K) with M = 18.015268 g/mol).
pub const M_KG_MOL: f64 = 0.018_015_268;

const MODEL: &str = "IAPWS-IF97 water/steam";
const LIQUID: i32 = 1;
const VAPOUR: i32 = 2;

fn out_of_range(quantity: &'static str, value: f64, range: String) -> Error {
    Error::OutOfRange {
        model: MODEL,
        quantity,
        value,
        range,
    }
}

fn finite(v: f64, what: &str) -> Result<f64> {
    // seuif97 returns a large negative sentinel for an invalid input.
    if v.is_finite() && v > -1e9 {
        Ok(v)
    } else {
        Err(Error::Internal(format!("seuif97 returned {v} for {what}")))
    }
}

/// IIR shifts (Δh kJ/kg, Δs kJ/(kg·K)) added to IF97 values (module docs).
fn shift() -> (f64, f64) {
    static SHIFT: OnceLock<(f64, f64)> = OnceLock::new();
    *SHIFT.get_or_init(|| {
        let p0 = seuif97::tx(T_MIN_C, 0.0, OP);
        (
            200.0 - seuif97::pt(p0, T_MIN_C, (OH, LIQUID)),
            1.0 - seuif97::pt(p0, T_MIN_C, (OS, LIQUID)),
        )
    })
}

/// (h IIR, s IIR, v) at `t_c` °C, `p_mpa` MPa in the IF97 region given (1 or 2).
fn hsv(t_c: f64, p_mpa: f64, region: i32) -> Result<(f64, f64, f64)> {
    let (dh, ds) = shift();
    Ok((
        finite(seuif97::pt(p_mpa, t_c, (OH, region)), "enthalpy")? + dh,
        finite(seuif97::pt(p_mpa, t_c, (OS, region)), "entropy")? + ds,
        finite(seuif97::pt(p_mpa, t_c, (OV, region)), "specific volume")?,
    ))
}

fn check_t_sat(t_c: f64) -> Result<()> {
    if t_c.is_finite() && (T_MIN_C..=T_SAT_MAX_C).contains(&t_c) {
        Ok(())
    } else {
        Err(out_of_range(
            "saturation temperature, °C",
            t_c,
            format!(
                "{T_MIN_C}..{T_SAT_MAX_C} °C for water (IF97 regions 1, 2 and 4; region 3 not used)"
            ),
        ))
    }
}

/// Saturation pressure at 0 °C, kPa (lowest of the saturation line; computed once).
fn p_sat_min_kpa() -> f64 {
    static P: OnceLock<f64> = OnceLock::new();
    *P.get_or_init(|| seuif97::tx(T_MIN_C, 0.0, OP) * 1000.0)
}

/// Both saturated states of water at `t_c` °C.
///
/// `p_s(T)` from the IF97 region-4 equation (R7-97 eq. 30); liquid from the region-1 Gibbs
/// equation (eq. 7), vapour from region 2 (eq. 15), both at (p_s, T); h and s shifted to IIR.
///
/// * `t_c` – 0..350 °C
///
/// Error `OutOfRange` outside. Source: IAPWS R7-97(2012); `seuif97` 2.3.8.
pub fn saturation(t_c: f64) -> Result<Saturation> {
    check_t_sat(t_c)?;
    let p_mpa = finite(seuif97::tx(t_c, 0.0, OP), "saturation pressure")?;
    let (hl, sl, vl) = hsv(t_c, p_mpa, LIQUID)?;
    let (hv, sv, vv) = hsv(t_c, p_mpa, VAPOUR)?;
    Ok(Saturation {
        t_c,
        p_kpa: p_mpa * 1000.0,
        h_liq_kj_kg: hl,
        h_vap_kj_kg: hv,
        s_liq_kj_kgk: sl,
        s_vap_kj_kgk: sv,
        v_liq_m3_kg: vl,
        v_vap_m3_kg: vv,
    })
}

/// Saturation temperature of water, °C, at `p_kpa` kPa: IF97 region-4 backward equation
/// (R7-97 eq. 31, the exact inverse of eq. 30).
///
/// * `p_kpa` – 0.6112 kPa (0 °C) .. [`P_MAX_KPA`] (350 °C)
///
/// Error `OutOfRange` outside. Source: IAPWS R7-97(2012) §8.2; `seuif97` 2.3.8.
pub fn sat_temperature_c(p_kpa: f64) -> Result<f64> {
    let lo = p_sat_min_kpa();
    if !(p_kpa.is_finite() && p_kpa >= lo * (1.0 - 1e-12) && p_kpa <= P_MAX_KPA) {
        return Err(out_of_range(
            "saturation pressure, kPa",
            p_kpa,
            format!("{lo:.4}..{P_MAX_KPA} kPa for water (saturation at 0..350 °C)"),
        ));
    }
    let t = finite(
        seuif97::px(p_kpa / 1000.0, 0.0, OT),
        "saturation temperature",
    )?;
    Ok(t.clamp(T_MIN_C, T_SAT_MAX_C))
}

fn check_p(p_kpa: f64) -> Result<()> {
    if p_kpa.is_finite() && p_kpa > 1e-3 && p_kpa <= P_MAX_KPA {
        Ok(())
    } else {
        Err(out_of_range(
            "pressure, kPa",
            p_kpa,
            format!(
                "0.001..{P_MAX_KPA} kPa for water (IF97 regions 1 and 2: up to the saturation pressure at 350 °C)"
            ),
        ))
    }
}

fn check_t(t_c: f64) -> Result<()> {
    if t_c.is_finite() && (T_MIN_C..=T_MAX_C).contains(&t_c) {
        Ok(())
    } else {
        Err(out_of_range(
            "temperature, °C",
            t_c,
            format!("{T_MIN_C}..{T_MAX_C} °C for water (IF97 regions 1 and 2)"),
        ))
    }
}

/// IF97 region of a single-phase state: liquid (1) at or below 350 °C above the saturation
/// pressure, vapour (2) otherwise (on the saturation line: vapour, as the Peng–Robinson fluids).
fn region_at(t_c: f64, p_kpa: f64) -> Result<i32> {
    if t_c <= T_SAT_MAX_C {
        let p_s = finite(seuif97::tx(t_c, 0.0, OP), "saturation pressure")? * 1000.0;
        Ok(if p_kpa > p_s { LIQUID } else { VAPOUR })
    } else {
        Ok(VAPOUR)
    }
}

fn single(t_c: f64, p_kpa: f64, region: i32) -> Result<FluidState> {
    let (h, s, v) = hsv(t_c, p_kpa / 1000.0, region)?;
    Ok(FluidState {
        fluid: Fluid::Water,
        t_c,
        p_kpa,
        q: None,
        h_kj_kg: h,
        s_kj_kg_k: s,
        rho_kg_m3: 1.0 / v,
    })
}

/// Single-phase water state at `t_c` °C and `p_kpa` kPa: compressed liquid (IF97 region 1)
/// where p is above the saturation pressure at t, else superheated vapour (region 2).
///
/// * `t_c` – 0..800 °C; `p_kpa` – 0.001..[`P_MAX_KPA`] kPa
///
/// A state exactly on the saturation line comes back as saturated vapour (q = None).
/// Error `OutOfRange` outside. Source: IAPWS R7-97(2012) eq. 7 and 15; `seuif97` 2.3.8.
pub fn state_tp(t_c: f64, p_kpa: f64) -> Result<FluidState> {
    check_t(t_c)?;
    check_p(p_kpa)?;
    single(t_c, p_kpa, region_at(t_c, p_kpa)?)
}

/// State at `p_kpa` and enthalpy or entropy `value` (IIR): the lever rule inside the dome,
/// else Brent's method (1e-9 K) on the forward equation of the single-phase region.
///
/// Error `OutOfRange` for p outside 0.001..[`P_MAX_KPA`] kPa or a value outside what 0..800 °C
/// gives at that pressure.
pub(crate) fn flash(p_kpa: f64, value: f64, target: Target) -> Result<FluidState> {
    check_p(p_kpa)?;
    if !value.is_finite() {
        return Err(out_of_range(
            target.quantity(),
            value,
            "a finite number".into(),
        ));
    }
    let pick = |h: f64, s: f64| target.pick(h, s);
    let p_mpa = p_kpa / 1000.0;
    let (t_lo, t_hi, region) = if p_kpa >= p_sat_min_kpa() {
        let t_s = sat_temperature_c(p_kpa)?;
        let (hl, sl, vl) = hsv(t_s, p_mpa, LIQUID)?;
        let (hv, sv, vv) = hsv(t_s, p_mpa, VAPOUR)?;
        let (xl, xv) = (pick(hl, sl), pick(hv, sv));
        if value >= xl && value <= xv {
            let q = (value - xl) / (xv - xl);
            return Ok(FluidState {
                fluid: Fluid::Water,
                t_c: t_s,
                p_kpa,
                q: Some(q),
                h_kj_kg: hl + q * (hv - hl),
                s_kj_kg_k: sl + q * (sv - sl),
                rho_kg_m3: 1.0 / (vl + q * (vv - vl)),
            });
        }
        if value > xv {
            (t_s, T_MAX_C, VAPOUR)
        } else {
            (T_MIN_C, t_s, LIQUID)
        }
    } else {
        (T_MIN_C, T_MAX_C, VAPOUR)
    };
    let (dh, ds) = shift();
    let g = |t_c: f64| -> f64 {
        match target {
            Target::H => seuif97::pt(p_mpa, t_c, (OH, region)) + dh - value,
            Target::S => seuif97::pt(p_mpa, t_c, (OS, region)) + ds - value,
        }
    };
    let (g_lo, g_hi) = (g(t_lo), g(t_hi));
    if !(g_lo <= 0.0 && g_hi >= 0.0) {
        return Err(out_of_range(
            target.quantity(),
            value,
            format!(
                "{:.3}..{:.3} for water at {p_kpa} kPa ({t_lo:.1}..{t_hi:.1} °C, IF97 region {region})",
                g_lo + value,
                g_hi + value
            ),
        ));
    }
    let t_c = crate::num::brent("IF97 flash", t_lo, t_hi, 1e-9, g)?;
    single(t_c, p_kpa, region)
}

/// Density of water at (t, p) for a cross-check of the region choice, kg/m³ (tests only).
#[cfg(test)]
fn density_any_region(t_c: f64, p_kpa: f64) -> f64 {
    seuif97::pt(p_kpa / 1000.0, t_c, seuif97::OD)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// IIR reference state: h = 200 kJ/kg, s = 1 kJ/(kg·K) for saturated liquid at 0 °C.
    #[test]
    fn iir_reference_state() {
        let s = saturation(0.0).unwrap();
        assert!((s.h_liq_kj_kg - 200.0).abs() < 1e-9);
        assert!((s.s_liq_kj_kgk - 1.0).abs() < 1e-12);
        // The shift is a constant: IF97 latent heat at 100 °C unchanged (2256.47 kJ/kg in
        // IF97-based tables, e.g. Çengel & Boles 7th ed. Table A-4: 2256.4; from memory).
        let s = saturation(100.0).unwrap();
        assert!((s.h_fg_kj_kg() - 2256.4).abs() < 0.2, "{}", s.h_fg_kj_kg());
        let (dh, ds) = shift();
        assert!(
            (dh - 200.04).abs() < 0.01 && (ds - 1.00015).abs() < 1e-4,
            "{dh} {ds}"
        );
    }

    /// IAPWS R7-97(2012) verification values (from memory, widely reprinted): Table 35
    /// p_s(500 K) = 2.63889776 MPa; Table 36 T_s(1 MPa) = 453.035632 K; Table 15 region 2 at
    /// 300 K, 3.5 kPa: h = 2549.91145 kJ/kg (IF97 reference, so + Δh here).
    #[test]
    fn verification_values() {
        let s = saturation(500.0 - 273.15).unwrap();
        assert!((s.p_kpa - 2638.89776).abs() < 1e-4);
        let t = sat_temperature_c(1000.0).unwrap();
        assert!((t - (453.035632 - 273.15)).abs() < 1e-6);
        let g = state_tp(300.0 - 273.15, 3.5).unwrap();
        assert!((g.h_kj_kg - shift().0 - 2549.91145).abs() < 1e-4);
    }

    /// Region choice matches seuif97's own automatic region selection away from saturation,
    /// and flashes invert (T, p) to 1e-6 K on both sides of the dome and above 350 °C.
    #[test]
    fn flashes_round_trip() {
        for (t, p) in [
            (40.0, 300.0),
            (120.0, 300.0),
            (200.0, 300.0),
            (60.0, 10_000.0),
            (330.0, 16_000.0),
            (400.0, 16_000.0),
            (600.0, 50.0),
            (5.0, 0.7),
        ] {
            let a = state_tp(t, p).unwrap();
            assert!(
                (a.rho_kg_m3 / density_any_region(t, p) - 1.0).abs() < 1e-9,
                "{t} {p}"
            );
            let b = flash(p, a.h_kj_kg, Target::H).unwrap();
            let c = flash(p, a.s_kj_kg_k, Target::S).unwrap();
            assert!(
                (b.t_c - t).abs() < 1e-6 && (c.t_c - t).abs() < 1e-6,
                "{t} {p}"
            );
            assert!(b.q.is_none() && c.q.is_none());
        }
        // Below the triple-point pressure (0.611657 kPa) seuif97's automatic region selection
        // refuses the state, though IF97 region 2 holds for any p > 0: there the vapour is
        // nearly ideal, rho = p / (R T) with R = 0.461526 kJ/(kg K) (R7-97), to 0.1 %.
        let a = state_tp(5.0, 0.5).unwrap();
        let ideal = 0.5 / (0.461526 * 278.15);
        assert!((a.rho_kg_m3 / ideal - 1.0).abs() < 1e-3, "{}", a.rho_kg_m3);
        let b = flash(0.5, a.h_kj_kg, Target::H).unwrap();
        assert!((b.t_c - 5.0).abs() < 1e-6);
        let s = saturation(150.0).unwrap();
        let h = s.h_liq_kj_kg + 0.3 * s.h_fg_kj_kg();
        let m = flash(s.p_kpa, h, Target::H).unwrap();
        assert!((m.q.unwrap() - 0.3).abs() < 1e-9 && (m.t_c - 150.0).abs() < 1e-9);
    }

    #[test]
    fn out_of_range_is_an_error() {
        assert!(saturation(351.0).is_err());
        assert!(saturation(-1.0).is_err());
        assert!(saturation(f64::NAN).is_err());
        assert!(sat_temperature_c(20_000.0).is_err());
        assert!(sat_temperature_c(0.5).is_err());
        assert!(state_tp(900.0, 100.0).is_err());
        assert!(state_tp(100.0, 30_000.0).is_err());
        assert!(state_tp(100.0, 0.0).is_err());
        assert!(flash(100.0, 1e5, Target::H).is_err());
        assert!(flash(100.0, f64::NAN, Target::S).is_err());
    }
}
