//! Vapour-compression chiller from its refrigerant cycle: evaporator, compressor (isentropic
//! efficiency), condenser, expansion valve.
//!
//! States: 1 compressor suction, saturated vapour at the evaporating temperature plus
//! `superheat_k`; 2 discharge, `h2 = h1 + (h2s − h1)/η_c`, `h2s = h(p_cond, s1)`; 3 condenser
//! outlet, saturated liquid minus `subcool_k`; 4 after the throttle, `h4 = h3`.
//! `q_evap = h1 − h4`, `w = h2 − h1`, `q_cond = h2 − h3`, `COP = q_evap / w`.
//!
//! Off design: evaporating = chilled-water supply − `approach_evap_k`, condensing = sink
//! entering + `approach_cond_k`. Capacity scales with the volumetric cooling effect of a
//! fixed-displacement compressor at constant volumetric efficiency:
//! `Q = Q_design · (ρ1 q_evap) / (ρ1 q_evap)_design`.
//!
//! Source: Çengel & Boles, Thermodynamics: An Engineering Approach, 7th ed., §11-3/11-4 (ideal
//! and actual vapour-compression cycles); volumetric capacity: ASHRAE Handbook—Refrigeration,
//! ch. on compressors (capacity ∝ displacement × suction density × refrigerating effect;
//! from memory).

use crate::error::{Error, Result};
use crate::props::fluids::{self, Fluid};
use crate::validate;

const K0: f64 = 273.15;
/// Smallest condensing-minus-evaporating difference the model accepts, K.
pub const MIN_LIFT_K: f64 = 5.0;

/// The refrigerant cycle.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct VcCycle {
    pub fluid: Fluid,
    /// Compressor isentropic efficiency, (0, 1].
    pub eta_compressor: f64,
    /// Suction superheat, K.
    pub superheat_k: f64,
    /// Condenser-outlet subcooling, K.
    pub subcool_k: f64,
}

/// One solved cycle per kg of refrigerant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct VcPoint {
    pub t_evap_c: f64,
    pub t_cond_c: f64,
    pub p_evap_kpa: f64,
    pub p_cond_kpa: f64,
    /// Enthalpies of states 1..4, kJ/kg.
    pub h_kj_kg: [f64; 4],
    /// Entropies of states 1..3, kJ/(kg·K) (4 follows from the throttle).
    pub s_kj_kgk: [f64; 3],
    /// Discharge temperature, °C.
    pub t_discharge_c: f64,
    /// Suction density, kg/m³.
    pub rho_suction_kg_m3: f64,
    pub q_evap_kj_kg: f64,
    pub w_kj_kg: f64,
    pub q_cond_kj_kg: f64,
    pub cop: f64,
    /// Entropy generated inside (compressor + throttle), kJ/(kg·K), ≥ 0.
    pub s_gen_internal_kj_kgk: f64,
}

impl VcCycle {
    /// Check every field: compressor efficiency in (0, 1], superheat 0..30 K, subcooling
    /// 0..20 K.
    pub fn validate(&self) -> Result<()> {
        if !(self.eta_compressor.is_finite()
            && self.eta_compressor > 0.0
            && self.eta_compressor <= 1.0)
        {
            return Err(Error::input(
                "eta_compressor",
                self.eta_compressor,
                "must be > 0 and at most 1 (compressor isentropic efficiency)",
            ));
        }
        validate::in_range(
            "superheat_k",
            self.superheat_k,
            0.0,
            30.0,
            "suction superheat, K",
        )?;
        validate::in_range(
            "subcool_k",
            self.subcool_k,
            0.0,
            20.0,
            "condenser subcooling, K",
        )
    }

