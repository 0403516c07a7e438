//! parhelion: screening solar-heat-driven cooling against a conventional electric chiller.
//!
//! Data flows one way (see `DEVELOPERS.md`):
//! scenario → weather and load → solar field → storage → cooling route → backup →
//! hourly records → monthly / annual figures → tables and files.

pub mod checks;
pub mod components;
pub mod error;
pub mod feasibility;
pub mod load;
pub mod num;
pub mod plant;
pub mod props;
pub mod report;
pub mod routes;
pub mod scenario;
pub mod sun;
pub mod validate;
pub mod weather;

pub use error::{Error, Result};

/// Caution printed under every table and in every report.
pub const SCREENING_CAUTION: &str = "Screening estimate only, not a plant design. Hot water and steam \
under pressure need pressure relief; stored warm water can grow Legionella; LiBr solution is corrosive; \
refrigerants and flammable working fluids need trained handling; collector arrays load roofs. Local codes \
and a licensed engineer decide.";
