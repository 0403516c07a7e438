//! Output: terminal tables, hourly CSV, JSON summary. Knows no physics: it formats what the
//! feasibility layer computed.

pub mod calibration;
pub mod checks;
pub mod files;
pub mod hourly;
pub mod html;
pub mod json;
pub mod state;
pub mod table;
pub mod weather;
pub mod xlsx;
