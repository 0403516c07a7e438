//! The HTML report: one self-contained file (inline CSS and SVG, no network), with the
//! feasibility tables, five charts, the assumptions, the method and its sources, the reference
//! check summary and the screening caution. The charts are SVG written by hand as strings (no
//! plotting crate, so no font files are needed to render text: labels are SVG `<text>` set in
//! the reader's sans-serif font).

use crate::checks::Check;
use crate::error::Result;
use crate::feasibility::economics;
use crate::feasibility::metrics::sizes_of;
use crate::feasibility::{Evaluation, OptionResult};
use crate::scenario::Scenario;
use std::collections::BTreeMap;
use std::fmt::Write as _;

/// Section ids of the report, in order (tests look for each).
pub const SECTIONS: [&str; 8] = [
    "caution-top",
    "tables",
    "charts",
    "assumptions",
    "method",
    "checks",
    "caution-end",
    "origin",
];

/// Chart ids, in order.
pub const CHARTS: [&str; 5] = [
    "chart-monthly-cooling",
    "chart-monthly-solar-share",
    "chart-heat-map",
    "chart-annual-cost-energy",
    "chart-cash-flow",
];

/// Colour-blind-safe palette (Okabe & Ito 2008, "Color Universal Design"; common practice).
const PALETTE: [&str; 8] = [
    "#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00", "#F0E442", "#000000",
];
const MONTHS: [&str; 12] = ["J", "F", "M", "A", "M", "J", "J", "A", "S", "O", "N", "D"];
/// Chart width in SVG user units (the CSS scales it to the page).
const W: f64 = 1000.0;

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// Inline Markdown of README and table headings: `code` and *emphasis*, the rest escaped.
fn inline_md(s: &str) -> String {
    let mut out = String::new();
    for (i, part) in s.split('`').enumerate() {
        if i % 2 == 1 {
            out.push_str(&format!("<code>{}</code>", esc(part)));
        } else {
            for (j, p) in esc(part).split('*').enumerate() {
                if j % 2 == 1 {
                    out.push_str(&format!("<em>{p}</em>"));
                } else {
                    out.push_str(p);
                }
            }
        }
    }
    out
}

/// One option's cumulative discounted saving, years 0..=lifetime, money.
pub type SavingsLine = (String, Vec<f64>);

/// Cumulative discounted saving of each option against the reference over the lifetime.
///
/// For each option other than the reference: `S_k = Σ_{t=0..k} (C_ref,t − C_opt,t) / (1+r)^t`,
/// money, for `k = 0..=lifetime`, where `C_t` are the yearly costs of
/// [`economics::life_cycle`] (year 0 capital; later years O&M, energy with escalation, water,
/// replacements), rebuilt exactly as the annual figures were (same sizes, bill and spec). The
/// last value equals the option's `npv_vs_reference`.
///
/// * `s` – the scenario the evaluation came from; `ev` – its evaluation
///
/// Returns `None` without `[economics]` or without the reference among the options; otherwise
/// `(option name, S_0..S_n)` per non-reference option.
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 5 (present
/// worth, from memory).
pub fn cumulative_discounted_savings(
    s: &Scenario,
    ev: &Evaluation,
) -> Result<Option<Vec<SavingsLine>>> {
    let Some(e) = &s.economics else {
        return Ok(None);
    };
    let mut flows = Vec::with_capacity(ev.options.len());
    for o in &ev.options {
        if !s.options.contains_key(&o.option) {
            return Ok(None);
        }
        let import: Vec<f64> = o.hours.iter().map(|r| r.grid_kwh.max(0.0)).collect();
        let export: Vec<f64> = o
            .hours
            .iter()
            .map(|r| r.pv_export_kwh + (-r.grid_kwh).max(0.0))
            .collect();
        let bill = economics::energy_cost(
            &import,
            &export,
            o.annual.fuel_kwh,
            o.annual.water_m3,
            e,
            s.site.jan1_weekday,
        );
        let capex = e.costs.capex(&sizes_of(s, o));
        let lc = economics::life_cycle(e, &capex, &bill, o.annual.cooling_kwh)?;
        flows.push((o.option.clone(), lc.flows));
    }
    let Some(rf) = flows
        .iter()
        .find(|(n, _)| *n == ev.reference)
        .map(|(_, f)| f.clone())
    else {
        return Ok(None);
    };
    let v = 1.0 / (1.0 + e.discount_rate);
    let out = flows
        .into_iter()
        .filter(|(n, _)| *n != ev.reference)
        .map(|(n, f)| {
            let mut acc = 0.0;
            let mut disc = 1.0;
            let cum = f
                .iter()
                .zip(&rf)
                .map(|(c, r)| {
                    acc += (r - c) * disc;
                    disc *= v;
                    acc
                })
                .collect();
            (n, cum)
        })
        .collect();
    Ok(Some(out))
}

// ---------------------------------------------------------------------------------------------
// Chart helpers
// ---------------------------------------------------------------------------------------------

/// A linear axis with round ticks covering `[lo, hi]` (0 always included).
struct Axis {
    lo: f64,
    hi: f64,
    step: f64,
}

fn nice_axis(lo: f64, hi: f64) -> Axis {
    let (mut lo, mut hi) = (lo.min(0.0), hi.max(0.0));
    if !lo.is_finite() || !hi.is_finite() {
        (lo, hi) = (0.0, 1.0);
    }
    if hi - lo < 1e-12 {
        hi = lo + 1.0;
    }
    let raw = (hi - lo) / 5.0;
    let mag = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 2.5, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * mag);
    Axis {
        lo: (lo / step).floor() * step,
        hi: (hi / step).ceil() * step,
        step,
    }
}

