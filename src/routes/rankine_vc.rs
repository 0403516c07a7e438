//! Route `rankine-vc`: a solar Rankine engine (organic working fluid or steam) driving the
//! compressor of a vapour-compression chiller; the `[baseline]` chiller plant carries what the
//! engine cannot.
//!
//! Shaft balance each hour: the engine's shaft `W_engine = η_th · heat` (at most its design
//! shaft power) drives the compressor through the coupling, so the engine-driven cooling is
//! `Q_sun = W_engine · η_mech · COP_vc`, at most the chiller's capacity and the load — the
//! cooling the heat made, and the only numerator of the thermal COP. The rest of the load is
//! electric cooling, charged as the `[baseline]` plant of [`super::conventional`] charges the
//! reference for the same cooling (like for like): a motor on the same shaft is a compressor
//! on grid electricity, and an auditor compares it with the chiller it replaces, so its
//! electricity, tower fan, pumps and water are those of the baseline plant. Engine shaft
//! beyond the compressor's need is curtailed (`surplus = "curtail"`) or drives a generator
//! (`surplus = "generate"`, electricity `η_gen` × surplus shaft, reported, not netted).
//!
//! Heat sink: [`RankineVc::t_sink_c`] — wet sink: the route's own cooling tower, its
//! variable-speed fan holding wet-bulb + `sink_approach_k` (at least `t_sink_min_c`) as the
//! baseline's tower holds its set-point (fan by the affinity law, make-up water, condenser-water
//! pump at the baseline's rate); dry sink: a dry cooler at dry-bulb + `sink_approach_k`, its
//! fans `dry_cooler_fan_w_per_kw` per kW rejected (default 20 W/kW, common practice for
//! screening). Both cycles condense against the sink.
//!
//! Cut-in (the plant's control, [`Route::cut_in_out_c`]): the engine starts when the store's
//! top reaches `t_cut_in_c` and stops when it falls below `t_cut_out_c` (defaults: the design
//! supply less 15 K and less 25 K, and never below the engine's lowest workable supply at the
//! design sink — an engine run far below its design supply turns 2–4 % of the heat into shaft
//! work, which is not worth the starts; common practice). While enabled the route asks at the
//! store's top temperature (at most the supply that reaches the engine's highest evaporating
//! temperature); the plant draws only at or above that temperature (no boiler behind an engine).
//! With `surplus = "generate"` the route asks for the engine's full heat (to export
//! electricity); else only for the heat that drives the compressor.
//!
//! Per hour: 2 Rankine flashes + 2 VC flashes per solve (Brent, ~10 iterations of one cubic
//! each), table look-ups otherwise. `heat_request` and `run` see the same hour's temperatures:
//! the engine and chiller solved for the first are kept (keyed by the exact supply and sink
//! temperatures) and serve the second, so each hour solves the two cycles once.

use super::conventional::Conventional;
use super::{
    Cooling, Electricity, HeatRequest, HeatSupplied, HourConditions, Memo, Reason, Route, RouteHour,
};
use crate::components::chiller_electric::ChillerSpec;
use crate::components::rankine::{EngineOp, RankineCycle, RankineEngine};
use crate::components::vapour_compression::{ChillerOp, VcChiller, VcCycle};
use crate::error::{Error, Result};
use crate::props::fluids::Fluid;
use crate::validate;

/// What to do with engine shaft power beyond the compressor's need.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Surplus {
    Curtail,
    Generate,
}

/// Heat sink of both condensers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Sink {
    /// Cooling-tower water: wet-bulb + approach.
    Wet,
    /// Dry cooler: dry-bulb + approach.
    Dry,
}

/// What the route cannot cool.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Shortfall {
    /// Hand it to the baseline electric chiller (its electricity counted).
    BackupChiller,
    /// Report it unmet.
    Unmet,
}

fn d_engine_fluid() -> String {
    "R245fa".into()
}
fn d_chiller_fluid() -> String {
    "R134a".into()
}
fn d_eta_pump() -> f64 {
    0.6
}
fn d_eta_expander() -> f64 {
    0.75
}
fn d_superheat() -> f64 {
    5.0
}
fn d_dt_water() -> f64 {
    8.0
}
fn d_pinch() -> f64 {
    5.0
}
fn d_approach_engine() -> f64 {
    10.0
}
fn d_eta_comp() -> f64 {
    0.75
}
fn d_subcool() -> f64 {
    3.0
}
fn d_approach_evap() -> f64 {
    3.0
}
fn d_approach_cond() -> f64 {
    8.0
}
fn d_eta_mech() -> f64 {
    0.95
}
fn d_dry_fan() -> f64 {
    20.0
}
fn d_eta_gen() -> f64 {
    0.9
}
fn d_surplus() -> Surplus {
    Surplus::Curtail
}
fn d_sink() -> Sink {
    Sink::Wet
}
fn d_sink_approach() -> f64 {
    5.0
}
fn d_t_supply_design() -> f64 {
    120.0
}
fn d_t_sink_design() -> f64 {
    29.44
}
fn d_t_sink_min() -> f64 {
    18.0
}
fn d_shortfall() -> Shortfall {
    Shortfall::BackupChiller
}

