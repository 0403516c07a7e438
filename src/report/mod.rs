//! report layer (see DEVELOPERS.md).
