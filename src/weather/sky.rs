//! What the collectors see of the outdoors besides the sun: wind speed and the long-wave
//! (thermal) irradiance of the sky, for every hour of the weather year, computed once per
//! scenario so every option sees the same.
//!
//! **Wind.** The weather's own wind speed where it gives one; otherwise the scenario's monthly
//! means (`[weather] wind_monthly_m_s`, 12 values), otherwise [`DEFAULT_WIND_M_S`]. Used as
//! given (no correction from the station's height to the collector's).
//!
//! **Long-wave irradiance** on a horizontal surface, `EL = ε σ Ta⁴`, with
//! * the clear-sky emissivity of Swinbank (1963), `ε_clear = 9.2·10⁻⁶ Ta²` (Ta in K),
//! * the all-sky emissivity `ε = (1 − 0.84 c) ε_clear + 0.84 c` with cloud cover `c` (0–1),
//! * the cloud cover from the day's clearness index `KT = H/H0` (daily global horizontal over
//!   daily extraterrestrial horizontal irradiation): `c = 2.33 − 3.33 KT`, clipped to 0–1,
//!   one value for the 24 hours of the day (night hours take their day's value).
//!
//! Sources: W. C. Swinbank, "Long-wave radiation from clear skies", Q. J. R. Meteorol. Soc.
//! 89 (1963) 339–348; G. S. Campbell & J. M. Norman, *An Introduction to Environmental
//! Biophysics*, 2nd ed., Springer 1998, ch. 10 (Swinbank's formula in emissivity form, the
//! all-sky emissivity and the cloud cover from the atmospheric transmission). The book was not
//! read here: the three formulas and coefficients are as quoted in public code citing it (an
//! R hydrology package's `AtmosphericEmissivity`, crop models' long-wave routines, a Julia
//! biophysics model's "Swinbank, Eq. 10.11 in Campbell and Norman 1998").
//!
//! Limits, stated once: Swinbank fitted night-time clear skies at air temperatures of about
//! 0–30 °C (from memory); ε is capped at 1. The sky is taken as seen whole by the collector
//! (no view-factor correction for tilt). With no sun all day (polar night) there is no
//! clearness index: the sky is taken as clear (`c = 0`, the largest long-wave loss).

use super::{HOURS, WeatherYear};
use crate::error::Result;
use crate::props::{KELVIN_0C, STEFAN_BOLTZMANN_W_M2K4};
use crate::sun::geometry::daily_extraterrestrial_j_m2;
use crate::validate;

/// Wind speed where neither the weather nor the scenario gives one, m/s: 2 m/s, the value
/// FAO Irrigation and Drainage Paper 56 (1998) suggests where no wind data exist (from
/// memory); common practice.
pub const DEFAULT_WIND_M_S: f64 = 2.0;

/// Swinbank's clear-sky coefficient, 1/K²: `ε_clear = 9.2·10⁻⁶ Ta²` (Swinbank 1963 as written
/// by Campbell & Norman 1998, ch. 10).
pub const SWINBANK_PER_K2: f64 = 9.2e-6;

/// Weight of cloud in the all-sky emissivity, `ε = (1 − 0.84 c) ε_clear + 0.84 c` (Campbell &
/// Norman 1998, ch. 10).
pub const CLOUD_WEIGHT: f64 = 0.84;

/// Cloud cover from the daily atmospheric transmission `KT`: `c = 2.33 − 3.33 KT` (Campbell &
/// Norman 1998): `(intercept, slope)`.
pub const CLOUD_FROM_KT: (f64, f64) = (2.33, 3.33);

/// One hour of what the collectors see besides the sun.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OutdoorHour {
    /// Wind speed, m/s.
    pub wind_m_s: f64,
    /// Long-wave irradiance on a horizontal surface, W/m².
    pub long_wave_w_m2: f64,
    /// Cloud cover of the day, fraction 0–1.
    pub cloud_cover: f64,
}