impl Axis {
    fn ticks(&self) -> Vec<f64> {
        let n = ((self.hi - self.lo) / self.step).round() as i64;
        (0..=n).map(|i| self.lo + i as f64 * self.step).collect()
    }
    /// Map a value to a pixel between `p0` (at `lo`) and `p1` (at `hi`).
    fn map(&self, v: f64, p0: f64, p1: f64) -> f64 {
        p0 + (v - self.lo) / (self.hi - self.lo) * (p1 - p0)
    }
}

fn tick_label(v: f64, step: f64) -> String {
    let digits = if step >= 1.0 {
        0
    } else {
        (-step.log10().floor()) as usize
    };
    let a = v.abs();
    if a >= 1e6 && step >= 1e5 {
        format!("{:.1}M", v / 1e6)
    } else if a >= 1e4 && step >= 1e3 {
        format!("{:.0}k", v / 1e3)
    } else {
        format!("{v:.digits$}")
    }
}

fn svg_open(id: &str, h: f64, label: &str) -> String {
    format!(
        "<svg id=\"{id}\" xmlns=\"http://www.w3.org/2000/svg\" width=\"{W:.0}\" height=\"{h:.0}\" \
         viewBox=\"0 0 {W:.0} {h:.0}\" role=\"img\" aria-label=\"{}\">",
        esc(label)
    )
}

/// Y axis with gridlines and tick labels, for a plot area `x0..x1`, `y0` (top) .. `y1` (bottom).
fn y_axis(out: &mut String, ax: &Axis, x0: f64, x1: f64, y0: f64, y1: f64, unit: &str) {
    for t in ax.ticks() {
        let y = ax.map(t, y1, y0);
        let _ = write!(
            out,
            "<line x1=\"{x0:.1}\" y1=\"{y:.1}\" x2=\"{x1:.1}\" y2=\"{y:.1}\" class=\"grid\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">{}</text>",
            x0 - 4.0,
            y + 4.0,
            tick_label(t, ax.step)
        );
    }
    let _ = write!(
        out,
        "<text x=\"{:.1}\" y=\"{:.1}\" class=\"unit\">{}</text>",
        x0 - 36.0,
        y0 - 8.0,
        esc(unit)
    );
}

fn legend(out: &mut String, items: &[(&str, String)], x: f64, y: f64) {
    let mut cx = x;
    for (colour, label) in items {
        let _ = write!(
            out,
            "<rect x=\"{cx:.1}\" y=\"{:.1}\" width=\"12\" height=\"12\" fill=\"{colour}\"/>\
             <text x=\"{:.1}\" y=\"{y:.1}\">{}</text>",
            y - 10.0,
            cx + 16.0,
            esc(label)
        );
        cx += 28.0 + 6.5 * label.chars().count() as f64;
    }
}

// ---------------------------------------------------------------------------------------------
// The five charts
// ---------------------------------------------------------------------------------------------

