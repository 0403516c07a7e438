//! Rotary silica-gel desiccant wheel by the combined-potential (F1/F2) analogy method.
//!
//! Banks (1972) showed that coupled heat and mass transfer in a sorbent regenerator can be
//! treated as two independent heat-exchanger-like waves in two combined potentials F1 and F2.
//! Jurinak (1982) fitted the potentials for regular-density silica gel and air as
//!
//! * `F1 = −2865 / T^1.490 + 4.344 W^0.8624`
//! * `F2 = T^1.490 / 6360 − 1.127 W^0.07969`
//!
//! with T the air temperature in K and W the humidity ratio in kg/kg. A wheel is described by
//! two effectivenesses, one per potential, defined like a heat-exchanger effectiveness on the
//! process side: `ε_Fi = (Fi,po − Fi,pi) / (Fi,ri − Fi,pi)` (p process, r regeneration, i in,
//! o out). The process outlet is the intersection of the line `F1 = F1,po` with the line
//! `F2 = F2,po`; the regeneration outlet follows from the dry-air, water and energy balances
//! of the adiabatic wheel (no net storage over a rotation, drive power neglected as heat).
//! F1 lines lie close to isenthalps and F2 lines close to lines of constant relative humidity,
//! so a good wheel has small ε_F1 (0.05–0.1) and large ε_F2 (≈ 0.95) (common practice).
//!
//! Sources: Jurinak, J.J., Open cycle solar desiccant cooling: component models and system
//! simulations, PhD thesis, University of Wisconsin–Madison, 1982; Banks, P.J., Coupled
//! equilibrium heat and single adsorbate transfer in fluid flow through a porous medium,
//! Chem. Eng. Sci. 27 (1972); Jurinak, Mitchell & Beckman, J. Solar Energy Eng. 106 (1984).
//! The seven coefficients are quoted **from memory** of Jurinak's fit as it is reproduced in
//! the desiccant-cooling literature (the search tool gave no readable copy).
//!
//! Validity (Jurinak's fit and the effectiveness approach): process inlet 0–50 °C,
//! regeneration inlet 50–90 °C (enforced by [`DesiccantWheel::run`]), regeneration-to-process
//! dry-air flow ratio 0.5–2 — the effectivenesses are those of the flow ratio actually used
//! (Jurinak's typical values are for balanced flow).

use crate::error::{Error, Result};
use crate::props::psychro;

/// Jurinak's F1/F2 fit for silica gel (from memory, see module docs): `F1 = −A1/T^N + B1 W^P1`.
const A1: f64 = 2865.0;
/// Exponent of T in both potentials.
const N_T: f64 = 1.490;
/// Coefficient of W in F1.
const B1: f64 = 4.344;
/// Exponent of W in F1.
const P1: f64 = 0.8624;
/// `F2 = T^N / C2 − D2 W^Q2`.
const C2: f64 = 6360.0;
/// Coefficient of W in F2.
const D2: f64 = 1.127;
/// Exponent of W in F2.
const Q2: f64 = 0.07969;

/// Regeneration inlet temperatures the wheel model accepts, °C (silica gel, Jurinak's range).
pub const T_REGEN_VALID_C: (f64, f64) = (50.0, 90.0);
/// Process inlet temperatures the wheel model accepts, °C.
pub const T_PROCESS_VALID_C: (f64, f64) = (0.0, 50.0);
/// Regeneration-to-process dry-air flow ratios accepted.
pub const FLOW_RATIO_VALID: (f64, f64) = (0.5, 2.0);

/// A humid-air state: dry-bulb and humidity ratio (the pressure is passed separately).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Air {
    /// Dry-bulb, °C.
    pub t_c: f64,
    /// Humidity ratio, kg water / kg dry air.
    pub w_kg_kg: f64,
}

impl Air {
    /// Enthalpy, kJ/kg dry air, ASHRAE 2017 ch. 1 eq. 32 (see [`psychro::enthalpy_kj_kg`]).
    pub fn h_kj_kg(&self) -> f64 {
        psychro::enthalpy_kj_kg(self.t_c, self.w_kg_kg)
    }

    /// Mix two streams of dry-air flows `m_a`, `m_b` (kg/s, `m_a + m_b > 0`): water and
    /// enthalpy are mass-weighted (exact balances), the temperature follows from eq. 32.
    pub fn mix(a: Air, m_a: f64, b: Air, m_b: f64) -> Air {
        let m = m_a + m_b;
        let w = (m_a * a.w_kg_kg + m_b * b.w_kg_kg) / m;
        let h = (m_a * a.h_kj_kg() + m_b * b.h_kj_kg()) / m;
        Air {
            t_c: psychro::dry_bulb_from_enthalpy(h, w),
            w_kg_kg: w,
        }
    }
}

