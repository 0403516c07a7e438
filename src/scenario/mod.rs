//! scenario layer (see DEVELOPERS.md).
