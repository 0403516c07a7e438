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
pub mod conventional;
pub mod desiccant;
pub mod electric;
pub mod pv_electric;
pub mod rankine_vc;

use crate::load::LoadHour;

/// Control margin between the store's top and the supply a machine running on store heat
/// alone is solved at, K: its mixing valve holds the supply while the top drifts down over
/// the hour, and the plant draws only while the top is at or above that supply (common
/// practice: a valve needs a few kelvin of headroom).
pub const SUPPLY_MARGIN_K: f64 = 2.0;

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
    /// No solar heat to drive the machine: the option has no collector field, or the field
    /// collected nothing this hour and the store is below the machine's cut-in. The backup
    /// (chiller, motor) carried the hour.
    NoSun,
    /// The field is collecting but the store's top is still below the machine's cut-in (or
    /// fell below its cut-out): machine off, the backup carried the hour.
    StoreBelowCutIn,
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
    /// Rankine: the engine cannot run at this hour's supply and sink (no operating point);
    /// the backup chiller carried the hour.
    EngineOff,
}

impl Reason {
    /// Stable code used in the hourly CSV and JSON.
    pub fn as_str(&self) -> &'static str {
        match self {
            Reason::Ok => "ok",
            Reason::NoLoad => "no-load",
            Reason::CapacityLimit => "capacity-limit",
            Reason::NoSun => "no-sun",
            Reason::StoreBelowCutIn => "store-below-cut-in",
            Reason::CrystallisationMargin => "crystallisation-margin",
            Reason::NoSolution => "no-solution",
            Reason::EvaporativeOnly => "evaporative-only",
            Reason::WheelOutOfRange => "wheel-out-of-range",
            Reason::LatentLimit => "latent-limit",
            Reason::HeatShort => "heat-short",
            Reason::SensibleLimit => "sensible-limit",
            Reason::NotVentilating => "not-ventilating",
            Reason::EngineOff => "engine-off",
        }
    }
}

/// Cooling delivered in an hour, by who made it, kWh. Each kWh of cooling is in exactly one
/// field; the plant splits `heat_driven_kwh` between solar and backup heat.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Cooling {
    /// By the heat-driven machine from the driving heat it was given: absorption chiller,
    /// desiccant unit while its wheel is regenerated, the engine-driven share of a Rankine
    /// chiller (shaft from heat × mechanical efficiency × chiller COP).
    pub heat_driven_kwh: f64,
    /// By evaporative cooling alone (desiccant unit with its wheel stopped): no driving heat,
    /// no compressor — a saving that needs no sun.
    pub evaporative_kwh: f64,
    /// By an electric compressor: the conventional chiller (reference or backup) or a motor.
    pub electric_kwh: f64,
}

impl Cooling {
    /// All cooling delivered, kWh.
    pub fn total_kwh(&self) -> f64 {
        self.heat_driven_kwh + self.evaporative_kwh + self.electric_kwh
    }
}

/// Electricity used in an hour, by use, kWh. Each kWh is in exactly one field.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Electricity {
    /// Compressors of electric chillers (and a Rankine chiller's motor).
    pub compressor_kwh: f64,
    /// Heat rejection: cooling-tower and dry-cooler fans.
    pub heat_rejection_kwh: f64,
    /// Pumps: chilled, condenser and hot water, solution pump, collector loop.
    pub pumps_kwh: f64,
    /// Air handling of a desiccant unit: its fans, wheel drives and evaporative-cooler pumps.
    pub air_handling_kwh: f64,
}

impl Electricity {
    /// All electricity, kWh.
    pub fn total_kwh(&self) -> f64 {
        self.compressor_kwh + self.heat_rejection_kwh + self.pumps_kwh + self.air_handling_kwh
    }
}

