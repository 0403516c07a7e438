//! Weather from a CSV file: one header line naming the columns, then one row per hour of the
//! year, in order (no timestamp column is read).
//!
//! * `interval = "ending"` or `"beginning"`: each row is the average over one hour, the first
//!   row covering 1 January 00:00–01:00 local standard time. The two names only differ in how a
//!   source labels that interval (01:00 or 00:00); the data are used the same way.
//! * `interval = "instant"`: rows are samples at 00:00, 01:00, … 23:00; the interval means are
//!   the averages of consecutive samples, the last one paired with the first (the year wraps).
//!
//! Exactly 8760 data rows, or 8784 (a leap year) with `drop_feb29 = true`, which drops the 24
//! rows of day 60. When DNI or DHI is missing both are derived from GHI by Erbs et al. (1982)
//! with the sun at mid-interval from the closed forms of `sun::geometry`.
//!
//! Every problem in the file is an `Error::Input` whose `file` is the CSV path and whose key is
//! `line N, column NAME` (or `header`), with the value found and what is allowed.

use super::{HOURS, Humidity, WeatherHour, WeatherYear, calendar, decompose};
use crate::error::{Error, Result};
use crate::sun::geometry as geo;
use crate::validate;
use std::path::Path;

/// Rows in a leap year's file.
const LEAP_HOURS: usize = 8784;
/// First row of 29 February (day 60) in a leap year's file.
const FEB29_FIRST_ROW: usize = 59 * 24;

fn one() -> usize {
    1
}

/// Time convention of the rows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Interval {
    /// Hourly averages labelled by the end of the hour (first row 00:00–01:00).
    Ending,
    /// Hourly averages labelled by the start of the hour (first row 00:00–01:00).
    Beginning,
    /// Instantaneous samples on the hour, first at 00:00.
    Instant,
}

/// Header names of the columns to read. Exactly one of `rh`, `t_dew`, `w`.
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Columns {
    /// Global horizontal irradiance.
    pub ghi: String,
    /// Direct normal irradiance (with `dhi`; if either is missing both come from Erbs).
    pub dni: Option<String>,
    /// Diffuse horizontal irradiance.
    pub dhi: Option<String>,
    /// Dry-bulb temperature.
    pub t_db: String,
    /// Relative humidity.
    pub rh: Option<String>,
    /// Dew-point temperature.
    pub t_dew: Option<String>,
    /// Humidity ratio.
    pub w: Option<String>,
    /// Wind speed.
    pub wind: Option<String>,
    /// Barometric pressure.
    pub pressure: Option<String>,
}

/// Irradiance unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum IrradianceUnit {
    /// W/m².
    #[serde(rename = "W/m2")]
    WM2,
    /// kW/m².
    #[serde(rename = "kW/m2")]
    KwM2,
}

/// Temperature unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum TemperatureUnit {
    /// Degrees Celsius.
    C,
    /// Kelvin.
    K,
}

/// Relative-humidity unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum RhUnit {
    /// Percent, 0–100.
    #[serde(rename = "%")]
    Percent,
    /// Fraction, 0–1.
    #[serde(rename = "fraction")]
    Fraction,
}

/// Humidity-ratio unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum RatioUnit {
    /// kg water per kg dry air.
    #[serde(rename = "kg/kg")]
    KgKg,
    /// g water per kg dry air.
    #[serde(rename = "g/kg")]
    GKg,
}

/// Pressure unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum PressureUnit {
    /// Kilopascal.
    #[serde(rename = "kPa")]
    KPa,
    /// Hectopascal (millibar).
    #[serde(rename = "hPa")]
    HPa,
    /// Pascal.
    #[serde(rename = "Pa")]
    Pa,
}

/// Wind-speed unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum WindUnit {
    /// Metres per second.
    #[serde(rename = "m/s")]
    MS,
}

