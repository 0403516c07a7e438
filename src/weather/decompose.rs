//! Beam/diffuse decomposition of global horizontal irradiance. Filled by the weather work.