/// The route as written in a scenario (`[options.NAME.rankine-vc]`). Defaults are common
/// practice for small ORC / water-cooled chiller plants (demo values, not product data).
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RankineVcSpec {
    /// Engine working fluid (default R245fa).
    #[serde(default = "d_engine_fluid")]
    pub engine_fluid: String,
    /// Chiller refrigerant (default R134a).
    #[serde(default = "d_chiller_fluid")]
    pub chiller_fluid: String,
    /// Engine pump isentropic efficiency (default 0.6).
    #[serde(default = "d_eta_pump")]
    pub eta_pump: f64,
    /// Expander isentropic efficiency (default 0.75).
    #[serde(default = "d_eta_expander")]
    pub eta_expander: f64,
    /// Engine superheat, K (default 5).
    #[serde(default = "d_superheat")]
    pub engine_superheat_k: f64,
    /// Recuperator effectiveness, 0 for none (default 0).
    #[serde(default)]
    pub recuperator: f64,
    /// Hot-water drop across the evaporating section, K (default 8).
    #[serde(default = "d_dt_water")]
    pub dt_water_evap_k: f64,
    /// Evaporator pinch, K (default 5).
    #[serde(default = "d_pinch")]
    pub pinch_evap_k: f64,
    /// Engine condensing minus sink temperature, K (default 10).
    #[serde(default = "d_approach_engine")]
    pub engine_approach_cond_k: f64,
    /// Highest engine evaporating temperature, °C (default Tc − 15 K of the fluid).
    #[serde(default)]
    pub t_evap_max_c: Option<f64>,
    /// Compressor isentropic efficiency (default 0.75).
    #[serde(default = "d_eta_comp")]
    pub eta_compressor: f64,
    /// Chiller suction superheat, K (default 5).
    #[serde(default = "d_superheat")]
    pub chiller_superheat_k: f64,
    /// Chiller subcooling, K (default 3).
    #[serde(default = "d_subcool")]
    pub subcool_k: f64,
    /// Chilled water minus evaporating temperature, K (default 3).
    #[serde(default = "d_approach_evap")]
    pub approach_evap_k: f64,
    /// Chiller condensing minus sink temperature, K (default 8).
    #[serde(default = "d_approach_cond")]
    pub approach_cond_k: f64,
    /// Cooling capacity at design, kW (default: the baseline chiller's).
    #[serde(default)]
    pub capacity_kw: Option<f64>,
    /// Chilled-water supply, °C (default: the baseline chiller's).
    #[serde(default)]
    pub t_chw_supply_c: Option<f64>,
    /// Shaft/coupling efficiency between engine and compressor (default 0.95).
    #[serde(default = "d_eta_mech")]
    pub eta_mech: f64,
    /// Dry-cooler fan electricity per kW of heat rejected, W/kW (`sink = "dry"`; default 20).
    #[serde(default = "d_dry_fan")]
    pub dry_cooler_fan_w_per_kw: f64,
    /// `curtail` or `generate` (default curtail).
    #[serde(default = "d_surplus")]
    pub surplus: Surplus,
    /// Generator efficiency with `surplus = "generate"` (default 0.9).
    #[serde(default = "d_eta_gen")]
    pub eta_generator: f64,
    /// `wet` (cooling tower) or `dry` (dry cooler) (default wet).
    #[serde(default = "d_sink")]
    pub sink: Sink,
    /// Sink water above wet-bulb (wet) or dry-bulb (dry), K (default 5).
    #[serde(default = "d_sink_approach")]
    pub sink_approach_k: f64,
    /// Lowest sink temperature (tower/fan control), °C (default 18).
    #[serde(default = "d_t_sink_min")]
    pub t_sink_min_c: f64,
    /// Hot-water supply at design, °C (default 120).
    #[serde(default = "d_t_supply_design")]
    pub t_supply_design_c: f64,
    /// Sink temperature at design, °C (default 29.44 = 85 °F, AHRI water-cooled rating).
    #[serde(default = "d_t_sink_design")]
    pub t_sink_design_c: f64,
    /// Store top that starts the engine, °C (default: `t_cut_out_c` + 10 K).
    #[serde(default)]
    pub t_cut_in_c: Option<f64>,
    /// Store top below which the engine stops, °C (default: the design supply less 25 K, at
    /// least the engine's lowest workable supply at the design sink).
    #[serde(default)]
    pub t_cut_out_c: Option<f64>,
    /// `backup-chiller` or `unmet` (default backup-chiller).
    #[serde(default = "d_shortfall")]
    pub shortfall: Shortfall,
    /// Start-up cost and run/off limits (`[…rankine_vc.starts]`; default thermal mass
    /// [`THERMAL_MASS_KJ_K_PER_KW`]).
    #[serde(default)]
    pub starts: super::StartSpec,
}

/// Default thermal mass an engine warms at each start (evaporator, expander, hot-water
/// circuit), kJ/K per kW of the chiller's rated cooling (an assumption, common practice, from
/// memory; listed in reports).
pub const THERMAL_MASS_KJ_K_PER_KW: f64 = 5.0;

fn fluid(key: &str, name: &str) -> Result<Fluid> {
    Fluid::from_name(name).map_err(|e| match e {
        Error::Input { value, allowed, .. } => Error::Input {
            file: String::new(),
            key: key.into(),
            value,
            allowed,
        },
        o => o,
    })
}

