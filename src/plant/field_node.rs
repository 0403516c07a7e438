//! The collector field's heat capacity in the hour loop: one lumped node (absorbers, fluid in
//! the collectors and the loop's pipes) at the field's mean temperature.
//!
//! ISO 9806:2017's quasi-dynamic model gives the collector's useful power as the steady-state
//! power less `c5 · dϑm/dt` (c5, the effective thermal capacity per m²). Here:
//!
//! * **pump stopped**: the node warms in the sun (or cools at night) towards the no-flow
//!   equilibrium where the absorbed power equals the collector's and the pipes' losses,
//!   `a2 Δ² + (a1 + UA_pipe/A) Δ = S` (`Δ = ϑ − ϑa`, `S` the absorbed power per m²),
//!   `C dΔ/dt = −A (a1 Δ + a2 Δ² + UA_pipe/A · Δ − S)`, integrated over the sub-step as an
//!   exponential relaxation on the secant slope between the node and the equilibrium
//!   (exact at the equilibrium and for `a2 = 0`);
//! * **pump running**: the loop runs at the steady state of the field (solved exactly as
//!   before) and the node relaxes towards that steady state's mean temperature `ϑss` with the
//!   time constant of a well-mixed node flushed by the loop, `τ = C / (2 ṁ cp)` (the outlet of
//!   a node at mean temperature ϑ is `2ϑ − ϑin`); the heat it gives up (or takes, when it is
//!   colder than the steady state, as on a cold morning), `C (ϑ − ϑss)(1 − e^{−Δt/τ})`, is
//!   delivered with the loop's stream.
//!
//! With `C = 0` the node has no memory and the loop is exactly the steady-state model.
//! Sources: ISO 9806:2017, quasi-dynamic model (c5 term; from memory); Duffie & Beckman,
//! *Solar Engineering of Thermal Processes*, 4th ed., §6.12 (collector heat capacity, one-node
//! model and its time constant; from memory).

use crate::components::field::Field;

/// Default heat capacity of the loop's pipes per metre (supply + return), J/(m·K): a water-filled
/// DN 25 copper pipe, 0.49 L/m of water (2.05 kJ/K) and 0.64 kg/m of copper (0.25 kJ/K) (common
/// practice).
pub const DEFAULT_PIPE_CAPACITY_J_MK: f64 = 2300.0;

/// The lumped field node.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldNode {
    /// Node (field mean) temperature, °C.
    pub t_c: f64,
    /// Heat capacity of collectors, fluid and pipes, J/K.
    pub capacity_j_k: f64,
    /// Highest temperature the stopped field is held at, °C: the loop's stagnation
    /// protection (a concentrating field defocuses, a glazed loop drains back or vents) keeps
    /// the fluid at or below the store's collection limit; the heat above it is dumped.
    pub t_max_c: f64,
}

/// The hour's plane irradiance and the outdoors (air, wind, long-wave) seen by the field.
#[derive(Debug, Clone, Copy)]
pub struct Sky {
    pub beam_w_m2: f64,
    pub diffuse_w_m2: f64,
    pub aoi_deg: f64,
    pub amb: crate::components::collector::Ambient,
}

impl FieldNode {
    /// The pump is stopped for `dt_s`: relax towards the no-flow equilibrium (module docs).
    /// Returns the change of the energy held in the field, J.
    pub fn idle(&mut self, field: &Field, sky: &Sky, dt_s: f64) -> f64 {
        if self.capacity_j_k <= 0.0 {
            return 0.0;
        }
        let (d_eq, k) = self.idle_law(field, sky);
        let d0 = self.t_c - sky.amb.t_air_c;
        let d1 = d_eq + (d0 - d_eq) * (-k * dt_s).exp();
        let before = self.t_c;
        self.t_c = (sky.amb.t_air_c + d1).min(self.t_max_c.max(before));
        self.capacity_j_k * (self.t_c - before)
    }

    /// Time, s, until the stopped field's node reaches `t_target_c` on the trajectory of
    /// [`FieldNode::idle`] (`None` if it does not: the target is not between the node and its
    /// no-flow equilibrium). Zero when the node is already there.
    pub fn idle_time_to(&self, field: &Field, sky: &Sky, t_target_c: f64) -> Option<f64> {
        if self.t_c >= t_target_c {
            return Some(0.0);
        }
        if self.capacity_j_k <= 0.0 {
            return None;
        }
        let (d_eq, k) = self.idle_law(field, sky);
        let d0 = self.t_c - sky.amb.t_air_c;
        let dt = t_target_c - sky.amb.t_air_c;
        // Warming towards an equilibrium above the target.
        (d_eq > dt && k > 0.0).then(|| ((d0 - d_eq) / (dt - d_eq)).ln() / k)
    }

    /// The no-flow equilibrium above air, K, and the relaxation rate from the node, 1/s.
    fn idle_law(&self, field: &Field, sky: &Sky) -> (f64, f64) {
        let c = &field.collector;
        let area = field.area_m2();
        // The gain at air temperature (optical gain less the wind and long-wave terms of the
        // quasi-dynamic model; below zero under a cold night sky for an uncovered absorber).
        let s = c.useful_in(
            sky.beam_w_m2,
            sky.diffuse_w_m2,
            sky.aoi_deg,
            sky.amb.t_air_c,
            &sky.amb,
        );
        let ua_pipe_per_m2 = field.pipe.ua_w_mk * field.pipe.length_m / area.max(1e-9);
        let b = c.linear_loss_w_m2k(&sky.amb) + ua_pipe_per_m2;
        let a2 = c.a2_w_m2k2;
        let d_eq = 2.0 * s / (b + (b * b + 4.0 * a2 * s.abs()).sqrt());
        let d0 = self.t_c - sky.amb.t_air_c;
        // Secant slope of the loss `b Δ + a2 |Δ| Δ` between the node and the equilibrium.
        let slope = if (d0 - d_eq).abs() > 1e-12 {
            let f = |d: f64| b * d + a2 * d.abs() * d;
            (f(d0) - f(d_eq)) / (d0 - d_eq)
        } else {
            b + 2.0 * a2 * d_eq.abs()
        };
        (d_eq, area * slope.max(0.0) / self.capacity_j_k)
    }

