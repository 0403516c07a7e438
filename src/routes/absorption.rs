//! Route `absorption`: a single-effect LiBr–water chiller driven by hot water from the solar
//! store (and the boiler), rejecting heat through a wet cooling tower.
//!
//! Per hour: the tower's cold water is found for the heat the machine rejects (two fixed-point
//! passes: first at the rejection the rated COP implies, then at the solved one); the machine
//! is solved for the hour's load at the chilled-water set-point (`MeetLoad`: capacity control
//! by lowering the hot-water supply with a mixing valve — the required supply temperature is
//! what the route asks for). Rules:
//! * required supply above `t_supply_max_c` (hot cooling water): the machine runs at
//!   `t_supply_max_c` with the capacity it has there (`GivenSupply`); the rest goes to the
//!   backup electric chiller or stays unmet;
//! * backup `boiler`: the route asks for the required supply whatever the store's temperature
//!   (the boiler lifts it); backup `electric-chiller`: the machine runs on store heat alone,
//!   enabled by the plant between its cut-in and cut-out temperatures (`t_cut_in_c`,
//!   `t_cut_out_c`, defaults 75 / 65 °C: the trade's 65–75 °C range for small single-effect
//!   machines, common practice); it asks at the store's top temperature when that is below
//!   the requirement, runs at the capacity that supply gives, and the backup chiller — the
//!   `[baseline]` plant of [`super::conventional`], run exactly as the reference runs it —
//!   carries the rest;
//! * the heat supplied may fall short of the request: cooling then scales with it at the
//!   solved thermal COP;
//! * heat rejection: the machine's own wet tower, its variable-speed fan holding the cooling
//!   water at wet-bulb + design approach (at least 18 °C), as the baseline's tower does;
//! * parasitics: solution pump (from the cycle), hot-water pump in W per kW of driving heat
//!   (default common practice), and — at the `[baseline]` plant's rates, like for like — the
//!   condenser-water pump on the heat rejected and the chilled-water pump on the cooling.
//!
//! No warm start is kept between hours (`&self` and no interior mutability): every solve starts
//! from the design point. Cost per hour: about 2 × (3–5 Newton iterations × 5 residual
//! evaluations) ≈ 40 residual evaluations of ~14 property calls each, plus two tower Brent
//! solves (~12 psychrometric evaluations each).

use super::conventional::Conventional;
use super::{Cooling, Electricity};
use super::{HeatRequest, HeatSupplied, HourConditions, Memo, Reason, Route, RouteHour};
use crate::components::absorption_cycle::{CyclePoint, Machine, Mode, Rating};
use crate::components::absorption_fit::{self, Datasheet, FitReport};
use crate::components::chiller_electric::ChillerSpec;
use crate::components::cooling_tower::{Tower, TowerSpec};
use crate::error::Result;
use crate::validate;
use serde::Deserialize;

/// What covers the cooling the absorption machine cannot make.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Backup {
    /// The boiler lifts the generator supply to what the load needs.
    Boiler,
    /// The baseline electric chiller carries the rest.
    ElectricChiller,
}

fn d_cap() -> f64 {
    35.0
}
fn d_hw_in() -> f64 {
    88.0
}
fn d_hw_out() -> f64 {
    83.0
}
fn d_cw_in() -> f64 {
    31.0
}
fn d_cw_out() -> f64 {
    35.0
}
fn d_chw_in() -> f64 {
    12.5
}
fn d_chw_out() -> f64 {
    7.0
}
fn d_shx() -> f64 {
    0.7
}
fn d_backup() -> Backup {
    Backup::Boiler
}
fn d_pump_hw() -> f64 {
    10.0
}
fn d_cut_in() -> f64 {
    75.0
}
fn d_cut_out() -> f64 {
    65.0
}
fn d_tmax() -> f64 {
    95.0
}
fn d_margin() -> f64 {
    5.0
}

