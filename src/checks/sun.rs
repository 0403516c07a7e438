//! Reference checks for the sun area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every sun check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
