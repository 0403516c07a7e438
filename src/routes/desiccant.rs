//! Route `desiccant`: solar-regenerated desiccant evaporative cooling (open cycle).
//!
//! Air paths (states numbered as in the code):
//!
//! * supply: process inlet (1) → desiccant wheel, part bypassed (2) → sensible heat wheel,
//!   hot side (3) → supply evaporative cooler (4) → supply fan (heat pick-up) → room;
//! * regeneration: regeneration-side inlet (5) → return evaporative cooler (6) → heat wheel,
//!   cold side (7) → hot-water regeneration coil (t_regen) → desiccant wheel, part bypassed
//!   → exhaust fan → outdoors.
//!
//! `cycle = "ventilation"`: 100 % outdoor air is supplied and the room's return air
//! regenerates (process inlet = outdoor, regeneration inlet = room). `cycle = "recirculation"`:
//! room air is recirculated and outdoor air regenerates. Both are the classic open cycles
//! (Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., the chapter on solar
//! desiccant cooling; ventilation cycle after Pennington's patent, from memory).
//!
//! Control each hour with a cooling load — and, in the ventilation cycle, with mechanical
//! ventilation in the building model (`LoadHour::ventilation_m3_h > 0`); fans run only then,
//! supply flow fixed. A ventilation-cycle unit has nothing to do in an hour when the building
//! takes no outdoor air (unoccupied): it is off and the whole load goes to the backup chiller
//! (or is reported unmet), reason `not-ventilating`.
//! 1. The supply humidity ratio the space needs, `W_target = W_room − Q_lat / (m (2501 +
//!    1.86 t_room))`; the supply temperature the sensible load needs,
//!    `t_need = t_room − Q_sens / (m c_p)`.
//! 2. The supply evaporative cooler runs only when the air after the heat wheel is warmer
//!    than `t_need` (minus the fan's pick-up), at the effectiveness that reaches it, at most
//!    its design value; it is off when its wet-bulb is at or below 0 °C (frozen pad). The
//!    heat wheel and the return cooler run when the process air is warmer than the cooled
//!    return side.
//! 3. Wheel stopped (and the regeneration coil off) when the supply without it already has
//!    `W ≤ W_target` (dry outdoor air: evaporative cooling alone) — or when the process inlet is
//!    outside the wheel model's range (0–50 °C).
//! 4. Otherwise the regeneration temperature that gives `W_supply = W_target` is found by Brent's
//!    method between `t_regen_min_c` and the cap `min(t_regen_max_c, what the heat supplied
//!    allows)`. If even `t_regen_min_c` over-dries, the wheel runs at `t_regen_min_c` with the
//!    bypass fraction β (same on process and regeneration sides, keeping the flow ratio) that
//!    meets the target, found by Brent's method. If the cap is not enough, the wheel runs at
//!    the cap and the latent shortfall is unmet.
//! 5. Delivered cooling from the supply state against the room state (`t_in_c` of the load
//!    model, `w_room_kg_kg` of the spec), sensible and latent separately, each at most the
//!    room's need, plus (ventilation cycle) the ventilation load of the outdoor air replaced
//!    (below). What remains of the building load goes to the backup electric chiller
//!    (`unmet = "backup-chiller"`) or is reported unmet (`unmet = "report"`).
//!
//! Credit balance (sensible and latent each on its own; this project's derivation from the
//! steady-flow energy balance of the room and of the unit). The building model's load `Q_b`
//! (≥ 0) contains the load of its mechanical ventilation `V_b` (`LoadHour::ventilation_m3_h`,
//! outdoor → room state) besides the envelope, internal, occupant and infiltration loads. With
//! `m = V ρ_std / 3600` and the ventilation load of a dry-air flow `m`,
//! `L_s(m) = max(0, m c_p (t_out − t_room))`, `L_l(m) = max(0, m (W_out − W_room)(2501 + 1.86
//! t_room))` (ASHRAE Handbook—Fundamentals 2017 ch. 1 eq. 30 enthalpy, from memory):
//!
//! * ventilation cycle: the unit's outdoor air `V_u` replaces `V_r = min(V_u, V_b)` of the
//!   building's. The room still needs `Q_room = max(0, Q_b − L(m_r))`: the envelope, internal
//!   and infiltration loads and, when `V_u < V_b`, the load of the outdoor air the unit does not
//!   replace. The supply delivers `D = m_u (h_room − h_supply)` to the room at the unit's flow.
//!   Credited cooling `= min(D, Q_room) + (Q_b − Q_room)`: room-side delivery capped at the
//!   room's need, plus the ventilation load of the replaced outdoor air (never more than
//!   `Q_b`). The unit itself cools `m_u (h_out − h_supply) = L(m_u) + D`; when `V_u > V_b` the
//!   surplus outdoor air's load `L(m_u) − L(m_r)` is carried by the unit and never credited (the
//!   building does not have it). `V_u = V_b` is the rule before the ventilation flow reached
//!   the route (unit flow = building flow); `V_b = 0` stops the unit (above);
//! * recirculation cycle: the supply is room air, no outdoor air is replaced:
//!   `Q_room = Q_b`, credited cooling `= min(D, Q_b)`; it runs in any hour with a load.
//!
//! The backup carries `Q_b − credited` (sensible + latent). Hand check: `tests` below.
//!
//! Heat request rule: the route asks for the regeneration heat at the regeneration temperature
//! it needs, whatever the store's top temperature — the boiler lifts the supply (route
//! contract). `run` re-solves the hour; when the heat supplied is less than asked, the
//! regeneration temperature is capped at what that heat can reach (Brent on the coil heat),
//! and below `t_regen_min_c` the wheel stops.

use super::conventional::{Conventional, ConventionalHour};
use super::{
    Cooling, Electricity, HeatRequest, HeatSupplied, HourConditions, Reason, Route, RouteHour,
};
use crate::components::chiller_electric::ChillerSpec;
use crate::components::desiccant_wheel::{Air, DesiccantWheel, T_PROCESS_VALID_C};
use crate::components::evap_cooler::{EvapCooler, water_enthalpy_kj_kg};
use crate::components::heat_wheel::{
    HeatWheel, RegenCoil, cp_kj_kgk, fan_heat_rise_k, fan_power_w,
};
use crate::error::Result;
use crate::props::psychro;
use crate::validate;

/// Density of standard air used to turn the volume flow into a dry-air mass flow, kg/m³
/// (1.2 kg/m³, ASHRAE standard air, common practice).
pub const STANDARD_AIR_DENSITY_KG_M3: f64 = 1.2;

/// Which open cycle.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Cycle {
    /// 100 % outdoor air supplied; room return air regenerates.
    #[default]
    Ventilation,
    /// Room air recirculated; outdoor air regenerates.
    Recirculation,
}

/// What happens to load the desiccant unit cannot meet.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Unmet {
    /// A post-cooling coil on the backup electric chiller (the baseline chiller) takes it.
    #[default]
    BackupChiller,
    /// It is reported unmet.
    Report,
}

fn d_ratio() -> f64 {
    1.0
}
/// Default wheel F1/F2 effectivenesses: 0.05 / 0.95, the ideal end of the range a good
/// silica-gel wheel is given (`components::desiccant_wheel` docs; common practice, from memory).
/// No published pair measured on a real wheel was found and read (searched: Jurinak 1982,
/// Banks 1985, Duffie & Beckman's desiccant chapter, Panaras et al.), so this is an ASSUMPTION:
/// it likely overstates a real wheel's drying. The scenario assumptions say so and the demos
/// carry F1 0.05–0.20, F2 0.70–0.95 as uncertain inputs.
pub const DEFAULT_EPS_F1_F2: (f64, f64) = (0.05, 0.95);

fn d_eps_f1() -> f64 {
    DEFAULT_EPS_F1_F2.0
}
fn d_eps_f2() -> f64 {
    DEFAULT_EPS_F1_F2.1
}
fn d_eps_hw() -> f64 {
    0.8
}
fn d_eps_evap() -> f64 {
    0.9
}
fn d_sfp() -> f64 {
    1500.0
}
fn d_drive() -> f64 {
    15.0
}
fn d_pump() -> f64 {
    30.0
}
fn d_t_min() -> f64 {
    50.0
}
fn d_t_max() -> f64 {
    75.0
}
fn d_approach() -> f64 {
    5.0
}
fn d_water_dt() -> f64 {
    15.0
}
fn d_w_room() -> f64 {
    0.0105
}

