//! Solar position by the NREL Solar Position Algorithm (SPA) and relative air mass.
//!
//! The sun's place is computed with the `solar-positioning` crate (v0.7, SPA of Reda & Andreas,
//! "Solar Position Algorithm for Solar Radiation Applications", NREL/TP-560-34302, 2003,
//! rev. 2008), through its numeric Julian-date interface; ΔT = TT − UT from the crate's
//! `delta_t::estimate`.
//!
//! Conventions of every position returned here:
//! * zenith: **topocentric and apparent** (refraction-corrected) — SPA step 3.14 with the
//!   report's refraction correction (its eq. 42) evaluated at the standard-atmosphere pressure
//!   of the site's elevation (ASHRAE 2017 ch. 1 eq. 3, `crate::props::psychro`) and a fixed
//!   air temperature of 15 °C; no correction when the geometric elevation is at or below
//!   −0.83337° (sun's radius + refraction at the horizon, as in the report);
//! * azimuth: clockwise from north, 0..360°;
//! * time: local standard time of the site's fixed UTC offset (no daylight saving).
//!
//! The hourly year ([`year_positions`]) evaluates SPA's location-independent part (heliocentric
//! series and nutation, steps 3.1–3.8, ~9 µs a call) with the crate once a day at 0 h UT and
//! interpolates the sun's geocentric right ascension, declination and distance to each hour
//! with a four-point Lagrange polynomial; the apparent sidereal time is the SPA expression
//! (eq. 12) plus the equation of the equinoxes from the four leading IAU 1980 nutation terms
//! (Meeus, *Astronomical Algorithms*, 2nd ed., ch. 22, accurate to 0.5″). The topocentric part
//! (steps 3.9–3.14) then runs for every hour. Against the crate's full SPA at every hour the
//! difference stays below 2e-4° (unit test `year_matches_full_spa_every_hour`).

use crate::error::{Error, Result};
use crate::props::psychro::pressure_at_elevation_kpa;
use crate::sun::geometry::extraterrestrial_normal_w_m2;
use crate::validate::in_range;
use solar_positioning::time::JulianDate;
use solar_positioning::{Location, RefractionCorrection, SolarPositions, delta_t};

/// Air temperature assumed in the refraction correction, °C (SPA report's form, eq. 42).
pub const REFRACTION_TEMPERATURE_C: f64 = 15.0;

/// Geometric elevation at or below which no refraction is applied, degrees
/// (−(0.26667 + 0.5667), SPA report §3.14).
const REFRACTION_CUTOFF_DEG: f64 = -0.83337;

/// Hours in the 365-day year of the simulation.
const HOURS: usize = 8760;

/// Days in each month of a 365-day year.
const MONTH_DAYS: [u32; 12] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/// A place on earth.
#[derive(Debug, Clone, Copy)]
pub struct Site {
    /// Latitude, degrees north positive, −90..=90.
    pub latitude_deg: f64,
    /// Longitude, degrees east positive, −180..=180.
    pub longitude_deg: f64,
    /// Elevation above sea level, m, −500..=9000.
    pub elevation_m: f64,
    /// Local standard time minus UTC, hours, −12..=14 (e.g. −7 for US Mountain Standard Time).
    pub utc_offset_h: f64,
}

/// The sun as seen from a site at one time.
#[derive(Debug, Clone, Copy)]
pub struct SunPosition {
    /// Topocentric zenith angle with atmospheric refraction (apparent), degrees, 0..=180.
    pub zenith_deg: f64,
    /// Topocentric azimuth, degrees clockwise from north, 0..360.
    pub azimuth_deg: f64,
    /// Extraterrestrial irradiance normal to the beam, W/m² (Duffie & Beckman eq. 1.4.1b,
    /// `crate::sun::geometry::extraterrestrial_normal_w_m2`).
    pub extra_normal_w_m2: f64,
    /// Relative air mass, Kasten & Young 1989, of the apparent zenith; 0.0 when zenith ≥ 90°.
    pub air_mass: f64,
    /// Day of the year, 1..=365 in [`year_positions`] (365-day year), 1..=366 in [`position_at`].
    pub day_of_year: u32,
}

