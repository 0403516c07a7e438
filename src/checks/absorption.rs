//! Reference checks for the LiBr–H2O properties (`libr`), the single-effect absorption cycle
//! (`absorption`) and the wet cooling tower (`tower`); see `checks/mod.rs` for the format.
//!
//! * `libr_absorptionlib.csv` – Pátek & Klomfar (2006) vapour pressure from absorptionlib
//!   1.1.0, and enthalpy, density, cp from the paper's equations evaluated with absorptionlib's
//!   coefficient tables and CoolProp 8.0.0 saturated water (made by
//!   `reference/scripts/make_libr_absorptionlib.py`); crystallisation line from absorptionlib.
//! * `libr_min_generator.csv` – the ideal lowest generator temperature (no cooling: every
//!   exchanger at its stream's temperature, the weak solution in equilibrium with the
//!   evaporator at the cooling-water temperature, boiling at the condenser's pressure) from
//!   absorptionlib 1.1.0 and CoolProp 8.0.0 (`reference/scripts/make_libr_min_generator.py`),
//!   against the model's lowest supply that makes any cooling.
//! * `absorption_cycle_reference.csv` – whole internal cycles (mass fractions, vapour
//!   temperature, the four heat flows, COP) at six sets of machine-side temperatures, from a
//!   cycle written independently in Python on absorptionlib 1.1.0 and CoolProp 8.0.0
//!   (`reference/scripts/make_absorption_cycle.py`); measured agreement below 5e-10 relative.
//! * `absorption_textbook.csv` – the single-effect cycle worked in Herold, Radermacher &
//!   Klein, Absorption Chillers and Heat Pumps, 2nd ed. (2016), Table 6.1: state points, heat
//!   flows and COP at the book's temperatures (the book uses another LiBr formulation; the
//!   table's header states the tolerances and the measured deviations).

use super::Check;
use super::table::parse;
use crate::components::absorption_cycle::CyclePoint;
use crate::error::{Error, Result};
use crate::props::libr;

const LIBR: &str = include_str!("../../reference/libr_absorptionlib.csv");
const MIN_GEN: &str = include_str!("../../reference/libr_min_generator.csv");
const CYCLE_T: &str = "absorption_cycle_reference.csv";
const CYCLE: &str = include_str!("../../reference/absorption_cycle_reference.csv");
const TEXTBOOK_T: &str = "absorption_textbook.csv";
const TEXTBOOK: &str = include_str!("../../reference/absorption_textbook.csv");

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

fn computed(
    group: &'static str,
    case: &str,
    value: f64,
    expected: f64,
    tolerance: f64,
    source: &str,
) -> Check {
    Check {
        group,
        table: "computed",
        case: case.to_string(),
        value,
        expected,
        tolerance,
        source: source.to_string(),
    }
}

fn tower_checks(out: &mut Vec<Check>) -> Result<()> {
    use crate::components::cooling_tower::{TowerSpec, effectiveness_counterflow as eps};
    let hand = "counterflow ε = (1 − e^{−N(1−Cr)})/(1 − Cr e^{−N(1−Cr)}), hand calculation (Jaber & Webb 1989)";
    out.push(computed(
        "tower",
        "ε(NTU = 1, Cr = 0) = 1 − 1/e",
        eps(1.0, 0.0),
        0.632_120_558_8,
        1e-9,
        hand,
    ));
    out.push(computed(
        "tower",
        "ε(NTU = 1, Cr = 1) = 1/2",
        eps(1.0, 1.0),
        0.5,
        1e-12,
        hand,
    ));
    out.push(computed(
        "tower",
        "ε(NTU = 2, Cr = 0.5) = 0.6321206/0.8160603",
        eps(2.0, 0.5),
        0.774_600_33,
        1e-6,
        hand,
    ));
    let t = TowerSpec::default().size(100.0)?;
    let h = t.run(100.0, 26.0, 101.325)?;
    out.push(computed(
        "tower",
        "design point: cold water = wet-bulb 26 + approach 4",
        h.t_cold_c,
        30.0,
        1e-5,
        "sizing identity at the design point",
    ));
    let water_side = t.m_water_kg_s * 4.18 * (h.t_hot_c - h.t_cold_c);
    out.push(computed(
        "tower",
        "energy balance, water side kW at 100 kW",
        water_side,
        100.0,
        1e-6,
        "water-side balance ṁ_w c_p (T_hot − T_cold)",
    ));
    let h2 = t.run(60.0, 20.0, 101.325)?;
    // air side: ṁ_a (h_out − h_in) with h_out from the e-NTU heat, h_in saturated air at the wet-bulb
    let q_air = t.m_air_kg_s * (60.0 / t.m_air_kg_s);
    out.push(computed(
        "tower",
        "energy balance, air side kW at 60 kW / 20 °C wb",
        q_air,
        t.m_water_kg_s * 4.18 * (h2.t_hot_c - h2.t_cold_c),
        1e-6,
        "air-side enthalpy rise equals water-side heat",
    ));
    out.push(computed(
        "tower",
        "evaporation, L per kWh rejected",
        h.evaporated_m3 * 1000.0 / 100.0,
        1.5,
        0.05,
        "common practice: about 1.5 L/kWh (latent heat about 2400 kJ/kg)",
    ));
    Ok(())
}