/// The `absorption` route's scenario section (defaults common practice for small
/// hot-water-fired machines).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AbsorptionSpec {
    /// Cooling capacity at rating, kW (default 35).
    #[serde(default = "d_cap")]
    pub capacity_kw: f64,
    /// Rating temperatures, °C (defaults 88/83 hot, 31/35 cooling, 12.5/7 chilled water).
    #[serde(default = "d_hw_in")]
    pub t_hw_in_c: f64,
    #[serde(default = "d_hw_out")]
    pub t_hw_out_c: f64,
    #[serde(default = "d_cw_in")]
    pub t_cw_in_c: f64,
    #[serde(default = "d_cw_out")]
    pub t_cw_out_c: f64,
    #[serde(default = "d_chw_in")]
    pub t_chw_in_c: f64,
    #[serde(default = "d_chw_out")]
    pub t_chw_out_c: f64,
    /// Solution heat-exchanger effectiveness (default 0.7).
    #[serde(default = "d_shx")]
    pub sol_hx_effectiveness: f64,
    #[serde(default)]
    pub tower: TowerSpec,
    /// `boiler` (default) or `electric-chiller`.
    #[serde(default = "d_backup")]
    pub backup: Backup,
    /// Hot-water pump power per kW of driving heat, W/kW (default 10). The condenser- and
    /// chilled-water pumps are the `[baseline]` plant's (same rates for every option).
    #[serde(default = "d_pump_hw")]
    pub pump_hw_w_per_kw: f64,
    /// Electric backup: the plant starts the machine when the store's top reaches this, °C
    /// (default 75).
    #[serde(default = "d_cut_in")]
    pub t_cut_in_c: f64,
    /// Electric backup: the plant stops the machine when the store's top falls below this, °C
    /// (default 65; at most `t_cut_in_c`).
    #[serde(default = "d_cut_out")]
    pub t_cut_out_c: f64,
    /// Highest generator supply, °C (default 95).
    #[serde(default = "d_tmax")]
    pub t_supply_max_c: f64,
    /// Smallest crystallisation margin of the strong solution leaving the SHX, K (default 5):
    /// the generator supply is lowered until the margin is at least this (capacity limited,
    /// hour counted as `crystallisation-margin`).
    #[serde(default = "d_margin")]
    pub cryst_margin_min_k: f64,
    /// Manufacturer's performance table (CSV, `components::absorption_fit`); a relative path
    /// is taken from the scenario's folder. When given, the machine sized at rating is fitted
    /// to it (four UA multipliers and the SHX effectiveness) and the fitted machine runs the
    /// year; a fit beyond the bounds is refused.
    #[serde(default)]
    pub datasheet: Option<String>,
    /// Start-up cost and run/off limits (`[…absorption.starts]`; default thermal mass
    /// [`THERMAL_MASS_KJ_K_PER_KW`]).
    #[serde(default)]
    pub starts: super::StartSpec,
}

/// Default thermal mass a single-effect machine warms at each start, kJ/K per kW of rated
/// cooling: its generator, solution and hot-water circuit, about a third of a small machine's
/// roughly 25 kJ/(K·kW) (an assumption, common practice, from memory; listed in reports).
pub const THERMAL_MASS_KJ_K_PER_KW: f64 = 8.0;

impl AbsorptionSpec {
    /// Check every key (names relative to the section).
    pub fn validate(&self) -> Result<()> {
        self.rating().validate()?;
        self.tower.validate().map_err(|e| e.within("", "tower"))?;
        validate::in_range(
            "pump_hw_w_per_kw",
            self.pump_hw_w_per_kw,
            0.0,
            100.0,
            "hot-water pump power per kW of driving heat, W/kW",
        )?;
        validate::in_range(
            "t_cut_in_c",
            self.t_cut_in_c,
            40.0,
            self.t_supply_max_c,
            "store temperature that starts the machine, °C (at most t_supply_max_c)",
        )?;
        validate::in_range(
            "t_cut_out_c",
            self.t_cut_out_c,
            40.0,
            self.t_cut_in_c,
            "store temperature that stops the machine, °C (at most t_cut_in_c)",
        )?;
        validate::in_range(
            "t_supply_max_c",
            self.t_supply_max_c,
            self.t_hw_in_c,
            130.0,
            "highest generator supply, °C (at least the rating supply)",
        )?;
        self.starts.validate()?;
        validate::in_range(
            "cryst_margin_min_k",
            self.cryst_margin_min_k,
            0.0,
            30.0,
            "crystallisation margin, K",
        )?;
        if let Some(d) = &self.datasheet
            && d.trim().is_empty()
        {
            return Err(crate::error::Error::input(
                "datasheet",
                "\"\"",
                "the path of a CSV performance table",
            ));
        }
        Ok(())
    }

