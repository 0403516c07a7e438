//! Irradiance on a plane from horizontal irradiance: isotropic sky, HDKR, Perez 1990.
//!
//! Beam, sky-diffuse and ground-reflected parts stay separate, since collectors apply different
//! incidence angle modifiers to them. Ground reflection is isotropic in every model:
//! `G_ground = G_h ρ (1 − cos β)/2` (D&B 4th ed. eq. 2.15.1, last term).
//!
//! Conventions are those of pvlib-python (`pvlib.irradiance`, checked against pvlib 0.16.1 in
//! `reference/sky_pvlib.csv`), so the comparison is like for like: the same guards on cos θz in
//! Rb (HDKR: cos θz ≥ 0.01745; Perez: cos θz ≥ cos 85°), `max(cos θ, 0)`, `F1 ≥ 0`.
//!
//! Edge behaviour: negative or non-finite irradiances are taken as 0, albedo is clipped to
//! [0, 1], the HDKR anisotropy index `A_i` and `f²` are capped at 1 (they exceed 1 only for
//! inconsistent data, DNI > G_on or DNI cos θz > GHI; pvlib does not cap); with the sun at or below the horizon (θz ≥ 90°) the beam is 0 and both anisotropic
//! models fall back to the isotropic sky for whatever diffuse remains (pvlib's Perez returns 0
//! there because its air mass is undefined; this is the one deliberate difference). Every
//! output is finite and ≥ 0.

use crate::sun::incidence::Plane;
use crate::sun::position::SunPosition;

/// Sky diffuse model. Scenario names: `isotropic`, `hdkr`, `perez`.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum SkyModel {
    /// Uniform sky: `G_d,T = G_d (1 + cos β)/2` (Liu & Jordan; D&B 4th ed. §2.15).
    Isotropic,
    /// Hay–Davies–Klucher–Reindl (D&B 4th ed. §2.16, eq. 2.16.7).
    Hdkr,
    /// Perez et al. 1990, 'allsitescomposite1990' coefficients.
    #[serde(rename = "perez")]
    Perez1990,
}

/// Irradiance on a plane, by component, W/m².
#[derive(Debug, Clone, Copy, Default)]
pub struct PlaneIrradiance {
    /// Beam on the plane, W/m².
    pub beam_w_m2: f64,
    /// Diffuse from the sky dome (incl. circumsolar and horizon band), W/m².
    pub sky_diffuse_w_m2: f64,
    /// Reflected from the ground, W/m².
    pub ground_w_m2: f64,
    /// Angle of incidence of the beam, degrees (as passed in).
    pub aoi_deg: f64,
}

impl PlaneIrradiance {
    /// Total irradiance on the plane, beam + sky diffuse + ground, W/m².
    pub fn total_w_m2(&self) -> f64 {
        self.beam_w_m2 + self.sky_diffuse_w_m2 + self.ground_w_m2
    }

    /// Diffuse on the plane, sky + ground, W/m².
    pub fn diffuse_w_m2(&self) -> f64 {
        self.sky_diffuse_w_m2 + self.ground_w_m2
    }
}

/// Perez 1990 'allsitescomposite1990' coefficients by sky clearness bin:
/// `[f11, f12, f13, f21, f22, f23]`.
///
/// Source: R. Perez, P. Ineichen, R. Seals, J. Michalsky, R. Stewart, "Modeling daylight
/// availability and irradiance components from direct and global irradiance", Solar Energy
/// 44(5) 271–289 (1990), Table 6; values as tabulated in pvlib-python 0.16.1,
/// `pvlib/irradiance.py`, `_get_perez_coefficients('allsitescomposite1990')`.
const PEREZ_1990: [[f64; 6]; 8] = [
    [-0.0080, 0.5880, -0.0620, -0.0600, 0.0720, -0.0220],
    [0.1300, 0.6830, -0.1510, -0.0190, 0.0660, -0.0290],
    [0.3300, 0.4870, -0.2210, 0.0550, -0.0640, -0.0260],
    [0.5680, 0.1870, -0.2950, 0.1090, -0.1520, -0.0140],
    [0.8730, -0.3920, -0.3620, 0.2260, -0.4620, 0.0010],
    [1.1320, -1.2370, -0.4120, 0.2880, -0.8230, 0.0560],
    [1.0600, -1.6000, -0.3590, 0.2640, -1.1270, 0.1310],
    [0.6780, -0.3270, -0.2500, 0.1560, -1.3770, 0.2510],
];

/// Lower bounds of the Perez clearness bins 2..8 (bin 1 is ε < 1.065), Perez et al. 1990
/// Table 1 (as in pvlib).
const PEREZ_EPS_BOUNDS: [f64; 7] = [1.065, 1.23, 1.5, 1.95, 2.8, 4.5, 6.2];