/// Clear-sky emissivity, Swinbank (1963): `ε_clear = 9.2·10⁻⁶ Ta²`, Ta in K, capped at 1.
///
/// * `t_air_c` – air temperature, °C
///
/// Source: Swinbank 1963 in the form of Campbell & Norman 1998, ch. 10 (module docs).
pub fn swinbank_clear_sky_emissivity(t_air_c: f64) -> f64 {
    let t = t_air_c + KELVIN_0C;
    (SWINBANK_PER_K2 * t * t).min(1.0)
}

/// Cloud cover (0–1) from the day's clearness index `KT = H/H0`: `c = 2.33 − 3.33 KT`,
/// clipped to 0–1 (clear at `KT ≥ 0.70`, overcast at `KT ≤ 0.40`). NaN gives 0.
///
/// Source: Campbell & Norman 1998, ch. 10 (module docs).
pub fn cloud_cover_from_clearness(kt: f64) -> f64 {
    let c = CLOUD_FROM_KT.0 - CLOUD_FROM_KT.1 * kt;
    if c.is_nan() { 0.0 } else { c.clamp(0.0, 1.0) }
}

/// All-sky emissivity `ε = (1 − 0.84 c) ε_clear + 0.84 c`.
///
/// * `eps_clear` – clear-sky emissivity; `cloud_cover` – 0–1
///
/// Source: Campbell & Norman 1998, ch. 10 (module docs).
pub fn all_sky_emissivity(eps_clear: f64, cloud_cover: f64) -> f64 {
    let c = cloud_cover.clamp(0.0, 1.0);
    ((1.0 - CLOUD_WEIGHT * c) * eps_clear + CLOUD_WEIGHT * c).min(1.0)
}

/// Long-wave irradiance from the sky on a horizontal surface, W/m²: `EL = ε σ Ta⁴` with the
/// all-sky emissivity of Swinbank's clear sky and the cloud cover.
///
/// * `t_air_c` – air temperature, °C; `cloud_cover` – 0–1
pub fn long_wave_w_m2(t_air_c: f64, cloud_cover: f64) -> f64 {
    let t = t_air_c + KELVIN_0C;
    all_sky_emissivity(swinbank_clear_sky_emissivity(t_air_c), cloud_cover)
        * STEFAN_BOLTZMANN_W_M2K4
        * t.powi(4)
}

/// Effective sky temperature `Tsky = (EL/σ)^¼`, °C (information).
pub fn sky_temperature_c(long_wave_w_m2: f64) -> f64 {
    (long_wave_w_m2.max(0.0) / STEFAN_BOLTZMANN_W_M2K4).powf(0.25) - KELVIN_0C
}

/// Check the scenario's monthly wind means: 12 values, 0–30 m/s (key relative to
/// `[weather]`).
pub fn validate_wind_monthly(key: &str, wind_monthly_m_s: &[f64]) -> Result<()> {
    validate::list(
        key,
        wind_monthly_m_s,
        12,
        0.0,
        30.0,
        "monthly mean wind speed, m/s (January first)",
    )
}