/// The chiller's refrigerant: any fluid but water (a water-vapour compressor at chilled-water
/// temperatures needs volume flows no screening model of a packaged chiller covers).
fn chiller_fluid(name: &str) -> Result<Fluid> {
    let f = fluid("chiller_fluid", name)?;
    if f == Fluid::Water {
        let known: Vec<&str> = Fluid::PENG_ROBINSON.iter().map(|f| f.name()).collect();
        return Err(Error::input(
            "chiller_fluid",
            name,
            format!(
                "one of {} (water is an engine fluid only)",
                known.join(", ")
            ),
        ));
    }
    Ok(f)
}

fn eff(key: &str, v: f64, meaning: &str) -> Result<()> {
    if v.is_finite() && v > 0.0 && v <= 1.0 {
        Ok(())
    } else {
        Err(Error::input(
            key,
            v,
            format!("must be > 0 and at most 1 ({meaning})"),
        ))
    }
}

impl RankineVcSpec {
    /// Check every field (keys relative to the section): known fluids, efficiencies in (0, 1],
    /// temperatures and approaches in their ranges; the cycles themselves are checked at build.
    pub fn validate(&self) -> Result<()> {
        fluid("engine_fluid", &self.engine_fluid)?;
        chiller_fluid(&self.chiller_fluid)?;
        for (k, v, m) in [
            ("eta_pump", self.eta_pump, "pump isentropic efficiency"),
            (
                "eta_expander",
                self.eta_expander,
                "expander isentropic efficiency",
            ),
            (
                "eta_compressor",
                self.eta_compressor,
                "compressor isentropic efficiency",
            ),
            ("eta_mech", self.eta_mech, "shaft coupling efficiency"),
            ("eta_generator", self.eta_generator, "generator efficiency"),
        ] {
            eff(k, v, m)?;
        }
        validate::in_range(
            "dry_cooler_fan_w_per_kw",
            self.dry_cooler_fan_w_per_kw,
            0.0,
            100.0,
            "dry-cooler fan power per kW rejected, W/kW",
        )?;
        validate::in_range(
            "sink_approach_k",
            self.sink_approach_k,
            0.0,
            20.0,
            "sink above wet- or dry-bulb, K",
        )?;
        validate::in_range(
            "t_sink_min_c",
            self.t_sink_min_c,
            5.0,
            35.0,
            "lowest sink temperature, °C",
        )?;
        validate::in_range(
            "t_sink_design_c",
            self.t_sink_design_c,
            10.0,
            50.0,
            "sink temperature at design, °C",
        )?;
        validate::in_range(
            "t_supply_design_c",
            self.t_supply_design_c,
            50.0,
            250.0,
            "hot-water supply at design, °C",
        )?;
        if self.t_supply_design_c <= self.t_sink_design_c {
            return Err(Error::input(
                "t_supply_design_c",
                self.t_supply_design_c,
                format!(
                    "must be above t_sink_design_c = {} °C (source colder than sink)",
                    self.t_sink_design_c
                ),
            ));
        }
        if let Some(c) = self.capacity_kw {
            validate::positive("capacity_kw", c, 1e5, "design cooling capacity, kW")?;
        }
        self.starts.validate()?;
        if let Some(t) = self.t_chw_supply_c {
            validate::in_range("t_chw_supply_c", t, 0.0, 20.0, "chilled-water supply, °C")?;
        }
        Ok(())
    }
}

/// The built route.
#[derive(Debug)]
pub struct RankineVc {
    pub engine: RankineEngine,
    pub chiller: VcChiller,
    /// The backup chiller: the `[baseline]` plant (module docs).
    pub backup_chiller: Conventional,
    /// Condenser- and chilled-water pump rates of the `[baseline]` plant, W/kW.
    pub pump_cw_w_per_kw: f64,
    pub pump_chw_w_per_kw: f64,
    pub dry_cooler_fan_w_per_kw: f64,
    pub t_chw_c: f64,
    pub eta_mech: f64,
    pub eta_generator: f64,
    pub surplus: Surplus,
    pub sink: Sink,
    pub sink_approach_k: f64,
    pub t_sink_min_c: f64,
    pub t_supply_design_c: f64,
    /// Store cut-in and cut-out of the engine, °C (module docs).
    pub t_cut_in_c: f64,
    pub t_cut_out_c: f64,
    pub shortfall: Shortfall,
    /// Start-up cost and run/off limits.
    pub start: super::StartUp,
    /// Engine design shaft power, kW (drives the compressor at design capacity).
    pub engine_shaft_design_kw: f64,
    /// The wet cooling tower both cycles reject heat through (`sink = "wet"`), sized at the
    /// design heat rejected; it gives the hour's water use and fan electricity.
    pub tower: Option<crate::components::cooling_tower::Tower>,
    /// The last engine and chiller solves (module docs).
    memo: Memo<CycleMemo>,
}

/// The engine at the last (supply, sink) and the chiller at the last sink, by their bits.
#[derive(Debug, Default, Clone, Copy)]
struct CycleMemo {
    engine_key: Option<(u64, u64)>,
    engine: Option<EngineOp>,
    chiller_key: Option<u64>,
    chiller: Option<ChillerOp>,
}