/// `[options.NAME.desiccant]`: the desiccant evaporative cooling unit. Defaults are typical of
/// the class (common practice), not product data.
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DesiccantSpec {
    /// Supply air volume flow at standard density 1.2 kg/m³, m³/h; fixed (runs in every hour
    /// with cooling load and, in the ventilation cycle, building ventilation; module docs).
    pub supply_flow_m3_h: f64,
    /// `ventilation` (default) or `recirculation`.
    #[serde(default)]
    pub cycle: Cycle,
    /// Regeneration-side to supply dry-air flow ratio, 0.5–2 (default 1: balanced; the wheel
    /// effectivenesses must be those of this ratio).
    #[serde(default = "d_ratio")]
    pub regen_flow_ratio: f64,
    /// Desiccant wheel F1 effectiveness, 0..1 (default 0.05: ideal end, an assumption; see
    /// [`DEFAULT_EPS_F1_F2`]).
    #[serde(default = "d_eps_f1")]
    pub eps_f1: f64,
    /// Desiccant wheel F2 effectiveness, 0..1 (default 0.95: ideal end, an assumption; see
    /// [`DEFAULT_EPS_F1_F2`]).
    #[serde(default = "d_eps_f2")]
    pub eps_f2: f64,
    /// Sensible heat wheel effectiveness, 0..1 (default 0.8).
    #[serde(default = "d_eps_hw")]
    pub eps_heat_wheel: f64,
    /// Supply evaporative cooler saturation effectiveness, 0..1 (default 0.9).
    #[serde(default = "d_eps_evap")]
    pub eps_evap_supply: f64,
    /// Return-side evaporative cooler saturation effectiveness, 0..1 (default 0.9).
    #[serde(default = "d_eps_evap")]
    pub eps_evap_return: f64,
    /// Supply fan specific fan power, W/(m³/s) (default 1500).
    #[serde(default = "d_sfp")]
    pub sfp_supply_w_per_m3_s: f64,
    /// Regeneration/exhaust fan specific fan power, W/(m³/s) (default 1500).
    #[serde(default = "d_sfp")]
    pub sfp_regen_w_per_m3_s: f64,
    /// Drive power of each wheel when turning, W per m³/s of supply air (default 15).
    #[serde(default = "d_drive")]
    pub wheel_drive_w_per_m3_s: f64,
    /// Pump power of each evaporative cooler when wetted, W per m³/s of its air (default 30).
    #[serde(default = "d_pump")]
    pub evap_pump_w_per_m3_s: f64,
    /// Lowest regeneration temperature the wheel is run at, °C, 50–90 (default 50).
    #[serde(default = "d_t_min")]
    pub t_regen_min_c: f64,
    /// Highest regeneration temperature, °C, 50–90 (default 75, silica gel).
    #[serde(default = "d_t_max")]
    pub t_regen_max_c: f64,
    /// Regeneration coil: hot-water supply above the regeneration air temperature, K (5).
    #[serde(default = "d_approach")]
    pub coil_approach_k: f64,
    /// Regeneration coil design water temperature drop, K (15).
    #[serde(default = "d_water_dt")]
    pub coil_water_dt_k: f64,
    /// Room humidity ratio at the set-point, kg/kg (default 0.0105 ≈ 26 °C, 50 % RH). The
    /// scenario layer sets it from the building's humidity set-point.
    #[serde(default = "d_w_room")]
    pub w_room_kg_kg: f64,
    /// `backup-chiller` (default: the `[baseline]` plant, run as the reference runs it) or
    /// `report`.
    #[serde(default)]
    pub unmet: Unmet,
    /// Start-up cost and run/off limits (`[…desiccant.starts]`; default thermal mass
    /// [`THERMAL_MASS_KJ_K_PER_KW`] per kW of the unit's nominal cooling,
    /// [`Desiccant::nominal_kw`]).
    #[serde(default)]
    pub starts: super::StartSpec,
}

/// Default thermal mass a desiccant unit warms at each start (regeneration coil, wheel and
/// casing), kJ/K per kW of its nominal cooling (an assumption, common practice, from memory;
/// listed in reports).
pub const THERMAL_MASS_KJ_K_PER_KW: f64 = 2.0;

impl DesiccantSpec {
    /// Typical unit of the class for a supply flow, m³/h (all defaults; demo values).
    pub fn typical(supply_flow_m3_h: f64) -> Self {
        DesiccantSpec {
            supply_flow_m3_h,
            cycle: Cycle::Ventilation,
            regen_flow_ratio: d_ratio(),
            eps_f1: d_eps_f1(),
            eps_f2: d_eps_f2(),
            eps_heat_wheel: d_eps_hw(),
            eps_evap_supply: d_eps_evap(),
            eps_evap_return: d_eps_evap(),
            sfp_supply_w_per_m3_s: d_sfp(),
            sfp_regen_w_per_m3_s: d_sfp(),
            wheel_drive_w_per_m3_s: d_drive(),
            evap_pump_w_per_m3_s: d_pump(),
            t_regen_min_c: d_t_min(),
            t_regen_max_c: d_t_max(),
            coil_approach_k: d_approach(),
            coil_water_dt_k: d_water_dt(),
            w_room_kg_kg: d_w_room(),
            unmet: Unmet::BackupChiller,
            starts: super::StartSpec::default(),
        }
    }

    /// Check every key; errors name the key (relative to the section), value and range.
    pub fn validate(&self) -> Result<()> {
        self.starts.validate()?;
        validate::positive(
            "supply_flow_m3_h",
            self.supply_flow_m3_h,
            1e6,
            "supply air flow, m³/h",
        )?;
        validate::in_range(
            "regen_flow_ratio",
            self.regen_flow_ratio,
            0.5,
            2.0,
            "regeneration-to-supply flow ratio",
        )?;
        for (k, v, m) in [
            ("eps_f1", self.eps_f1, "desiccant wheel F1 effectiveness"),
            ("eps_f2", self.eps_f2, "desiccant wheel F2 effectiveness"),
            (
                "eps_heat_wheel",
                self.eps_heat_wheel,
                "heat wheel effectiveness",
            ),
            (
                "eps_evap_supply",
                self.eps_evap_supply,
                "supply evaporative cooler effectiveness",
            ),
            (
                "eps_evap_return",
                self.eps_evap_return,
                "return evaporative cooler effectiveness",
            ),
        ] {
            validate::in_range(k, v, 0.0, 1.0, m)?;
        }
        for (k, v) in [
            ("sfp_supply_w_per_m3_s", self.sfp_supply_w_per_m3_s),
            ("sfp_regen_w_per_m3_s", self.sfp_regen_w_per_m3_s),
        ] {
            validate::in_range(k, v, 0.0, 10_000.0, "specific fan power, W/(m³/s)")?;
        }
        validate::in_range(
            "wheel_drive_w_per_m3_s",
            self.wheel_drive_w_per_m3_s,
            0.0,
            1000.0,
            "wheel drive power, W per m³/s",
        )?;
        validate::in_range(
            "evap_pump_w_per_m3_s",
            self.evap_pump_w_per_m3_s,
            0.0,
            1000.0,
            "evaporative cooler pump power, W per m³/s",
        )?;
        validate::in_range(
            "t_regen_max_c",
            self.t_regen_max_c,
            50.0,
            90.0,
            "highest regeneration temperature for silica gel, °C",
        )?;
        validate::in_range(
            "t_regen_min_c",
            self.t_regen_min_c,
            50.0,
            self.t_regen_max_c,
            "lowest regeneration temperature, °C, at most t_regen_max_c",
        )?;
        validate::in_range(
            "coil_approach_k",
            self.coil_approach_k,
            1.0,
            30.0,
            "coil approach, K",
        )?;
        validate::in_range(
            "coil_water_dt_k",
            self.coil_water_dt_k,
            1.0,
            50.0,
            "coil water temperature drop, K",
        )?;
        validate::in_range(
            "w_room_kg_kg",
            self.w_room_kg_kg,
            0.002,
            0.03,
            "room humidity ratio at the set-point, kg/kg",
        )?;
        Ok(())
    }
}

/// Why the hour went as it did (hourly CSV code via [`DesiccantReason::as_str`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum DesiccantReason {
    /// Met the load with the wheel regenerated.
    Ok,
    /// No cooling load: unit off.
    NoLoad,
    /// Air dry enough without the wheel: wheel and coil off, evaporative cooling only.
    EvaporativeOnly,
    /// Process inlet outside the wheel model's range (0–50 °C): wheel off.
    WheelOutOfRange,
    /// Wheel at the maximum regeneration temperature and still too wet: latent short.
    LatentLimit,
    /// Less heat supplied than asked: regeneration temperature capped.
    HeatShort,
    /// Supply not cold enough with the evaporative cooler at its design effectiveness.
    SensibleLimit,
    /// Ventilation cycle, building not ventilating this hour (unoccupied): unit off; `run`
    /// gives the whole load to the backup chiller (or reports it unmet).
    NotVentilating,
}

impl DesiccantReason {
    /// Stable code for the hourly outputs.
    pub fn as_str(&self) -> &'static str {
        match self {
            DesiccantReason::Ok => "ok",
            DesiccantReason::NoLoad => "no-load",
            DesiccantReason::EvaporativeOnly => "evaporative-only",
            DesiccantReason::WheelOutOfRange => "wheel-out-of-range",
            DesiccantReason::LatentLimit => "latent-limit",
            DesiccantReason::HeatShort => "heat-short",
            DesiccantReason::SensibleLimit => "sensible-limit",
            DesiccantReason::NotVentilating => "not-ventilating",
        }
    }
}

