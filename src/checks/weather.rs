//! Reference checks for the weather area (see `checks/mod.rs` for the table format).
//!
//! * `weather_erbs_pvlib.csv` – Erbs et al. (1982) decomposition against pvlib-python 0.16.1.
//! * `weather_sky.csv` – the long-wave sky model of `weather::sky` (Swinbank 1963 clear sky,
//!   Campbell & Norman 1998 all-sky emissivity and cloud cover) by hand calculation
//!   (`reference/scripts/make_collector_quasi_dynamic.py`, standard library only).
//! * `weather_synthetic_normals.csv` – the synthetic year of two demo climates reproduces the
//!   monthly normals it was made from (round trip).
//! * `computed` – the daily clearness indices of a synthetic month against the quantiles of the
//!   Bendt, Collares-Pereira & Rabl (1981) distribution, written out here from the published
//!   CDF with `γ` from the mean relation (solved here by bisection, apart from the generator's
//!   Brent root), and the mean of the distribution with the paper's fitted `γ(K̄T)` against `K̄T`.

use super::Check;
use super::table::{Row, parse};
use crate::props::psychro;
use crate::weather::synthetic::{self, MonthlyNormals};
use crate::weather::{Humidity, MONTH_DAYS, WeatherYear, decompose};

const ERBS_TABLE: &str = "weather_erbs_pvlib.csv";
const ERBS: &str = include_str!("../../reference/weather_erbs_pvlib.csv");
const SKY_TABLE: &str = "weather_sky.csv";
const SKY: &str = include_str!("../../reference/weather_sky.csv");
const NORMALS_TABLE: &str = "weather_synthetic_normals.csv";
const NORMALS: &str = include_str!("../../reference/weather_synthetic_normals.csv");

/// Months whose daily clearness distribution is compared with Bendt's CDF.
const BENDT_MONTHS: [usize; 4] = [1, 4, 7, 10];
/// Cumulative frequencies at which the quantiles are compared.
const BENDT_P: [f64; 5] = [0.1, 0.25, 0.5, 0.75, 0.9];

/// Every weather check.
pub fn checks() -> crate::Result<Vec<Check>> {
    let mut out = erbs_checks()?;
    out.extend(sky_checks()?);
    out.extend(synthetic_checks()?);
    Ok(out)
}

