//! Stratified water tank: N fully mixed nodes stacked top to bottom, explicit in time with
//! internal sub-steps.
//!
//! Method: the multinode stratified tank of Duffie & Beckman, Solar Engineering of Thermal
//! Processes, 4th ed. (2013), §8.4: each node is a fully mixed volume; streams are carried by
//! first-order upwind plug flow from node to node; each node loses heat to the room through its
//! share of the tank's UA (by surface area); after every sub-step, any node colder than the one
//! below it is mixed with it (buoyancy), conserving energy.
//!
//! Node 0 is the top. All nodes have the same mass `ρ V / N`. Stored energy is exactly
//! `Σ m_i cp (T_i − T_ref)` with the constant `ρ` and `cp` the caller gives, so the energy
//! balance `Σ q_in + q_aux − q_loss − Δstored` closes to rounding.
//!
//! Nothing here allocates: state and scratch are fixed arrays of [`MAX_NODES`].

use crate::error::{Error, Result};
use crate::validate::{count, in_range, positive};

/// Most nodes a tank may have.
pub const MAX_NODES: usize = 50;
/// Most streams one step can carry.
pub const MAX_STREAMS: usize = 4;

/// A tank's geometry, losses, discretisation and fluid properties.
#[derive(Debug, Clone)]
pub struct TankSpec {
    /// Water volume, m³.
    pub volume_m3: f64,
    /// Height of the (vertical cylindrical) tank, m.
    pub height_m: f64,
    /// Loss coefficient of the whole tank to the room, W/K, shared among nodes by surface area.
    pub ua_w_k: f64,
    /// Number of nodes, 1..=50 (1 = fully mixed).
    pub nodes: usize,
    /// Uniform starting temperature, °C.
    pub t_init_c: f64,
    /// Specific heat of the water, J/(kg·K) (from `props::water` at the design mean temperature).
    pub cp_j_kgk: f64,
    /// Density of the water, kg/m³ (from `props::water` at the design mean temperature).
    pub rho_kg_m3: f64,
}

/// Where a stream enters the tank.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Inlet {
    /// Enters the top node, flows down, leaves from the bottom node (the charging loop).
    Top,
    /// Enters the bottom node, flows up, leaves from the top node (the discharge/return side).
    Bottom,
    /// Inlet stratifier. A stream at least as warm as the tank's mean temperature (at the start
    /// of the sub-step) is a charging stream: it enters the highest node colder than itself (the
    /// bottom node if none is), flows down and leaves from the bottom. A stream colder than the
    /// mean is a return: it enters the lowest node warmer than itself (the top node if none is),
    /// flows up and leaves from the top. (Duffie & Beckman 4th ed. §8.4 control functions.)
    Stratified,
    /// Charging stratifier: whatever its temperature, the stream enters the highest node colder
    /// than itself (the bottom node if none is), flows down and leaves from the bottom — the
    /// collector loop's return always draws from the bottom, and lukewarm collector water never
    /// stirs the hot top.
    StratifiedCharge,
    /// Return stratifier for a draw: whatever its temperature, the return enters the lowest
    /// node warmer than itself (the top node if none is), flows up and leaves from the top — a
    /// warm return never heats the bottom the collector loop draws from.
    StratifiedReturn,
}

/// A stream through the tank during a step: `flow_kg_s` enters at `inlet` at `t_in_c`; the same
/// mass leaves at the other end.
#[derive(Debug, Clone, Copy)]
pub struct Stream {
    /// Mass flow, kg/s (≥ 0; zero, negative or non-finite is treated as no flow by [`Tank::step`]).
    pub flow_kg_s: f64,
    /// Inlet temperature, °C.
    pub t_in_c: f64,
    /// Where it enters.
    pub inlet: Inlet,
}

