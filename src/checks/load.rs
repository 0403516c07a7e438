//! Reference checks for the load area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every load check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
