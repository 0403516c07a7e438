//! Reading an embedded check table.

use crate::error::{Error, Result};
use std::collections::HashMap;

/// One row of a check table, columns by header name.
#[derive(Debug, Clone)]
pub struct Row {
    table: &'static str,
    line: usize,
    cells: HashMap<String, String>,
}

impl Row {
    /// A text cell.
    pub fn str(&self, col: &str) -> Result<&str> {
        self.cells.get(col).map(String::as_str).ok_or_else(|| {
            Error::Internal(format!(
                "reference/{}: line {}: no column `{col}`",
                self.table, self.line
            ))
        })
    }

    /// A numeric cell.
    pub fn f64(&self, col: &str) -> Result<f64> {
        let s = self.str(col)?;
        s.trim().parse::<f64>().map_err(|_| {
            Error::Internal(format!(
                "reference/{}: line {}: column `{col}` = `{s}` is not a number",
                self.table, self.line
            ))
        })
    }

    /// The `expected`, `tolerance` and `source` cells every table has.
    pub fn expected(&self) -> Result<(f64, f64, String)> {
        Ok((
            self.f64("expected")?,
            self.f64("tolerance")?,
            self.str("source")?.to_string(),
        ))
    }
}

/// A check of `value` against this row's `expected`, `tolerance` and `source`.
pub fn check(
    group: &'static str,
    table: &'static str,
    case: String,
    value: f64,
    row: &Row,
) -> Result<super::Check> {
    let (expected, tolerance, source) = row.expected()?;
    Ok(super::Check {
        group,
        table,
        case,
        value,
        expected,
        tolerance,
        source,
    })
}

/// Parse an embedded table (`include_str!("../../reference/NAME.csv")`).
/// `#` lines are comments; the first other line is the header.
pub fn parse(table: &'static str, text: &str) -> Result<Vec<Row>> {
    let mut rdr = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let headers = rdr
        .headers()
        .map_err(|e| Error::Internal(format!("reference/{table}: {e}")))?
        .clone();
    let mut rows = Vec::new();
    for rec in rdr.records() {
        let rec = rec.map_err(|e| Error::Internal(format!("reference/{table}: {e}")))?;
        let line = rec.position().map_or(0, |p| p.line() as usize);
        let cells = headers
            .iter()
            .zip(rec.iter())
            .map(|(h, v)| (h.to_string(), v.to_string()))
            .collect();
        rows.push(Row { table, line, cells });
    }
    Ok(rows)
}
