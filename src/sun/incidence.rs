//! Angle of incidence on fixed and tracking planes.
//!
//! Sun and plane directions in the project's convention: zenith angle from the vertical,
//! azimuths clockwise from north (90 = east, 180 = south), tilt from horizontal, degrees.
//!
//! Source: J.A. Duffie, W.A. Beckman, *Solar Engineering of Thermal Processes*, 4th ed.,
//! Wiley 2013, §1.6 (eq. 1.6.2/1.6.3) and §1.7 (tracking surfaces, eqs. 1.7.4 and 1.7.6).

use crate::error::Result;
use crate::sun::position::SunPosition;
use crate::validate::in_range;

/// How the collector plane follows the sun. Scenario names: `fixed`, `one-axis-ns`,
/// `one-axis-ew`, `two-axis`.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Tracking {
    /// The plane stays as given.
    Fixed,
    /// Horizontal north–south axis; the plane turns east–west to minimise the angle of
    /// incidence (D&B 4th ed. §1.7, eq. 1.7.6a/b).
    #[serde(rename = "one-axis-ns")]
    OneAxisNorthSouth,
    /// Horizontal east–west axis, continuously adjusted (D&B 4th ed. §1.7, eq. 1.7.4a/b).
    #[serde(rename = "one-axis-ew")]
    OneAxisEastWest,
    /// Plane held normal to the beam.
    TwoAxis,
}

/// A plane's orientation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Plane {
    /// Tilt from horizontal, degrees (0 = horizontal, 90 = vertical).
    pub tilt_deg: f64,
    /// Azimuth of the plane's outward normal projected on the ground, degrees clockwise
    /// from north (180 = facing south).
    pub azimuth_deg: f64,
}

impl Plane {
    /// A checked plane.
    ///
    /// * `tilt_deg` – tilt from horizontal, 0..=90 degrees
    /// * `azimuth_deg` – facing direction, clockwise from north, 0..=360 degrees
    ///
    /// Returns the plane, or `Error::Input` naming the key and its range.
    pub fn new(tilt_deg: f64, azimuth_deg: f64) -> Result<Plane> {
        in_range(
            "tilt_deg",
            tilt_deg,
            0.0,
            90.0,
            "plane tilt from horizontal, degrees",
        )?;
        in_range(
            "azimuth_deg",
            azimuth_deg,
            0.0,
            360.0,
            "plane azimuth clockwise from north, degrees",
        )?;
        Ok(Plane {
            tilt_deg,
            azimuth_deg,
        })
    }
}

/// Cosine of the angle of incidence of the beam on a plane.
///
/// `cos θ = cos θz cos β + sin θz sin β cos(γs − γ)` — D&B 4th ed. eq. 1.6.3, the zenith/azimuth
/// form of eq. 1.6.2 (the difference of azimuths is the same whether they are counted from
/// south, as there, or from north, as here).
///
/// * `plane` – tilt β and azimuth γ, degrees
/// * `zenith_deg` – solar zenith θz, degrees
/// * `azimuth_deg` – solar azimuth γs, degrees clockwise from north
///
/// Returns cos θ in [−1, 1]; negative when the sun is behind the plane. Non-finite input
/// gives NaN — callers pass checked positions.
///
/// Source: Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th ed., §1.6.
pub fn cos_aoi(plane: Plane, zenith_deg: f64, azimuth_deg: f64) -> f64 {
    let (sz, cz) = zenith_deg.to_radians().sin_cos();
    let (sb, cb) = plane.tilt_deg.to_radians().sin_cos();
    let c = cz * cb + sz * sb * (azimuth_deg - plane.azimuth_deg).to_radians().cos();
    c.clamp(-1.0, 1.0)
}

fn aoi_deg(plane: Plane, sun: &SunPosition) -> f64 {
    cos_aoi(plane, sun.zenith_deg, sun.azimuth_deg)
        .acos()
        .to_degrees()
}

