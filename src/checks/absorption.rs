//! Reference checks for the LiBr–H2O properties (`libr`), the single-effect absorption cycle
//! (`absorption`) and the wet cooling tower (`tower`); see `checks/mod.rs` for the format.
//!
//! * `libr_absorptionlib.csv` – Pátek & Klomfar (2006) vapour pressure from absorptionlib
//!   1.1.0, and enthalpy, density, cp from the paper's equations evaluated with absorptionlib's
//!   coefficient tables and CoolProp 8.0.0 saturated water (made by
//!   `reference/scripts/make_libr_absorptionlib.py`); crystallisation line from absorptionlib.

use super::Check;
use super::table::parse;
use crate::error::{Error, Result};
use crate::props::libr;

const LIBR: &str = include_str!("../../reference/libr_absorptionlib.csv");

fn libr_checks(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "libr_absorptionlib.csv";
    for row in parse(T, LIBR)? {
        let (t, x) = (row.f64("t_c")?, row.f64("x")?);
        let q = row.str("quantity")?;
        let value = match q {
            "p_kpa" => libr::vapour_pressure_kpa(t, x)?,
            "h_kj_kg" => libr::enthalpy_kj_kg(t, x)?,
            "rho_kg_m3" => libr::density_kg_m3(t, x)?,
            "cp_kj_kgk" => libr::cp_kj_kgk(t, x)?,
            "t_cryst_c" => libr::crystallisation_temperature_c(x)?,
            other => {
                return Err(Error::Internal(format!(
                    "reference/{T}: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: "libr",
            table: T,
            case: format!("{t} °C, x = {x}, {q}"),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

/// Every check of the libr, absorption and tower groups.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    libr_checks(&mut out)?;
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn all_absorption_checks_pass() {
        let c = checks().unwrap();
        let mut worst = std::collections::BTreeMap::<String, f64>::new();
        for k in &c {
            let q = k.case.rsplit(", ").next().unwrap_or("").to_string();
            let rel = (k.value - k.expected).abs() / k.expected.abs().max(1e-300);
            let e = worst.entry(format!("{} {q}", k.group)).or_insert(0.0);
            *e = e.max(rel);
        }
        eprintln!("worst relative differences: {worst:?}");
        let failed: Vec<_> = c.iter().filter(|k| !k.passed()).collect();
        assert!(failed.is_empty(), "{} failed: {:?}", failed.len(), &failed[..failed.len().min(5)]);
        assert!(c.len() > 250);
    }
}
