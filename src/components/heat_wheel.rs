//! Sensible processes on air streams: the rotary sensible heat wheel, the hot-water
//! regeneration heating coil and the heat a fan puts into the air it moves.
//!
//! All three change temperature at constant humidity ratio; heat per kg dry air is
//! `c_p (t_o − t_i)` with the moist-air `c_p = 1.006 + 1.86 W` kJ/(kg K), exactly the change of
//! the ASHRAE 2017 ch. 1 eq. 32 enthalpy at constant W, so the energy balances close exactly.

use super::desiccant_wheel::Air;
use crate::error::Result;

/// Moist-air specific heat per kg dry air at constant W, kJ/(kg K): `1.006 + 1.86 W`
/// (ASHRAE Handbook—Fundamentals 2017 (SI), ch. 1, eq. 32 differentiated in t).
pub fn cp_kj_kgk(w_kg_kg: f64) -> f64 {
    1.006 + 1.86 * w_kg_kg
}

/// Outlets of a heat wheel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HeatWheelOut {
    /// Hot stream leaving (cooled).
    pub hot_out: Air,
    /// Cold stream leaving (warmed).
    pub cold_out: Air,
    /// Heat moved from the hot to the cold stream, kW (≥ 0).
    pub q_kw: f64,
}

/// A rotary sensible heat wheel of effectiveness ε.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HeatWheel {
    /// Sensible effectiveness on the smaller capacity rate, 0..1 (0.7–0.85 typical, common
    /// practice).
    pub eps: f64,
}

impl HeatWheel {
    /// A wheel of effectiveness `eps` in [0, 1] (an error naming `eps_heat_wheel` otherwise).
    pub fn new(eps: f64) -> Result<Self> {
        crate::validate::in_range(
            "eps_heat_wheel",
            eps,
            0.0,
            1.0,
            "sensible heat wheel effectiveness",
        )?;
        Ok(HeatWheel { eps })
    }

    /// Exchange heat between two streams, no moisture transfer or carry-over.
    ///
    /// * `hot`, `m_hot_kg_s` – warmer stream and its dry-air flow, kg/s (> 0)
    /// * `cold`, `m_cold_kg_s` – cooler stream and its dry-air flow, kg/s (> 0)
    ///
    /// `q = ε C_min (t_hot − t_cold)`, `C = m c_p(W)`; each outlet `t_o = t_i ∓ q/C`. If
    /// `t_hot ≤ t_cold` no heat moves (the wheel is stopped: it would heat the supply).
    /// Errors: `Input` for non-positive flows. Source: ε-NTU definition, e.g. Incropera &
    /// DeWitt, Fundamentals of Heat and Mass Transfer, §11.4; ASHRAE Handbook—HVAC Systems
    /// and Equipment 2020 ch. 26 (air-to-air energy recovery).
    pub fn run(
        &self,
        hot: Air,
        m_hot_kg_s: f64,
        cold: Air,
        m_cold_kg_s: f64,
    ) -> Result<HeatWheelOut> {
        crate::validate::positive("m_hot_kg_s", m_hot_kg_s, 1e4, "dry-air flow, kg/s")?;
        crate::validate::positive("m_cold_kg_s", m_cold_kg_s, 1e4, "dry-air flow, kg/s")?;
        let c_h = m_hot_kg_s * cp_kj_kgk(hot.w_kg_kg);
        let c_c = m_cold_kg_s * cp_kj_kgk(cold.w_kg_kg);
        let mut q = (self.eps * c_h.min(c_c) * (hot.t_c - cold.t_c)).max(0.0);
        // Condensation on the wheel is not modelled: the hot stream is cooled no lower than
        // its dew point (at standard pressure; the pressure effect on the dew point is a few
        // hundredths of a kelvin per 100 m of elevation). Conservative: a real wheel would
        // transfer some latent heat as well.
        if hot.w_kg_kg > 0.0 {
            let pw = crate::props::psychro::vapour_pressure_from_ratio(hot.w_kg_kg, 101.325);
            if let Ok(t_dp) = crate::props::psychro::dew_point_from_vapour_pressure(pw) {
                q = q.min(((hot.t_c - t_dp) * c_h).max(0.0));
            }
        }
        Ok(HeatWheelOut {
            hot_out: Air {
                t_c: hot.t_c - q / c_h,
                w_kg_kg: hot.w_kg_kg,
            },
            cold_out: Air {
                t_c: cold.t_c + q / c_c,
                w_kg_kg: cold.w_kg_kg,
            },
            q_kw: q,
        })
    }
}

/// Hot-water heating coil that heats the regeneration air from the store.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RegenCoil {
    /// Hot-water supply above the air leaving the coil, K (5 K typical, common practice).
    pub approach_k: f64,
    /// Design water temperature drop, K (15 K typical, common practice).
    pub water_dt_k: f64,
}

