//! Single-effect LiBr–water absorption chiller: generator, condenser, evaporator, absorber,
//! solution heat exchanger (SHX), solution pump and throttles.
//!
//! State points (numbering after Herold, Radermacher & Klein, Absorption Chillers and Heat
//! Pumps, ch. 6): 1 weak solution leaving the absorber (equilibrium at the low pressure), 2
//! after the pump, 3 after the SHX; 4 strong solution leaving the generator (equilibrium at the
//! high pressure), 5 after the SHX, 6 after the throttle (h6 = h5); 7 vapour leaving the
//! generator, superheated at the equilibrium temperature of the entering weak solution; 8
//! saturated condensate; 9 after the throttle; 10 saturated vapour leaving the evaporator.
//! Balances: total mass `ṁ1 = ṁ4 + ṁ7`, LiBr `ṁ1 x_w = ṁ4 x_s`, energy of every component
//! from these enthalpies (so the global balance `Q_g + Q_e + W_p = Q_a + Q_c` holds).
//!
//! External heat exchangers, each with a fixed UA sized at design, ε = 1 − exp(−UA/C) for a
//! stream against a (mean) phase-change temperature on the machine side:
//! * evaporator: chilled water against the evaporating temperature `t_e`;
//! * condenser: cooling water against the condensing temperature `t_c`;
//! * absorber: cooling water against the mean of the solution's entering equilibrium
//!   temperature (strong solution at the low pressure) and its leaving temperature t1;
//! * generator: hot water against the mean of the weak solution's equilibrium temperature at
//!   the high pressure (t7) and the leaving temperature t4.
//!
//! The mean solution temperature stands in for the LMTD of the absorber and generator (an
//! approximation that keeps the solve smooth). Cooling water flows in series: absorber first,
//! then condenser (common practice for small machines). Constant-speed solution pump: the weak
//! solution flow is fixed at design. Flows of the three external circuits are fixed at design.
//!
//! Off-design: with the UAs fixed, Newton's method (finite-difference Jacobian) on
//! `(t_c, x_w, x_s, z)` where `z` is the hot-water inlet temperature (mode "meet the load":
//! the capacity control lowers the hot-water supply until the cooling equals the load) or the
//! cooling capacity (mode "given supply"). Non-convergence is an error, never a number.

use crate::error::{Error, Result};
use crate::props::{libr, water};
use crate::validate;

/// Water specific heat of the external circuits, kJ/(kg·K).
const CP_W: f64 = 4.18;

/// Design (rating) conditions of a machine.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rating {
    /// Cooling capacity at rating, kW.
    pub capacity_kw: f64,
    pub t_hw_in_c: f64,
    pub t_hw_out_c: f64,
    pub t_cw_in_c: f64,
    pub t_cw_out_c: f64,
    pub t_chw_in_c: f64,
    pub t_chw_out_c: f64,
    /// Solution heat-exchanger effectiveness (on the smaller capacity rate).
    pub sol_hx_effectiveness: f64,
}

impl Rating {
    /// Rating temperatures typical of small hot-water-fired single-effect machines (common
    /// practice): hot water 88/83 °C, cooling water 31/35 °C, chilled water 12.5/7 °C, SHX 0.7.
    pub fn typical(capacity_kw: f64) -> Self {
        Rating {
            capacity_kw,
            t_hw_in_c: 88.0,
            t_hw_out_c: 83.0,
            t_cw_in_c: 31.0,
            t_cw_out_c: 35.0,
            t_chw_in_c: 12.5,
            t_chw_out_c: 7.0,
            sol_hx_effectiveness: 0.7,
        }
    }