/// Relative optical air mass, Kasten & Young (1989).
///
/// `m = 1 / (cos z + 0.50572 (96.07995 − z)^−1.6364)`, `z` the apparent zenith in degrees.
///
/// * `zenith_deg` – apparent (refraction-corrected) solar zenith angle, degrees
///
/// Returns m (dimensionless, 1.0 at the zenith, ≈ 38 at the horizon). Returns 0.0 — meaning
/// "no beam path" — for `zenith_deg ≥ 90` and for non-finite input; negative zenith is taken
/// as 0.
///
/// Source: F. Kasten, A.T. Young, "Revised optical air mass tables and approximation formula",
/// Applied Optics 28(22), 4735–4738 (1989).
pub fn air_mass_kasten_young(zenith_deg: f64) -> f64 {
    if !zenith_deg.is_finite() || zenith_deg >= 90.0 {
        return 0.0;
    }
    let z = zenith_deg.max(0.0);
    1.0 / (z.to_radians().cos() + 0.50572 * (96.07995 - z).powf(-1.6364))
}

/// Check a site; each field named with its allowed range.
fn check_site(site: &Site) -> Result<()> {
    in_range(
        "latitude_deg",
        site.latitude_deg,
        -90.0,
        90.0,
        "site latitude, degrees north",
    )?;
    in_range(
        "longitude_deg",
        site.longitude_deg,
        -180.0,
        180.0,
        "site longitude, degrees east",
    )?;
    in_range(
        "elevation_m",
        site.elevation_m,
        -500.0,
        9000.0,
        "site elevation above sea level, m",
    )?;
    in_range(
        "utc_offset_h",
        site.utc_offset_h,
        -12.0,
        14.0,
        "local standard time minus UTC, hours",
    )
}

/// Years the ΔT estimate covers.
fn check_year(year: i32) -> Result<()> {
    if (-500..=3000).contains(&year) {
        Ok(())
    } else {
        Err(Error::input(
            "year",
            year,
            "must be between -500 and 3000 (range of the ΔT estimate used with SPA)",
        ))
    }
}

/// Refraction correction at the standard pressure of the site's elevation and 15 °C.
fn refraction_for(site: &Site) -> Result<RefractionCorrection> {
    let p_mbar = 10.0 * pressure_at_elevation_kpa(site.elevation_m);
    RefractionCorrection::new(p_mbar, REFRACTION_TEMPERATURE_C).map_err(crate_error)
}

fn crate_error(e: solar_positioning::Error) -> Error {
    Error::Internal(format!("solar position: {e}"))
}

/// Julian day (UT) of 0 h UT on a Gregorian calendar date (Meeus ch. 7; the crate's calendar
/// constructor, validated).
fn julian_day_0h(year: i32, month: u32, day: u32) -> Result<f64> {
    JulianDate::from_utc(year, month, day, 0, 0, 0.0, 0.0)
        .map(|j| j.julian_date())
        .map_err(|e| Error::input("date", format!("{year}-{month}-{day}"), e.to_string()))
}

/// Month and day of month of day `n` (1..=365) of a 365-day year.
fn month_day_365(n: u32) -> (u32, u32) {
    let mut rest = n;
    for (i, &len) in MONTH_DAYS.iter().enumerate() {
        if rest <= len {
            return (i as u32 + 1, rest);
        }
        rest -= len;
    }
    (12, 31)
}

fn is_leap(year: i32) -> bool {
    (year % 4 == 0 && year % 100 != 0) || year % 400 == 0
}

/// Full SPA by the crate at a UT Julian day, with explicit ΔT and atmosphere. Returns
/// (apparent topocentric zenith, azimuth), degrees. Used by [`position_at`] and by the check
/// against the SPA report's worked example.
pub(crate) fn spa_full(
    site: &Site,
    jd_ut: f64,
    delta_t_s: f64,
    refraction: RefractionCorrection,
) -> Result<(f64, f64)> {
    let time = JulianDate::new(jd_ut, delta_t_s).map_err(crate_error)?;
    let location = Location {
        latitude: site.latitude_deg,
        longitude: site.longitude_deg,
    };
    let p = SolarPositions::new()
        .at_from_julian(time, location, site.elevation_m, Some(refraction))
        .map_err(crate_error)?;
    Ok((p.zenith_angle(), p.azimuth()))
}

