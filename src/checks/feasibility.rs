//! Reference checks for the feasibility metrics and the PV array (see `checks/mod.rs`).
//!
//! * `econ_textbook.csv` – capital recovery and discount factors from printed compound interest
//!   tables (from memory), and IRR / NPV / levelised-cost cases built on them (group
//!   `economics`).
//! * `econ_numpy_financial.csv` – NPV and IRR of invented cash flows, numpy-financial 1.0.0.
//! * `pv_pvlib.csv` – Faiman and NOCT cell temperature, PVWatts DC power and PVWatts inverter,
//!   pvlib 0.16.1 (group `pv`).
//! * computed – the energy definitions (PE, PER, f_sav, CO₂) on a hand-worked example
//!   (group `energy`), CRF's r → 0 limit, PV at STC.

use super::Check;
use super::table::parse;
use crate::components::pv::{CellTemp, InverterCurve, PvSpec};
use crate::error::{Error, Result};
use crate::feasibility::economics::{annuity_factor, irr, levelised_cost, npv};
use crate::feasibility::energy::{
    EnergySpec, EnergyUse, RefrigerantSpec, assess, fractional_savings,
};

const TEXTBOOK: &str = include_str!("../../reference/econ_textbook.csv");
const NPF: &str = include_str!("../../reference/econ_numpy_financial.csv");
const PVLIB: &str = include_str!("../../reference/pv_pvlib.csv");

fn unknown(table: &str, q: &str) -> Error {
    Error::Internal(format!("reference/{table}: unknown quantity `{q}`"))
}

/// Every economics, energy and PV check.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    textbook(&mut out)?;
    numpy_financial(&mut out)?;
    pvlib(&mut out)?;
    computed(&mut out)?;
    Ok(out)
}