    /// Check the rating: capacity 0..1e5 kW; each circuit's inlet/outlet in the right order;
    /// chilled water below cooling water below hot water; SHX effectiveness in (0, 1).
    pub fn validate(&self) -> Result<()> {
        validate::positive(
            "capacity_kw",
            self.capacity_kw,
            1e5,
            "cooling capacity at rating, kW",
        )?;
        validate::open_range(
            "sol_hx_effectiveness",
            self.sol_hx_effectiveness,
            0.0,
            1.0,
            "solution heat exchanger effectiveness",
        )?;
        validate::in_range(
            "t_chw_out_c",
            self.t_chw_out_c,
            3.0,
            20.0,
            "chilled water leaving, °C",
        )?;
        validate::in_range(
            "t_chw_in_c",
            self.t_chw_in_c,
            self.t_chw_out_c + 1.0,
            25.0,
            "chilled water entering, °C (above the leaving temperature)",
        )?;
        validate::in_range(
            "t_cw_in_c",
            self.t_cw_in_c,
            self.t_chw_in_c + 1.0,
            45.0,
            "cooling water entering, °C (above the chilled water)",
        )?;
        validate::in_range(
            "t_cw_out_c",
            self.t_cw_out_c,
            self.t_cw_in_c + 1.0,
            50.0,
            "cooling water leaving, °C (above its entering temperature)",
        )?;
        validate::in_range(
            "t_hw_in_c",
            self.t_hw_in_c,
            self.t_cw_out_c + 20.0,
            130.0,
            "hot water entering, °C (at least 20 K above the cooling water leaving)",
        )?;
        validate::in_range(
            "t_hw_out_c",
            self.t_hw_out_c,
            self.t_cw_out_c + 15.0,
            self.t_hw_in_c - 1.0,
            "hot water leaving, °C (below its entering temperature)",
        )?;
        Ok(())
    }
}

/// Design approaches of the machine side to the external streams, K (common practice):
/// evaporating 3 K below the chilled water leaving; condensing 3 K above the cooling water
/// leaving; weak solution leaving the absorber 4 K above the cooling water entering; strong
/// solution leaving the generator 3 K below the hot water leaving.
const APPROACH_EVAP_K: f64 = 3.0;
const APPROACH_COND_K: f64 = 3.0;
const APPROACH_ABS_K: f64 = 4.0;
const APPROACH_GEN_K: f64 = 3.0;

/// Changes to a sized machine found by fitting it to a datasheet
/// (`components::absorption_fit`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Calibration {
    /// Multipliers of the generator, absorber, condenser and evaporator UA sized at rating.
    pub ua_multipliers: [f64; 4],
    /// Solution heat-exchanger effectiveness.
    pub sol_hx_effectiveness: f64,
}

/// A sized machine (UAs fixed).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Machine {
    pub rating: Rating,
    /// Weak-solution flow (constant-speed pump), kg/s.
    pub m_weak_kg_s: f64,
    /// External flows, kg/s.
    pub m_hw_kg_s: f64,
    pub m_cw_kg_s: f64,
    pub m_chw_kg_s: f64,
    /// UA of generator, absorber, condenser, evaporator, kW/K.
    pub ua_gen_kw_k: f64,
    pub ua_abs_kw_k: f64,
    pub ua_cond_kw_k: f64,
    pub ua_evap_kw_k: f64,
    /// Design point solution (warm start).
    pub design: CyclePoint,
}

/// A solved cycle state.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct CyclePoint {
    pub t_evap_c: f64,
    pub t_cond_c: f64,
    /// Weak solution leaving the absorber, °C, and its mass fraction.
    pub t_abs_c: f64,
    pub x_weak: f64,
    /// Strong solution leaving the generator, °C, and its mass fraction.
    pub t_gen_c: f64,
    pub x_strong: f64,
    pub p_low_kpa: f64,
    pub p_high_kpa: f64,
    /// Strong solution leaving the SHX, °C.
    pub t_strong_shx_c: f64,
    /// Refrigerant flow, kg/s.
    pub m_ref_kg_s: f64,
    pub q_evap_kw: f64,
    pub q_cond_kw: f64,
    pub q_abs_kw: f64,
    pub q_gen_kw: f64,
    pub q_shx_kw: f64,
    pub w_pump_kw: f64,
    pub t_hw_in_c: f64,
    pub t_hw_out_c: f64,
    pub t_cw_in_c: f64,
    /// Cooling water between absorber and condenser, °C.
    pub t_cw_mid_c: f64,
    pub t_cw_out_c: f64,
    pub t_chw_in_c: f64,
    pub t_chw_out_c: f64,
    /// Strong solution leaving the SHX minus its crystallisation temperature, K (large when
    /// x_strong is below the crystallisation fit's range).
    pub cryst_margin_k: f64,
    /// Newton iterations used.
    pub iterations: u32,
}

impl CyclePoint {
    /// Thermal COP `Q_e / Q_g`.
    pub fn cop(&self) -> f64 {
        self.q_evap_kw / self.q_gen_kw
    }