/// Combined potential F1 of silica gel–air, dimensionless:
/// `F1 = −2865 / T^1.490 + 4.344 W^0.8624`, T = t + 273.15 K.
///
/// * `t_c` – air dry-bulb, °C; `w_kg_kg` – humidity ratio, kg/kg (≥ 0)
///
/// F1 rises with both T and W; its lines run close to isenthalps. Source: Jurinak (1982),
/// coefficients from memory (module docs).
pub fn f1(t_c: f64, w_kg_kg: f64) -> f64 {
    -A1 / (t_c + 273.15).powf(N_T) + B1 * w_kg_kg.max(0.0).powf(P1)
}

/// Combined potential F2 of silica gel–air, dimensionless:
/// `F2 = T^1.490 / 6360 − 1.127 W^0.07969`, T = t + 273.15 K.
///
/// * `t_c` – air dry-bulb, °C; `w_kg_kg` – humidity ratio, kg/kg (≥ 0)
///
/// F2 rises with T and falls with W; its lines run close to lines of constant relative
/// humidity. Source: Jurinak (1982), coefficients from memory (module docs).
pub fn f2(t_c: f64, w_kg_kg: f64) -> f64 {
    (t_c + 273.15).powf(N_T) / C2 - D2 * w_kg_kg.max(0.0).powf(Q2)
}

/// The air state with the given potentials: the intersection of `F1 = f1_target` and
/// `F2 = f2_target`.
///
/// With `u = T^1.49`, F2 gives `u = 6360 (F2 + 1.127 W^0.07969)`; put into F1 this leaves one
/// equation in W, `g(W) = 4.344 W^0.8624 − 2865/u(W) − F1 = 0`, strictly increasing in W, so
/// the root is unique; it is found by Brent's method to 1e-14 on W (then `T = u^(1/1.49)`).
///
/// * `f1_target`, `f2_target` – potentials, dimensionless
///
/// Returns the state (°C, kg/kg). `OutOfRange` when the root lies outside 1e-12..0.2 kg/kg
/// (no air state at these potentials in the range of the fit). Source: Jurinak (1982).
pub fn state_from_potentials(f1_target: f64, f2_target: f64) -> Result<Air> {
    const W_HI: f64 = 0.2;
    let u_of = |w: f64| C2 * (f2_target + D2 * w.powf(Q2));
    let g = |w: f64| {
        let u = u_of(w);
        if u <= 0.0 {
            f64::NEG_INFINITY
        } else {
            B1 * w.powf(P1) - A1 / u - f1_target
        }
    };
    // Lowest W at which u > 0 (F2 < 0 needs some water for T to be positive).
    let w_lo = if f2_target < 0.0 {
        ((-f2_target / D2).powf(1.0 / Q2) * (1.0 + 1e-9)).max(1e-12)
    } else {
        1e-12
    };
    let out_of_range = |what: f64| Error::OutOfRange {
        model: "silica-gel F1/F2 potentials (Jurinak 1982)",
        quantity: "w_kg_kg at F1/F2 intersection",
        value: what,
        range: format!("{w_lo:.3e} to {W_HI} kg/kg"),
    };
    if !(f1_target.is_finite() && f2_target.is_finite()) || w_lo >= W_HI {
        return Err(out_of_range(f64::NAN));
    }
    let (g_lo, g_hi) = (g(w_lo), g(W_HI));
    if g_lo > 0.0 {
        return Err(out_of_range(w_lo));
    }
    if g_hi < 0.0 {
        return Err(out_of_range(W_HI));
    }
    let w = crate::num::brent("F1/F2 intersection", w_lo, W_HI, 1e-14, g)?;
    let t_k = u_of(w).powf(1.0 / N_T);
    Ok(Air {
        t_c: t_k - 273.15,
        w_kg_kg: w,
    })
}

/// Both outlets of a desiccant wheel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WheelOut {
    /// Process air leaving (dried, warmed).
    pub process_out: Air,
    /// Regeneration air leaving (moist, cooled).
    pub regen_out: Air,
    /// Water moved from process to regeneration air, kg/s.
    pub water_kg_s: f64,
}

/// A silica-gel desiccant wheel described by its two potential effectivenesses.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DesiccantWheel {
    /// Effectiveness on F1, 0..1 (typical 0.05–0.1, common practice).
    pub eps_f1: f64,
    /// Effectiveness on F2, 0..1 (typical ≈ 0.95, common practice).
    pub eps_f2: f64,
}