/// One hour of the desiccant unit (kWh are over the hour = mean kW).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DesiccantHour {
    /// Supply air dry-bulb and humidity ratio entering the room (°C, kg/kg); the room state
    /// when the unit is off.
    pub t_supply_c: f64,
    pub w_supply_kg_kg: f64,
    /// Sensible and latent cooling delivered by the unit (negative: the supply adds load), kWh.
    pub sensible_kwh: f64,
    pub latent_kwh: f64,
    /// The backup chiller plant's hour (zero without one).
    pub backup: ConventionalHour,
    /// Load met by neither, kWh.
    pub unmet_kwh: f64,
    /// Regeneration air temperature, °C (`None`: wheel stopped).
    pub t_regen_c: Option<f64>,
    /// Fraction of both air streams bypassing the wheel (0..1; 1 when stopped).
    pub bypass_fraction: f64,
    /// Regeneration heat from the hot-water coil, kWh.
    pub regen_heat_kwh: f64,
    /// Hot-water supply and return at the coil, °C (meaningful when regen heat > 0).
    pub t_water_supply_c: f64,
    pub t_water_return_c: f64,
    /// Electricity of fans, wheel drives and pumps, kWh.
    pub unit_electricity_kwh: f64,
    /// Water evaporated by both evaporative coolers, kg.
    pub water_kg: f64,
    /// Supply evaporative cooler effectiveness used.
    pub eps_evap_supply_used: f64,
    /// Heat leaving with the exhaust above what its air brought in, kWh.
    pub exhaust_heat_kwh: f64,
    /// Cooling of the supply air from the outdoor state, `m (h_outdoor − h_supply)`, kWh (the
    /// conventional numerator of a desiccant unit's thermal COP; includes the ventilation
    /// load the room-based figures leave out).
    pub outdoor_to_supply_kwh: f64,
    /// Relative closure of the unit's energy and water balances over all its air streams.
    pub energy_balance_rel: f64,
    pub water_balance_rel: f64,
    pub reason: DesiccantReason,
}

impl DesiccantHour {
    /// Cooling by the unit alone, kWh (never below zero).
    pub fn unit_cooling_kwh(&self) -> f64 {
        (self.sensible_kwh + self.latent_kwh).max(0.0)
    }

    /// Thermal COP on the outdoor-to-supply enthalpy difference (the figure usually quoted
    /// for desiccant units): `m (h_oda − h_sup) / Q_regen`; `None` without regeneration heat.
    pub fn cop_thermal_outdoor(&self) -> Option<f64> {
        (self.regen_heat_kwh > 0.0).then(|| self.outdoor_to_supply_kwh / self.regen_heat_kwh)
    }

    /// Thermal COP = unit cooling / regeneration heat; `None` without regeneration heat.
    pub fn cop_thermal(&self) -> Option<f64> {
        (self.regen_heat_kwh > 0.0).then(|| self.unit_cooling_kwh() / self.regen_heat_kwh)
    }
}

/// The built route.
#[derive(Debug, Clone)]
pub struct Desiccant {
    pub spec: DesiccantSpec,
    pub wheel: DesiccantWheel,
    pub heat_wheel: HeatWheel,
    pub evap_supply: EvapCooler,
    pub evap_return: EvapCooler,
    pub coil: RegenCoil,
    /// Supply and regeneration dry-air flows, kg/s.
    pub m_supply_kg_s: f64,
    pub m_regen_kg_s: f64,
    /// Backup chiller (`None` for `unmet = "report"`).
    pub backup: Option<Conventional>,
}

/// Build the route from its spec; `baseline` is the scenario's electric chiller, used as the
/// backup post-cooling chiller at its own size.
///
/// Flows: `m = V ρ_std / 3600` with ρ_std = 1.2 kg/m³. Errors: the spec's validation errors.
pub fn build(spec: &DesiccantSpec, baseline: &ChillerSpec) -> Result<Desiccant> {
    spec.validate()?;
    let m_supply = spec.supply_flow_m3_h * STANDARD_AIR_DENSITY_KG_M3 / 3600.0;
    Ok(Desiccant {
        spec: spec.clone(),
        wheel: DesiccantWheel::new(spec.eps_f1, spec.eps_f2)?,
        heat_wheel: HeatWheel::new(spec.eps_heat_wheel)?,
        evap_supply: EvapCooler::new(spec.eps_evap_supply)?,
        evap_return: EvapCooler::new(spec.eps_evap_return)?,
        coil: RegenCoil {
            approach_k: spec.coil_approach_k,
            water_dt_k: spec.coil_water_dt_k,
        },
        m_supply_kg_s: m_supply,
        m_regen_kg_s: m_supply * spec.regen_flow_ratio,
        backup: match spec.unmet {
            Unmet::BackupChiller => Some(Conventional::new(baseline.clone())?),
            Unmet::Report => None,
        },
    })
}

/// Per-hour fixed quantities.
#[derive(Debug, Clone, Copy)]
struct Ctx {
    p_kpa: f64,
    /// Process inlet (1) and regeneration-side inlet (5).
    s1: Air,
    s5: Air,
    /// Regeneration side entering the heat wheel (6): after the return cooler when the heat
    /// wheel runs, else (5).
    s6: Air,
    t_wb5: f64,
    heat_wheel_on: bool,
    /// Supply temperature leaving the supply cooler that meets the sensible load, °C.
    t_dec_target_c: f64,
    t_room_c: f64,
    /// Room humidity ratio the plant holds, kg/kg.
    w_room_kg_kg: f64,
    sensible_load_kw: f64,
}

/// The unit's states at one operating point.
#[derive(Debug, Clone, Copy)]
struct Op {
    supply: Air,
    exhaust: Air,
    s7: Air,
    q_coil_kw: f64,
    water_supply_kg_s: f64,
    water_return_kg_s: f64,
    t_wb3: f64,
    eps_dec: f64,
    fan_supply_w: f64,
    fan_regen_w: f64,
}

impl Desiccant {
    fn v_supply_m3_s(&self) -> f64 {
        self.m_supply_kg_s / STANDARD_AIR_DENSITY_KG_M3
    }

    fn v_regen_m3_s(&self) -> f64 {
        self.m_regen_kg_s / STANDARD_AIR_DENSITY_KG_M3
    }

    /// Dry-air flow of the building's outdoor air the unit replaces this hour, kg/s:
    /// `min(V_u, V_b) ρ_std / 3600` (ventilation cycle; 0 for recirculation). A non-finite or
    /// negative building flow counts as none.
    fn m_replaced_kg_s(&self, c: &HourConditions) -> f64 {
        match self.spec.cycle {
            Cycle::Ventilation => {
                let v_b = c.load.ventilation_m3_h;
                let v_b = if v_b.is_finite() { v_b.max(0.0) } else { 0.0 };
                (v_b * STANDARD_AIR_DENSITY_KG_M3 / 3600.0).min(self.m_supply_kg_s)
            }
            Cycle::Recirculation => 0.0,
        }
    }

    /// Sensible and latent loads the supply air must meet at the room, kW: `Q_room` of the
    /// module docs.
    ///
    /// The building model counts the load of its outdoor air (outdoor → room state). In the
    /// ventilation cycle the unit's supply replaces `min(V_u, V_b)` of that outdoor air, so the
    /// room sees the building load less the ventilation load of the replaced flow (and no less
    /// than zero); the unit is credited with that ventilation load (`account`). In the
    /// recirculation cycle the room sees the building load.
    fn room_loads(&self, c: &HourConditions) -> (f64, f64) {
        let (q_s, q_l) = (c.load.sensible_kw.max(0.0), c.load.latent_kw.max(0.0));
        match self.spec.cycle {
            Cycle::Ventilation => {
                let (m, t_room, w_room) = (
                    self.m_replaced_kg_s(c),
                    c.load.t_in_c,
                    self.spec.w_room_kg_kg,
                );
                // Only a load the outdoor air adds is taken off: cooler or drier outdoor air
                // is already credited inside the building's (clamped, ≥ 0) load.
                let vs = (m * cp_kj_kgk(c.w_kg_kg) * (c.t_db_c - t_room)).max(0.0);
                let vl = (m * (c.w_kg_kg - w_room) * (2501.0 + 1.86 * t_room)).max(0.0);
                ((q_s - vs).max(0.0), (q_l - vl).max(0.0))
            }
            Cycle::Recirculation => (q_s, q_l),
        }
    }

