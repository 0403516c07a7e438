//! Thermophysical properties: water and steam (IAPWS-IF97 via `seuif97`), humid air.
//! Property routines know nothing of equipment, time or scenarios.

pub mod cubic;
pub mod fluids;
pub mod glycol;
pub mod libr;
pub mod psychro;
pub mod steam;
pub mod water;

/// Stefan–Boltzmann constant, W/(m²·K⁴) (CODATA 2018; exact in the 2019 SI).
pub const STEFAN_BOLTZMANN_W_M2K4: f64 = 5.670_374_419e-8;

/// Kelvin at 0 °C.
pub const KELVIN_0C: f64 = 273.15;
