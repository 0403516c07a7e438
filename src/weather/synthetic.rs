//! Synthetic weather year from monthly normals. Filled by the weather work.
