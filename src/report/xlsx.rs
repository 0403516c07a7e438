//! The spreadsheet (`rust_xlsxwriter`): sheets `annual` (options as rows), `monthly` (option,
//! month), `hourly` (long format, the columns of the hourly CSV), `assumptions` and `caution`.
//! The annual and monthly figures are the registry's ([`FIGURES`]): its headers, shown units
//! (MWh, %, …) and decimals; numbers are numbers with number formats, not text.

use crate::error::{Error, Result};
use crate::feasibility::figures::FIGURES;
use crate::feasibility::{Evaluation, Totals};
use rust_xlsxwriter::{Format, Workbook, Worksheet, XlsxError};

/// Sheet names, in order.
pub const SHEETS: [&str; 5] = ["annual", "monthly", "hourly", "assumptions", "caution"];

fn xerr(e: XlsxError) -> Error {
    Error::Internal(format!("spreadsheet: {e}"))
}

fn write_figures(
    ws: &mut Worksheet,
    row: u32,
    col: u16,
    t: &Totals,
    fmts: &[Format],
) -> Result<()> {
    for (k, f) in FIGURES.iter().enumerate() {
        if let Some(v) = f.shown_value(t) {
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
/// ([`super::hourly::columns`]; numbers as numbers, empty cells where undefined),
/// `assumptions`, and `caution` (the screening caution, version and scenario). Undefined
/// figures are empty cells. Errors: only an internal failure of the writer.
pub fn render(ev: &Evaluation, assumptions: &[String]) -> Result<Vec<u8>> {
    let mut wb = Workbook::new();
    let bold = Format::new().set_bold().set_text_wrap();
    let fmts: Vec<Format> = FIGURES
        .iter()
        .map(|f| Format::new().set_num_format(f.unit.xlsx_format()))
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
    for (k, f) in FIGURES.iter().enumerate() {
        ws.write_string_with_format(0, 4 + k as u16, f.header(&ev.currency), &bold)
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
    for (k, f) in FIGURES.iter().enumerate() {
        ws.write_string_with_format(0, 2 + k as u16, f.header(&ev.currency), &bold)
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
    let body = super::hourly::render(ev)?;
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