/// Build the route: size the chiller at its design capacity (design sink, chilled water) and
/// the engine to drive its compressor there, `W_engine = Q / (COP · η_mech)`.
///
/// Errors: `Input` for bad keys (named relative to the section), or design temperatures that
/// leave the engine inoperable (supply below its minimum at the design sink).
pub fn build(spec: &RankineVcSpec, baseline: &ChillerSpec) -> Result<RankineVc> {
    spec.validate()?;
    let ef = fluid("engine_fluid", &spec.engine_fluid)?;
    let cf = chiller_fluid(&spec.chiller_fluid)?;
    // 15 K below the critical point (common practice, away from the steep near-critical
    // region), and within the property model's saturation range (water: 350 °C).
    let t_evap_max = spec
        .t_evap_max_c
        .unwrap_or((ef.t_crit_c() - 15.0).min(ef.t_sat_max_c() - 2.0));
    let engine = RankineEngine {
        cycle: RankineCycle {
            fluid: ef,
            eta_pump: spec.eta_pump,
            eta_expander: spec.eta_expander,
            superheat_k: spec.engine_superheat_k,
            recuperator: spec.recuperator,
        },
        dt_water_evap_k: spec.dt_water_evap_k,
        pinch_evap_k: spec.pinch_evap_k,
        approach_cond_k: spec.engine_approach_cond_k,
        t_evap_max_c: t_evap_max,
    };
    engine.validate()?;
    let t_chw = spec.t_chw_supply_c.unwrap_or(baseline.t_chw_supply_c);
    let cap = spec.capacity_kw.unwrap_or(baseline.capacity_kw);
    let chiller = VcChiller::size(
        VcCycle {
            fluid: cf,
            eta_compressor: spec.eta_compressor,
            superheat_k: spec.chiller_superheat_k,
            subcool_k: spec.subcool_k,
        },
        spec.approach_evap_k,
        spec.approach_cond_k,
        cap,
        t_chw,
        spec.t_sink_design_c,
    )?;
    let design = chiller.operate(t_chw, spec.t_sink_design_c)?;
    let t_min_engine = engine.t_supply_min_c(spec.t_sink_design_c);
    let t_max_engine = engine.t_supply_max_c();
    let t_cut_out = spec
        .t_cut_out_c
        .unwrap_or((spec.t_supply_design_c - 25.0).max(t_min_engine));
    if t_cut_out < t_min_engine || t_cut_out > t_max_engine {
        return Err(Error::input(
            "t_cut_out_c",
            t_cut_out,
            format!(
                "must be between {t_min_engine:.1} °C (the engine's minimum at the design sink) and {t_max_engine:.1} °C"
            ),
        ));
    }
    let t_cut_in = spec
        .t_cut_in_c
        .unwrap_or((t_cut_out + 10.0).min(t_max_engine));
    if t_cut_in < t_cut_out || t_cut_in > t_max_engine {
        return Err(Error::input(
            "t_cut_in_c",
            t_cut_in,
            format!("must be between t_cut_out_c = {t_cut_out:.1} °C and {t_max_engine:.1} °C"),
        ));
    }
    if spec.t_supply_design_c < t_min_engine {
        return Err(Error::input(
            "t_supply_design_c",
            spec.t_supply_design_c,
            format!(
                "must be at least {t_min_engine:.1} °C for the engine to run at the design sink"
            ),
        ));
    }
    let engine_design = engine.operate(spec.t_supply_design_c, spec.t_sink_design_c)?;
    // Design heat rejected: chiller condenser (cooling + compressor work) and engine
    // condenser (engine heat in − shaft work) at design.
    let shaft = cap / design.point.cop / spec.eta_mech;
    let eta_e = engine_design.point.eta_th.max(1e-3);
    let tower = match spec.sink {
        Sink::Wet => Some(
            crate::components::cooling_tower::TowerSpec::default()
                .size(cap + cap / design.point.cop + shaft * (1.0 / eta_e - 1.0))?,
        ),
        Sink::Dry => None,
    };
    Ok(RankineVc {
        memo: Memo::default(),
        tower,
        engine,
        chiller,
        backup_chiller: Conventional::new(baseline.clone())?,
        pump_cw_w_per_kw: baseline.pump_cw_w_per_kw,
        pump_chw_w_per_kw: baseline.pump_chw_w_per_kw,
        dry_cooler_fan_w_per_kw: spec.dry_cooler_fan_w_per_kw,
        t_chw_c: t_chw,
        eta_mech: spec.eta_mech,
        eta_generator: spec.eta_generator,
        surplus: spec.surplus,
        sink: spec.sink,
        sink_approach_k: spec.sink_approach_k,
        t_sink_min_c: spec.t_sink_min_c,
        t_supply_design_c: spec.t_supply_design_c,
        t_cut_in_c: t_cut_in,
        t_cut_out_c: t_cut_out,
        shortfall: spec.shortfall,
        start: spec.starts.build(cap, THERMAL_MASS_KJ_K_PER_KW),
        engine_shaft_design_kw: cap / design.point.cop / spec.eta_mech,
    })
}

/// Why the route did what it did.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RankineVcReason {
    Ok,
    NoLoad,
    /// Load above the chiller's capacity at this hour's temperatures.
    CapacityLimit,
    /// The engine cannot run at this supply and sink: backup chiller only.
    EngineOff,
    /// No store heat may be drawn (store below the cut-in band): backup chiller only.
    StoreBelowCutIn,
    /// Less heat arrived than was asked: the engine carried less, the backup the rest.
    HeatShort,
}

