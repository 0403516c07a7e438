//! Synthetic weather year from monthly normals.
//!
//! From twelve monthly means (daily global horizontal irradiation, dry-bulb, daily range,
//! humidity) a year of 8760 hours is built that looks like real weather and reproduces the
//! normals exactly:
//!
//! 1. Monthly mean clearness index `K̄T = H̄ / H̄0` (H̄0 from the daily extraterrestrial
//!    irradiation of `sun::geometry`, averaged over the month's days).
//! 2. Daily clearness indices `KT` drawn from the generalised distribution of Bendt,
//!    Collares-Pereira & Rabl (1981): the month's `N` days take the distribution's quantiles at
//!    `(i − 0.5)/N`, in an order shuffled by a seeded PCG-64 generator, then scaled by one factor
//!    (within about 1 %) so that `Σ KT·H0 = N·H̄` exactly. Day-to-day persistence is not modelled
//!    (Bendt et al. found daily values close to a random sequence).
//! 3. Hourly global from the daily value by Collares-Pereira & Rabl (1979) `r_t`, in solar time;
//!    hourly diffuse from the day's diffuse fraction (Erbs et al. 1982, daily) by Liu & Jordan
//!    (1960) `r_d`; beam normal by closure.
//! 4. Dry-bulb by the ASHRAE design-day profile of the daily range; dew point constant over a day.
//!
//! Deterministic for a given seed.

use super::{HOURS, Humidity, MONTH_DAYS, WeatherHour, WeatherYear};
use crate::error::{Error, Result};
use crate::props::psychro;
use crate::sun::geometry as geo;
use crate::validate;
use rand::{Rng, SeedableRng};
use rand_pcg::Pcg64;

/// Lower bound of the daily clearness index in the Bendt et al. (1981) distribution
/// (from memory; the paper itself could not be read here).
pub const BENDT_KT_MIN: f64 = 0.05;

/// Smallest monthly mean clearness index accepted (the Bendt distribution needs
/// `KT,min < K̄T < KT,max`; below 0.1 the month is implausibly dark).
pub const MEAN_KT_LO: f64 = 0.10;
/// Largest monthly mean clearness index accepted (just under `KT,max(0.8) = 0.845`).
pub const MEAN_KT_HI: f64 = 0.80;

/// Below this `cos z` at mid-hour a synthetic hour's beam is sent to diffuse (DNI = 0), so DNI
/// stays bounded near sunrise and sunset (the same threshold as pvlib's `min_cos_zenith`,
/// zenith 86.27°; common practice).
pub const SYNTH_MIN_COS_ZENITH: f64 = 0.065;

/// Sub-steps per hour used to integrate `r_t` and `r_d` over each hour (midpoint rule).
const SUBSTEPS: usize = 12;

/// Hourly fraction of the daily temperature range below the day's maximum, hours 1..24 local
/// time (hour 1 ends at 01:00): `T = Tmax − f·range`.
///
/// Source: ASHRAE Handbook—Fundamentals 2009 (SI) ch. 14 Table 6 (same in the 2013 and 2017
/// editions); values from memory.
pub const ASHRAE_RANGE_FRACTION: [f64; 24] = [
    0.88, 0.92, 0.95, 0.98, 1.00, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13, 0.05, 0.00, 0.00, 0.06,
    0.14, 0.24, 0.39, 0.50, 0.59, 0.68, 0.75, 0.82,
];

/// Day-to-day scaling of the daily range with the day's clearness: `R_d = R̄ (1 + c (KT/K̄ − 1))`
/// with `c = 0.3` (clear days swing wider). Common practice, coefficient chosen here and kept
/// small; the month's mean range is unchanged because the month's mean of `KT/K̄` is 1.
pub const RANGE_KT_COUPLING: f64 = 0.3;

fn default_seed() -> u64 {
    1
}

/// Monthly climate normals from which a synthetic year is made (12 values each, January first).
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MonthlyNormals {
    /// Monthly mean of daily global horizontal irradiation, kWh/m²/day.
    pub ghi_kwh_m2_day: Vec<f64>,
    /// Monthly mean dry-bulb, °C: the mean of the daily `(max + min)/2`, as climate normals
    /// tabulate it (the mean of the 24 hourly values is 0.036·range higher with the ASHRAE shape).
    pub t_mean_c: Vec<f64>,
    /// Monthly mean daily range `max − min`, K.
    pub t_range_k: Vec<f64>,
    /// Monthly mean relative humidity, % — exactly one of `rh_pct` / `t_dew_c`.
    pub rh_pct: Option<Vec<f64>>,
    /// Monthly mean dew point, °C — exactly one of `rh_pct` / `t_dew_c`.
    pub t_dew_c: Option<Vec<f64>>,
    /// Seed of the random order of days (default 1).
    #[serde(default = "default_seed")]
    pub seed: u64,
}

