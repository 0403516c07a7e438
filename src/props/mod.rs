//! Thermophysical properties: water and steam (IAPWS-IF97 via `seuif97`), humid air.
//! Property routines know nothing of equipment, time or scenarios.

pub mod cubic;
pub mod fluids;
pub mod glycol;
pub mod libr;
pub mod psychro;
pub mod steam;
pub mod water;