impl RankineVcReason {
    /// Stable code.
    pub fn as_str(&self) -> &'static str {
        match self {
            Self::Ok => "ok",
            Self::NoLoad => "no-load",
            Self::CapacityLimit => "capacity-limit",
            Self::EngineOff => "engine-off",
            Self::StoreBelowCutIn => "store-below-cut-in",
            Self::HeatShort => "heat-short",
        }
    }
}

/// One hour of the route with its extra outputs (energies in kWh over the hour).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RankineVcHour {
    pub t_sink_c: f64,
    pub t_supply_c: f64,
    pub t_return_c: f64,
    /// Engine thermal efficiency (0 when off).
    pub engine_efficiency: f64,
    /// Engine shaft work from the driving heat, kWh.
    pub shaft_from_heat_kwh: f64,
    pub chiller_cop: f64,
    /// Cooling the engine drove, kWh (shaft × η_mech × COP, at most load and capacity).
    pub cooling_sun_kwh: f64,
    /// Load left for the backup chiller (or unmet), kWh.
    pub rest_kwh: f64,
    /// Driving heat used by the engine, kWh.
    pub heat_used_kwh: f64,
    pub engine_heat_rejected_kwh: f64,
    /// Heat rejected by the engine-driven chiller's condenser, kWh.
    pub chiller_heat_rejected_kwh: f64,
    /// Exported electricity from surplus shaft, kWh (generate mode).
    pub surplus_electricity_kwh: f64,
    /// Heat the route wants for this hour, kWh.
    pub heat_wanted_kwh: f64,
    pub reason: RankineVcReason,
}

impl RankineVc {
    /// The engine at (`t_supply`, `t_sink`) and, if `chiller` is asked, the chiller at
    /// `t_sink` (`None` where a cycle cannot run), from the memo when the temperatures are
    /// those of the last solve.
    fn cycles(
        &self,
        t_supply: f64,
        t_sink: f64,
        chiller: bool,
    ) -> (Option<EngineOp>, Option<ChillerOp>) {
        let mut m = self.memo.get();
        let ek = (t_supply.to_bits(), t_sink.to_bits());
        if m.engine_key != Some(ek) {
            m.engine = self.engine.operate(t_supply, t_sink).ok();
            m.engine_key = Some(ek);
        }
        let c = if chiller {
            if m.chiller_key != Some(t_sink.to_bits()) {
                m.chiller = self.chiller.operate(self.t_chw_c, t_sink).ok();
                m.chiller_key = Some(t_sink.to_bits());
            }
            m.chiller
        } else {
            None
        };
        self.memo.set(m);
        (m.engine, c)
    }

    /// Condenser sink temperature this hour, °C: wet `t_wb + approach`, dry `t_db + approach`,
    /// at least `t_sink_min_c`. The one place to point at a shared cooling-tower model.
    pub fn t_sink_c(&self, c: &HourConditions) -> f64 {
        let t = match self.sink {
            Sink::Wet => c.t_wb_c + self.sink_approach_k,
            Sink::Dry => c.t_db_c + self.sink_approach_k,
        };
        if t.is_finite() {
            t.max(self.t_sink_min_c)
        } else {
            self.t_sink_min_c
        }
    }

    /// Supply the engine runs at: the store's top less the valve's control margin
    /// ([`super::SUPPLY_MARGIN_K`]), at most the supply that reaches its highest evaporating
    /// temperature; `None` when no store heat may be drawn.
    fn t_supply(&self, t_store_top_c: Option<f64>) -> Option<f64> {
        t_store_top_c
            .filter(|t| t.is_finite())
            .map(|t| (t - super::SUPPLY_MARGIN_K).min(self.engine.t_supply_max_c()))
    }