impl MonthlyNormals {
    /// Check list lengths and ranges. Keys are relative (`ghi_kwh_m2_day[3]`); the scenario
    /// layer prefixes them. Whether GHI is below the extraterrestrial value depends on the
    /// latitude and is checked by [`synthesize`].
    ///
    /// Ranges: GHI 0.05–12 kWh/m²/day, dry-bulb −50–50 °C, range 0–30 K, RH 1–100 %,
    /// dew point −60–40 °C and not above the month's mean dry-bulb.
    pub fn validate(&self) -> Result<()> {
        validate::list(
            "ghi_kwh_m2_day",
            &self.ghi_kwh_m2_day,
            12,
            0.05,
            12.0,
            "monthly mean daily global horizontal irradiation, kWh/m²/day",
        )?;
        validate::list(
            "t_mean_c",
            &self.t_mean_c,
            12,
            -50.0,
            50.0,
            "monthly mean dry-bulb, °C",
        )?;
        validate::list(
            "t_range_k",
            &self.t_range_k,
            12,
            0.0,
            30.0,
            "monthly mean daily temperature range max − min, K",
        )?;
        match (&self.rh_pct, &self.t_dew_c) {
            (Some(rh), None) => validate::list(
                "rh_pct",
                rh,
                12,
                1.0,
                100.0,
                "monthly mean relative humidity, %",
            )?,
            (None, Some(dp)) => {
                validate::list("t_dew_c", dp, 12, -60.0, 40.0, "monthly mean dew point, °C")?;
                for (m, (&d, &t)) in dp.iter().zip(&self.t_mean_c).enumerate() {
                    if d > t {
                        return Err(Error::input(
                            format!("t_dew_c[{m}]"),
                            d,
                            format!(
                                "must not exceed the month's mean dry-bulb t_mean_c[{m}] = {t} °C"
                            ),
                        ));
                    }
                }
            }
            (Some(_), Some(_)) => {
                return Err(Error::input(
                    "rh_pct",
                    "both rh_pct and t_dew_c",
                    "give exactly one of rh_pct (monthly mean RH, %) or t_dew_c (monthly mean dew point, °C)",
                ));
            }
            (None, None) => {
                return Err(Error::input(
                    "rh_pct",
                    "missing",
                    "give exactly one of rh_pct (monthly mean RH, %) or t_dew_c (monthly mean dew point, °C)",
                ));
            }
        }
        Ok(())
    }
}

/// Upper bound of the daily clearness index of the Bendt et al. (1981) distribution as a
/// function of the monthly mean: `KT,max = 0.6313 + 0.267 K̄T − 11.9 (K̄T − 0.75)^8`.
///
/// Source: from memory, as used with the Bendt distribution (the paper could not be read
/// here; the relation is also printed with it by Hollands & Huget, Solar Energy 30 (1983)
/// 195–209). Valid for `K̄T` about 0.1–0.8.
pub fn bendt_kt_max(mean_kt: f64) -> f64 {
    0.6313 + 0.267 * mean_kt - 11.9 * (mean_kt - 0.75).powi(8)
}

/// Mean of `u = (KT − KT,min)/(KT,max − KT,min)` under the density `∝ exp(x u)` on `[0, 1]`:
/// `1/(1 − e^−x) − 1/x`, with the series `1/2 + x/12` near 0.
fn truncated_exp_mean_unit(x: f64) -> f64 {
    if x.abs() < 1e-4 {
        0.5 + x / 12.0
    } else {
        1.0 / (-(-x).exp_m1()) - 1.0 / x
    }
}

/// Mean daily clearness index of the Bendt distribution with parameter `gamma` and bounds
/// `kt_min`, `kt_max` (dimensionless):
/// `K̄ = [(a − 1/γ) e^{γa} − (b − 1/γ) e^{γb}] / (e^{γa} − e^{γb})`, `a = KT,min`, `b = KT,max`,
/// evaluated in a cancellation-free form; `(a + b)/2` at `γ = 0`.
///
/// Source: follows from the CDF of Bendt, Collares-Pereira & Rabl, Solar Energy 27(1) 1–5
/// (1981) (form from memory).
pub fn bendt_mean(gamma: f64, kt_min: f64, kt_max: f64) -> f64 {
    kt_min + (kt_max - kt_min) * truncated_exp_mean_unit(gamma * (kt_max - kt_min))
}

