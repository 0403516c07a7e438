//! Occupancy and set-point schedules. Filled by the load work.