    /// Relative closure of the global energy balance `(Q_g + Q_e + W_p − Q_a − Q_c)/Q_g`.
    pub fn energy_closure(&self) -> f64 {
        (self.q_gen_kw + self.q_evap_kw + self.w_pump_kw - self.q_abs_kw - self.q_cond_kw)
            / self.q_gen_kw
    }
}

/// Internal state from the machine-side unknowns (design procedure and off-design residuals).
struct Internal {
    p: CyclePoint,
    /// Mean solution temperatures of generator and absorber, °C.
    t_gen_mean: f64,
    t_abs_mean: f64,
}

fn h_vapour_kj_kg(p_kpa: f64, t_c: f64) -> f64 {
    seuif97::pt(p_kpa / 1000.0, t_c, seuif97::OH)
}

/// The refrigerant (water) side of a cycle state: it depends only on the evaporating and
/// condensing temperatures, so Newton steps that move only the mass fractions reuse it.
#[derive(Debug, Clone, Copy)]
struct WaterSide {
    t_e: f64,
    t_c: f64,
    p_l: f64,
    p_h: f64,
    /// Saturated liquid at the condensing and saturated vapour at the evaporating temperature.
    h8: f64,
    h10: f64,
}

impl WaterSide {
    fn new(t_e: f64, t_c: f64) -> Result<WaterSide> {
        Ok(WaterSide {
            t_e,
            t_c,
            p_l: water::saturation_pressure_kpa(t_e)?,
            p_h: water::saturation_pressure_kpa(t_c)?,
            h8: seuif97::tx(t_c, 0.0, seuif97::OH),
            h10: seuif97::tx(t_e, 1.0, seuif97::OH),
        })
    }

    /// `cache` if it holds exactly these temperatures, else a new one (stored in `cache`).
    fn cached(cache: &mut Option<WaterSide>, t_e: f64, t_c: f64) -> Result<WaterSide> {
        match *cache {
            Some(w) if w.t_e == t_e && w.t_c == t_c => Ok(w),
            _ => {
                let w = WaterSide::new(t_e, t_c)?;
                *cache = Some(w);
                Ok(w)
            }
        }
    }
}

fn state_points(
    t_e: f64,
    t_c: f64,
    t1: f64,
    t4: f64,
    m1: f64,
    eps_shx: f64,
) -> Result<(f64, f64, Internal)> {
    let x_w = libr::mass_fraction(water::saturation_pressure_kpa(t_e)?, t1)?;
    let x_s = libr::mass_fraction(water::saturation_pressure_kpa(t_c)?, t4)?;
    if x_s <= x_w + 1e-4 {
        return Err(Error::Internal(format!(
            "absorption cycle: strong solution {x_s:.4} not above weak {x_w:.4}: generator too cold for the absorber"
        )));
    }
    Ok((x_w, x_s, internal(t_e, t_c, x_w, x_s, m1, eps_shx)?))
}

/// The internal cycle (no external exchangers) at given machine-side temperatures: weak
/// solution leaving the absorber at `t_abs_out_c` in equilibrium with the evaporator at
/// `t_evap_c`, strong solution leaving the generator at `t_gen_out_c` in equilibrium with
/// the condenser at `t_cond_c`, weak-solution flow `m_weak_kg_s`, SHX effectiveness
/// `eps_shx`. Every state point and heat flow as the module documentation defines them (the
/// same arithmetic the sizing and the off-design solve use); the external-stream fields of
/// the result are zero.
///
/// Errors: `Internal` when the strong solution is not richer than the weak (no refrigerant
/// flow), `OutOfRange` when a property leaves its range.
pub fn internal_cycle(
    t_evap_c: f64,
    t_cond_c: f64,
    t_abs_out_c: f64,
    t_gen_out_c: f64,
    m_weak_kg_s: f64,
    eps_shx: f64,
) -> Result<CyclePoint> {
    let (_, _, s) = state_points(
        t_evap_c,
        t_cond_c,
        t_abs_out_c,
        t_gen_out_c,
        m_weak_kg_s,
        eps_shx,
    )?;
    Ok(s.p)
}

/// Cycle state from evaporating/condensing temperatures, mass fractions and weak flow.
fn internal(t_e: f64, t_c: f64, x_w: f64, x_s: f64, m1: f64, eps_shx: f64) -> Result<Internal> {
    internal_with(&WaterSide::new(t_e, t_c)?, x_w, x_s, m1, eps_shx)
}

