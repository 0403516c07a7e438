//! The collector field: `rows` parallel rows of `in_series` identical modules, fed through a
//! supply pipe and drained through a return pipe.
//!
//! Flow bookkeeping: `flow_kg_s_m2` is the field's total mass flow divided by its total area
//! (on the collector's area basis). Each row carries `1/rows` of the flow through
//! `in_series` modules, so each module sees `flow_kg_s_m2 · in_series` per m² of its own area.
//! The pipe length is split half to the supply and half to the return run, both losing heat
//! to the ambient air temperature.

#[cfg(doc)]
use super::collector::CollectorKind;
use super::collector::{Ambient, CollectorSpec};
use super::pipe::Pipe;
use crate::error::Result;
use crate::validate::{count, in_range, positive};

/// A field of identical collector modules.
#[derive(Debug, Clone)]
pub struct Field {
    /// The module.
    pub collector: CollectorSpec,
    /// Modules in series in each row.
    pub in_series: u32,
    /// Parallel rows.
    pub rows: u32,
    /// Total mass flow per m² of total field area (area basis of the collector), kg/(s·m²).
    pub flow_kg_s_m2: f64,
    /// Fluid specific heat, J/(kg·K).
    pub cp_j_kgk: f64,
    /// Supply plus return piping.
    pub pipe: Pipe,
}

/// One steady state of the field with the pump running.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldOutput {
    /// Temperature at the field outlet after the return pipe, °C.
    pub t_out_c: f64,
    /// Heat delivered to the fluid between field inlet and outlet, after pipe losses, W:
    /// `ṁ cp (t_out − t_in)`; negative when the loop loses heat.
    pub q_useful_w: f64,
    /// Heat gained in the collectors alone, W.
    pub q_collectors_w: f64,
    /// Heat lost by the supply and return pipes, W.
    pub q_pipe_loss_w: f64,
    /// Total mass flow, kg/s.
    pub flow_kg_s: f64,
}

impl Field {
    /// Check the field: the collector (keys prefixed `collector.`), `1 ≤ in_series ≤ 50`,
    /// `1 ≤ rows ≤ 10000`, `0 < flow_kg_s_m2 ≤ 0.2` kg/(s·m²) (low-flow systems about 0.004,
    /// high-flow 0.015–0.02, common practice), `1000 ≤ cp_j_kgk ≤ 5000`, and the pipe
    /// (keys prefixed `pipe.`).
    pub fn validate(&self) -> Result<()> {
        self.collector
            .validate()
            .map_err(|e| e.within("", "collector"))?;
        count(
            "in_series",
            self.in_series,
            1,
            50,
            "modules in series per row",
        )?;
        count("rows", self.rows, 1, 10_000, "parallel rows of modules")?;
        positive(
            "flow_kg_s_m2",
            self.flow_kg_s_m2,
            0.2,
            "field mass flow per m² of collector, kg/(s·m²)",
        )?;
        in_range(
            "cp_j_kgk",
            self.cp_j_kgk,
            1000.0,
            5000.0,
            "collector fluid specific heat, J/(kg·K)",
        )?;
        self.pipe.validate().map_err(|e| e.within("", "pipe"))
    }

    /// Total collector area on the collector's area basis, m²: `in_series · rows · A_module`.
    pub fn area_m2(&self) -> f64 {
        self.modules() * self.collector.area_m2()
    }

    /// Total gross area, m²: `in_series · rows · A_gross,module`.
    pub fn gross_m2(&self) -> f64 {
        self.modules() * self.collector.gross_m2
    }

    /// Total mass flow with the pump running, kg/s: `flow_kg_s_m2 · area_m2`.
    pub fn flow_kg_s(&self) -> f64 {
        self.flow_kg_s_m2 * self.area_m2()
    }

    /// Effective thermal capacity of all modules, J/K: `c5 · area_m2`, c5 in J/(m²K) from
    /// `c5_j_m2k` or `1000 · heat_capacity_kj_m2k` ([`CollectorSpec::c5_j_m2k()`]), else the
    /// class default ([`CollectorKind::default_capacity_kj_m2k`]). The plant's field node
    /// carries it (with the pipes').
    pub fn heat_capacity_j_k(&self) -> f64 {
        let c5 = self
            .collector
            .c5_j_m2k()
            .unwrap_or_else(|| 1000.0 * self.collector.kind.default_capacity_kj_m2k());
        c5 * self.area_m2()
    }