/// (1) Monthly cooling by source, one small panel per option, stacked bars.
fn chart_monthly_cooling(ev: &Evaluation) -> String {
    let cols = 3usize;
    let rows = ev.options.len().div_ceil(cols).max(1);
    let (pw, ph) = (W / cols as f64, 210.0);
    let h = 40.0 + rows as f64 * ph;
    let top = ev
        .options
        .iter()
        .flat_map(|o| {
            o.monthly
                .iter()
                .map(|m| (m.cooling_kwh + m.unmet_kwh) / 1000.0)
        })
        .fold(0.0, f64::max);
    let ax = nice_axis(0.0, top);
    let mut s = svg_open(CHARTS[0], h, "monthly cooling by source per option");
    legend(
        &mut s,
        &[
            (PALETTE[0], "from solar heat".into()),
            (PALETTE[2], "from backup heat".into()),
            (PALETTE[3], "evaporative".into()),
            (PALETTE[4], "on own PV".into()),
            (PALETTE[1], "electric (grid)".into()),
            (PALETTE[5], "unmet".into()),
        ],
        60.0,
        20.0,
    );
    for (i, o) in ev.options.iter().enumerate() {
        let (px, py) = ((i % cols) as f64 * pw, 40.0 + (i / cols) as f64 * ph);
        let (x0, x1, y0, y1) = (px + 52.0, px + pw - 12.0, py + 28.0, py + ph - 24.0);
        let _ = write!(
            s,
            "<text x=\"{:.1}\" y=\"{:.1}\" class=\"panel\">{} ({})</text>",
            x0,
            py + 14.0,
            esc(&o.option),
            esc(o.route)
        );
        y_axis(&mut s, &ax, x0, x1, y0, y1, "MWh");
        let bw = (x1 - x0) / 12.0;
        for (m, t) in o.monthly.iter().enumerate() {
            let parts = [
                (t.cooling_solar_kwh, PALETTE[0]),
                (t.cooling_backup_heat_kwh, PALETTE[2]),
                (t.cooling_evaporative_kwh, PALETTE[3]),
                (t.cooling_pv_kwh, PALETTE[4]),
                (t.cooling_electric_kwh, PALETTE[1]),
                (t.unmet_kwh, PALETTE[5]),
            ]
            .map(|(v, c)| (v.max(0.0) / 1000.0, c));
            let x = x0 + m as f64 * bw + 0.15 * bw;
            let mut base = 0.0;
            for (v, c) in parts {
                if v <= 0.0 {
                    continue;
                }
                let ya = ax.map(base + v, y1, y0);
                let yb = ax.map(base, y1, y0);
                let _ = write!(
                    s,
                    "<rect x=\"{x:.1}\" y=\"{ya:.1}\" width=\"{:.1}\" height=\"{:.1}\" fill=\"{c}\"/>",
                    0.7 * bw,
                    (yb - ya).max(0.0)
                );
                base += v;
            }
            let _ = write!(
                s,
                "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
                x + 0.35 * bw,
                y1 + 14.0,
                MONTHS[m]
            );
        }
    }
    s.push_str("</svg>");
    s
}

/// (2) Monthly solar share of cooling per option with a collector field or own PV (lines).
fn chart_monthly_solar_share(ev: &Evaluation) -> String {
    let h = 330.0;
    let (x0, x1, y0, y1) = (70.0, W - 220.0, 30.0, h - 40.0);
    let ax = Axis {
        lo: 0.0,
        hi: 100.0,
        step: 20.0,
    };
    let mut s = svg_open(CHARTS[1], h, "monthly solar share of cooling per option");
    y_axis(&mut s, &ax, x0, x1, y0, y1, "%");
    let dx = (x1 - x0) / 12.0;
    for (m, name) in MONTHS.iter().enumerate() {
        let _ = write!(
            s,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{name}</text>",
            x0 + (m as f64 + 0.5) * dx,
            y1 + 16.0
        );
    }
    let mut k = 0usize;
    for (idx, o) in ev
        .options
        .iter()
        .enumerate()
        .filter(|(_, o)| o.annual.solar_share_of_cooling.is_some_and(|f| f > 0.0))
    {
        // Colours by the option's position in the evaluation, as in charts 4 and 5.
        let c = PALETTE[idx % PALETTE.len()];
        let mut path = String::new();
        let mut pen_up = true;
        for (m, t) in o.monthly.iter().enumerate() {
            match t.solar_share_of_cooling {
                Some(f) => {
                    let (x, y) = (x0 + (m as f64 + 0.5) * dx, ax.map(100.0 * f, y1, y0));
                    let _ = write!(path, "{}{x:.1},{y:.1} ", if pen_up { "M" } else { "L" });
                    let _ = write!(
                        s,
                        "<circle cx=\"{x:.1}\" cy=\"{y:.1}\" r=\"3\" fill=\"{c}\"/>"
                    );
                    pen_up = false;
                }
                None => pen_up = true,
            }
        }
        let _ = write!(
            s,
            "<path d=\"{}\" fill=\"none\" stroke=\"{c}\" stroke-width=\"2\"/>\
             <rect x=\"{:.1}\" y=\"{:.1}\" width=\"12\" height=\"12\" fill=\"{c}\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\">{}</text>",
            path.trim_end(),
            x1 + 16.0,
            y0 + 20.0 * k as f64,
            x1 + 32.0,
            y0 + 10.0 + 20.0 * k as f64,
            esc(&o.option)
        );
        k += 1;
    }
    if k == 0 {
        let _ = write!(
            s,
            "<text x=\"{:.1}\" y=\"{:.1}\">no option has a collector field</text>",
            x0 + 20.0,
            y0 + 40.0
        );
    }
    s.push_str("</svg>");
    s
}