impl DesiccantWheel {
    /// A wheel with F1 and F2 effectivenesses.
    ///
    /// * `eps_f1`, `eps_f2` – effectivenesses, each in [0, 1] (an error naming the key
    ///   otherwise). ε_F1 = 0, ε_F2 = 1 is Jurinak's ideal dehumidifier.
    ///
    /// Source: Jurinak (1982); typical values common practice.
    pub fn new(eps_f1: f64, eps_f2: f64) -> Result<Self> {
        crate::validate::in_range("eps_f1", eps_f1, 0.0, 1.0, "wheel F1 effectiveness")?;
        crate::validate::in_range("eps_f2", eps_f2, 0.0, 1.0, "wheel F2 effectiveness")?;
        Ok(DesiccantWheel { eps_f1, eps_f2 })
    }

    /// The F1 and F2 the process outlet must have:
    /// `Fi,po = Fi,pi + ε_Fi (Fi,ri − Fi,pi)`.
    ///
    /// * `process_in`, `regen_in` – inlet states (°C, kg/kg)
    ///
    /// Source: Jurinak (1982) effectiveness definitions.
    pub fn outlet_potentials(&self, process_in: Air, regen_in: Air) -> (f64, f64) {
        let (f1p, f2p) = (
            f1(process_in.t_c, process_in.w_kg_kg),
            f2(process_in.t_c, process_in.w_kg_kg),
        );
        let (f1r, f2r) = (
            f1(regen_in.t_c, regen_in.w_kg_kg),
            f2(regen_in.t_c, regen_in.w_kg_kg),
        );
        (
            f1p + self.eps_f1 * (f1r - f1p),
            f2p + self.eps_f2 * (f2r - f2p),
        )
    }

    /// Run the wheel at steady periodic operation.
    ///
    /// * `process_in` – process air entering, °C and kg/kg, 0–50 °C, `0 ≤ W ≤ W_s`
    /// * `regen_in` – regeneration air entering (after the heating coil), 50–90 °C, `W ≤ W_s`
    /// * `m_process_kg_s`, `m_regen_kg_s` – dry-air flows, kg/s, > 0, ratio regen/process
    ///   0.5–2
    /// * `p_kpa` – total pressure, kPa (10..200)
    ///
    /// Process outlet: the state with `F1 = F1,pi + ε_F1 (F1,ri − F1,pi)` and
    /// `F2 = F2,pi + ε_F2 (F2,ri − F2,pi)` ([`state_from_potentials`]). Regeneration outlet
    /// from the balances of the adiabatic wheel:
    /// `W_ro = W_ri + (m_p/m_r)(W_pi − W_po)`, `h_ro = h_ri + (m_p/m_r)(h_pi − h_po)`.
    ///
    /// Errors: `Input` for non-positive or non-finite flows or a flow ratio outside 0.5–2;
    /// `OutOfRange` for inlets outside their ranges, a regeneration inlet not hotter than the
    /// process inlet, or an outlet that is not a physical state (supersaturated or W < 0).
    /// Source: Jurinak (1982); balances: steady flow, ASHRAE 2017 ch. 1 eq. 32 enthalpy.
    pub fn run(
        &self,
        process_in: Air,
        regen_in: Air,
        m_process_kg_s: f64,
        m_regen_kg_s: f64,
        p_kpa: f64,
    ) -> Result<WheelOut> {
        crate::validate::positive(
            "m_process_kg_s",
            m_process_kg_s,
            1e4,
            "process dry-air flow through the wheel, kg/s",
        )?;
        crate::validate::positive(
            "m_regen_kg_s",
            m_regen_kg_s,
            1e4,
            "regeneration dry-air flow through the wheel, kg/s",
        )?;
        let ratio = m_regen_kg_s / m_process_kg_s;
        crate::validate::in_range(
            "m_regen_kg_s / m_process_kg_s",
            ratio,
            FLOW_RATIO_VALID.0,
            FLOW_RATIO_VALID.1,
            "regeneration-to-process flow ratio of the F1/F2 wheel model",
        )?;
        let range = |quantity: &'static str, value: f64, lo: f64, hi: f64| {
            if value.is_finite() && (lo..=hi).contains(&value) {
                Ok(())
            } else {
                Err(Error::OutOfRange {
                    model: "silica-gel desiccant wheel (F1/F2)",
                    quantity,
                    value,
                    range: format!("{lo} to {hi} °C"),
                })
            }
        };
        range(
            "process inlet t_c",
            process_in.t_c,
            T_PROCESS_VALID_C.0,
            T_PROCESS_VALID_C.1,
        )?;
        range(
            "regeneration inlet t_c",
            regen_in.t_c,
            T_REGEN_VALID_C.0,
            T_REGEN_VALID_C.1,
        )?;
        physical(process_in, p_kpa)?;
        physical(regen_in, p_kpa)?;
        let (f1o, f2o) = self.outlet_potentials(process_in, regen_in);
        let po = state_from_potentials(f1o, f2o)?;
        physical(po, p_kpa)?;
        let k = 1.0 / ratio;
        let w_ro = regen_in.w_kg_kg + k * (process_in.w_kg_kg - po.w_kg_kg);
        let h_ro = regen_in.h_kj_kg() + k * (process_in.h_kj_kg() - po.h_kj_kg());
        let ro = Air {
            t_c: psychro::dry_bulb_from_enthalpy(h_ro, w_ro),
            w_kg_kg: w_ro,
        };
        physical(ro, p_kpa)?;
        Ok(WheelOut {
            process_out: po,
            regen_out: ro,
            water_kg_s: m_process_kg_s * (process_in.w_kg_kg - po.w_kg_kg),
        })
    }
}

