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
//!   (the boiler lifts it); backup `electric-chiller`: it asks at the store's top temperature
//!   when that is below the requirement and at least `t_supply_min_c`, runs at the capacity
//!   that supply gives, and the electric chiller carries the rest; below `t_supply_min_c` it
//!   asks for nothing and the electric chiller carries the whole load;
//! * the heat supplied may fall short of the request: cooling then scales with it at the
//!   solved thermal COP;
//! * parasitics: solution pump (from the cycle), hot/cooling/chilled-water pumps in W per kW of
//!   the stream's heat (defaults common practice), tower fan.
//!
//! No warm start is kept between hours (`&self` and no interior mutability): every solve starts
//! from the design point. Cost per hour: about 2 × (3–5 Newton iterations × 5 residual
//! evaluations) ≈ 40 residual evaluations of ~14 property calls each, plus two tower Brent
//! solves (~12 psychrometric evaluations each).

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
fn d_pump_cw() -> f64 {
    15.0
}
fn d_pump_chw() -> f64 {
    15.0
}
fn d_tmin() -> f64 {
    70.0
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
    /// Pump power per kW of the stream's heat, W/kW (defaults 10 hot, 15 cooling, 15 chilled).
    #[serde(default = "d_pump_hw")]
    pub pump_hw_w_per_kw: f64,
    #[serde(default = "d_pump_cw")]
    pub pump_cw_w_per_kw: f64,
    #[serde(default = "d_pump_chw")]
    pub pump_chw_w_per_kw: f64,
    /// Lowest supply worth running on without the boiler, °C (default 70).
    #[serde(default = "d_tmin")]
    pub t_supply_min_c: f64,
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
}

