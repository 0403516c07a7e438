//! Reference checks for the numerics: Levenberg–Marquardt (`num::lm`) on NIST StRD nonlinear
//! regression problems (`num_nist_strd.csv`, data in `num_nist_strd_data.csv`); see
//! `checks/mod.rs` for the format.

use super::Check;
use super::table::{check, parse};
use crate::error::{Error, Result};
use crate::num::lm::levenberg_marquardt;

const CHECKS: &str = include_str!("../../reference/num_nist_strd.csv");
const DATA: &str = include_str!("../../reference/num_nist_strd_data.csv");

/// Model, certified values and NIST starting values 1 and 2 of a problem.
struct Problem {
    model: fn(&[f64], f64) -> f64,
    certified: &'static [f64],
    starts: [&'static [f64]; 2],
}

fn problem(name: &str) -> Result<Problem> {
    match name {
        "Misra1a" => Ok(Problem {
            model: |b, x| b[0] * (1.0 - (-b[1] * x).exp()),
            certified: &[2.3894212918E+02, 5.5015643181E-04],
            starts: [&[500.0, 1e-4], &[250.0, 5e-4]],
        }),
        "MGH09" => Ok(Problem {
            model: |b, x| b[0] * (x * x + x * b[1]) / (x * x + x * b[2] + b[3]),
            certified: &[
                1.9280693458E-01,
                1.9128232873E-01,
                1.2305650693E-01,
                1.3606233068E-01,
            ],
            starts: [&[25.0, 39.0, 41.5, 39.0], &[0.25, 0.39, 0.415, 0.39]],
        }),
        other => Err(Error::Internal(format!(
            "reference/num_nist_strd.csv: unknown problem `{other}`"
        ))),
    }
}

fn residuals(p: &Problem, data: &[(f64, f64)], b: &[f64]) -> Vec<f64> {
    data.iter().map(|&(x, y)| y - (p.model)(b, x)).collect()
}

pub fn checks() -> Result<Vec<Check>> {
    const T: &str = "num_nist_strd.csv";
    let mut data: Vec<(String, f64, f64)> = Vec::new();
    for row in parse("num_nist_strd_data.csv", DATA)? {
        data.push((
            row.str("problem")?.to_string(),
            row.f64("x")?,
            row.f64("y")?,
        ));
    }
    let mut out = Vec::new();
    for row in parse(T, CHECKS)? {
        let name = row.str("problem")?;
        let p = problem(name)?;
        let obs: Vec<(f64, f64)> = data
            .iter()
            .filter(|d| d.0 == name)
            .map(|d| (d.1, d.2))
            .collect();
        let start = row.f64("start")?;
        let q = row.str("quantity")?;
        let value = if q == "rss_at_certified" {
            residuals(&p, &obs, p.certified).iter().map(|r| r * r).sum()
        } else {
            let b0 = match start as i64 {
                1 => p.starts[0],
                2 => p.starts[1],
                _ => return Err(Error::Internal(format!("reference/{T}: start {start}"))),
            };
            let fit = levenberg_marquardt(name, b0, 1000, |b| Ok(residuals(&p, &obs, b)))?;
            match q {
                "rss" => fit.sum_sq,
                _ => {
                    let k: usize = q
                        .strip_prefix('b')
                        .and_then(|s| s.parse().ok())
                        .filter(|&k| k >= 1 && k <= fit.p.len())
                        .ok_or_else(|| {
                            Error::Internal(format!("reference/{T}: unknown quantity `{q}`"))
                        })?;
                    fit.p[k - 1]
                }
            }
        };
        out.push(check(
            "num",
            T,
            format!("{name} start {start}, {q}"),
            value,
            &row,
        )?);
    }
    Ok(out)
}
