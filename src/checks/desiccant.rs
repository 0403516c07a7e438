//! Checks of the desiccant route: the F1/F2 wheel, balances, published potential-line
//! properties and facts of the trade.

use super::Check;
use super::table;
use crate::components::chiller_electric::{ChillerSpec, Condenser};
use crate::components::desiccant_wheel::{Air, DesiccantWheel, f1, f2, state_from_potentials};
use crate::error::{Error, Result};
use crate::load::LoadHour;
use crate::props::psychro;
use crate::routes::HourConditions;
use crate::routes::desiccant::{Desiccant, DesiccantSpec, build};

const POTENTIALS: &str = include_str!("../../reference/desiccant_potentials.csv");
const TRADE: &str = include_str!("../../reference/desiccant_trade.csv");
const P: f64 = 101.325;

/// The typical unit of the trade table.
fn typical_unit() -> Result<Desiccant> {
    build(
        &DesiccantSpec::typical(10_000.0),
        &ChillerSpec::typical(Condenser::WaterCooled, 200.0),
    )
}

/// An hour at 101.325 kPa, room 26 °C.
fn hour(t_db_c: f64, w_kg_kg: f64, sensible_kw: f64, latent_kw: f64) -> Result<HourConditions> {
    Ok(HourConditions {
        hour: 0,
        t_db_c,
        w_kg_kg,
        t_wb_c: psychro::wet_bulb_c(t_db_c, w_kg_kg, P)?,
        p_kpa: P,
        load: LoadHour {
            sensible_kw,
            latent_kw,
            heating_kw: 0.0,
            t_in_c: 26.0,
            // The typical unit's own flow: it replaces all of the building's outdoor air.
            ventilation_m3_h: 10_000.0,
        },
    })
}

/// Temperature on the line `fun = target` at humidity ratio `w` (Brent, −20..150 °C).
fn t_on_line(fun: fn(f64, f64) -> f64, target: f64, w: f64) -> Result<f64> {
    crate::num::brent("potential line", -20.0, 150.0, 1e-10, |t| {
        fun(t, w) - target
    })
}

pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    let c = |table: &'static str, case: String, value, expected, tolerance, source: String| Check {
        group: "desiccant",
        table,
        case,
        value,
        expected,
        tolerance,
        source,
    };
    // F1/F2 invariance and balances of the wheel (computed).
    let wheel = DesiccantWheel::new(0.05, 0.95)?;
    for (pi, ri) in [
        ((30.0, 0.012), (70.0, 0.012)),
        ((35.0, 0.0142), (60.0, 0.0111)),
        ((26.0, 0.0105), (80.0, 0.016)),
    ] {
        let (pi, ri) = (
            Air {
                t_c: pi.0,
                w_kg_kg: pi.1,
            },
            Air {
                t_c: ri.0,
                w_kg_kg: ri.1,
            },
        );
        let o = wheel.run(pi, ri, 1.0, 1.0, P)?;
        let po = o.process_out;
        let name = format!(
            "process {:.1} °C {:.4} / regen {:.0} °C",
            pi.t_c, pi.w_kg_kg, ri.t_c
        );
        let eps1 = (f1(po.t_c, po.w_kg_kg) - f1(pi.t_c, pi.w_kg_kg))
            / (f1(ri.t_c, ri.w_kg_kg) - f1(pi.t_c, pi.w_kg_kg));
        let eps2 = (f2(po.t_c, po.w_kg_kg) - f2(pi.t_c, pi.w_kg_kg))
            / (f2(ri.t_c, ri.w_kg_kg) - f2(pi.t_c, pi.w_kg_kg));
        let def = "effectiveness definition ε_Fi = (Fi,po − Fi,pi)/(Fi,ri − Fi,pi), Jurinak 1982";
        out.push(c(
            "computed",
            format!("{name}, ε_F1 from outlet"),
            eps1,
            0.05,
            1e-9,
            def.into(),
        ));
        out.push(c(
            "computed",
            format!("{name}, ε_F2 from outlet"),
            eps2,
            0.95,
            1e-9,
            def.into(),
        ));
        let ideal = DesiccantWheel::new(0.0, 1.0)?
            .run(pi, ri, 1.0, 1.0, P)?
            .process_out;
        out.push(c(
            "computed",
            format!("{name}, ideal wheel F1 stays at inlet"),
            f1(ideal.t_c, ideal.w_kg_kg),
            f1(pi.t_c, pi.w_kg_kg),
            1e-10,
            "Jurinak 1982 ideal dehumidifier: ε_F1 = 0, ε_F2 = 1".into(),
        ));
        let w_in = pi.w_kg_kg + ri.w_kg_kg;
        let h_in = pi.h_kj_kg() + ri.h_kj_kg();
        let w_out = po.w_kg_kg + o.regen_out.w_kg_kg;
        let h_out = po.h_kj_kg() + o.regen_out.h_kj_kg();
        let bal = "steady-flow balance of the adiabatic wheel, relative closure";
        out.push(c(
            "computed",
            format!("{name}, water balance"),
            (w_in - w_out) / w_in,
            0.0,
            1e-9,
            bal.into(),
        ));
        out.push(c(
            "computed",
            format!("{name}, energy balance"),
            (h_in - h_out) / h_in,
            0.0,
            1e-9,
            bal.into(),
        ));
    }
    // The potentials round trip (intersection solve).
    for (t, w) in [(30.0, 0.012), (55.0, 0.005)] {
        let s = state_from_potentials(f1(t, w), f2(t, w))?;
        out.push(c(
            "computed",
            format!("F1/F2 intersection returns {t} °C"),
            s.t_c,
            t,
            1e-8,
            "inverse of the potentials: state_from_potentials(F1(t,W), F2(t,W)) = (t,W)".into(),
        ));
    }
    // Published properties of the potential lines.
    for r in table::parse("desiccant_potentials.csv", POTENTIALS)? {
        let (expected, tolerance, source) = r.expected()?;
        let (t, w, w_end) = (r.f64("t_c")?, r.f64("w_kg_kg")?, r.f64("w_end_kg_kg")?);
        let q = r.str("quantity")?;
        let value = match q {
            "dh_along_f1" => {
                let t_end = t_on_line(f1, f1(t, w), w_end)?;
                psychro::enthalpy_kj_kg(t_end, w_end) - psychro::enthalpy_kj_kg(t, w)
            }
            "drh_along_f2" => {
                let t_end = t_on_line(f2, f2(t, w), w_end)?;
                psychro::rh_from_ratio(t_end, w_end, P)? - psychro::rh_from_ratio(t, w, P)?
            }
            other => {
                return Err(Error::Internal(format!(
                    "reference/desiccant_potentials.csv: unknown quantity `{other}`"
                )));
            }
        };
        out.push(c(
            "desiccant_potentials.csv",
            format!("{}, {q}", r.str("case")?),
            value,
            expected,
            tolerance,
            source,
        ));
    }
    // Facts of the trade on whole hours, and the route's own balances.
    let unit = typical_unit()?;
    for r in table::parse("desiccant_trade.csv", TRADE)? {
        let (expected, tolerance, source) = r.expected()?;
        let (sens, lat) = (r.f64("sensible_kw")?, r.f64("latent_kw")?);
        let hc = hour(r.f64("t_db_c")?, r.f64("w_kg_kg")?, sens, lat)?;
        let h = unit.solve_hour(&hc, None)?;
        let q = r.str("quantity")?;
        let value = match q {
            "t_regen_c" => h.t_regen_c.unwrap_or(f64::NAN),
            "regen_heat_kwh" => h.regen_heat_kwh,
            "evaporative_share" => h.sensible_kwh / (sens + lat),
            other => {
                return Err(Error::Internal(format!(
                    "reference/desiccant_trade.csv: unknown quantity `{other}`"
                )));
            }
        };
        let case = r.str("case")?;
        out.push(c(
            "desiccant_trade.csv",
            format!("{case}, {q}"),
            value,
            expected,
            tolerance,
            source,
        ));
        let bal = "unit energy and water balance over all air streams, relative closure";
        out.push(c(
            "computed",
            format!("{case}, unit energy balance"),
            h.energy_balance_rel,
            0.0,
            1e-9,
            bal.into(),
        ));
        out.push(c(
            "computed",
            format!("{case}, unit water balance"),
            h.water_balance_rel,
            0.0,
            1e-9,
            bal.into(),
        ));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    #[test]
    fn all_desiccant_checks_pass() {
        let checks = super::checks().unwrap();
        assert!(checks.len() >= 25, "{}", checks.len());
        for c in &checks {
            assert!(c.passed(), "{c:?}");
        }
    }
}