/// What one step did. Per-stream arrays follow the order of the `streams` slice; unused slots
/// are 0.
#[derive(Debug, Clone, Copy, Default)]
pub struct StepResult {
    /// Heat each stream delivered into the tank, J: `∫ ṁ cp (t_in − t_out) dt`; negative when
    /// the stream takes heat out.
    pub q_in_j: [f64; 4],
    /// Flow-weighted mean outlet temperature of each stream over the step, °C. For a stream
    /// with no flow: the temperature of the node it would leave from, at the end of the step.
    pub t_out_c: [f64; 4],
    /// Heat lost to the room, J (negative if the room is warmer than the tank).
    pub q_loss_j: f64,
    /// Heat added by the auxiliary element in the top node, J.
    pub q_aux_j: f64,
    /// Change of stored energy, J.
    pub delta_stored_j: f64,
    /// Internal sub-steps taken.
    pub substeps: u32,
}

/// State of a stratified tank.
#[derive(Debug, Clone)]
pub struct Tank {
    n: usize,
    t_c: [f64; MAX_NODES],
    ua_node_w_k: [f64; MAX_NODES],
    m_node_kg: f64,
    cp_j_kgk: f64,
}

/// Heat to change a fully mixed volume of water by `delta_t_k`, J.
///
/// `Q = V ρ cp ΔT`.
///
/// * `volume_m3` – volume, m³
/// * `rho_kg_m3` – density, kg/m³
/// * `cp_j_kgk` – specific heat, J/(kg·K)
/// * `delta_t_k` – temperature change, K (negative gives negative heat)
///
/// Source: definition of specific heat (constant ρ, cp over the interval).
pub fn energy_to_heat_j(volume_m3: f64, rho_kg_m3: f64, cp_j_kgk: f64, delta_t_k: f64) -> f64 {
    volume_m3 * rho_kg_m3 * cp_j_kgk * delta_t_k
}

impl TankSpec {
    /// Check every field: volume (0, 10 000] m³, height (0, 50] m, UA [0, 1e5] W/K, nodes
    /// 1..=50, start temperature [0, 200] °C, cp (0, 10 000] J/(kg·K), density (0, 2000] kg/m³.
    ///
    /// Returns an `Input` error naming the key (`volume_m3`, `height_m`, `ua_w_k`, `nodes`,
    /// `t_init_c`, `cp_j_kgk`, `rho_kg_m3`).
    pub fn validate(&self) -> Result<()> {
        positive("volume_m3", self.volume_m3, 10_000.0, "tank volume, m³")?;
        positive("height_m", self.height_m, 50.0, "tank height, m")?;
        in_range(
            "ua_w_k",
            self.ua_w_k,
            0.0,
            1.0e5,
            "tank loss coefficient to the room, W/K",
        )?;
        let nodes = u32::try_from(self.nodes).unwrap_or(u32::MAX);
        count("nodes", nodes, 1, MAX_NODES as u32, "stratification nodes")?;
        in_range(
            "t_init_c",
            self.t_init_c,
            0.0,
            200.0,
            "tank start temperature, °C",
        )?;
        positive(
            "cp_j_kgk",
            self.cp_j_kgk,
            10_000.0,
            "water specific heat, J/(kg·K)",
        )?;
        positive("rho_kg_m3", self.rho_kg_m3, 2_000.0, "water density, kg/m³")?;
        Ok(())
    }
}

impl Tank {
    /// A tank at its uniform start temperature.
    ///
    /// The tank is a vertical cylinder of the given volume and height; its UA is shared among
    /// the nodes by outside surface area (each node its side strip, the top and bottom nodes
    /// also the end discs).
    ///
    /// * `spec` – call [`TankSpec::validate`] first; out-of-range node counts are clamped to
    ///   1..=50 here so this never panics.
    pub fn new(spec: &TankSpec) -> Tank {
        let n = spec.nodes.clamp(1, MAX_NODES);
        let area_end_m2 = spec.volume_m3 / spec.height_m;
        let radius_m = (area_end_m2 / std::f64::consts::PI).sqrt();
        let side_node_m2 = 2.0 * std::f64::consts::PI * radius_m * spec.height_m / n as f64;
        let total_m2 = 2.0 * area_end_m2 + n as f64 * side_node_m2;
        let mut ua = [0.0; MAX_NODES];
        for (i, u) in ua.iter_mut().take(n).enumerate() {
            let mut a = side_node_m2;
            if i == 0 {
                a += area_end_m2;
            }
            if i == n - 1 {
                a += area_end_m2;
            }
            *u = spec.ua_w_k * a / total_m2;
        }
        let mut t = [0.0; MAX_NODES];
        t[..n].fill(spec.t_init_c);
        Tank {
            n,
            t_c: t,
            ua_node_w_k: ua,
            m_node_kg: spec.rho_kg_m3 * spec.volume_m3 / n as f64,
            cp_j_kgk: spec.cp_j_kgk,
        }
    }

