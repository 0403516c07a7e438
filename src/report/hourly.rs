//! The hourly CSV: long format, one row per hour and option, units in column names.

use crate::error::{Error, Result};
use crate::feasibility::Evaluation;
use crate::weather::calendar;

/// Column names, in order. README documents each.
pub const COLUMNS: [&str; 37] = [
    "option",
    "route",
    "hour_of_year",
    "month",
    "day",
    "hour",
    "t_amb_c",
    "ghi_w_m2",
    "poa_w_m2",
    "load_kwh",
    "cooling_kwh",
    "unmet_kwh",
    "solar_heat_kwh",
    "heat_to_route_kwh",
    "route_solar_kwh",
    "backup_heat_kwh",
    "heat_demand_kwh",
    "heat_demand_solar_kwh",
    "electricity_kwh",
    "pump_kwh",
    "fuel_kwh",
    "heat_rejected_kwh",
    "store_loss_kwh",
    "t_store_c",
    "t_store_top_c",
    "cop_thermal",
    "cop_electric",
    "balance_error_kwh",
    "stagnation",
    "reason",
    "water_m3",
    "t_drive_c",
    "t_sink_c",
    "pv_used_kwh",
    "pv_export_kwh",
    "grid_kwh",
    "detail",
];

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
        w.write_record(COLUMNS).map_err(err)?;
        for o in &ev.options {
            for r in &o.hours {
                let (m, d, h, _) = calendar(r.hour);
                w.write_record([
                    o.option.clone(),
                    o.route.to_string(),
                    r.hour.to_string(),
                    m.to_string(),
                    d.to_string(),
                    h.to_string(),
                    num(r.t_amb_c),
                    num(r.ghi_w_m2),
                    num(r.poa_w_m2),
                    num(r.load_kwh),
                    num(r.cooling_kwh),
                    num(r.unmet_kwh),
                    num(r.solar_heat_kwh),
                    num(r.heat_to_route_kwh),
                    num(r.route_solar_kwh),
                    num(r.backup_heat_kwh),
                    num(r.heat_demand_kwh),
                    num(r.heat_demand_solar_kwh),
                    num(r.electricity_kwh),
                    num(r.pump_kwh),
                    num(r.fuel_kwh),
                    num(r.heat_rejected_kwh),
                    num(r.store_loss_kwh),
                    opt(r.t_store_c),
                    opt(r.t_store_top_c),
                    opt(r.cop_thermal),
                    opt(r.cop_electric),
                    format!("{:.3e}", r.balance_error_kwh),
                    u8::from(r.stagnation).to_string(),
                    r.reason.as_str().to_string(),
                    num(r.water_m3),
                    opt(r.t_drive_c),
                    opt(r.t_sink_c),
                    num(r.pv_used_kwh),
                    num(r.pv_export_kwh),
                    num(r.grid_kwh),
                    r.detail
                        .iter()
                        .filter(|(k, _)| !k.is_empty())
                        .map(|(k, v)| format!("{k}={}", num(*v)))
                        .collect::<Vec<_>>()
                        .join(";"),
                ])
                .map_err(err)?;
            }
        }
        w.flush()
            .map_err(|e| Error::Internal(format!("hourly CSV: {e}")))?;
    }
    Ok(buf)
}
