//! Range checks for input values, shared by every section of a scenario.
//!
//! Each returns an [`Error::Input`] naming the key, the value and the allowed range with its
//! meaning; the scenario layer adds the file and the key's section with [`Error::within`].

use crate::error::{Error, Result};

/// `lo <= value <= hi`, finite. `meaning` says what the key is, with its unit
/// (`"collector tilt from horizontal, degrees"`).
pub fn in_range(key: &str, value: f64, lo: f64, hi: f64, meaning: &str) -> Result<()> {
    if value.is_finite() && value >= lo && value <= hi {
        Ok(())
    } else {
        Err(Error::input(
            key,
            value,
            format!("must be between {lo} and {hi} ({meaning})"),
        ))
    }
}

/// `value > 0` and at most `hi`, finite.
pub fn positive(key: &str, value: f64, hi: f64, meaning: &str) -> Result<()> {
    if value.is_finite() && value > 0.0 && value <= hi {
        Ok(())
    } else {
        Err(Error::input(
            key,
            value,
            format!("must be > 0 and at most {hi} ({meaning})"),
        ))
    }
}

/// `lo < value < hi` (open interval), finite: effectivenesses, efficiencies.
pub fn open_range(key: &str, value: f64, lo: f64, hi: f64, meaning: &str) -> Result<()> {
    if value.is_finite() && value > lo && value < hi {
        Ok(())
    } else {
        Err(Error::input(
            key,
            value,
            format!("must be strictly between {lo} and {hi} ({meaning})"),
        ))
    }
}

/// A whole count between `lo` and `hi`.
pub fn count(key: &str, value: u32, lo: u32, hi: u32, meaning: &str) -> Result<()> {
    if (lo..=hi).contains(&value) {
        Ok(())
    } else {
        Err(Error::input(
            key,
            value,
            format!("must be a whole number from {lo} to {hi} ({meaning})"),
        ))
    }
}

/// Exactly `n` values (monthly lists: `n = 12`), each checked with `in_range`.
pub fn list(key: &str, values: &[f64], n: usize, lo: f64, hi: f64, meaning: &str) -> Result<()> {
    if values.len() != n {
        return Err(Error::input(
            key,
            format!("a list of {} values", values.len()),
            format!("must list exactly {n} values ({meaning})"),
        ));
    }
    for (i, v) in values.iter().enumerate() {
        in_range(&format!("{key}[{i}]"), *v, lo, hi, meaning)?;
    }
    Ok(())
}
