//! The sun: position (SPA), sun–earth geometry, angle of incidence on fixed and tracking
//! planes, air mass, and plane-of-array irradiance by sky model.
//!
//! Convention everywhere: azimuths clockwise from north (90 = east, 180 = south), tilt from
//! horizontal, angles in degrees.

pub mod geometry;
pub mod incidence;
pub mod position;
pub mod sky;