fn sky_checks() -> crate::Result<Vec<Check>> {
    use crate::weather::sky;
    let mut out = Vec::new();
    for row in parse(SKY_TABLE, SKY)? {
        let (t, cloud) = (row.f64("t_air_c")?, row.f64("cloud_cover")?);
        let q = row.str("quantity")?;
        let value = match q {
            "clear_emissivity" => sky::swinbank_clear_sky_emissivity(t),
            "cloud_cover" => sky::cloud_cover_from_clearness(row.f64("kt")?),
            "long_wave_w_m2" => sky::long_wave_w_m2(t, cloud),
            "sky_temperature_c" => sky::sky_temperature_c(sky::long_wave_w_m2(t, cloud)),
            other => {
                return Err(crate::Error::Internal(format!(
                    "reference/{SKY_TABLE}: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: "weather",
            table: SKY_TABLE,
            case: format!("sky, {}, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(out)
}

fn erbs_checks() -> crate::Result<Vec<Check>> {
    let mut out = Vec::new();
    for row in parse(ERBS_TABLE, ERBS)? {
        let (dni, dhi) = decompose::erbs(
            row.f64("ghi_w_m2")?,
            row.f64("zenith_deg")?,
            row.f64("dni_extra_w_m2")?,
        );
        let q = row.str("quantity")?;
        let value = match q {
            "dni_w_m2" => dni,
            "dhi_w_m2" => dhi,
            other => {
                return Err(crate::Error::Internal(format!(
                    "reference/{ERBS_TABLE}: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: "weather",
            table: ERBS_TABLE,
            case: format!("Erbs, {}, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(out)
}

/// One demo climate of the normals table: site and normals.
struct Climate {
    name: String,
    lat: f64,
    lon: f64,
    utc: f64,
    elev: f64,
    rows: Vec<Row>,
}

fn climates() -> crate::Result<Vec<Climate>> {
    let mut out: Vec<Climate> = Vec::new();
    for row in parse(NORMALS_TABLE, NORMALS)? {
        let name = row.str("climate")?.to_string();
        match out.iter_mut().find(|c| c.name == name) {
            Some(c) => c.rows.push(row),
            None => out.push(Climate {
                name,
                lat: row.f64("latitude_deg")?,
                lon: row.f64("longitude_deg")?,
                utc: row.f64("utc_offset_h")?,
                elev: row.f64("elevation_m")?,
                rows: vec![row],
            }),
        }
    }
    Ok(out)
}

/// The 12 monthly values of `quantity` in a climate's rows, or `None` when absent.
fn monthly(c: &Climate, quantity: &str) -> crate::Result<Option<Vec<f64>>> {
    let mut v = vec![f64::NAN; 12];
    let mut any = false;
    for r in &c.rows {
        if r.str("quantity")? == quantity {
            let m = r.f64("month")? as usize;
            if !(1..=12).contains(&m) {
                return Err(crate::Error::Internal(format!(
                    "reference/{NORMALS_TABLE}: month {m}"
                )));
            }
            v[m - 1] = r.f64("expected")?;
            any = true;
        }
    }
    Ok(any.then_some(v))
}

fn need(c: &Climate, quantity: &str) -> crate::Result<Vec<f64>> {
    monthly(c, quantity)?.ok_or_else(|| {
        crate::Error::Internal(format!(
            "reference/{NORMALS_TABLE}: {} has no {quantity}",
            c.name
        ))
    })
}

fn normals_of(c: &Climate) -> crate::Result<MonthlyNormals> {
    Ok(MonthlyNormals {
        ghi_kwh_m2_day: need(c, "ghi_kwh_m2_day")?,
        t_mean_c: need(c, "t_mean_c")?,
        t_range_k: need(c, "t_range_k")?,
        rh_pct: monthly(c, "rh_pct")?,
        t_dew_c: monthly(c, "t_dew_c")?,
        seed: 1,
    })
}

/// Monthly statistics of a weather year: mean daily GHI (kWh/m²/day), mean of daily
/// (max+min)/2 (°C), mean daily range (K), mean hourly dew point (°C).
fn monthly_stats(y: &WeatherYear) -> crate::Result<[[f64; 4]; 12]> {
    let mut out = [[0.0; 4]; 12];
    let mut day = 0usize;
    for (m, &len) in MONTH_DAYS.iter().enumerate() {
        let mut s = [0.0; 4];
        for _ in 0..len {
            let hours = &y.hours[day * 24..day * 24 + 24];
            let ghi: f64 = hours.iter().map(|h| h.ghi_w_m2).sum();
            let tmax = hours.iter().map(|h| h.t_db_c).fold(f64::MIN, f64::max);
            let tmin = hours.iter().map(|h| h.t_db_c).fold(f64::MAX, f64::min);
            let mut dp = 0.0;
            for h in hours {
                match h.humidity {
                    Humidity::DewPointC(d) => dp += d,
                    other => {
                        return Err(crate::Error::Internal(format!(
                            "synthetic humidity is not a dew point: {other:?}"
                        )));
                    }
                }
            }
            s[0] += ghi / 1000.0;
            s[1] += (tmax + tmin) / 2.0;
            s[2] += tmax - tmin;
            s[3] += dp / 24.0;
            day += 1;
        }
        for k in 0..4 {
            out[m][k] = s[k] / len as f64;
        }
    }
    Ok(out)
}

/// Bendt et al. (1981) distribution written out from the published CDF
/// `F = (e^{γa} − e^{γK}) / (e^{γa} − e^{γb})`, `a = 0.05`, `b = KT,max(K̄T)`.
/// Its mean is `[(a − 1/γ) e^{γa} − (b − 1/γ) e^{γb}] / (e^{γa} − e^{γb})`.
struct Bendt {
    a: f64,
    b: f64,
    g: f64,
}

impl Bendt {
    fn new(kbar: f64, g: f64) -> Self {
        Bendt {
            a: synthetic::BENDT_KT_MIN,
            b: synthetic::bendt_kt_max(kbar),
            g,
        }
    }

    /// `γ` defined by the mean relation, by plain bisection (independent of the generator's
    /// Brent root), over −60..60.
    fn from_mean(kbar: f64) -> Self {
        let (mut lo, mut hi) = (-60.0, 60.0);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if Bendt::new(kbar, mid).mean() < kbar {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        Bendt::new(kbar, 0.5 * (lo + hi))
    }

    fn quantile(&self, p: f64) -> f64 {
        let (ea, eb) = ((self.g * self.a).exp(), (self.g * self.b).exp());
        (ea + p * (eb - ea)).ln() / self.g
    }

    fn mean(&self) -> f64 {
        let (a, b, g) = (self.a, self.b, self.g);
        if g.abs() < 1e-6 {
            return 0.5 * (a + b); // uniform limit
        }
        let (ea, eb) = ((g * a).exp(), (g * b).exp());
        ((a - 1.0 / g) * ea - (b - 1.0 / g) * eb) / (ea - eb)
    }
}

fn synthetic_checks() -> crate::Result<Vec<Check>> {
    let mut out = Vec::new();
    for c in climates()? {
        let n = normals_of(&c)?;
        let y = synthetic::synthesize(&n, c.lat, c.lon, c.utc, c.elev)?;
        let stats = monthly_stats(&y)?;
        for r in &c.rows {
            let m = r.f64("month")? as usize - 1;
            let q = r.str("quantity")?;
            let value = match q {
                "ghi_kwh_m2_day" => stats[m][0],
                "t_mean_c" => stats[m][1],
                "t_range_k" => stats[m][2],
                "t_dew_c" => stats[m][3],
                // RH at the month's mean dry-bulb from its mean dew point.
                "rh_pct" => {
                    100.0 * psychro::saturation_pressure_kpa(stats[m][3])?
                        / psychro::saturation_pressure_kpa(stats[m][1])?
                }
                other => {
                    return Err(crate::Error::Internal(format!(
                        "reference/{NORMALS_TABLE}: unknown quantity `{other}`"
                    )));
                }
            };
            let (expected, tolerance, source) = r.expected()?;
            out.push(Check {
                group: "weather",
                table: NORMALS_TABLE,
                case: format!("{}, month {}, {q}", c.name, m + 1),
                value,
                expected,
                tolerance,
                source,
            });
        }

        let (kt, kbar) = synthetic::daily_clearness(&n, c.lat)?;
        let src = "Bendt, Collares-Pereira & Rabl, Solar Energy 27(1) 1-5 (1981): CDF \
                   (e^{γa}-e^{γK})/(e^{γa}-e^{γb}), a = 0.05, b = 0.6313+0.267K̄-11.9(K̄-0.75)^8, \
                   γ from the mean relation (from memory)";
        for &m in &BENDT_MONTHS {
            let first: usize = MONTH_DAYS[..m - 1].iter().map(|&d| d as usize).sum();
            let len = MONTH_DAYS[m - 1] as usize;
            let mut days: Vec<f64> = kt[first..first + len].to_vec();
            days.sort_by(f64::total_cmp);
            let k = kbar[m - 1];
            let exact = Bendt::from_mean(k);
            for &p in &BENDT_P {
                // Order statistic i (1-based) stands at cumulative frequency (i − 0.5)/N.
                let x = (p * len as f64 + 0.5).clamp(1.0, len as f64);
                let lo = x.floor() as usize;
                let hi = x.ceil() as usize;
                let w = x - lo as f64;
                let value = days[lo - 1] * (1.0 - w) + days[hi - 1] * w;
                out.push(Check {
                    group: "weather",
                    table: "computed",
                    case: format!("{}, month {m} (K̄T {k:.3}), daily KT quantile {p}", c.name),
                    value,
                    expected: exact.quantile(p),
                    tolerance: 0.01,
                    source: src.to_string(),
                });
            }
            out.push(Check {
                group: "weather",
                table: "computed",
                case: format!(
                    "{}, month {m}, mean daily KT of Bendt's distribution with the fitted γ",
                    c.name
                ),
                value: Bendt::new(k, synthetic::bendt_gamma_fit(k)).mean(),
                expected: k,
                tolerance: 0.005,
                source:
                    "Bendt et al. (1981) fitted γ = -1.498 + (1.184ξ - 27.182e^{-1.5ξ})/(b-a), \
                         ξ = (b-a)/(b-K̄) (from memory); the distribution's mean must equal K̄T"
                        .to_string(),
            });
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn all_weather_checks_pass() {
        let checks = checks().unwrap();
        assert!(checks.len() > 100, "{} checks", checks.len());
        let mut worst = 0.0f64;
        for c in &checks {
            worst = worst.max((c.value - c.expected).abs() / c.tolerance);
            assert!(
                c.passed(),
                "{} [{}]: {} vs {} ± {}",
                c.case,
                c.table,
                c.value,
                c.expected,
                c.tolerance
            );
        }
        eprintln!(
            "weather checks: {}, worst |diff|/tol = {worst:.3}",
            checks.len()
        );
    }
}