    fn ctx(&self, c: &HourConditions) -> Result<Ctx> {
        let outdoor = Air {
            t_c: c.t_db_c,
            w_kg_kg: c.w_kg_kg,
        };
        let room = Air {
            t_c: c.load.t_in_c,
            w_kg_kg: self.spec.w_room_kg_kg,
        };
        let (s1, s5) = match self.spec.cycle {
            Cycle::Ventilation => (outdoor, room),
            Cycle::Recirculation => (room, outdoor),
        };
        let p = c.p_kpa;
        let t_wb5 = psychro::wet_bulb_c(s5.t_c, s5.w_kg_kg, p)?;
        let s6_dec = if t_wb5 > 0.0 {
            self.evap_return.run(s5, t_wb5, self.evap_return.eps)?.air
        } else {
            s5
        };
        let heat_wheel_on = s1.t_c > s6_dec.t_c;
        let fan_supply_w = fan_power_w(self.spec.sfp_supply_w_per_m3_s, self.v_supply_m3_s());
        let fan_rise_k = fan_heat_rise_k(fan_supply_w, self.m_supply_kg_s, room.w_kg_kg);
        let (q_s, _) = self.room_loads(c);
        let t_need = room.t_c - q_s / (self.m_supply_kg_s * cp_kj_kgk(room.w_kg_kg));
        Ok(Ctx {
            p_kpa: p,
            s1,
            s5,
            s6: if heat_wheel_on { s6_dec } else { s5 },
            t_wb5,
            heat_wheel_on,
            t_dec_target_c: t_need - fan_rise_k,
            t_room_c: room.t_c,
            w_room_kg_kg: room.w_kg_kg,
            sensible_load_kw: q_s,
        })
    }

    /// Supply-cooler outlet temperature that meets the sensible load at supply humidity
    /// ratio `w`: `t_room − Q_s/(m c_p(w)) − Δt_fan(w)`, °C.
    fn t_dec_target(&self, x: &Ctx, w: f64) -> f64 {
        let m = self.m_supply_kg_s;
        let fan = fan_power_w(self.spec.sfp_supply_w_per_m3_s, self.v_supply_m3_s());
        x.t_room_c - x.sensible_load_kw / (m * cp_kj_kgk(w)) - fan_heat_rise_k(fan, m, w)
    }

    /// States with the wheel at `wheel = Some((t_regen, β))` or stopped (`None`).
    fn eval(&self, x: &Ctx, wheel: Option<(f64, f64)>) -> Result<Op> {
        let (m_p, m_r) = (self.m_supply_kg_s, self.m_regen_kg_s);
        let regen_in_w = x.s6.w_kg_kg;
        // Desiccant wheel (process side) and its regeneration outlet.
        let (s2, regen_out, f_wheel, t_regen) = match wheel {
            Some((t_r, beta)) if beta < 1.0 => {
                let f = 1.0 - beta;
                let o = self.wheel.run(
                    x.s1,
                    Air {
                        t_c: t_r,
                        w_kg_kg: regen_in_w,
                    },
                    f * m_p,
                    f * m_r,
                    x.p_kpa,
                )?;
                let s2 = if beta > 0.0 {
                    Air::mix(o.process_out, f * m_p, x.s1, beta * m_p)
                } else {
                    o.process_out
                };
                (s2, Some(o.regen_out), f, t_r)
            }
            _ => (x.s1, None, 0.0, f64::NAN),
        };
        // Heat wheel.
        let (s3, s7) = if x.heat_wheel_on {
            let o = self.heat_wheel.run(s2, m_p, x.s6, m_r)?;
            (o.hot_out, o.cold_out)
        } else {
            (s2, x.s6)
        };
        // Coil and regeneration-side mixing, exhaust fan.
        let (q_coil, s9) = match regen_out {
            Some(ro) => {
                let q = self.coil.heat_kw(f_wheel * m_r, s7, t_regen);
                let s9 = if f_wheel < 1.0 {
                    Air::mix(ro, f_wheel * m_r, s7, (1.0 - f_wheel) * m_r)
                } else {
                    ro
                };
                (q, s9)
            }
            None => (0.0, s7),
        };
        let fan_regen_w = fan_power_w(self.spec.sfp_regen_w_per_m3_s, self.v_regen_m3_s());
        let exhaust = Air {
            t_c: s9.t_c + fan_heat_rise_k(fan_regen_w, m_r, s9.w_kg_kg),
            w_kg_kg: s9.w_kg_kg,
        };
        // Supply evaporative cooler: only when the air is warmer than the sensible target.
        let mut eps_dec = 0.0;
        let mut t_wb3 = f64::NAN;
        let mut s4 = s3;
        if x.sensible_load_kw > 0.0 && s3.t_c > x.t_dec_target_c {
            t_wb3 = psychro::wet_bulb_c(s3.t_c, s3.w_kg_kg, x.p_kpa)?;
            if t_wb3 > 0.0 && s3.t_c - t_wb3 > 1e-9 {
                // Target with c_p at the inlet W, then once more at the outlet W (the
                // delivered sensible cooling uses the supply's c_p).
                let mut t_target = x.t_dec_target_c;
                for _ in 0..2 {
                    eps_dec =
                        ((s3.t_c - t_target) / (s3.t_c - t_wb3)).clamp(0.0, self.evap_supply.eps);
                    s4 = self.evap_supply.run(s3, t_wb3, eps_dec)?.air;
                    t_target = self.t_dec_target(x, s4.w_kg_kg);
                }
                // Never humidify the supply above the room's humidity: moisture added here is
                // a latent load the backup chiller would have to remove again (in humid
                // climates that costs more than the sensible cooling gained). W rises close to
                // linearly with the effectiveness along the wet-bulb line, so one proportional
                // cut and a re-run lands at or just below the room's W.
                if s4.w_kg_kg > x.w_room_kg_kg && eps_dec > 0.0 {
                    let room_w_headroom = (x.w_room_kg_kg - s3.w_kg_kg).max(0.0);
                    let added = s4.w_kg_kg - s3.w_kg_kg;
                    eps_dec = if added > 0.0 {
                        eps_dec * (room_w_headroom / added).min(1.0)
                    } else {
                        0.0
                    };
                    s4 = if eps_dec > 0.0 {
                        self.evap_supply.run(s3, t_wb3, eps_dec)?.air
                    } else {
                        s3
                    };
                }
            }
        }
        let water_supply = m_p * (s4.w_kg_kg - s3.w_kg_kg);
        let water_return = if x.heat_wheel_on {
            m_r * (x.s6.w_kg_kg - x.s5.w_kg_kg)
        } else {
            0.0
        };
        let fan_supply_w = fan_power_w(self.spec.sfp_supply_w_per_m3_s, self.v_supply_m3_s());
        let supply = Air {
            t_c: s4.t_c + fan_heat_rise_k(fan_supply_w, m_p, s4.w_kg_kg),
            w_kg_kg: s4.w_kg_kg,
        };
        Ok(Op {
            supply,
            exhaust,
            s7,
            q_coil_kw: q_coil,
            water_supply_kg_s: water_supply,
            water_return_kg_s: water_return,
            t_wb3,
            eps_dec,
            fan_supply_w,
            fan_regen_w,
        })
    }

    /// Regeneration temperature reached by `q_kw` of coil heat at no bypass, °C (Brent on the
    /// coil heat, which rises with t_regen); `None` when even `t_regen_min_c` needs more.
    fn t_regen_for_heat(&self, x: &Ctx, q_kw: f64, t_hi: f64) -> Result<Option<f64>> {
        let t_lo = self.spec.t_regen_min_c;
        let q_at = |t: f64| self.eval(x, Some((t, 0.0))).map(|o| o.q_coil_kw);
        if q_at(t_lo)? > q_kw {
            return Ok(None);
        }
        if q_at(t_hi)? <= q_kw {
            return Ok(Some(t_hi));
        }
        let t = crate::num::brent(
            "desiccant regeneration temperature for heat",
            t_lo,
            t_hi,
            1e-4,
            |t| q_at(t).map_or(f64::NAN, |q| q - q_kw),
        )?;
        Ok(Some(t))
    }

    /// Solve the hour: control, states, delivered cooling, energy use.
    ///
    /// * `c` – the hour's outdoor state, pressure and load (`load.t_in_c` is the room
    ///   temperature)
    /// * `heat` – heat supplied for regeneration (`None`: as much as the control wants,
    ///   i.e. what [`Route::heat_request`] asks)
    ///
    /// Returns the hour's [`DesiccantHour`] (see the module docs for the control). Errors:
    /// `OutOfRange` for states outside the psychrometric or component ranges (a pressure
    /// outside 10..200 kPa, supersaturated air), `Internal` if a solve fails.
    pub fn solve_hour(
        &self,
        c: &HourConditions,
        heat: Option<HeatSupplied>,
    ) -> Result<DesiccantHour> {
        self.solve_hour_below(c, heat, None)
    }

    /// As [`Desiccant::solve_hour`], with the regeneration temperature held at or below
    /// `t_regen_cap_c` (the store's water can reach no higher: a unit on store heat alone).
    pub fn solve_hour_below(
        &self,
        c: &HourConditions,
        heat: Option<HeatSupplied>,
        t_regen_cap_c: Option<f64>,
    ) -> Result<DesiccantHour> {
        let wanted = self.solve_capped(c, None, t_regen_cap_c)?;
        match heat {
            None => Ok(wanted),
            Some(h) => {
                let got = h.solar_kwh.max(0.0) + h.backup_kwh.max(0.0);
                if got >= wanted.regen_heat_kwh * (1.0 - 1e-9) - 1e-12 {
                    Ok(wanted)
                } else {
                    self.solve_capped(c, Some(got), t_regen_cap_c)
                }
            }
        }
    }

