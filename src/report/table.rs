//! Terminal tables (comfy-table), options as rows, units in headers.

use crate::feasibility::{Evaluation, Totals};
use comfy_table::{
    Cell, CellAlignment, ContentArrangement, Table,
    presets::{ASCII_MARKDOWN, UTF8_FULL_CONDENSED},
};
use std::cell::Cell as StdCell;

thread_local! {
    /// Markdown tables instead of terminal ones (set for the duration of one render).
    static MARKDOWN: StdCell<bool> = const { StdCell::new(false) };
}

fn mwh(x: f64) -> String {
    format!("{:.1}", x / 1000.0)
}
fn ratio(x: Option<f64>, digits: usize) -> String {
    x.map_or("–".into(), |v| format!("{v:.digits$}"))
}
fn pct(x: Option<f64>) -> String {
    x.map_or("–".into(), |v| format!("{:.1}", 100.0 * v))
}

pub(crate) fn new_table(header: &[&str]) -> Table {
    let mut t = Table::new();
    let md = MARKDOWN.with(StdCell::get);
    t.load_preset(if md {
        ASCII_MARKDOWN
    } else {
        UTF8_FULL_CONDENSED
    })
    .set_content_arrangement(if md {
        ContentArrangement::Disabled
    } else {
        ContentArrangement::Dynamic
    })
    .set_header(header.iter().map(Cell::new));
    t
}