    /// Temperature of the top node, °C.
    pub fn t_top_c(&self) -> f64 {
        self.t_c[0]
    }

    /// Temperature of the bottom node, °C.
    pub fn t_bottom_c(&self) -> f64 {
        self.t_c[self.n - 1]
    }

    /// Mass-weighted mean temperature, °C (nodes have equal mass).
    pub fn t_mean_c(&self) -> f64 {
        self.t_c[..self.n].iter().sum::<f64>() / self.n as f64
    }

    /// Node temperatures, °C, top first.
    pub fn node_temps_c(&self) -> &[f64] {
        &self.t_c[..self.n]
    }

    /// Stored energy above `t_ref_c`, J: `Σ m_i cp (T_i − T_ref)`.
    pub fn stored_j(&self, t_ref_c: f64) -> f64 {
        let mc = self.m_node_kg * self.cp_j_kgk;
        self.t_c[..self.n].iter().map(|t| mc * (t - t_ref_c)).sum()
    }

    /// Like [`Tank::step`], but first checks the inputs and returns an `Input` error for a
    /// non-positive or non-finite `dt_s`, more than 4 streams, a negative or non-finite flow,
    /// an inlet temperature outside 0..=200 °C, a non-finite room temperature or a negative or
    /// non-finite auxiliary heat.
    pub fn try_step(
        &mut self,
        dt_s: f64,
        streams: &[Stream],
        t_room_c: f64,
        q_aux_w: f64,
    ) -> Result<StepResult> {
        positive("dt_s", dt_s, 1.0e7, "time step, s")?;
        if streams.len() > MAX_STREAMS {
            return Err(Error::input(
                "streams",
                streams.len(),
                format!("at most {MAX_STREAMS} streams through a tank"),
            ));
        }
        for (i, s) in streams.iter().enumerate() {
            in_range(
                &format!("streams[{i}].flow_kg_s"),
                s.flow_kg_s,
                0.0,
                1.0e4,
                "mass flow, kg/s",
            )?;
            in_range(
                &format!("streams[{i}].t_in_c"),
                s.t_in_c,
                0.0,
                200.0,
                "inlet temperature, °C",
            )?;
        }
        in_range("t_room_c", t_room_c, -50.0, 100.0, "room temperature, °C")?;
        in_range("q_aux_w", q_aux_w, 0.0, 1.0e8, "auxiliary heat, W")?;
        Ok(self.step(dt_s, streams, t_room_c, q_aux_w))
    }