impl RegenCoil {
    /// Heat to lift air of dry-air flow `m_da_kg_s` from `inlet` to `t_out_c`, kW:
    /// `q = m c_p(W) (t_out − t_in)`, zero when `t_out ≤ t_in` (the coil only heats).
    pub fn heat_kw(&self, m_da_kg_s: f64, inlet: Air, t_out_c: f64) -> f64 {
        (m_da_kg_s * cp_kj_kgk(inlet.w_kg_kg) * (t_out_c - inlet.t_c)).max(0.0)
    }

    /// Air leaving when the coil gives `q_kw` (≥ 0) to `m_da_kg_s` (> 0): `t_in + q/(m c_p)`.
    pub fn outlet_for_heat(&self, m_da_kg_s: f64, inlet: Air, q_kw: f64) -> Air {
        Air {
            t_c: inlet.t_c + q_kw.max(0.0) / (m_da_kg_s * cp_kj_kgk(inlet.w_kg_kg)),
            w_kg_kg: inlet.w_kg_kg,
        }
    }

    /// Hot-water supply and return temperatures, °C, for air heated from `t_air_in_c` to
    /// `t_air_out_c` in counterflow: supply `t_air_out + approach`; return
    /// `max(supply − water_dt, t_air_in + approach)` (the water cannot leave colder than the
    /// entering air plus the approach). Common practice.
    pub fn water_temperatures_c(&self, t_air_in_c: f64, t_air_out_c: f64) -> (f64, f64) {
        let supply = t_air_out_c + self.approach_k;
        let ret = (supply - self.water_dt_k)
            .max(t_air_in_c + self.approach_k)
            .min(supply);
        (supply, ret)
    }
}

/// Fan shaft-and-motor power, W, from the specific fan power: `P = SFP · V`.
///
/// * `sfp_w_per_m3_s` – specific fan power, W/(m³/s) (EN 16798-3 SFP classes: about
///   1250–2000 for air-handling units with heat recovery, from memory)
/// * `v_m3_s` – volume flow, m³/s
pub fn fan_power_w(sfp_w_per_m3_s: f64, v_m3_s: f64) -> f64 {
    sfp_w_per_m3_s * v_m3_s
}

/// Temperature rise of the air through a fan whose motor sits in the air stream, K: all of
/// the fan power ends as heat in the air, `Δt = P / (m c_p(W))` (kW / (kg/s · kJ/(kg K))).
///
/// * `power_w` – fan power, W; `m_da_kg_s` – dry-air flow, kg/s (> 0); `w_kg_kg` – humidity
///   ratio. Source: ASHRAE Handbook—Fundamentals 2017 ch. 19 (fan heat gain), common practice.
pub fn fan_heat_rise_k(power_w: f64, m_da_kg_s: f64, w_kg_kg: f64) -> f64 {
    power_w / 1000.0 / (m_da_kg_s * cp_kj_kgk(w_kg_kg))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Balanced flows: q = ε C (t_h − t_c); 0.8 · 1 kg/s · (1.006 + 1.86·0.006) · (50 − 20)
    /// = 24.4118 kW; hot out 50 − 24 = 26 °C at ε = 0.8 and equal W (hand calculation).
    #[test]
    fn balanced_wheel_by_hand() {
        let hw = HeatWheel::new(0.8).unwrap();
        let h = Air {
            t_c: 50.0,
            w_kg_kg: 0.006,
        };
        let c = Air {
            t_c: 20.0,
            w_kg_kg: 0.006,
        };
        let o = hw.run(h, 1.0, c, 1.0).unwrap();
        assert!((o.q_kw - 0.8 * (1.006 + 1.86 * 0.006) * 30.0).abs() < 1e-12);
        assert!((o.hot_out.t_c - 26.0).abs() < 1e-12 && (o.cold_out.t_c - 44.0).abs() < 1e-12);
        // Stopped when it would heat the hot side.
        let back = hw.run(c, 1.0, h, 1.0).unwrap();
        assert_eq!(back.q_kw, 0.0);
        assert!(HeatWheel::new(1.5).is_err());
        assert!(hw.run(h, 0.0, c, 1.0).is_err());
    }

    /// SFP 1500 W/(m³/s) at 1 m³/s into 1.2 kg/s of air at 10 g/kg: 1.5/(1.2·1.0246) = 1.22 K.
    #[test]
    fn fan_heat_by_hand() {
        let p = fan_power_w(1500.0, 1.0);
        assert!((fan_heat_rise_k(p, 1.2, 0.01) - 1.5 / (1.2 * 1.0246)).abs() < 1e-12);
    }

    #[test]
    fn coil_water_temperatures() {
        let c = RegenCoil {
            approach_k: 5.0,
            water_dt_k: 15.0,
        };
        assert_eq!(c.water_temperatures_c(40.0, 65.0), (70.0, 55.0));
        assert_eq!(c.water_temperatures_c(60.0, 65.0), (70.0, 65.0));
        let a = Air {
            t_c: 40.0,
            w_kg_kg: 0.01,
        };
        let q = c.heat_kw(2.0, a, 65.0);
        assert!((c.outlet_for_heat(2.0, a, q).t_c - 65.0).abs() < 1e-12);
    }
}