/// What a route did in the hour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RouteHour {
    /// Cooling delivered at the building's terminals, by who made it.
    pub cooling: Cooling,
    /// Cooling load not met, kWh.
    pub unmet_kwh: f64,
    /// Electricity used by the route, by use.
    pub electricity: Electricity,
    /// Heat rejected to ambient, kWh: by the machines' condensers, absorbers and exhausts,
    /// and every kWh of the route's electricity (fans and pumps end as heat in the air and
    /// water they move). With the driving heat used and the cooling it closes the route's
    /// first law: `heat + cooling + electricity = heat rejected`.
    pub heat_rejected_kwh: f64,
    pub reason: Reason,
    /// Water used (cooling tower make-up, evaporative coolers), m³.
    pub water_m3: f64,
    /// Driving temperature the machine ran at (generator, regeneration or engine supply), °C.
    pub t_drive_c: Option<f64>,
    /// Heat-rejection sink the machine saw (cooling water or air entering), °C.
    pub t_sink_c: Option<f64>,
    /// Chilled-water temperature the heat-driven machine made, °C (for the second-law check).
    pub t_chw_c: Option<f64>,
    /// Electricity from the option's own PV array used this hour, kWh (pv-electric).
    pub pv_used_kwh: f64,
    /// PV electricity exported, kWh.
    pub pv_export_kwh: f64,
    /// Up to four route-specific figures (name with unit, value), empty names unused.
    pub detail: [(&'static str, f64); 4],
}

impl RouteHour {
    /// All cooling delivered, kWh.
    pub fn cooling_kwh(&self) -> f64 {
        self.cooling.total_kwh()
    }
    /// All electricity, kWh.
    pub fn electricity_kwh(&self) -> f64 {
        self.electricity.total_kwh()
    }
    /// An idle hour with no cooling load.
    pub fn no_load() -> RouteHour {
        RouteHour::default()
    }
    /// The conventional plant's hour as electric cooling (reference, or backup alone).
    pub fn from_conventional(h: &conventional::ConventionalHour, reason: Reason) -> RouteHour {
        RouteHour {
            cooling: Cooling {
                electric_kwh: h.cooling_kwh,
                ..Cooling::default()
            },
            unmet_kwh: h.unmet_kwh,
            electricity: Electricity {
                compressor_kwh: h.compressor_kwh,
                heat_rejection_kwh: h.fan_kwh,
                pumps_kwh: h.pumps_kwh,
                air_handling_kwh: 0.0,
            },
            heat_rejected_kwh: h.heat_rejected_kwh + h.fan_kwh + h.pumps_kwh,
            reason,
            water_m3: h.water_m3,
            t_sink_c: Some(h.t_condenser_in_c),
            ..RouteHour::default()
        }
    }
    /// Add the conventional plant's hour (a backup chiller carrying part of the load).
    pub fn add_backup(&mut self, h: &conventional::ConventionalHour) {
        self.cooling.electric_kwh += h.cooling_kwh;
        self.electricity.compressor_kwh += h.compressor_kwh;
        self.electricity.heat_rejection_kwh += h.fan_kwh;
        self.electricity.pumps_kwh += h.pumps_kwh;
        self.heat_rejected_kwh += h.heat_rejected_kwh + h.fan_kwh + h.pumps_kwh;
        self.water_m3 += h.water_m3;
    }
}

impl Default for RouteHour {
    fn default() -> Self {
        RouteHour {
            cooling: Cooling::default(),
            unmet_kwh: 0.0,
            electricity: Electricity::default(),
            heat_rejected_kwh: 0.0,
            reason: Reason::NoLoad,
            water_m3: 0.0,
            t_drive_c: None,
            t_sink_c: None,
            t_chw_c: None,
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

/// What a start of a heat-driven machine costs and how long it must run and rest, as a
/// scenario writes it (`[options.NAME.<route>.starts]`).
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StartSpec {
    /// Thermal mass warmed from the plant room to the drive temperature at each start, kJ/K
    /// per kW of the machine's rated cooling (default: the route's, stated in its docs).
    #[serde(default)]
    pub thermal_mass_kj_k_per_kw: Option<f64>,
    /// Hours the machine stays enabled once started, even if the store falls below its
    /// cut-out (default 1: no constraint beyond the hour).
    #[serde(default = "one_hour")]
    pub min_run_h: u32,
    /// Hours the machine stays off once stopped (default 0).
    #[serde(default)]
    pub min_off_h: u32,
}

fn one_hour() -> u32 {
    1
}

impl Default for StartSpec {
    fn default() -> Self {
        StartSpec {
            thermal_mass_kj_k_per_kw: None,
            min_run_h: 1,
            min_off_h: 0,
        }
    }
}

impl StartSpec {
    /// Check the keys: thermal mass 0..200 kJ/(K·kW), minimum run 1..24 h, minimum off
    /// 0..24 h.
    pub fn validate(&self) -> crate::Result<()> {
        if let Some(m) = self.thermal_mass_kj_k_per_kw {
            crate::validate::in_range(
                "starts.thermal_mass_kj_k_per_kw",
                m,
                0.0,
                200.0,
                "thermal mass warmed at each start, kJ/K per kW of rated cooling",
            )?;
        }
        crate::validate::count(
            "starts.min_run_h",
            self.min_run_h,
            1,
            24,
            "hours the machine stays enabled once started",
        )?;
        crate::validate::count(
            "starts.min_off_h",
            self.min_off_h,
            0,
            24,
            "hours the machine stays off once stopped",
        )
    }

    /// The built start-up of a machine of `capacity_kw` whose class default is
    /// `default_kj_k_per_kw`.
    pub fn build(&self, capacity_kw: f64, default_kj_k_per_kw: f64) -> StartUp {
        StartUp {
            thermal_mass_kj_k: self.thermal_mass_kj_k_per_kw.unwrap_or(default_kj_k_per_kw)
                * capacity_kw,
            min_run_h: self.min_run_h,
            min_off_h: self.min_off_h,
        }
    }
}

/// A heat-driven machine's start: the heat its thermal mass takes to reach the drive
/// temperature, and its run/off limits (applied by the plant loop).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StartUp {
    /// kJ/K.
    pub thermal_mass_kj_k: f64,
    pub min_run_h: u32,
    pub min_off_h: u32,
}

/// A cooling route stepped by the plant loop.
pub trait Route: Send + Sync {
    /// Route name as written in the scenario (`electric`, ...).
    fn kind(&self) -> &'static str;
    /// The machine's store cut-in and cut-out temperatures, °C (`cut_out ≤ cut_in`), for a
    /// route that runs on store heat alone (electric backup). The plant loop enables the
    /// machine when the store's top reaches the cut-in and disables it when the top falls
    /// below the cut-out; while disabled it passes `t_store_top_c = None`. `None` (the
    /// default) for routes that need no heat or whose boiler lifts the store's water.
    fn cut_in_out_c(&self) -> Option<(f64, f64)> {
        None
    }
    /// A heat-driven machine's start-up cost and run/off limits; `None` for routes that need
    /// no heat.
    fn start_up(&self) -> Option<StartUp> {
        None
    }
    /// Heat wanted from the store this hour (see module docs). `t_store_top_c` is `None` when
    /// the machine may not draw store heat: the option has no store, or the store is below the
    /// machine's cut-in band ([`Route::cut_in_out_c`]). A route whose backup is the boiler
    /// may still ask (the boiler gives it all); a route with an electric backup asks for
    /// nothing and reports [`Reason::StoreBelowCutIn`] (the plant refines it to
    /// [`Reason::NoSun`] where no solar heat came in).
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