/// `OutOfRange` unless `0 ≤ W ≤ W_s(t, p)` (ASHRAE 2017 eqs. 5/6, 20).
pub fn physical(a: Air, p_kpa: f64) -> Result<()> {
    let ws = psychro::saturation_ratio(a.t_c, p_kpa)?;
    if a.w_kg_kg.is_finite() && a.w_kg_kg >= 0.0 && a.w_kg_kg <= ws * (1.0 + 1e-9) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: "humid-air state",
            quantity: "w_kg_kg",
            value: a.w_kg_kg,
            range: format!("0 to saturation {ws:.6} kg/kg at {:.2} °C", a.t_c),
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const P: f64 = 101.325;

    fn air(t_c: f64, w_kg_kg: f64) -> Air {
        Air { t_c, w_kg_kg }
    }

    /// Evaluation of the fit at 30 °C, W = 0.012 on a calculator (Python 3 floats):
    /// T^1.49 = 303.15^1.49 = 4985.05; F1 = −2865/4985.05 + 4.344·0.012^0.8624
    /// = −0.574718 + 0.095802 = −0.478916; F2 = 4985.05/6360 − 1.127·0.012^0.07969
    /// = 0.783813 − 0.792235 = −0.008421.
    #[test]
    fn potentials_by_hand() {
        assert!(
            (f1(30.0, 0.012) - (-0.478916)).abs() < 1e-6,
            "{}",
            f1(30.0, 0.012)
        );
        assert!(
            (f2(30.0, 0.012) - (-0.008421)).abs() < 1e-6,
            "{}",
            f2(30.0, 0.012)
        );
    }

    #[test]
    fn intersection_inverts_potentials() {
        for (t, w) in [(30.0, 0.012), (45.0, 0.006), (70.0, 0.014), (5.0, 0.003)] {
            let s = state_from_potentials(f1(t, w), f2(t, w)).unwrap();
            assert!(
                (s.t_c - t).abs() < 1e-9 && (s.w_kg_kg - w).abs() < 1e-12,
                "{s:?}"
            );
        }
    }

    /// Typical ventilation-cycle point: outdoor 30 °C/12 g/kg, regeneration 70 °C/12 g/kg,
    /// ε_F1 = 0.05, ε_F2 = 0.95. The wheel dries and heats the process air and the balances
    /// close.
    #[test]
    fn wheel_dries_and_balances() {
        let wh = DesiccantWheel::new(0.05, 0.95).unwrap();
        let (pi, ri) = (air(30.0, 0.012), air(70.0, 0.012));
        let o = wh.run(pi, ri, 1.0, 1.0, P).unwrap();
        assert!(
            o.process_out.w_kg_kg < 0.008 && o.process_out.t_c > 45.0,
            "{o:?}"
        );
        let dw = (pi.w_kg_kg - o.process_out.w_kg_kg) + (ri.w_kg_kg - o.regen_out.w_kg_kg);
        let dh = (pi.h_kj_kg() - o.process_out.h_kj_kg()) + (ri.h_kj_kg() - o.regen_out.h_kj_kg());
        assert!(dw.abs() < 1e-15 && dh.abs() < 1e-10);
    }

    #[test]
    fn bad_inputs() {
        assert!(DesiccantWheel::new(-0.1, 0.9).is_err());
        assert!(DesiccantWheel::new(0.1, 1.2).is_err());
        assert!(DesiccantWheel::new(f64::NAN, 0.9).is_err());
        let wh = DesiccantWheel::new(0.05, 0.95).unwrap();
        let (pi, ri) = (air(30.0, 0.012), air(70.0, 0.012));
        assert!(wh.run(pi, ri, 0.0, 1.0, P).is_err());
        assert!(wh.run(pi, ri, 1.0, 0.0, P).is_err());
        assert!(wh.run(pi, ri, 1.0, 3.0, P).is_err());
        assert!(wh.run(pi, air(45.0, 0.012), 1.0, 1.0, P).is_err());
        assert!(wh.run(pi, air(95.0, 0.012), 1.0, 1.0, P).is_err());
        assert!(wh.run(air(30.0, 0.05), ri, 1.0, 1.0, P).is_err());
    }
}
