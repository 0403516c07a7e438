//! The JSON summary: `{ scenario, version, caution, reference, weather, load, warnings, options: [ {
//! option, route, description, gross_collector_m2, store_m3, annual: {..}, monthly: [..] } ] }`.
//! Keys of `annual` and of each `monthly` entry are those of the hourly CSV where the two
//! share a quantity (units in the names). README lists them; they are stable.

use crate::error::{Error, Result};
use crate::feasibility::{Evaluation, Totals};
use serde::Serialize;

#[derive(Serialize)]
struct Doc<'a> {
    scenario: &'a str,
    version: &'static str,
    caution: &'static str,
    reference: &'a str,
    weather: &'a str,
    load: &'a str,
    /// What a study must not miss (`feasibility::warnings`).
    warnings: Vec<String>,
    options: Vec<Opt<'a>>,
}

#[derive(Serialize)]
struct Opt<'a> {
    option: &'a str,
    route: &'a str,
    description: Option<&'a str>,
    gross_collector_m2: f64,
    store_m3: Option<f64>,
    annual: &'a Totals,
    monthly: Vec<Month<'a>>,
}

#[derive(Serialize)]
struct Month<'a> {
    month: u32,
    #[serde(flatten)]
    totals: &'a Totals,
}

/// Render the summary as pretty JSON.
pub fn render(ev: &Evaluation) -> Result<Vec<u8>> {
    let doc = Doc {
        scenario: &ev.scenario,
        version: env!("CARGO_PKG_VERSION"),
        caution: crate::SCREENING_CAUTION,
        reference: &ev.reference,
        weather: &ev.weather_origin,
        load: &ev.load_origin,
        warnings: crate::feasibility::warnings(ev),
        options: ev
            .options
            .iter()
            .map(|o| Opt {
                option: &o.option,
                route: o.route,
                description: o.description.as_deref(),
                gross_collector_m2: o.gross_m2,
                store_m3: o.store_m3,
                annual: &o.annual,
                monthly: o
                    .monthly
                    .iter()
                    .enumerate()
                    .map(|(i, t)| Month {
                        month: i as u32 + 1,
                        totals: t,
                    })
                    .collect(),
            })
            .collect(),
    };
    let mut v =
        serde_json::to_vec_pretty(&doc).map_err(|e| Error::Internal(format!("JSON: {e}")))?;
    v.push(b'\n');
    Ok(v)
}
