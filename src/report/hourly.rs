//! The hourly CSV: long format, one row per hour and option, units in column names.

use crate::error::{Error, Result};
use crate::feasibility::Evaluation;
use crate::plant::HourRecord;
use crate::weather::calendar;

/// One column of the hourly CSV: its name (units in it), unit, meaning and how a record gives
/// its value. README's hourly-column table and the sidecar's `columns` are written from these.
pub struct Column {
    pub name: &'static str,
    /// Unit as a reader writes it (`-` for a pure number or a code).
    pub unit: &'static str,
    pub meaning: &'static str,
    pub get: fn(&HourRecord) -> String,
}

const fn col(
    name: &'static str,
    unit: &'static str,
    meaning: &'static str,
    get: fn(&HourRecord) -> String,
) -> Column {
    Column {
        name,
        unit,
        meaning,
        get,
    }
}

/// The hourly record's columns, in order, after option, route and the calendar ([`LEAD`]).
pub const RECORD_COLUMNS: &[Column] = &[
    col("t_amb_c", "°C", "outdoor dry-bulb", |r| num(r.t_amb_c)),
    col("t_wb_c", "°C", "outdoor wet-bulb", |r| num(r.t_wb_c)),
    col(
        "w_kg_kg",
        "kg/kg",
        "outdoor humidity ratio, per kg dry air",
        |r| num(r.w_kg_kg),
    ),
    col("ghi_w_m2", "W/m²", "global horizontal irradiance", |r| {
        num(r.ghi_w_m2)
    }),
    col("dni_w_m2", "W/m²", "direct normal irradiance", |r| {
        num(r.dni_w_m2)
    }),
    col("dhi_w_m2", "W/m²", "diffuse horizontal irradiance", |r| {
        num(r.dhi_w_m2)
    }),
    col(
        "poa_w_m2",
        "W/m²",
        "total irradiance on the option's collector plane (0 without a field)",
        |r| num(r.poa_w_m2),
    ),
    col(
        "poa_beam_w_m2",
        "W/m²",
        "of which beam (0 without a field)",
        |r| num(r.poa_beam_w_m2),
    ),
    col(
        "poa_diffuse_w_m2",
        "W/m²",
        "of which diffuse, sky and ground-reflected (0 without a field)",
        |r| num(r.poa_diffuse_w_m2),
    ),
    col(
        "load_kwh",
        "kWh",
        "building cooling load, sensible + latent",
        |r| num(r.load_kwh),
    ),
    col(
        "cooling_kwh",
        "kWh",
        "cooling delivered: the sum of the five cooling_* sources",
        |r| num(r.cooling_kwh),
    ),
    col(
        "cooling_solar_kwh",
        "kWh",
        "by the heat-driven machine from solar heat",
        |r| num(r.cooling_solar_kwh),
    ),
    col(
        "cooling_backup_heat_kwh",
        "kWh",
        "by the heat-driven machine from boiler heat",
        |r| num(r.cooling_backup_heat_kwh),
    ),
    col(
        "cooling_evaporative_kwh",
        "kWh",
        "by evaporative cooling alone (no driving heat, no compressor)",
        |r| num(r.cooling_evaporative_kwh),
    ),
    col(
        "cooling_electric_kwh",
        "kWh",
        "by an electric compressor on grid electricity",
        |r| num(r.cooling_electric_kwh),
    ),
    col(
        "cooling_pv_kwh",
        "kWh",
        "by an electric compressor on the option's own PV",
        |r| num(r.cooling_pv_kwh),
    ),
    col("unmet_kwh", "kWh", "load not met", |r| num(r.unmet_kwh)),
    col(
        "solar_heat_kwh",
        "kWh",
        "heat the collector loop delivered into the store",
        |r| num(r.solar_heat_kwh),
    ),
    col(
        "heat_to_route_kwh",
        "kWh",
        "driving heat given to the route (solar + boiler)",
        |r| num(r.heat_to_route_kwh),
    ),
    col(
        "route_solar_kwh",
        "kWh",
        "of which from the solar store",
        |r| num(r.route_solar_kwh),
    ),
    col(
        "backup_heat_kwh",
        "kWh",
        "boiler heat, for the route and the heat demand together",
        |r| num(r.backup_heat_kwh),
    ),
    col(
        "heat_demand_kwh",
        "kWh",
        "heat demand (hot water + space heating)",
        |r| num(r.heat_demand_kwh),
    ),
    col(
        "heat_demand_solar_kwh",
        "kWh",
        "of which from the solar store",
        |r| num(r.heat_demand_solar_kwh),
    ),
    col(
        "electricity_kwh",
        "kWh",
        "all electricity: the four elec_* uses + pump_kwh",
        |r| num(r.electricity_kwh),
    ),
    col(
        "elec_compressor_kwh",
        "kWh",
        "compressors of electric chillers",
        |r| num(r.elec_compressor_kwh),
    ),
    col(
        "elec_heat_rejection_kwh",
        "kWh",
        "cooling-tower and dry-cooler fans",
        |r| num(r.elec_heat_rejection_kwh),
    ),
    col(
        "elec_pumps_kwh",
        "kWh",
        "the route's pumps (chilled, condenser, hot water, solution)",
        |r| num(r.elec_pumps_kwh),
    ),
    col(
        "elec_air_handling_kwh",
        "kWh",
        "desiccant unit fans, wheel drives, evaporative-cooler pumps",
        |r| num(r.elec_air_handling_kwh),
    ),
    col(
        "pump_kwh",
        "kWh",
        "collector-loop pump",
        |r| num(r.pump_kwh),
    ),
    col("fuel_kwh", "kWh", "boiler fuel (HHV)", |r| num(r.fuel_kwh)),
    col(
        "heat_rejected_kwh",
        "kWh",
        "heat to ambient by condensers, absorbers, engine condensers and exhausts, including all the route's electricity",
        |r| num(r.heat_rejected_kwh),
    ),
    col(
        "store_loss_kwh",
        "kWh",
        "store heat loss to the plant room",
        |r| num(r.store_loss_kwh),
    ),
    col(
        "store_delta_kwh",
        "kWh",
        "change of the energy stored over the hour",
        |r| num(r.store_delta_kwh),
    ),
    col(
        "t_store_c",
        "°C",
        "store mean temperature at the end of the hour (empty: no store)",
        |r| opt(r.t_store_c),
    ),
    col(
        "t_store_top_c",
        "°C",
        "store top temperature at the end of the hour (empty: no store)",
        |r| opt(r.t_store_top_c),
    ),
    col(
        "cop_thermal",
        "-",
        "heat-driven cooling per unit driving heat (empty: no heat used)",
        |r| opt(r.cop_thermal),
    ),
    col(
        "cop_electric",
        "-",
        "cooling per unit electricity (empty: none used)",
        |r| opt(r.cop_electric),
    ),
    col(
        "balance_error_kwh",
        "kWh",
        "store energy balance: in − out − losses − Δstored",
        |r| num(r.balance_error_kwh),
    ),
    col(
        "plant_balance_kwh",
        "kWh",
        "plant first-law residual over the hour (zero but for round-off)",
        |r| num(r.plant_balance_kwh),
    ),
    col(
        "machine_starts",
        "0/1",
        "1: the heat-driven machine started this hour",
        |r| r.machine_starts.to_string(),
    ),
    col(
        "startup_heat_kwh",
        "kWh",
        "driving heat that warmed the machine's thermal mass at a start",
        |r| num(r.startup_heat_kwh),
    ),
    col(
        "stagnation",
        "0/1",
        "1: the field could have gained heat but the store was at its maximum",
        |r| u8::from(r.stagnation).to_string(),
    ),
    col(
        "reason",
        "code",
        "what held the option back this hour (reason codes below)",
        |r| r.reason.as_str().to_string(),
    ),
    col(
        "water_m3",
        "m³",
        "water used: cooling-tower make-up, evaporative coolers",
        |r| num(r.water_m3),
    ),
    col(
        "t_drive_c",
        "°C",
        "generator, regeneration or engine supply temperature the machine ran at",
        |r| opt(r.t_drive_c),
    ),
    col(
        "t_sink_c",
        "°C",
        "cooling water or air the machine rejected heat to",
        |r| opt(r.t_sink_c),
    ),
    col(
        "t_chw_c",
        "°C",
        "chilled water the heat-driven machine made",
        |r| opt(r.t_chw_c),
    ),
    col("pv_used_kwh", "kWh", "PV electricity used on site", |r| {
        num(r.pv_used_kwh)
    }),
    col("pv_export_kwh", "kWh", "PV electricity exported", |r| {
        num(r.pv_export_kwh)
    }),
    col(
        "grid_kwh",
        "kWh",
        "electricity from the grid: electricity_kwh − pv_used_kwh",
        |r| num(r.grid_kwh),
    ),
];

