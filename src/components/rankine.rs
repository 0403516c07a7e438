//! Rankine engine (organic working fluid or steam) driven by pressurised hot water: pump,
//! evaporator (with optional superheat), expander, optional recuperator, condenser.
//!
//! Cycle (per kg of working fluid), states as in every thermodynamics text:
//! 1 saturated liquid at the condensing temperature; 2 pump outlet at the evaporating
//! pressure, `h2 = h1 + (h2s − h1)/η_p`; 3 evaporator outlet, saturated vapour or superheated
//! by `superheat_k`; 4 expander outlet, `h4 = h3 − η_e (h3 − h4s)`; recuperator (effectiveness
//! ε, on the vapour side, to the pump-outlet temperature): `q_rec = ε [h4 − h(p_cond, T2)]`,
//! `h2r = h2 + q_rec`, `h4r = h4 − q_rec`. Heat in `q_in = h3 − h2r`, net work
//! `w = (h3 − h4) − (h2 − h1)`, heat out `q_out = h4r − h1`, efficiency `η = w / q_in`.
//!
//! Off design (each hour) the evaporating pressure slides with the hot-water supply: the water
//! falls by `dt_water_evap_k` across the evaporating and superheating section and the pinch
//! sits at the bubble point, so `T_evap = t_supply − dt_water_evap_k − pinch_evap_k`, held at
//! or below `t_evap_max_c`. The condensing temperature is the sink's entering temperature
//! plus `approach_cond_k`. Efficiencies of pump and expander are held constant (a screening
//! simplification: real expanders lose efficiency away from their design pressure ratio).
//!
//! Source: cycle analysis as in Y. A. Çengel, M. A. Boles, Thermodynamics: An Engineering
//! Approach, 7th ed., ch. 10 (Rankine cycle with isentropic efficiencies, regeneration);
//! pinch-point method as in common ORC practice (e.g. S. Quoilin et al., "Techno-economic
//! survey of Organic Rankine Cycle systems", Renew. Sust. Energy Rev. 22 (2013) 168–186).

use crate::error::{Error, Result};
use crate::props::fluids::{self, Fluid};
use crate::validate;

const K0: f64 = 273.15;

/// Smallest evaporating-minus-condensing temperature difference at which the engine runs, K
/// (below it the expander's pressure ratio is too small to be worth running; common practice).
pub const MIN_LIFT_K: f64 = 10.0;

/// The thermodynamic cycle of the engine.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RankineCycle {
    pub fluid: Fluid,
    /// Pump isentropic efficiency, (0, 1].
    pub eta_pump: f64,
    /// Expander isentropic efficiency, (0, 1].
    pub eta_expander: f64,
    /// Superheat at the evaporator outlet, K (0 = saturated vapour).
    pub superheat_k: f64,
    /// Recuperator effectiveness, [0, 1) (0 = no recuperator).
    pub recuperator: f64,
}

/// One solved cycle, per kg of working fluid.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RankinePoint {
    pub t_evap_c: f64,
    pub t_cond_c: f64,
    pub p_evap_kpa: f64,
    pub p_cond_kpa: f64,
    /// Enthalpies of states 1, 2, 2r, 3, 4, 4r, kJ/kg.
    pub h_kj_kg: [f64; 6],
    /// Entropies of states 1, 2, 2r, 3, 4, 4r, kJ/(kg·K).
    pub s_kj_kgk: [f64; 6],
    /// Saturated-liquid enthalpy at the evaporating pressure (the pinch point), kJ/kg.
    pub h_bubble_kj_kg: f64,
    /// Temperature entering the evaporator (after pump and recuperator), °C.
    pub t_evap_in_c: f64,
    /// Temperature at the evaporator outlet, °C.
    pub t_evap_out_c: f64,
    pub w_pump_kj_kg: f64,
    pub w_expander_kj_kg: f64,
    pub q_in_kj_kg: f64,
    pub q_out_kj_kg: f64,
    pub q_rec_kj_kg: f64,
    /// Net work over heat in.
    pub eta_th: f64,
    /// Entropy generated inside the cycle (pump, expander, recuperator), kJ/(kg·K), ≥ 0.
    pub s_gen_internal_kj_kgk: f64,
}

