//! The spreadsheet (`rust_xlsxwriter`): sheets `annual` (options as rows), `monthly` (option,
//! month), `hourly` (long format, the columns of the hourly CSV), `assumptions` and `caution`.
//! Units are in the headers; numbers are numbers with number formats, not text.

use crate::error::{Error, Result};
use crate::feasibility::{Evaluation, Totals};
use rust_xlsxwriter::{Format, Workbook, Worksheet, XlsxError};

/// Sheet names, in order.
pub const SHEETS: [&str; 5] = ["annual", "monthly", "hourly", "assumptions", "caution"];

type Field = (&'static str, fn(&Totals) -> Option<f64>, &'static str);

/// Figures of the annual and monthly sheets: header with unit, value, number format.
/// Fractions are stored as fractions with a percent format.
const FIELDS: [Field; 34] = [
    ("load kWh", |t| Some(t.load_kwh), "#,##0"),
    ("cooling kWh", |t| Some(t.cooling_kwh), "#,##0"),
    (
        "electric cooling kWh",
        |t| Some(t.cooling_electric_kwh),
        "#,##0",
    ),
    ("unmet kWh", |t| Some(t.unmet_kwh), "#,##0"),
    ("unmet h", |t| Some(f64::from(t.unmet_hours)), "0"),
    ("electricity kWh", |t| Some(t.electricity_kwh), "#,##0"),
    ("grid electricity kWh", |t| Some(t.grid_kwh), "#,##0"),
    ("own PV used kWh", |t| Some(t.pv_used_kwh), "#,##0"),
    ("PV export kWh", |t| Some(t.pv_export_kwh), "#,##0"),
    ("thermal COP", |t| t.cop_thermal, "0.00"),
    ("SEP", |t| t.seasonal_electric_performance, "0.00"),
    ("water m³", |t| Some(t.water_m3), "#,##0.0"),
    ("solar heat kWh", |t| Some(t.solar_heat_kwh), "#,##0"),
    ("yield kWh/m²", |t| t.collector_yield_kwh_m2, "#,##0"),
    ("heat to route kWh", |t| Some(t.heat_to_route_kwh), "#,##0"),
    ("heat demand kWh", |t| Some(t.heat_demand_kwh), "#,##0"),
    ("backup heat kWh", |t| Some(t.backup_heat_kwh), "#,##0"),
    ("boiler fuel kWh", |t| Some(t.fuel_kwh), "#,##0"),
    ("route SF", |t| t.thermal_solar_fraction, "0.0%"),
    ("SF heat demand", |t| t.solar_fraction_heat_demand, "0.0%"),
    ("stagnation h", |t| Some(f64::from(t.stagnation_hours)), "0"),
    ("primary energy kWh", |t| t.primary_energy_kwh, "#,##0"),
    ("PE savings", |t| t.primary_energy_savings_fraction, "0.0%"),
    ("CO2 kg", |t| t.co2_kg, "#,##0"),
    ("CO2 savings", |t| t.co2_savings_fraction, "0.0%"),
    ("peak electric kW", |t| t.peak_electric_kw, "#,##0.0"),
    ("peak cut kW", |t| t.peak_reduction_kw, "#,##0.0"),
    (
        "water m³/MWh cooling",
        |t| t.water_m3_per_mwh_cooling,
        "0.00",
    ),
    ("capital", |t| t.capex, "#,##0"),
    ("energy bill /yr", |t| t.annual_energy_cost, "#,##0"),
    ("annualised cost /yr", |t| t.annualised_cost, "#,##0"),
    ("LCOC /MWh", |t| t.lcoc_per_mwh, "#,##0.0"),
    ("NPV vs reference", |t| t.npv_vs_reference, "#,##0"),
    ("IRR", |t| t.irr, "0.0%"),
];

fn xerr(e: XlsxError) -> Error {
    Error::Internal(format!("spreadsheet: {e}"))
}

/// Header text with the currency put in front of money units.
fn header(h: &str, currency: &str) -> String {
    match h {
        "capital" | "NPV vs reference" => format!("{h} {currency}"),
        "energy bill /yr" | "annualised cost /yr" | "LCOC /MWh" => {
            h.replacen(" /", &format!(" {currency}/"), 1)
        }
        _ => h.to_string(),
    }
}

fn write_figures(
    ws: &mut Worksheet,
    row: u32,
    col: u16,
    t: &Totals,
    fmts: &[Format],
) -> Result<()> {
    for (k, (_, get, _)) in FIELDS.iter().enumerate() {
        if let Some(v) = get(t).filter(|v| v.is_finite()) {
            ws.write_number_with_format(row, col + k as u16, v, &fmts[k])
                .map_err(xerr)?;
        }
    }
    Ok(())
}