    fn rating(&self) -> Rating {
        Rating {
            capacity_kw: self.capacity_kw,
            t_hw_in_c: self.t_hw_in_c,
            t_hw_out_c: self.t_hw_out_c,
            t_cw_in_c: self.t_cw_in_c,
            t_cw_out_c: self.t_cw_out_c,
            t_chw_in_c: self.t_chw_in_c,
            t_chw_out_c: self.t_chw_out_c,
            sol_hx_effectiveness: self.sol_hx_effectiveness,
        }
    }
}

/// Why the absorption route did what it did (to be folded into `Reason` by the lead).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum AbsorptionReason {
    Ok,
    NoLoad,
    /// Load above what the machine makes at the hour's supply/cooling water.
    CapacityLimit,
    /// No store heat may be drawn (electric backup, store below the cut-in band): machine off.
    StoreBelowCutIn,
    /// Capacity limited to keep the strong solution's crystallisation margin (or, when even
    /// the lowest supply is too close, machine off).
    CrystallisationMargin,
    /// The cycle solve failed (no convergence or no refrigerant flow): machine off this hour.
    NoSolution,
}

impl AbsorptionReason {
    pub fn as_str(&self) -> &'static str {
        match self {
            AbsorptionReason::Ok => "ok",
            AbsorptionReason::NoLoad => "no-load",
            AbsorptionReason::CapacityLimit => "capacity-limit",
            AbsorptionReason::StoreBelowCutIn => "store-below-cut-in",
            AbsorptionReason::CrystallisationMargin => "crystallisation-margin",
            AbsorptionReason::NoSolution => "no-solution",
        }
    }
}

/// The hour as the absorption route sees it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AbsorptionHour {
    /// Generator hot-water supply, °C (0 when off).
    pub t_gen_in_c: f64,
    /// Cooling water entering the absorber, °C.
    pub t_cw_in_c: f64,
    /// Driving heat wanted, kWh.
    pub heat_kwh: f64,
    /// Hot water returned, °C.
    pub t_return_c: f64,
    /// Cooling the machine makes with the full request, kWh.
    pub cooling_kwh: f64,
    pub cop_thermal: f64,
    /// Solution pump electricity with the heat wanted, kWh.
    pub solution_pump_kwh: f64,
    /// Tower heat rejected with the heat wanted, kWh.
    pub heat_rejected_kwh: f64,
    /// Crystallisation margin of the strong solution, K (`None` when the machine is off).
    pub cryst_margin_k: Option<f64>,
    pub reason: AbsorptionReason,
}

/// The absorption route.
#[derive(Debug, Clone)]
pub struct Absorption {
    pub spec: AbsorptionSpec,
    pub machine: Machine,
    pub tower: Tower,
    /// The backup chiller: the `[baseline]` plant.
    pub backup_chiller: Conventional,
    /// Condenser- and chilled-water pump rates of the `[baseline]` plant, W/kW.
    pub pump_cw_w_per_kw: f64,
    pub pump_chw_w_per_kw: f64,
    /// The last solved hour and cycle point: `run` repeats `heat_request`'s solve for the same
    /// hour and store temperature (served from here), and each solve starts from the last
    /// cycle point (warm start).
    memo: Memo<MemoState>,
}

#[derive(Debug, Default, Clone, Copy)]
struct MemoState {
    key: Option<(usize, u64)>,
    hour: Option<AbsorptionHour>,
    warm: Option<CyclePoint>,
}

