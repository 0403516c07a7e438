//! Component hx.
