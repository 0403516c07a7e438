//! Reference checks for the sun area (see `checks/mod.rs` for the table format).
//!
//! * `sun_spa_report.csv` – the SPA report's worked example (zenith, azimuth, incidence);
//! * `sun_duffie_beckman.csv` – Duffie & Beckman 4th ed. examples 1.6.1 and 1.6.2;
//! * computed – the tracking angles against D&B's closed forms eqs. 1.7.4a and 1.7.6a;
//! * `sun_position_pvlib.csv` – hourly positions against pvlib's SPA at two sites;
//! * `sun_tracking_pvlib.csv` – single-axis tracking against pvlib;
//! * `sky_pvlib.csv` – plane irradiance for the three sky models against pvlib (group `sky`).

use super::Check;
use super::table::{check, parse};
use crate::error::{Error, Result};
use crate::sun::geometry::{cos_zenith, declination_cooper_deg, extraterrestrial_normal_w_m2};
use crate::sun::incidence::{Plane, Tracking, cos_aoi, track};
use crate::sun::position::{
    Site, SunPosition, air_mass_kasten_young, position_at, spa_full, year_positions,
};
use crate::sun::sky::{SkyModel, plane_irradiance};
use solar_positioning::RefractionCorrection;

const SPA_REPORT: &str = include_str!("../../reference/sun_spa_report.csv");
const DUFFIE_BECKMAN: &str = include_str!("../../reference/sun_duffie_beckman.csv");
const POSITION_PVLIB: &str = include_str!("../../reference/sun_position_pvlib.csv");
const TRACKING_PVLIB: &str = include_str!("../../reference/sun_tracking_pvlib.csv");
const SKY_PVLIB: &str = include_str!("../../reference/sky_pvlib.csv");

/// Every sun and sky check.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    spa_report(&mut out)?;
    duffie_beckman(&mut out)?;
    tracking_closed_forms(&mut out);
    positions_pvlib(&mut out)?;
    tracking_pvlib(&mut out)?;
    sky_pvlib(&mut out)?;
    Ok(out)
}

/// An azimuth put on the expected value's side of the 0/360 cut, so the difference is the
/// angle between them.
fn near(azimuth_deg: f64, expected_deg: f64) -> f64 {
    expected_deg + ((azimuth_deg - expected_deg + 540.0).rem_euclid(360.0) - 180.0)
}

fn internal(table: &str, what: &str) -> Error {
    Error::Internal(format!("reference/{table}: {what}"))
}

fn spa_report(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "sun_spa_report.csv";
    for row in parse(T, SPA_REPORT)? {
        let site = Site {
            latitude_deg: row.f64("latitude_deg")?,
            longitude_deg: row.f64("longitude_deg")?,
            elevation_m: row.f64("elevation_m")?,
            utc_offset_h: row.f64("utc_offset_h")?,
        };
        let local_h = row.f64("hour")? + row.f64("minute")? / 60.0 + row.f64("second")? / 3600.0;
        // 0 h UT of the date (Meeus, Astronomical Algorithms, eq. 7.1; January/February are
        // not needed by this table).
        let (y, m, d) = (row.f64("year")?, row.f64("month")?, row.f64("day")?);
        let a = (y / 100.0).floor();
        let b = 2.0 - a + (a / 4.0).floor();
        let jd0 = (365.25 * (y + 4716.0)).floor() + (30.6001 * (m + 1.0)).floor() + d + b - 1524.5;
        let jd = jd0 + (local_h - site.utc_offset_h) / 24.0;
        let refr = RefractionCorrection::new(row.f64("pressure_mbar")?, row.f64("temperature_c")?)
            .map_err(|e| internal(T, &e.to_string()))?;
        let (zenith, azimuth) = spa_full(&site, jd, row.f64("delta_t_s")?, refr)?;
        let plane = Plane {
            tilt_deg: row.f64("slope_deg")?,
            azimuth_deg: 180.0 + row.f64("azimuth_rotation_deg")?,
        };
        let q = row.str("quantity")?;
        let value = match q {
            "zenith_deg" => zenith,
            "azimuth_deg" => azimuth,
            "aoi_deg" => cos_aoi(plane, zenith, azimuth).acos().to_degrees(),
            other => return Err(internal(T, &format!("unknown quantity {other}"))),
        };
        out.push(check(
            "sun",
            T,
            format!("SPA report example, {q}"),
            value,
            &row,
        )?);
    }
    Ok(())
}

/// Solar azimuth from latitude, declination and hour angle, degrees clockwise from north
/// (D&B 4th ed. eq. 1.6.6: `γs = sign(ω) |acos((cos θz sin φ − sin δ)/(sin θz cos φ))|`,
/// from south, then + 180).
fn db_zenith_azimuth(lat_deg: f64, decl_deg: f64, omega_deg: f64) -> (f64, f64) {
    let cz = cos_zenith(lat_deg, decl_deg, omega_deg).clamp(-1.0, 1.0);
    let z = cz.acos();
    let (phi, d) = (lat_deg.to_radians(), decl_deg.to_radians());
    let c = ((cz * phi.sin() - d.sin()) / (z.sin() * phi.cos())).clamp(-1.0, 1.0);
    let gamma = c.acos().to_degrees().copysign(omega_deg);
    (z.to_degrees(), 180.0 + gamma)
}