/// Fit the machine the section rates to a datasheet (see `components::absorption_fit`): the
/// report, whether or not within its bounds.
///
/// Errors: `Input` for a bad section or a row the rated machine cannot solve, `Internal` when
/// the rating is infeasible or the fit fails.
pub fn calibrate(spec: &AbsorptionSpec, sheet: &Datasheet) -> Result<FitReport> {
    spec.validate()?;
    absorption_fit::fit(&Machine::size(spec.rating())?, sheet, None)
}

/// Size the machine at its rating (fitted to `datasheet` when given: a fit beyond the bounds
/// is an error) and the tower for the machine's heat rejection at rating.
///
/// Errors: `Input` for a bad section or a refused fit, `Internal` when the rating is
/// infeasible.
pub fn build(
    spec: AbsorptionSpec,
    baseline: &ChillerSpec,
    datasheet: Option<&Datasheet>,
) -> Result<Absorption> {
    spec.validate()?;
    let machine = match datasheet {
        None => Machine::size(spec.rating())?,
        Some(sheet) => {
            let fit = calibrate(&spec, sheet)?;
            fit.accept()?;
            fit.machine
        }
    };
    let tower = spec
        .tower
        .size(machine.design.q_abs_kw + machine.design.q_cond_kw)?;
    Ok(Absorption {
        spec,
        machine,
        tower,
        backup_chiller: Conventional::new(baseline.clone())?,
        pump_cw_w_per_kw: baseline.pump_cw_w_per_kw,
        pump_chw_w_per_kw: baseline.pump_chw_w_per_kw,
        memo: Memo::default(),
    })
}

impl Absorption {
    fn off(&self, c: &HourConditions, reason: AbsorptionReason) -> AbsorptionHour {
        AbsorptionHour {
            t_gen_in_c: 0.0,
            t_cw_in_c: c.t_wb_c,
            heat_kwh: 0.0,
            t_return_c: 0.0,
            cooling_kwh: 0.0,
            cop_thermal: 0.0,
            solution_pump_kwh: 0.0,
            heat_rejected_kwh: 0.0,
            cryst_margin_k: None,
            reason,
        }
    }

    /// The machine at the chilled-water set-point; a warm start that fails is retried from
    /// the design point (never a silent number).
    fn solve_retrying(
        &self,
        mode: Mode,
        t_cw: f64,
        warm: Option<&CyclePoint>,
    ) -> Result<CyclePoint> {
        let (m, t_chw) = (&self.machine, self.spec.t_chw_out_c);
        m.solve(mode, t_cw, t_chw, warm)
            .or_else(|_| m.solve(mode, t_cw, t_chw, None))
    }

    fn solve_at(
        &self,
        c: &HourConditions,
        load: f64,
        t_avail: f64,
        t_cw: f64,
        warm: Option<&CyclePoint>,
    ) -> Result<CyclePoint> {
        let solve = |mode: Mode| self.solve_retrying(mode, t_cw, warm);
        let need = solve(Mode::MeetLoad { q_evap_kw: load });
        match need {
            Ok(p) if p.t_hw_in_c <= t_avail => Ok(p),
            _ => {
                let _ = c;
                solve(Mode::GivenSupply { t_hw_in_c: t_avail })
            }
        }
    }

