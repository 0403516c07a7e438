//! `parhelion weather`: the monthly summary of the weather a scenario will use, so a user can
//! sanity-check inputs before trusting results.

use crate::error::{Error, Result};
use comfy_table::{Cell, CellAlignment, ContentArrangement, Table, presets::UTF8_FULL_CONDENSED};
use serde::Serialize;

/// Base temperature of the cooling degree-hours, °C (18 °C, a usual base; common practice).
pub const CDH_BASE_C: f64 = 18.0;

/// One month of weather.
#[derive(Debug, Clone, Default, Serialize)]
pub struct WeatherMonth {
    pub month: u32,
    pub ghi_kwh_m2: f64,
    pub dni_kwh_m2: f64,
    pub dhi_kwh_m2: f64,
    /// Irradiation on each option's collector plane, kWh/m², in option order.
    pub poa_kwh_m2: Vec<f64>,
    pub t_mean_c: f64,
    pub t_max_c: f64,
    pub w_mean_g_kg: f64,
    pub rh_mean_pct: f64,
    pub t_wb_mean_c: f64,
    pub cooling_degree_hours_kh: f64,
}

/// A year's weather summary.
#[derive(Debug, Clone, Serialize)]
pub struct WeatherSummary {
    pub origin: String,
    /// Names of the planes in `poa_kwh_m2` (option names).
    pub planes: Vec<String>,
    pub months: Vec<WeatherMonth>,
    pub year: WeatherMonth,
}

/// Render as a terminal table.
pub fn render(s: &WeatherSummary) -> String {
    let mut head: Vec<String> = [
        "month",
        "GHI kWh/m²",
        "DNI kWh/m²",
        "DHI kWh/m²",
        "T mean °C",
        "T max °C",
        "W g/kg",
        "RH %",
        "wet-bulb °C",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    head.push(format!("CDH{CDH_BASE_C:.0} K·h"));
    for p in &s.planes {
        head.push(format!("{p} plane kWh/m²"));
    }
    let mut t = Table::new();
    t.load_preset(UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Dynamic)
        .set_header(head.iter().map(Cell::new));
    let row = |label: String, m: &WeatherMonth| {
        let mut r = vec![
            label,
            format!("{:.1}", m.ghi_kwh_m2),
            format!("{:.1}", m.dni_kwh_m2),
            format!("{:.1}", m.dhi_kwh_m2),
            format!("{:.1}", m.t_mean_c),
            format!("{:.1}", m.t_max_c),
            format!("{:.2}", m.w_mean_g_kg),
            format!("{:.0}", m.rh_mean_pct),
            format!("{:.1}", m.t_wb_mean_c),
            format!("{:.0}", m.cooling_degree_hours_kh),
        ];
        r.extend(m.poa_kwh_m2.iter().map(|v| format!("{v:.1}")));
        r
    };
    const NAMES: [&str; 12] = [
        "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
    ];
    for m in &s.months {
        t.add_row(row(NAMES[m.month as usize - 1].to_string(), m));
    }
    t.add_row(row("year".into(), &s.year));
    for i in 1..t.column_count() {
        if let Some(c) = t.column_mut(i) {
            c.set_cell_alignment(CellAlignment::Right);
        }
    }
    format!("weather: {}\n{t}\n", s.origin)
}

/// Render as CSV (one row per month, then the year as month 0).
pub fn render_csv(s: &WeatherSummary) -> Result<Vec<u8>> {
    let mut buf = Vec::new();
    {
        let mut w = csv::Writer::from_writer(&mut buf);
        let err = |e: csv::Error| Error::Internal(format!("weather CSV: {e}"));
        let mut head: Vec<String> = [
            "month",
            "ghi_kwh_m2",
            "dni_kwh_m2",
            "dhi_kwh_m2",
            "t_mean_c",
            "t_max_c",
            "w_mean_g_kg",
            "rh_mean_pct",
            "t_wb_mean_c",
            "cooling_degree_hours_kh",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect();
        head.extend(s.planes.iter().map(|p| format!("poa_{p}_kwh_m2")));
        w.write_record(&head).map_err(err)?;
        for m in s.months.iter().chain(std::iter::once(&s.year)) {
            let mut r = vec![
                m.month.to_string(),
                format!("{:.3}", m.ghi_kwh_m2),
                format!("{:.3}", m.dni_kwh_m2),
                format!("{:.3}", m.dhi_kwh_m2),
                format!("{:.3}", m.t_mean_c),
                format!("{:.3}", m.t_max_c),
                format!("{:.4}", m.w_mean_g_kg),
                format!("{:.2}", m.rh_mean_pct),
                format!("{:.3}", m.t_wb_mean_c),
                format!("{:.1}", m.cooling_degree_hours_kh),
            ];
            r.extend(m.poa_kwh_m2.iter().map(|v| format!("{v:.3}")));
            w.write_record(&r).map_err(err)?;
        }
        w.flush()
            .map_err(|e| Error::Internal(format!("weather CSV: {e}")))?;
    }
    Ok(buf)
}