    /// Solve the cycle (module equations).
    ///
    /// * `t_evap_c`, `t_cond_c` – saturation temperatures, °C, within the fluid's saturation
    ///   table, condensing at least [`MIN_LIFT_K`] above evaporating
    ///
    /// Errors: `Input` for bad fields, `OutOfRange` outside the fluid model or lift < 5 K.
    /// Property calls: 2 saturation look-ups, 1 (p, s) flash, 2–3 (T, p) states or flashes.
    pub fn solve(&self, t_evap_c: f64, t_cond_c: f64) -> Result<VcPoint> {
        self.validate()?;
        let f = self.fluid;
        if !(t_evap_c.is_finite() && t_cond_c.is_finite() && t_cond_c - t_evap_c >= MIN_LIFT_K) {
            return Err(Error::OutOfRange {
                model: "vapour-compression cycle",
                quantity: "condensing minus evaporating temperature, K",
                value: t_cond_c - t_evap_c,
                range: format!("at least {MIN_LIFT_K} K"),
            });
        }
        let se = fluids::saturation(f, t_evap_c)?;
        let sc = fluids::saturation(f, t_cond_c)?;
        let (pe, pc) = (se.p_kpa, sc.p_kpa);
        let (h1, s1, rho1) = if self.superheat_k > 0.0 {
            let st = fluids::state_tp(f, t_evap_c + self.superheat_k, pe)?;
            (st.h_kj_kg, st.s_kj_kg_k, st.rho_kg_m3)
        } else {
            (se.h_vap_kj_kg, se.s_vap_kj_kgk, 1.0 / se.v_vap_m3_kg)
        };
        let st2s = fluids::state_ps(f, pc, s1)?;
        let h2 = h1 + (st2s.h_kj_kg - h1) / self.eta_compressor;
        let st2 = if self.eta_compressor < 1.0 {
            fluids::state_ph(f, pc, h2)?
        } else {
            st2s
        };
        let (h3, s3) = if self.subcool_k > 0.0 {
            let st = fluids::state_tp(f, t_cond_c - self.subcool_k, pc)?;
            (st.h_kj_kg, st.s_kj_kg_k)
        } else {
            (sc.h_liq_kj_kg, sc.s_liq_kj_kgk)
        };
        let h4 = h3;
        // Entropy after the throttle: the two-phase mixture at p_evap with h4.
        let st4 = fluids::state_ph(f, pe, h4)?;
        let s_gen = (st2.s_kj_kg_k - s1) + (st4.s_kj_kg_k - s3);
        let q_e = h1 - h4;
        let w = h2 - h1;
        if !(q_e > 0.0 && w > 0.0) {
            return Err(Error::Internal(format!(
                "vapour-compression cycle ({}) at {t_evap_c}/{t_cond_c} °C: no refrigerating effect",
                f.name()
            )));
        }
        Ok(VcPoint {
            t_evap_c,
            t_cond_c,
            p_evap_kpa: pe,
            p_cond_kpa: pc,
            h_kj_kg: [h1, h2, h3, h4],
            s_kj_kgk: [s1, st2.s_kj_kg_k, s3],
            t_discharge_c: st2.t_c,
            rho_suction_kg_m3: rho1,
            q_evap_kj_kg: q_e,
            w_kj_kg: w,
            q_cond_kj_kg: h2 - h3,
            cop: q_e / w,
            s_gen_internal_kj_kgk: s_gen,
        })
    }
}

/// A chiller sized at a design point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct VcChiller {
    pub cycle: VcCycle,
    /// Chilled-water supply minus evaporating temperature, K.
    pub approach_evap_k: f64,
    /// Condensing minus sink entering temperature, K.
    pub approach_cond_k: f64,
    /// Cooling capacity at the design point, kW.
    pub capacity_design_kw: f64,
    /// Volumetric cooling effect ρ1·q_evap at the design point, kJ/m³.
    pub vol_effect_design_kj_m3: f64,
}

/// The chiller at one hour's temperatures.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ChillerOp {
    pub point: VcPoint,
    /// Full-load capacity at these temperatures, kW.
    pub capacity_kw: f64,
    /// Carnot COP between the chilled water and the sink, `T_chw / (T_sink − T_chw)`.
    pub cop_carnot: f64,
}

impl VcChiller {
    /// Size a chiller of `capacity_design_kw` at chilled water `t_chw_design_c` and sink
    /// `t_sink_design_c` (°C). Errors as [`VcCycle::solve`]; `Input` for approaches outside
    /// 0.5..15 K (evaporator) / 2..30 K (condenser) or capacity outside (0, 1e5] kW.
    pub fn size(
        cycle: VcCycle,
        approach_evap_k: f64,
        approach_cond_k: f64,
        capacity_design_kw: f64,
        t_chw_design_c: f64,
        t_sink_design_c: f64,
    ) -> Result<VcChiller> {
        validate::in_range(
            "approach_evap_k",
            approach_evap_k,
            0.5,
            15.0,
            "chilled water minus evaporating temperature, K",
        )?;
        validate::in_range(
            "approach_cond_k",
            approach_cond_k,
            2.0,
            30.0,
            "condensing minus sink entering temperature, K",
        )?;
        validate::positive(
            "capacity_kw",
            capacity_design_kw,
            1e5,
            "chiller design cooling capacity, kW",
        )?;
        let p = cycle.solve(
            t_chw_design_c - approach_evap_k,
            t_sink_design_c + approach_cond_k,
        )?;
        Ok(VcChiller {
            cycle,
            approach_evap_k,
            approach_cond_k,
            capacity_design_kw,
            vol_effect_design_kj_m3: p.rho_suction_kg_m3 * p.q_evap_kj_kg,
        })
    }

