//! Circulation pump of the collector loop: a constant electric power while running.
//!
//! The pump either runs for a fraction of an hour at its rated electric power or it is off;
//! no speed control, no part-load curve. Its power can be given directly or derived from the
//! loop's flow and pressure drop with the hydraulic power `P = V̇ Δp / η` (any fluid
//! mechanics text, e.g. White, *Fluid Mechanics*, 7th ed., §11.2: "water horsepower"
//! divided by overall efficiency; from memory). Pump heat into the fluid is neglected.

use crate::error::Result;
use crate::validate::positive;

/// A pump drawing `power_w` of electricity while it runs.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pump {
    /// Electric power while running, W.
    pub power_w: f64,
}

impl Pump {
    /// Check `0 < power_w ≤ 100 000` W.
    pub fn validate(&self) -> Result<()> {
        positive(
            "power_w",
            self.power_w,
            100_000.0,
            "pump electric power while running, W",
        )
    }

    /// Pump sized from the loop hydraulics: `P = ṁ Δp / (ρ η)`, W.
    ///
    /// * `flow_kg_s` – mass flow, kg/s (0 < ṁ ≤ 1000)
    /// * `dp_pa` – loop pressure drop at that flow, Pa (0 < Δp ≤ 2 MPa)
    /// * `rho_kg_m3` – fluid density, kg/m³ (500..1500)
    /// * `efficiency` – overall wire-to-water efficiency, strictly between 0 and 1
    ///   (small circulators 0.2–0.5, common practice)
    ///
    /// Errors name the offending argument (`flow_kg_s`, `dp_pa`, `rho_kg_m3`,
    /// `efficiency`).
    ///
    /// Source: hydraulic power `V̇ Δp` over efficiency (e.g. White, *Fluid Mechanics*, 7th
    /// ed., §11.2; from memory).
    pub fn from_hydraulics(
        flow_kg_s: f64,
        dp_pa: f64,
        rho_kg_m3: f64,
        efficiency: f64,
    ) -> Result<Pump> {
        positive("flow_kg_s", flow_kg_s, 1000.0, "pump mass flow, kg/s")?;
        positive("dp_pa", dp_pa, 2.0e6, "loop pressure drop, Pa")?;
        crate::validate::in_range(
            "rho_kg_m3",
            rho_kg_m3,
            500.0,
            1500.0,
            "fluid density, kg/m³",
        )?;
        crate::validate::open_range(
            "efficiency",
            efficiency,
            0.0,
            1.0,
            "overall pump efficiency",
        )?;
        Ok(Pump {
            power_w: flow_kg_s / rho_kg_m3 * dp_pa / efficiency,
        })
    }

    /// Electricity used in one hour when the pump runs for `run_fraction` of it, kWh:
    /// `E = P · f · 1 h / 1000`.
    ///
    /// * `run_fraction` – running time as a fraction of the hour, clamped to `[0, 1]`
    ///   (NaN counts as 0)
    pub fn electricity_kwh(&self, run_fraction: f64) -> f64 {
        let f = if run_fraction.is_nan() {
            0.0
        } else {
            run_fraction.clamp(0.0, 1.0)
        };
        self.power_w * f / 1000.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// 1.2 kg/s of water (ρ = 1000) through 60 kPa at 40 % efficiency:
    /// 0.0012 m³/s · 60 000 Pa / 0.4 = 180 W; running half an hour: 0.09 kWh.
    #[test]
    fn hydraulic_sizing_by_hand() {
        let p = Pump::from_hydraulics(1.2, 60_000.0, 1000.0, 0.4).unwrap();
        assert!((p.power_w - 180.0).abs() < 1e-9);
        assert!((p.electricity_kwh(0.5) - 0.09).abs() < 1e-12);
        assert_eq!(p.electricity_kwh(2.0), 0.18);
        assert_eq!(p.electricity_kwh(f64::NAN), 0.0);
        p.validate().unwrap();
    }

    #[test]
    fn bad_input_names_the_key() {
        let e = Pump::from_hydraulics(1.2, 60_000.0, 1000.0, 1.0).unwrap_err();
        assert!(e.to_string().contains("efficiency"));
        assert!(Pump { power_w: 0.0 }.validate().is_err());
    }
}