    /// Solve the hour: tower and machine coupled by two fixed-point passes on the rejected heat.
    ///
    /// * `c` – the hour; `t_store_top_c` – store top, °C (`None` without a store)
    ///
    /// Returns the route's hourly extras; never fails (a failed solve is the reason
    /// `NoSolution` with the machine off).
    pub fn solve_hour(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> AbsorptionHour {
        let key = (c.hour, t_store_top_c.map_or(u64::MAX, f64::to_bits));
        let memo = self.memo.get();
        if let (Some(k), Some(h)) = (memo.key, memo.hour)
            && k == key
        {
            return h;
        }
        let (h, warm) = self.solve_hour_from(c, t_store_top_c, memo.warm.as_ref());
        self.memo.set(MemoState {
            key: Some(key),
            hour: Some(h),
            warm: warm.or(memo.warm),
        });
        h
    }

    fn solve_hour_from(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        warm: Option<&CyclePoint>,
    ) -> (AbsorptionHour, Option<CyclePoint>) {
        let load = c.load.cooling_kw();
        if load <= 0.0 {
            return (self.off(c, AbsorptionReason::NoLoad), None);
        }
        let s = &self.spec;
        let t_avail = match (s.backup, t_store_top_c) {
            (Backup::Boiler, _) => s.t_supply_max_c,
            (Backup::ElectricChiller, None) => {
                return (self.off(c, AbsorptionReason::StoreBelowCutIn), None);
            }
            (Backup::ElectricChiller, Some(t)) => {
                (t - super::SUPPLY_MARGIN_K).min(s.t_supply_max_c)
            }
        };
        let cap_load = load.min(1.3 * s.capacity_kw);
        let mut reject = cap_load * (1.0 + 1.0 / self.machine.design.cop());
        let mut p = None;
        for _ in 0..2 {
            // The variable-speed fan holds the set-point unless full speed cannot
            // (`Tower::run_held`): the cold water is the warmer of the two.
            let t_cw = match self.tower.t_cold_c(reject, c.t_wb_c, c.p_kpa) {
                Ok(t) => t.max(self.t_set_c(c)),
                Err(_) => return (self.off(c, AbsorptionReason::NoSolution), None),
            };
            match self.solve_at(c, cap_load, t_avail, t_cw, p.as_ref().or(warm)) {
                Ok(q) if q.q_evap_kw > 0.0 => {
                    reject = q.q_abs_kw + q.q_cond_kw;
                    p = Some(q);
                }
                _ => return (self.off(c, AbsorptionReason::NoSolution), None),
            }
        }
        let Some(mut p) = p else {
            return (self.off(c, AbsorptionReason::NoSolution), None);
        };
        let mut limited_by_cryst = false;
        if p.cryst_margin_k < s.cryst_margin_min_k {
            match self.limit_for_crystallisation(&p) {
                Some(q) => {
                    reject = q.q_abs_kw + q.q_cond_kw;
                    p = q;
                    limited_by_cryst = true;
                }
                None => return (self.off(c, AbsorptionReason::CrystallisationMargin), None),
            }
        }
        let cooling = p.q_evap_kw.min(load);
        let reason = if limited_by_cryst {
            AbsorptionReason::CrystallisationMargin
        } else if cooling < load - 1e-6 {
            AbsorptionReason::CapacityLimit
        } else {
            AbsorptionReason::Ok
        };
        let hour = AbsorptionHour {
            t_gen_in_c: p.t_hw_in_c,
            t_cw_in_c: p.t_cw_in_c,
            heat_kwh: p.q_gen_kw,
            t_return_c: p.t_hw_out_c,
            cooling_kwh: cooling,
            cop_thermal: p.cop(),
            solution_pump_kwh: p.w_pump_kw,
            heat_rejected_kwh: reject,
            cryst_margin_k: Some(p.cryst_margin_k),
            reason,
        };
        (hour, Some(p))
    }

    /// The crystallisation guard: `p` has a strong solution closer to crystallisation than
    /// `cryst_margin_min_k`. The margin shrinks as the generator supply rises (the strong
    /// solution grows richer in LiBr faster than its SHX outlet warms), so the supply is
    /// lowered — at the same cooling-water temperature — to the highest one where the margin
    /// equals the minimum (Brent, 0.01 K, between `p`'s supply and the supply that makes 1 % of
    /// the rated cooling). The machine then makes what that supply gives; the rest goes
    /// to the backup. `None` when even the lowest supply is too close (machine off).
    fn limit_for_crystallisation(&self, p: &CyclePoint) -> Option<CyclePoint> {
        let m = &self.machine;
        let (t_cw, t_chw) = (p.t_cw_in_c, self.spec.t_chw_out_c);
        let min = self.spec.cryst_margin_min_k;
        let at = |t: f64| self.solve_retrying(Mode::GivenSupply { t_hw_in_c: t }, t_cw, Some(p));
        let lo = m
            .solve(
                Mode::MeetLoad {
                    q_evap_kw: 0.01 * self.spec.capacity_kw,
                },
                t_cw,
                t_chw,
                None,
            )
            .ok()?;
        let margin = |t: f64| at(t).map_or(f64::NAN, |q| q.cryst_margin_k - min);
        // The margin is not monotonic over the whole range (below the crystallisation fit's
        // lowest mass fraction its temperature is held at the fit's end, so the margin grows
        // with the SHX outlet temperature there): step down from `p`'s supply in eighths of
        // the range to the first supply with enough margin, and bracket the root there.
        let (t_lo, t_hi) = (lo.t_hw_in_c, p.t_hw_in_c);
        let mut hi = t_hi;
        let mut bracket = None;
        for k in 1..=8 {
            let t = t_hi - (t_hi - t_lo) * f64::from(k) / 8.0;
            if margin(t) > 0.0 {
                bracket = Some((t, hi));
                break;
            }
            hi = t;
        }
        let (a, b) = bracket?;
        let t = crate::num::brent("absorption crystallisation limit", a, b, 0.01, margin).ok()?;
        at(t).ok().filter(|q| q.q_evap_kw > 0.0)
    }

    /// The machine's cooling-water set-point: the baseline tower's rule with this tower's
    /// design approach.
    fn t_set_c(&self, c: &HourConditions) -> f64 {
        super::conventional::tower_set_point_c(c, self.spec.tower.design_approach_k)
    }
}

impl Route for Absorption {
    fn kind(&self) -> &'static str {
        "absorption"
    }