/// Colour of `f` in 0..1 on a perceptual dark-blue → green → yellow ramp (five stops
/// approximating the viridis colour map; common practice).
fn ramp(f: f64) -> String {
    const STOPS: [(f64, f64, f64); 5] = [
        (68.0, 1.0, 84.0),
        (59.0, 82.0, 139.0),
        (33.0, 145.0, 140.0),
        (94.0, 201.0, 98.0),
        (253.0, 231.0, 37.0),
    ];
    let f = if f.is_finite() {
        f.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let x = f * 4.0;
    let i = (x.floor() as usize).min(3);
    let u = x - i as f64;
    let (a, b) = (STOPS[i], STOPS[i + 1]);
    let c = |p: f64, q: f64| (p + u * (q - p)).round() as u8;
    format!("#{:02x}{:02x}{:02x}", c(a.0, b.0), c(a.1, b.1), c(a.2, b.2))
}

/// What the heat map shows, and for which option.
fn heat_map_subject<'a>(s: &Scenario, ev: &'a Evaluation) -> Option<(&'a OptionResult, bool)> {
    let o = ev.options.iter().find(|o| {
        s.options
            .get(&o.option)
            .is_some_and(|sec| sec.route.is_heat_driven())
    })?;
    let store = o.hours.iter().any(|r| r.t_store_c.is_some());
    Some((o, store))
}

/// (3) Hour-of-day × day-of-year heat map of store temperature (or cooling by the route when
/// the option has no store) for the first heat-driven option.
fn chart_heat_map(s: &Scenario, ev: &Evaluation) -> (String, String) {
    let h = 330.0;
    let mut svg = svg_open(CHARTS[2], h, "hour-of-day by day-of-year heat map");
    let Some((o, store)) = heat_map_subject(s, ev) else {
        let _ = write!(
            svg,
            "<text x=\"70\" y=\"60\">no heat-driven option in this scenario</text></svg>"
        );
        return (svg, "No heat-driven option: no heat map.".into());
    };
    let value = |r: &crate::plant::HourRecord| -> Option<f64> {
        if store {
            r.t_store_c
        } else {
            Some(r.cooling_solar_kwh + r.cooling_backup_heat_kwh)
        }
    };
    let vals: Vec<Option<f64>> = o.hours.iter().map(value).collect();
    let (lo, hi) = vals
        .iter()
        .flatten()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(*v), b.max(*v))
        });
    let (lo, hi) = if lo.is_finite() && hi > lo {
        (lo, hi)
    } else {
        (0.0, lo.max(0.0) + 1.0)
    };
    let (x0, y0) = (60.0, 20.0);
    let (cw, chh) = (2.2, 11.0);
    let days = o.hours.len() / 24;
    for (i, v) in vals.iter().enumerate() {
        let (d, hr) = (i / 24, i % 24);
        let fill = v.map_or("#cccccc".to_string(), |v| ramp((v - lo) / (hi - lo)));
        let _ = write!(
            svg,
            "<rect x=\"{:.1}\" y=\"{:.0}\" width=\"{cw}\" height=\"{chh}\" fill=\"{fill}\"/>",
            x0 + d as f64 * cw,
            y0 + hr as f64 * chh
        );
    }
    for hr in (0..=24).step_by(6) {
        let _ = write!(
            svg,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">{hr}:00</text>",
            x0 - 4.0,
            y0 + hr as f64 * chh + 4.0
        );
    }
    let month_start = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334];
    let names = [
        "Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec",
    ];
    for (d, n) in month_start.iter().zip(names) {
        let _ = write!(
            svg,
            "<text x=\"{:.1}\" y=\"{:.1}\">{n}</text>",
            x0 + *d as f64 * cw + 2.0,
            y0 + 24.0 * chh + 16.0
        );
    }
    // Colour key.
    let kx = x0 + days.max(365) as f64 * cw + 20.0;
    for j in 0..20 {
        let f = 1.0 - j as f64 / 19.0;
        let _ = write!(
            svg,
            "<rect x=\"{kx:.1}\" y=\"{:.1}\" width=\"16\" height=\"13.3\" fill=\"{}\"/>",
            y0 + j as f64 * 13.2,
            ramp(f)
        );
    }
    let unit = if store { "°C" } else { "kWh" };
    let _ = write!(
        svg,
        "<text x=\"{:.1}\" y=\"{:.1}\">{hi:.0} {unit}</text>\
         <text x=\"{:.1}\" y=\"{:.1}\">{lo:.0} {unit}</text></svg>",
        kx + 20.0,
        y0 + 10.0,
        kx + 20.0,
        y0 + 264.0
    );
    let what = if store {
        "mean store temperature at the end of each hour, °C"
    } else {
        "cooling the heat-driven machine made (from solar and backup heat) in each hour, kWh"
    };
    let caption = format!(
        "Heat map of option <code>{}</code> ({}), the first heat-driven option: {what}; \
         columns are days of the year, rows hours of the day (local standard time).",
        esc(&o.option),
        esc(o.route)
    );
    (svg, caption)
}