/// Parameter `γ` of the Bendt distribution for a monthly mean `K̄T`: the root of
/// `bendt_mean(γ, 0.05, KT,max(K̄T)) = K̄T` (Brent, to 1e-10). Bendt et al. give a fitted
/// explicit approximation; solving the mean relation exactly is used instead so the month's
/// mean is reproduced (the fit is compared in the checks).
///
/// `mean_kt` must lie in `[0.10, 0.80]`; outside it an `Input` error.
pub fn bendt_gamma(mean_kt: f64) -> Result<f64> {
    validate::in_range(
        "mean_kt",
        mean_kt,
        MEAN_KT_LO,
        MEAN_KT_HI,
        "monthly mean clearness index for the Bendt distribution",
    )?;
    let b = bendt_kt_max(mean_kt);
    crate::num::brent("Bendt gamma", -400.0, 400.0, 1e-10, |g| {
        bendt_mean(g, BENDT_KT_MIN, b) - mean_kt
    })
}

/// Bendt et al. (1981) fitted explicit approximation of `γ`:
/// `γ = −1.498 + (1.184 ξ − 27.182 e^{−1.5 ξ}) / (KT,max − KT,min)`,
/// `ξ = (KT,max − KT,min) / (KT,max − K̄T)`. From memory; used only as a check of
/// [`bendt_gamma`].
pub fn bendt_gamma_fit(mean_kt: f64) -> f64 {
    let (a, b) = (BENDT_KT_MIN, bendt_kt_max(mean_kt));
    let xi = (b - a) / (b - mean_kt);
    -1.498 + (1.184 * xi - 27.182 * (-1.5 * xi).exp()) / (b - a)
}

/// Cumulative frequency of the daily clearness index, Bendt et al. (1981):
/// `F(KT) = (e^{γ KT,min} − e^{γ KT}) / (e^{γ KT,min} − e^{γ KT,max})`, 0 below `KT,min`,
/// 1 above `KT,max`; uniform when `γ = 0`. Evaluated as `expm1(γ(KT − a)) / expm1(γ(b − a))`.
///
/// Source: P. Bendt, M. Collares-Pereira, A. Rabl, "The frequency distribution of daily
/// insolation values", Solar Energy 27(1) 1–5 (1981) (form from memory).
pub fn bendt_cdf(kt: f64, gamma: f64, kt_min: f64, kt_max: f64) -> f64 {
    if kt <= kt_min {
        return 0.0;
    }
    if kt >= kt_max {
        return 1.0;
    }
    let (u, d) = (kt - kt_min, kt_max - kt_min);
    if (gamma * d).abs() < 1e-9 {
        u / d
    } else {
        (gamma * u).exp_m1() / (gamma * d).exp_m1()
    }
}

/// Inverse of [`bendt_cdf`]: the daily clearness index at cumulative frequency `p` (0–1):
/// `KT = KT,min + ln(1 + p·expm1(γ (KT,max − KT,min))) / γ`.
pub fn bendt_quantile(p: f64, gamma: f64, kt_min: f64, kt_max: f64) -> f64 {
    let p = p.clamp(0.0, 1.0);
    let d = kt_max - kt_min;
    if (gamma * d).abs() < 1e-9 {
        kt_min + p * d
    } else {
        kt_min + (p * (gamma * d).exp_m1()).ln_1p() / gamma
    }
}

/// Daily diffuse fraction `Hd/H` from the daily clearness index, Erbs, Klein & Duffie (1982):
///
/// * `ωs ≤ 81.4°`: `1 − 0.2727 KT + 2.4495 KT² − 11.9514 KT³ + 9.3879 KT⁴` for `KT < 0.715`,
///   else `0.143`
/// * `ωs > 81.4°`: `1 + 0.2832 KT − 2.5557 KT² + 0.8448 KT³` for `KT < 0.722`, else `0.175`
///
/// * `kt` – daily clearness index `H/H0`
/// * `sunset_hour_angle_deg` – the day's sunset hour angle ωs, degrees
///
/// Result clipped to `[0, 1]`. Source: Erbs et al., Solar Energy 28(4) 293–302 (1982);
/// Duffie & Beckman, 4th ed., eq. 2.11.1 (coefficients from memory, matching a public
/// implementation of the same equation).
pub fn erbs_daily_diffuse_fraction(kt: f64, sunset_hour_angle_deg: f64) -> f64 {
    let k = kt.max(0.0);
    let f = if sunset_hour_angle_deg <= 81.4 {
        if k < 0.715 {
            1.0 - 0.2727 * k + 2.4495 * k * k - 11.9514 * k.powi(3) + 9.3879 * k.powi(4)
        } else {
            0.143
        }
    } else if k < 0.722 {
        1.0 + 0.2832 * k - 2.5557 * k * k + 0.8448 * k.powi(3)
    } else {
        0.175
    };
    f.clamp(0.0, 1.0)
}