fn textbook(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "econ_textbook.csv";
    for row in parse(T, TEXTBOOK)? {
        let (rate, years) = (row.f64("rate")?, row.f64("years")? as u32);
        let (capex, annual, output) = (row.f64("capex")?, row.f64("annual")?, row.f64("output")?);
        let q = row.str("quantity")?;
        let (expected, tolerance, source) = row.expected()?;
        let uniform = |first: f64| {
            let mut f = vec![annual; years as usize + 1];
            f[0] = first;
            f
        };
        let value = match q {
            "crf" => annuity_factor(rate, years)?,
            "pf" => npv(rate, &{
                let mut f = vec![0.0; years as usize + 1];
                f[years as usize] = 1.0;
                f
            })?,
            "irr_uniform" => irr(&uniform(-capex)).unwrap_or(f64::NAN),
            "npv_uniform" => npv(rate, &uniform(-capex))?,
            "levelised" => {
                levelised_cost(rate, years, capex, &vec![annual; years as usize], output)?
                    .unwrap_or(f64::NAN)
            }
            _ => return Err(unknown(T, q)),
        };
        out.push(Check {
            group: "economics",
            table: T,
            case: format!("{}, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

fn numpy_financial(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "econ_numpy_financial.csv";
    for row in parse(T, NPF)? {
        let rate = row.f64("rate")?;
        let flows = row
            .str("flows")?
            .split_whitespace()
            .map(|s| {
                s.parse::<f64>()
                    .map_err(|_| Error::Internal(format!("reference/{T}: bad flow `{s}`")))
            })
            .collect::<Result<Vec<f64>>>()?;
        let q = row.str("quantity")?;
        let (expected, tolerance, source) = row.expected()?;
        let value = match q {
            "npv" => npv(rate, &flows)?,
            "irr" => irr(&flows).unwrap_or(f64::NAN),
            _ => return Err(unknown(T, q)),
        };
        out.push(Check {
            group: "economics",
            table: T,
            case: format!("{}, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

/// The array of `make_pv_pvlib.py`.
fn table_array(cell_temp: CellTemp) -> PvSpec {
    PvSpec {
        kwp: 10.0,
        module_efficiency: 0.20,
        temp_coeff_per_k: -0.0037,
        cell_temp,
        inverter_efficiency: 0.96,
        inverter_curve: InverterCurve::Pvwatts,
        dc_ac_ratio: 1.2,
        dc_losses_fraction: 0.14,
        area_m2: None,
    }
}

fn pvlib(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "pv_pvlib.csv";
    let faiman = table_array(CellTemp::Faiman { u0: 25.0, u1: 6.84 });
    let noct = table_array(CellTemp::Noct {
        noct_c: 45.0,
        tau_alpha: 0.9,
    });
    for pv in [&faiman, &noct] {
        pv.validate()?;
    }
    for row in parse(T, PVLIB)? {
        let (g, ta, ws) = (
            row.f64("poa_w_m2")?,
            row.f64("t_amb_c")?,
            row.f64("wind_m_s")?,
        );
        let q = row.str("quantity")?;
        let (expected, tolerance, source) = row.expected()?;
        let value = match q {
            "t_cell_faiman_c" => faiman.cell_temp_c(g, ta, ws),
            "t_cell_noct_c" => noct.cell_temp_c(g, ta, ws),
            "dc_gross_kw" => faiman.dc_gross_kw(g, faiman.cell_temp_c(g, ta, ws)),
            "dc_gross_noct_kw" => noct.dc_gross_kw(g, noct.cell_temp_c(g, ta, ws)),
            "ac_kw" => faiman.ac_power_kw(g, ta, ws),
            "ac_noct_kw" => noct.ac_power_kw(g, ta, ws),
            _ => return Err(unknown(T, q)),
        };
        out.push(Check {
            group: "pv",
            table: T,
            case: format!("{}: {g} W/m2, {ta} °C, {ws} m/s, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

fn computed(out: &mut Vec<Check>) -> Result<()> {
    let mut push =
        |group: &'static str, case: &str, value: f64, expected: f64, tol: f64, src: &str| {
            out.push(Check {
                group,
                table: "computed",
                case: case.to_string(),
                value,
                expected,
                tolerance: tol,
                source: src.to_string(),
            })
        };
    // CRF → 1/n as r → 0
    push(
        "economics",
        "CRF(1e-7, 25) against its r -> 0 limit 1/n + r(n+1)/(2n)",
        annuity_factor(1e-7, 25)?,
        0.04 + 1e-7 * 26.0 / 50.0,
        1e-13,
        "series of r(1+r)^n/((1+r)^n - 1) about r = 0",
    );
    // Energy: hand-worked example. Reference 10 000 kWh grid (10 kWh × 1000 h), 5000 kWh fuel,
    // 20 kg refrigerant leaking 5 %/yr at GWP 1430; option 2000 kWh grid, 1000 kWh fuel;
    // both deliver 30 000 kWh cooling + 4000 kWh heat; factors 2.5 / 1.1, 0.4 / 0.18 kg/kWh.
    let spec = EnergySpec::default();
    spec.validate()?;
    let ref_h = [10.0; 1000];
    let opt_h = [2.0; 1000];
    let r = assess(
        &spec,
        &EnergyUse {
            hourly_import_kwh: &ref_h,
            fuel_kwh: 5000.0,
            cooling_kwh: 30_000.0,
            heat_kwh: 4000.0,
            water_m3: 0.0,
            refrigerant: Some(RefrigerantSpec {
                charge_kg: 20.0,
                leak_rate_per_year: 0.05,
                gwp100: 1430.0,
            }),
        },
    );
    let o = assess(
        &spec,
        &EnergyUse {
            hourly_import_kwh: &opt_h,
            fuel_kwh: 1000.0,
            cooling_kwh: 30_000.0,
            heat_kwh: 4000.0,
            water_m3: 120.0,
            refrigerant: None,
        },
    );
    let def = "definitions PE = E f_el + Q f_fuel, PER = (Qc + Qh)/PE, f_sav = 1 - PE/PE_ref \
               (IEA SHC solar cooling key figures, from memory); hand calculation";
    // PE_ref = 25 000 + 5500 = 30 500; PE_opt = 5000 + 1100 = 6100
    push(
        "energy",
        "reference primary energy, kWh",
        r.primary_energy_kwh,
        30_500.0,
        1e-9,
        def,
    );
    push(
        "energy",
        "option primary energy, kWh",
        o.primary_energy_kwh,
        6100.0,
        1e-9,
        def,
    );
    // PER_opt = 34 000/6100 = 5.573 770 49
    push(
        "energy",
        "option primary energy ratio",
        o.primary_energy_ratio.unwrap_or(f64::NAN),
        5.573_770_49,
        1e-8,
        def,
    );
    // f_sav = 1 − 6100/30 500 = 0.8
    push(
        "energy",
        "fractional primary energy savings",
        fractional_savings(o.primary_energy_kwh, r.primary_energy_kwh).unwrap_or(f64::NAN),
        0.8,
        1e-12,
        def,
    );
    // CO2_ref = 4000 + 900 + 1430 = 6330 kg; CO2_opt = 800 + 180 = 980 kg
    let co2 = "CO2 = E c_el + Q c_fuel + charge x leak rate x GWP100 (TEWI direct term, EN 378-1 \
               Annex B, from memory); hand calculation";
    push(
        "energy",
        "reference CO2, kg/yr",
        r.co2_total_kg,
        6330.0,
        1e-9,
        co2,
    );
    push(
        "energy",
        "option CO2, kg/yr",
        o.co2_total_kg,
        980.0,
        1e-9,
        co2,
    );
    push(
        "energy",
        "option water per MWh cooling, m3/MWh",
        o.water_m3_per_mwh_cooling.unwrap_or(f64::NAN),
        4.0,
        1e-12,
        "120 m3 / 30 MWh; hand calculation",
    );
    // PV at STC with the cell held at 25 °C: exactly the rating.
    let pv = table_array(CellTemp::default());
    push(
        "pv",
        "DC power at 1000 W/m2, 25 °C cell, kW",
        pv.dc_gross_kw(1000.0, 25.0),
        10.0,
        1e-12,
        "definition of the STC rating (PVWatts v5, Dobos 2014)",
    );
    Ok(())
}

#[cfg(test)]
mod tests {
    #[test]
    fn every_feasibility_check_passes() {
        let all = super::checks().unwrap();
        assert!(all.len() > 100, "{}", all.len());
        for c in &all {
            assert!(c.passed(), "{c:?}");
        }
    }
}
