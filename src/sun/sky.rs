//! Plane-of-array irradiance: isotropic, HDKR, Perez 1990. Filled by the sun work.
