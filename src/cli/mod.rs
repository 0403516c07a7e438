//! Command-line helpers of the binary.

pub mod explore;