/// `sin ωs − (π ωs / 180) cos ωs`, the common denominator of `r_t` and `r_d`.
fn rt_denominator(ws_deg: f64) -> f64 {
    let w = ws_deg.to_radians();
    w.sin() - w * w.cos()
}

/// Collares-Pereira & Rabl (1979) ratio of hourly to daily global irradiation, per hour,
/// at hour angle ω (middle of the hour):
/// `r_t = (π/24)(a + b cos ω)(cos ω − cos ωs)/(sin ωs − (π ωs/180) cos ωs)`,
/// `a = 0.409 + 0.5016 sin(ωs − 60°)`, `b = 0.6609 − 0.4767 sin(ωs − 60°)`.
///
/// * `omega_deg` – hour angle, degrees (morning negative)
/// * `omega_s_deg` – sunset hour angle, degrees
///
/// Zero when `|ω| ≥ ωs` (never negative). Source: Duffie & Beckman, 4th ed., eq. 2.13.2;
/// M. Collares-Pereira, A. Rabl, Solar Energy 22 (1979) 155–164.
pub fn collares_pereira_rabl_rt(omega_deg: f64, omega_s_deg: f64) -> f64 {
    if omega_s_deg <= 0.0 || omega_deg.abs() >= omega_s_deg {
        return 0.0;
    }
    let s = (omega_s_deg - 60.0).to_radians().sin();
    let a = 0.409 + 0.5016 * s;
    let b = 0.6609 - 0.4767 * s;
    let cw = omega_deg.to_radians().cos();
    let cws = omega_s_deg.to_radians().cos();
    (std::f64::consts::PI / 24.0) * (a + b * cw) * (cw - cws) / rt_denominator(omega_s_deg)
}

/// Liu & Jordan (1960) ratio of hourly to daily diffuse irradiation, per hour:
/// `r_d = (π/24)(cos ω − cos ωs)/(sin ωs − (π ωs/180) cos ωs)`; zero when `|ω| ≥ ωs`.
///
/// Source: Duffie & Beckman, 4th ed., eq. 2.13.1; B.Y.H. Liu, R.C. Jordan, Solar Energy 4(3)
/// (1960) 1–19.
pub fn liu_jordan_rd(omega_deg: f64, omega_s_deg: f64) -> f64 {
    if omega_s_deg <= 0.0 || omega_deg.abs() >= omega_s_deg {
        return 0.0;
    }
    let cw = omega_deg.to_radians().cos();
    let cws = omega_s_deg.to_radians().cos();
    (std::f64::consts::PI / 24.0) * (cw - cws) / rt_denominator(omega_s_deg)
}

/// Hour angle (degrees, wrapped to −180..180) at standard time `t_h` of day `n`.
fn hour_angle_at(t_h: f64, n: u32, longitude_deg: f64, utc_offset_h: f64) -> f64 {
    let w = geo::hour_angle_deg(geo::solar_time_h(t_h, n, longitude_deg, utc_offset_h));
    (w + 180.0).rem_euclid(360.0) - 180.0
}

/// Daily values smoothly varying through the year that keep each month's mean exactly:
/// linear interpolation between mid-month values (cyclic), then a per-month offset that restores
/// the month's mean. Common practice (avoids steps of several kelvin at month boundaries).
fn smooth_daily(monthly: &[f64]) -> Vec<f64> {
    let mut mid = [0.0; 12];
    let mut start = 0.0;
    for m in 0..12 {
        mid[m] = start + MONTH_DAYS[m] as f64 / 2.0;
        start += MONTH_DAYS[m] as f64;
    }
    let mut out = Vec::with_capacity(365);
    let mut first = 0usize;
    for m in 0..12 {
        let len = MONTH_DAYS[m] as usize;
        let begin = out.len();
        for d in 0..len {
            let x = (first + d) as f64 + 0.5;
            // Neighbouring mid-month points (cyclic over 365 days).
            let (x0, y0, x1, y1) = if x < mid[m] {
                let p = (m + 11) % 12;
                let xp = if m == 0 { mid[11] - 365.0 } else { mid[p] };
                (xp, monthly[p], mid[m], monthly[m])
            } else {
                let q = (m + 1) % 12;
                let xq = if m == 11 { mid[0] + 365.0 } else { mid[q] };
                (mid[m], monthly[m], xq, monthly[q])
            };
            out.push(y0 + (y1 - y0) * (x - x0) / (x1 - x0));
        }
        let mean: f64 = out[begin..].iter().sum::<f64>() / len as f64;
        let shift = monthly[m] - mean;
        for v in &mut out[begin..] {
            *v += shift;
        }
        first += len;
    }
    out
}

