//! Component field.