/// Wind, long-wave irradiance and cloud cover for every hour of the year (module docs).
///
/// * `w` – the weather year (after any scaling of irradiance and temperature)
/// * `latitude_deg` – site latitude, for the daily extraterrestrial irradiation
/// * `wind_monthly_m_s` – 12 monthly means for hours the weather gives no wind (validated)
///
/// Returns one [`OutdoorHour`] per weather hour.
pub fn outdoor_year(
    w: &WeatherYear,
    latitude_deg: f64,
    wind_monthly_m_s: Option<&[f64]>,
) -> Vec<OutdoorHour> {
    let n = w.hours.len().min(HOURS);
    let mut out = Vec::with_capacity(n);
    for (day, hours) in w.hours[..n].chunks(24).enumerate() {
        let h0 = daily_extraterrestrial_j_m2(day as u32 + 1, latitude_deg);
        let h: f64 = hours.iter().map(|x| x.ghi_w_m2.max(0.0) * 3600.0).sum();
        let cloud = if h0 > 0.0 {
            cloud_cover_from_clearness(h / h0)
        } else {
            0.0
        };
        for (k, x) in hours.iter().enumerate() {
            let i = day * 24 + k;
            let (month, ..) = super::calendar(i);
            let wind = x.wind_m_s.unwrap_or_else(|| {
                wind_monthly_m_s
                    .and_then(|m| m.get(month as usize - 1).copied())
                    .unwrap_or(DEFAULT_WIND_M_S)
            });
            out.push(OutdoorHour {
                wind_m_s: wind,
                long_wave_w_m2: long_wave_w_m2(x.t_db_c, cloud),
                cloud_cover: cloud,
            });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::weather::{Humidity, WeatherHour};

    /// Swinbank at 20 °C by hand: 9.2e-6 · 293.15² = 0.790620; EL = 0.790620 · σ · 293.15⁴ =
    /// 0.790620 · 418.766 = 331.08 W/m², sky temperature (0.790620)^¼ · 293.15 = 276.43 K.
    #[test]
    fn swinbank_by_hand() {
        let e = swinbank_clear_sky_emissivity(20.0);
        assert!((e - 0.790_620).abs() < 1e-6, "{e}");
        let el = long_wave_w_m2(20.0, 0.0);
        assert!((el - 331.08).abs() < 0.01, "{el}");
        assert!((sky_temperature_c(el) - 3.28).abs() < 0.01);
        // overcast: (1 − 0.84) 0.790620 + 0.84 = 0.966499
        assert!((all_sky_emissivity(e, 1.0) - 0.966_499).abs() < 1e-6);
        // capped at 1 where Swinbank exceeds it (above about 56.5 °C)
        assert_eq!(swinbank_clear_sky_emissivity(60.0), 1.0);
    }

    #[test]
    fn cloud_cover_limits() {
        assert_eq!(cloud_cover_from_clearness(0.75), 0.0);
        assert_eq!(cloud_cover_from_clearness(0.3), 1.0);
        // 2.33 − 3.33 · 0.55 = 0.4985
        assert!((cloud_cover_from_clearness(0.55) - 0.4985).abs() < 1e-12);
        assert_eq!(cloud_cover_from_clearness(f64::NAN), 0.0);
    }

    /// A year without wind data takes the monthly means, or 2 m/s; a given wind is kept; the
    /// cloud cover is one per day; a dark day is overcast, a bright one clear.
    #[test]
    fn outdoor_year_fills_wind_and_sky() {
        let hour = |ghi: f64, wind: Option<f64>| WeatherHour {
            ghi_w_m2: ghi,
            dni_w_m2: 0.0,
            dhi_w_m2: ghi,
            t_db_c: 20.0,
            humidity: Humidity::RhPct(50.0),
            p_kpa: None,
            wind_m_s: wind,
        };
        let mut hours = vec![hour(0.0, None); HOURS];
        // day 1 (1 January) at 35° N: bright noon hours; day 2 dark
        for h in &mut hours[8..16] {
            h.ghi_w_m2 = 600.0;
        }
        hours[40].wind_m_s = Some(7.5);
        let w = WeatherYear {
            hours,
            origin: "test".into(),
            derived_beam_diffuse: None,
        };
        let monthly: Vec<f64> = (1..=12).map(|m| m as f64).collect();
        let o = outdoor_year(&w, 35.0, Some(&monthly));
        assert_eq!(o.len(), HOURS);
        assert_eq!(o[0].wind_m_s, 1.0);
        assert_eq!(o[40].wind_m_s, 7.5);
        assert_eq!(o[HOURS - 1].wind_m_s, 12.0);
        assert_eq!(outdoor_year(&w, 35.0, None)[0].wind_m_s, DEFAULT_WIND_M_S);
        // 8 h × 600 W/m² = 17.28 MJ/m² against H0 ≈ 18.3 MJ/m² (1 January, 35° N): clear
        assert_eq!(o[3].cloud_cover, 0.0);
        assert_eq!(o[3].cloud_cover, o[20].cloud_cover);
        assert_eq!(o[30].cloud_cover, 1.0);
        assert!(o[30].long_wave_w_m2 > o[3].long_wave_w_m2);
        assert!(o.iter().all(|x| x.long_wave_w_m2.is_finite()));
    }
}