/// The leading columns (option, route, calendar): name, unit, meaning.
pub const LEAD: [(&str, &str, &str); 6] = [
    ("option", "-", "option name, as in the scenario"),
    ("route", "-", "the option's cooling route"),
    (
        "hour_of_year",
        "h",
        "hour i: the interval [i, i+1) h after 1 January 00:00 local standard time",
    ),
    ("month", "-", "1–12"),
    ("day", "-", "day of the month"),
    ("hour", "-", "hour of the day, 0–23 (start of the interval)"),
];

/// The last column: route figures.
pub const DETAIL: (&str, &str, &str) = (
    "detail",
    "-",
    "route figures as name=value;… (units in the names)",
);

/// Every column name, in order.
pub fn columns() -> Vec<&'static str> {
    column_table().into_iter().map(|(n, _, _)| n).collect()
}

/// Every column in order: name, unit, meaning.
pub fn column_table() -> Vec<(&'static str, &'static str, &'static str)> {
    let mut c = LEAD.to_vec();
    c.extend(RECORD_COLUMNS.iter().map(|c| (c.name, c.unit, c.meaning)));
    c.push(DETAIL);
    c
}

/// The sidecar written next to the hourly CSV (`FILE.meta.json`): version, scenario, the
/// screening caution and every column's name, unit and meaning, so the CSV itself is plain
/// (header first) and any data tool reads it with its defaults.
pub fn render_meta(ev: &Evaluation) -> Result<Vec<u8>> {
    let columns: Vec<serde_json::Value> = column_table()
        .into_iter()
        .map(|(name, unit, meaning)| {
            serde_json::json!({"name": name, "unit": unit, "meaning": meaning})
        })
        .collect();
    let v = serde_json::json!({
        "version": env!("CARGO_PKG_VERSION"),
        "scenario": ev.scenario,
        "caution": crate::SCREENING_CAUTION,
        "columns": columns,
    });
    let mut s = serde_json::to_string_pretty(&v)
        .map_err(|e| Error::Internal(format!("hourly sidecar JSON: {e}")))?;
    s.push('\n');
    Ok(s.into_bytes())
}

