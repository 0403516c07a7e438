//! Cooling routes: assemblies of components that turn driving heat (or power) into delivered
//! cooling. The plant loop steps one route per option, once per hour, in two calls:
//!
//! 1. [`Route::heat_request`] — given the hour's conditions and the temperature at the top of
//!    the option's store, how much driving heat the route wants, at what supply temperature,
//!    returning at what temperature. Routes that need no heat (the electric chiller) say `None`.
//! 2. [`Route::run`] — given the heat actually supplied (solar from the store and backup from
//!    the boiler), what the route delivered, used and rejected, and why it fell short.
//!
//! A new heat-driven route (absorption, desiccant, Rankine) implements both calls; the plant
//! loop, storage, backup and bookkeeping stay as they are.

pub mod absorption;
pub mod desiccant;
pub mod electric;
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
}

/// Driving heat actually given to a route this hour.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct HeatSupplied {
    /// From the solar store, kWh.
    pub solar_kwh: f64,
    /// From the backup boiler, kWh.
    pub backup_kwh: f64,
}

/// Why a route did less than asked, or that it did all.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Reason {
    /// Met the whole load.
    Ok,
    /// No cooling load this hour.
    NoLoad,
    /// Load above what the machine can deliver at this hour's conditions.
    CapacityLimit,
}

impl Reason {
    /// Stable code used in the hourly CSV and JSON.
    pub fn as_str(&self) -> &'static str {
        match self {
            Reason::Ok => "ok",
            Reason::NoLoad => "no-load",
            Reason::CapacityLimit => "capacity-limit",
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
}

/// A cooling route stepped by the plant loop.
pub trait Route: Send + Sync {
    /// Route name as written in the scenario (`electric`, ...).
    fn kind(&self) -> &'static str;
    /// Heat wanted from the store this hour (see module docs). `t_store_top_c` is `None` for
    /// an option without a store.
    fn heat_request(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> Option<HeatRequest>;
    /// Run the hour with the heat supplied (`None` when the route asked for none).
    fn run(&self, c: &HourConditions, heat: Option<HeatSupplied>) -> RouteHour;
}
