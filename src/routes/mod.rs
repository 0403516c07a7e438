//! Cooling routes: assemblies of components that turn driving heat (or power) into delivered
//! cooling. The plant loop steps one route per option, once per hour, in two calls:
//!
//! 1. [`Route::heat_request`] — given the hour's conditions and the temperature at the top of
//!    the option's store, how much driving heat the route wants, at what supply temperature,
//!    returning at what temperature. Routes that need no heat (the electric chiller) say `None`.
//! 2. [`Route::run`] — given the same store temperature and the heat actually supplied (solar from the store and backup from
//!    the boiler), what the route delivered, used and rejected, and why it fell short.
//!
//! A new heat-driven route (absorption, desiccant, Rankine) implements both calls; the plant
//! loop, storage, backup and bookkeeping stay as they are.

pub mod absorption;
pub mod desiccant;
pub mod electric;
pub mod pv_electric;
pub mod rankine_vc;

use crate::load::LoadHour;

/// What a route sees of the hour.
#[derive(Debug, Clone, Copy)]
pub struct HourConditions {
    /// Hour of the year, 0..8760.
    pub hour: usize,
    /// Outdoor dry-bulb, °C.
    pub t_db_c: f64,
    /// Outdoor humidity ratio, kg/kg.
    pub w_kg_kg: f64,
    /// Outdoor wet-bulb, °C (ASHRAE 2017 psychrometrics).
    pub t_wb_c: f64,
    /// Barometric pressure, kPa.
    pub p_kpa: f64,
    /// The building's load this hour.
    pub load: LoadHour,
}

/// Driving heat a route asks of the store for this hour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HeatRequest {
    /// Heat wanted over the hour, kWh.
    pub heat_kwh: f64,
    /// Temperature the route needs at its inlet, °C (the boiler lifts the store's water to it).
    pub t_supply_c: f64,
    /// Temperature the route returns to the store, °C.
    pub t_return_c: f64,
    /// May the boiler make up what the store cannot give? `false` for routes whose backup is
    /// electric (an absorption chiller with an electric backup chiller, an engine whose motor
    /// carries the shaft): heat from a boiler would only be burnt to save electricity.
    pub boiler_backup: bool,
}

/// Driving heat actually given to a route this hour.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct HeatSupplied {
    /// From the solar store, kWh.
    pub solar_kwh: f64,
    /// From the backup boiler, kWh.
    pub backup_kwh: f64,
}

/// Why a route did less than asked, or what it did instead. One list for every route, so
/// the hourly CSV has one vocabulary.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Reason {
    /// Met the whole load as intended.
    Ok,
    /// No cooling load this hour.
    NoLoad,
    /// Load above what the machine can deliver at this hour's conditions.
    CapacityLimit,
    /// Absorption: store below the lowest workable supply; the backup chiller carried the hour.
    SupplyTooCold,
    /// Absorption: generator supply lowered (capacity limited) to keep the strong solution's
    /// crystallisation margin; the backup carried the rest.
    CrystallisationMargin,
    /// A machine's solve found no operating point (no refrigerant flow, no convergence):
    /// machine off, backup carried what it could.
    NoSolution,
    /// Desiccant: outdoor air dry enough, wheel stopped, evaporative cooling only.
    EvaporativeOnly,
    /// Desiccant: process air outside the wheel model's validity; backup carried the hour.
    WheelOutOfRange,
    /// Desiccant: too humid even at the highest regeneration temperature.
    LatentLimit,
    /// Less driving heat arrived than was asked.
    HeatShort,
    /// Desiccant: supply air not cold enough with the coolers at design.
    SensibleLimit,
    /// Desiccant, ventilation cycle: the building has no mechanical ventilation this hour
    /// (unoccupied), so there is no outdoor air for the unit to treat: unit off, the backup
    /// chiller (or `unmet`) carried the load.
    NotVentilating,
    /// Rankine: no heat or supply too cold, the motor drove the compressor alone.
    EngineOff,
    /// Rankine: engine and motor shared the shaft.
    MotorAssist,
}