fn duffie_beckman(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "sun_duffie_beckman.csv";
    for row in parse(T, DUFFIE_BECKMAN)? {
        let (z, a) = db_zenith_azimuth(
            row.f64("latitude_deg")?,
            row.f64("declination_deg")?,
            row.f64("hour_angle_deg")?,
        );
        let plane = Plane {
            tilt_deg: row.f64("tilt_deg")?,
            azimuth_deg: row.f64("plane_azimuth_deg")?,
        };
        let q = row.str("quantity")?;
        let value = match q {
            "zenith_deg" => z,
            "azimuth_deg" => near(a, row.f64("expected")?),
            "cos_aoi" => cos_aoi(plane, z, a),
            "aoi_deg" => cos_aoi(plane, z, a).acos().to_degrees(),
            "declination_deg" => declination_cooper_deg(row.f64("day_of_year")? as u32),
            other => return Err(internal(T, &format!("unknown quantity {other}"))),
        };
        let case = format!("D&B Example {}, {q}", row.str("example")?);
        out.push(check("sun", T, case, value, &row)?);
    }
    Ok(())
}

fn sun_at(zenith_deg: f64, azimuth_deg: f64) -> SunPosition {
    SunPosition {
        zenith_deg,
        azimuth_deg,
        extra_normal_w_m2: extraterrestrial_normal_w_m2(172),
        air_mass: air_mass_kasten_young(zenith_deg),
        day_of_year: 172,
    }
}

/// Horizontal-axis trackers against D&B's closed forms in declination and hour angle
/// (independent of the zenith/azimuth form used by `track`).
fn tracking_closed_forms(out: &mut Vec<Check>) {
    let flat = Plane {
        tilt_deg: 0.0,
        azimuth_deg: 180.0,
    };
    for (lat, decl, omega) in [
        (40.0, 21.0, 30.0),
        (40.0, 21.0, 100.0),
        (40.0, -20.0, -45.0),
        (10.0, 5.0, 60.0),
        (-30.0, -23.0, -15.0),
        (55.0, 10.0, 75.0),
    ] {
        let (z, a) = db_zenith_azimuth(lat, decl, omega);
        let sun = sun_at(z, a);
        let (d, w) = (f64::to_radians(decl), f64::to_radians(omega));
        let ew = (1.0 - (d.cos() * w.sin()).powi(2))
            .sqrt()
            .acos()
            .to_degrees();
        let ns = ((z.to_radians().cos()).powi(2) + (d.cos() * w.sin()).powi(2))
            .sqrt()
            .acos()
            .to_degrees();
        for (mode, expected, eq) in [
            (
                Tracking::OneAxisEastWest,
                ew,
                "1.7.4a: cos θ = (1 − cos²δ sin²ω)^½",
            ),
            (
                Tracking::OneAxisNorthSouth,
                ns,
                "1.7.6a: cos θ = (cos²θz + cos²δ sin²ω)^½",
            ),
        ] {
            let (_, aoi) = track(mode, flat, &sun);
            out.push(Check {
                group: "sun",
                table: "computed",
                case: format!("{mode:?} φ {lat} δ {decl} ω {omega}, aoi_deg"),
                value: aoi,
                expected,
                tolerance: 1e-9,
                source: format!(
                    "Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., eq. {eq}"
                ),
            });
        }
    }
}

fn positions_pvlib(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "sun_position_pvlib.csv";
    const MONTH_DAYS: [u32; 12] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
    let mut cache: Vec<(f64, i32, Vec<SunPosition>)> = Vec::new();
    for row in parse(T, POSITION_PVLIB)? {
        let site = Site {
            latitude_deg: row.f64("latitude_deg")?,
            longitude_deg: row.f64("longitude_deg")?,
            elevation_m: row.f64("elevation_m")?,
            utc_offset_h: row.f64("utc_offset_h")?,
        };
        let year = row.f64("year")? as i32;
        let i = row.f64("hour_index")? as usize;
        if !cache
            .iter()
            .any(|(lat, y, _)| *lat == site.latitude_deg && *y == year)
        {
            cache.push((site.latitude_deg, year, year_positions(&site, year)?));
        }
        let hourly = cache
            .iter()
            .find(|(lat, y, _)| *lat == site.latitude_deg && *y == year)
            .map(|(_, _, v)| v)
            .ok_or_else(|| internal(T, "site cache"))?;
        let from_year = hourly
            .get(i)
            .copied()
            .ok_or_else(|| internal(T, &format!("hour_index {i} outside 0..8760")))?;
        let mut rest = (i / 24) as u32 + 1;
        let mut month = 1;
        for len in MONTH_DAYS {
            if rest <= len {
                break;
            }
            rest -= len;
            month += 1;
        }
        let at = position_at(&site, year, month, rest, (i % 24) as f64 + 0.5)?;
        let q = row.str("quantity")?;
        let expected = row.f64("expected")?;
        for (how, p) in [("year_positions", from_year), ("position_at", at)] {
            let value = match q {
                "zenith_deg" => p.zenith_deg,
                "azimuth_deg" => near(p.azimuth_deg, expected),
                other => return Err(internal(T, &format!("unknown quantity {other}"))),
            };
            let case = format!("{}, {how}, {q}", row.str("case")?);
            out.push(check("sun", T, case, value, &row)?);
        }
    }
    Ok(())
}