    /// The highest regeneration temperature store water at `t_store_top_c` can give through
    /// the coil: the top less the valve's control margin and the coil's approach. `None`
    /// where the boiler lifts the water (no backup chiller) or there is no store.
    fn t_regen_cap_c(&self, t_store_top_c: Option<f64>) -> Option<f64> {
        self.backup.as_ref()?;
        t_store_top_c.map(|t| t - super::SUPPLY_MARGIN_K - self.coil.approach_k)
    }

    /// The control with the regeneration heat capped at `heat_cap_kwh` and the temperature
    /// at `t_regen_cap_c` (`None`: no cap).
    fn solve_capped(
        &self,
        c: &HourConditions,
        heat_cap_kwh: Option<f64>,
        t_regen_cap_c: Option<f64>,
    ) -> Result<DesiccantHour> {
        if c.load.cooling_kw() <= 0.0 {
            return Ok(self.off_hour(c));
        }
        if self.spec.cycle == Cycle::Ventilation && self.m_replaced_kg_s(c) <= 0.0 {
            return Ok(DesiccantHour {
                reason: DesiccantReason::NotVentilating,
                ..self.off_hour(c)
            });
        }
        let (q_s, q_l) = self.room_loads(c);
        let x = self.ctx(c)?;
        let (m_p, t_room, w_room) = (self.m_supply_kg_s, c.load.t_in_c, self.spec.w_room_kg_kg);
        let w_target = w_room - q_l / (m_p * (2501.0 + 1.86 * t_room));
        // Residual in g/kg so that Brent's one tolerance suits both x and f.
        let resid = |o: &Op| (o.supply.w_kg_kg - w_target) * 1000.0;
        let off = self.eval(&x, None)?;
        let wheel_usable = (T_PROCESS_VALID_C.0..=T_PROCESS_VALID_C.1).contains(&x.s1.t_c);
        let t_min = self.spec.t_regen_min_c;
        let mut reason = DesiccantReason::Ok;
        let (op, wheel) = if resid(&off) <= 0.0 {
            reason = DesiccantReason::EvaporativeOnly;
            (off, None)
        } else if !wheel_usable {
            reason = DesiccantReason::WheelOutOfRange;
            (off, None)
        } else {
            // Caps from the store's temperature and the heat supplied.
            let mut t_hi = self
                .spec
                .t_regen_max_c
                .min(t_regen_cap_c.unwrap_or(f64::INFINITY));
            let capped = heat_cap_kwh.is_some() || t_hi < self.spec.t_regen_max_c;
            if let Some(got) = heat_cap_kwh {
                t_hi = self
                    .t_regen_for_heat(&x, got, t_hi)?
                    .unwrap_or(f64::NEG_INFINITY);
            }
            if t_hi < t_min {
                reason = DesiccantReason::HeatShort;
                (off, None)
            } else {
                let at_min = self.eval(&x, Some((t_min, 0.0)))?;
                if resid(&at_min) <= 0.0 {
                    // Over-dries at the minimum: bypass part of both streams.
                    let beta = crate::num::brent("desiccant wheel bypass", 0.0, 1.0, 1e-6, |b| {
                        self.eval(&x, Some((t_min, b)))
                            .map_or(f64::NAN, |o| resid(&o))
                    })?;
                    (self.eval(&x, Some((t_min, beta)))?, Some((t_min, beta)))
                } else {
                    let at_max = self.eval(&x, Some((t_hi, 0.0)))?;
                    if resid(&at_max) > 0.0 || t_hi - t_min < 1e-6 {
                        reason = if capped {
                            DesiccantReason::HeatShort
                        } else {
                            DesiccantReason::LatentLimit
                        };
                        (at_max, Some((t_hi, 0.0)))
                    } else {
                        let t = crate::num::brent(
                            "desiccant regeneration temperature",
                            t_min,
                            t_hi,
                            1e-4,
                            |t| {
                                self.eval(&x, Some((t, 0.0)))
                                    .map_or(f64::NAN, |o| resid(&o))
                            },
                        )?;
                        if capped {
                            reason = DesiccantReason::HeatShort;
                        }
                        (self.eval(&x, Some((t, 0.0)))?, Some((t, 0.0)))
                    }
                }
            }
        };
        self.account(c, &x, &op, wheel, q_s, q_l, reason)
    }

    #[allow(clippy::too_many_arguments)]
    fn account(
        &self,
        c: &HourConditions,
        x: &Ctx,
        op: &Op,
        wheel: Option<(f64, f64)>,
        q_s: f64,
        q_l: f64,
        mut reason: DesiccantReason,
    ) -> Result<DesiccantHour> {
        let (m_p, m_r) = (self.m_supply_kg_s, self.m_regen_kg_s);
        let (t_room, w_room) = (c.load.t_in_c, self.spec.w_room_kg_kg);
        let s = op.supply;
        let cap_s = m_p * cp_kj_kgk(s.w_kg_kg) * (t_room - s.t_c);
        let cap_l = m_p * (w_room - s.w_kg_kg) * (2501.0 + 1.86 * t_room);
        // Room-side delivery at the unit's flow, capped at the room's need, plus the part of the
        // building's load the unit removed before the air reached the room: the ventilation load
        // of the outdoor air it replaces, min(V_u, V_b) (ventilation cycle; `room_loads`).
        let (q_s_b, q_l_b) = (c.load.sensible_kw.max(0.0), c.load.latent_kw.max(0.0));
        let sens = cap_s.min(q_s) + (q_s_b - q_s);
        let lat = cap_l.min(q_l) + (q_l_b - q_l);
        if reason == DesiccantReason::Ok && cap_s < q_s * (1.0 - 1e-9) {
            reason = DesiccantReason::SensibleLimit;
        }
        let short = q_s_b + q_l_b - (sens + lat).max(0.0);
        let (backup, unmet) = match (&self.backup, short > 1e-12) {
            (Some(b), true) => {
                let h = b.serve(c, short);
                (h, h.unmet_kwh)
            }
            _ => (ConventionalHour::default(), short.max(0.0)),
        };
        let v_s = self.v_supply_m3_s();
        let v_r = self.v_regen_m3_s();
        let wheel_turns = matches!(wheel, Some((_, b)) if b < 1.0);
        let mut unit_w = op.fan_supply_w + op.fan_regen_w;
        if wheel_turns {
            unit_w += self.spec.wheel_drive_w_per_m3_s * v_s;
        }
        if x.heat_wheel_on {
            unit_w += self.spec.wheel_drive_w_per_m3_s * v_s;
            unit_w += self.spec.evap_pump_w_per_m3_s * v_r;
        }
        if op.eps_dec > 0.0 {
            unit_w += self.spec.evap_pump_w_per_m3_s * v_s;
        }
        // Balances over the unit (fan power enters the air as heat; drive and pump power
        // are neglected as heat to the air).
        let hw3 = if op.water_supply_kg_s > 0.0 {
            water_enthalpy_kj_kg(op.t_wb3)
        } else {
            0.0
        };
        let hw5 = water_enthalpy_kj_kg(x.t_wb5);
        let e_in = [
            m_p * x.s1.h_kj_kg(),
            m_r * x.s5.h_kj_kg(),
            op.q_coil_kw,
            (op.fan_supply_w + op.fan_regen_w) / 1000.0,
            op.water_supply_kg_s * hw3,
            op.water_return_kg_s * hw5,
        ];
        let e_out = [m_p * s.h_kj_kg(), m_r * op.exhaust.h_kj_kg()];
        let scale: f64 = e_in.iter().chain(e_out.iter()).map(|v| v.abs()).sum();
        let e_err = e_in.iter().sum::<f64>() - e_out.iter().sum::<f64>();
        let w_in =
            m_p * x.s1.w_kg_kg + m_r * x.s5.w_kg_kg + op.water_supply_kg_s + op.water_return_kg_s;
        let w_out = m_p * s.w_kg_kg + m_r * op.exhaust.w_kg_kg;
        let (t_ws, t_wr) = match wheel {
            Some((t_r, _)) => self.coil.water_temperatures_c(op.s7.t_c, t_r),
            None => (f64::NAN, f64::NAN),
        };
        Ok(DesiccantHour {
            t_supply_c: s.t_c,
            w_supply_kg_kg: s.w_kg_kg,
            sensible_kwh: sens,
            latent_kwh: lat,
            backup,
            unmet_kwh: unmet,
            t_regen_c: wheel.map(|(t, _)| t),
            bypass_fraction: wheel.map_or(1.0, |(_, b)| b),
            regen_heat_kwh: op.q_coil_kw,
            t_water_supply_c: t_ws,
            t_water_return_c: t_wr,
            unit_electricity_kwh: unit_w / 1000.0,
            water_kg: (op.water_supply_kg_s + op.water_return_kg_s) * 3600.0,
            eps_evap_supply_used: op.eps_dec,
            exhaust_heat_kwh: m_r * (op.exhaust.h_kj_kg() - x.s5.h_kj_kg()),
            outdoor_to_supply_kwh: m_p
                * (psychro::enthalpy_kj_kg(c.t_db_c, c.w_kg_kg) - s.h_kj_kg()),
            energy_balance_rel: e_err.abs() / scale.max(1e-12),
            water_balance_rel: (w_in - w_out).abs() / w_in.abs().max(1e-12),
            reason,
        })
    }

