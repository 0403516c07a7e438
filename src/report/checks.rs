//! The reference-check table printed by `parhelion checks`.

use crate::checks::Check;
use comfy_table::{Cell, ContentArrangement, Table, presets::UTF8_FULL_CONDENSED};

fn g(x: f64) -> String {
    if x == 0.0 {
        "0".into()
    } else if x.abs() >= 1e5 || x.abs() < 1e-3 {
        format!("{x:.4e}")
    } else {
        format!("{x:.6}")
            .trim_end_matches('0')
            .trim_end_matches('.')
            .to_string()
    }
}

/// Render every check, grouped as they come, with a count at the end.
pub fn render(checks: &[Check]) -> String {
    let mut t = Table::new();
    t.load_preset(UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Dynamic)
        .set_header(
            [
                "group",
                "case",
                "value",
                "expected",
                "tolerance",
                "result",
                "source",
            ]
            .map(Cell::new),
        );
    for c in checks {
        t.add_row(vec![
            c.group.to_string(),
            c.case.clone(),
            g(c.value),
            g(c.expected),
            g(c.tolerance),
            if c.passed() {
                "pass".into()
            } else {
                "FAIL".into()
            },
            c.source.clone(),
        ]);
    }
    let failed = checks.iter().filter(|c| !c.passed()).count();
    format!(
        "parhelion {} reference checks\n{t}\n{} passed, {failed} failed\n",
        env!("CARGO_PKG_VERSION"),
        checks.len() - failed
    )
}