/// [`internal`] with the water side given.
fn internal_with(ws: &WaterSide, x_w: f64, x_s: f64, m1: f64, eps_shx: f64) -> Result<Internal> {
    let (t_e, t_c, p_l, p_h) = (ws.t_e, ws.t_c, ws.p_l, ws.p_h);
    // Solution temperatures from the water saturation temperatures at the two pressures.
    let (weak, strong) = (libr::DuhringLine::new(x_w)?, libr::DuhringLine::new(x_s)?);
    let t1 = weak.solution_temperature_c(t_e)?;
    let t4 = strong.solution_temperature_c(t_c)?;
    let t7 = weak.solution_temperature_c(t_c)?;
    let t_abs_in = strong.solution_temperature_c(t_e)?;
    let m_s = m1 * x_w / x_s;
    let m_r = m1 - m_s;
    let h1 = libr::enthalpy_kj_kg(t1, x_w)?;
    let h4 = libr::enthalpy_kj_kg(t4, x_s)?;
    let rho1 = libr::density_kg_m3(t1, x_w)?;
    let w_p = m1 * (p_h - p_l) / rho1; // kW
    let h2 = h1 + w_p / m1;
    // SHX: ε applies to the smaller capacity rate (cp at the inlets). That is the strong side
    // in practice, where this is Herold et al.'s ε = (t4 − t5)/(t4 − t1); the duty is the
    // strong stream's enthalpy change down to t5, so every balance uses the same enthalpies.
    let c_w = m1 * libr::cp_kj_kgk(t1, x_w)?;
    let c_s = m_s * libr::cp_kj_kgk(t4, x_s)?;
    let t5 = t4 - eps_shx * c_w.min(c_s) / c_s * (t4 - t1);
    let h5 = libr::enthalpy_kj_kg(t5, x_s)?;
    let q_shx = m_s * (h4 - h5);
    let h3 = h2 + q_shx / m1;
    let h7 = h_vapour_kj_kg(p_h, t7.max(t_c + 1e-6));
    let (h8, h10) = (ws.h8, ws.h10);
    let q_e = m_r * (h10 - h8);
    let q_c = m_r * (h7 - h8);
    let q_g = m_s * h4 + m_r * h7 - m1 * h3;
    let q_a = m_r * h10 + m_s * h5 - m1 * h1;
    // Below the fit's range the line is held at its lowest point (checked first: an error
    // value would be built and dropped every Newton step).
    let cryst = t5 - libr::crystallisation_temperature_c(x_s.max(libr::X_CRYST_MIN))?;
    for v in [q_e, q_c, q_g, q_a, h7, h8, h10] {
        if !v.is_finite() {
            return Err(Error::Internal("absorption cycle: non-finite state".into()));
        }
    }
    Ok(Internal {
        p: CyclePoint {
            t_evap_c: t_e,
            t_cond_c: t_c,
            t_abs_c: t1,
            x_weak: x_w,
            t_gen_c: t4,
            x_strong: x_s,
            p_low_kpa: p_l,
            p_high_kpa: p_h,
            t_strong_shx_c: t5,
            m_ref_kg_s: m_r,
            q_evap_kw: q_e,
            q_cond_kw: q_c,
            q_abs_kw: q_a,
            q_gen_kw: q_g,
            q_shx_kw: q_shx,
            w_pump_kw: w_p,
            cryst_margin_k: cryst,
            ..CyclePoint::default()
        },
        t_gen_mean: 0.5 * (t7 + t4),
        t_abs_mean: 0.5 * (t_abs_in + t1),
    })
}

fn ua(q: f64, c: f64, dt_max: f64, what: &str) -> Result<f64> {
    let eps = q / (c * dt_max);
    if !(eps > 0.0 && eps < 1.0) {
        return Err(Error::Internal(format!(
            "absorption design: {what} effectiveness {eps:.3} outside (0, 1): rating temperatures too tight"
        )));
    }
    Ok(-c * (1.0 - eps).ln())
}

/// What is fixed in an off-design solve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Mode {
    /// Cooling fixed (kW); the hot-water inlet temperature is solved for.
    MeetLoad { q_evap_kw: f64 },
    /// Hot-water inlet temperature fixed (°C); the cooling capacity is solved for.
    GivenSupply { t_hw_in_c: f64 },
}