/// Unit of each quantity read; required for every column named in [`Columns`] (no silent
/// default: a kW/m² column read as W/m² would pass every range check).
#[derive(Debug, Clone, Default, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Units {
    /// `"W/m2"` or `"kW/m2"`.
    pub ghi: Option<IrradianceUnit>,
    /// `"W/m2"` or `"kW/m2"`.
    pub dni: Option<IrradianceUnit>,
    /// `"W/m2"` or `"kW/m2"`.
    pub dhi: Option<IrradianceUnit>,
    /// `"C"` or `"K"`.
    pub t_db: Option<TemperatureUnit>,
    /// `"C"` or `"K"`.
    pub t_dew: Option<TemperatureUnit>,
    /// `"%"` or `"fraction"`.
    pub rh: Option<RhUnit>,
    /// `"kg/kg"` or `"g/kg"`.
    pub w: Option<RatioUnit>,
    /// `"kPa"`, `"hPa"` or `"Pa"`.
    pub pressure: Option<PressureUnit>,
    /// `"m/s"`.
    pub wind: Option<WindUnit>,
}

/// How to read a weather CSV file.
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FileSpec {
    /// Path of the CSV file, relative to the scenario's folder.
    pub path: String,
    /// 1-based line number of the header (default 1); data rows follow it.
    #[serde(default = "one")]
    pub header_row: usize,
    /// Time convention of the rows.
    pub interval: Interval,
    /// Drop 29 February (the 24 rows of day 60) from a leap year's 8784 rows.
    #[serde(default)]
    pub drop_feb29: bool,
    /// Header names of the columns.
    pub columns: Columns,
    /// Unit of each column.
    pub units: Units,
}

/// What a column holds, for conversion and range checks.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Q {
    Ghi,
    Dni,
    Dhi,
    Tdb,
    Rh,
    Tdew,
    W,
    Wind,
    P,
}

/// One column to read: where it is, how to convert it (`x·factor + offset`) and its range.
struct Col {
    q: Q,
    name: String,
    idx: usize,
    factor: f64,
    offset: f64,
    lo: f64,
    hi: f64,
    meaning: &'static str,
    data: Vec<f64>,
}

fn missing_unit(field: &str) -> Error {
    Error::input(
        format!("units.{field}"),
        "missing",
        format!("give the unit of columns.{field}"),
    )
}

/// The columns the spec asks for, with conversion and range (index filled later).
fn wanted(spec: &FileSpec) -> Result<Vec<Col>> {
    let c = &spec.columns;
    let u = &spec.units;
    let humid = [c.rh.is_some(), c.t_dew.is_some(), c.w.is_some()]
        .iter()
        .filter(|&&b| b)
        .count();
    if humid != 1 {
        return Err(Error::input(
            "columns",
            format!("{humid} humidity columns"),
            "name exactly one of rh, t_dew, w",
        ));
    }
    let irr = |u: Option<IrradianceUnit>, f: &str| -> Result<f64> {
        match u.ok_or_else(|| missing_unit(f))? {
            IrradianceUnit::WM2 => Ok(1.0),
            IrradianceUnit::KwM2 => Ok(1000.0),
        }
    };
    let temp = |u: Option<TemperatureUnit>, f: &str| -> Result<f64> {
        match u.ok_or_else(|| missing_unit(f))? {
            TemperatureUnit::C => Ok(0.0),
            TemperatureUnit::K => Ok(-273.15),
        }
    };
    let col = |q, name: &String, factor, offset, lo, hi, meaning| Col {
        q,
        name: name.clone(),
        idx: 0,
        factor,
        offset,
        lo,
        hi,
        meaning,
        data: Vec::with_capacity(LEAP_HOURS),
    };
    let irr_m = "irradiance, W/m²";
    let mut out = vec![col(
        Q::Ghi,
        &c.ghi,
        irr(u.ghi, "ghi")?,
        0.0,
        0.0,
        1500.0,
        "global horizontal irradiance, W/m²",
    )];
    if let Some(n) = &c.dni {
        out.push(col(Q::Dni, n, irr(u.dni, "dni")?, 0.0, 0.0, 1500.0, irr_m));
    }
    if let Some(n) = &c.dhi {
        out.push(col(Q::Dhi, n, irr(u.dhi, "dhi")?, 0.0, 0.0, 1500.0, irr_m));
    }
    out.push(col(
        Q::Tdb,
        &c.t_db,
        1.0,
        temp(u.t_db, "t_db")?,
        -60.0,
        70.0,
        "dry-bulb temperature, °C",
    ));
    if let Some(n) = &c.rh {
        let f = match u.rh.ok_or_else(|| missing_unit("rh"))? {
            RhUnit::Percent => 1.0,
            RhUnit::Fraction => 100.0,
        };
        out.push(col(Q::Rh, n, f, 0.0, 0.0, 100.0, "relative humidity, %"));
    }
    if let Some(n) = &c.t_dew {
        let off = temp(u.t_dew, "t_dew")?;
        out.push(col(Q::Tdew, n, 1.0, off, -80.0, 60.0, "dew point, °C"));
    }
    if let Some(n) = &c.w {
        let f = match u.w.ok_or_else(|| missing_unit("w"))? {
            RatioUnit::KgKg => 1.0,
            RatioUnit::GKg => 1e-3,
        };
        out.push(col(Q::W, n, f, 0.0, 0.0, 0.06, "humidity ratio, kg/kg"));
    }
    if let Some(n) = &c.wind {
        u.wind.ok_or_else(|| missing_unit("wind"))?;
        out.push(col(Q::Wind, n, 1.0, 0.0, 0.0, 75.0, "wind speed, m/s"));
    }
    if let Some(n) = &c.pressure {
        let f = match u.pressure.ok_or_else(|| missing_unit("pressure"))? {
            PressureUnit::KPa => 1.0,
            PressureUnit::HPa => 0.1,
            PressureUnit::Pa => 1e-3,
        };
        out.push(col(
            Q::P,
            n,
            f,
            0.0,
            50.0,
            110.0,
            "barometric pressure, kPa",
        ));
    }
    Ok(out)
}