/// `κ` of the clearness formula for zenith in radians (Perez et al. 1990, eq. 1).
const PEREZ_KAPPA: f64 = 1.041;

fn clean(x: f64) -> f64 {
    if x.is_finite() { x.max(0.0) } else { 0.0 }
}

/// Irradiance on a plane by component.
///
/// * `model` – sky diffuse model
/// * `plane` – tilt β and azimuth of the plane (as set by `incidence::track`), degrees
/// * `aoi_deg` – angle of incidence θ of the beam on that plane, degrees (from `track`)
/// * `sun` – zenith θz (apparent), air mass (relative, Kasten–Young) and extraterrestrial normal
///   irradiance G_on
/// * `ghi_w_m2`, `dni_w_m2`, `dhi_w_m2` – global horizontal, direct normal and diffuse
///   horizontal irradiance, W/m²
/// * `albedo` – ground reflectance ρ, 0..1
///
/// Returns `PlaneIrradiance` with
/// * beam `G_b,T = DNI max(cos θ, 0)` (0 when θz ≥ 90°);
/// * ground `G_h ρ (1 − cos β)/2`;
/// * sky diffuse by model:
///   - Isotropic: `DHI (1 + cos β)/2`;
///   - HDKR (D&B eq. 2.16.7, diffuse terms): `DHI [(1 − A_i)(1 + cos β)/2 (1 + f sin³(β/2))
///     + A_i R_b]`, `A_i = DNI/G_on`, `f = √(DNI cos θz / GHI)`,
///     `R_b = max(cos θ, 0)/max(cos θz, 0.01745)`;
///   - Perez 1990 (their eqs. 1, 2, 9 and Table 6): `DHI [(1 − F1)(1 + cos β)/2 + F1 a/b +
///     F2 sin β]` with `a = max(cos θ, 0)`, `b = max(cos θz, cos 85°)`,
///     `F1 = max(f11 + f12 Δ + f13 Z, 0)`, `F2 = f21 + f22 Δ + f23 Z`, Z = θz in radians,
///     brightness `Δ = DHI m / G_on`, clearness `ε = ((DHI + DNI)/DHI + κ Z³)/(1 + κ Z³)`
///     selecting the coefficient bin; clipped at 0.
///
/// Valid for 0 ≤ β ≤ 180°. Edge behaviour as in the module doc; zero irradiance gives zeros.
///
/// Sources: Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th ed., §2.15–2.16;
/// Perez, Ineichen, Seals, Michalsky, Stewart, Solar Energy 44(5) 271–289 (1990).
#[allow(clippy::too_many_arguments)]
pub fn plane_irradiance(
    model: SkyModel,
    plane: Plane,
    aoi_deg: f64,
    sun: &SunPosition,
    ghi_w_m2: f64,
    dni_w_m2: f64,
    dhi_w_m2: f64,
    albedo: f64,
) -> PlaneIrradiance {
    let ghi = clean(ghi_w_m2);
    let dni = clean(dni_w_m2);
    let dhi = clean(dhi_w_m2);
    let rho = if albedo.is_finite() {
        albedo.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let zenith = sun.zenith_deg;
    let sun_up = zenith.is_finite() && zenith < 90.0;
    let cos_th = if aoi_deg.is_finite() {
        aoi_deg.to_radians().cos().max(0.0)
    } else {
        0.0
    };
    let (sin_b, cos_b) = plane.tilt_deg.to_radians().sin_cos();
    let sky_view = (1.0 + cos_b) / 2.0;
    let beam = if sun_up { dni * cos_th } else { 0.0 };
    let ground = ghi * rho * (1.0 - cos_b) / 2.0;
    let g_on = sun.extra_normal_w_m2;
    let isotropic = dhi * sky_view;
    let sky = if !sun_up || dhi <= 0.0 || !(g_on.is_finite() && g_on > 0.0) {
        isotropic
    } else {
        let cos_z = zenith.to_radians().cos();
        match model {
            SkyModel::Isotropic => isotropic,
            SkyModel::Hdkr => {
                let a_i = (dni / g_on).min(1.0);
                let rb = cos_th / cos_z.max(0.01745);
                let f = if ghi > 0.0 {
                    (dni * cos_z.max(0.0) / ghi).min(1.0).sqrt()
                } else {
                    0.0
                };
                let s = (plane.tilt_deg.to_radians() / 2.0).sin();
                dhi * ((1.0 - a_i) * sky_view * (1.0 + f * s * s * s) + a_i * rb)
            }
            SkyModel::Perez1990 => {
                let z = zenith.to_radians();
                let kz3 = PEREZ_KAPPA * z * z * z;
                let eps = ((dhi + dni) / dhi + kz3) / (1.0 + kz3);
                let bin = PEREZ_EPS_BOUNDS.iter().filter(|&&b| eps >= b).count();
                let c = PEREZ_1990[bin];
                let delta = dhi * clean(sun.air_mass) / g_on;
                let f1 = (c[0] + c[1] * delta + c[2] * z).max(0.0);
                let f2 = c[3] + c[4] * delta + c[5] * z;
                let b = cos_z.max(85f64.to_radians().cos());
                dhi * ((1.0 - f1) * sky_view + f1 * cos_th / b + f2 * sin_b)
            }
        }
    };
    PlaneIrradiance {
        beam_w_m2: clean(beam),
        sky_diffuse_w_m2: clean(sky),
        ground_w_m2: clean(ground),
        aoi_deg,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sun::incidence::{Tracking, cos_aoi, track};
    use crate::sun::position::air_mass_kasten_young;

    fn sun(z: f64, a: f64) -> SunPosition {
        SunPosition {
            zenith_deg: z,
            azimuth_deg: a,
            extra_normal_w_m2: 1400.0,
            air_mass: air_mass_kasten_young(z),
            day_of_year: 10,
        }
    }

    const MODELS: [SkyModel; 3] = [SkyModel::Isotropic, SkyModel::Hdkr, SkyModel::Perez1990];

    /// On a horizontal plane every model returns DHI for the sky and 0 from the ground, and
    /// beam + sky = GHI when GHI = DNI cos θz + DHI (closure of the components; for Perez with
    /// β = 0 the circumsolar term F1 cos θz/b is exactly F1 for θz < 85°).
    #[test]
    fn horizontal_plane_closes() {
        let flat = Plane {
            tilt_deg: 0.0,
            azimuth_deg: 180.0,
        };
        let (z, dni, dhi) = (40.0_f64, 700.0, 120.0);
        let ghi = dni * z.to_radians().cos() + dhi;
        for m in MODELS {
            let s = sun(z, 150.0);
            let aoi = cos_aoi(flat, z, 150.0).acos().to_degrees();
            let r = plane_irradiance(m, flat, aoi, &s, ghi, dni, dhi, 0.2);
            assert!((r.sky_diffuse_w_m2 - dhi).abs() < 1e-9, "{m:?}");
            assert!(r.ground_w_m2.abs() < 1e-12);
            assert!((r.total_w_m2() - ghi).abs() < 1e-9, "{m:?}");
        }
    }

    /// Night, zero irradiance, garbage inputs: every output finite and ≥ 0; zeros when there is
    /// no irradiance.
    #[test]
    fn edges_are_finite_and_non_negative() {
        let values = [0.0, -5.0, f64::NAN, f64::INFINITY, 1e-9, 800.0];
        for m in MODELS {
            for mode in [
                Tracking::Fixed,
                Tracking::OneAxisNorthSouth,
                Tracking::TwoAxis,
            ] {
                for z in [0.0, 45.0, 84.9, 89.99, 90.0, 120.0, 180.0] {
                    let s = sun(z, 100.0);
                    let (p, aoi) = track(
                        mode,
                        Plane {
                            tilt_deg: 90.0,
                            azimuth_deg: 0.0,
                        },
                        &s,
                    );
                    for &g in &values {
                        for &d in &values {
                            let r = plane_irradiance(m, p, aoi, &s, g, d, d * 0.3, 0.2);
                            for v in [r.beam_w_m2, r.sky_diffuse_w_m2, r.ground_w_m2] {
                                assert!(v.is_finite() && v >= 0.0, "{m:?} z {z} g {g} d {d}");
                            }
                        }
                    }
                    let r = plane_irradiance(m, p, aoi, &s, 0.0, 0.0, 0.0, 0.2);
                    assert_eq!(r.total_w_m2(), 0.0);
                    if z >= 90.0 {
                        let r = plane_irradiance(m, p, aoi, &s, 30.0, 50.0, 30.0, 0.2);
                        assert_eq!(r.beam_w_m2, 0.0);
                    }
                }
            }
        }
    }

    /// Perez clearness bins: ε just above a bound uses the next bin (Perez et al. 1990 Table 1).
    #[test]
    fn perez_bins() {
        assert_eq!(PEREZ_EPS_BOUNDS.iter().filter(|&&b| 1.0 >= b).count(), 0);
        assert_eq!(PEREZ_EPS_BOUNDS.iter().filter(|&&b| 1.065 >= b).count(), 1);
        assert_eq!(PEREZ_EPS_BOUNDS.iter().filter(|&&b| 7.0 >= b).count(), 7);
    }
}