impl Machine {
    /// Size the machine at its rating: machine-side temperatures from the design approaches
    /// (module constants, common practice), cycle solved for the weak-solution flow that gives
    /// the capacity, each external UA from `UA = −C ln(1 − ε)`, `ε = Q/(C ΔT_max)`.
    ///
    /// Errors: `Input` for a bad rating; `Internal` when the rating is thermodynamically
    /// infeasible (no refrigerant flow, or an effectiveness outside (0, 1)).
    pub fn size(rating: Rating) -> Result<Machine> {
        rating.validate()?;
        let r = rating;
        let t_e = r.t_chw_out_c - APPROACH_EVAP_K;
        let t_c = r.t_cw_out_c + APPROACH_COND_K;
        let t1 = r.t_cw_in_c + APPROACH_ABS_K;
        let t4 = r.t_hw_out_c - APPROACH_GEN_K;
        let (x_w, x_s, unit) = state_points(t_e, t_c, t1, t4, 1.0, r.sol_hx_effectiveness)?;
        let m1 = r.capacity_kw / unit.p.q_evap_kw;
        let d = internal(t_e, t_c, x_w, x_s, m1, r.sol_hx_effectiveness)?;
        let m_hw = d.p.q_gen_kw / (CP_W * (r.t_hw_in_c - r.t_hw_out_c));
        let m_chw = r.capacity_kw / (CP_W * (r.t_chw_in_c - r.t_chw_out_c));
        let m_cw = (d.p.q_abs_kw + d.p.q_cond_kw) / (CP_W * (r.t_cw_out_c - r.t_cw_in_c));
        let c_cw = m_cw * CP_W;
        let t_mid = r.t_cw_in_c + d.p.q_abs_kw / c_cw;
        let ua_gen = ua(
            d.p.q_gen_kw,
            m_hw * CP_W,
            r.t_hw_in_c - d.t_gen_mean,
            "generator",
        )?;
        let ua_abs = ua(d.p.q_abs_kw, c_cw, d.t_abs_mean - r.t_cw_in_c, "absorber")?;
        let ua_cond = ua(d.p.q_cond_kw, c_cw, t_c - t_mid, "condenser")?;
        let ua_evap = ua(
            r.capacity_kw,
            m_chw * CP_W,
            r.t_chw_in_c - t_e,
            "evaporator",
        )?;
        let mut p = d.p;
        p.t_hw_in_c = r.t_hw_in_c;
        p.t_hw_out_c = r.t_hw_out_c;
        p.t_cw_in_c = r.t_cw_in_c;
        p.t_cw_mid_c = t_mid;
        p.t_cw_out_c = r.t_cw_out_c;
        p.t_chw_in_c = r.t_chw_in_c;
        p.t_chw_out_c = r.t_chw_out_c;
        Ok(Machine {
            rating: r,
            m_weak_kg_s: m1,
            m_hw_kg_s: m_hw,
            m_cw_kg_s: m_cw,
            m_chw_kg_s: m_chw,
            ua_gen_kw_k: ua_gen,
            ua_abs_kw_k: ua_abs,
            ua_cond_kw_k: ua_cond,
            ua_evap_kw_k: ua_evap,
            design: p,
        })
    }

    /// The same machine with its four external UAs multiplied by `c.ua_multipliers`
    /// (generator, absorber, condenser, evaporator) and its solution heat exchanger at
    /// `c.sol_hx_effectiveness`; flows (pump and the three circuits) stay at design. The
    /// design point (warm start, rated heat rejection) is re-solved at the rating
    /// temperatures with the rated hot-water supply.
    ///
    /// Errors: `Input` for a multiplier that is not positive and finite or an effectiveness
    /// outside (0, 1); `Internal` when the changed machine makes no cooling at its rating.
    pub fn calibrated(&self, c: &Calibration) -> Result<Machine> {
        for (k, m) in ["generator", "absorber", "condenser", "evaporator"]
            .iter()
            .zip(c.ua_multipliers)
        {
            if !(m.is_finite() && m > 0.0) {
                return Err(Error::input(
                    format!("ua_multiplier.{k}"),
                    m,
                    "a positive UA multiplier",
                ));
            }
        }
        validate::open_range(
            "sol_hx_effectiveness",
            c.sol_hx_effectiveness,
            0.0,
            1.0,
            "solution heat-exchanger effectiveness",
        )?;
        let [fg, fa, fc, fe] = c.ua_multipliers;
        let mut m = *self;
        m.rating.sol_hx_effectiveness = c.sol_hx_effectiveness;
        m.ua_gen_kw_k *= fg;
        m.ua_abs_kw_k *= fa;
        m.ua_cond_kw_k *= fc;
        m.ua_evap_kw_k *= fe;
        let r = m.rating;
        m.design = m.solve(
            Mode::GivenSupply {
                t_hw_in_c: r.t_hw_in_c,
            },
            r.t_cw_in_c,
            r.t_chw_out_c,
            Some(&self.design),
        )?;
        Ok(m)
    }

