//! Reference checks for the psychro area (humid air) and the chiller area (electric chiller);
//! see `checks/mod.rs` for the table format.
//!
//! * `psychro_psychrolib.csv` – psychrolib 2.5.0 on a grid of states (made by
//!   `reference/scripts/make_psychro_psychrolib.py`). The model and psychrolib evaluate the same
//!   closed forms (W, h, v, ρ: agreement to rounding, measured ≤ 6e-14 absolute) and solve the
//!   same equations for wet-bulb and dew point (Brent to ~1e-9 K here, psychrolib tightened to
//!   1e-10 K; measured ≤ 8e-9 K). Tolerances about ten times the measured differences: W 1e-9
//!   relative, h 1e-10 kJ/kg, v and ρ 1e-12, wet-bulb and dew point 1e-7 K.
//! * `psychro_ashrae.csv` – printed Handbook values (Tables 1 and 3, Example 1).
//! * `chiller_ahri.csv` – AHRI 550/590 rating point, IPLV formula and plausibility of defaults.

use super::Check;
use super::table::{check, parse};
use crate::components::chiller_electric::{AHRI_T_CHW_C, ChillerSpec, Condenser, IPLV_WEIGHTS};
use crate::error::{Error, Result};
use crate::props::psychro;

const PSYCHROLIB: &str = include_str!("../../reference/psychro_psychrolib.csv");
const ASHRAE: &str = include_str!("../../reference/psychro_ashrae.csv");
const CHILLER: &str = include_str!("../../reference/chiller_ahri.csv");

fn unknown(table: &str, q: &str) -> Error {
    Error::Internal(format!("reference/{table}: unknown quantity `{q}`"))
}

fn psychrolib_checks(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "psychro_psychrolib.csv";
    for row in parse(T, PSYCHROLIB)? {
        let (t, rh, p, w) = (
            row.f64("t_c")?,
            row.f64("rh_pct")?,
            row.f64("p_kpa")?,
            row.f64("w_kg_kg")?,
        );
        let q = row.str("quantity")?;
        let value = match q {
            "w_kg_kg" => psychro::ratio_from_rh(t, rh, p)?,
            "t_wb_c" => psychro::wet_bulb_c(t, w, p)?,
            "t_dp_c" => psychro::dew_point_c(t, w, p)?,
            "h_kj_kg" => psychro::enthalpy_kj_kg(t, w),
            "v_m3_kg" => psychro::specific_volume_m3_kg(t, w, p),
            "rho_kg_m3" => psychro::moist_air_density_kg_m3(t, w, p),
            other => return Err(unknown(T, other)),
        };
        let case = format!("{t} °C, {rh} %, {p} kPa, {q}");
        out.push(check("psychro", T, case, value, &row)?);
    }
    Ok(())
}

fn ashrae_checks(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "psychro_ashrae.csv";
    for row in parse(T, ASHRAE)? {
        let case_name = row.str("case")?;
        let q = row.str("quantity")?;
        let (value, case) = match (case_name, q) {
            ("table3", "pws_kpa") => {
                let t = row.f64("t_c")?;
                (
                    psychro::saturation_pressure_kpa(t)?,
                    format!("Table 3, {t} °C, pws_kpa"),
                )
            }
            ("table1", "p_kpa") => {
                let z = row.f64("z_m")?;
                (
                    psychro::pressure_at_elevation_kpa(z),
                    format!("Table 1, {z} m, p_kpa"),
                )
            }
            ("example1", _) => {
                let s = psychro::state_from_wet_bulb(
                    row.f64("t_c")?,
                    row.f64("t_wb_c")?,
                    row.f64("p_kpa_in")?,
                )?;
                let v = match q {
                    "w_kg_kg" => s.w_kg_kg,
                    "t_dp_c" => s.t_dp_c,
                    "rh_pct" => s.rh_pct,
                    "h_kj_kg" => s.h_kj_kg,
                    "v_m3_kg" => s.v_m3_kg,
                    other => return Err(unknown(T, other)),
                };
                (v, format!("Example 1 (40 °C db, 20 °C wb), {q}"))
            }
            (_, other) => return Err(unknown(T, other)),
        };
        out.push(check("psychro", T, case, value, &row)?);
    }
    Ok(())
}

/// Every psychro and chiller check.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    psychrolib_checks(&mut out)?;
    ashrae_checks(&mut out)?;
    chiller_checks(&mut out)?;
    Ok(out)
}

fn condenser(table: &str, s: &str) -> Result<Condenser> {
    match s {
        "water-cooled" => Ok(Condenser::WaterCooled),
        "air-cooled" => Ok(Condenser::AirCooled),
        other => Err(Error::Internal(format!(
            "reference/{table}: unknown condenser `{other}`"
        ))),
    }
}

fn chiller_checks(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "chiller_ahri.csv";
    for row in parse(T, CHILLER)? {
        let c = condenser(T, row.str("condenser")?)?;
        let q = row.str("quantity")?;
        let mut spec = ChillerSpec::typical(c, 500.0);
        if q != "demo_cop_rated" {
            spec.cop_rated = row.f64("cop_rated")?;
        }
        let value = match q {
            "cop_full_load" => spec.cop_full_load(row.f64("t_cond_in_c")?, AHRI_T_CHW_C),
            "t_rating_c" => c.rating_temperature_c(),
            "t_chw_rating_c" => AHRI_T_CHW_C,
            "iplv" => {
                spec.part_load = Some([row.f64("a")?, row.f64("b")?, row.f64("c")?, row.f64("d")?]);
                spec.validate()?;
                spec.iplv()
            }
            "cop_ratio_plus_1k" => {
                let t = row.f64("t_cond_in_c")?;
                spec.cop_full_load(t + 1.0, AHRI_T_CHW_C) / spec.cop_full_load(t, AHRI_T_CHW_C)
            }
            "demo_cop_rated" => spec.cop_rated,
            "iplv_over_cop" => spec.iplv() / spec.cop_rated,
            other => return Err(unknown(T, other)),
        };
        let case = format!("{}, {q}", row.str("case")?);
        out.push(check("chiller", T, case, value, &row)?);
    }
    out.push(Check {
        group: "chiller",
        table: "computed",
        case: "IPLV weights sum".into(),
        value: IPLV_WEIGHTS.iter().sum(),
        expected: 1.0,
        tolerance: 1e-12,
        source: "AHRI 550/590 (I-P) IPLV.IP weights 0.01 + 0.42 + 0.45 + 0.12 = 1".into(),
    });
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn all_checks_pass() {
        let all = checks().unwrap();
        let failed: Vec<_> = all.iter().filter(|c| !c.passed()).collect();
        assert!(
            failed.is_empty(),
            "{} of {} failed: {failed:#?}",
            failed.len(),
            all.len()
        );
        assert!(all.iter().filter(|c| c.group == "psychro").count() > 1400);
        assert!(all.iter().filter(|c| c.group == "chiller").count() >= 16);
    }
}
