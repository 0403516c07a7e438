//! Angle of incidence on fixed and tracking planes. Filled by the sun work.