    fn off_hour(&self, c: &HourConditions) -> DesiccantHour {
        DesiccantHour {
            t_supply_c: c.load.t_in_c,
            w_supply_kg_kg: self.spec.w_room_kg_kg,
            sensible_kwh: 0.0,
            latent_kwh: 0.0,
            backup: ConventionalHour::default(),
            unmet_kwh: 0.0,
            t_regen_c: None,
            bypass_fraction: 1.0,
            regen_heat_kwh: 0.0,
            t_water_supply_c: f64::NAN,
            t_water_return_c: f64::NAN,
            unit_electricity_kwh: 0.0,
            water_kg: 0.0,
            eps_evap_supply_used: 0.0,
            exhaust_heat_kwh: 0.0,
            outdoor_to_supply_kwh: 0.0,
            energy_balance_rel: 0.0,
            water_balance_rel: 0.0,
            reason: DesiccantReason::NoLoad,
        }
    }

    /// The whole load handed to the backup (or unmet) with `reason`: the unit's solve
    /// failed, or it may not draw store heat.
    fn fallback(&self, c: &HourConditions, reason: Reason) -> RouteHour {
        let load = c.load.cooling_kw().max(0.0);
        match &self.backup {
            Some(b) => RouteHour::from_conventional(&b.serve(c, load), reason),
            None => RouteHour {
                unmet_kwh: load,
                reason,
                ..RouteHour::default()
            },
        }
    }
}

impl Desiccant {
    /// Nominal cooling of the unit for its start-up mass, kW: its supply air cooled by 12 K
    /// (`ṁ · 1.006 kJ/(kg·K) · 12 K`; a stated basis, not a rating).
    pub fn nominal_kw(&self) -> f64 {
        self.m_supply_kg_s * 1.006 * 12.0
    }
}