    /// Advance `dt_s` seconds with up to 4 streams, the room at `t_room_c` and `q_aux_w` of
    /// auxiliary heat added to the top node (electric element; 0 = off).
    ///
    /// Per sub-step of length `h`: first advection and the element, explicit from the node
    /// temperatures at the sub-step's start, `m cp ΔT_i = h [Σ_s ṁ_s cp (T_up,s,i − T_i) +
    /// q_aux δ_i0]`, where `T_up` is the upstream node along the stream's path (the inlet
    /// temperature at the entry node; nodes off the path get nothing); then the loss, exactly,
    /// `T_i ← T_room + (T_i − T_room) exp(−UA_i h/(m cp))` (operator splitting; a fully mixed
    /// tank without flow decays exactly as the exponential). The number of sub-steps is the
    /// smallest that keeps `h (Σ_s ṁ_s + max_i UA_i/cp) ≤ m` (plug-flow Courant number plus loss
    /// number ≤ 1: every update is a convex combination, so no overshoot, and the splitting
    /// error stays small). After each sub-step inverted nodes
    /// are mixed (pool-adjacent: a node warmer than the one above merges with it into their mass
    /// mean, repeated until the column is stable), conserving energy.
    ///
    /// * `dt_s` – step length, s (≤ 0 or non-finite: nothing happens, all zeros returned)
    /// * `streams` – at most 4 are used (see [`Tank::try_step`] for a checked call); a stream
    ///   with zero, negative or non-finite flow or a non-finite inlet temperature is no flow
    /// * `t_room_c` – room temperature, °C (non-finite: no loss)
    /// * `q_aux_w` – auxiliary heat, W (negative or non-finite: off)
    ///
    /// Returns per-stream heat and mean outlet temperature, loss, auxiliary heat, change of
    /// stored energy and the number of sub-steps.
    ///
    /// Source: Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., §8.4.
    pub fn step(
        &mut self,
        dt_s: f64,
        streams: &[Stream],
        t_room_c: f64,
        q_aux_w: f64,
    ) -> StepResult {
        let mut res = StepResult::default();
        let n = self.n;
        let ns = streams.len().min(MAX_STREAMS);
        let mut flow = [0.0; MAX_STREAMS];
        let mut t_in = [0.0; MAX_STREAMS];
        for (k, s) in streams.iter().take(ns).enumerate() {
            if s.flow_kg_s.is_finite() && s.flow_kg_s > 0.0 && s.t_in_c.is_finite() {
                flow[k] = s.flow_kg_s;
                t_in[k] = s.t_in_c;
            }
        }
        if !(dt_s.is_finite() && dt_s > 0.0) {
            for (out, s) in res.t_out_c.iter_mut().zip(&streams[..ns]) {
                *out = self.outlet_node_temp(s);
            }
            return res;
        }
        let q_aux_w = if q_aux_w.is_finite() && q_aux_w > 0.0 {
            q_aux_w
        } else {
            0.0
        };
        let losses = t_room_c.is_finite();
        let cp = self.cp_j_kgk;
        let mc = self.m_node_kg * cp;

        // Sub-step count from the stability bound.
        let total_flow: f64 = flow.iter().sum();
        let ua_max = if losses {
            self.ua_node_w_k[..n].iter().fold(0.0_f64, |a, &b| a.max(b))
        } else {
            0.0
        };
        let rate_per_s = (total_flow + ua_max / cp) / self.m_node_kg;
        // The 1e-9 slack keeps an exact integer Courant number (a sharp plug) from rounding up
        // to one more sub-step; a Courant number of 1 + 1e-9 is harmless.
        let subs_f = (dt_s * rate_per_s - 1e-9).ceil().max(1.0);
        let subs = if subs_f < u32::MAX as f64 {
            subs_f as u32
        } else {
            u32::MAX
        };
        let h = dt_s / subs as f64;
        let mut decay = [1.0; MAX_NODES];
        if losses {
            for (d, ua) in decay.iter_mut().zip(&self.ua_node_w_k[..n]) {
                *d = (-ua * h / mc).exp();
            }
        }

        let stored0 = self.stored_j(0.0);
        let mut q_in = [0.0; MAX_STREAMS];
        let mut t_out_sum = [0.0; MAX_STREAMS];
        let mut q_loss = 0.0;
        let mut acc = [0.0; MAX_NODES];
        for _ in 0..subs {
            acc[..n].fill(0.0);
            let t_mean = self.t_mean_c();
            for k in 0..ns {
                if flow[k] == 0.0 {
                    continue;
                }
                let (entry, down) = self.path(streams[k].inlet, t_in[k], t_mean);
                let w = flow[k] * cp; // W/K
                let t_exit;
                if down {
                    let mut up = t_in[k];
                    for (a, &t) in acc[entry..n].iter_mut().zip(&self.t_c[entry..n]) {
                        *a += w * (up - t);
                        up = t;
                    }
                    t_exit = self.t_c[n - 1];
                } else {
                    let mut up = t_in[k];
                    for (a, &t) in acc[..=entry].iter_mut().zip(&self.t_c[..=entry]).rev() {
                        *a += w * (up - t);
                        up = t;
                    }
                    t_exit = self.t_c[0];
                }
                q_in[k] += h * w * (t_in[k] - t_exit);
                t_out_sum[k] += t_exit;
            }
            acc[0] += q_aux_w;
            for (t, a) in self.t_c[..n].iter_mut().zip(&acc[..n]) {
                *t += h * a / mc;
            }
            if losses {
                // Exact exponential relaxation of each node towards the room over the sub-step;
                // the heat lost is what the node's energy fell by, so the balance stays exact.
                for (t, d) in self.t_c[..n].iter_mut().zip(&decay[..n]) {
                    let t_new = t_room_c + (*t - t_room_c) * d;
                    q_loss += mc * (*t - t_new);
                    *t = t_new;
                }
            }
            self.mix();
        }

        for k in 0..ns {
            res.q_in_j[k] = q_in[k];
            res.t_out_c[k] = if flow[k] > 0.0 {
                t_out_sum[k] / subs as f64
            } else {
                self.outlet_node_temp(&streams[k])
            };
        }
        res.q_loss_j = q_loss;
        res.q_aux_j = q_aux_w * dt_s;
        res.delta_stored_j = self.stored_j(0.0) - stored0;
        res.substeps = subs;
        res
    }