    /// Steady state with the pump running: supply pipe (half the length, loss to `ta_c`) →
    /// `in_series` modules each feeding the next ([`CollectorSpec::outlet`], exact
    /// mean-temperature energy balance) → return pipe (other half). Rows in parallel share the
    /// inlet and are identical, so one row is computed.
    ///
    /// * `t_in_c` – field inlet temperature (from the tank or heat exchanger), °C
    /// * `g_beam_w_m2`, `g_diffuse_w_m2` – beam and diffuse irradiance in the collector
    ///   plane, W/m²
    /// * `aoi_deg` – beam angle of incidence, degrees
    /// * `amb` – the hour's air temperature (collectors and pipes), wind speed and long-wave
    ///   irradiance (collectors)
    ///
    /// Returns the outlet temperature and the heat flows. Gains can be negative: whether to
    /// run is the controller's decision. If the flow is zero (e.g. an unvalidated field with
    /// zero rows), nothing leaves: all heat flows are 0 and `t_out_c` is
    /// [`Self::no_flow_temp_c`]. Does not allocate.
    ///
    /// Sources: ISO 9806:2017 quasi-dynamic model without the c5 term
    /// ([`CollectorSpec::outlet_in`], modules); Incropera 7th ed. eq. 8.46 (pipes).
    pub fn run(
        &self,
        t_in_c: f64,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        amb: &Ambient,
    ) -> FieldOutput {
        let ta_c = amb.t_air_c;
        let flow = self.flow_kg_s();
        let c = flow * self.cp_j_kgk;
        if c.is_nan() || c <= 0.0 {
            return FieldOutput {
                t_out_c: self.no_flow_temp_c(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, amb),
                q_useful_w: 0.0,
                q_collectors_w: 0.0,
                q_pipe_loss_w: 0.0,
                flow_kg_s: 0.0,
            };
        }
        let half = 0.5 * self.pipe.length_m;
        let t_supply = self.pipe.outlet_c(t_in_c, flow, self.cp_j_kgk, ta_c, half);
        let module_flow = self.flow_kg_s_m2 * self.in_series as f64;
        let mut t = t_supply;
        let mut q_w_m2 = 0.0;
        for _ in 0..self.in_series {
            let (t_out, q) = self.collector.outlet_in(
                t,
                module_flow,
                self.cp_j_kgk,
                g_beam_w_m2,
                g_diffuse_w_m2,
                aoi_deg,
                amb,
            );
            t = t_out;
            q_w_m2 += q;
        }
        let q_collectors_w = q_w_m2 * self.collector.area_m2() * self.rows as f64;
        let t_out = self.pipe.outlet_c(t, flow, self.cp_j_kgk, ta_c, half);
        let q_pipe_loss_w = c * ((t_in_c - t_supply) + (t - t_out));
        FieldOutput {
            t_out_c: t_out,
            q_useful_w: c * (t_out - t_in_c),
            q_collectors_w,
            q_pipe_loss_w,
            flow_kg_s: flow,
        }
    }

    /// No-flow (pump off) collector mean temperature, °C, for the differential thermostat:
    /// the `tm` at which the collector's useful power is zero (see
    /// [`CollectorSpec::stagnation_in`]: wind and sky terms included). Compare it with the
    /// tank bottom: running can gain heat only if it is warmer.
    ///
    /// * arguments as in [`Self::run`]
    ///
    /// Returns the air temperature without sun under a sky at air temperature. A steady-state
    /// estimate: the absorber's warm-up time (thermal capacity) is not included.
    ///
    /// Source: ISO 9806:2017 quasi-dynamic model without the c5 term, q = 0.
    pub fn no_flow_temp_c(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        amb: &Ambient,
    ) -> f64 {
        self.collector
            .stagnation_in(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, amb)
    }