pub(crate) fn right(t: &mut Table, from: usize) {
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
        "electric cooling MWh",
        "unmet MWh",
        "unmet h",
        "electricity MWh",
        "own PV used MWh",
        "thermal COP",
        "SEP",
        "water m³",
    ]);
    for o in &ev.options {
        let a = &o.annual;
        cool.add_row(vec![
            o.option.clone(),
            o.route.to_string(),
            mwh(a.load_kwh),
            mwh(a.cooling_kwh),
            mwh(a.cooling_electric_kwh),
            mwh(a.unmet_kwh),
            a.unmet_hours.to_string(),
            mwh(a.electricity_kwh),
            mwh(a.pv_used_kwh),
            ratio(a.cop_thermal, 2),
            ratio(a.seasonal_electric_performance, 2),
            format!("{:.0}", a.water_m3),
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
        "route SF %",
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
            pct(a.thermal_solar_fraction),
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
    out.push_str(&reason_hours(ev));
    if let Some(r) = ev.options.iter().find(|o| o.option == ev.reference) {
        let mut diff = new_table(&[
            "option",
            "grid electricity saved MWh",
            "boiler fuel saved MWh",
            "primary energy MWh",
            "PE savings %",
            "CO2 t",
            "CO2 savings %",
            "peak kW",
            "peak cut kW",
            "water m³/MWh cooling",
        ]);
        for o in &ev.options {
            let a = &o.annual;
            diff.add_row(vec![
                o.option.clone(),
                mwh(r.annual.grid_kwh - a.grid_kwh),
                mwh(r.annual.fuel_kwh - a.fuel_kwh),
                a.primary_energy_kwh.map_or("–".into(), mwh),
                pct(a.primary_energy_savings_fraction),
                a.co2_kg
                    .map_or("–".into(), |v| format!("{:.1}", v / 1000.0)),
                pct(a.co2_savings_fraction),
                ratio(a.peak_electric_kw, 0),
                ratio(a.peak_reduction_kw, 0),
                ratio(a.water_m3_per_mwh_cooling, 2),
            ]);
        }
        right(&mut diff, 1);
        out.push_str(&format!(
            "\nEnergy, emissions and water against the reference `{}`\n{diff}\n",
            ev.reference
        ));
        if ev.options.iter().any(|o| o.annual.capex.is_some()) {
            let cur = &ev.currency;
            let h = [
                "option".to_string(),
                format!("capital {cur}"),
                format!("energy bill {cur}/yr"),
                format!("annualised {cur}/yr"),
                format!("LCOC {cur}/MWh"),
                format!("NPV vs ref {cur}"),
                "payback yr".into(),
                "disc. payback yr".into(),
                "IRR %".into(),
            ];
            let hr: Vec<&str> = h.iter().map(String::as_str).collect();
            let mut money = new_table(&hr);
            let k = |v: Option<f64>| v.map_or("–".into(), |v| format!("{v:.0}"));
            for o in &ev.options {
                let a = &o.annual;
                let is_ref = o.option == ev.reference;
                money.add_row(vec![
                    o.option.clone(),
                    k(a.capex),
                    k(a.annual_energy_cost),
                    k(a.annualised_cost),
                    k(a.lcoc_per_mwh),
                    if is_ref {
                        "–".into()
                    } else {
                        k(a.npv_vs_reference)
                    },
                    if is_ref {
                        "–".into()
                    } else {
                        a.simple_payback_years
                            .map_or("none".into(), |v| format!("{v:.1}"))
                    },
                    if is_ref {
                        "–".into()
                    } else {
                        a.discounted_payback_years
                            .map_or("none".into(), |v| format!("{v:.1}"))
                    },
                    if is_ref {
                        "–".into()
                    } else {
                        a.irr.map_or("none".into(), |v| format!("{:.1}", 100.0 * v))
                    },
                ]);
            }
            right(&mut money, 1);
            out.push_str(&format!(
                "\nMoney (indicative cost functions and prices from the scenario; see README)\n{money}\n"
            ));
        }
    }
    out.push_str(&ranking(ev));
    out.push_str(&format!("\n{}\n", crate::SCREENING_CAUTION));
    out
}

/// Hours of the year by reason code, one column per code that occurred in any option (the
/// guards that limited each route: capacity, supply too cold, crystallisation margin, …);
/// `no-load` hours are left out.
fn reason_hours(ev: &Evaluation) -> String {
    let mut codes: Vec<&'static str> = Vec::new();
    for o in &ev.options {
        for k in o.annual.reason_hours.keys() {
            if *k != "no-load" && !codes.contains(k) {
                codes.push(k);
            }
        }
    }
    // "ok" first, the rest in the order of the reason list's codes (alphabetical here).
    codes.sort_by_key(|c| (*c != "ok", *c));
    let mut header = vec!["option"];
    header.extend(codes.iter().copied());
    let mut t = new_table(&header);
    for o in &ev.options {
        let mut row = vec![o.option.clone()];
        row.extend(codes.iter().map(|c| {
            o.annual
                .reason_hours
                .get(c)
                .copied()
                .unwrap_or(0)
                .to_string()
        }));
        t.add_row(row);
    }
    right(&mut t, 1);
    format!("\nHours by reason code (hours with a cooling load; codes in README)\n{t}\n")
}

/// Which option wins on each criterion, with its figure and the difference from the
/// reference: the reason, in numbers. Options with unmet load above the reference's are not
/// ranked (they do less).
fn ranking(ev: &Evaluation) -> String {
    let Some(r) = ev.options.iter().find(|o| o.option == ev.reference) else {
        return String::new();
    };
    let eligible: Vec<_> = ev
        .options
        .iter()
        .filter(|o| o.annual.unmet_kwh <= r.annual.unmet_kwh + 1e-6 * r.annual.load_kwh.max(1.0))
        .collect();
    type Get = fn(&crate::feasibility::Totals) -> Option<f64>;
    let cur = ev.currency.clone();
    let criteria: [(&str, String, Get, f64); 4] = [
        (
            "cost",
            format!("annualised cost, {cur}/yr"),
            |a| a.annualised_cost,
            1.0,
        ),
        (
            "primary energy",
            "primary energy, MWh/yr".into(),
            |a| a.primary_energy_kwh,
            1e-3,
        ),
        ("emissions", "CO2, t/yr".into(), |a| a.co2_kg, 1e-3),
        ("water", "water, m³/yr".into(), |a| Some(a.water_m3), 1.0),
    ];
    let mut t = new_table(&[
        "criterion",
        "best option",
        "its figure",
        "reference figure",
        "difference",
    ]);
    let mut any = false;
    for (name, unit, get, scale) in criteria {
        let best = eligible
            .iter()
            .filter_map(|o| get(&o.annual).map(|v| (o, v)))
            .min_by(|a, b| a.1.total_cmp(&b.1));
        if let (Some((o, v)), Some(rv)) = (best, get(&r.annual)) {
            any = true;
            t.add_row(vec![
                format!("{name} ({unit})"),
                o.option.clone(),
                format!("{:.1}", v * scale),
                format!("{:.1}", rv * scale),
                if rv.abs() > 0.0 {
                    format!("{:+.1} %", 100.0 * (v - rv) / rv)
                } else {
                    format!("{:+.1}", (v - rv) * scale)
                },
            ]);
        }
    }
    if !any {
        return String::new();
    }
    right(&mut t, 2);
    format!(
        "\nRanking: the best option on each criterion, against the reference `{}`\n{t}\n",
        ev.reference
    )
}

/// The same tables as [`feasibility`] as Markdown for a report: a heading per table, the
/// assumptions the caller lists, and the caution.
pub fn markdown(ev: &Evaluation, assumptions: &[String]) -> String {
    MARKDOWN.with(|m| m.set(true));
    let body = feasibility(ev);
    MARKDOWN.with(|m| m.set(false));
    let mut out = String::new();
    let mut first = true;
    for line in body.lines() {
        let is_table = line.starts_with('|');
        if !is_table && !line.trim().is_empty() {
            if first {
                out.push_str(&format!("# {line}\n\n"));
                first = false;
            } else if line.starts_with("weather:") || line.starts_with("load:") {
                out.push_str(&format!("- {line}\n"));
            } else if line.starts_with("Screening estimate") {
                out.push_str(&format!("\n## Caution\n\n{line}\n"));
            } else {
                out.push_str(&format!("\n## {line}\n\n"));
            }
        } else if is_table {
            out.push_str(line);
            out.push('\n');
        }
    }
    if !assumptions.is_empty() {
        out.push_str("\n## Assumptions\n\n");
        for a in assumptions {
            out.push_str(&format!("- {a}\n"));
        }
    }
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
        "route SF %",
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
            pct(m.solar_share_of_cooling),
            m.stagnation_hours.to_string(),
        ]);
    }
    right(&mut t, 1);
    format!("Monthly: {option}\n{t}\n")
}