    /// Solve the hour. `heat` is `None` to compute only what the route wants (heat request);
    /// with `Some`, the engine runs on that heat. The backup chiller is not run here (`run`).
    ///
    /// Never panics; a cycle the models refuse (temperatures outside a fluid's range) turns
    /// the engine off and hands the load to the backup.
    pub fn solve_hour(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        heat: Option<HeatSupplied>,
    ) -> RankineVcHour {
        let t_sink = self.t_sink_c(c);
        let load = c.load.cooling_kw();
        let load = if load.is_finite() { load.max(0.0) } else { 0.0 };
        let t_supply = self.t_supply(t_store_top_c);
        let mut h = RankineVcHour {
            t_sink_c: t_sink,
            t_supply_c: t_supply.unwrap_or(0.0),
            t_return_c: t_supply.unwrap_or(0.0),
            engine_efficiency: 0.0,
            shaft_from_heat_kwh: 0.0,
            chiller_cop: 0.0,
            cooling_sun_kwh: 0.0,
            rest_kwh: load,
            heat_used_kwh: 0.0,
            engine_heat_rejected_kwh: 0.0,
            chiller_heat_rejected_kwh: 0.0,
            surplus_electricity_kwh: 0.0,
            heat_wanted_kwh: 0.0,
            reason: if load > 0.0 {
                RankineVcReason::StoreBelowCutIn
            } else {
                RankineVcReason::NoLoad
            },
        };
        let Some(t_supply) = t_supply else {
            return h;
        };
        // The engine runs only to cool (with `generate`, its surplus shaft is exported while
        // it cools; it is not started for export alone).
        if load <= 0.0 {
            return h;
        }
        let generate = self.surplus == Surplus::Generate;
        let (engine, chiller) = self.cycles(t_supply, t_sink, true);
        let (Some(e), Some(op)) = (engine, chiller) else {
            h.reason = RankineVcReason::EngineOff;
            return h;
        };
        let eta = e.point.eta_th;
        h.t_return_c = e.t_return_c;
        h.engine_efficiency = eta;
        h.chiller_cop = op.point.cop;
        // Shaft the compressor needs for the load it can take.
        let q_max = load.min(op.capacity_kw);
        let w_need = q_max / op.point.cop / self.eta_mech;
        let shaft_wanted = if generate {
            self.engine_shaft_design_kw
        } else {
            w_need.min(self.engine_shaft_design_kw)
        };
        h.heat_wanted_kwh = shaft_wanted / eta;
        let Some(given) = heat else {
            return h;
        };
        let q_heat = (given.solar_kwh + given.backup_kwh).max(0.0);
        let shaft = (q_heat * eta).min(self.engine_shaft_design_kw);
        let used_for_comp = shaft.min(w_need);
        let (shaft_run, heat_run) = match self.surplus {
            Surplus::Generate => (shaft, shaft / eta),
            Surplus::Curtail => (used_for_comp, used_for_comp / eta),
        };
        h.shaft_from_heat_kwh = shaft_run;
        h.heat_used_kwh = heat_run;
        h.engine_heat_rejected_kwh = heat_run - shaft_run;
        if self.surplus == Surplus::Generate {
            h.surplus_electricity_kwh = (shaft - used_for_comp) * self.eta_generator;
        }
        h.cooling_sun_kwh = (used_for_comp * self.eta_mech * op.point.cop).min(q_max);
        // Condenser heat = cooling + compressor work; coupling losses leave as heat too.
        h.chiller_heat_rejected_kwh = h.cooling_sun_kwh + used_for_comp;
        h.rest_kwh = (load - h.cooling_sun_kwh).max(0.0);
        h.reason = if h.cooling_sun_kwh <= 0.0 {
            RankineVcReason::HeatShort
        } else if h.rest_kwh <= 1e-9 {
            RankineVcReason::Ok
        } else if q_heat * eta < w_need.min(self.engine_shaft_design_kw) * (1.0 - 1e-9) {
            RankineVcReason::HeatShort
        } else {
            // Load above the chiller's capacity, or a compressor needing more shaft than the
            // engine's design: the backup carries the rest.
            RankineVcReason::CapacityLimit
        };
        h
    }
}

