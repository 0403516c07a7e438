//! ISO 13790:2008 simple hourly method (5R1C). Filled by the load work.
