//! The scenario file's layout. Every struct rejects unknown keys; units are in key names.
//! `parhelion init` writes a starter that documents each key with its unit and range
//! (`starter.rs`), and README's scenario reference lists them.

use crate::components::chiller_electric::ChillerSpec;
use crate::components::collector::CollectorSpec;
use crate::components::pv::PvSpec;
use crate::feasibility::economics::EconomicsSpec;
use crate::feasibility::energy::{EnergySpec, RefrigerantSpec};
use crate::load::file::LoadFileSpec;
use crate::load::rc5::BuildingSpec;
use crate::routes::absorption::AbsorptionSpec;
use crate::routes::desiccant::DesiccantSpec;
use crate::routes::rankine_vc::RankineVcSpec;
use crate::sun::incidence::Tracking;
use crate::sun::sky::SkyModel;
use crate::weather::file::FileSpec;
use crate::weather::synthetic::MonthlyNormals;
use indexmap::IndexMap;
use serde::Deserialize;

/// A whole scenario file.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Scenario {
    /// Scenario name shown on every output.
    pub name: String,
    /// Name of the option every saving is measured against.
    pub reference: String,
    /// When cooling and the heat demand both want heat from the same store this hour, which
    /// is served first.
    #[serde(default)]
    pub heat_priority: HeatPriority,
    pub site: SiteSection,
    pub weather: WeatherSection,
    pub load: LoadSection,
    #[serde(default)]
    pub heat_demand: Option<HeatDemandSection>,
    /// The conventional electric chiller: the `electric` route and the backup chiller of
    /// heat-driven routes.
    pub baseline: ChillerSpec,
    /// Collector definitions by name (ISO 9806 coefficients).
    #[serde(default)]
    pub collectors: IndexMap<String, CollectorSpec>,
    /// The plants to compare, in the order given.
    pub options: IndexMap<String, OptionSection>,
    /// Money: prices, discount rate, lifetime, cost functions. Without it no money figures.
    #[serde(default)]
    pub economics: Option<EconomicsSpec>,
    /// Primary-energy and CO2 factors (indicative defaults when absent).
    #[serde(default)]
    pub energy: EnergySpec,
    /// Uncertain inputs for `parhelion sensitivity` and `parhelion uncertainty`.
    #[serde(default)]
    pub uncertainty: Option<UncertaintySection>,
}

/// `[uncertainty]`: the inputs whose uncertainty the sensitivity and uncertainty verbs explore.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UncertaintySection {
    /// One `[[uncertainty.inputs]]` per uncertain number.
    pub inputs: Vec<UncertainInput>,
}

/// How an uncertain input is spread between `low` and `high`.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Distribution {
    /// Equally likely anywhere between low and high.
    #[default]
    Uniform,
    /// Triangular between low and high with its mode at the scenario's own value.
    Triangular,
}

/// One uncertain number, by its dotted key path in this scenario.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct UncertainInput {
    /// Dotted key path, e.g. `options.solar.field.gross_area_m2` or
    /// `weather.irradiation_scale`.
    pub key: String,
    pub low: f64,
    pub high: f64,
    #[serde(default)]
    pub distribution: Distribution,
}

/// Heat allocation rule between the cooling route and the heat demand.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum HeatPriority {
    #[default]
    CoolingFirst,
    HeatingFirst,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SiteSection {
    pub latitude_deg: f64,
    pub longitude_deg: f64,
    pub elevation_m: f64,
    /// Offset of local standard time from UTC, hours (east positive).
    pub utc_offset_h: f64,
    #[serde(default = "default_albedo")]
    pub ground_albedo: f64,
    /// Calendar year used for the sun's position (a 365-day year is simulated).
    #[serde(default = "default_year")]
    pub year: i32,
    /// Day of week of 1 January, 0 = Monday .. 6 = Sunday (for occupancy schedules).
    #[serde(default)]
    pub jan1_weekday: u32,
}

fn unity() -> f64 {
    1.0
}