fn sun_position(zenith_deg: f64, azimuth_deg: f64, day_of_year: u32) -> SunPosition {
    SunPosition {
        zenith_deg,
        azimuth_deg,
        extra_normal_w_m2: extraterrestrial_normal_w_m2(day_of_year),
        air_mass: air_mass_kasten_young(zenith_deg),
        day_of_year,
    }
}

/// The sun at a local standard time, by the crate's full SPA.
///
/// * `site` – the place (checked: latitude ±90°, longitude ±180°, elevation −500..9000 m,
///   UTC offset −12..14 h)
/// * `year`, `month` (1..=12), `day` (1..=days in that month of that year, leap years with
///   29 February) – calendar date, Gregorian
/// * `hour_decimal` – local standard time, hours after midnight, 0..=24
///
/// Returns the topocentric apparent zenith, azimuth (clockwise from north), extraterrestrial
/// normal irradiance and Kasten–Young air mass; `day_of_year` is the calendar day (1..=366).
/// ΔT from the crate's estimate for the month. Refraction as described in the module doc.
/// Bad site, date or time → `Error::Input`.
///
/// Source: Reda & Andreas, NREL/TP-560-34302 (2003, rev. 2008), via `solar-positioning` 0.7.
pub fn position_at(
    site: &Site,
    year: i32,
    month: u32,
    day: u32,
    hour_decimal: f64,
) -> Result<SunPosition> {
    check_site(site)?;
    check_year(year)?;
    in_range(
        "hour_decimal",
        hour_decimal,
        0.0,
        24.0,
        "local standard time, hours after midnight",
    )?;
    let jd0 = julian_day_0h(year, month, day)?;
    let jd = jd0 + (hour_decimal - site.utc_offset_h) / 24.0;
    let dt = delta_t::estimate_from_date(year, month).map_err(crate_error)?;
    let (zenith, azimuth) = spa_full(site, jd, dt, refraction_for(site)?)?;
    let leap_extra = u32::from(is_leap(year) && month > 2);
    let doy = MONTH_DAYS[..(month as usize - 1)].iter().sum::<u32>() + day + leap_extra;
    Ok(sun_position(zenith, azimuth, doy))
}

/// Geocentric sun at the daily interpolation nodes.
struct Node {
    alpha_deg: f64,
    delta_deg: f64,
    r_au: f64,
}

/// Four-point Lagrange interpolation on equally spaced nodes at −1, 0, 1, 2, at `t` in [0, 1).
fn lagrange4(y: [f64; 4], t: f64) -> f64 {
    let (a, b, c, d) = (t + 1.0, t, t - 1.0, t - 2.0);
    -y[0] * b * c * d / 6.0 + y[1] * a * c * d / 2.0 - y[2] * a * b * d / 2.0
        + y[3] * a * b * c / 6.0
}

/// Apparent Greenwich sidereal time, degrees (SPA eq. 12–15 mean sidereal time; nutation in
/// longitude from the four leading IAU 1980 terms, Meeus 2nd ed. ch. 22, in arc seconds).
fn apparent_sidereal_deg(jd_ut: f64, delta_t_s: f64) -> f64 {
    let jc = (jd_ut - 2_451_545.0) / 36_525.0;
    let nu0 = 280.460_618_37 + 360.985_647_366_29 * (jd_ut - 2_451_545.0) + 0.000_387_933 * jc * jc
        - jc * jc * jc / 38_710_000.0;
    let jce = (jd_ut + delta_t_s / 86_400.0 - 2_451_545.0) / 36_525.0;
    let omega = (125.044_52 - 1_934.136_261 * jce).to_radians();
    let l_sun = (280.4665 + 36_000.769_8 * jce).to_radians();
    let l_moon = (218.3165 + 481_267.881_3 * jce).to_radians();
    let dpsi_arcsec =
        -17.20 * omega.sin() - 1.32 * (2.0 * l_sun).sin() - 0.23 * (2.0 * l_moon).sin()
            + 0.21 * (2.0 * omega).sin();
    // Mean obliquity (Meeus eq. 22.2, leading terms), degrees.
    let eps = 23.439_291_1 - 0.013_004_2 * jce;
    (nu0 + dpsi_arcsec / 3600.0 * eps.to_radians().cos()).rem_euclid(360.0)
}

