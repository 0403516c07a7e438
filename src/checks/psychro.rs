//! Reference checks for the psychro area (see `checks/mod.rs` for the table format).

use super::Check;

/// Every psychro check.
pub fn checks() -> crate::Result<Vec<Check>> {
    Ok(Vec::new())
}