    fn start_up(&self) -> Option<super::StartUp> {
        Some(
            self.spec
                .starts
                .build(self.spec.capacity_kw, THERMAL_MASS_KJ_K_PER_KW),
        )
    }

    fn cut_in_out_c(&self) -> Option<(f64, f64)> {
        (self.spec.backup == Backup::ElectricChiller)
            .then_some((self.spec.t_cut_in_c, self.spec.t_cut_out_c))
    }

    fn heat_request(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> Option<HeatRequest> {
        let h = self.solve_hour(c, t_store_top_c);
        (h.heat_kwh > 0.0).then_some(HeatRequest {
            heat_kwh: h.heat_kwh,
            t_supply_c: h.t_gen_in_c,
            t_return_c: h.t_return_c,
            boiler_backup: self.spec.backup == Backup::Boiler,
        })
    }

    fn run(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        heat: Option<HeatSupplied>,
    ) -> RouteHour {
        let load = c.load.cooling_kw();
        if load.is_nan() || load <= 0.0 {
            return RouteHour::no_load();
        }
        // The same solve as the request (same store temperature); the heat actually supplied
        // scales it (the machine at the solved COP on less heat).
        let h = self.solve_hour(c, t_store_top_c);
        let supplied = heat.map_or(0.0, |q| q.solar_kwh + q.backup_kwh);
        let frac = if h.heat_kwh > 0.0 {
            (supplied / h.heat_kwh).clamp(0.0, 1.0)
        } else {
            0.0
        };
        let cooling = h.cooling_kwh * frac;
        let heat_used = h.heat_kwh * frac;
        let rejected = h.heat_rejected_kwh * frac;
        let tw = (rejected > 0.0)
            .then(|| {
                self.tower
                    .run_held(rejected, c.t_wb_c, c.p_kpa, self.t_set_c(c))
                    .ok()
            })
            .flatten();
        let fan = tw.map_or(0.0, |t| t.fan_kwh);
        // Water pumps besides the solution pump (whose work is inside the cycle's rejection).
        let water_pumps = (self.spec.pump_hw_w_per_kw * heat_used
            + self.pump_cw_w_per_kw * rejected
            + self.pump_chw_w_per_kw * cooling)
            / 1000.0;
        let mut out = RouteHour {
            cooling: Cooling {
                heat_driven_kwh: cooling,
                ..Cooling::default()
            },
            electricity: Electricity {
                compressor_kwh: 0.0,
                heat_rejection_kwh: fan,
                pumps_kwh: h.solution_pump_kwh * frac + water_pumps,
                air_handling_kwh: 0.0,
            },
            heat_rejected_kwh: rejected + fan + water_pumps,
            water_m3: tw.map_or(0.0, |t| t.water_m3),
            t_drive_c: (cooling > 0.0).then_some(h.t_gen_in_c),
            t_sink_c: Some(h.t_cw_in_c),
            t_chw_c: (cooling > 0.0).then_some(self.spec.t_chw_out_c),
            detail: [
                ("t_return_c", h.t_return_c),
                ("cryst_margin_k", h.cryst_margin_k.unwrap_or(0.0)),
                ("", 0.0),
                ("", 0.0),
            ],
            ..RouteHour::default()
        };
        let rest = load - cooling;
        if self.spec.backup == Backup::ElectricChiller && rest > 1e-9 {
            out.add_backup(&self.backup_chiller.serve(c, rest));
        }
        let unmet = (load - out.cooling_kwh()).max(0.0);
        out.unmet_kwh = unmet;
        out.reason = match h.reason {
            AbsorptionReason::Ok | AbsorptionReason::NoLoad if unmet > 1e-6 => {
                Reason::CapacityLimit
            }
            AbsorptionReason::Ok | AbsorptionReason::NoLoad
                if frac < 1.0 - 1e-9 && h.heat_kwh > 0.0 =>
            {
                Reason::HeatShort
            }
            AbsorptionReason::Ok | AbsorptionReason::NoLoad => Reason::Ok,
            AbsorptionReason::CapacityLimit => Reason::CapacityLimit,
            AbsorptionReason::StoreBelowCutIn => Reason::StoreBelowCutIn,
            AbsorptionReason::CrystallisationMargin => Reason::CrystallisationMargin,
            AbsorptionReason::NoSolution => Reason::NoSolution,
        };
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::chiller_electric::Condenser;
    use crate::load::LoadHour;

    fn spec() -> AbsorptionSpec {
        toml::from_str("").unwrap()
    }

    fn hour(load_kw: f64, t_wb: f64) -> HourConditions {
        HourConditions {
            hour: 4000,
            t_db_c: t_wb + 6.0,
            w_kg_kg: 0.015,
            t_wb_c: t_wb,
            p_kpa: 101.325,
            load: LoadHour {
                sensible_kw: load_kw,
                latent_kw: 0.0,
                heating_kw: 0.0,
                t_in_c: 25.0,
                ventilation_m3_h: 0.0,
            },
        }
    }

    #[test]
    fn meets_part_load_with_boiler_backup() {
        let r = build(
            spec(),
            &ChillerSpec::typical(Condenser::WaterCooled, 35.0),
            None,
        )
        .unwrap();
        let c = hour(20.0, 24.0);
        let req = r.heat_request(&c, Some(90.0)).unwrap();
        let h = r.solve_hour(&c, Some(90.0));
        assert!(req.t_supply_c < 88.0 && req.t_supply_c > 60.0, "{req:?}");
        assert!(h.cop_thermal > 0.6 && h.cop_thermal < 0.85, "{h:?}");
        let out = r.run(
            &c,
            Some(90.0),
            Some(HeatSupplied {
                solar_kwh: req.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert!((out.cooling_kwh() - 20.0).abs() < 1e-6 && out.unmet_kwh < 1e-6);
        assert_eq!(out.cooling.heat_driven_kwh, out.cooling_kwh());
        // Half the heat: half the cooling (electric-free boiler backup leaves the rest unmet).
        let half = r.run(
            &c,
            Some(90.0),
            Some(HeatSupplied {
                solar_kwh: 0.5 * req.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert!((half.cooling_kwh() - 10.0).abs() < 1e-6);
    }

    #[test]
    fn electric_backup_when_store_cold() {
        let mut s = spec();
        s.backup = Backup::ElectricChiller;
        let r = build(s, &ChillerSpec::typical(Condenser::WaterCooled, 35.0), None).unwrap();
        let c = hour(30.0, 24.0);
        assert_eq!(r.cut_in_out_c(), Some((75.0, 65.0)));
        // Below the cut-in band the plant passes no store temperature: machine off, and the
        // hour is exactly the baseline plant's.
        assert!(r.heat_request(&c, None).is_none());
        let out = r.run(&c, None, None);
        assert_eq!(out.reason, Reason::StoreBelowCutIn);
        let base = r.backup_chiller.serve(&c, 30.0);
        assert!(
            (out.cooling.electric_kwh - 30.0).abs() < 1e-9 && out.cooling.heat_driven_kwh == 0.0
        );
        assert_eq!(out.electricity_kwh(), base.electricity_kwh());
        assert_eq!(out.water_m3, base.water_m3);
    }

    /// Crystallisation guard. The over-loaded machine runs where its strong solution is
    /// richest; at these conditions the margin is ~38 K, far above the default 5 K (this
    /// machine does not come near crystallisation within its supply range), so the test asks
    /// for a margin 1 K above what the hour has (the most this hour reaches at a lower supply is
    /// ~1.8 K more) — set on the built route, past the input range
    /// check, to exercise the mechanism: the supply is lowered until the margin is exactly the
    /// minimum, and the electric backup carries the cooling given up.
    #[test]
    fn crystallisation_margin_limits_capacity() {
        let bc = ChillerSpec::typical(Condenser::WaterCooled, 35.0);
        let mut s = spec();
        s.backup = Backup::ElectricChiller;
        let free = build(s.clone(), &bc, None).unwrap();
        let c = hour(60.0, 19.0);
        let h0 = free.solve_hour(&c, Some(95.0));
        assert_eq!(h0.reason, AbsorptionReason::CapacityLimit, "{h0:?}");
        let mut guarded = build(s.clone(), &bc, None).unwrap();
        let m0 = h0.cryst_margin_k.unwrap();
        guarded.spec.cryst_margin_min_k = m0 + 1.0;
        let min = guarded.spec.cryst_margin_min_k;
        let h1 = guarded.solve_hour(&c, Some(95.0));
        assert_eq!(h1.reason, AbsorptionReason::CrystallisationMargin, "{h1:?}");
        assert!((h1.cryst_margin_k.unwrap() - min).abs() < 0.05, "{h1:?}");
        assert!(h1.t_gen_in_c < h0.t_gen_in_c - 0.5, "{h1:?}");
        assert!(h1.cooling_kwh < h0.cooling_kwh, "{h1:?}");
        let req = guarded.heat_request(&c, Some(95.0)).unwrap();
        let out = guarded.run(
            &c,
            Some(95.0),
            Some(HeatSupplied {
                solar_kwh: req.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert_eq!(out.reason, Reason::CrystallisationMargin);
        assert!((out.cooling_kwh() - 60.0).abs() < 1e-6, "{out:?}");
        assert!((out.cooling.electric_kwh - (60.0 - h1.cooling_kwh)).abs() < 1e-6);
        // A margin no supply reaches: the machine stays off, the backup carries the hour.
        let mut off = build(s, &bc, None).unwrap();
        off.spec.cryst_margin_min_k = m0 + 5.0;
        let h2 = off.solve_hour(&c, Some(95.0));
        assert_eq!(h2.reason, AbsorptionReason::CrystallisationMargin);
        assert_eq!(h2.heat_kwh, 0.0);
        let out = off.run(&c, Some(95.0), None);
        // (the baseline chiller backing it up is rated 35 kW: the rest is unmet)
        assert!((out.cooling.electric_kwh - 35.0).abs() < 1e-6, "{out:?}");
        assert!((out.cooling_kwh() - out.cooling.electric_kwh).abs() < 1e-9);
        assert!((out.unmet_kwh - 25.0).abs() < 1e-6);
    }

    #[test]
    fn bad_input_is_error() {
        let bc = ChillerSpec::typical(Condenser::WaterCooled, 35.0);
        let mut s = spec();
        s.t_hw_in_c = 30.0; // hot water colder than cooling water
        assert!(build(s, &bc, None).is_err());
        let mut s = spec();
        s.t_chw_in_c = 36.0;
        s.t_chw_out_c = 7.0; // chilled water above cooling water
        assert!(build(s, &bc, None).is_err());
        let mut s = spec();
        s.sol_hx_effectiveness = 0.0;
        assert!(build(s, &bc, None).is_err());
        assert!(toml::from_str::<AbsorptionSpec>("bogus = 1").is_err());
    }
}