    /// Entry node and direction (true = flowing down) of a stream.
    fn path(&self, inlet: Inlet, t_in_c: f64, t_mean_c: f64) -> (usize, bool) {
        let n = self.n;
        match inlet {
            Inlet::Top => (0, true),
            Inlet::Bottom => (n - 1, false),
            Inlet::StratifiedCharge => {
                let k = self.t_c[..n]
                    .iter()
                    .position(|&t| t < t_in_c)
                    .unwrap_or(n - 1);
                (k, true)
            }
            Inlet::StratifiedReturn => {
                let k = self.t_c[..n].iter().rposition(|&t| t > t_in_c).unwrap_or(0);
                (k, false)
            }
            Inlet::Stratified => {
                if t_in_c >= t_mean_c {
                    let k = self.t_c[..n]
                        .iter()
                        .position(|&t| t < t_in_c)
                        .unwrap_or(n - 1);
                    (k, true)
                } else {
                    let k = self.t_c[..n].iter().rposition(|&t| t > t_in_c).unwrap_or(0);
                    (k, false)
                }
            }
        }
    }

    /// Temperature of the node a stream would leave from now.
    fn outlet_node_temp(&self, s: &Stream) -> f64 {
        let down = match s.inlet {
            Inlet::Top | Inlet::StratifiedCharge => true,
            Inlet::Bottom | Inlet::StratifiedReturn => false,
            Inlet::Stratified => !s.t_in_c.is_finite() || s.t_in_c >= self.t_mean_c(),
        };
        if down {
            self.t_bottom_c()
        } else {
            self.t_top_c()
        }
    }

