//! plant layer (see DEVELOPERS.md).
