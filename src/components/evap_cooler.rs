//! Direct evaporative cooler (wetted pad or spray) on an air stream.
//!
//! The outlet temperature follows from the saturation effectiveness,
//! `t_o = t_i − ε (t_i − t*)`, t* the thermodynamic wet-bulb of the inlet. The outlet humidity
//! ratio closes the energy balance with make-up water entering at t* (a recirculating sump
//! settles at the wet-bulb): `h_o = h_i + (W_o − W_i) h_w(t*)`, `h_w = 4.186 t*` kJ/kg — the
//! same balance that defines the thermodynamic wet-bulb (ASHRAE 2017 ch. 1 eq. 33), so at
//! ε = 1 the outlet is exactly saturated at t* and every outlet lies on the inlet's wet-bulb
//! line. Pump power is counted by the caller.
//!
//! Source: ASHRAE Handbook—HVAC Systems and Equipment 2020, ch. 41 (evaporative air coolers:
//! saturation effectiveness, typically 0.7–0.95 for rigid media, from memory); ASHRAE
//! Handbook—Fundamentals 2017 (SI), ch. 1 eqs. 32 and 33.

use super::desiccant_wheel::Air;
use crate::error::{Error, Result};

/// Outlet of an evaporative cooler.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EvapOut {
    /// Air leaving.
    pub air: Air,
    /// Water evaporated into the air, kg per kg dry air (≥ 0).
    pub water_kg_kg: f64,
}

/// A direct evaporative cooler with its design saturation effectiveness.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EvapCooler {
    /// Saturation (wet-bulb depression) effectiveness at full wetting, 0..1.
    pub eps: f64,
}

impl EvapCooler {
    /// A cooler of saturation effectiveness `eps` (in [0, 1], an error naming `eps_evap`
    /// otherwise; 0.85–0.95 typical of rigid media, common practice).
    pub fn new(eps: f64) -> Result<Self> {
        crate::validate::in_range(
            "eps_evap",
            eps,
            0.0,
            1.0,
            "evaporative cooler saturation effectiveness",
        )?;
        Ok(EvapCooler { eps })
    }

    /// Outlet at effectiveness `eps` (0 ≤ eps ≤ the cooler's `eps`: part wetting or pad
    /// bypass modulates it), given the inlet's wet-bulb.
    ///
    /// * `inlet` – air entering (°C, kg/kg); `t_wb_c` – its thermodynamic wet-bulb, °C
    ///   (from [`crate::props::psychro::wet_bulb_c`]); `eps` – effectiveness used
    ///
    /// `t_o = t_i − ε (t_i − t*)`; `W_o = (h_i − 4.186 t* W_i − 1.006 t_o) /
    /// (2501 + 1.86 t_o − 4.186 t*)` (energy balance with water at t*).
    ///
    /// Errors: `Input` for `eps` outside `[0, self.eps]`; `OutOfRange` when t* ≤ 0 °C (the
    /// pad would freeze: the ice branch of the wet-bulb has no use here) or t* > t_i.
    /// Source: module docs.
    pub fn run(&self, inlet: Air, t_wb_c: f64, eps: f64) -> Result<EvapOut> {
        crate::validate::in_range(
            "eps",
            eps,
            0.0,
            self.eps,
            "evaporative cooler effectiveness in use, up to its design value",
        )?;
        if !(t_wb_c.is_finite() && t_wb_c > 0.0 && t_wb_c <= inlet.t_c + 1e-9) {
            return Err(Error::OutOfRange {
                model: "direct evaporative cooler",
                quantity: "inlet wet-bulb t_wb_c",
                value: t_wb_c,
                range: format!(
                    "above 0 °C (no freezing pad) and at most the dry-bulb {} °C",
                    inlet.t_c
                ),
            });
        }
        let t_o = inlet.t_c - eps * (inlet.t_c - t_wb_c);
        let hw = 4.186 * t_wb_c;
        let w_o = (inlet.h_kj_kg() - hw * inlet.w_kg_kg - 1.006 * t_o) / (2501.0 + 1.86 * t_o - hw);
        Ok(EvapOut {
            air: Air {
                t_c: t_o,
                w_kg_kg: w_o,
            },
            water_kg_kg: w_o - inlet.w_kg_kg,
        })
    }
}

/// Enthalpy of liquid make-up water at `t_c`, kJ/kg: `4.186 t` (ASHRAE 2017 ch. 1 eq. 33's
/// liquid term; zero at 0 °C like the moist-air enthalpy).
pub fn water_enthalpy_kj_kg(t_c: f64) -> f64 {
    4.186 * t_c
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::props::psychro;

    const P: f64 = 101.325;

    /// At ε = 1 the outlet is saturated air at the wet-bulb: W_o = W_s(t*) to 1e-12
    /// (ASHRAE 2017 ch. 1 eq. 33 is the same balance).
    #[test]
    fn full_effectiveness_reaches_saturation() {
        let a = Air {
            t_c: 35.0,
            w_kg_kg: 0.008,
        };
        let twb = psychro::wet_bulb_c(a.t_c, a.w_kg_kg, P).unwrap();
        let o = EvapCooler::new(1.0).unwrap().run(a, twb, 1.0).unwrap();
        let ws = psychro::saturation_ratio(twb, P).unwrap();
        assert!((o.air.t_c - twb).abs() < 1e-12);
        assert!(
            (o.air.w_kg_kg - ws).abs() < 1e-9,
            "{} vs {ws}",
            o.air.w_kg_kg
        );
    }

    /// Partial effectiveness: the outlet keeps the inlet's wet-bulb (within the 1e-6 K the
    /// wet-bulb solver's tolerance and the 4.186 vs 2.326 term allow) and closes energy.
    #[test]
    fn constant_wet_bulb_and_energy() {
        let a = Air {
            t_c: 40.0,
            w_kg_kg: 0.006,
        };
        let twb = psychro::wet_bulb_c(a.t_c, a.w_kg_kg, P).unwrap();
        let o = EvapCooler::new(0.9).unwrap().run(a, twb, 0.9).unwrap();
        assert!((o.air.t_c - (40.0 - 0.9 * (40.0 - twb))).abs() < 1e-12);
        let twb_o = psychro::wet_bulb_c(o.air.t_c, o.air.w_kg_kg, P).unwrap();
        assert!((twb_o - twb).abs() < 1e-6, "{twb_o} vs {twb}");
        let e = a.h_kj_kg() + o.water_kg_kg * water_enthalpy_kj_kg(twb) - o.air.h_kj_kg();
        assert!(e.abs() < 1e-10);
    }

    #[test]
    fn bad_inputs() {
        assert!(EvapCooler::new(1.1).is_err());
        assert!(EvapCooler::new(-0.1).is_err());
        let c = EvapCooler::new(0.9).unwrap();
        let a = Air {
            t_c: 3.0,
            w_kg_kg: 0.001,
        };
        let twb = psychro::wet_bulb_c(a.t_c, a.w_kg_kg, P).unwrap();
        assert!(twb < 0.0, "{twb}");
        assert!(c.run(a, twb, 0.9).is_err(), "frozen pad must be refused");
        assert!(c.run(a, 2.0, 0.95).is_err(), "above design effectiveness");
    }
}
