//! Component chiller_electric.