fn input(
    file: &str,
    key: impl Into<String>,
    value: impl ToString,
    allowed: impl Into<String>,
) -> Error {
    Error::Input {
        file: file.to_string(),
        key: key.into(),
        value: value.to_string(),
        allowed: allowed.into(),
    }
}

/// Read a weather year from a CSV file.
///
/// * `spec` – what to read (see [`FileSpec`])
/// * `base_dir` – folder `spec.path` is relative to (the scenario's folder)
/// * `latitude_deg`, `longitude_deg` (east positive), `utc_offset_h` – the site, used only to
///   derive DNI/DHI with Erbs when the file lacks them
///
/// Returns 8760 hours in the `weather` interval convention; `derived_beam_diffuse` is
/// `Some("Erbs et al. 1982")` when beam and diffuse were derived (zenith at mid-interval:
/// Spencer declination, equation of time and solar time of `sun::geometry`, extraterrestrial
/// normal irradiance by D&B eq. 1.4.1b); DNI and DHI given in the file are kept as they are.
/// `p_kpa` and `wind_m_s` are `Some` when the columns are given.
///
/// Checked ranges (after unit conversion): irradiances 0–1500 W/m², dry-bulb −60–70 °C,
/// dew point −80–60 °C, RH 0–100 %, humidity ratio 0–0.06 kg/kg, wind 0–75 m/s, pressure
/// 50–110 kPa. Errors: unreadable file (`Error::Read`), empty file, missing or duplicated
/// header, non-numeric or non-finite cell, out-of-range value, wrong row count — each an
/// `Error::Input` naming the file, the line and column, the value and what is allowed.
pub fn read(
    spec: &FileSpec,
    base_dir: &Path,
    latitude_deg: f64,
    longitude_deg: f64,
    utc_offset_h: f64,
) -> Result<WeatherYear> {
    if spec.header_row == 0 {
        return Err(Error::input(
            "header_row",
            0,
            "1-based line number of the header line (1 = first line)",
        ));
    }
    let mut cols = wanted(spec)?;
    let path = base_dir.join(&spec.path);
    let file = path.display().to_string();
    let bytes = std::fs::read(&path).map_err(|source| Error::Read {
        path: path.clone(),
        source,
    })?;
    if bytes.iter().all(u8::is_ascii_whitespace) {
        return Err(input(
            &file,
            "header",
            "empty file",
            format!(
                "a header at line {} followed by {HOURS} hourly rows",
                spec.header_row
            ),
        ));
    }

    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .trim(csv::Trim::All)
        .from_reader(bytes.as_slice());
    let mut rec = csv::ByteRecord::new();
    let read_rec = |rdr: &mut csv::Reader<&[u8]>, rec: &mut csv::ByteRecord| -> Result<bool> {
        rdr.read_byte_record(rec).map_err(|e| {
            let line = e.position().map_or(0, |p| p.line());
            input(
                &file,
                format!("line {line}"),
                "unreadable CSV",
                e.to_string(),
            )
        })
    };

    // Header: the first record at or after `header_row`.
    let mut header_line = 0u64;
    while read_rec(&mut rdr, &mut rec)? {
        let line = rec.position().map_or(0, |p| p.line());
        if line >= spec.header_row as u64 {
            header_line = line;
            break;
        }
    }
    if header_line == 0 {
        return Err(input(
            &file,
            "header",
            format!("no line {}", spec.header_row),
            "header_row must point at the header line inside the file",
        ));
    }
    let headers: Vec<String> = rec
        .iter()
        .enumerate()
        .map(|(i, h)| {
            let s = String::from_utf8_lossy(h);
            let s = if i == 0 {
                s.trim_start_matches('\u{feff}')
            } else {
                &s
            };
            s.trim().to_string()
        })
        .collect();
    for (i, h) in headers.iter().enumerate() {
        if h.is_empty() {
            continue;
        }
        if let Some(j) = headers[i + 1..].iter().position(|g| g == h) {
            return Err(input(
                &file,
                "header",
                h,
                format!(
                    "each column name must appear once; `{h}` is column {} and column {} of line {header_line}",
                    i + 1,
                    i + j + 2
                ),
            ));
        }
    }
    for c in &mut cols {
        match headers.iter().position(|h| *h == c.name) {
            Some(i) => c.idx = i,
            None => {
                let near = headers
                    .iter()
                    .filter(|h| strsim::jaro_winkler(h, &c.name) > 0.85)
                    .map(|h| format!(" (did you mean `{h}`?)"))
                    .next()
                    .unwrap_or_default();
                return Err(input(
                    &file,
                    "header",
                    &c.name,
                    format!(
                        "no column named `{}` in line {header_line}{near}; headers found: {}",
                        c.name,
                        headers.join(", ")
                    ),
                ));
            }
        }
    }

    // Data rows.
    let mut rows = 0usize;
    let mut last_line = header_line;
    while read_rec(&mut rdr, &mut rec)? {
        let line = rec.position().map_or(0, |p| p.line());
        last_line = line;
        rows += 1;
        if rows > LEAP_HOURS {
            continue; // counted for the error below, not stored
        }
        for c in &mut cols {
            let key = || format!("line {line}, column {}", c.name);
            let cell = rec.get(c.idx).ok_or_else(|| {
                input(
                    &file,
                    key(),
                    "missing cell",
                    format!("a number ({})", c.meaning),
                )
            })?;
            let text = std::str::from_utf8(cell).unwrap_or("(not UTF-8)");
            let x: f64 = text.parse().map_err(|_| {
                input(
                    &file,
                    key(),
                    format!("`{text}`"),
                    format!("a number ({})", c.meaning),
                )
            })?;
            if !x.is_finite() {
                return Err(input(
                    &file,
                    key(),
                    text,
                    format!("a finite number ({})", c.meaning),
                ));
            }
            let v = x * c.factor + c.offset;
            if !(v >= c.lo && v <= c.hi) {
                return Err(input(
                    &file,
                    key(),
                    text,
                    format!(
                        "must be between {} and {} after unit conversion ({}; read as {v})",
                        c.lo, c.hi, c.meaning
                    ),
                ));
            }
            c.data.push(v);
        }
    }

    match rows {
        HOURS => {}
        LEAP_HOURS if spec.drop_feb29 => {
            for c in &mut cols {
                c.data.drain(FEB29_FIRST_ROW..FEB29_FIRST_ROW + 24);
            }
        }
        LEAP_HOURS => {
            return Err(input(
                &file,
                format!("line {last_line}"),
                format!("{rows} data rows"),
                "8784 rows is a leap year: set drop_feb29 = true to drop 29 February",
            ));
        }
        _ => {
            return Err(input(
                &file,
                format!("line {last_line}"),
                format!("{rows} data rows (data ended at line {last_line})"),
                format!(
                    "exactly {HOURS} hourly rows after the header at line {header_line} \
                     ({LEAP_HOURS} with drop_feb29 = true)"
                ),
            ));
        }
    }

    if spec.interval == Interval::Instant {
        for c in &mut cols {
            let first = c.data[0];
            for i in 0..HOURS {
                let next = if i + 1 < HOURS { c.data[i + 1] } else { first };
                c.data[i] = 0.5 * (c.data[i] + next);
            }
        }
    }

    let get = |q: Q| cols.iter().find(|c| c.q == q).map(|c| c.data.as_slice());
    let ghi = get(Q::Ghi).ok_or_else(|| Error::Internal("ghi column".into()))?;
    let t_db = get(Q::Tdb).ok_or_else(|| Error::Internal("t_db column".into()))?;
    let (rh, tdew, w) = (get(Q::Rh), get(Q::Tdew), get(Q::W));
    let (wind, p) = (get(Q::Wind), get(Q::P));
    let beam = match (get(Q::Dni), get(Q::Dhi)) {
        (Some(dni), Some(dhi)) => Some((dni, dhi)),
        _ => None,
    };
    if beam.is_none() {
        validate::in_range(
            "latitude_deg",
            latitude_deg,
            -90.0,
            90.0,
            "site latitude, degrees",
        )?;
        validate::in_range(
            "longitude_deg",
            longitude_deg,
            -180.0,
            180.0,
            "site longitude, degrees east",
        )?;
        validate::in_range(
            "utc_offset_h",
            utc_offset_h,
            -12.0,
            14.0,
            "standard-time offset from UTC, hours",
        )?;
    }

    let mut hours = Vec::with_capacity(HOURS);
    let (mut decl, mut g_on, mut day) = (0.0, 0.0, 0u32);
    for i in 0..HOURS {
        let (dni, dhi) = match beam {
            Some((dni, dhi)) => (dni[i], dhi[i]),
            None => {
                let (_, _, hour, doy) = calendar(i);
                if doy != day {
                    day = doy;
                    decl = geo::declination_spencer_deg(doy);
                    g_on = geo::extraterrestrial_normal_w_m2(doy);
                }
                let solar = geo::solar_time_h(hour as f64 + 0.5, doy, longitude_deg, utc_offset_h);
                let cz = geo::cos_zenith(latitude_deg, decl, geo::hour_angle_deg(solar));
                let zenith = cz.clamp(-1.0, 1.0).acos().to_degrees();
                decompose::erbs(ghi[i], zenith, g_on)
            }
        };
        let humidity = match (rh, tdew, w) {
            (Some(x), _, _) => Humidity::RhPct(x[i]),
            (_, Some(x), _) => Humidity::DewPointC(x[i]),
            (_, _, Some(x)) => Humidity::RatioKgKg(x[i]),
            _ => return Err(Error::Internal("no humidity column".into())),
        };
        hours.push(WeatherHour {
            ghi_w_m2: ghi[i],
            dni_w_m2: dni,
            dhi_w_m2: dhi,
            t_db_c: t_db[i],
            humidity,
            p_kpa: p.map(|x| x[i]),
            wind_m_s: wind.map(|x| x[i]),
        });
    }
    Ok(WeatherYear {
        hours,
        origin: format!(
            "file {file} ({} interval{})",
            match spec.interval {
                Interval::Ending => "ending",
                Interval::Beginning => "beginning",
                Interval::Instant => "instant",
            },
            if rows == LEAP_HOURS {
                ", 29 February dropped"
            } else {
                ""
            }
        ),
        derived_beam_diffuse: beam.is_none().then_some("Erbs et al. 1982"),
    })
}