/// Dew point from a mean relative humidity at a mean dry-bulb:
/// `pw = RH/100 · pws(T)`, then `t_dp` with `pws(t_dp) = pw` (ASHRAE 2017 ch. 1 eqs. 5, 6, 22).
///
/// * `t_c` – dry-bulb, °C; `rh_pct` – relative humidity, %
///
/// Source: ASHRAE Handbook—Fundamentals 2017 ch. 1 via `props::psychro`.
pub fn dew_point_from_rh_c(t_c: f64, rh_pct: f64) -> Result<f64> {
    let pw = rh_pct / 100.0 * psychro::saturation_pressure_kpa(t_c)?;
    psychro::dew_point_from_vapour_pressure(pw)
}

/// Daily clearness indices of one year, one per day, by the method of the module docs.
/// Returns `(kt per day, K̄T per month)`. `h0` is the daily extraterrestrial irradiation per day,
/// J/m².
fn daily_kt(n: &MonthlyNormals, h0: &[f64]) -> Result<(Vec<f64>, [f64; 12])> {
    let mut rng = Pcg64::seed_from_u64(n.seed);
    let mut kt = Vec::with_capacity(365);
    let mut kbar = [0.0; 12];
    let mut first = 0usize;
    for m in 0..12 {
        let len = MONTH_DAYS[m] as usize;
        let days = &h0[first..first + len];
        let h0_mean = days.iter().sum::<f64>() / len as f64;
        let h_mean = n.ghi_kwh_m2_day[m] * 3.6e6;
        let key = format!("ghi_kwh_m2_day[{m}]");
        if h_mean >= h0_mean {
            return Err(Error::input(
                key,
                n.ghi_kwh_m2_day[m],
                format!(
                    "must be below the month's extraterrestrial irradiation on a horizontal \
                     plane, {:.2} kWh/m²/day at this latitude",
                    h0_mean / 3.6e6
                ),
            ));
        }
        let k = h_mean / h0_mean;
        if !(MEAN_KT_LO..=MEAN_KT_HI).contains(&k) {
            return Err(Error::input(
                key,
                n.ghi_kwh_m2_day[m],
                format!(
                    "gives a monthly clearness index H/H0 = {k:.3}; must be {MEAN_KT_LO} to \
                     {MEAN_KT_HI} ({:.2} to {:.2} kWh/m²/day at this latitude)",
                    MEAN_KT_LO * h0_mean / 3.6e6,
                    MEAN_KT_HI * h0_mean / 3.6e6
                ),
            ));
        }
        kbar[m] = k;
        let gamma = bendt_gamma(k)?;
        let b = bendt_kt_max(k);
        let mut vals: Vec<f64> = (0..len)
            .map(|i| bendt_quantile((i as f64 + 0.5) / len as f64, gamma, BENDT_KT_MIN, b))
            .collect();
        // Fisher–Yates shuffle with the seeded generator.
        for i in (1..len).rev() {
            let j = rng.random_range(0..=i);
            vals.swap(i, j);
        }
        let sum_h: f64 = vals.iter().zip(days).map(|(k, h)| k * h).sum();
        let scale = h_mean * len as f64 / sum_h;
        kt.extend(vals.iter().map(|v| v * scale));
        first += len;
    }
    Ok((kt, kbar))
}