fn tracking_pvlib(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "sun_tracking_pvlib.csv";
    let flat = Plane {
        tilt_deg: 0.0,
        azimuth_deg: 180.0,
    };
    for row in parse(T, TRACKING_PVLIB)? {
        let mode = match row.str("mode")? {
            "one_axis_ns" => Tracking::OneAxisNorthSouth,
            "one_axis_ew" => Tracking::OneAxisEastWest,
            other => return Err(internal(T, &format!("unknown mode {other}"))),
        };
        let sun = sun_at(row.f64("zenith_deg")?, row.f64("azimuth_deg")?);
        let (plane, aoi) = track(mode, flat, &sun);
        let q = row.str("quantity")?;
        let value = match q {
            "aoi_deg" => aoi,
            "tilt_deg" => plane.tilt_deg,
            other => return Err(internal(T, &format!("unknown quantity {other}"))),
        };
        let case = format!("{}, {q}", row.str("case")?);
        out.push(check("sun", T, case, value, &row)?);
    }
    Ok(())
}

fn sky_pvlib(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "sky_pvlib.csv";
    for row in parse(T, SKY_PVLIB)? {
        let zenith = row.f64("zenith_deg")?;
        let doy = row.f64("day_of_year")? as u32;
        let sun = SunPosition {
            zenith_deg: zenith,
            azimuth_deg: row.f64("sun_azimuth_deg")?,
            extra_normal_w_m2: row.f64("dni_extra_w_m2")?,
            air_mass: air_mass_kasten_young(zenith),
            day_of_year: doy,
        };
        let plane = Plane {
            tilt_deg: row.f64("tilt_deg")?,
            azimuth_deg: row.f64("plane_azimuth_deg")?,
        };
        let aoi = cos_aoi(plane, zenith, sun.azimuth_deg).acos().to_degrees();
        let model = match row.str("model")? {
            "any" | "isotropic" => SkyModel::Isotropic,
            "hdkr" => SkyModel::Hdkr,
            "perez" => SkyModel::Perez1990,
            other => return Err(internal(T, &format!("unknown model {other}"))),
        };
        let r = plane_irradiance(
            model,
            plane,
            aoi,
            &sun,
            row.f64("ghi_w_m2")?,
            row.f64("dni_w_m2")?,
            row.f64("dhi_w_m2")?,
            row.f64("albedo")?,
        );
        let q = row.str("quantity")?;
        let value = match q {
            "aoi_deg" => aoi,
            "airmass" => sun.air_mass,
            "dni_extra" => extraterrestrial_normal_w_m2(doy),
            "beam" => r.beam_w_m2,
            "ground" => r.ground_w_m2,
            "sky_diffuse" => r.sky_diffuse_w_m2,
            other => return Err(internal(T, &format!("unknown quantity {other}"))),
        };
        let case = format!("{} {}, {q}", row.str("case")?, row.str("model")?);
        out.push(check("sky", T, case, value, &row)?);
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every sun and sky check passes; prints the worst relative use of tolerance per table.
    #[test]
    fn all_sun_checks_pass() {
        let checks = checks().unwrap();
        assert!(checks.len() > 300, "{} checks", checks.len());
        let mut failed = Vec::new();
        for c in &checks {
            if !c.passed() {
                failed.push(format!(
                    "{} {}: {} vs {} (tol {})",
                    c.table, c.case, c.value, c.expected, c.tolerance
                ));
            }
        }
        let mut worst: Vec<(String, f64, f64)> = Vec::new();
        for c in &checks {
            let key = format!("{} {}", c.table, c.case.rsplit(", ").next().unwrap_or(""));
            let d = (c.value - c.expected).abs();
            match worst.iter_mut().find(|w| w.0 == key) {
                Some(w) => {
                    if d > w.1 {
                        w.1 = d;
                        w.2 = c.tolerance;
                    }
                }
                None => worst.push((key, d, c.tolerance)),
            }
        }
        for (k, d, t) in &worst {
            eprintln!("{k}: worst |diff| {d:.3e} (tolerance {t})");
        }
        assert!(failed.is_empty(), "failed:\n{}", failed.join("\n"));
    }
}