/// Horizontal bars of one annual figure per option in a panel starting at `px`.
fn bar_panel(out: &mut String, ev: &Evaluation, px: f64, title: &str, vals: &[Option<f64>]) {
    let pw = W / 2.0;
    let (x0, x1) = (px + 170.0, px + pw - 30.0);
    let (y0, rh) = (50.0, 30.0);
    let lo = vals.iter().flatten().fold(0.0, |a: f64, b| a.min(*b));
    let hi = vals.iter().flatten().fold(0.0, |a: f64, b| a.max(*b));
    let ax = nice_axis(lo, hi);
    let y1 = y0 + rh * ev.options.len() as f64;
    let _ = write!(
        out,
        "<text x=\"{:.1}\" y=\"22\" class=\"panel\">{}</text>",
        px + 10.0,
        esc(title)
    );
    for t in ax.ticks() {
        let x = ax.map(t, x0, x1);
        let _ = write!(
            out,
            "<line x1=\"{x:.1}\" y1=\"{:.1}\" x2=\"{x:.1}\" y2=\"{y1:.1}\" class=\"grid\"/>\
             <text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{}</text>",
            y0 - 4.0,
            y1 + 16.0,
            tick_label(t, ax.step)
        );
    }
    for (i, (o, v)) in ev.options.iter().zip(vals).enumerate() {
        let y = y0 + i as f64 * rh;
        let _ = write!(
            out,
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">{}</text>",
            x0 - 6.0,
            y + rh / 2.0 + 4.0,
            esc(&o.option)
        );
        if let Some(v) = v {
            let (xa, xb) = (ax.map(v.min(0.0), x0, x1), ax.map(v.max(0.0), x0, x1));
            let _ = write!(
                out,
                "<rect x=\"{xa:.1}\" y=\"{:.1}\" width=\"{:.1}\" height=\"{:.1}\" fill=\"{}\"/>",
                y + 5.0,
                (xb - xa).max(0.0),
                rh - 10.0,
                PALETTE[i % PALETTE.len()]
            );
        }
    }
}

/// (4) Annualised cost and primary energy per option, side by side.
fn chart_cost_energy(ev: &Evaluation) -> String {
    let h = 80.0 + 30.0 * ev.options.len() as f64;
    let mut s = svg_open(
        CHARTS[3],
        h,
        "annualised cost and primary energy per option",
    );
    let money: Vec<Option<f64>> = ev
        .options
        .iter()
        .map(|o| o.annual.annualised_cost)
        .collect();
    if money.iter().any(Option::is_some) {
        bar_panel(
            &mut s,
            ev,
            0.0,
            &format!("annualised cost, {}/yr", ev.currency),
            &money,
        );
    } else {
        s.push_str(
            "<text x=\"10\" y=\"22\" class=\"panel\">annualised cost</text>\
             <text x=\"10\" y=\"60\">no [economics] section: no money figures</text>",
        );
    }
    let pe: Vec<Option<f64>> = ev
        .options
        .iter()
        .map(|o| o.annual.primary_energy_kwh.map(|v| v / 1000.0))
        .collect();
    bar_panel(&mut s, ev, W / 2.0, "primary energy, MWh/yr", &pe);
    s.push_str("</svg>");
    s
}

/// (5) Cumulative discounted saving against the reference over the lifetime (lines).
fn chart_cash_flow(ev: &Evaluation, cum: Option<&[SavingsLine]>) -> String {
    let h = 340.0;
    let mut s = svg_open(
        CHARTS[4],
        h,
        "cumulative discounted cash flow against the reference",
    );
    let Some(cum) = cum.filter(|c| !c.is_empty()) else {
        s.push_str(
            "<text x=\"70\" y=\"60\">no [economics] section (or no reference option): no cash flow</text></svg>",
        );
        return s;
    };
    let (x0, x1, y0, y1) = (80.0, W - 220.0, 30.0, h - 44.0);
    let years = cum.iter().map(|(_, v)| v.len()).max().unwrap_or(1).max(2) - 1;
    let lo = cum
        .iter()
        .flat_map(|(_, v)| v)
        .fold(0.0, |a: f64, b| a.min(*b));
    let hi = cum
        .iter()
        .flat_map(|(_, v)| v)
        .fold(0.0, |a: f64, b| a.max(*b));
    let ax = nice_axis(lo, hi);
    y_axis(&mut s, &ax, x0, x1, y0, y1, &ev.currency);
    let xa = nice_axis(0.0, years as f64);
    for t in xa.ticks().into_iter().filter(|t| *t <= years as f64) {
        let x = x0 + t / years as f64 * (x1 - x0);
        let _ = write!(
            s,
            "<text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\">{t:.0}</text>",
            y1 + 16.0
        );
    }
    let _ = write!(
        s,
        "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\">year</text>\
         <line x1=\"{x0}\" y1=\"{z:.1}\" x2=\"{x1}\" y2=\"{z:.1}\" stroke=\"#333\" stroke-width=\"1.5\"/>",
        (x0 + x1) / 2.0,
        y1 + 34.0,
        z = ax.map(0.0, y1, y0)
    );
    // Colours by the option's position in the evaluation, as in chart 4.
    for (k, (name, v)) in cum.iter().enumerate() {
        let idx = ev
            .options
            .iter()
            .position(|o| &o.option == name)
            .unwrap_or(k);
        let c = PALETTE[idx % PALETTE.len()];
        let d: Vec<String> = v
            .iter()
            .enumerate()
            .map(|(t, y)| {
                format!(
                    "{}{:.1},{:.1}",
                    if t == 0 { "M" } else { "L" },
                    x0 + t as f64 / years as f64 * (x1 - x0),
                    ax.map(*y, y1, y0)
                )
            })
            .collect();
        let _ = write!(
            s,
            "<path d=\"{}\" fill=\"none\" stroke=\"{c}\" stroke-width=\"2\"/>\
             <rect x=\"{:.1}\" y=\"{:.1}\" width=\"12\" height=\"12\" fill=\"{c}\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\">{}</text>",
            d.join(" "),
            x1 + 16.0,
            y0 + 20.0 * k as f64,
            x1 + 32.0,
            y0 + 10.0 + 20.0 * k as f64,
            esc(name)
        );
    }
    s.push_str("</svg>");
    s
}