    /// Buoyancy mixing: pool adjacent violators from the top down so temperature never rises
    /// downward; each pool takes the mean of its (equal-mass) nodes.
    fn mix(&mut self) {
        let n = self.n;
        if self.t_c[..n].windows(2).all(|w| w[0] >= w[1]) {
            return;
        }
        let mut sum = [0.0; MAX_NODES];
        let mut cnt = [0usize; MAX_NODES];
        let mut top = 0usize; // number of pools
        for j in 0..n {
            sum[top] = self.t_c[j];
            cnt[top] = 1;
            top += 1;
            while top >= 2
                && sum[top - 1] / cnt[top - 1] as f64 > sum[top - 2] / cnt[top - 2] as f64
            {
                sum[top - 2] += sum[top - 1];
                cnt[top - 2] += cnt[top - 1];
                top -= 1;
            }
        }
        let mut j = 0;
        for p in 0..top {
            let t = sum[p] / cnt[p] as f64;
            for _ in 0..cnt[p] {
                self.t_c[j] = t;
                j += 1;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn spec(nodes: usize, ua: f64, t0: f64) -> TankSpec {
        // 1 m³, 2 m tall; ρ and cp of water at 60 °C, 300 kPa from IF97 (983.297 kg/m³,
        // 4182.32 J/(kg·K); iapws 1.5.5, reference/water_iapws.csv).
        TankSpec {
            volume_m3: 1.0,
            height_m: 2.0,
            ua_w_k: ua,
            nodes,
            t_init_c: t0,
            cp_j_kgk: 4182.32,
            rho_kg_m3: 983.297,
        }
    }

    #[test]
    fn mixed_tank_cools_like_the_exponential() {
        // 1 node, UA = 5 W/K, 80 °C in a 20 °C room, 24 one-hour steps.
        // Exact: T = Ta + (T0 − Ta) exp(−UA t/(m cp)), τ = m cp/UA = 8.225e5 s:
        // T(24 h) = 20 + 60 exp(−0.105047) = 74.01696 °C (Duffie & Beckman 4th ed. §8.3, fully
        // mixed tank without load). The loss step is the exact exponential: rounding only.
        let s = spec(1, 5.0, 80.0);
        let mut tank = Tank::new(&s);
        let mut q_loss = 0.0;
        for _ in 0..24 {
            q_loss += tank.step(3600.0, &[], 20.0, 0.0).q_loss_j;
        }
        let mc = s.rho_kg_m3 * s.volume_m3 * s.cp_j_kgk;
        let exact = 20.0 + 60.0 * (-86_400.0 * s.ua_w_k / mc).exp();
        assert!((exact - 74.01696).abs() < 1e-5);
        assert!((tank.t_mean_c() - exact).abs() < 1e-9);
        assert!((q_loss - mc * (80.0 - exact)).abs() < 1e-9 * mc * 80.0);
    }

    #[test]
    fn plug_charge_keeps_outlet_cold() {
        // 10 nodes at 20 °C (98.33 kg each); 0.1 kg/s at 60 °C into the top for 1966.6 s moves
        // exactly two node masses: Courant number 1, so the front is sharp, the bottom stays at
        // 20 °C and the tank gains ṁ cp (60 − 20) t.
        let s = spec(10, 0.0, 20.0);
        let mut tank = Tank::new(&s);
        let m_node = s.rho_kg_m3 * s.volume_m3 / 10.0;
        let t = 2.0 * m_node / 0.1;
        let r = tank.step(
            t,
            &[Stream {
                flow_kg_s: 0.1,
                t_in_c: 60.0,
                inlet: Inlet::Top,
            }],
            20.0,
            0.0,
        );
        let expected = 0.1 * s.cp_j_kgk * 40.0 * t;
        assert!((r.q_in_j[0] - expected).abs() < 1e-6 * expected);
        assert_eq!(r.t_out_c[0], 20.0);
        assert!((tank.node_temps_c()[1] - 60.0).abs() < 1e-9);
        assert!((tank.node_temps_c()[2] - 20.0).abs() < 1e-9);
    }

    #[test]
    fn cold_inflow_at_top_mixes_down() {
        // Cold water pushed into the top of a warm tank is unstable and must sink: afterwards
        // temperatures never rise downward.
        let mut tank = Tank::new(&spec(10, 2.0, 60.0));
        tank.step(
            600.0,
            &[Stream {
                flow_kg_s: 0.05,
                t_in_c: 15.0,
                inlet: Inlet::Top,
            }],
            20.0,
            0.0,
        );
        assert!(tank.node_temps_c().windows(2).all(|w| w[0] >= w[1]));
        assert!(tank.t_top_c() < 60.0);
    }

    #[test]
    fn stratified_inlet_enters_at_its_level() {
        // A tank 70 °C over 30 °C; a 50 °C stream through a stratifier enters the first node
        // colder than itself (node 5) and leaves the nodes above it untouched.
        let mut tank = Tank::new(&spec(10, 0.0, 30.0));
        tank.t_c[..5].fill(70.0);
        tank.step(
            60.0,
            &[Stream {
                flow_kg_s: 0.1,
                t_in_c: 50.0,
                inlet: Inlet::Stratified,
            }],
            20.0,
            0.0,
        );
        assert!(tank.node_temps_c()[..5].iter().all(|&t| t == 70.0));
        assert!(tank.node_temps_c()[5] > 30.0 && tank.node_temps_c()[5] < 50.0);
    }

    #[test]
    fn try_step_rejects_bad_input() {
        let mut tank = Tank::new(&spec(4, 1.0, 40.0));
        let s = Stream {
            flow_kg_s: -1.0,
            t_in_c: 50.0,
            inlet: Inlet::Top,
        };
        assert!(tank.try_step(3600.0, &[s], 20.0, 0.0).is_err());
        assert!(tank.try_step(f64::NAN, &[], 20.0, 0.0).is_err());
        assert!(tank.try_step(3600.0, &[s; 5], 20.0, 0.0).is_err());
        let bad = TankSpec {
            nodes: 0,
            ..spec(1, 1.0, 40.0)
        };
        assert!(bad.validate().is_err());
        let bad = TankSpec {
            volume_m3: f64::NAN,
            ..spec(1, 1.0, 40.0)
        };
        assert!(bad.validate().is_err());
        // Unchecked step with bad values stays finite.
        let r = tank.step(
            3600.0,
            &[
                s,
                Stream {
                    flow_kg_s: f64::NAN,
                    ..s
                },
            ],
            f64::NAN,
            -5.0,
        );
        assert!(
            r.q_in_j
                .iter()
                .chain(r.t_out_c.iter())
                .all(|v| v.is_finite())
        );
        assert!(tank.t_mean_c().is_finite());
    }

    fn inlet_of(i: u8) -> Inlet {
        match i % 5 {
            0 => Inlet::Top,
            1 => Inlet::Bottom,
            2 => Inlet::Stratified,
            3 => Inlet::StratifiedCharge,
            _ => Inlet::StratifiedReturn,
        }
    }

    proptest! {
        #[test]
        fn energy_balance_closes(
            nodes in 1usize..=50,
            vol in 0.05f64..50.0,
            ua in 0.0f64..200.0,
            t0 in 5.0f64..95.0,
            troom in -10.0f64..40.0,
            aux in 0.0f64..20_000.0,
            dt in 1.0f64..7200.0,
            ss in proptest::collection::vec((0.0f64..3.0, 5.0f64..99.0, 0u8..3), 0..=4),
        ) {
            let s = TankSpec { volume_m3: vol, height_m: 2.0, ..spec(nodes, ua, t0) };
            let mut tank = Tank::new(&s);
            let mut streams = [Stream { flow_kg_s: 0.0, t_in_c: 0.0, inlet: Inlet::Top }; 4];
            for (k, (f, t, i)) in ss.iter().enumerate() {
                streams[k] = Stream { flow_kg_s: *f, t_in_c: *t, inlet: inlet_of(*i) };
            }
            let before = tank.stored_j(0.0);
            let r = tank.step(dt, &streams[..ss.len()], troom, aux);
            let after = tank.stored_j(0.0);
            let sum_in: f64 = r.q_in_j.iter().sum();
            let residual = sum_in + r.q_aux_j - r.q_loss_j - r.delta_stored_j;
            let scale = before.abs() + after.abs();
            prop_assert!(residual.abs() <= 1e-9 * scale, "residual {residual} scale {scale}");
            prop_assert!((r.delta_stored_j - (after - before)).abs() <= 1e-12 * scale);
            // Never hotter than the hottest source, never colder than the coldest, unless the
            // element heats it.
            if aux == 0.0 {
                let hi = ss.iter().map(|x| x.1).fold(t0.max(troom), f64::max);
                let lo = ss.iter().map(|x| x.1).fold(t0.min(troom), f64::min);
                prop_assert!(tank.node_temps_c().iter().all(|&t| t <= hi + 1e-6 && t >= lo - 1e-6));
            }
        }
    }
}