    fn eps(&self, ua: f64, c: f64) -> f64 {
        1.0 - (-ua / c).exp()
    }

    /// Residuals (scaled by the capacity) and the state, for unknowns `u = (t_c, x_w, x_s, z)`.
    fn residuals(
        &self,
        u: [f64; 4],
        mode: Mode,
        t_cw_in: f64,
        t_chw_out: f64,
        cache: &mut Option<WaterSide>,
    ) -> Result<([f64; 4], CyclePoint)> {
        let (q_target, t_hw_in) = match mode {
            Mode::MeetLoad { q_evap_kw } => (q_evap_kw, u[3]),
            Mode::GivenSupply { t_hw_in_c } => (u[3], t_hw_in_c),
        };
        let c_chw = self.m_chw_kg_s * CP_W;
        let c_cw = self.m_cw_kg_s * CP_W;
        let c_hw = self.m_hw_kg_s * CP_W;
        let eps_e = self.eps(self.ua_evap_kw_k, c_chw);
        let t_e = t_chw_out - q_target * (1.0 / eps_e - 1.0) / c_chw;
        let ws = WaterSide::cached(cache, t_e, u[0])?;
        let s = internal_with(
            &ws,
            u[1],
            u[2],
            self.m_weak_kg_s,
            self.rating.sol_hx_effectiveness,
        )?;
        let p = s.p;
        let t_mid = t_cw_in + p.q_abs_kw / c_cw;
        let scale = self.rating.capacity_kw;
        let r = [
            (p.q_evap_kw - q_target) / scale,
            (p.q_gen_kw - self.eps(self.ua_gen_kw_k, c_hw) * c_hw * (t_hw_in - s.t_gen_mean))
                / scale,
            (p.q_abs_kw - self.eps(self.ua_abs_kw_k, c_cw) * c_cw * (s.t_abs_mean - t_cw_in))
                / scale,
            (p.q_cond_kw - self.eps(self.ua_cond_kw_k, c_cw) * c_cw * (u[0] - t_mid)) / scale,
        ];
        let mut out = p;
        out.t_hw_in_c = t_hw_in;
        out.t_hw_out_c = t_hw_in - p.q_gen_kw / c_hw;
        out.t_cw_in_c = t_cw_in;
        out.t_cw_mid_c = t_mid;
        out.t_cw_out_c = t_mid + p.q_cond_kw / c_cw;
        out.t_chw_out_c = t_chw_out;
        out.t_chw_in_c = t_chw_out + q_target / c_chw;
        Ok((r, out))
    }

