//! Component collector.
