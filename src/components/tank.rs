//! Component tank.
