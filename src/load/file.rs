//! Hourly load from a CSV file. Filled by the load work.