/// Site constants of SPA's topocentric step (report §3.10, eqs. 27–29).
struct Topo {
    sin_phi: f64,
    cos_phi: f64,
    x: f64,
    y: f64,
    lon: f64,
    refraction: f64, // (P/1010)(283/(273+T)) 1.02 / 60, degrees
}

impl Topo {
    fn new(site: &Site) -> Self {
        let phi = site.latitude_deg.to_radians();
        let u = (0.996_647_19 * phi.tan()).atan();
        let e = site.elevation_m / 6_378_140.0;
        let p_mbar = 10.0 * pressure_at_elevation_kpa(site.elevation_m);
        Topo {
            sin_phi: phi.sin(),
            cos_phi: phi.cos(),
            x: u.cos() + e * phi.cos(),
            y: 0.996_647_19 * u.sin() + e * phi.sin(),
            lon: site.longitude_deg,
            refraction: (p_mbar / 1010.0) * (283.0 / (273.0 + REFRACTION_TEMPERATURE_C)) * 1.02
                / 60.0,
        }
    }

    /// Apparent topocentric zenith and azimuth from the geocentric sun and sidereal time
    /// (report §3.9–3.14, eqs. 26–46).
    fn position(&self, nu_deg: f64, alpha_deg: f64, delta_deg: f64, r_au: f64) -> (f64, f64) {
        let h = (nu_deg + self.lon - alpha_deg).to_radians();
        let xi = (8.794 / (3600.0 * r_au)).to_radians();
        let (sin_h, cos_h) = h.sin_cos();
        let (sin_d, cos_d) = delta_deg.to_radians().sin_cos();
        let sin_xi = xi.sin();
        let den = cos_d - self.x * sin_xi * cos_h;
        let d_alpha = (-self.x * sin_xi * sin_h).atan2(den);
        let delta_p = ((sin_d - self.y * sin_xi) * d_alpha.cos()).atan2(den);
        let h_p = h - d_alpha;
        let (sin_dp, cos_dp) = delta_p.sin_cos();
        let (sin_hp, cos_hp) = h_p.sin_cos();
        let cos_z = (self.sin_phi * sin_dp + self.cos_phi * cos_dp * cos_hp).clamp(-1.0, 1.0);
        let e0 = 90.0 - cos_z.acos().to_degrees();
        let e = if e0 > REFRACTION_CUTOFF_DEG {
            e0 + self.refraction / (e0 + 10.3 / (e0 + 5.11)).to_radians().tan()
        } else {
            e0
        };
        let gamma = sin_hp
            .atan2(cos_hp * self.sin_phi - sin_dp / cos_dp * self.cos_phi)
            .to_degrees();
        (90.0 - e, (gamma + 180.0).rem_euclid(360.0))
    }
}

