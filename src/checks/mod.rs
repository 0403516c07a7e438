//! Reference checks: every physical model compared with something outside the project.
//!
//! Each check table is a CSV file in `reference/`, embedded in the binary at build time with
//! `include_str!`, so an installed `parhelion checks` runs from any directory. A table has one
//! row per case; besides its own input columns it always has `expected`, `tolerance` (absolute,
//! in the unit of the quantity) and `source` (author, title, edition, table/example number, or
//! a reference library with its version, or "common practice"; "from memory" where so).
//! Lines starting with `#` are comments (provenance, the script that made the table).
//!
//! An area's evaluator (`sun.rs`, `weather.rs`, ...) reads its tables, runs the model on each
//! row's inputs and returns one [`Check`] per compared quantity. `tests/checks.rs` asserts
//! every check passes; `parhelion checks` prints them.

pub mod table;

mod absorption;
mod collector;
mod desiccant;
mod feasibility;
mod load;
mod num;
mod plant;
mod psychro;
mod rankine;
mod storage;
mod sun;
mod weather;

use serde::Serialize;

/// One compared quantity.
#[derive(Debug, Clone, Serialize)]
pub struct Check {
    /// Area of the model (`sun`, `sky`, `collector`, ...).
    pub group: &'static str,
    /// The reference table it came from (file name in `reference/`), or `computed` for checks
    /// whose expected value is a closed-form limit computed in the evaluator.
    pub table: &'static str,
    /// What case and quantity: `"SPA example, zenith_deg"`.
    pub case: String,
    /// Model value.
    pub value: f64,
    /// Reference value.
    pub expected: f64,
    /// Allowed absolute difference, in the quantity's unit.
    pub tolerance: f64,
    /// Where the expected value comes from.
    pub source: String,
}

impl Check {
    /// Passes when both numbers are finite and within tolerance.
    pub fn passed(&self) -> bool {
        self.value.is_finite()
            && self.expected.is_finite()
            && (self.value - self.expected).abs() <= self.tolerance
    }
}

/// Run every check of every area. An error here is a defect in a table or an evaluator.
pub fn run_all() -> crate::Result<Vec<Check>> {
    let mut out = Vec::new();
    for area in [
        sun::checks,
        absorption::checks,
        weather::checks,
        psychro::checks,
        load::checks,
        collector::checks,
        storage::checks,
        plant::checks,
        desiccant::checks,
        feasibility::checks,
        rankine::checks,
        num::checks,
    ] {
        out.extend(area()?);
    }
    Ok(out)
}