/// The spreadsheet of an evaluation, as the bytes of an .xlsx file.
///
/// * `ev` – the evaluation; `assumptions` – lines for the `assumptions` sheet
///   (from [`crate::scenario::assumptions`])
///
/// Sheets [`SHEETS`]: `annual` one row per option, `monthly` one row per option and month,
/// `hourly` one row per hour and option with the columns of the hourly CSV
/// ([`super::hourly::COLUMNS`]; numbers as numbers, empty cells where undefined),
/// `assumptions`, and `caution` (the screening caution, version and scenario). Undefined
/// figures are empty cells. Errors: only an internal failure of the writer.
pub fn render(ev: &Evaluation, assumptions: &[String]) -> Result<Vec<u8>> {
    let mut wb = Workbook::new();
    let bold = Format::new().set_bold().set_text_wrap();
    let fmts: Vec<Format> = FIELDS
        .iter()
        .map(|(_, _, f)| Format::new().set_num_format(*f))
        .collect();

    // annual
    let ws = wb.add_worksheet();
    ws.set_name(SHEETS[0]).map_err(xerr)?;
    ws.write_string_with_format(0, 0, "option", &bold)
        .map_err(xerr)?;
    ws.write_string_with_format(0, 1, "route", &bold)
        .map_err(xerr)?;
    ws.write_string_with_format(0, 2, "collector m²", &bold)
        .map_err(xerr)?;
    ws.write_string_with_format(0, 3, "store m³", &bold)
        .map_err(xerr)?;
    for (k, (h, _, _)) in FIELDS.iter().enumerate() {
        ws.write_string_with_format(0, 4 + k as u16, header(h, &ev.currency), &bold)
            .map_err(xerr)?;
    }
    for (i, o) in ev.options.iter().enumerate() {
        let r = 1 + i as u32;
        ws.write_string(r, 0, &o.option).map_err(xerr)?;
        ws.write_string(r, 1, o.route).map_err(xerr)?;
        ws.write_number(r, 2, o.gross_m2).map_err(xerr)?;
        if let Some(v) = o.store_m3 {
            ws.write_number(r, 3, v).map_err(xerr)?;
        }
        write_figures(ws, r, 4, &o.annual, &fmts)?;
    }
    ws.set_column_width(0, 24).map_err(xerr)?;
    ws.set_freeze_panes(1, 1).map_err(xerr)?;

    // monthly
    let ws = wb.add_worksheet();
    ws.set_name(SHEETS[1]).map_err(xerr)?;
    ws.write_string_with_format(0, 0, "option", &bold)
        .map_err(xerr)?;
    ws.write_string_with_format(0, 1, "month", &bold)
        .map_err(xerr)?;
    for (k, (h, _, _)) in FIELDS.iter().enumerate() {
        ws.write_string_with_format(0, 2 + k as u16, header(h, &ev.currency), &bold)
            .map_err(xerr)?;
    }
    let mut r = 1u32;
    for o in &ev.options {
        for (m, t) in o.monthly.iter().enumerate() {
            ws.write_string(r, 0, &o.option).map_err(xerr)?;
            ws.write_number(r, 1, (m + 1) as f64).map_err(xerr)?;
            write_figures(ws, r, 2, t, &fmts)?;
            r += 1;
        }
    }
    ws.set_column_width(0, 24).map_err(xerr)?;
    ws.set_freeze_panes(1, 2).map_err(xerr)?;

    // hourly: the hourly CSV, cell by cell (numbers written as numbers).
    let csv_bytes = super::hourly::render(ev)?;
    let body: Vec<u8> = csv_bytes
        .split_inclusive(|b| *b == b'\n')
        .filter(|l| !l.starts_with(b"#"))
        .flatten()
        .copied()
        .collect();
    let ws = wb.add_worksheet();
    ws.set_name(SHEETS[2]).map_err(xerr)?;
    let mut rd = csv::ReaderBuilder::new()
        .has_headers(false)
        .from_reader(body.as_slice());
    for (r, rec) in rd.records().enumerate() {
        let rec = rec.map_err(|e| Error::Internal(format!("hourly CSV re-read: {e}")))?;
        for (c, cell) in rec.iter().enumerate() {
            if cell.is_empty() {
                continue;
            }
            let (r, c) = (r as u32, c as u16);
            match cell.parse::<f64>() {
                Ok(v) if r > 0 && v.is_finite() => ws.write_number(r, c, v),
                _ => ws.write_string(r, c, cell),
            }
            .map_err(xerr)?;
        }
    }

    // assumptions
    let ws = wb.add_worksheet();
    ws.set_name(SHEETS[3]).map_err(xerr)?;
    ws.write_string_with_format(0, 0, "assumption", &bold)
        .map_err(xerr)?;
    for (i, a) in assumptions.iter().enumerate() {
        ws.write_string(1 + i as u32, 0, a).map_err(xerr)?;
    }
    ws.set_column_width(0, 160).map_err(xerr)?;

    // caution
    let ws = wb.add_worksheet();
    ws.set_name(SHEETS[4]).map_err(xerr)?;
    ws.write_string_with_format(0, 0, crate::SCREENING_CAUTION, &bold)
        .map_err(xerr)?;
    ws.write_string(
        1,
        0,
        format!(
            "parhelion {} · scenario: {} · reference: {} · money in {}",
            env!("CARGO_PKG_VERSION"),
            ev.scenario,
            ev.reference,
            ev.currency
        ),
    )
    .map_err(xerr)?;
    ws.write_string(2, 0, format!("weather: {}", ev.weather_origin))
        .map_err(xerr)?;
    ws.write_string(3, 0, format!("load: {}", ev.load_origin))
        .map_err(xerr)?;
    ws.set_column_width(0, 160).map_err(xerr)?;

    wb.save_to_buffer().map_err(xerr)
}
