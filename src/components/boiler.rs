//! Component boiler.