// ---------------------------------------------------------------------------------------------
// Tables, method, checks
// ---------------------------------------------------------------------------------------------

fn is_numeric_cell(c: &str) -> bool {
    c.parse::<f64>().is_ok() || c == "–" || c == "none"
}

fn html_table(rows: &[Vec<String>], class: &str) -> String {
    let mut t = format!("<table class=\"{class}\">");
    for (i, r) in rows.iter().enumerate() {
        if i == 0 {
            t.push_str("<thead><tr>");
            for c in r {
                let _ = write!(t, "<th>{}</th>", inline_md(c));
            }
            t.push_str("</tr></thead><tbody>");
        } else {
            t.push_str("<tr>");
            for (j, c) in r.iter().enumerate() {
                let cls = if j > 0 && is_numeric_cell(c) {
                    " class=\"num\""
                } else {
                    ""
                };
                let _ = write!(t, "<td{cls}>{}</td>", inline_md(c));
            }
            t.push_str("</tr>");
        }
    }
    t.push_str("</tbody></table>");
    t
}

/// Cells of a Markdown table line `| a | b |`; `None` for the `|---|` separator.
fn md_cells(line: &str) -> Option<Vec<String>> {
    let inner = line.trim().trim_start_matches('|').trim_end_matches('|');
    if inner.chars().all(|c| matches!(c, '-' | '|' | ':' | ' ')) {
        return None;
    }
    Some(inner.split('|').map(|c| c.trim().to_string()).collect())
}

/// The feasibility tables, taken from the Markdown rendering of [`super::table`] so the figures
/// and columns are those of the terminal tables.
fn tables(ev: &Evaluation) -> (String, Vec<String>) {
    let md = super::table::markdown(ev, &[]);
    let mut out = String::new();
    let mut origin = Vec::new();
    let mut rows: Vec<Vec<String>> = Vec::new();
    let flush = |out: &mut String, rows: &mut Vec<Vec<String>>| {
        if !rows.is_empty() {
            out.push_str(&html_table(rows, "figures"));
            rows.clear();
        }
    };
    for line in md.lines() {
        if line.starts_with('|') {
            if let Some(c) = md_cells(line) {
                rows.push(c);
            }
            continue;
        }
        flush(&mut out, &mut rows);
        if let Some(h) = line.strip_prefix("## ") {
            if h != "Caution" {
                let _ = write!(out, "<h3>{}</h3>", inline_md(h));
            }
        } else if let Some(item) = line.strip_prefix("- ") {
            origin.push(item.to_string());
        }
    }
    flush(&mut out, &mut rows);
    (out, origin)
}

/// README's method table (model, method, checked against), embedded at build time.
fn method_rows() -> Vec<Vec<String>> {
    const README: &str = include_str!("../../README.md");
    let mut rows = Vec::new();
    let mut inside = false;
    for line in README.lines() {
        if line.starts_with("## ") {
            inside = line.starts_with("## Method summary");
            continue;
        }
        if inside && line.starts_with('|') {
            if let Some(c) = md_cells(line) {
                rows.push(c);
            }
        } else if inside && !rows.is_empty() {
            break;
        }
    }
    rows
}

/// Passed and failed checks per group, groups in alphabetical order.
pub fn check_counts(checks: &[Check]) -> BTreeMap<&'static str, (usize, usize)> {
    let mut m = BTreeMap::new();
    for c in checks {
        let e = m.entry(c.group).or_insert((0, 0));
        if c.passed() {
            e.0 += 1;
        } else {
            e.1 += 1;
        }
    }
    m
}