/// The plane as the tracker sets it for this sun, and the angle of incidence.
///
/// * `mode` – tracking mode
/// * `fixed` – the plane for [`Tracking::Fixed`] (ignored by the trackers)
/// * `sun` – sun position (zenith, azimuth clockwise from north)
///
/// Returns the plane and the angle of incidence in degrees, 0..=180:
/// * `Fixed`: `fixed` and θ from [`cos_aoi`];
/// * `OneAxisNorthSouth`: `tan β = tan θz |sin γs|`, facing east (90°) in the morning half of
///   the sky and west (270°) in the afternoon half (D&B eq. 1.7.6b with the N–S axis);
///   `cos θ = (1 − sin²θz cos²γs)^½`, equal to D&B eq. 1.7.6a `(cos²θz + cos²δ sin²ω)^½`;
/// * `OneAxisEastWest`: `tan β = tan θz |cos γs|`, facing south (180°) when the sun is in the
///   southern half of the sky, north (0°) otherwise (D&B eq. 1.7.4b);
///   `cos θ = (1 − sin²θz sin²γs)^½`, equal to D&B eq. 1.7.4a `(1 − cos²δ sin²ω)^½`;
/// * `TwoAxis`: tilt θz, azimuth γs, θ = 0.
///
/// Edge behaviour: with the sun at or below the horizon (θz ≥ 90°) the trackers stow flat
/// (tilt 0°, azimuth 180°) and θ = θz; the beam is zero then anyway.
///
/// Source: Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th ed., §1.6–1.7.
pub fn track(mode: Tracking, fixed: Plane, sun: &SunPosition) -> (Plane, f64) {
    let z = sun.zenith_deg;
    let az = sun.azimuth_deg;
    if mode == Tracking::Fixed {
        return (fixed, aoi_deg(fixed, sun));
    }
    if z.is_nan() || z >= 90.0 {
        let flat = Plane {
            tilt_deg: 0.0,
            azimuth_deg: 180.0,
        };
        return (flat, aoi_deg(flat, sun));
    }
    let tan_z = z.to_radians().tan();
    let (s_az, c_az) = az.to_radians().sin_cos();
    let plane = match mode {
        Tracking::OneAxisNorthSouth => Plane {
            tilt_deg: (tan_z * s_az.abs()).atan().to_degrees(),
            azimuth_deg: if s_az >= 0.0 { 90.0 } else { 270.0 },
        },
        Tracking::OneAxisEastWest => Plane {
            tilt_deg: (tan_z * c_az.abs()).atan().to_degrees(),
            azimuth_deg: if c_az <= 0.0 { 180.0 } else { 0.0 },
        },
        Tracking::TwoAxis | Tracking::Fixed => Plane {
            tilt_deg: z,
            azimuth_deg: az,
        },
    };
    (plane, aoi_deg(plane, sun))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sun(z: f64, a: f64) -> SunPosition {
        SunPosition {
            zenith_deg: z,
            azimuth_deg: a,
            extra_normal_w_m2: 1367.0,
            air_mass: crate::sun::position::air_mass_kasten_young(z),
            day_of_year: 172,
        }
    }

    /// SPA report (Reda & Andreas, NREL/TP-560-34302, appendix A.5): zenith 50.11162°,
    /// azimuth 194.34024°, surface slope 30°, azimuth rotation −10° from south (10° east of
    /// south = 170° from north) → incidence 25.18700°.
    #[test]
    fn spa_report_incidence() {
        let p = Plane {
            tilt_deg: 30.0,
            azimuth_deg: 170.0,
        };
        let th = cos_aoi(p, 50.11162, 194.34024).acos().to_degrees();
        assert!((th - 25.18700).abs() < 1e-4, "θ = {th}");
    }

    /// Two-axis tracking: the beam is normal to the plane, θ = 0 (definition).
    #[test]
    fn two_axis_is_normal() {
        for (z, a) in [(10.0, 100.0), (45.0, 180.0), (85.0, 290.0), (60.0, 0.0)] {
            let (_, th) = track(
                Tracking::TwoAxis,
                Plane::new(0.0, 180.0).unwrap(),
                &sun(z, a),
            );
            assert!(th.abs() < 1e-6, "θ = {th}");
        }
    }

    /// Horizontal-axis trackers never see a larger angle than a horizontal plane (θ ≤ θz),
    /// and the tracked tilt gives the minimum θ over all rotations about the axis.
    #[test]
    fn one_axis_beats_horizontal() {
        let flat = Plane::new(0.0, 180.0).unwrap();
        for z in [5.0, 30.0, 60.0, 80.0, 89.0] {
            for a in [30.0, 95.0, 150.0, 200.0, 265.0, 330.0] {
                let s = sun(z, a);
                let (_, th_flat) = track(Tracking::Fixed, flat, &s);
                for mode in [Tracking::OneAxisNorthSouth, Tracking::OneAxisEastWest] {
                    let (p, th) = track(mode, flat, &s);
                    assert!(
                        th <= th_flat + 1e-9,
                        "{mode:?} z {z} a {a}: {th} > {th_flat}"
                    );
                    // No other rotation about the axis does better.
                    for r in -89..=89 {
                        let rot = f64::from(r);
                        let other = match mode {
                            Tracking::OneAxisNorthSouth => Plane {
                                tilt_deg: rot.abs(),
                                azimuth_deg: if rot >= 0.0 { 90.0 } else { 270.0 },
                            },
                            _ => Plane {
                                tilt_deg: rot.abs(),
                                azimuth_deg: if rot >= 0.0 { 180.0 } else { 0.0 },
                            },
                        };
                        let th_o = cos_aoi(other, z, a).acos().to_degrees();
                        assert!(th <= th_o + 1e-9, "{mode:?} {p:?} vs {other:?}");
                    }
                }
            }
        }
    }

    /// Sun below the horizon: trackers stow flat, all outputs finite.
    #[test]
    fn night_is_finite() {
        for mode in [
            Tracking::Fixed,
            Tracking::OneAxisNorthSouth,
            Tracking::OneAxisEastWest,
            Tracking::TwoAxis,
        ] {
            for z in [90.0, 95.0, 170.0, 180.0] {
                let (p, th) = track(mode, Plane::new(30.0, 180.0).unwrap(), &sun(z, 10.0));
                assert!(p.tilt_deg.is_finite() && th.is_finite() && (0.0..=180.0).contains(&th));
            }
        }
    }

    #[test]
    fn bad_plane_is_an_error() {
        assert!(Plane::new(-1.0, 180.0).is_err());
        assert!(Plane::new(30.0, 361.0).is_err());
        assert!(Plane::new(f64::NAN, 180.0).is_err());
    }
}