fn default_albedo() -> f64 {
    0.2
}
fn default_year() -> i32 {
    2025
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum WeatherSource {
    Synthetic,
    File,
}

/// `[weather]`: `source` and the matching `[weather.synthetic]` or `[weather.file]` table.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WeatherSection {
    pub source: WeatherSource,
    /// Factor on every irradiance of the year (GHI, DNI, DHI), for sensitivity studies.
    #[serde(default = "unity")]
    pub irradiation_scale: f64,
    /// Shift of every dry-bulb temperature of the year, K, for sensitivity studies; the
    /// humidity stays as the source gives it (dew point, ratio or RH), a dew point never
    /// above the dry-bulb.
    #[serde(default)]
    pub temperature_shift_k: f64,
    /// Monthly mean wind speeds, m/s, 12 values (January first), for the hours the weather
    /// gives no wind (a synthetic year never does); without them 2 m/s
    /// (`weather::sky::DEFAULT_WIND_M_S`). Read by collectors with wind coefficients.
    pub wind_monthly_m_s: Option<Vec<f64>>,
    pub synthetic: Option<MonthlyNormals>,
    pub file: Option<FileSpec>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum LoadSource {
    Model,
    File,
}

/// `[load]`: `source` and the matching `[load.model]` or `[load.file]` table.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LoadSection {
    pub source: LoadSource,
    pub model: Option<BuildingSpec>,
    pub file: Option<LoadFileSpec>,
}

/// `[heat_demand]`: heat the building needs besides cooling, which a solar store can serve.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HeatDemandSection {
    /// Domestic hot water drawn per day, litres at the delivery temperature (0 = none).
    #[serde(default)]
    pub dhw_l_per_day: f64,
    /// Hot-water delivery temperature, °C.
    #[serde(default = "default_dhw_t")]
    pub dhw_t_c: f64,
    /// Cold (mains) water temperature by month, °C, 12 values.
    #[serde(default)]
    pub cold_water_c: Vec<f64>,
    /// Fraction of the day's draw in each hour, 24 values summing to 1 (default: a typical
    /// profile with morning and evening peaks, common practice).
    #[serde(default)]
    pub dhw_profile: Option<Vec<f64>>,
    /// Serve the building model's space-heating need as well.
    #[serde(default)]
    pub space_heating: bool,
    /// Space-heating loop supply and return temperatures, °C.
    #[serde(default = "default_sh_supply")]
    pub sh_supply_c: f64,
    #[serde(default = "default_sh_return")]
    pub sh_return_c: f64,
}

fn default_dhw_t() -> f64 {
    55.0
}
fn default_sh_supply() -> f64 {
    45.0
}
fn default_sh_return() -> f64 {
    35.0
}

/// The kind of cooling machine an option uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum RouteKind {
    /// Conventional vapour-compression chiller on grid electricity (the `[baseline]` chiller).
    Electric,
    /// Single-effect LiBr–water absorption chiller driven by the option's hot water.
    Absorption,
    /// Desiccant evaporative-cooling air handler regenerated by the option's hot water.
    Desiccant,
    /// Organic Rankine engine on the option's hot water driving a vapour-compression chiller.
    RankineVc,
    /// The `[baseline]` chiller with the option's own PV array.
    PvElectric,
}

impl RouteKind {
    pub fn as_str(&self) -> &'static str {
        match self {
            RouteKind::Electric => "electric",
            RouteKind::Absorption => "absorption",
            RouteKind::Desiccant => "desiccant",
            RouteKind::RankineVc => "rankine-vc",
            RouteKind::PvElectric => "pv-electric",
        }
    }

    /// Routes driven by heat from the option's field and store.
    pub fn is_heat_driven(&self) -> bool {
        matches!(
            self,
            RouteKind::Absorption | RouteKind::Desiccant | RouteKind::RankineVc
        )
    }
}

