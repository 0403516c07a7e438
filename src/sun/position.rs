//! Solar position by SPA (solar-positioning crate) and air mass. Filled by the sun work.
