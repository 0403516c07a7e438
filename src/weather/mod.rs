//! The weather year: 8760 hourly records from a file or synthesised from monthly normals.
//!
//! Time convention for every series in parhelion: hour `i` (0..8760) of a 365-day year is the
//! interval from `i` to `i + 1` hours after 1 January 00:00 local standard time; its values are
//! averages (irradiance, W/m²) or representative values (temperature) over that interval. File
//! readers convert other conventions (`beginning`, `instant`) to this one.

pub mod decompose;
pub mod file;
pub mod sky;
pub mod synthetic;

/// Hours in the simulated year (leap days are dropped on import).
pub const HOURS: usize = 8760;

/// Humidity as the source gives it; converted to a humidity ratio with `props::psychro`
/// once the barometric pressure is known.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Humidity {
    /// Relative humidity, percent (0–100).
    RhPct(f64),
    /// Dew-point temperature, °C.
    DewPointC(f64),
    /// Humidity ratio, kg water per kg dry air.
    RatioKgKg(f64),
}

/// One hour of weather (interval convention above).
#[derive(Debug, Clone, Copy)]
pub struct WeatherHour {
    /// Global horizontal irradiance, W/m².
    pub ghi_w_m2: f64,
    /// Direct normal irradiance, W/m².
    pub dni_w_m2: f64,
    /// Diffuse horizontal irradiance, W/m².
    pub dhi_w_m2: f64,
    /// Dry-bulb temperature, °C.
    pub t_db_c: f64,
    /// Humidity as given.
    pub humidity: Humidity,
    /// Barometric pressure, kPa, when the source gives it (else from elevation).
    pub p_kpa: Option<f64>,
    /// Wind speed at 10 m, m/s, when the source gives it.
    pub wind_m_s: Option<f64>,
}

/// A whole weather year and where it came from.
#[derive(Debug, Clone)]
pub struct WeatherYear {
    /// 8760 hours.
    pub hours: Vec<WeatherHour>,
    /// One line saying where the data came from (file path or "synthetic, seed N").
    pub origin: String,
    /// Set when beam and diffuse were derived from GHI: the decomposition used
    /// (`"Erbs et al. 1982"`). Shown by `parhelion weather`.
    pub derived_beam_diffuse: Option<&'static str>,
}

/// Days in each month of a 365-day year.
pub const MONTH_DAYS: [u32; 12] = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/// `(month 1..=12, day of month 1..=31, hour of day 0..=23, day of year 1..=365)` of hour `i`.
pub fn calendar(i: usize) -> (u32, u32, u32, u32) {
    let doy = (i / 24) as u32 + 1;
    let hour = (i % 24) as u32;
    let mut d = doy;
    for (m, &len) in MONTH_DAYS.iter().enumerate() {
        if d <= len {
            return (m as u32 + 1, d, hour, doy);
        }
        d -= len;
    }
    (12, 31, hour, doy)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn calendar_edges() {
        assert_eq!(calendar(0), (1, 1, 0, 1));
        assert_eq!(calendar(31 * 24), (2, 1, 0, 32));
        assert_eq!(calendar(HOURS - 1), (12, 31, 23, 365));
    }
}
