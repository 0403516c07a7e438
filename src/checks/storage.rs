//! Reference checks for the storage area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every storage check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
