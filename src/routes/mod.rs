//! routes layer (see DEVELOPERS.md).