/// Where the sidecar of the hourly file `path` goes: `path` with `.meta.json` appended.
pub fn meta_path(path: &std::path::Path) -> std::path::PathBuf {
    let mut s = path.as_os_str().to_os_string();
    s.push(".meta.json");
    std::path::PathBuf::from(s)
}

fn num(x: f64) -> String {
    // Six significant decimals are more than any input justifies; trims file size.
    let s = format!("{x:.6}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" { "0".into() } else { s.to_string() }
}

fn opt(x: Option<f64>) -> String {
    x.map_or(String::new(), num)
}

/// Render the hourly CSV of every option: the header ([`columns`]) on the first line, then one
/// row per hour and option. Version, scenario and caution are in the sidecar ([`render_meta`]).
pub fn render(ev: &Evaluation) -> Result<Vec<u8>> {
    let mut buf = Vec::new();
    {
        let mut w = csv::Writer::from_writer(&mut buf);
        let err = |e: csv::Error| Error::Internal(format!("hourly CSV: {e}"));
        w.write_record(columns()).map_err(err)?;
        for o in &ev.options {
            for r in &o.hours {
                let (m, d, h, _) = calendar(r.hour);
                let mut row: Vec<String> = vec![
                    o.option.clone(),
                    o.route.to_string(),
                    r.hour.to_string(),
                    m.to_string(),
                    d.to_string(),
                    h.to_string(),
                ];
                for c in RECORD_COLUMNS {
                    let cell = (c.get)(r);
                    // No non-finite number leaves the program: a bug, named for the report.
                    if cell.contains("NaN") || cell.contains("inf") {
                        return Err(Error::Internal(format!(
                            "hourly CSV: {} = {cell} for option {} at hour {} (a bug: please report it with the scenario)",
                            c.name, o.option, r.hour
                        )));
                    }
                    row.push(cell);
                }
                row.push(
                    r.detail
                        .iter()
                        .filter(|(k, _)| !k.is_empty())
                        .map(|(k, v)| format!("{k}={}", num(*v)))
                        .collect::<Vec<_>>()
                        .join(";"),
                );
                w.write_record(&row).map_err(err)?;
            }
        }
        w.flush()
            .map_err(|e| Error::Internal(format!("hourly CSV: {e}")))?;
    }
    Ok(buf)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// README's hourly-column table is this module's column table, row for row.
    #[test]
    fn readme_table_is_the_column_table() {
        let readme = include_str!("../../README.md");
        let rows: Vec<&str> = readme
            .lines()
            .skip_while(|l| *l != "| column | unit | meaning |")
            .skip(2)
            .take_while(|l| l.starts_with("| `"))
            .collect();
        let want: Vec<String> = column_table()
            .into_iter()
            .map(|(n, u, m)| format!("| `{n}` | {u} | {m} |"))
            .collect();
        assert_eq!(rows, want);
        let names = columns();
        let mut unique = names.clone();
        unique.sort_unstable();
        unique.dedup();
        assert_eq!(unique.len(), names.len(), "column names are unique");
    }
}
