//! Component pump.
