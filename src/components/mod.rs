//! One physical device each. A component knows its own physics and nothing of the hour loop
//! or of economics.

pub mod absorption_cycle;
pub mod absorption_fit;
pub mod boiler;
pub mod chiller_electric;
pub mod collector;
pub mod cooling_tower;
pub mod desiccant_wheel;
pub mod evap_cooler;
pub mod field;
pub mod heat_wheel;
pub mod hx;
pub mod pcm;
pub mod pipe;
pub mod pump;
pub mod pv;
pub mod rankine;
pub mod tank;
pub mod vapour_compression;
