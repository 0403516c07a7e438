//! Reference checks for the plant area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every plant check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
