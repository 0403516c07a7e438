//! Reference checks for the weather area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every weather check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