    fn modules(&self) -> f64 {
        self.in_series as f64 * self.rows as f64
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::collector::demo_flat_plate;

    fn still(ta: f64) -> Ambient {
        Ambient::still(ta)
    }

    fn field(in_series: u32, rows: u32, length_m: f64) -> Field {
        Field {
            collector: demo_flat_plate(),
            in_series,
            rows,
            flow_kg_s_m2: 0.015,
            cp_j_kgk: 4180.0,
            pipe: Pipe {
                length_m,
                ua_w_mk: 0.3,
            },
        }
    }

    #[test]
    fn areas_and_flow() {
        let f = field(3, 4, 20.0);
        f.validate().unwrap();
        assert!((f.area_m2() - 12.0 * 2.3).abs() < 1e-12);
        assert!((f.gross_m2() - 12.0 * 2.5).abs() < 1e-12);
        assert!((f.flow_kg_s() - 0.015 * 27.6).abs() < 1e-12);
        assert!((f.heat_capacity_j_k() - 7000.0 * 27.6).abs() < 1e-9);
    }

    /// Without heat loss (a1 = a2 = 0 bypasses validation on purpose) the arrangement cannot
    /// matter: t_out − t_in = S · A_total / (ṁ cp) exactly, for 1×6, 2×3, 3×2 and 6×1 fields.
    #[test]
    fn lossless_arrangement_invariance() {
        let s = 0.78 * (0.9923 * 0.0 + 0.9 * 500.0); // diffuse only: 351 W/m²
        for (ns, nr) in [(1, 6), (2, 3), (3, 2), (6, 1)] {
            let mut f = field(ns, nr, 0.0);
            f.collector.a1_w_m2k = 0.0;
            f.collector.a2_w_m2k2 = 0.0;
            let out = f.run(40.0, 0.0, 500.0, 0.0, &still(20.0));
            let dt = s * f.area_m2() / (f.flow_kg_s() * f.cp_j_kgk);
            assert!(
                (out.t_out_c - 40.0 - dt).abs() < 1e-12,
                "{ns}x{nr}: {}",
                out.t_out_c
            );
        }
    }

    /// Two modules in series at field flow F per m² ≈ one module of double area at the same
    /// total flow (the same F). Not identical: the mean-temperature model applied to two halves
    /// differs from one whole. For a linear loss (a2 = 0) both are closed forms: with
    /// `T_s = ta + S/a1` and `k = a1 A_total/(2 ṁ cp)`, n equal modules in series give
    /// `t_out = T_s − (T_s − t_in) ((1 − k/n)/(1 + k/n))ⁿ` — asserted to 1e-9 K for n = 1, 2.
    /// The two differ in `ln` by about k³/2, i.e. 2.6 mK for the quadratic demo collector
    /// linearised at this point (k ≈ 0.036); its a2 curvature adds to that, so the quadratic
    /// case is asserted within 10 mK.
    #[test]
    fn two_in_series_equals_double_area() {
        let (tin, gb, gd, aoi, ta) = (50.0, 750.0, 120.0, 25.0, 22.0);
        let double = |f: &Field| {
            let mut one = Field {
                in_series: 1,
                ..f.clone()
            };
            one.collector.aperture_m2 *= 2.0;
            one.collector.gross_m2 *= 2.0;
            one
        };
        // linear collector: exact closed forms
        let mut lin = field(2, 1, 0.0);
        lin.collector.a2_w_m2k2 = 0.0;
        let (two, one) = (
            lin.run(tin, gb, gd, aoi, &still(ta)),
            double(&lin).run(tin, gb, gd, aoi, &still(ta)),
        );
        let c = &lin.collector;
        let s = c.eta0 * (c.iam_beam(aoi) * gb + c.iam_diffuse * gd);
        let t_s = ta + s / c.a1_w_m2k;
        let k = c.a1_w_m2k * lin.area_m2() / (2.0 * lin.flow_kg_s() * lin.cp_j_kgk);
        let closed = |n: f64| t_s - (t_s - tin) * ((1.0 - k / n) / (1.0 + k / n)).powf(n);
        assert!(
            (two.t_out_c - closed(2.0)).abs() < 1e-9,
            "{} vs {}",
            two.t_out_c,
            closed(2.0)
        );
        assert!(
            (one.t_out_c - closed(1.0)).abs() < 1e-9,
            "{} vs {}",
            one.t_out_c,
            closed(1.0)
        );
        assert!((two.flow_kg_s - one.flow_kg_s).abs() < 1e-15);
        // quadratic demo collector: nearly equal
        let quad = field(2, 1, 0.0);
        let (two, one) = (
            quad.run(tin, gb, gd, aoi, &still(ta)),
            double(&quad).run(tin, gb, gd, aoi, &still(ta)),
        );
        assert!(
            (two.t_out_c - one.t_out_c).abs() < 0.01,
            "{} vs {}",
            two.t_out_c,
            one.t_out_c
        );
        assert!(two.t_out_c > tin + 5.0);
    }

    /// Energy bookkeeping: useful = collectors − pipe losses, and useful = ṁ cp ΔT.
    #[test]
    fn energy_bookkeeping() {
        let f = field(3, 5, 60.0);
        let o = f.run(55.0, 650.0, 150.0, 35.0, &still(18.0));
        assert!((o.q_useful_w - (o.q_collectors_w - o.q_pipe_loss_w)).abs() < 1e-6);
        assert!((o.q_useful_w - o.flow_kg_s * 4180.0 * (o.t_out_c - 55.0)).abs() < 1e-9);
        assert!(o.q_pipe_loss_w > 0.0 && o.q_collectors_w > 0.0);
        // hand check of the collector part: sum of module gains q_i = ṁ cp per m² · ΔT_i
        let c = &f.collector;
        let mut t = f.pipe.outlet_c(55.0, o.flow_kg_s, 4180.0, 18.0, 30.0);
        let t0 = t;
        for _ in 0..3 {
            t = c.outlet(t, 0.045, 4180.0, 650.0, 150.0, 35.0, 18.0).0;
        }
        assert!((o.q_collectors_w - o.flow_kg_s * 4180.0 * (t - t0)).abs() < 1e-6);
    }

    /// No sun, no flow, no NaN.
    #[test]
    fn edge_inputs_are_finite() {
        let f = field(2, 2, 30.0);
        let o = f.run(20.0, 0.0, 0.0, 0.0, &still(20.0));
        assert!((o.t_out_c - 20.0).abs() < 1e-12 && o.q_useful_w.abs() < 1e-9);
        let o = f.run(60.0, 0.0, 0.0, 100.0, &still(10.0));
        assert!(o.q_useful_w < 0.0 && o.t_out_c < 60.0 && o.t_out_c > 10.0);
        let mut z = field(2, 2, 30.0);
        z.rows = 0;
        let o = z.run(60.0, 800.0, 100.0, 10.0, &still(20.0));
        assert_eq!(o.q_useful_w, 0.0);
        assert_eq!(
            o.t_out_c,
            z.no_flow_temp_c(800.0, 100.0, 10.0, &still(20.0))
        );
        assert_eq!(f.no_flow_temp_c(0.0, 0.0, 0.0, &still(20.0)), 20.0);
    }

    /// The no-flow temperature is where useful power is zero (D&B/ISO 9806 q = 0).
    #[test]
    fn no_flow_temp_zero_gain() {
        let f = field(1, 1, 0.0);
        let t = f.no_flow_temp_c(700.0, 100.0, 30.0, &still(25.0));
        assert!(f.collector.useful_w_m2(700.0, 100.0, 30.0, t, 25.0).abs() < 1e-9);
    }

    #[test]
    fn validate_prefixes_keys() {
        let mut f = field(2, 2, 30.0);
        f.collector.eta0 = 0.0;
        assert!(
            f.validate()
                .unwrap_err()
                .to_string()
                .contains("collector.eta0")
        );
        let mut f = field(2, 2, 30.0);
        f.pipe.ua_w_mk = -1.0;
        assert!(
            f.validate()
                .unwrap_err()
                .to_string()
                .contains("pipe.ua_w_mk")
        );
        let mut f = field(2, 2, 30.0);
        f.in_series = 0;
        assert!(f.validate().unwrap_err().to_string().contains("in_series"));
    }
}