/// `[options.NAME]`: one whole plant.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OptionSection {
    pub route: RouteKind,
    /// One line describing the option, shown in reports.
    #[serde(default)]
    pub description: Option<String>,
    /// Serve `[heat_demand]` from this option's solar store (else its boiler serves it all).
    #[serde(default)]
    pub serves_heat_demand: bool,
    pub field: Option<FieldSection>,
    pub storage: Option<StorageSection>,
    #[serde(default)]
    pub backup: BackupSection,
    /// `route = "absorption"`: the machine (`[options.NAME.absorption]`).
    pub absorption: Option<AbsorptionSpec>,
    /// `route = "desiccant"`: the air handler.
    pub desiccant: Option<DesiccantSpec>,
    /// `route = "rankine-vc"`: engine and chiller.
    pub rankine_vc: Option<RankineVcSpec>,
    /// `route = "pv-electric"`: the PV array.
    pub pv: Option<PvSection>,
    /// Refrigerant charge for leakage emissions (optional).
    pub refrigerant: Option<RefrigerantSpec>,
}

/// `[options.NAME.pv]`: orientation of the array, and `[options.NAME.pv.array]` its model.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PvSection {
    pub tilt_deg: f64,
    #[serde(default = "south")]
    pub azimuth_deg: f64,
    #[serde(default = "fixed")]
    pub tracking: Tracking,
    #[serde(default = "perez")]
    pub sky_model: SkyModel,
    /// One-parameter beam IAM of the module glass (ASHRAE form; about 0.05 for flat glass,
    /// common practice).
    #[serde(default = "default_pv_b0")]
    pub iam_b0: f64,
    pub array: PvSpec,
}

fn default_pv_b0() -> f64 {
    0.05
}

/// Heat-transfer fluid of the collector loop.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Fluid {
    Water,
    /// Aqueous propylene glycol (antifreeze), of mass fraction `glycol_mass_fraction`; needs
    /// an indirect loop (`hx_effectiveness`).
    PropyleneGlycol,
}

/// `[options.NAME.field]`: the collector field.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FieldSection {
    /// Name of a `[collectors.NAME]` definition.
    pub collector: String,
    /// Number of collector modules — or give `gross_area_m2` (rounded up to whole rows).
    pub modules: Option<u32>,
    pub gross_area_m2: Option<f64>,
    /// Modules connected in series in each row (rows run in parallel).
    #[serde(default = "one")]
    pub in_series: u32,
    pub tilt_deg: f64,
    #[serde(default = "south")]
    pub azimuth_deg: f64,
    #[serde(default = "fixed")]
    pub tracking: Tracking,
    #[serde(default = "perez")]
    pub sky_model: SkyModel,
    #[serde(default = "water")]
    pub fluid: Fluid,
    /// Glycol mass fraction of a `propylene-glycol` loop, 0.25–0.50.
    #[serde(default = "default_glycol")]
    pub glycol_mass_fraction: f64,
    /// Collector-loop mass flow per m² of collector (on its area basis), kg/(s·m²).
    #[serde(default = "default_flow")]
    pub flow_kg_s_m2: f64,
    /// Total length of supply plus return piping, m, and its loss coefficient per metre.
    #[serde(default = "default_pipe_length")]
    pub pipe_length_m: f64,
    #[serde(default = "default_pipe_loss")]
    pub pipe_loss_w_mk: f64,
    /// Heat capacity of the loop's pipes and their fluid per metre, J/(m·K) (default 2300: a
    /// water-filled DN 25 copper pipe).
    #[serde(default = "default_pipe_capacity")]
    pub pipe_heat_capacity_j_mk: f64,
    /// Effectiveness of the collector-loop heat exchanger (indirect loop); omit for a
    /// direct loop.
    pub hx_effectiveness: Option<f64>,
    /// Collector-loop pump electric power per m² of collector while running, W/m².
    #[serde(default = "default_pump")]
    pub pump_w_m2: f64,
    /// Differential thermostat: start when the collector sensor (the field's temperature
    /// while stopped) exceeds the store bottom by `dt_on_k`, stop when the outlet gain falls
    /// below `dt_off_k`.
    #[serde(default = "default_dt_on")]
    pub dt_on_k: f64,
    #[serde(default = "default_dt_off")]
    pub dt_off_k: f64,
}