impl Route for RankineVc {
    fn kind(&self) -> &'static str {
        "rankine-vc"
    }

    fn cut_in_out_c(&self) -> Option<(f64, f64)> {
        Some((self.t_cut_in_c, self.t_cut_out_c))
    }

    fn start_up(&self) -> Option<super::StartUp> {
        Some(self.start)
    }

    fn heat_request(&self, c: &HourConditions, t_store_top_c: Option<f64>) -> Option<HeatRequest> {
        let h = self.solve_hour(c, t_store_top_c, None);
        (h.heat_wanted_kwh > 0.0).then_some(HeatRequest {
            heat_kwh: h.heat_wanted_kwh,
            t_supply_c: h.t_supply_c,
            t_return_c: h.t_return_c,
            boiler_backup: false,
        })
    }

    fn run(
        &self,
        c: &HourConditions,
        t_store_top_c: Option<f64>,
        heat: Option<HeatSupplied>,
    ) -> RouteHour {
        let h = self.solve_hour(c, t_store_top_c, Some(heat.unwrap_or_default()));
        if h.reason == RankineVcReason::NoLoad && h.heat_used_kwh <= 0.0 {
            return RouteHour::no_load();
        }
        let rejected = h.engine_heat_rejected_kwh + h.chiller_heat_rejected_kwh;
        let (fan_kwh, water_m3, cw_pump_kwh) = match (&self.tower, self.sink) {
            (Some(t), Sink::Wet) if rejected > 0.0 => {
                let tw = t.run_held(rejected, c.t_wb_c, c.p_kpa, h.t_sink_c).ok();
                (
                    tw.map_or(t.fan_kw, |r| r.fan_kwh),
                    tw.map_or(0.0, |r| r.water_m3),
                    self.pump_cw_w_per_kw * rejected / 1000.0,
                )
            }
            (_, Sink::Dry) => (self.dry_cooler_fan_w_per_kw * rejected / 1000.0, 0.0, 0.0),
            _ => (0.0, 0.0, 0.0),
        };
        let pumps = cw_pump_kwh + self.pump_chw_w_per_kw * h.cooling_sun_kwh / 1000.0;
        let mut out = RouteHour {
            cooling: Cooling {
                heat_driven_kwh: h.cooling_sun_kwh,
                ..Cooling::default()
            },
            electricity: Electricity {
                compressor_kwh: 0.0,
                heat_rejection_kwh: fan_kwh,
                pumps_kwh: pumps,
                air_handling_kwh: 0.0,
            },
            heat_rejected_kwh: rejected + fan_kwh + pumps,
            water_m3,
            t_drive_c: (h.heat_used_kwh > 0.0).then_some(h.t_supply_c),
            t_sink_c: Some(h.t_sink_c),
            t_chw_c: (h.cooling_sun_kwh > 0.0).then_some(self.t_chw_c),
            pv_export_kwh: 0.0,
            detail: [
                ("engine_efficiency", h.engine_efficiency),
                ("shaft_from_heat_kwh", h.shaft_from_heat_kwh),
                ("surplus_kwh", h.surplus_electricity_kwh),
                ("chiller_cop", h.chiller_cop),
            ],
            ..RouteHour::default()
        };
        if h.rest_kwh > 1e-9 {
            match self.shortfall {
                Shortfall::Unmet => out.unmet_kwh = h.rest_kwh,
                Shortfall::BackupChiller => {
                    let b = self.backup_chiller.serve(c, h.rest_kwh);
                    out.add_backup(&b);
                    out.unmet_kwh = b.unmet_kwh;
                }
            }
        }
        out.reason = match h.reason {
            RankineVcReason::NoLoad => Reason::NoLoad,
            _ if out.unmet_kwh > 1e-6 => Reason::CapacityLimit,
            RankineVcReason::CapacityLimit => Reason::CapacityLimit,
            RankineVcReason::Ok => Reason::Ok,
            RankineVcReason::EngineOff => Reason::EngineOff,
            RankineVcReason::StoreBelowCutIn => Reason::StoreBelowCutIn,
            RankineVcReason::HeatShort => Reason::HeatShort,
        };
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::chiller_electric::Condenser;
    use crate::load::LoadHour;

    fn spec() -> RankineVcSpec {
        toml::from_str("").unwrap()
    }

    fn base() -> ChillerSpec {
        ChillerSpec::typical(Condenser::WaterCooled, 100.0)
    }

    fn hour(load_kw: f64, t_wb: f64) -> HourConditions {
        HourConditions {
            hour: 4000,
            t_db_c: t_wb + 8.0,
            w_kg_kg: 0.015,
            t_wb_c: t_wb,
            p_kpa: 101.325,
            load: LoadHour {
                sensible_kw: load_kw,
                latent_kw: 0.0,
                ..LoadHour::default()
            },
        }
    }

    /// The memo only saves work: an hour asked of a route that has just solved other
    /// temperatures gives, bit for bit, what a freshly built route gives.
    #[test]
    fn memo_changes_no_result() {
        let used = build(&spec(), &base()).unwrap();
        let heat = Some(HeatSupplied {
            solar_kwh: 20.0,
            backup_kwh: 0.0,
        });
        for (load, t_wb, t_top) in [
            (60.0, 24.0, 130.0),
            (60.0, 24.0, 130.0),
            (60.0, 20.0, 130.0),
            (0.0, 20.0, 110.0),
            (40.0, 20.0, 110.0),
        ] {
            let c = hour(load, t_wb);
            let a = used.solve_hour(&c, Some(t_top), heat);
            let b = build(&spec(), &base())
                .unwrap()
                .solve_hour(&c, Some(t_top), heat);
            assert_eq!(format!("{a:?}"), format!("{b:?}"));
        }
    }

    /// Hot store, full sun: the engine alone drives the compressor; the heat asked is the
    /// compressor shaft over η_th; cooling / heat = η_th · η_mech · COP (shaft balance).
    #[test]
    fn hot_store_engine_carries_shaft() {
        let r = build(&spec(), &base()).unwrap();
        let c = hour(60.0, 24.0);
        let req = r.heat_request(&c, Some(130.0)).unwrap();
        // The engine runs at the store's top less the valve's control margin.
        assert!((req.t_supply_c - (130.0 - crate::routes::SUPPLY_MARGIN_K)).abs() < 1e-12);
        assert!(req.t_return_c < req.t_supply_c);
        let given = Some(HeatSupplied {
            solar_kwh: req.heat_kwh,
            backup_kwh: 0.0,
        });
        let h = r.solve_hour(&c, Some(130.0), given);
        assert_eq!(h.reason, RankineVcReason::Ok);
        assert!((h.cooling_sun_kwh - 60.0).abs() < 1e-9 && h.rest_kwh < 1e-9);
        let cop = h.cooling_sun_kwh / h.heat_used_kwh;
        let expect = h.engine_efficiency * r.eta_mech * h.chiller_cop;
        assert!((cop - expect).abs() < 1e-9);
        // Trade range of Rankine-driven vapour compression at 120–140 °C: 0.3–0.7 (common
        // practice).
        assert!(cop > 0.3 && cop < 0.7, "{cop}");
        let rh = r.run(&c, Some(130.0), given);
        assert!((rh.cooling.heat_driven_kwh - 60.0).abs() < 1e-9);
        assert_eq!(rh.cooling.electric_kwh, 0.0);
        // First law of the whole route: heat in + cooling = heat rejected (the coupling's
        // losses leave with the chiller's condenser heat).
        let balance =
            h.heat_used_kwh + h.cooling_sun_kwh + rh.electricity_kwh() - rh.heat_rejected_kwh;
        assert!(balance.abs() < 1e-9, "{balance}");
    }

    /// Half the heat: the engine drives half the cooling; the other half is the baseline
    /// plant's, charged exactly as the reference would be for 30 kW.
    #[test]
    fn backup_carries_the_rest() {
        let r = build(&spec(), &base()).unwrap();
        let c = hour(60.0, 24.0);
        let req = r.heat_request(&c, Some(130.0)).unwrap();
        let half = Some(HeatSupplied {
            solar_kwh: 0.5 * req.heat_kwh,
            backup_kwh: 0.0,
        });
        let h = r.solve_hour(&c, Some(130.0), half);
        assert_eq!(h.reason, RankineVcReason::HeatShort);
        assert!((h.cooling_sun_kwh - 30.0).abs() < 1e-9, "{h:?}");
        let rh = r.run(&c, Some(130.0), half);
        let b = r.backup_chiller.serve(&c, 30.0);
        assert!((rh.cooling.electric_kwh - 30.0).abs() < 1e-9);
        assert!((rh.electricity.compressor_kwh - b.compressor_kwh).abs() < 1e-12);
        let none = r.solve_hour(&c, Some(130.0), Some(HeatSupplied::default()));
        assert_eq!(none.reason, RankineVcReason::HeatShort);
        assert_eq!(none.cooling_sun_kwh, 0.0);
    }

    /// Below the cut-in band (no store temperature passed): the hour is the baseline plant's,
    /// to the last bit. Cut-in defaults: design supply − 25 K (at least the engine's minimum)
    /// and 10 K above that.
    #[test]
    fn store_below_cut_in_is_the_baseline() {
        let r = build(&spec(), &base()).unwrap();
        let c = hour(60.0, 24.0);
        assert!(r.heat_request(&c, None).is_none());
        let rh = r.run(&c, None, None);
        assert_eq!(rh.reason, Reason::StoreBelowCutIn);
        let b = RouteHour::from_conventional(
            &r.backup_chiller.serve(&c, 60.0),
            Reason::StoreBelowCutIn,
        );
        assert_eq!(
            (
                rh.cooling,
                rh.electricity,
                rh.water_m3,
                rh.heat_rejected_kwh,
                rh.unmet_kwh
            ),
            (
                b.cooling,
                b.electricity,
                b.water_m3,
                b.heat_rejected_kwh,
                b.unmet_kwh
            )
        );
        let t_min = r.engine.t_supply_min_c(29.44);
        assert!((r.t_cut_out_c - (120.0f64 - 25.0).max(t_min)).abs() < 1e-12);
        assert!((r.t_cut_in_c - (r.t_cut_out_c + 10.0)).abs() < 1e-12);
        // A store too cold for the engine at this sink: no operating point, no heat asked.
        assert!(r.heat_request(&c, Some(40.0)).is_none());
        assert_eq!(r.run(&c, Some(40.0), None).reason, Reason::EngineOff);
        assert!(r.heat_request(&hour(0.0, 24.0), Some(130.0)).is_none());
    }

    /// Surplus generation: the engine runs at its design shaft while it cools and exports the
    /// surplus through the generator.
    #[test]
    fn surplus_is_generated() {
        let mut s = spec();
        s.surplus = Surplus::Generate;
        let g = build(&s, &base()).unwrap();
        let c = hour(30.0, 24.0);
        let req = g.heat_request(&c, Some(130.0)).unwrap();
        let h = g.solve_hour(
            &c,
            Some(130.0),
            Some(HeatSupplied {
                solar_kwh: req.heat_kwh,
                backup_kwh: 0.0,
            }),
        );
        assert!(h.surplus_electricity_kwh > 0.0);
        assert!((h.shaft_from_heat_kwh - g.engine_shaft_design_kw).abs() < 1e-9);
        let used = h.cooling_sun_kwh / h.chiller_cop / g.eta_mech;
        let expect = (h.shaft_from_heat_kwh - used) * g.eta_generator;
        assert!((h.surplus_electricity_kwh - expect).abs() < 1e-9);
    }

    #[test]
    fn bad_spec_errors() {
        let mut s = spec();
        s.engine_fluid = "R999".into();
        let e = build(&s, &base()).unwrap_err().to_string();
        assert!(e.contains("engine_fluid") && e.contains("R245fa"), "{e}");
        assert!(e.contains("water"), "the list names water: {e}");
        let mut s = spec();
        s.chiller_fluid = "steam".into();
        let e = build(&s, &base()).unwrap_err().to_string();
        assert!(
            e.contains("chiller_fluid") && e.contains("engine fluid only"),
            "{e}"
        );
        let mut s = spec();
        s.eta_expander = 1.2;
        assert!(build(&s, &base()).is_err());
        let mut s = spec();
        s.eta_mech = 0.0;
        assert!(build(&s, &base()).is_err());
        let mut s = spec();
        s.t_cut_in_c = Some(90.0);
        s.t_cut_out_c = Some(100.0); // cut-out above cut-in
        let e = build(&s, &base()).unwrap_err().to_string();
        assert!(e.contains("t_cut_in_c"), "{e}");
        let mut s = spec();
        s.t_supply_design_c = 25.0; // colder than the design sink
        assert!(build(&s, &base()).is_err());
        assert!(toml::from_str::<RankineVcSpec>("colour = 1").is_err());
    }
}