impl Route for Desiccant {
    fn kind(&self) -> &'static str {
        "desiccant"
    }

    fn start_up(&self) -> Option<super::StartUp> {
        Some(
            self.spec
                .starts
                .build(self.nominal_kw(), THERMAL_MASS_KJ_K_PER_KW),
        )
    }

    /// With a backup chiller the wheel regenerates on store heat alone: the plant enables it
    /// from `t_regen_min_c` + 5 K down to `t_regen_min_c` (below that no regeneration is
    /// possible at all).
    fn cut_in_out_c(&self) -> Option<(f64, f64)> {
        self.backup
            .as_ref()
            .map(|_| (self.spec.t_regen_min_c + 5.0, self.spec.t_regen_min_c))
    }

    /// Regeneration heat at the temperature the control wants (module docs); `None` when
    /// the hour needs none (no load, or the wheel is stopped), the solve fails, or the unit
    /// may not draw store heat (electric backup, store below its cut-in band).
    fn heat_request(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> Option<HeatRequest> {
        if self.backup.is_some() && t_store_top_c.is_none() {
            return None;
        }
        let h = self
            .solve_hour_below(c, None, self.t_regen_cap_c(t_store_top_c))
            .ok()?;
        (h.regen_heat_kwh > 0.0).then_some(HeatRequest {
            heat_kwh: h.regen_heat_kwh,
            t_supply_c: h.t_water_supply_c,
            t_return_c: h.t_water_return_c,
            // With a backup chiller behind it, regeneration runs on solar heat alone (burning
            // fuel to dry air the chiller could dry is a loss); without one the boiler helps.
            boiler_backup: self.backup.is_none(),
        })
    }

    fn run(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        heat: Option<HeatSupplied>,
    ) -> RouteHour {
        let heat = Some(heat.unwrap_or_default());
        let supplied = heat.map_or(0.0, |q| q.solar_kwh.max(0.0) + q.backup_kwh.max(0.0));
        let cap = self.t_regen_cap_c(t_store_top_c);
        let h = match self.solve_hour_below(c, heat, cap) {
            Ok(h) => h,
            Err(_) => return self.fallback(c, Reason::NoSolution),
        };
        if h.reason == DesiccantReason::NotVentilating {
            // Unit off: the whole load to the backup (or unmet), as when the solve fails.
            return self.fallback(c, Reason::NotVentilating);
        }
        if h.reason == DesiccantReason::NoLoad {
            return RouteHour::no_load();
        }
        let unit = h.unit_cooling_kwh();
        // What the driving heat made is what the unit delivers beyond what it would deliver
        // this hour with its wheel stopped (evaporative cooling alone, which needs no heat):
        // only that increment is heat-driven cooling; the rest is evaporative.
        let evaporative = if h.regen_heat_kwh > 0.0 {
            self.solve_hour_below(c, Some(HeatSupplied::default()), cap)
                .map_or(0.0, |h0| h0.unit_cooling_kwh())
                .clamp(0.0, unit)
        } else {
            unit
        };
        let heat_driven = unit - evaporative;
        let mut out = RouteHour {
            cooling: Cooling {
                heat_driven_kwh: heat_driven,
                evaporative_kwh: evaporative,
                electric_kwh: 0.0,
            },
            unmet_kwh: h.unmet_kwh,
            electricity: Electricity {
                air_handling_kwh: h.unit_electricity_kwh,
                ..Electricity::default()
            },
            // The unit's own air-side balance is checked inside the route
            // (`energy_balance_rel`); towards the plant's first law its rejection is the
            // driving heat it was given (all of it leaves with the exhaust air, used by the
            // wheel or not), the cooling it is credited with and its electricity.
            heat_rejected_kwh: supplied + unit + h.unit_electricity_kwh,
            reason: match h.reason {
                DesiccantReason::Ok if h.unmet_kwh > 1e-9 => Reason::CapacityLimit,
                DesiccantReason::Ok => Reason::Ok,
                DesiccantReason::NoLoad => Reason::NoLoad,
                DesiccantReason::EvaporativeOnly => Reason::EvaporativeOnly,
                DesiccantReason::WheelOutOfRange => Reason::WheelOutOfRange,
                DesiccantReason::LatentLimit => Reason::LatentLimit,
                DesiccantReason::HeatShort if self.backup.is_some() && t_store_top_c.is_none() => {
                    Reason::StoreBelowCutIn
                }
                DesiccantReason::HeatShort => Reason::HeatShort,
                DesiccantReason::SensibleLimit => Reason::SensibleLimit,
                DesiccantReason::NotVentilating => Reason::NotVentilating,
            },
            water_m3: h.water_kg / 1000.0,
            t_drive_c: h.t_regen_c,
            t_sink_c: Some(c.t_db_c),
            detail: [
                ("t_supply_c", h.t_supply_c),
                ("w_supply_g_kg", 1000.0 * h.w_supply_kg_kg),
                ("sensible_kwh", h.sensible_kwh),
                ("latent_kwh", h.latent_kwh),
            ],
            ..RouteHour::default()
        };
        out.add_backup(&h.backup);
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::chiller_electric::Condenser;
    use crate::load::LoadHour;

    /// An hour whose building ventilates at the typical unit's own flow (10 000 m³/h): the
    /// unit replaces all of the building's outdoor air, the rule before the building's flow
    /// reached the route.
    pub(crate) fn hour(t_db: f64, w: f64, sens: f64, lat: f64) -> HourConditions {
        hour_vent(t_db, w, sens, lat, 10_000.0)
    }

    /// An hour with the building's mechanical ventilation `vent_m3_h`.
    pub(crate) fn hour_vent(
        t_db: f64,
        w: f64,
        sens: f64,
        lat: f64,
        vent_m3_h: f64,
    ) -> HourConditions {
        HourConditions {
            hour: 4000,
            t_db_c: t_db,
            w_kg_kg: w,
            t_wb_c: psychro::wet_bulb_c(t_db, w, 101.325).unwrap(),
            p_kpa: 101.325,
            load: LoadHour {
                sensible_kw: sens,
                latent_kw: lat,
                heating_kw: 0.0,
                t_in_c: 26.0,
                ventilation_m3_h: vent_m3_h,
            },
        }
    }

    pub(crate) fn unit() -> Desiccant {
        build(
            &DesiccantSpec::typical(10_000.0),
            &ChillerSpec::typical(Condenser::WaterCooled, 200.0),
        )
        .unwrap()
    }

    /// Moderate humid hour (30 °C, 12 g/kg; room 26 °C/10.5 g/kg; building load 20 kW
    /// sensible, 20 kW latent, ventilation cycle). The unit's outdoor air carries the
    /// ventilation part of that load: at m = 3.333 kg/s, latent m·(0.012 − 0.0105)·(2501 +
    /// 1.86·26) = 12.75 kW and sensible m·c_p·(30 − 26) = 13.6 kW, so the room sees 7.25 kW
    /// latent and the supply must reach W = 0.0105 − 7.25/(m·(2501 + 1.86·26)) (hand
    /// calculation). The unit is credited with the whole building load it removes.
    #[test]
    fn humid_hour_meets_latent_target() {
        let u = unit();
        let m = u.m_supply_kg_s;
        let vl = m * (0.012 - 0.0105) * (2501.0 + 1.86 * 26.0);
        let h = u.solve_hour(&hour(30.0, 0.012, 20.0, 20.0), None).unwrap();
        let w_target = 0.0105 - (20.0 - vl) / (m * (2501.0 + 1.86 * 26.0));
        assert!((h.w_supply_kg_kg - w_target).abs() < 1e-6, "{h:?}");
        let t = h.t_regen_c.unwrap();
        assert!((50.0..=75.0).contains(&t), "{t}");
        assert!(
            (h.latent_kwh - 20.0).abs() < 1e-3 && (h.sensible_kwh - 20.0).abs() < 1e-6,
            "{h:?}"
        );
        assert_eq!(h.reason, DesiccantReason::Ok);
        assert!(h.energy_balance_rel < 1e-9 && h.water_balance_rel < 1e-9);
        let r = u
            .heat_request(&hour(30.0, 0.012, 20.0, 20.0), Some(90.0))
            .unwrap();
        assert!((r.heat_kwh - h.regen_heat_kwh).abs() < 1e-12);
        assert!((r.t_supply_c - (t + 5.0)).abs() < 1e-12 && r.t_return_c < r.t_supply_c);
    }

    /// Very humid hour: even 75 °C cannot dry to target; latent short goes to the backup.
    #[test]
    fn very_humid_hour_hits_latent_limit() {
        let u = unit();
        // Building latent 100 kW, of which the outdoor air brings m·0.0055·2549 = 46.7 kW: the
        // room's 53.3 kW needs W ≈ 4.2 g/kg from 16 g/kg outdoor air.
        let c = hour(32.0, 0.016, 20.0, 100.0);
        let h = u.solve_hour(&c, None).unwrap();
        assert_eq!(h.reason, DesiccantReason::LatentLimit, "{h:?}");
        assert_eq!(h.t_regen_c, Some(75.0));
        assert!(h.backup.cooling_kwh > 0.0 && h.unmet_kwh < 1e-9);
        // A store at 90 °C (the plant passes its top while the unit is enabled): hot enough
        // for the highest regeneration temperature through the coil (90 − 2 − 5 ≥ 75 °C).
        let rh = u.run(
            &c,
            Some(90.0),
            u.heat_request(&c, Some(90.0)).map(|r| HeatSupplied {
                solar_kwh: r.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert!((rh.cooling_kwh() - 120.0).abs() < 1e-9 && rh.reason == Reason::LatentLimit);
        // A store at 78 °C caps regeneration at 71 °C: the wheel dries less, and the hour is
        // short of driving temperature.
        let capped = u.run(
            &c,
            Some(78.0),
            u.heat_request(&c, Some(78.0)).map(|r| HeatSupplied {
                solar_kwh: r.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert_eq!(capped.reason, Reason::HeatShort);
        assert_eq!(capped.t_drive_c, Some(71.0));
        assert!(capped.cooling.heat_driven_kwh < rh.cooling.heat_driven_kwh);
    }

    /// Outdoor air drier than the supply target: wheel stopped, no heat asked, evaporative
    /// cooling carries the sensible load (building 60 kW sensible, of which the outdoor air
    /// brings m·c_p·(40 − 26) ≈ 47 kW: the room's 13 kW needs supply below 26 °C).
    #[test]
    fn dry_hour_is_evaporative_only() {
        let u = unit();
        let c = hour(40.0, 0.006, 60.0, 2.0);
        let h = u.solve_hour(&c, None).unwrap();
        assert_eq!(h.reason, DesiccantReason::EvaporativeOnly);
        assert_eq!(h.regen_heat_kwh, 0.0);
        assert!(u.heat_request(&c, None).is_none());
        assert!(h.eps_evap_supply_used > 0.0 && h.water_kg > 0.0);
    }

    /// Half the heat asked: the regeneration temperature drops and the reason says so.
    #[test]
    fn heat_short_caps_regeneration() {
        let u = unit();
        let c = hour(30.0, 0.0125, 20.0, 5.0);
        let full = u.solve_hour(&c, None).unwrap();
        let half = u
            .solve_hour(
                &c,
                Some(HeatSupplied {
                    solar_kwh: 0.5 * full.regen_heat_kwh,
                    backup_kwh: 0.0,
                }),
            )
            .unwrap();
        assert_eq!(half.reason, DesiccantReason::HeatShort);
        assert!(half.regen_heat_kwh <= 0.5 * full.regen_heat_kwh * (1.0 + 1e-6));
        assert!(half.w_supply_kg_kg > full.w_supply_kg_kg);
        // No heat at all: nothing is credited to driving heat.
        let none = u.run(&c, None, None);
        assert_eq!(none.cooling.heat_driven_kwh, 0.0);
    }

    /// Cold dry hour with cooling load (dew point below 0 °C, wet-bulb below 0 °C): wheel
    /// off, supply cooler off (frozen pad), balances still close.
    #[test]
    fn cold_dry_hour() {
        let u = unit();
        let c = hour(2.0, 0.002, 5.0, 0.0);
        assert!(c.t_wb_c < 0.0);
        let h = u.solve_hour(&c, None).unwrap();
        assert_eq!(h.reason, DesiccantReason::EvaporativeOnly);
        assert_eq!(h.eps_evap_supply_used, 0.0);
        assert!(h.energy_balance_rel < 1e-9);
    }

    #[test]
    fn no_load_and_bad_specs() {
        let u = unit();
        let h = u.solve_hour(&hour(30.0, 0.012, 0.0, 0.0), None).unwrap();
        assert_eq!(h.reason, DesiccantReason::NoLoad);
        assert_eq!(
            u.run(&hour(30.0, 0.012, 0.0, 0.0), None, None).reason,
            Reason::NoLoad
        );
        let base = ChillerSpec::typical(Condenser::WaterCooled, 200.0);
        let bad = |f: &dyn Fn(&mut DesiccantSpec)| {
            let mut s = DesiccantSpec::typical(10_000.0);
            f(&mut s);
            build(&s, &base).is_err()
        };
        assert!(bad(&|s| s.supply_flow_m3_h = 0.0));
        assert!(bad(&|s| s.eps_f2 = 1.1));
        assert!(bad(&|s| s.eps_heat_wheel = -0.1));
        assert!(bad(&|s| s.t_regen_max_c = 95.0));
        assert!(bad(&|s| s.t_regen_min_c = 80.0));
        assert!(bad(&|s| s.regen_flow_ratio = 0.0));
        let mut s = DesiccantSpec::typical(10_000.0);
        s.eps_f1 = 2.0;
        assert!(s.validate().unwrap_err().to_string().contains("eps_f1"));
        let t: DesiccantSpec = toml::from_str(
            "supply_flow_m3_h = 5000.0\ncycle = \"recirculation\"\nunmet = \"report\"\n",
        )
        .unwrap();
        assert_eq!((t.cycle, t.unmet), (Cycle::Recirculation, Unmet::Report));
        assert!(toml::from_str::<DesiccantSpec>("supply_flow_m3_h = 1.0\ncolour = 1\n").is_err());
    }

    /// Unoccupied hour (building ventilation 0) with a cooling load of 20 kW sensible + 20 kW
    /// latent: the ventilation-cycle unit is off — no regeneration heat asked, no unit cooling,
    /// no fan power — and the backup chiller carries all 40 kWh (hand: 20 + 20), as in an
    /// hour whose solve fails; with `unmet = "report"` the 40 kWh are unmet and nothing runs.
    #[test]
    fn unoccupied_hour_unit_off_backup_carries_all() {
        let u = unit();
        let c = hour_vent(30.0, 0.012, 20.0, 20.0, 0.0);
        let h = u.solve_hour(&c, None).unwrap();
        assert_eq!(h.reason, DesiccantReason::NotVentilating);
        assert_eq!((h.sensible_kwh, h.latent_kwh), (0.0, 0.0));
        assert_eq!((h.regen_heat_kwh, h.unit_electricity_kwh), (0.0, 0.0));
        assert!(u.heat_request(&c, None).is_none());
        let r = u.run(&c, None, None);
        assert_eq!(r.reason, Reason::NotVentilating);
        assert!((r.cooling_kwh() - 40.0).abs() < 1e-9, "{r:?}");
        assert!((r.cooling.electric_kwh - 40.0).abs() < 1e-9, "{r:?}");
        assert!(r.cooling.heat_driven_kwh == 0.0 && r.unmet_kwh == 0.0);
        // Electricity is the backup chiller's alone (same as the whole-load fallback).
        assert_eq!(
            r.electricity_kwh(),
            u.fallback(&c, Reason::NoSolution).electricity_kwh()
        );
        assert!(r.electricity_kwh() > 0.0);
        let mut s = DesiccantSpec::typical(10_000.0);
        s.unmet = Unmet::Report;
        let rep = build(&s, &ChillerSpec::typical(Condenser::WaterCooled, 200.0)).unwrap();
        let r = rep.run(&c, None, None);
        assert_eq!(r.reason, Reason::NotVentilating);
        assert_eq!(
            (r.cooling_kwh(), r.unmet_kwh, r.electricity_kwh()),
            (0.0, 40.0, 0.0)
        );
        // The recirculation cycle does not need the building's outdoor air: it runs.
        let mut s = DesiccantSpec::typical(10_000.0);
        s.cycle = Cycle::Recirculation;
        let rec = build(&s, &ChillerSpec::typical(Condenser::WaterCooled, 200.0)).unwrap();
        assert_ne!(
            rec.solve_hour(&c, None).unwrap().reason,
            DesiccantReason::NotVentilating
        );
    }

    /// Unit flow twice the building's (10 000 vs 5 000 m³/h), 30 °C/12 g/kg outdoors, room
    /// 26 °C/10.5 g/kg, building load 20 kW sensible + 20 kW latent. The unit replaces only the
    /// building's 5 000 m³/h: m_b = 5000·1.2/3600 = 1.6667 kg/s, whose latent ventilation load
    /// is 1.6667·(0.012 − 0.0105)·(2501 + 1.86·26) = 6.3734 kW (not the 12.747 kW of the unit's
    /// 3.3333 kg/s). The room needs 20 − 6.3734 = 13.6266 kW latent, so the supply target is
    /// W = 0.0105 − 13.6266/(3.3333·2549.36) = 0.0088965 kg/kg (hand calculation).
    ///
    /// With no regeneration heat the wheel stops and the supply keeps the outdoor 12 g/kg (the
    /// supply cooler never humidifies above the room): the room receives 3.3333·(0.0105 −
    /// 0.012)·2549.36 = −12.747 kW latent, and the credit is −12.747 + 6.3734 = −6.3734 kW: the
    /// extra 5 000 m³/h of humid outdoor air is a load the unit brings, never a credit (the old
    /// rule, crediting the unit's whole flow, gave 0).
    #[test]
    fn unit_flow_above_building_credits_building_flow_only() {
        let u = unit();
        let m_u = u.m_supply_kg_s;
        let m_b: f64 = 5000.0 * 1.2 / 3600.0;
        let h_fg = 2501.0 + 1.86 * 26.0;
        let vl_b = m_b * (0.012 - 0.0105) * h_fg;
        assert!((vl_b - 6.3734).abs() < 1e-4);
        let c = hour_vent(30.0, 0.012, 20.0, 20.0, 5000.0);
        let h = u.solve_hour(&c, None).unwrap();
        let w_target = 0.0105 - (20.0 - vl_b) / (m_u * h_fg);
        assert!((w_target - 0.0088965).abs() < 1e-7);
        assert!((h.w_supply_kg_kg - w_target).abs() < 1e-6, "{h:?}");
        // Met: credited latent = room's need (13.6266) + replaced ventilation (6.3734) = 20.
        assert!((h.latent_kwh - 20.0).abs() < 1e-3, "{h:?}");
        // The unit dried its whole flow by more than it is credited with.
        let removed = m_u * (0.012 - h.w_supply_kg_kg) * h_fg;
        assert!((removed - 26.373).abs() < 1e-2, "{removed}");
        // No heat: wheel off, latent credit −6.3734 kW, the backup carries the rest.
        let cold = u.solve_hour(&c, Some(HeatSupplied::default())).unwrap();
        assert_eq!(cold.t_regen_c, None);
        assert!((cold.w_supply_kg_kg - 0.012).abs() < 1e-12, "{cold:?}");
        let lat = m_u * (0.0105 - 0.012) * h_fg + vl_b;
        assert!((lat + 6.3734).abs() < 1e-3);
        assert!((cold.latent_kwh - lat).abs() < 1e-9, "{cold:?}");
        let credited = (cold.sensible_kwh + cold.latent_kwh).max(0.0);
        assert!(
            (cold.backup.cooling_kwh + cold.unmet_kwh - (40.0 - credited)).abs() < 1e-9,
            "{cold:?}"
        );
    }

    /// Unit flow equal to the building's: the rule before this change (the unit credited with
    /// the ventilation load of its own flow) — `humid_hour_meets_latent_target` holds its hand
    /// calculation. A building flow above the unit's changes nothing (the unit replaces its own
    /// flow; the rest of the building's outdoor air stays a room load), bit for bit.
    #[test]
    fn unit_flow_equal_to_building_is_the_old_rule() {
        let u = unit();
        for (t, w, s, l) in [
            (30.0, 0.012, 20.0, 20.0),
            (32.0, 0.016, 20.0, 100.0),
            (40.0, 0.006, 60.0, 2.0),
        ] {
            let eq = u
                .solve_hour(&hour_vent(t, w, s, l, 10_000.0), None)
                .unwrap();
            let more = u
                .solve_hour(&hour_vent(t, w, s, l, 25_000.0), None)
                .unwrap();
            // Debug text: the stopped-wheel hours carry NaN water temperatures (NaN ≠ NaN).
            assert_eq!(format!("{eq:?}"), format!("{more:?}"));
        }
        // Same humid hour as `humid_hour_meets_latent_target`: vl at the unit's flow.
        let m = u.m_supply_kg_s;
        let vl = m * (0.012 - 0.0105) * (2501.0 + 1.86 * 26.0);
        assert!((vl - 12.747).abs() < 1e-3);
        let h = u
            .solve_hour(&hour_vent(30.0, 0.012, 20.0, 20.0, 10_000.0), None)
            .unwrap();
        let w_target = 0.0105 - (20.0 - vl) / (m * (2501.0 + 1.86 * 26.0));
        assert!((h.w_supply_kg_kg - w_target).abs() < 1e-6, "{h:?}");
    }

    /// Recirculation cycle on a humid hour runs and balances.
    #[test]
    fn recirculation_cycle_balances() {
        let mut s = DesiccantSpec::typical(10_000.0);
        s.cycle = Cycle::Recirculation;
        let u = build(&s, &ChillerSpec::typical(Condenser::WaterCooled, 200.0)).unwrap();
        let h = u.solve_hour(&hour(30.0, 0.012, 20.0, 5.0), None).unwrap();
        assert!(
            h.energy_balance_rel < 1e-9 && h.water_balance_rel < 1e-9,
            "{h:?}"
        );
    }

    mod prop {
        use super::*;
        use crate::components::evap_cooler::EvapCooler;
        use proptest::prelude::*;

        proptest! {
            /// No component creates water or energy, for random valid inlet states.
            #[test]
            fn components_conserve(
                tp in 15.0f64..45.0, rhp in 0.2f64..0.9, tr in 50.0f64..90.0,
                wr_frac in 0.2f64..1.0, e1 in 0.0f64..0.2, e2 in 0.8f64..1.0, ratio in 0.7f64..1.5,
            ) {
                let wp = psychro::ratio_from_rh(tp, rhp * 100.0, 101.325).unwrap();
                let wr = wp * wr_frac;
                let pi = Air { t_c: tp, w_kg_kg: wp };
                let ri = Air { t_c: tr, w_kg_kg: wr };
                let wheel = DesiccantWheel::new(e1, e2).unwrap();
                if let Ok(o) = wheel.run(pi, ri, 1.0, ratio, 101.325) {
                    let dw = (pi.w_kg_kg + ratio * ri.w_kg_kg)
                        - (o.process_out.w_kg_kg + ratio * o.regen_out.w_kg_kg);
                    let dh = (pi.h_kj_kg() + ratio * ri.h_kj_kg())
                        - (o.process_out.h_kj_kg() + ratio * o.regen_out.h_kj_kg());
                    prop_assert!(dw.abs() < 1e-12 && dh.abs() < 1e-9 * (pi.h_kj_kg().abs() + ri.h_kj_kg()));
                    prop_assert!(o.process_out.w_kg_kg >= 0.0 && o.regen_out.w_kg_kg >= 0.0);
                }
                let hw = HeatWheel::new(e2).unwrap();
                let o = hw.run(ri, ratio, pi, 1.0).unwrap();
                let dh = ratio * (ri.h_kj_kg() - o.hot_out.h_kj_kg()) - (o.cold_out.h_kj_kg() - pi.h_kj_kg());
                prop_assert!(dh.abs() < 1e-9 && o.hot_out.t_c >= pi.t_c - 1e-9);
                let twb = psychro::wet_bulb_c(tp, wp, 101.325).unwrap();
                let ec = EvapCooler::new(e2).unwrap().run(pi, twb, e2).unwrap();
                prop_assert!(ec.water_kg_kg >= 0.0);
                let de = pi.h_kj_kg() + ec.water_kg_kg * 4.186 * twb - ec.air.h_kj_kg();
                prop_assert!(de.abs() < 1e-9);
            }
        }
    }
}
