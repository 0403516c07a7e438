//! Terminal tables (comfy-table), options as rows, units in headers.

use crate::feasibility::{Evaluation, Totals};
use comfy_table::{Cell, CellAlignment, ContentArrangement, Table, presets::UTF8_FULL_CONDENSED};

fn mwh(x: f64) -> String {
    format!("{:.1}", x / 1000.0)
}
fn ratio(x: Option<f64>, digits: usize) -> String {
    x.map_or("–".into(), |v| format!("{v:.digits$}"))
}
fn pct(x: Option<f64>) -> String {
    x.map_or("–".into(), |v| format!("{:.1}", 100.0 * v))
}

fn new_table(header: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_preset(UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Dynamic)
        .set_header(header.iter().map(Cell::new));
    t
}

fn right(t: &mut Table, from: usize) {
    let n = t.column_count();
    for i in from..n {
        if let Some(c) = t.column_mut(i) {
            c.set_cell_alignment(CellAlignment::Right);
        }
    }
}

/// The feasibility tables of an evaluation: cooling, then solar heat and backup, then the
/// difference of each option from the reference; the caution last.
pub fn feasibility(ev: &Evaluation) -> String {
    let mut cool = new_table(&[
        "option",
        "route",
        "load MWh",
        "cooling MWh",
        "unmet MWh",
        "unmet h",
        "electricity MWh",
        "thermal COP",
        "electric COP",
    ]);
    for o in &ev.options {
        let a = &o.annual;
        cool.add_row(vec![
            o.option.clone(),
            o.route.to_string(),
            mwh(a.load_kwh),
            mwh(a.cooling_kwh),
            mwh(a.unmet_kwh),
            a.unmet_hours.to_string(),
            mwh(a.electricity_kwh),
            ratio(a.cop_thermal, 2),
            ratio(a.cop_electric, 2),
        ]);
    }
    right(&mut cool, 2);
    let mut heat = new_table(&[
        "option",
        "collector m²",
        "store m³",
        "solar heat MWh",
        "yield kWh/m²",
        "heat to route MWh",
        "heat demand MWh",
        "backup heat MWh",
        "solar fraction %",
        "SF heat demand %",
        "stagnation h",
    ]);
    for o in &ev.options {
        let a = &o.annual;
        heat.add_row(vec![
            o.option.clone(),
            if o.gross_m2 > 0.0 {
                format!("{:.0}", o.gross_m2)
            } else {
                "–".into()
            },
            o.store_m3.map_or("–".into(), |v| format!("{v:.1}")),
            mwh(a.solar_heat_kwh),
            ratio(a.collector_yield_kwh_m2, 0),
            mwh(a.heat_to_route_kwh),
            mwh(a.heat_demand_kwh),
            mwh(a.backup_heat_kwh),
            pct(a.solar_fraction),
            pct(a.solar_fraction_heat_demand),
            a.stagnation_hours.to_string(),
        ]);
    }
    right(&mut heat, 1);
    let mut out = format!(
        "parhelion {} · scenario: {}\nweather: {}\nload: {}\n\nCooling over the year\n{cool}\n\nSolar heat and backup over the year\n{heat}\n",
        env!("CARGO_PKG_VERSION"),
        ev.scenario,
        ev.weather_origin,
        ev.load_origin
    );
    if let Some(r) = ev.options.iter().find(|o| o.option == ev.reference) {
        let mut diff = new_table(&[
            "option",
            "electricity saved MWh",
            "boiler fuel saved MWh",
            "unmet change MWh",
        ]);
        for o in &ev.options {
            diff.add_row(vec![
                o.option.clone(),
                mwh(r.annual.electricity_kwh - o.annual.electricity_kwh),
                mwh(r.annual.fuel_kwh - o.annual.fuel_kwh),
                mwh(o.annual.unmet_kwh - r.annual.unmet_kwh),
            ]);
        }
        right(&mut diff, 1);
        out.push_str(&format!(
            "\nAgainst the reference option `{}`\n{diff}\n",
            ev.reference
        ));
    }
    out.push_str(&format!("\n{}\n", crate::SCREENING_CAUTION));
    out
}

const MONTHS: [&str; 12] = [
    "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
];

/// Monthly table of one option.
pub fn monthly(option: &str, months: &[Totals]) -> String {
    let mut t = new_table(&[
        "month",
        "load MWh",
        "cooling MWh",
        "electricity MWh",
        "solar heat MWh",
        "heat demand MWh",
        "backup heat MWh",
        "solar fraction %",
        "stagnation h",
    ]);
    for (i, m) in months.iter().enumerate() {
        t.add_row(vec![
            MONTHS[i].to_string(),
            mwh(m.load_kwh),
            mwh(m.cooling_kwh),
            mwh(m.electricity_kwh),
            mwh(m.solar_heat_kwh),
            mwh(m.heat_demand_kwh),
            mwh(m.backup_heat_kwh),
            pct(m.solar_fraction),
            m.stagnation_hours.to_string(),
        ]);
    }
    right(&mut t, 1);
    format!("Monthly: {option}\n{t}\n")
}
