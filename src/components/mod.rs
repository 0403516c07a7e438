//! One physical device each. A component knows its own physics and nothing of the hour loop
//! or of economics.

pub mod boiler;
pub mod chiller_electric;
pub mod collector;
pub mod field;
pub mod hx;
pub mod pcm;
pub mod pipe;
pub mod pump;
pub mod rankine;
pub mod tank;
pub mod vapour_compression;