impl RankinePoint {
    /// Net work, kJ/kg.
    pub fn w_net_kj_kg(&self) -> f64 {
        self.w_expander_kj_kg - self.w_pump_kj_kg
    }
}

fn check_eff(key: &str, v: f64, meaning: &str) -> Result<()> {
    if v.is_finite() && v > 0.0 && v <= 1.0 {
        Ok(())
    } else {
        Err(Error::input(
            key,
            v,
            format!("must be > 0 and at most 1 ({meaning})"),
        ))
    }
}

impl RankineCycle {
    /// Check every field: efficiencies in (0, 1], superheat 0..50 K, recuperator 0..0.95.
    pub fn validate(&self) -> Result<()> {
        check_eff("eta_pump", self.eta_pump, "pump isentropic efficiency")?;
        check_eff(
            "eta_expander",
            self.eta_expander,
            "expander isentropic efficiency",
        )?;
        validate::in_range(
            "superheat_k",
            self.superheat_k,
            0.0,
            50.0,
            "superheat at the evaporator outlet, K",
        )?;
        validate::in_range(
            "recuperator",
            self.recuperator,
            0.0,
            0.95,
            "recuperator effectiveness, 0 for none",
        )
    }

    /// Solve the cycle between the evaporating and condensing temperatures (module equations).
    ///
    /// * `t_evap_c` – evaporating (saturation) temperature, °C, below the fluid's
    ///   [`Fluid::t_sat_max_c`]
    /// * `t_cond_c` – condensing temperature, °C, at least [`MIN_LIFT_K`] below `t_evap_c`
    ///
    /// Errors: `Input` for bad efficiencies, `OutOfRange` for temperatures outside the fluid
    /// model or a lift below 10 K; `Internal` if the second law is broken (a defect).
    /// Property calls: 2 saturation look-ups, 2 (p, s) flashes, 1–2 (T, p) states.
    pub fn solve(&self, t_evap_c: f64, t_cond_c: f64) -> Result<RankinePoint> {
        self.validate()?;
        let f = self.fluid;
        if !(t_evap_c.is_finite() && t_cond_c.is_finite() && t_evap_c - t_cond_c >= MIN_LIFT_K) {
            return Err(Error::OutOfRange {
                model: "Rankine cycle",
                quantity: "evaporating minus condensing temperature, K",
                value: t_evap_c - t_cond_c,
                range: format!("at least {MIN_LIFT_K} K"),
            });
        }
        let se = fluids::saturation(f, t_evap_c)?;
        let sc = fluids::saturation(f, t_cond_c)?;
        let (pe, pc) = (se.p_kpa, sc.p_kpa);
        let (h1, s1) = (sc.h_liq_kj_kg, sc.s_liq_kj_kgk);
        let st2s = fluids::state_ps(f, pe, s1)?;
        let h2 = h1 + (st2s.h_kj_kg - h1) / self.eta_pump;
        // Pump outlet: from the isentropic state, the dissipated h2 − h2s heats the liquid by
        // (h2 − h2s)/cp and raises its entropy by (h2 − h2s)/T (first order; a fraction of a
        // kelvin), cp from the saturated-liquid line.
        let cp_l = liquid_cp(f, t_cond_c)?;
        let t2 = st2s.t_c + (h2 - st2s.h_kj_kg) / cp_l;
        let s2 = s1 + (h2 - st2s.h_kj_kg) / (st2s.t_c + K0);
        let (h3, s3, t3) = if self.superheat_k > 0.0 {
            let t3 = t_evap_c + self.superheat_k;
            let st = fluids::state_tp(f, t3, pe)?;
            (st.h_kj_kg, st.s_kj_kg_k, t3)
        } else {
            (se.h_vap_kj_kg, se.s_vap_kj_kgk, t_evap_c)
        };
        let st4s = fluids::state_ps(f, pc, s3)?;
        let h4 = h3 - self.eta_expander * (h3 - st4s.h_kj_kg);
        let st4 = fluids::state_ph(f, pc, h4)?;
        let (mut q_rec, mut s2r, mut s4r, mut t_in) = (0.0, s2, st4.s_kj_kg_k, t2);
        if self.recuperator > 0.0 && st4.t_c > t2 {
            let cold = fluids::state_tp(f, t2.max(t_cond_c + 1e-6), pc)?;
            q_rec = (self.recuperator * (h4 - cold.h_kj_kg)).max(0.0);
            let st4r = fluids::state_ph(f, pc, h4 - q_rec)?;
            s4r = st4r.s_kj_kg_k;
            t_in = t2 + q_rec / cp_l;
            s2r = s2 + cp_l * ((t_in + K0) / (t2 + K0)).ln();
        }
        let h2r = h2 + q_rec;
        let h4r = h4 - q_rec;
        let w_p = h2 - h1;
        let w_e = h3 - h4;
        let q_in = h3 - h2r;
        let q_out = h4r - h1;
        let s_gen = (s2 - s1) + (st4.s_kj_kg_k - s3) + (s2r - s2) + (s4r - st4.s_kj_kg_k);
        let eta = (w_e - w_p) / q_in;
        if !(eta.is_finite() && q_in > 0.0) {
            return Err(Error::Internal(format!(
                "Rankine cycle ({}) at {t_evap_c}/{t_cond_c} °C: no heat in",
                f.name()
            )));
        }
        Ok(RankinePoint {
            t_evap_c,
            t_cond_c,
            p_evap_kpa: pe,
            p_cond_kpa: pc,
            h_kj_kg: [h1, h2, h2r, h3, h4, h4r],
            s_kj_kgk: [s1, s2, s2r, s3, st4.s_kj_kg_k, s4r],
            h_bubble_kj_kg: se.h_liq_kj_kg,
            t_evap_in_c: t_in,
            t_evap_out_c: t3,
            w_pump_kj_kg: w_p,
            w_expander_kj_kg: w_e,
            q_in_kj_kg: q_in,
            q_out_kj_kg: q_out,
            q_rec_kj_kg: q_rec,
            eta_th: eta,
            s_gen_internal_kj_kgk: s_gen,
        })
    }
}

