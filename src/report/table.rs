//! Terminal tables (comfy-table), options as rows, units in headers.

use crate::feasibility::{Evaluation, OptionResult, Totals, figures};
use comfy_table::{
    Cell, CellAlignment, ContentArrangement, Table,
    presets::{ASCII_MARKDOWN, UTF8_FULL_CONDENSED},
};
use std::cell::Cell as StdCell;

thread_local! {
    /// Markdown tables instead of terminal ones (set for the duration of one render).
    static MARKDOWN: StdCell<bool> = const { StdCell::new(false) };
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

/// A column that is not a figure: header and the option's value.
type Extra = (&'static str, fn(&OptionResult) -> String);

/// One table of figures from the registry, options as rows; `extra` columns (header,
/// value of an option) come after the option's name.
fn figure_table(ev: &Evaluation, title: &str, keys: &[&str], extra: &[Extra]) -> String {
    let figs = figures::of(keys);
    let mut header = vec!["option".to_string()];
    header.extend(extra.iter().map(|(h, _)| h.to_string()));
    header.extend(figs.iter().map(|f| f.header(&ev.currency)));
    let hr: Vec<&str> = header.iter().map(String::as_str).collect();
    let mut t = new_table(&hr);
    for o in &ev.options {
        let is_ref = o.option == ev.reference;
        let mut row = vec![o.option.clone()];
        row.extend(extra.iter().map(|(_, get)| get(o)));
        row.extend(figs.iter().map(|f| {
            let v = (f.get)(&o.annual);
            // Figures against the reference are blank on the reference's own row.
            if is_ref && against_reference(f.key) {
                "–".to_string()
            } else {
                f.format(v)
            }
        }));
        t.add_row(row);
    }
    // Text columns (the option, the route) stay left; numbers go right.
    let text = 1 + usize::from(extra.first().is_some_and(|(h, _)| *h == "route"));
    right(&mut t, text);
    format!("\n{title}\n{t}\n")
}

/// Figures that compare an option with the reference.
fn against_reference(key: &str) -> bool {
    key.ends_with("_saved_kwh")
        || key.ends_with("_saved_m3")
        || key.ends_with("savings_fraction")
        || matches!(
            key,
            "peak_reduction_kw"
                | "npv_vs_reference"
                | "simple_payback_years"
                | "discounted_payback_years"
                | "irr"
        )
}

/// The tables of figures, in order: title and the registry keys (terminal, Markdown, HTML).
pub const TABLES: [(&str, &[&str]); 6] = [
    (
        "Key figures (against the reference where saved)",
        &[
            "solar_share_of_cooling",
            "primary_energy_savings_fraction",
            "grid_saved_kwh",
            "fuel_saved_kwh",
            "water_saved_m3",
            "cop_thermal",
            "thermal_solar_fraction",
            "seasonal_electric_performance",
        ],
    ),
    (
        "Cooling by source over the year",
        &[
            "load_kwh",
            "peak_load_kw",
            "cooling_kwh",
            "cooling_solar_kwh",
            "cooling_backup_heat_kwh",
            "cooling_evaporative_kwh",
            "cooling_electric_kwh",
            "cooling_pv_kwh",
            "unmet_kwh",
            "unmet_hours",
        ],
    ),
    (
        "Electricity by use and water over the year",
        &[
            "electricity_kwh",
            "elec_compressor_kwh",
            "elec_heat_rejection_kwh",
            "elec_pumps_kwh",
            "elec_air_handling_kwh",
            "pump_kwh",
            "grid_kwh",
            "water_m3",
        ],
    ),
    (
        "Solar heat and backup over the year",
        &[
            "solar_heat_kwh",
            "collector_yield_kwh_m2",
            "heat_to_route_kwh",
            "thermal_solar_fraction",
            "heat_demand_kwh",
            "solar_fraction_heat_demand",
            "backup_heat_kwh",
            "stagnation_hours",
            "machine_starts",
            "startup_heat_kwh",
        ],
    ),
    (
        "Primary energy, emissions and peak",
        &[
            "primary_energy_kwh",
            "primary_energy_ratio",
            "primary_energy_savings_fraction",
            "co2_kg",
            "co2_savings_fraction",
            "peak_electric_kw",
            "peak_reduction_kw",
            "water_m3_per_mwh_cooling",
        ],
    ),
    (
        "Money (indicative cost functions and prices from the scenario; see README)",
        &[
            "capex",
            "annual_energy_cost",
            "annualised_cost",
            "lcoc_per_mwh",
            "npv_vs_reference",
            "simple_payback_years",
            "discounted_payback_years",
            "irr",
        ],
    ),
];

/// The feasibility tables of an evaluation: the key figures first (solar share of cooling
/// and primary-energy saving lead), then cooling by source, electricity by use and water,
/// solar heat and backup, hours by reason code, primary energy and emissions, money, the
/// ranking; the caution last. Every figure comes from the registry ([`figures::FIGURES`]).
pub fn feasibility(ev: &Evaluation) -> String {
    let mut out = format!(
        "parhelion {} · scenario: {} · reference: {}\nweather: {}\nload: {}\n",
        env!("CARGO_PKG_VERSION"),
        ev.scenario,
        ev.reference,
        ev.weather_origin,
        ev.load_origin
    );
    let route: Extra = ("route", |o| o.route.to_string());
    let sizes: [Extra; 2] = [
        ("collector m²", |o| {
            if o.gross_m2 > 0.0 {
                format!("{:.0}", o.gross_m2)
            } else {
                "–".into()
            }
        }),
        ("store m³", |o| {
            o.store_m3.map_or("–".into(), |v| format!("{v:.1}"))
        }),
    ];
    let has_money = ev.options.iter().any(|o| o.annual.capex.is_some());
    for (k, (title, keys)) in TABLES.iter().enumerate() {
        let extra: &[Extra] = match k {
            0 => std::slice::from_ref(&route),
            3 => &sizes,
            _ => &[],
        };
        if k == 5 && !has_money {
            continue;
        }
        out.push_str(&figure_table(ev, title, keys, extra));
        if k == 3 {
            out.push_str(&reason_hours(ev));
        }
    }
    out.push_str(
        &crate::feasibility::warnings(ev)
            .iter()
            .fold(String::new(), |mut s, w| {
                s.push_str(&format!("\nWarning: {w}\n"));
                s
            }),
    );
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

/// Figures of the monthly table (registry keys).
pub const MONTHLY: [&str; 9] = [
    "load_kwh",
    "cooling_kwh",
    "cooling_solar_kwh",
    "cooling_electric_kwh",
    "electricity_kwh",
    "solar_heat_kwh",
    "backup_heat_kwh",
    "solar_share_of_cooling",
    "stagnation_hours",
];

/// Monthly table of one option.
pub fn monthly(option: &str, months: &[Totals]) -> String {
    let figs = figures::of(&MONTHLY);
    let mut header = vec!["month".to_string()];
    header.extend(figs.iter().map(|f| f.header("")));
    let hr: Vec<&str> = header.iter().map(String::as_str).collect();
    let mut t = new_table(&hr);
    for (i, m) in months.iter().enumerate() {
        let mut row = vec![MONTHS[i].to_string()];
        row.extend(figs.iter().map(|f| f.show(m)));
        t.add_row(row);
    }
    right(&mut t, 1);
    format!("Monthly: {option}\n{t}\n")
}