const CSS: &str = r#"
:root{--ink:#1b1b1b;--muted:#555;--rule:#d0d0d0}
*{box-sizing:border-box}
body{font:14px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,"Liberation Sans",Arial,sans-serif;color:var(--ink);max-width:1160px;margin:0 auto;padding:16px 20px}
h1{font-size:1.6em;margin:.2em 0}
h2{font-size:1.25em;border-bottom:2px solid var(--rule);padding-bottom:.15em;margin-top:1.6em}
h3{font-size:1.02em;margin:1.1em 0 .4em}
.caution{border:2px solid #b35900;background:#fff4e5;padding:.6em .9em;border-radius:4px}
table{border-collapse:collapse;width:100%;table-layout:fixed;margin:.3em 0 1em}
th,td{border:1px solid var(--rule);padding:3px 4px;overflow-wrap:anywhere;word-wrap:break-word;vertical-align:top}
table.figures{font-size:12px}
table.figures th{background:#f1f4f8;font-weight:600;text-align:left}
table.figures th:first-child,table.figures td:first-child{width:15%}
table.counts{width:auto;min-width:360px;max-width:100%}
td.num{text-align:right;font-variant-numeric:tabular-nums}
table.method{font-size:12px}
table.method td:first-child,table.method th:first-child{width:16%}
figure{margin:1em 0 1.6em;max-width:100%}
figure svg{display:block;width:100%;height:auto;max-width:100%}
figcaption{color:var(--muted);font-size:12.5px;margin-top:.3em}
svg text{font-size:12px;fill:#222;font-family:system-ui,"Liberation Sans",Arial,sans-serif}
svg text.panel{font-weight:600}
svg text.unit{fill:#555}
svg .grid{stroke:#e2e2e2;stroke-width:1}
code{font-size:.92em;background:#f3f3f3;padding:0 .2em;overflow-wrap:anywhere}
ul{padding-left:1.3em}
@media print{
 body{max-width:none;padding:0;font-size:10pt}
 section{break-before:page}
 section#caution-top,section#origin{break-before:auto}
 figure{break-inside:avoid}
 table{font-size:8pt;page-break-inside:auto}
 tr{break-inside:avoid}
 .caution{background:none}
}
"#;

/// Counts elements whose content is wider than their box and writes the count into
/// `document.body.dataset.overflow` (a layout self-check; reads the page only, no network).
const OVERFLOW_SCRIPT: &str = r#"<script>
(function(){var n=0,what=[];
document.querySelectorAll('table,th,td,figure,figcaption,section,p,li,h1,h2,h3,div').forEach(function(e){
 if(e.scrollWidth>e.clientWidth+1){n++;if(what.length<5)what.push(e.tagName+(e.id?'#'+e.id:''));}});
document.body.dataset.overflow=String(n);document.body.dataset.overflowWhat=what.join(' ');})();
</script>"#;

/// The whole HTML report of an evaluation.
///
/// * `ev` – the evaluation; `s` – the scenario it came from (assumptions, economics, routes)
/// * `checks` – the reference checks to summarise (from [`crate::checks::run_all`])
///
/// Returns one self-contained HTML document: no external script, stylesheet, font or image.
/// Chart (5) is rebuilt from the life-cycle flows of [`cumulative_discounted_savings`].
/// Errors only from the economics of an unvalidated scenario.
pub fn render(ev: &Evaluation, s: &Scenario, checks: &[Check]) -> Result<String> {
    let version = env!("CARGO_PKG_VERSION");
    let caution = esc(crate::SCREENING_CAUTION);
    let (tables, origin) = tables(ev);
    let cum = cumulative_discounted_savings(s, ev)?;
    let (heat_svg, heat_caption) = chart_heat_map(s, ev);
    let mut h = String::with_capacity(1 << 20);
    let _ = write!(
        h,
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\
         <meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\
         <title>{t} — parhelion {version}</title><style>{CSS}</style></head><body>\
         <header><h1>{t}</h1><p>Screening report by parhelion {version}. Reference option: \
         <code>{r}</code>. Currency: {c}.</p></header>\
         <section id=\"caution-top\"><p class=\"caution\"><strong>Caution.</strong> {caution}</p></section>\
         <section id=\"origin\"><h2>Inputs</h2><ul>",
        t = esc(&ev.scenario),
        r = esc(&ev.reference),
        c = esc(&ev.currency),
    );
    for o in &origin {
        let _ = write!(h, "<li>{}</li>", inline_md(o));
    }
    for o in &ev.options {
        if let Some(d) = &o.description {
            let _ = write!(
                h,
                "<li><code>{}</code> ({}): {}</li>",
                esc(&o.option),
                esc(o.route),
                esc(d)
            );
        }
    }
    let _ = write!(
        h,
        "</ul></section><section id=\"tables\"><h2>Figures over the year</h2>{tables}</section>\
         <section id=\"charts\"><h2>Charts</h2>"
    );
    let figure = |h: &mut String, svg: &str, caption: &str| {
        let _ = write!(
            h,
            "<figure class=\"chart\">{svg}<figcaption>{caption}</figcaption></figure>"
        );
    };
    figure(
        &mut h,
        &chart_monthly_cooling(ev),
        "(1) Monthly cooling delivered, MWh, by source: by the heat-driven machine from solar \
         heat and from backup heat, by evaporation alone, by an electric compressor on own PV \
         and on the grid, and unmet load. Same scale in every panel.",
    );
    figure(
        &mut h,
        &chart_monthly_solar_share(ev),
        "(2) Monthly solar share of cooling, %: cooling made from solar heat or own PV / cooling \
         load, for the options that have one; a gap is a month without cooling load.",
    );
    figure(&mut h, &heat_svg, &format!("(3) {heat_caption}"));
    figure(
        &mut h,
        &chart_cost_energy(ev),
        "(4) Annualised cost (present cost of the life-cycle flows × capital recovery factor) and \
         annual primary energy per option.",
    );
    let cash_caption = match &s.economics {
        Some(e) => format!(
            "(5) Cumulative discounted saving against the reference <code>{}</code>, {}: \
             Σ (reference cost − option cost)<sub>t</sub> / (1 + {})<sup>t</sup> for years \
             t = 0…{} of the life-cycle flows (year 0 the extra capital, later years O&amp;M, \
             energy with escalation, water and replacements). Where a line crosses zero is the \
             discounted payback; its end is the NPV in the money table.",
            esc(&ev.reference),
            esc(&ev.currency),
            e.discount_rate,
            e.lifetime_years
        ),
        None => "(5) No [economics] section: no cash flow.".into(),
    };
    figure(&mut h, &chart_cash_flow(ev, cum.as_deref()), &cash_caption);
    h.push_str("</section><section id=\"assumptions\"><h2>Assumptions</h2><ul>");
    for a in crate::scenario::assumptions(s) {
        let _ = write!(h, "<li>{}</li>", esc(&a));
    }
    h.push_str(
        "</ul></section><section id=\"method\"><h2>Method summary and sources</h2>\
         <p>Each model and the outside reference it is checked against (from the README).</p>",
    );
    h.push_str(&html_table(&method_rows(), "method"));
    h.push_str("</section><section id=\"checks\"><h2>Reference checks</h2>");
    let counts = check_counts(checks);
    let mut rows = vec![vec![
        "group".to_string(),
        "passed".to_string(),
        "failed".to_string(),
    ]];
    for (g, (p, f)) in &counts {
        rows.push(vec![g.to_string(), p.to_string(), f.to_string()]);
    }
    let (p, f) = counts
        .values()
        .fold((0, 0), |(a, b), (p, f)| (a + p, b + f));
    rows.push(vec!["all".into(), p.to_string(), f.to_string()]);
    let _ = write!(
        h,
        "<p>{p} of {} reference checks pass (model value within the tolerance of a published or \
         library value; <code>parhelion checks</code> lists each).</p>{}",
        p + f,
        html_table(&rows, "figures counts")
    );
    let _ = writeln!(
        h,
        "</section><section id=\"caution-end\"><h2>Caution</h2><p class=\"caution\">{caution}</p>\
         </section>{OVERFLOW_SCRIPT}</body></html>"
    );
    Ok(h)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nice_axis_round_steps() {
        // 0..437.8/12 ≈ 36.5 MWh: raw step 7.3 → 10, axis 0..40.
        let a = nice_axis(0.0, 36.5);
        assert_eq!((a.lo, a.hi, a.step), (0.0, 40.0, 10.0));
        // −388 401 .. 40 553: raw 85 791 → 100 000, axis −400 000 .. 100 000.
        let b = nice_axis(-388_401.0, 40_553.0);
        assert_eq!((b.lo, b.hi, b.step), (-400_000.0, 100_000.0, 100_000.0));
        assert_eq!(b.ticks().len(), 6);
        // All zero: a unit axis, never a division by zero.
        let z = nice_axis(0.0, 0.0);
        assert!(z.hi > z.lo);
        assert_eq!(z.map(0.5, 0.0, 100.0), 50.0);
    }

    #[test]
    fn ramp_ends_and_escape() {
        assert_eq!(ramp(0.0), "#440154");
        assert_eq!(ramp(1.0), "#fde725");
        assert_eq!(ramp(f64::NAN), "#440154");
        assert_eq!(esc("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
        assert_eq!(
            inline_md("vs `grid` *x*"),
            "vs <code>grid</code> <em>x</em>"
        );
    }

    #[test]
    fn method_table_mirrors_readme() {
        let rows = method_rows();
        assert_eq!(rows[0], ["model", "method", "checked against"]);
        assert!(rows.len() > 10, "{}", rows.len());
        assert!(rows.iter().all(|r| r.len() == 3));
    }
}
