//! The hourly CSV: long format, one row per hour and option, units in column names.

use crate::error::{Error, Result};
use crate::feasibility::Evaluation;
use crate::plant::HourRecord;
use crate::weather::calendar;

/// The record's columns after option, route and the calendar: name (units in it) and value.
/// README documents each.
type Column = (&'static str, fn(&HourRecord) -> String);

/// The hourly record's columns, in order.
pub const RECORD_COLUMNS: &[Column] = &[
    ("t_amb_c", |r| num(r.t_amb_c)),
    ("ghi_w_m2", |r| num(r.ghi_w_m2)),
    ("poa_w_m2", |r| num(r.poa_w_m2)),
    ("load_kwh", |r| num(r.load_kwh)),
    ("cooling_kwh", |r| num(r.cooling_kwh)),
    ("cooling_solar_kwh", |r| num(r.cooling_solar_kwh)),
    (
        "cooling_backup_heat_kwh",
        |r| num(r.cooling_backup_heat_kwh),
    ),
    (
        "cooling_evaporative_kwh",
        |r| num(r.cooling_evaporative_kwh),
    ),
    ("cooling_electric_kwh", |r| num(r.cooling_electric_kwh)),
    ("cooling_pv_kwh", |r| num(r.cooling_pv_kwh)),
    ("unmet_kwh", |r| num(r.unmet_kwh)),
    ("solar_heat_kwh", |r| num(r.solar_heat_kwh)),
    ("heat_to_route_kwh", |r| num(r.heat_to_route_kwh)),
    ("route_solar_kwh", |r| num(r.route_solar_kwh)),
    ("backup_heat_kwh", |r| num(r.backup_heat_kwh)),
    ("heat_demand_kwh", |r| num(r.heat_demand_kwh)),
    ("heat_demand_solar_kwh", |r| num(r.heat_demand_solar_kwh)),
    ("electricity_kwh", |r| num(r.electricity_kwh)),
    ("elec_compressor_kwh", |r| num(r.elec_compressor_kwh)),
    (
        "elec_heat_rejection_kwh",
        |r| num(r.elec_heat_rejection_kwh),
    ),
    ("elec_pumps_kwh", |r| num(r.elec_pumps_kwh)),
    ("elec_air_handling_kwh", |r| num(r.elec_air_handling_kwh)),
    ("pump_kwh", |r| num(r.pump_kwh)),
    ("fuel_kwh", |r| num(r.fuel_kwh)),
    ("heat_rejected_kwh", |r| num(r.heat_rejected_kwh)),
    ("store_loss_kwh", |r| num(r.store_loss_kwh)),
    ("store_delta_kwh", |r| num(r.store_delta_kwh)),
    ("t_store_c", |r| opt(r.t_store_c)),
    ("t_store_top_c", |r| opt(r.t_store_top_c)),
    ("cop_thermal", |r| opt(r.cop_thermal)),
    ("cop_electric", |r| opt(r.cop_electric)),
    ("balance_error_kwh", |r| num(r.balance_error_kwh)),
    ("plant_balance_kwh", |r| num(r.plant_balance_kwh)),
    ("stagnation", |r| u8::from(r.stagnation).to_string()),
    ("reason", |r| r.reason.as_str().to_string()),
    ("water_m3", |r| num(r.water_m3)),
    ("t_drive_c", |r| opt(r.t_drive_c)),
    ("t_sink_c", |r| opt(r.t_sink_c)),
    ("t_chw_c", |r| opt(r.t_chw_c)),
    ("pv_used_kwh", |r| num(r.pv_used_kwh)),
    ("pv_export_kwh", |r| num(r.pv_export_kwh)),
    ("grid_kwh", |r| num(r.grid_kwh)),
];

/// The leading columns (option, route, calendar) and the last (route detail).
const LEAD: [&str; 6] = ["option", "route", "hour_of_year", "month", "day", "hour"];

/// Every column name, in order.
pub fn columns() -> Vec<&'static str> {
    let mut c: Vec<&'static str> = LEAD.to_vec();
    c.extend(RECORD_COLUMNS.iter().map(|(n, _)| *n));
    c.push("detail");
    c
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

/// Render the hourly CSV of every option (a comment line first names scenario and version).
pub fn render(ev: &Evaluation) -> Result<Vec<u8>> {
    let mut buf = format!(
        "# parhelion {} hourly records; scenario: {}; {}\n",
        env!("CARGO_PKG_VERSION"),
        ev.scenario,
        crate::SCREENING_CAUTION
    )
    .into_bytes();
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
                row.extend(RECORD_COLUMNS.iter().map(|(_, get)| get(r)));
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
