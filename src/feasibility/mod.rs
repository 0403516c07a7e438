//! feasibility layer (see DEVELOPERS.md).