/// Saturated-liquid heat capacity, kJ/(kg·K), by a central difference of the saturated-liquid
/// enthalpy over ±1 K (close to cp far from the critical point).
fn liquid_cp(f: Fluid, t_c: f64) -> Result<f64> {
    let lo = (t_c - 1.0).max(f.t_min_c());
    let hi = t_c + 1.0;
    let a = fluids::saturation(f, lo)?;
    let b = fluids::saturation(f, hi)?;
    Ok((b.h_liq_kj_kg - a.h_liq_kj_kg) / (hi - lo))
}

/// The engine with its heat exchangers, as sized for a plant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RankineEngine {
    pub cycle: RankineCycle,
    /// Hot-water temperature drop across the evaporating and superheating section, K.
    pub dt_water_evap_k: f64,
    /// Pinch (water minus fluid at the bubble point), K.
    pub pinch_evap_k: f64,
    /// Condensing temperature minus the sink's entering temperature, K.
    pub approach_cond_k: f64,
    /// Highest evaporating temperature, °C.
    pub t_evap_max_c: f64,
}

/// The engine at one hour's temperatures.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EngineOp {
    pub point: RankinePoint,
    /// Hot-water supply, °C.
    pub t_supply_c: f64,
    /// Hot-water return, °C.
    pub t_return_c: f64,
    /// Sink entering temperature, °C.
    pub t_sink_c: f64,
    /// Carnot efficiency between the hot-water supply and the sink, `1 − T_sink / T_supply`.
    pub eta_carnot: f64,
}