fn one() -> u32 {
    1
}
fn default_pipe_capacity() -> f64 {
    crate::plant::field_node::DEFAULT_PIPE_CAPACITY_J_MK
}
fn south() -> f64 {
    180.0
}
fn fixed() -> Tracking {
    Tracking::Fixed
}
fn perez() -> SkyModel {
    SkyModel::Perez1990
}
fn water() -> Fluid {
    Fluid::Water
}
fn default_glycol() -> f64 {
    0.3
}
fn default_flow() -> f64 {
    0.02
}
fn default_pipe_length() -> f64 {
    20.0
}
fn default_pipe_loss() -> f64 {
    0.25
}
fn default_pump() -> f64 {
    2.0
}
fn default_dt_on() -> f64 {
    6.0
}
fn default_dt_off() -> f64 {
    1.5
}

/// Storage kind.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum StorageKind {
    /// Stratified water tank.
    Tank,
    /// Phase-change store.
    Pcm,
}

/// `[options.NAME.storage]`: a water tank (`volume_m3`, `height_m`, `ua_w_k`, `nodes`) or a
/// phase-change store (`mass_kg`, `cp_solid_j_kgk`, `cp_liquid_j_kgk`, `latent_j_kg`,
/// `t_melt_c`, `melt_range_k`, `ua_w_k`, `ua_hx_w_k`).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StorageSection {
    pub kind: StorageKind,
    /// Tank volume, m³ — or give `volume_l_per_m2` to make it follow the collector area.
    pub volume_m3: Option<f64>,
    /// Tank volume per m² of gross collector area, litres/m².
    pub volume_l_per_m2: Option<f64>,
    pub height_m: Option<f64>,
    #[serde(default = "default_nodes")]
    pub nodes: u32,
    /// Loss coefficient of the whole store to the plant room, W/K.
    pub ua_w_k: f64,
    /// Plant-room temperature where the store stands, °C.
    #[serde(default = "default_room")]
    pub t_room_c: f64,
    /// Store temperature at the start of the year, °C.
    #[serde(default = "default_t_init")]
    pub t_init_c: f64,
    /// Collection stops when the top of the store reaches this, °C (stagnation follows).
    #[serde(default = "default_t_max")]
    pub t_max_c: f64,
    /// Absolute pressure a water tank is held at, kPa (default 300: an unvented store up to
    /// 99 °C). Above 99 °C the tank must be pressurised: `t_max_c` at least 5 K below
    /// saturation at this pressure.
    #[serde(default = "default_tank_p")]
    pub pressure_kpa: f64,
    pub mass_kg: Option<f64>,
    pub cp_solid_j_kgk: Option<f64>,
    pub cp_liquid_j_kgk: Option<f64>,
    pub latent_j_kg: Option<f64>,
    pub t_melt_c: Option<f64>,
    #[serde(default)]
    pub melt_range_k: f64,
    pub ua_hx_w_k: Option<f64>,
}

fn default_nodes() -> u32 {
    10
}
fn default_tank_p() -> f64 {
    300.0
}
fn default_room() -> f64 {
    20.0
}
fn default_t_init() -> f64 {
    40.0
}
fn default_t_max() -> f64 {
    95.0
}

/// `[options.NAME.backup]`: the gas boiler that tops up what the sun does not give.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BackupSection {
    /// Boiler efficiency, heat delivered per fuel energy (fuel on its higher heating value).
    #[serde(default = "default_boiler_eff")]
    pub boiler_efficiency: f64,
}

impl Default for BackupSection {
    fn default() -> Self {
        BackupSection {
            boiler_efficiency: default_boiler_eff(),
        }
    }
}

fn default_boiler_eff() -> f64 {
    0.9
}
