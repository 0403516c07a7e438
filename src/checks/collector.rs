//! Reference checks for the collector area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every collector check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