impl Reason {
    /// Stable code used in the hourly CSV and JSON.
    pub fn as_str(&self) -> &'static str {
        match self {
            Reason::Ok => "ok",
            Reason::NoLoad => "no-load",
            Reason::CapacityLimit => "capacity-limit",
            Reason::SupplyTooCold => "supply-too-cold",
            Reason::CrystallisationMargin => "crystallisation-margin",
            Reason::NoSolution => "no-solution",
            Reason::EvaporativeOnly => "evaporative-only",
            Reason::WheelOutOfRange => "wheel-out-of-range",
            Reason::LatentLimit => "latent-limit",
            Reason::HeatShort => "heat-short",
            Reason::SensibleLimit => "sensible-limit",
            Reason::NotVentilating => "not-ventilating",
            Reason::EngineOff => "engine-off",
            Reason::MotorAssist => "motor-assist",
        }
    }
}

/// What a route did in the hour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RouteHour {
    /// Cooling delivered at the building's terminals, kWh.
    pub cooling_kwh: f64,
    /// Cooling load not met, kWh.
    pub unmet_kwh: f64,
    /// Electricity used by the route (compressors, fans, pumps), kWh.
    pub electricity_kwh: f64,
    /// Heat rejected to ambient, kWh.
    pub heat_rejected_kwh: f64,
    /// Cooling per unit of driving heat; `None` for routes not driven by heat, or no heat used.
    pub cop_thermal: Option<f64>,
    /// Cooling per unit of electricity; `None` when no electricity was used.
    pub cop_electric: Option<f64>,
    pub reason: Reason,
    /// Water used (cooling tower make-up, evaporative coolers), m³.
    pub water_m3: f64,
    /// Of the cooling, what a backup electric chiller delivered, kWh.
    pub backup_cooling_kwh: f64,
    /// Driving temperature the machine ran at (generator, regeneration or engine supply), °C.
    pub t_drive_c: Option<f64>,
    /// Heat-rejection sink the machine saw (cooling water or air entering), °C.
    pub t_sink_c: Option<f64>,
    /// Electricity from the option's own PV array used this hour, kWh (pv-electric).
    pub pv_used_kwh: f64,
    /// PV electricity exported, kWh.
    pub pv_export_kwh: f64,
    /// Up to four route-specific figures (name with unit, value), empty names unused.
    pub detail: [(&'static str, f64); 4],
}

impl Default for RouteHour {
    fn default() -> Self {
        RouteHour {
            cooling_kwh: 0.0,
            unmet_kwh: 0.0,
            electricity_kwh: 0.0,
            heat_rejected_kwh: 0.0,
            cop_thermal: None,
            cop_electric: None,
            reason: Reason::NoLoad,
            water_m3: 0.0,
            backup_cooling_kwh: 0.0,
            t_drive_c: None,
            t_sink_c: None,
            pv_used_kwh: 0.0,
            pv_export_kwh: 0.0,
            detail: [("", 0.0); 4],
        }
    }
}

/// Memory of a route's last solve, behind `&self`: the plant loop asks `heat_request` and then
/// `run` for the same hour and temperatures, and a route keeps what it solved for the first to
/// serve the second (and as a warm start for the next hour). Each option owns its route, so the
/// lock is never contended; a clone starts empty, so copies never share state.
#[derive(Debug, Default)]
pub(crate) struct Memo<T>(std::sync::Mutex<T>);

impl<T: Default> Clone for Memo<T> {
    fn clone(&self) -> Self {
        Memo::default()
    }
}

impl<T: Default + Copy> Memo<T> {
    /// The stored state (the default if the lock was poisoned).
    pub(crate) fn get(&self) -> T {
        self.0.lock().map(|g| *g).unwrap_or_default()
    }
    /// Replace the stored state.
    pub(crate) fn set(&self, m: T) {
        if let Ok(mut g) = self.0.lock() {
            *g = m;
        }
    }
}

/// A cooling route stepped by the plant loop.
pub trait Route: Send + Sync {
    /// Route name as written in the scenario (`electric`, ...).
    fn kind(&self) -> &'static str;
    /// Heat wanted from the store this hour (see module docs). `t_store_top_c` is `None` for
    /// an option without a store.
    fn heat_request(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> Option<HeatRequest>;
    /// Run the hour with the heat supplied (`None` when the route asked for none). The store
    /// temperature is the one `heat_request` saw, so a route can re-solve the same operating
    /// point deterministically.
    fn run(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        heat: Option<HeatSupplied>,
    ) -> RouteHour;
}