/// Build a synthetic weather year from monthly normals.
///
/// * `n` – the normals (validated here)
/// * `latitude_deg` – site latitude, −66..66° (north positive; every day must have a sunrise)
/// * `longitude_deg` – east positive, −180..180°
/// * `utc_offset_h` – standard-time zone, hours east of UTC, −12..14
/// * `elevation_m` – site elevation, −500..6000 m (checked only; the plant derives pressure
///   from it, `p_kpa` is left `None`)
///
/// Returns 8760 hours (interval convention of `weather`), `derived_beam_diffuse = None`
/// (diffuse is part of the method), `origin` naming the method and seed.
///
/// Per day: `H = KT·H0` (module docs). Per hour: `r_t` and `r_d` are averaged over 12
/// sub-steps of the standard-time hour (solar time by `geometry::solar_time_h`, negative parts
/// clipped to zero), so sunrise and sunset hours get their lit fraction, then renormalised so the
/// day's hourly sums equal `H` and `Hd` exactly. DHI is capped at GHI (the `r_d/r_t` shapes can
/// exceed 1 near sunrise on dull days; the cap lowers that day's diffuse slightly). DNI =
/// (GHI − DHI)/cos z with `cos z` at mid-hour; when `cos z < 0.065` the beam goes to diffuse,
/// and DNI is capped at the extraterrestrial normal irradiance (excess to diffuse).
/// Dry-bulb `T = Tmax − f·R_d` with the ASHRAE fractions, `Tmax = T̄_d + R_d/2`, `T̄_d` smoothed
/// day to day keeping the monthly mean. Humidity: `Humidity::DewPointC`, the day's dew point
/// (smoothed like `T̄_d`; from `rh_pct` via [`dew_point_from_rh_c`] at the monthly mean dry-bulb)
/// but never above the hour's dry-bulb.
///
/// Errors: `Input` for bad normals or site values, or a month whose GHI is at or above its
/// extraterrestrial value or outside clearness 0.10–0.80.
///
/// Sources: Bendt, Collares-Pereira & Rabl, Solar Energy 27(1) 1–5 (1981); Collares-Pereira &
/// Rabl, Solar Energy 22 (1979) 155–164; Liu & Jordan, Solar Energy 4 (1960) 1–19; Erbs, Klein
/// & Duffie, Solar Energy 28 (1982) 293–302; Duffie & Beckman 4th ed. §2.11–2.13; ASHRAE
/// Handbook—Fundamentals 2009 ch. 14 Table 6.
pub fn synthesize(
    n: &MonthlyNormals,
    latitude_deg: f64,
    longitude_deg: f64,
    utc_offset_h: f64,
    elevation_m: f64,
) -> Result<WeatherYear> {
    n.validate()?;
    validate::in_range(
        "latitude_deg",
        latitude_deg,
        -66.0,
        66.0,
        "site latitude, degrees north; synthetic weather needs a sunrise every day",
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
    validate::in_range(
        "elevation_m",
        elevation_m,
        -500.0,
        6000.0,
        "site elevation, m",
    )?;

    let h0: Vec<f64> = (1..=365u32)
        .map(|d| geo::daily_extraterrestrial_j_m2(d, latitude_deg))
        .collect();
    let (kt, _) = daily_kt(n, &h0)?;

    // Daily dry-bulb means and dew points, smoothed through the year.
    let t_day = smooth_daily(&n.t_mean_c);
    let dew_monthly: Vec<f64> = match (&n.t_dew_c, &n.rh_pct) {
        (Some(dp), _) => dp.clone(),
        (None, Some(rh)) => rh
            .iter()
            .zip(&n.t_mean_c)
            .enumerate()
            .map(|(m, (&r, &t))| {
                dew_point_from_rh_c(t, r).map_err(|e| e.within("", &format!("rh_pct[{m}]")))
            })
            .collect::<Result<Vec<f64>>>()?,
        (None, None) => return Err(Error::Internal("validated normals lack humidity".into())),
    };
    let dew_day = smooth_daily(&dew_monthly);

    let mut hours = Vec::with_capacity(HOURS);
    let mut wt = [0.0f64; 24];
    let mut wd = [0.0f64; 24];
    let mut day = 0usize;
    for (m, &len) in MONTH_DAYS.iter().enumerate() {
        let kbar_days = {
            let first = day;
            kt[first..first + len as usize].iter().sum::<f64>() / len as f64
        };
        for _ in 0..len {
            let doy = day as u32 + 1;
            let h_day = kt[day] * h0[day];
            let decl = geo::declination_spencer_deg(doy);
            let ws = geo::sunset_hour_angle_deg(latitude_deg, decl);
            let hd_day = erbs_daily_diffuse_fraction(kt[day], ws) * h_day;
            let g_on = geo::extraterrestrial_normal_w_m2(doy);

            let (mut st, mut sd) = (0.0, 0.0);
            for h in 0..24 {
                let (mut a, mut b) = (0.0, 0.0);
                for s in 0..SUBSTEPS {
                    let t = h as f64 + (s as f64 + 0.5) / SUBSTEPS as f64;
                    let w = hour_angle_at(t, doy, longitude_deg, utc_offset_h);
                    a += collares_pereira_rabl_rt(w, ws);
                    b += liu_jordan_rd(w, ws);
                }
                wt[h] = a;
                wd[h] = b;
                st += a;
                sd += b;
            }

            let range = n.t_range_k[m] * (1.0 + RANGE_KT_COUPLING * (kt[day] / kbar_days - 1.0));
            let t_max = t_day[day] + range / 2.0;
            for h in 0..24 {
                let ghi = if st > 0.0 {
                    h_day * wt[h] / st / 3600.0
                } else {
                    0.0
                };
                let mut dhi = if sd > 0.0 {
                    (hd_day * wd[h] / sd / 3600.0).min(ghi)
                } else {
                    0.0
                };
                let w = hour_angle_at(h as f64 + 0.5, doy, longitude_deg, utc_offset_h);
                let cz = geo::cos_zenith(latitude_deg, decl, w);
                let mut dni = 0.0;
                if ghi <= 0.0 {
                    dhi = 0.0;
                } else if cz < SYNTH_MIN_COS_ZENITH {
                    dhi = ghi;
                } else {
                    dni = ((ghi - dhi) / cz).max(0.0);
                    if dni > g_on {
                        dni = g_on;
                        dhi = ghi - dni * cz;
                    }
                }
                let t_db = t_max - ASHRAE_RANGE_FRACTION[h] * range;
                hours.push(WeatherHour {
                    ghi_w_m2: ghi,
                    dni_w_m2: dni,
                    dhi_w_m2: dhi,
                    t_db_c: t_db,
                    humidity: Humidity::DewPointC(dew_day[day].min(t_db)),
                    p_kpa: None,
                    wind_m_s: None,
                });
            }
            day += 1;
        }
    }
    Ok(WeatherYear {
        hours,
        origin: format!(
            "synthetic from monthly normals, seed {} (daily KT: Bendt et al. 1981; hourly: \
             Collares-Pereira & Rabl 1979 / Liu & Jordan 1960; diffuse: Erbs et al. 1982 daily; \
             dry-bulb: ASHRAE design-day range profile)",
            n.seed
        ),
        derived_beam_diffuse: None,
    })
}

/// The daily clearness indices [`synthesize`] uses for these normals at this latitude, with the
/// monthly means `K̄T` (for checks and reports).
///
/// * `latitude_deg` – −66..66°
///
/// Errors as [`synthesize`].
pub fn daily_clearness(n: &MonthlyNormals, latitude_deg: f64) -> Result<(Vec<f64>, [f64; 12])> {
    n.validate()?;
    validate::in_range(
        "latitude_deg",
        latitude_deg,
        -66.0,
        66.0,
        "site latitude, degrees north",
    )?;
    let h0: Vec<f64> = (1..=365u32)
        .map(|d| geo::daily_extraterrestrial_j_m2(d, latitude_deg))
        .collect();
    daily_kt(n, &h0)
}

#[cfg(test)]
mod tests {
    use super::*;

    pub(crate) fn demo() -> MonthlyNormals {
        MonthlyNormals {
            ghi_kwh_m2_day: vec![4.6, 5.3, 5.9, 6.1, 5.6, 5.0, 4.9, 4.8, 4.7, 4.6, 4.4, 4.3],
            t_mean_c: vec![
                26.5, 27.2, 28.3, 29.4, 29.3, 28.8, 28.4, 28.3, 27.9, 27.6, 27.2, 26.6,
            ],
            t_range_k: vec![8.0, 8.2, 8.0, 7.6, 7.0, 6.4, 6.2, 6.2, 6.4, 6.8, 7.4, 7.8],
            rh_pct: None,
            t_dew_c: Some(vec![
                21.0, 22.0, 23.0, 24.0, 24.5, 24.5, 24.2, 24.2, 24.0, 23.5, 22.5, 21.2,
            ]),
            seed: 7,
        }
    }

    /// Bendt CDF: uniform at γ = 0; the quantile inverts the CDF; the mean relation holds
    /// (numerical integral `KT,min + ∫ (1 − F) dKT`).
    #[test]
    fn bendt_cdf_quantile_mean() {
        assert!((bendt_cdf(0.3, 0.0, 0.05, 0.75) - 0.25 / 0.7).abs() < 1e-12);
        let g = bendt_gamma(0.55).unwrap();
        let b = bendt_kt_max(0.55);
        for p in [0.05, 0.3, 0.5, 0.9] {
            let k = bendt_quantile(p, g, 0.05, b);
            assert!((bendt_cdf(k, g, 0.05, b) - p).abs() < 1e-12);
        }
        let steps = 20000;
        let dk = (b - 0.05) / steps as f64;
        let integral: f64 = (0..steps)
            .map(|i| 1.0 - bendt_cdf(0.05 + (i as f64 + 0.5) * dk, g, 0.05, b))
            .sum::<f64>()
            * dk;
        assert!((0.05 + integral - 0.55).abs() < 1e-6);
    }

    /// Liu & Jordan r_d integrates to one over the day (D&B eq. 2.13.1 is the ratio of the
    /// extraterrestrial hourly to daily irradiation), and r_t is within 2 % of one.
    #[test]
    fn rt_rd_integrate_over_day() {
        for ws in [70.0, 90.0, 105.0] {
            let steps = 2400;
            let (mut st, mut sd) = (0.0, 0.0);
            for i in 0..steps {
                let w = -180.0 + (i as f64 + 0.5) * 360.0 / steps as f64;
                st += collares_pereira_rabl_rt(w, ws) * 24.0 / steps as f64;
                sd += liu_jordan_rd(w, ws) * 24.0 / steps as f64;
            }
            assert!((sd - 1.0).abs() < 1e-4, "ws {ws}: Σ r_d = {sd}");
            assert!((st - 1.0).abs() < 0.02, "ws {ws}: Σ r_t = {st}");
        }
    }

    /// The ASHRAE profile: maximum 1 at hour 5 (04:00–05:00), minimum 0 at hours 14–15;
    /// mean fraction 12.87/24 = 0.53625 (sum of the 24 published values).
    #[test]
    fn ashrae_profile_shape() {
        let sum: f64 = ASHRAE_RANGE_FRACTION.iter().sum();
        assert!((sum - 12.87).abs() < 1e-9);
    }

    #[test]
    fn synthetic_year_is_sane_and_deterministic() {
        let n = demo();
        let y = synthesize(&n, 11.7, 88.1, 6.0, 5.0).unwrap();
        assert_eq!(y.hours.len(), HOURS);
        for h in &y.hours {
            assert!(h.ghi_w_m2 >= 0.0 && h.ghi_w_m2 < 1367.0);
            assert!(h.dhi_w_m2 >= 0.0 && h.dhi_w_m2 <= h.ghi_w_m2 + 1e-9);
            assert!(h.dni_w_m2 >= 0.0 && h.dni_w_m2 <= 1420.0);
            if let Humidity::DewPointC(d) = h.humidity {
                assert!(d <= h.t_db_c);
            } else {
                panic!("humidity kind");
            }
        }
        let y2 = synthesize(&n, 11.7, 88.1, 6.0, 5.0).unwrap();
        assert_eq!(y.hours[4000].ghi_w_m2, y2.hours[4000].ghi_w_m2);
        let mut n3 = n.clone();
        n3.seed = 8;
        let y3 = synthesize(&n3, 11.7, 88.1, 6.0, 5.0).unwrap();
        let diff: f64 = (0..HOURS)
            .map(|i| (y.hours[i].ghi_w_m2 - y3.hours[i].ghi_w_m2).abs())
            .sum();
        assert!(diff > 0.0);
    }

    /// Each synthetic day's hourly GHI sums to that day's `KT·H0` exactly (renormalised
    /// `r_t`), and the hourly diffuse never exceeds the global.
    #[test]
    fn hourly_sums_reproduce_daily_totals() {
        let n = demo();
        let (lat, lon, utc) = (11.7, 88.1, 6.0);
        let y = synthesize(&n, lat, lon, utc, 5.0).unwrap();
        let (kt, _) = daily_clearness(&n, lat).unwrap();
        for (d, k) in kt.iter().enumerate() {
            let h_j: f64 = y.hours[d * 24..d * 24 + 24]
                .iter()
                .map(|h| h.ghi_w_m2 * 3600.0)
                .sum();
            let expected = k * geo::daily_extraterrestrial_j_m2(d as u32 + 1, lat);
            assert!(
                (h_j - expected).abs() < 1e-6 * expected,
                "day {d}: {h_j} vs {expected}"
            );
        }
    }

    /// Conditions of Duffie & Beckman 4th ed. Example 2.13.1 (φ = 43°, 23 August, n = 235,
    /// hour 10–11 solar time, ω = −22.5°): hand evaluation of eq. 2.13.2 with Cooper's
    /// declination δ = 11.0°, ωs = 100.4°: a = 0.7341, b = 0.3519, r_t = 0.1179
    /// (the book's r_t ≈ 0.118, from memory).
    #[test]
    fn rt_example_2_13_1() {
        let ws = geo::sunset_hour_angle_deg(43.0, geo::declination_cooper_deg(235));
        assert!((ws - 100.4).abs() < 0.1, "ws = {ws}");
        let rt = collares_pereira_rabl_rt(-22.5, ws);
        assert!((rt - 0.1179).abs() < 0.0005, "r_t = {rt}");
    }

    #[test]
    fn bad_normals_are_errors() {
        let mut n = demo();
        n.ghi_kwh_m2_day[3] = 11.5; // above extraterrestrial at 11.7° N in April (H0 ≈ 10.4)
        let e = synthesize(&n, 11.7, 88.1, 6.0, 5.0)
            .unwrap_err()
            .to_string();
        assert!(e.contains("ghi_kwh_m2_day[3]"), "{e}");
        let mut n = demo();
        n.rh_pct = Some(vec![60.0; 12]);
        assert!(n.validate().is_err());
        let mut n = demo();
        n.t_range_k.pop();
        assert!(n.validate().unwrap_err().to_string().contains("t_range_k"));
        let mut n = demo();
        n.t_dew_c.as_mut().unwrap()[5] = 30.0;
        assert!(n.validate().unwrap_err().to_string().contains("t_dew_c[5]"));
    }
}