/// The sun at the middle of each hour of a 365-day year.
///
/// * `site` – the place (checked as in [`position_at`])
/// * `year` – calendar year, −500..=3000; in a leap year 29 February is skipped, so day n of
///   the 365-day year is the calendar date of day n of a common year (1 March is day 60)
///
/// Returns 8760 positions; entry `i` is the sun at `i + 0.5` h local standard time after
/// 1 January 00:00 (the middle of hour interval i), `day_of_year = i / 24 + 1`.
/// ΔT: the crate's estimate at mid-year (its effect on position is ~1e-5° per second).
/// The geocentric sun is interpolated between daily SPA evaluations as the module doc
/// describes (within 2e-4° of full SPA). Bad site or year → `Error::Input`.
///
/// Source: Reda & Andreas, NREL/TP-560-34302 (2003, rev. 2008), via `solar-positioning` 0.7;
/// sidereal-time nutation terms Meeus, *Astronomical Algorithms*, 2nd ed., ch. 22.
pub fn year_positions(site: &Site, year: i32) -> Result<Vec<SunPosition>> {
    check_site(site)?;
    check_year(year)?;
    let dt = delta_t::estimate(f64::from(year) + 0.5).map_err(crate_error)?;
    let jd_jan1 = julian_day_0h(year, 1, 1)?;
    // Nodes at 0 h UT daily from two days before 1 January to three days after 31 December
    // (covers any UTC offset and the 4-point stencil).
    let first_node = jd_jan1 - 2.0;
    let n_nodes = 366 + usize::from(is_leap(year)) + 5;
    let spa = SolarPositions::new();
    let mut nodes = Vec::with_capacity(n_nodes);
    let mut prev_alpha = f64::NAN;
    for k in 0..n_nodes {
        let time = JulianDate::new(first_node + k as f64, dt).map_err(crate_error)?;
        let prep = spa.for_time_from_julian(time).map_err(crate_error)?;
        // Unwrap right ascension so that it interpolates across 360 → 0.
        let mut alpha = prep.right_ascension();
        if prev_alpha.is_finite() {
            alpha += 360.0 * ((prev_alpha - alpha) / 360.0).round();
        }
        prev_alpha = alpha;
        nodes.push(Node {
            alpha_deg: alpha,
            delta_deg: prep.declination(),
            r_au: prep.earth_radius_vector().unwrap_or(1.0),
        });
    }
    let topo = Topo::new(site);
    let mut out = Vec::with_capacity(HOURS);
    for n in 1..=365u32 {
        let (month, day) = month_day_365(n);
        let jd_date = julian_day_0h(year, month, day)?;
        for hour in 0..24 {
            let jd = jd_date + (f64::from(hour) + 0.5 - site.utc_offset_h) / 24.0;
            let u = jd - first_node;
            let k = (u.floor() as usize).clamp(1, n_nodes - 3);
            let t = u - k as f64;
            let pick = |f: fn(&Node) -> f64| {
                lagrange4(
                    [
                        f(&nodes[k - 1]),
                        f(&nodes[k]),
                        f(&nodes[k + 1]),
                        f(&nodes[k + 2]),
                    ],
                    t,
                )
            };
            let alpha = pick(|p| p.alpha_deg);
            let delta = pick(|p| p.delta_deg);
            let r = pick(|p| p.r_au);
            let nu = apparent_sidereal_deg(jd, dt);
            let (zenith, azimuth) = topo.position(nu, alpha, delta, r);
            out.push(sun_position(zenith, azimuth, n));
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn golden() -> Site {
        Site {
            latitude_deg: 39.742476,
            longitude_deg: -105.1786,
            elevation_m: 1830.14,
            utc_offset_h: -7.0,
        }
    }

    /// Reda & Andreas, NREL/TP-560-34302, appendix A.5 example: 17 Oct 2003 12:30:30 local
    /// (UTC−7), ΔT = 67 s, 820 mbar, 11 °C → topocentric zenith 50.11162°, azimuth 194.34024°.
    #[test]
    fn spa_report_example() {
        let jd = julian_day_0h(2003, 10, 17).unwrap() + (12.0 + 30.5 / 60.0 + 7.0) / 24.0;
        let refr = RefractionCorrection::new(820.0, 11.0).unwrap();
        let (z, a) = spa_full(&golden(), jd, 67.0, refr).unwrap();
        assert!((z - 50.11162).abs() < 1e-5, "zenith {z}");
        assert!((a - 194.34024).abs() < 1e-5, "azimuth {a}");
    }

    /// Kasten & Young 1989: the formula gives m ≈ 1 overhead and ≈ 2 at z = 60° (plane-parallel
    /// limit 1/cos z, which holds to 0.3 % there: m(60°) = 1.9943); pvlib values are in reference/sky_pvlib.csv.
    #[test]
    fn kasten_young_values() {
        assert!((air_mass_kasten_young(0.0) - 1.0).abs() < 1e-3);
        assert!((air_mass_kasten_young(60.0) - 2.0).abs() < 0.006);
        assert_eq!(air_mass_kasten_young(90.0), 0.0);
        assert_eq!(air_mass_kasten_young(f64::NAN), 0.0);
        assert!(air_mass_kasten_young(89.9) > 30.0);
    }

    /// The interpolated hourly year agrees with the crate's full SPA at every hour
    /// (a site west of Greenwich, a southern one east of it, a leap year).
    #[test]
    fn year_matches_full_spa_every_hour() {
        let sites = [
            (golden(), 2023),
            (
                Site {
                    latitude_deg: -33.9,
                    longitude_deg: 151.2,
                    elevation_m: 40.0,
                    utc_offset_h: 10.0,
                },
                2024,
            ),
        ];
        for (site, year) in sites {
            let pos = year_positions(&site, year).unwrap();
            assert_eq!(pos.len(), 8760);
            let refr = refraction_for(&site).unwrap();
            let dt = delta_t::estimate(f64::from(year) + 0.5).unwrap();
            let mut worst: f64 = 0.0;
            for (i, p) in pos.iter().enumerate() {
                let (m, d) = month_day_365(i as u32 / 24 + 1);
                let jd = julian_day_0h(year, m, d).unwrap()
                    + ((i % 24) as f64 + 0.5 - site.utc_offset_h) / 24.0;
                let (z, a) = spa_full(&site, jd, dt, refr).unwrap();
                worst = worst.max((z - p.zenith_deg).abs());
                if z < 89.0 {
                    let da = (a - p.azimuth_deg + 540.0).rem_euclid(360.0) - 180.0;
                    worst = worst.max(da.abs() * (z.to_radians().sin()));
                }
            }
            eprintln!("year {year}: worst difference {worst:e} deg");
            assert!(worst < 2e-4, "worst difference {worst}° for {year}");
        }
    }

    /// Leap years skip 29 February: hour 59×24+12 of 2024 is 1 March 12:30.
    #[test]
    fn leap_year_skips_feb_29() {
        let site = golden();
        let year = year_positions(&site, 2024).unwrap();
        let at = position_at(&site, 2024, 3, 1, 12.5).unwrap();
        let p = year[59 * 24 + 12];
        assert_eq!(p.day_of_year, 60);
        assert_eq!(at.day_of_year, 61);
        assert!((p.zenith_deg - at.zenith_deg).abs() < 2e-4);
    }

    #[test]
    fn bad_input_is_an_error() {
        let mut s = golden();
        s.latitude_deg = 91.0;
        assert!(year_positions(&s, 2023).is_err());
        s = golden();
        s.longitude_deg = f64::NAN;
        assert!(position_at(&s, 2023, 6, 1, 12.0).is_err());
        assert!(position_at(&golden(), 2023, 2, 29, 12.0).is_err());
        assert!(position_at(&golden(), 2023, 13, 1, 12.0).is_err());
        assert!(position_at(&golden(), 2023, 6, 1, 25.0).is_err());
        assert!(year_positions(&golden(), 5000).is_err());
    }

    /// Poles and the date line give finite positions.
    #[test]
    fn extreme_sites_are_finite() {
        for (lat, lon, off) in [(90.0, 0.0, 0.0), (-90.0, 180.0, 12.0), (0.0, -180.0, -12.0)] {
            let s = Site {
                latitude_deg: lat,
                longitude_deg: lon,
                elevation_m: 0.0,
                utc_offset_h: off,
            };
            for p in year_positions(&s, 2023).unwrap() {
                assert!(p.zenith_deg.is_finite() && p.azimuth_deg.is_finite());
                assert!(p.air_mass >= 0.0 && p.air_mass.is_finite());
            }
        }
    }
}