impl AbsorptionSpec {
    /// Check every key (names relative to the section).
    pub fn validate(&self) -> Result<()> {
        self.rating().validate()?;
        self.tower.validate().map_err(|e| e.within("", "tower"))?;
        for (k, v) in [
            ("pump_hw_w_per_kw", self.pump_hw_w_per_kw),
            ("pump_cw_w_per_kw", self.pump_cw_w_per_kw),
            ("pump_chw_w_per_kw", self.pump_chw_w_per_kw),
        ] {
            validate::in_range(k, v, 0.0, 100.0, "pump power per kW of heat, W/kW")?;
        }
        validate::in_range(
            "t_supply_min_c",
            self.t_supply_min_c,
            40.0,
            self.t_hw_in_c,
            "lowest useful supply, °C (at most the rating supply)",
        )?;
        validate::in_range(
            "t_supply_max_c",
            self.t_supply_max_c,
            self.t_hw_in_c,
            130.0,
            "highest generator supply, °C (at least the rating supply)",
        )?;
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
    /// Store below `t_supply_min_c` (electric backup): the machine stays off.
    SupplyTooCold,
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
            AbsorptionReason::SupplyTooCold => "supply-too-cold",
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
    /// Cooling per electricity of pumps and fan, with the heat wanted.
    pub cop_electric: f64,
    pub electricity_kwh: f64,
    /// Tower heat rejected, kWh.
    pub heat_rejected_kwh: f64,
    pub tower_water_m3: f64,
    pub cryst_margin_k: f64,
    pub reason: AbsorptionReason,
}

/// The absorption route.
#[derive(Debug, Clone)]
pub struct Absorption {
    pub spec: AbsorptionSpec,
    pub machine: Machine,
    pub tower: Tower,
    pub baseline: ChillerSpec,
    /// Tower approach of the baseline chiller's water, K.
    pub tower_approach_k: f64,
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
    let tower_approach_k = spec.tower.design_approach_k;
    Ok(Absorption {
        spec,
        machine,
        tower,
        baseline: baseline.clone(),
        tower_approach_k,
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
            cop_electric: 0.0,
            electricity_kwh: 0.0,
            heat_rejected_kwh: 0.0,
            tower_water_m3: 0.0,
            cryst_margin_k: f64::INFINITY,
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
            (Backup::Boiler, _) | (Backup::ElectricChiller, None) => s.t_supply_max_c,
            (Backup::ElectricChiller, Some(t)) => {
                if t < s.t_supply_min_c {
                    return (self.off(c, AbsorptionReason::SupplyTooCold), None);
                }
                t.min(s.t_supply_max_c)
            }
        };
        let cap_load = load.min(1.3 * s.capacity_kw);
        let mut reject = cap_load * (1.0 + 1.0 / self.machine.design.cop());
        let mut p = None;
        for _ in 0..2 {
            let t_cw = match self.tower.t_cold_c(reject, c.t_wb_c, c.p_kpa) {
                Ok(t) => t.max(crate::routes::electric::MIN_CONDENSER_WATER_C),
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
        let tw = self.tower.run(reject, c.t_wb_c, c.p_kpa).ok();
        let cooling = p.q_evap_kw.min(load);
        let elec = p.w_pump_kw
            + (s.pump_hw_w_per_kw * p.q_gen_kw
                + s.pump_cw_w_per_kw * reject
                + s.pump_chw_w_per_kw * p.q_evap_kw)
                / 1000.0
            + tw.map_or(0.0, |t| t.fan_kwh);
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
            cop_electric: cooling / elec,
            electricity_kwh: elec,
            heat_rejected_kwh: reject,
            tower_water_m3: tw.map_or(0.0, |t| t.water_m3),
            cryst_margin_k: p.cryst_margin_k,
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

    fn backup_electric(&self, rest_kw: f64, t_cw: f64) -> (f64, f64) {
        if rest_kw <= 0.0 {
            return (0.0, 0.0);
        }
        let h = self
            .baseline
            .run_hour(rest_kw, t_cw, self.baseline.t_chw_supply_c);
        (h.cooling_kwh, h.electricity_kwh)
    }
}

impl Route for Absorption {
    fn kind(&self) -> &'static str {
        "absorption"
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
        if load <= 0.0 {
            return RouteHour {
                cooling_kwh: 0.0,
                unmet_kwh: 0.0,
                electricity_kwh: 0.0,
                heat_rejected_kwh: 0.0,
                cop_thermal: None,
                cop_electric: None,
                reason: Reason::NoLoad,
                ..RouteHour::default()
            };
        }
        // The same solve as the request (same store temperature); the heat actually supplied
        // scales it.
        let h = self.solve_hour(c, t_store_top_c);
        let supplied = heat.map_or(0.0, |q| q.solar_kwh + q.backup_kwh);
        let frac = if h.heat_kwh > 0.0 {
            (supplied / h.heat_kwh).clamp(0.0, 1.0)
        } else {
            0.0
        };
        let cooling = h.cooling_kwh * frac;
        let mut elec = h.electricity_kwh * frac;
        let mut rejected = h.heat_rejected_kwh * frac;
        let mut delivered = cooling;
        let rest = load - cooling;
        if self.spec.backup == Backup::ElectricChiller && rest > 1e-9 {
            let t_cw = (c.t_wb_c + self.tower_approach_k)
                .max(crate::routes::electric::MIN_CONDENSER_WATER_C);
            let (q, e) = self.backup_electric(rest, t_cw);
            delivered += q;
            elec += e;
            rejected += q + e;
        }
        let unmet = (load - delivered).max(0.0);
        // Tower water for all heat rejected this hour (machine and backup chiller share it).
        let water_m3 = if rejected > 0.0 {
            self.tower
                .run(rejected, c.t_wb_c, c.p_kpa)
                .map_or(h.tower_water_m3 * frac, |t| t.water_m3)
        } else {
            0.0
        };
        let reason = match h.reason {
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
            AbsorptionReason::SupplyTooCold => Reason::SupplyTooCold,
            AbsorptionReason::CrystallisationMargin => Reason::CrystallisationMargin,
            AbsorptionReason::NoSolution => Reason::NoSolution,
        };
        RouteHour {
            cooling_kwh: delivered,
            unmet_kwh: unmet,
            electricity_kwh: elec,
            heat_rejected_kwh: rejected,
            cop_thermal: (supplied > 0.0 && cooling > 0.0).then(|| cooling / supplied),
            cop_electric: (elec > 0.0).then(|| delivered / elec),
            reason,
            water_m3,
            backup_cooling_kwh: delivered - cooling,
            t_drive_c: (h.t_gen_in_c > 0.0).then_some(h.t_gen_in_c),
            t_sink_c: Some(h.t_cw_in_c),
            detail: [
                ("t_return_c", h.t_return_c),
                ("cryst_margin_k", h.cryst_margin_k),
                ("", 0.0),
                ("", 0.0),
            ],
            ..RouteHour::default()
        }
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
        assert!((out.cooling_kwh - 20.0).abs() < 1e-6 && out.unmet_kwh < 1e-6);
        // Half the heat: half the cooling (electric-free boiler backup leaves the rest unmet).
        let half = r.run(
            &c,
            Some(90.0),
            Some(HeatSupplied {
                solar_kwh: 0.5 * req.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert!((half.cooling_kwh - 10.0).abs() < 1e-6);
    }

    #[test]
    fn electric_backup_when_store_cold() {
        let mut s = spec();
        s.backup = Backup::ElectricChiller;
        let r = build(s, &ChillerSpec::typical(Condenser::WaterCooled, 35.0), None).unwrap();
        let c = hour(30.0, 24.0);
        assert!(r.heat_request(&c, Some(60.0)).is_none());
        let out = r.run(&c, None, None);
        assert!((out.cooling_kwh - 30.0).abs() < 1e-6 && out.electricity_kwh > 0.0);
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
        guarded.spec.cryst_margin_min_k = h0.cryst_margin_k + 1.0;
        let min = guarded.spec.cryst_margin_min_k;
        let h1 = guarded.solve_hour(&c, Some(95.0));
        assert_eq!(h1.reason, AbsorptionReason::CrystallisationMargin, "{h1:?}");
        assert!((h1.cryst_margin_k - min).abs() < 0.05, "{h1:?}");
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
        assert!((out.cooling_kwh - 60.0).abs() < 1e-6, "{out:?}");
        assert!((out.backup_cooling_kwh - (60.0 - h1.cooling_kwh)).abs() < 1e-6);
        // A margin no supply reaches: the machine stays off, the backup carries the hour.
        let mut off = build(s, &bc, None).unwrap();
        off.spec.cryst_margin_min_k = h0.cryst_margin_k + 5.0;
        let h2 = off.solve_hour(&c, Some(95.0));
        assert_eq!(h2.reason, AbsorptionReason::CrystallisationMargin);
        assert_eq!(h2.heat_kwh, 0.0);
        let out = off.run(&c, Some(95.0), None);
        // (the baseline chiller backing it up is rated 35 kW: the rest is unmet)
        assert!((out.backup_cooling_kwh - 35.0).abs() < 1e-6, "{out:?}");
        assert!((out.cooling_kwh - out.backup_cooling_kwh).abs() < 1e-9);
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