    /// The chiller at chilled-water supply `t_chw_c` and sink entering `t_sink_c` (°C): cycle,
    /// capacity and Carnot COP. Error `Input` when the sink is not above the chilled water;
    /// `Internal` if the COP would beat Carnot (asserted every call).
    pub fn operate(&self, t_chw_c: f64, t_sink_c: f64) -> Result<ChillerOp> {
        if !(t_chw_c.is_finite() && t_sink_c.is_finite()) || t_sink_c <= t_chw_c {
            return Err(Error::input(
                "t_sink_c",
                t_sink_c,
                format!("must be finite and above the chilled-water temperature {t_chw_c} °C"),
            ));
        }
        let p = self.cycle.solve(
            t_chw_c - self.approach_evap_k,
            t_sink_c + self.approach_cond_k,
        )?;
        let cop_carnot = (t_chw_c + K0) / (t_sink_c - t_chw_c);
        if p.cop > cop_carnot || p.s_gen_internal_kj_kgk < -1e-9 {
            return Err(Error::Internal(format!(
                "vapour-compression chiller: COP {} above Carnot {cop_carnot}",
                p.cop
            )));
        }
        Ok(ChillerOp {
            capacity_kw: self.capacity_design_kw * p.rho_suction_kg_m3 * p.q_evap_kj_kg
                / self.vol_effect_design_kj_m3,
            point: p,
            cop_carnot,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn cyc(f: Fluid) -> VcCycle {
        VcCycle {
            fluid: f,
            eta_compressor: 0.75,
            superheat_k: 5.0,
            subcool_k: 3.0,
        }
    }

    /// First law: q_cond = q_evap + w.
    #[test]
    fn first_law_closes() {
        for f in [Fluid::R134a, Fluid::R32, Fluid::R290, Fluid::R1234zeE] {
            let p = cyc(f).solve(3.0, 40.0).unwrap();
            assert!((p.q_cond_kj_kg - p.q_evap_kj_kg - p.w_kj_kg).abs() < 1e-9);
            assert!(p.s_gen_internal_kj_kgk > 0.0);
            assert!(p.t_discharge_c > 40.0);
        }
    }

    /// Capacity falls as the sink warms (suction unchanged, more flash gas) and rises with
    /// warmer chilled water (denser suction gas): the direction of every catalogue table.
    #[test]
    fn capacity_follows_conditions() {
        let c = VcChiller::size(cyc(Fluid::R134a), 3.0, 8.0, 100.0, 7.0, 29.4).unwrap();
        let a = c.operate(7.0, 29.4).unwrap();
        assert!((a.capacity_kw - 100.0).abs() < 1e-9);
        assert!(c.operate(7.0, 35.0).unwrap().capacity_kw < 100.0);
        assert!(c.operate(10.0, 29.4).unwrap().capacity_kw > 100.0);
    }

    #[test]
    fn bad_input_errors() {
        for v in [0.0, 1.2, f64::NAN] {
            let mut c = cyc(Fluid::R134a);
            c.eta_compressor = v;
            assert!(c.solve(0.0, 40.0).is_err());
        }
        assert!(cyc(Fluid::R134a).solve(0.0, 2.0).is_err());
        assert!(cyc(Fluid::R32).solve(0.0, 90.0).is_err()); // above Tc of R32 (78.1 °C)
        let c = VcChiller::size(cyc(Fluid::R134a), 3.0, 8.0, 100.0, 7.0, 29.4).unwrap();
        assert!(c.operate(7.0, 5.0).is_err());
        assert!(VcChiller::size(cyc(Fluid::R134a), 3.0, 8.0, 0.0, 7.0, 29.4).is_err());
    }

    proptest! {
        /// Laws for every solved cycle: energy closes, entropy generated ≥ 0, COP below Carnot.
        #[test]
        fn laws_hold(t_chw in 4.0f64..15.0, t_sink in 18.0f64..45.0, eta in 0.4f64..1.0,
                     sh in 0.0f64..10.0, sc in 0.0f64..8.0) {
            let cycle = VcCycle { fluid: Fluid::R290, eta_compressor: eta, superheat_k: sh, subcool_k: sc };
            let c = VcChiller::size(cycle, 3.0, 6.0, 50.0, 7.0, 30.0).unwrap();
            let op = c.operate(t_chw, t_sink).unwrap();
            let p = op.point;
            prop_assert!((p.q_cond_kj_kg - p.q_evap_kj_kg - p.w_kj_kg).abs() < 1e-8);
            prop_assert!(p.s_gen_internal_kj_kgk >= -1e-9);
            prop_assert!(p.cop > 0.0 && p.cop < op.cop_carnot);
        }
    }
}