impl RankineEngine {
    /// Check every field (keys relative to the engine's section).
    pub fn validate(&self) -> Result<()> {
        self.cycle.validate()?;
        validate::in_range(
            "dt_water_evap_k",
            self.dt_water_evap_k,
            1.0,
            40.0,
            "hot-water drop across the evaporating section, K",
        )?;
        validate::in_range(
            "pinch_evap_k",
            self.pinch_evap_k,
            1.0,
            30.0,
            "evaporator pinch, K",
        )?;
        validate::in_range(
            "approach_cond_k",
            self.approach_cond_k,
            2.0,
            30.0,
            "condensing minus sink entering temperature, K",
        )?;
        let f = self.cycle.fluid;
        validate::in_range(
            "t_evap_max_c",
            self.t_evap_max_c,
            f.t_min_c() + MIN_LIFT_K,
            f.t_sat_max_c() - 2.0,
            "highest evaporating temperature of the working fluid, °C",
        )?;
        if self.cycle.superheat_k > self.dt_water_evap_k + self.pinch_evap_k {
            return Err(Error::input(
                "superheat_k",
                self.cycle.superheat_k,
                format!(
                    "must be at most dt_water_evap_k + pinch_evap_k = {} K (the vapour cannot leave hotter than the water enters)",
                    self.dt_water_evap_k + self.pinch_evap_k
                ),
            ));
        }
        Ok(())
    }

    /// Evaporating temperature the hot water at `t_supply_c` allows, °C:
    /// `min(t_supply − dt_water_evap − pinch, t_evap_max)`.
    pub fn t_evap_c(&self, t_supply_c: f64) -> f64 {
        (t_supply_c - self.dt_water_evap_k - self.pinch_evap_k).min(self.t_evap_max_c)
    }

    /// Lowest hot-water supply at which the engine runs, °C, for sink `t_sink_c`: the supply
    /// giving an evaporating temperature [`MIN_LIFT_K`] above condensing.
    pub fn t_supply_min_c(&self, t_sink_c: f64) -> f64 {
        t_sink_c + self.approach_cond_k + MIN_LIFT_K + self.dt_water_evap_k + self.pinch_evap_k
    }

    /// Hottest useful supply, °C: the one that reaches `t_evap_max_c`.
    pub fn t_supply_max_c(&self) -> f64 {
        self.t_evap_max_c + self.dt_water_evap_k + self.pinch_evap_k
    }