    /// Solve the machine off design with its UAs fixed.
    ///
    /// * `mode` – what is fixed: the cooling (the hot-water inlet is solved) or the hot-water
    ///   inlet (the cooling is solved); hot-water, cooling-water and chilled-water flows at
    ///   design
    /// * `t_cw_in_c` – cooling water entering the absorber, °C; `t_chw_out_c` – chilled-water
    ///   set-point, °C
    /// * `warm` – a previous solution to start from (else the design point)
    ///
    /// Newton's method with a forward-difference Jacobian, step limited to 5 K / 0.02 kg/kg,
    /// converged when every scaled residual < 1e-9 (≤ 30 iterations). Errors: `Internal` on
    /// non-convergence, or when the solution has no refrigerant flow (x_s ≤ x_w: the
    /// generator is below its minimum temperature), or a property leaves its range.
    pub fn solve(
        &self,
        mode: Mode,
        t_cw_in_c: f64,
        t_chw_out_c: f64,
        warm: Option<&CyclePoint>,
    ) -> Result<CyclePoint> {
        let w = warm.unwrap_or(&self.design);
        let z0 = match mode {
            Mode::MeetLoad { .. } => w.t_hw_in_c,
            Mode::GivenSupply { .. } => w.q_evap_kw,
        };
        let mut u = [w.t_cond_c, w.x_weak, w.x_strong, z0];
        let cap = self.rating.capacity_kw;
        let steps = [
            1e-5,
            1e-7,
            1e-7,
            match mode {
                Mode::MeetLoad { .. } => 1e-5,
                Mode::GivenSupply { .. } => 1e-7 * cap,
            },
        ];
        let mut cache = None;
        for it in 0..30 {
            let (r, p) = self.residuals(u, mode, t_cw_in_c, t_chw_out_c, &mut cache)?;
            if r.iter().all(|v| v.abs() < 1e-9) {
                if p.x_strong <= p.x_weak || p.m_ref_kg_s <= 0.0 {
                    return Err(Error::Internal(
                        "absorption: no refrigerant flow (generator below its minimum temperature)"
                            .into(),
                    ));
                }
                let mut p = p;
                p.iterations = it;
                return Ok(p);
            }
            let mut j = [[0.0; 4]; 4];
            // With the cooling fixed, the fourth unknown (the hot-water inlet) enters only the
            // generator residual, linearly: that column is exact, no extra cycle evaluation.
            let n_fd = match mode {
                Mode::MeetLoad { .. } => {
                    j[1][3] =
                        -self.eps(self.ua_gen_kw_k, self.m_hw_kg_s * CP_W) * self.m_hw_kg_s * CP_W
                            / cap;
                    3
                }
                Mode::GivenSupply { .. } => 4,
            };
            // The mass-fraction columns first: they reuse the water side of the base point.
            for k in [1, 2, 0, 3].into_iter().filter(|&k| k < n_fd) {
                let mut v = u;
                v[k] += steps[k];
                let (rk, _) = self.residuals(v, mode, t_cw_in_c, t_chw_out_c, &mut cache)?;
                for i in 0..4 {
                    j[i][k] = (rk[i] - r[i]) / steps[k];
                }
            }
            let mut a = [0.0; 16];
            for (row, jr) in a.chunks_exact_mut(4).zip(&j) {
                row.copy_from_slice(jr);
            }
            let mut du = [-r[0], -r[1], -r[2], -r[3]];
            if !crate::num::solve_linear(&mut a, &mut du) {
                return Err(Error::Internal("absorption: singular Jacobian".into()));
            }
            let lim = [
                5.0,
                0.02,
                0.02,
                match mode {
                    Mode::MeetLoad { .. } => 10.0,
                    Mode::GivenSupply { .. } => 0.3 * cap,
                },
            ];
            let mut f: f64 = 1.0;
            for k in 0..4 {
                if du[k].abs() > lim[k] {
                    f = f.min(lim[k] / du[k].abs());
                }
            }
            for k in 0..4 {
                u[k] += f * du[k];
            }
            u[1] = u[1].clamp(0.3, libr::X_MAX - 1e-6);
            u[2] = u[2].clamp(0.3, libr::X_MAX - 1e-6);
        }
        Err(Error::Internal(
            "absorption: Newton did not converge in 30 iterations".into(),
        ))
    }

