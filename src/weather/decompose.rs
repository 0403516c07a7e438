//! Beam/diffuse decomposition of global horizontal irradiance (Erbs, Klein & Duffie 1982).
//!
//! Used when a weather file gives only global horizontal irradiance (GHI): the hourly diffuse
//! fraction follows from the hourly clearness index, the beam from closure
//! `GHI = DHI + DNI cos z`.
//!
//! Low-sun guards follow those of the reference library the model is checked against
//! (pvlib-python 0.16.1, `pvlib.irradiance.erbs` with its defaults): the clearness index is
//! formed with `cos z` floored at 0.065 (zenith 86.27°) and clipped to `[0, 1]`, and above a
//! zenith of 87° the beam is set to zero and all of GHI is diffuse. On top of that, DNI is
//! capped at the extraterrestrial normal irradiance (any excess beam goes to diffuse), a bound
//! pvlib does not apply; it only acts on physically impossible inputs (GHI near the
//! extraterrestrial value with the sun within a few degrees of the horizon).

/// Minimum `cos z` used to form the clearness index (pvlib 0.16.1 default, zenith 86.273°).
pub const MIN_COS_ZENITH: f64 = 0.065;

/// Zenith above which the beam is set to zero, degrees (pvlib 0.16.1 default).
pub const MAX_ZENITH_DEG: f64 = 87.0;

/// Erbs, Klein & Duffie (1982) hourly diffuse fraction `Id/I` from the hourly clearness
/// index `kt = I / I0`.
///
/// * `kt ≤ 0.22`: `1 − 0.09 kt`
/// * `0.22 < kt ≤ 0.80`: `0.9511 − 0.1604 kt + 4.388 kt² − 16.638 kt³ + 12.336 kt⁴`
/// * `kt > 0.80`: `0.165`
///
/// `kt` is dimensionless; negative values are treated as 0 (fraction 1). The result lies in
/// `[0.165, 1]`. Fitted to hourly data of US stations, `kt` 0 to about 0.9.
///
/// Source: D.G. Erbs, S.A. Klein, J.A. Duffie, "Estimation of the diffuse radiation fraction
/// for hourly, daily and monthly-average global radiation", Solar Energy 28(4) 293–302
/// (1982), eq. 1; Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed.,
/// eq. 2.10.1; the same coefficients as pvlib-python 0.16.1 `irradiance.erbs`.
pub fn erbs_diffuse_fraction(kt: f64) -> f64 {
    let kt = kt.max(0.0);
    if kt <= 0.22 {
        1.0 - 0.09 * kt
    } else if kt <= 0.80 {
        // Erbs et al. 1982 eq. 1 (D&B eq. 2.10.1).
        0.9511 - 0.1604 * kt + 4.388 * kt * kt - 16.638 * kt.powi(3) + 12.336 * kt.powi(4)
    } else {
        0.165
    }
}

/// Split global horizontal irradiance into `(DNI, DHI)`, W/m², by Erbs et al. (1982).
///
/// `kt = GHI / (G_on · max(cos z, 0.065))`, clipped to `[0, 1]`; `DHI = f(kt) · GHI` with
/// [`erbs_diffuse_fraction`]; `DNI = (GHI − DHI) / cos z`.
///
/// * `ghi_w_m2` – global horizontal irradiance, W/m²
/// * `zenith_deg` – solar zenith angle at the middle of the interval, degrees
/// * `extra_normal_w_m2` – extraterrestrial irradiance normal to the beam, W/m²
///   (e.g. `sun::geometry::extraterrestrial_normal_w_m2`)
///
/// Edge behaviour: `ghi ≤ 0` or non-finite inputs → `(0, 0)` (pvlib passes a negative GHI
/// through to DHI; here it is zeroed). Zenith above 87° (sun at or below the horizon
/// included) → `(0, GHI)`: all of it diffuse, so closure holds, as in pvlib. DNI is never
/// above `extra_normal_w_m2`; a beam that would exceed it is capped and the excess added to
/// DHI (not in pvlib, acts only on inputs above the physical limit).
///
/// Source: Erbs, Klein & Duffie, Solar Energy 28(4) 293–302 (1982), eq. 1; low-sun guards as
/// pvlib-python 0.16.1 `pvlib.irradiance.erbs` (min_cos_zenith = 0.065, max_zenith = 87).
pub fn erbs(ghi_w_m2: f64, zenith_deg: f64, extra_normal_w_m2: f64) -> (f64, f64) {
    if !(ghi_w_m2.is_finite() && zenith_deg.is_finite() && extra_normal_w_m2.is_finite())
        || ghi_w_m2 <= 0.0
        || extra_normal_w_m2 <= 0.0
    {
        return (0.0, 0.0);
    }
    if zenith_deg > MAX_ZENITH_DEG {
        return (0.0, ghi_w_m2);
    }
    let cos_z = zenith_deg.to_radians().cos();
    let kt = (ghi_w_m2 / (extra_normal_w_m2 * cos_z.max(MIN_COS_ZENITH))).clamp(0.0, 1.0);
    let dhi = erbs_diffuse_fraction(kt) * ghi_w_m2;
    let dni = ((ghi_w_m2 - dhi) / cos_z).max(0.0);
    if dni > extra_normal_w_m2 {
        let dni = extra_normal_w_m2;
        (dni, ghi_w_m2 - dni * cos_z)
    } else {
        (dni, dhi)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The three branches of Erbs et al. 1982 eq. 1 at hand-evaluated points:
    /// kt = 0.1 → 1 − 0.009 = 0.991; kt = 0.5 → 0.9511 − 0.0802 + 1.097 − 2.07975 + 0.771
    /// = 0.65915; kt = 0.9 → 0.165.
    #[test]
    fn diffuse_fraction_branches() {
        assert!((erbs_diffuse_fraction(0.1) - 0.991).abs() < 1e-12);
        assert!((erbs_diffuse_fraction(0.5) - 0.65915).abs() < 1e-12);
        assert_eq!(erbs_diffuse_fraction(0.9), 0.165);
        // Continuity at the breakpoints is only approximate in the published fit:
        // at 0.22 the upper branch gives 0.9511 − 0.035288 + 0.212379 − 0.177165 + 0.028884.
        let upper =
            0.9511 - 0.1604 * 0.22 + 4.388 * 0.0484 - 16.638 * 0.010648 + 12.336 * 0.00234256;
        assert!((erbs_diffuse_fraction(0.22) - upper).abs() < 0.01);
    }

    /// Closure GHI = DHI + DNI cos z, and the guards.
    #[test]
    fn closure_and_guards() {
        let (dni, dhi) = erbs(600.0, 40.0, 1400.0);
        let cz = 40f64.to_radians().cos();
        assert!((dhi + dni * cz - 600.0).abs() < 1e-9);
        assert_eq!(erbs(0.0, 40.0, 1400.0), (0.0, 0.0));
        assert_eq!(erbs(-3.0, 40.0, 1400.0), (0.0, 0.0));
        assert_eq!(erbs(5.0, 95.0, 1400.0), (0.0, 5.0));
        assert_eq!(erbs(f64::NAN, 40.0, 1400.0), (0.0, 0.0));
        // Impossible input near the horizon: DNI capped at the extraterrestrial value.
        let (dni, dhi) = erbs(150.0, 86.9, 1400.0);
        assert!(dni <= 1400.0 && dni.is_finite());
        let cz = 86.9f64.to_radians().cos();
        assert!((dhi + dni * cz - 150.0).abs() < 1e-9);
    }
}