    /// Operate the engine with hot water at `t_supply_c` and the sink at `t_sink_c` (module
    /// rule for the evaporating and condensing temperatures).
    ///
    /// Water return: energy balance of the preheating section below the pinch,
    /// `t_return = T_evap + pinch − dt_water_evap · (h_bubble − h_2r)/(h_3 − h_bubble)`, held at
    /// least `pinch` above the liquid entering (then the cold end pinches and the water flow
    /// rises; a conservative simplification).
    ///
    /// Errors: `Input` when `t_supply_c ≤ t_sink_c` (source colder than sink) or either is not
    /// finite; `OutOfRange` when the supply is below [`Self::t_supply_min_c`]; `Internal` when
    /// the result would beat Carnot between supply and sink (a defect, asserted every call).
    pub fn operate(&self, t_supply_c: f64, t_sink_c: f64) -> Result<EngineOp> {
        if !(t_supply_c.is_finite() && t_sink_c.is_finite()) || t_supply_c <= t_sink_c {
            return Err(Error::input(
                "t_supply_c",
                t_supply_c,
                format!(
                    "must be finite and above the sink temperature {t_sink_c} °C (source colder than sink)"
                ),
            ));
        }
        let t_min = self.t_supply_min_c(t_sink_c);
        if t_supply_c < t_min - 1e-9 {
            return Err(Error::OutOfRange {
                model: "Rankine engine",
                quantity: "hot-water supply temperature, °C",
                value: t_supply_c,
                range: format!("at least {t_min:.2} °C at a sink of {t_sink_c} °C"),
            });
        }
        let t_evap = self.t_evap_c(t_supply_c);
        let t_cond = t_sink_c + self.approach_cond_k;
        let pt = self.cycle.solve(t_evap, t_cond)?;
        let q_evsh = pt.h_kj_kg[3] - pt.h_bubble_kj_kg;
        let q_pre = pt.h_bubble_kj_kg - pt.h_kj_kg[2];
        let t_pinch_water = t_evap + self.pinch_evap_k;
        let dt_hot = (t_supply_c - t_pinch_water).max(self.dt_water_evap_k);
        let t_return =
            (t_pinch_water - dt_hot * q_pre / q_evsh).max(pt.t_evap_in_c + self.pinch_evap_k);
        let eta_carnot = 1.0 - (t_sink_c + K0) / (t_supply_c + K0);
        if pt.eta_th > eta_carnot || pt.s_gen_internal_kj_kgk < -1e-9 {
            return Err(Error::Internal(format!(
                "Rankine engine: efficiency {} above Carnot {} (or negative entropy generation {})",
                pt.eta_th, eta_carnot, pt.s_gen_internal_kj_kgk
            )));
        }
        Ok(EngineOp {
            point: pt,
            t_supply_c,
            t_return_c: t_return.min(t_pinch_water),
            t_sink_c,
            eta_carnot,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn cycle(f: Fluid) -> RankineCycle {
        RankineCycle {
            fluid: f,
            eta_pump: 0.6,
            eta_expander: 0.75,
            superheat_k: 5.0,
            recuperator: 0.0,
        }
    }

    fn engine() -> RankineEngine {
        RankineEngine {
            cycle: cycle(Fluid::R245fa),
            dt_water_evap_k: 8.0,
            pinch_evap_k: 5.0,
            approach_cond_k: 10.0,
            t_evap_max_c: 120.0,
        }
    }

    /// First law per kg: q_in − q_out = w_net (closes to rounding).
    #[test]
    fn first_law_closes() {
        for f in [
            Fluid::R245fa,
            Fluid::NPentane,
            Fluid::R1233zdE,
            Fluid::Toluene,
            Fluid::Water,
        ] {
            let mut c = cycle(f);
            c.recuperator = 0.6;
            let p = c.solve(100.0, 35.0).unwrap();
            assert!(
                (p.q_in_kj_kg - p.q_out_kj_kg - p.w_net_kj_kg()).abs() < 1e-9,
                "{f:?}"
            );
            assert!(p.s_gen_internal_kj_kgk >= 0.0);
        }
    }

    /// A recuperator raises the efficiency of a dry fluid (R245fa leaves the expander
    /// superheated); Çengel & Boles 7th ed. §10-6 (regeneration raises η).
    #[test]
    fn recuperator_helps_dry_fluid() {
        let a = cycle(Fluid::R245fa).solve(110.0, 35.0).unwrap();
        let mut c = cycle(Fluid::R245fa);
        c.recuperator = 0.7;
        let b = c.solve(110.0, 35.0).unwrap();
        assert!(b.eta_th > a.eta_th + 0.005, "{} {}", a.eta_th, b.eta_th);
        assert!((b.w_net_kj_kg() - a.w_net_kj_kg()).abs() < 1e-9);
    }

    /// Steam is a wet fluid: from saturated or slightly superheated vapour the expansion ends
    /// inside the dome (Çengel & Boles 7th ed. Example 10-1: x4 = 0.886), so the recuperator
    /// finds nothing to recover and leaves the cycle unchanged.
    #[test]
    fn steam_expansion_ends_wet() {
        let a = cycle(Fluid::Water).solve(150.0, 40.0).unwrap();
        let mut c = cycle(Fluid::Water);
        c.recuperator = 0.7;
        let b = c.solve(150.0, 40.0).unwrap();
        let x4 = fluids::state_ph(Fluid::Water, a.p_cond_kpa, a.h_kj_kg[4])
            .unwrap()
            .q;
        assert!(x4.is_some_and(|x| x > 0.8 && x < 1.0), "{x4:?}");
        assert_eq!(b.q_rec_kj_kg, 0.0);
        assert_eq!(a.eta_th, b.eta_th);
    }

    /// Sliding evaporation: 100 °C water → T_evap = 100 − 8 − 5 = 87 °C; capped at 120 °C.
    #[test]
    fn evaporating_temperature_follows_source() {
        let e = engine();
        assert!((e.t_evap_c(100.0) - 87.0).abs() < 1e-12);
        assert!((e.t_evap_c(160.0) - 120.0).abs() < 1e-12);
        let op = e.operate(100.0, 28.0).unwrap();
        assert!(op.t_return_c < op.t_supply_c && op.t_return_c > 38.0);
        assert!(op.point.eta_th < op.eta_carnot);
    }

    #[test]
    fn bad_input_errors() {
        let e = engine();
        assert!(e.operate(25.0, 30.0).is_err()); // source colder than sink
        assert!(e.operate(50.0, 30.0).is_err()); // below the minimum supply
        assert!(e.operate(f64::NAN, 30.0).is_err());
        for v in [0.0, -0.1, 1.01, f64::NAN] {
            let mut c = cycle(Fluid::R245fa);
            c.eta_expander = v;
            assert!(c.solve(100.0, 35.0).is_err(), "{v}");
            let mut c = cycle(Fluid::R245fa);
            c.eta_pump = v;
            assert!(c.validate().is_err(), "{v}");
        }
        // Outside the EOS region: evaporating above Tc of R245fa (153.9 °C).
        assert!(cycle(Fluid::R245fa).solve(170.0, 35.0).is_err());
        let mut bad = engine();
        bad.cycle.superheat_k = 20.0;
        assert!(bad.validate().is_err());
    }

    /// First and second law at one operating point: energy closes, no negative entropy
    /// generation inside, below Carnot, and the surroundings' entropy rises (heat out at the
    /// sink, in from the supply).
    fn laws(
        e: &RankineEngine,
        t_supply: f64,
        t_sink: f64,
    ) -> std::result::Result<(), TestCaseError> {
        let op = e.operate(t_supply, t_sink).unwrap();
        let p = op.point;
        prop_assert!((p.q_in_kj_kg - p.q_out_kj_kg - p.w_net_kj_kg()).abs() < 1e-8);
        prop_assert!(p.s_gen_internal_kj_kgk >= -1e-9);
        prop_assert!(p.eta_th > 0.0 && p.eta_th < op.eta_carnot);
        let s_gen = p.q_out_kj_kg / (t_sink + K0) - p.q_in_kj_kg / (t_supply + K0);
        prop_assert!(s_gen > 0.0);
        Ok(())
    }

    proptest! {
        /// First and second law for every solved cycle: energy closes, no negative entropy
        /// generation inside, and never above Carnot between supply and sink.
        #[test]
        fn laws_hold(t_supply in 75.0f64..150.0, t_sink in 15.0f64..40.0,
                     ep in 0.3f64..1.0, ee in 0.4f64..1.0, sh in 0.0f64..10.0, rec in 0.0f64..0.9) {
            let mut e = engine();
            e.cycle.eta_pump = ep;
            e.cycle.eta_expander = ee;
            e.cycle.superheat_k = sh;
            e.cycle.recuperator = rec;
            prop_assume!(t_supply >= e.t_supply_min_c(t_sink));
            laws(&e, t_supply, t_sink)?;
        }

        /// The same laws for a steam engine (IAPWS-IF97) up to 220 °C supply.
        #[test]
        fn laws_hold_steam(t_supply in 90.0f64..220.0, t_sink in 15.0f64..40.0,
                           ep in 0.3f64..1.0, ee in 0.4f64..1.0, sh in 0.0f64..10.0) {
            let mut e = engine();
            e.cycle = cycle(Fluid::Water);
            e.cycle.eta_pump = ep;
            e.cycle.eta_expander = ee;
            e.cycle.superheat_k = sh;
            e.t_evap_max_c = 200.0;
            prop_assume!(t_supply >= e.t_supply_min_c(t_sink));
            laws(&e, t_supply, t_sink)?;
        }
    }
}