    /// Lowest hot-water inlet temperature at which the machine makes any cooling at these
    /// cooling-water and chilled-water temperatures, °C (the `MeetLoad` solve at a cooling of
    /// 1e-4 × capacity).
    pub fn min_hot_water_c(&self, t_cw_in_c: f64, t_chw_out_c: f64) -> Result<f64> {
        let q = 1e-4 * self.rating.capacity_kw;
        Ok(self
            .solve(
                Mode::MeetLoad { q_evap_kw: q },
                t_cw_in_c,
                t_chw_out_c,
                None,
            )?
            .t_hw_in_c)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn m() -> Machine {
        Machine::size(Rating::typical(35.0)).unwrap()
    }

    #[test]
    fn design_point_cop_and_closure() {
        let m = m();
        let d = m.design;
        eprintln!("{d:?}\n{m:?}");
        // Rated COP of single-effect hot-water machines 0.65–0.8 (common practice).
        assert!(d.cop() > 0.65 && d.cop() < 0.8, "{}", d.cop());
        assert!(d.energy_closure().abs() < 1e-9);
        // Off-design solve at the rating reproduces the design.
        let p = m
            .solve(Mode::GivenSupply { t_hw_in_c: 88.0 }, 31.0, 7.0, None)
            .unwrap();
        assert!((p.q_evap_kw - 35.0).abs() < 1e-5, "{}", p.q_evap_kw);
        assert!((p.t_hw_out_c - 83.0).abs() < 1e-5);
        assert!((p.t_cw_out_c - 35.0).abs() < 1e-5);
    }

    #[test]
    fn trends_of_the_trade() {
        // COP falls as cooling water rises and as hot water falls; capacity too (common practice).
        let m = m();
        let a = m
            .solve(Mode::GivenSupply { t_hw_in_c: 88.0 }, 29.0, 7.0, None)
            .unwrap();
        let b = m
            .solve(Mode::GivenSupply { t_hw_in_c: 88.0 }, 33.0, 7.0, None)
            .unwrap();
        let c = m
            .solve(Mode::GivenSupply { t_hw_in_c: 80.0 }, 31.0, 7.0, None)
            .unwrap();
        assert!(
            a.q_evap_kw > b.q_evap_kw && a.cop() > b.cop(),
            "{} {}",
            a.cop(),
            b.cop()
        );
        assert!(c.q_evap_kw < 35.0 && c.cop() < m.design.cop());
        // Trade statement (common practice): machines stop below about 65–75 °C supply at
        // 30 °C cooling water. The model's zero-capacity limit lies lower (measured 58.3 °C)
        // because thermodynamics puts it lower: the equilibrium limit at 30/7 °C is 56.0 °C
        // (absorptionlib 1.1.0, reference/libr_min_generator.csv, checked in
        // checks::absorption; the 2.3 K above it is the heat the ε = 0.7 SHX does not
        // recover). The trade's figure is a practical cut-out: at 65 °C the model gives 26 % of
        // rated capacity at COP 0.56. Asserted: the zero-flow limit is below 65 °C and above
        // 50 °C, and capacity at 65 °C is under a third of rating.
        let t_min = m.min_hot_water_c(30.0, 7.0).unwrap();
        assert!(t_min > 50.0 && t_min < 65.0, "{t_min}");
        let p65 = m
            .solve(Mode::GivenSupply { t_hw_in_c: 65.0 }, 30.0, 7.0, None)
            .unwrap();
        assert!(p65.q_evap_kw < 35.0 / 3.0, "{}", p65.q_evap_kw);
        // Below the limit there is no refrigerant flow: the solve says so.
        assert!(
            m.solve(
                Mode::GivenSupply {
                    t_hw_in_c: t_min - 3.0
                },
                30.0,
                7.0,
                None
            )
            .is_err()
        );
    }

    #[test]
    fn meet_load_lowers_supply() {
        let m = m();
        let p = m
            .solve(Mode::MeetLoad { q_evap_kw: 20.0 }, 31.0, 7.0, None)
            .unwrap();
        assert!((p.q_evap_kw - 20.0).abs() < 1e-6);
        assert!(p.t_hw_in_c < 88.0 && p.t_hw_in_c > 60.0);
        assert!(p.energy_closure().abs() < 1e-9);
    }

    #[test]
    fn bad_rating_is_error() {
        let mut r = Rating::typical(35.0);
        r.t_hw_in_c = 30.0;
        assert!(Machine::size(r).is_err());
        let mut r = Rating::typical(35.0);
        r.t_chw_in_c = 40.0;
        assert!(Machine::size(r).is_err());
        let mut r = Rating::typical(35.0);
        r.sol_hx_effectiveness = 1.0;
        assert!(Machine::size(r).is_err());
    }

    proptest::proptest! {
        #![proptest_config(proptest::prelude::ProptestConfig::with_cases(32))]
        #[test]
        fn energy_closes_everywhere(t_hw in 75.0..95.0f64, t_cw in 25.0..33.0f64, frac in 0.2..1.0f64) {
            let m = Machine::size(Rating::typical(35.0)).unwrap();
            if let Ok(p) = m.solve(Mode::GivenSupply { t_hw_in_c: t_hw }, t_cw, 7.0, None) {
                proptest::prop_assert!(p.energy_closure().abs() < 1e-6);
                let q = frac * p.q_evap_kw;
                let r = m.solve(Mode::MeetLoad { q_evap_kw: q }, t_cw, 7.0, Some(&p)).unwrap();
                proptest::prop_assert!(r.energy_closure().abs() < 1e-6);
                proptest::prop_assert!((r.q_evap_kw - q).abs() < 1e-6 * 35.0);
            } else {
                proptest::prop_assert!(false, "no solution at {} / {}", t_hw, t_cw);
            }
        }
    }
}
