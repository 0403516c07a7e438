//! The scenario: one building at one site, and the named options (whole plants) to compare.
//!
//! `schema.rs` holds the TOML layout (units in key names, unknown keys rejected), `parse.rs`
//! turns text into it with precise errors, `check.rs` range-checks every value and the
//! cross-references between sections, and `build.rs` turns a checked scenario into the
//! hourly inputs and component models the plant loop runs.

pub mod build;
pub mod check;
pub mod edit;
pub mod parse;
pub mod schema;
pub mod starter;

pub use schema::Scenario;

use crate::error::{Error, Result};
use std::path::{Path, PathBuf};

/// A scenario read from disk and checked, with the folder its relative paths start from.
#[derive(Debug, Clone)]
pub struct Loaded {
    /// The scenario.
    pub scenario: Scenario,
    /// The scenario file as given (for messages and for refusing to overwrite it).
    pub path: PathBuf,
    /// Folder of the scenario file: weather and load file paths are relative to it.
    pub base_dir: PathBuf,
}

impl Loaded {
    /// The scenario file name as shown in messages.
    pub fn file(&self) -> String {
        self.path.display().to_string()
    }
}

/// Read, parse and check a scenario file.
pub fn load(path: &Path) -> Result<Loaded> {
    let text = std::fs::read_to_string(path).map_err(|source| Error::Read {
        path: path.to_path_buf(),
        source,
    })?;
    let file = path.display().to_string();
    let scenario: Scenario = parse::from_toml(&file, &text)?;
    check::check(&scenario, &file)?;
    let base_dir = path
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("."));
    Ok(Loaded {
        scenario,
        path: path.to_path_buf(),
        base_dir,
    })
}

/// Parse and check scenario text that is not on disk (tests, `init` self-check).
pub fn from_str(file: &str, text: &str) -> Result<Scenario> {
    let scenario: Scenario = parse::from_toml(file, text)?;
    check::check(&scenario, file)?;
    Ok(scenario)
}

/// The assumptions a report lists: the scenario's factors and prices, and the fixed choices of
/// the method that a reader should know.
pub fn assumptions(s: &Scenario) -> Vec<String> {
    let e = &s.energy;
    let mut v = vec![
        format!(
            "Primary energy factors: electricity {}, fuel {}; CO2 {} kg/kWh electricity, {} kg/kWh fuel (scenario values; defaults indicative).",
            e.pe_factor_electricity, e.pe_factor_fuel, e.co2_kg_per_kwh_electricity, e.co2_kg_per_kwh_fuel
        ),
        "Like for like: every backup chiller is the reference's chiller plant ([baseline]: chiller, tower with a variable-speed fan holding wet-bulb + design approach, condenser- and chilled-water pumps), run by the same code; heat-driven cooling splits between solar and backup heat by the driving heat each gave; solar share of cooling = cooling from solar heat or own PV / cooling load; thermal COP = heat-driven cooling / driving heat.".into(),
        "Plant: 8 sub-steps per hour; the collector field carries its heat capacity (ISO 9806 c5, or 7/12/5/10 kJ/(m²K) for flat-plate/evacuated-tube/concentrating/uncovered when not given, plus 2300 J/(m·K) of pipe by default: common practice, from memory); machines on store heat alone draw only at or above their supply (store top less 2 K) between cut-in and cut-out temperatures.".into(),
        format!(
            "Weather: {:?}; building load: {:?}; site latitude {}°, longitude {}°, elevation {} m.",
            s.weather.source, s.load.source, s.site.latitude_deg, s.site.longitude_deg, s.site.elevation_m
        ),
        format!(
            "Reference chiller: {} kW, rated COP {} ({:?}); kept as backup in every option's capital cost.",
            s.baseline.capacity_kw, s.baseline.cop_rated, s.baseline.condenser
        ),
        "Water-cooled plants reject heat through a counterflow tower (effectiveness–NTU); water = evaporation + blow-down.".into(),
    ];
    for (name, o) in &s.options {
        if let Some(d) = &o.desiccant {
            let (f1, f2) = crate::routes::desiccant::DEFAULT_EPS_F1_F2;
            let source = if (d.eps_f1, d.eps_f2) == (f1, f2) {
                "the defaults, at the ideal end of the range given for silica-gel wheels (from memory, common practice; no published pair measured on a real wheel was read): a real wheel dries less, so the unit's cooling is likely overstated"
            } else {
                "scenario values"
            };
            let credit = match d.cycle {
                crate::routes::desiccant::Cycle::Ventilation => {
                    "; ventilation cycle: credited only with the ventilation load of the building's outdoor air it replaces (min of the unit's and the building's flow), off in hours when the building does not ventilate"
                }
                crate::routes::desiccant::Cycle::Recirculation => "",
            };
            v.push(format!(
                "Option {name}: desiccant wheel F1/F2 effectivenesses {}/{} — {source}{credit}.",
                d.eps_f1, d.eps_f2
            ));
        }
        let starts = o
            .absorption
            .as_ref()
            .map(|a| {
                (
                    a.starts,
                    crate::routes::absorption::THERMAL_MASS_KJ_K_PER_KW,
                )
            })
            .or(o.rankine_vc.as_ref().map(|r| {
                (
                    r.starts,
                    crate::routes::rankine_vc::THERMAL_MASS_KJ_K_PER_KW,
                )
            }))
            .or(o
                .desiccant
                .as_ref()
                .map(|d| (d.starts, crate::routes::desiccant::THERMAL_MASS_KJ_K_PER_KW)));
        if let Some((st, default)) = starts {
            v.push(format!(
                "Option {name}: each start warms the machine's thermal mass, {} kJ/K per kW of rated cooling ({}), from the plant room to its drive temperature; minimum run {} h, minimum off {} h.",
                st.thermal_mass_kj_k_per_kw.unwrap_or(default),
                if st.thermal_mass_kj_k_per_kw.is_some() {
                    "scenario value"
                } else {
                    "default, an assumption"
                },
                st.min_run_h,
                st.min_off_h
            ));
        }
        if let Some(d) = o.absorption.as_ref().and_then(|a| a.datasheet.as_ref()) {
            v.push(format!(
                "Option {name}: the absorption machine is fitted to the performance table {d} (four heat-exchanger UA multipliers and the solution heat-exchanger effectiveness, least squares); `parhelion calibrate` prints the fit row by row."
            ));
        }
    }
    match &s.economics {
        Some(m) => {
            v.push(format!(
                "Money in {}: discount rate {} (real), lifetime {} years, electricity {} per kWh{}, fuel {} per kWh, water {} per m³, export {} per kWh, demand charge {} per kW-month.",
                m.currency,
                m.discount_rate,
                m.lifetime_years,
                m.electricity_price_per_kwh.map_or("(time-of-use table)".to_string(), |p| p.to_string()),
                if m.tou.is_some() { " (time of use)" } else { "" },
                m.fuel_price_per_kwh,
                m.water_price_per_m3,
                m.export_price_per_kwh,
                m.demand_charge_per_kw_month
            ));
            v.push("Cost functions are INDICATIVE defaults unless the scenario sets them; they are not quotes.".into());
        }
        None => v.push("No [economics] section: no money figures.".into()),
    }
    v
}