    /// The pump runs for `dt_s` with the field's steady mean temperature `t_ss_c` and the
    /// loop's capacity rate `mcp_w_k`: the node relaxes towards the steady state and the heat
    /// it gives up is returned, J (negative when the field takes heat to warm up).
    pub fn run(&mut self, t_ss_c: f64, mcp_w_k: f64, dt_s: f64) -> f64 {
        if self.capacity_j_k <= 0.0 || mcp_w_k <= 0.0 {
            self.t_c = t_ss_c;
            return 0.0;
        }
        let tau = self.capacity_j_k / (2.0 * mcp_w_k);
        let f = 1.0 - (-dt_s / tau).exp();
        let release = self.capacity_j_k * (self.t_c - t_ss_c) * f;
        self.t_c -= (self.t_c - t_ss_c) * f;
        release
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::collector::demo_flat_plate;
    use crate::components::pipe::Pipe;

    fn field() -> Field {
        Field {
            collector: demo_flat_plate(),
            in_series: 1,
            rows: 10,
            flow_kg_s_m2: 0.02,
            cp_j_kgk: 4180.0,
            pipe: Pipe {
                length_m: 0.0,
                ua_w_mk: 0.0,
            },
        }
    }

    /// A stopped field under constant irradiance with a linear loss (a2 = 0) warms as the
    /// closed-form exponential of a lumped capacity: `Δ(t) = Δeq + (Δ0 − Δeq) e^{−A a1 t / C}`,
    /// `Δeq = S/a1`, whatever the sub-step (Duffie & Beckman 4th ed. §6.12).
    #[test]
    fn stopped_field_warms_as_a_lumped_capacity() {
        let mut f = field();
        f.collector.a2_w_m2k2 = 0.0;
        let area = f.area_m2();
        let sky = Sky {
            beam_w_m2: 600.0,
            diffuse_w_m2: 200.0,
            aoi_deg: 20.0,
            amb: crate::components::collector::Ambient::still(25.0),
        };
        let s = f
            .collector
            .useful_w_m2(sky.beam_w_m2, sky.diffuse_w_m2, sky.aoi_deg, 25.0, 25.0);
        let a1 = f.collector.a1_w_m2k;
        let cap = 7000.0 * area;
        for steps in [1usize, 4, 60] {
            let mut n = FieldNode {
                t_c: 25.0,
                capacity_j_k: cap,
                t_max_c: f64::INFINITY,
            };
            let mut stored = 0.0;
            for _ in 0..steps {
                stored += n.idle(&f, &sky, 1800.0 / steps as f64);
            }
            let expect = 25.0 + s / a1 * (1.0 - (-area * a1 * 1800.0 / cap).exp());
            assert!(
                (n.t_c - expect).abs() < 1e-9,
                "{steps}: {} vs {expect}",
                n.t_c
            );
            assert!((stored - cap * (n.t_c - 25.0)).abs() < 1e-6);
        }
    }

    /// With the quadratic loss the node still settles exactly at the no-flow temperature of
    /// the steady-state model (pipes without loss), from above and from below.
    #[test]
    fn stopped_field_settles_at_stagnation() {
        let f = field();
        let sky = Sky {
            beam_w_m2: 700.0,
            diffuse_w_m2: 150.0,
            aoi_deg: 30.0,
            amb: crate::components::collector::Ambient::still(30.0),
        };
        let t_stag = f.no_flow_temp_c(700.0, 150.0, 30.0, &sky.amb);
        for t0 in [20.0, 160.0] {
            let mut n = FieldNode {
                t_c: t0,
                capacity_j_k: 7000.0 * f.area_m2(),
                t_max_c: f64::INFINITY,
            };
            for _ in 0..200 {
                n.idle(&f, &sky, 900.0);
            }
            assert!((n.t_c - t_stag).abs() < 1e-6, "{t0}: {} vs {t_stag}", n.t_c);
        }
    }

    /// Flushed by the loop, the node gives up `C (ϑ − ϑss)(1 − e^{−Δt/τ})`, τ = C/(2 ṁ cp):
    /// the energy it loses is what it returns, and two half steps equal one whole.
    #[test]
    fn running_node_releases_its_heat() {
        let cap = 70_000.0;
        let mut a = FieldNode {
            t_c: 90.0,
            capacity_j_k: cap,
            t_max_c: f64::INFINITY,
        };
        let mut b = a;
        let q = a.run(60.0, 800.0, 900.0);
        let tau = cap / 1600.0;
        assert!((q - cap * 30.0 * (1.0 - (-900.0 / tau).exp())).abs() < 1e-6);
        assert!((q - cap * (90.0 - a.t_c)).abs() < 1e-6);
        let q2 = b.run(60.0, 800.0, 450.0) + b.run(60.0, 800.0, 450.0);
        assert!((q - q2).abs() < 1e-6 && (a.t_c - b.t_c).abs() < 1e-12);
        // No capacity: no memory.
        let mut z = FieldNode {
            t_c: 90.0,
            capacity_j_k: 0.0,
            t_max_c: f64::INFINITY,
        };
        assert_eq!(z.run(60.0, 800.0, 900.0), 0.0);
        assert_eq!(z.t_c, 60.0);
    }
}