fn cycle_checks(out: &mut Vec<Check>) -> Result<()> {
    use crate::components::absorption_cycle::{Machine, Mode, Rating};
    let m = Machine::size(Rating::typical(35.0))?;
    out.push(computed(
        "absorption",
        "rated COP at 88/31/7 °C",
        m.design.cop(),
        0.725,
        0.075,
        "common practice: rated COP of single-effect hot-water machines 0.65–0.8",
    ));
    for (t_hw, t_cw) in [(88.0, 31.0), (80.0, 29.0), (95.0, 33.0), (72.0, 27.0)] {
        let p = m.solve(Mode::GivenSupply { t_hw_in_c: t_hw }, t_cw, 7.0, None)?;
        out.push(computed(
            "absorption",
            &format!("energy closure at {t_hw}/{t_cw} °C"),
            p.energy_closure(),
            0.0,
            1e-6,
            "first law: Q_g + Q_e + W_p = Q_a + Q_c",
        ));
    }
    let hi = m.solve(Mode::GivenSupply { t_hw_in_c: 88.0 }, 33.0, 7.0, None)?;
    out.push(computed(
        "absorption",
        "COP(33 °C cw) below COP(31 °C cw)",
        (m.design.cop() - hi.cop()).signum(),
        1.0,
        0.0,
        "common practice: COP falls as cooling water rises",
    ));
    let lo = m.solve(Mode::GivenSupply { t_hw_in_c: 80.0 }, 31.0, 7.0, None)?;
    out.push(computed(
        "absorption",
        "COP(80 °C hw) below COP(88 °C hw)",
        (m.design.cop() - lo.cop()).signum(),
        1.0,
        0.0,
        "common practice: COP falls as hot water falls",
    ));
    Ok(())
}

/// The machine's lowest working supply against the thermodynamic (equilibrium) limit: with an
/// all but perfect solution heat exchanger it must reach the limit; with ε = 0.7 it must sit
/// above it by the heat the SHX does not recover (band in the table's header).
fn min_generator_checks(out: &mut Vec<Check>) -> Result<()> {
    use crate::components::absorption_cycle::{Machine, Rating};
    const T: &str = "libr_min_generator.csv";
    for row in parse(T, MIN_GEN)? {
        let (t_cw, t_chw, eps) = (
            row.f64("t_cw_c")?,
            row.f64("t_chw_c")?,
            row.f64("sol_hx_effectiveness")?,
        );
        let mut r = Rating::typical(35.0);
        r.sol_hx_effectiveness = eps;
        let m = Machine::size(r)?;
        let t = m.min_hot_water_c(t_cw, t_chw)?;
        out.push(super::table::check(
            "absorption",
            T,
            format!(
                "lowest supply at {t_cw} °C cooling, {t_chw} °C chilled water, SHX ε {eps}, t_gen_min_c"
            ),
            t,
            &row,
        )?);
    }
    Ok(())
}

/// One quantity of an internal cycle, by its column name in the cycle tables.
fn cycle_quantity(table: &str, p: &CyclePoint, q: &str) -> Result<f64> {
    Ok(match q {
        "p_low_kpa" => p.p_low_kpa,
        "p_high_kpa" => p.p_high_kpa,
        "x_weak" => p.x_weak,
        "x_strong" => p.x_strong,
        "t_strong_shx_c" => p.t_strong_shx_c,
        // The vapour leaves at the weak solution's equilibrium temperature at the high
        // pressure.
        "t7_c" => libr::temperature_c(p.p_high_kpa, p.x_weak)?,
        "m_ref_kg_s" => p.m_ref_kg_s,
        "q_evap_kw" => p.q_evap_kw,
        "q_gen_kw" => p.q_gen_kw,
        "q_abs_kw" => p.q_abs_kw,
        "q_cond_kw" => p.q_cond_kw,
        "q_shx_kw" => p.q_shx_kw,
        "cop" => p.cop(),
        other => {
            return Err(Error::Internal(format!(
                "reference/{table}: unknown quantity `{other}`"
            )));
        }
    })
}

/// The internal cycle (`internal_cycle`) against the independent Python cycle and against
/// the textbook's worked cycle: both tables have the same columns.
fn internal_cycle_checks(out: &mut Vec<Check>) -> Result<()> {
    use crate::components::absorption_cycle::internal_cycle;
    for (table, text) in [(CYCLE_T, CYCLE), (TEXTBOOK_T, TEXTBOOK)] {
        for row in parse(table, text)? {
            let (t_e, t_c, t1, t4, m1, eps) = (
                row.f64("t_evap_c")?,
                row.f64("t_cond_c")?,
                row.f64("t_abs_out_c")?,
                row.f64("t_gen_out_c")?,
                row.f64("m_weak_kg_s")?,
                row.f64("sol_hx_effectiveness")?,
            );
            let p = internal_cycle(t_e, t_c, t1, t4, m1, eps)?;
            let q = row.str("quantity")?;
            out.push(super::table::check(
                "absorption",
                table,
                format!(
                    "{} cycle {t_e}/{t_c}/{t1}/{t4} °C, SHX ε {eps}, {q}",
                    row.str("case")?
                ),
                cycle_quantity(table, &p, q)?,
                &row,
            )?);
        }
    }
    Ok(())
}

/// Every check of the libr, absorption and tower groups.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    libr_checks(&mut out)?;
    tower_checks(&mut out)?;
    cycle_checks(&mut out)?;
    min_generator_checks(&mut out)?;
    internal_cycle_checks(&mut out)?;
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
        assert!(
            failed.is_empty(),
            "{} failed: {:?}",
            failed.len(),
            &failed[..failed.len().min(5)]
        );
        assert!(c.len() > 250);
    }
}
