//! Reference checks for the storage area (see `checks/mod.rs` for the table format).
//!
//! * `water_if97.csv` – IAPWS R7-97(2012) verification values (Tables 5, 35, 36).
//! * `water_iapws.csv` – liquid density, cp and enthalpy against iapws 1.5.5 (PyPI).
//! * `storage_tank.csv` – heat to warm a full tank, `V ρ cp ΔT`, with ρ and cp from iapws 1.5.5.
//! * computed – closed forms: exponential cooling of a mixed tank, plug-flow charging of a cold
//!   stratified tank, heat across a PCM melt, the exchanger at an isothermal melt, and the
//!   energy balance of both stores.

use super::Check;
use super::table::parse;
use crate::components::pcm::{Pcm, PcmSpec};
use crate::components::tank::{Inlet, Stream, Tank, TankSpec, energy_to_heat_j};
use crate::error::{Error, Result};
use crate::props::water;

const IF97: &str = include_str!("../../reference/water_if97.csv");
const IAPWS: &str = include_str!("../../reference/water_iapws.csv");
const TANK: &str = include_str!("../../reference/storage_tank.csv");

const GROUP: &str = "storage";

fn check(
    table: &'static str,
    case: String,
    value: f64,
    expected: f64,
    tolerance: f64,
    source: String,
) -> Check {
    Check {
        group: GROUP,
        table,
        case,
        value,
        expected,
        tolerance,
        source,
    }
}

fn unknown(table: &str, q: &str) -> Error {
    Error::Internal(format!("reference/{table}: unknown quantity `{q}`"))
}

/// Every storage check.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    if97(&mut out)?;
    iapws(&mut out)?;
    tank_heat(&mut out)?;
    tank_loss(&mut out)?;
    tank_charge(&mut out)?;
    tank_balance(&mut out);
    pcm(&mut out);
    glycol(&mut out)?;
    Ok(out)
}

/// Propylene glycol table interpolation against CoolProp between the grid lines.
fn glycol(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "glycol_check_coolprop.csv";
    for row in parse(T, include_str!("../../reference/glycol_check_coolprop.csv"))? {
        let (x, t) = (row.f64("mass_fraction")?, row.f64("t_c")?);
        let (rho, cp) = crate::props::glycol::properties(t, x)?;
        let q = row.str("quantity")?;
        let value = match q {
            "rho_kg_m3" => rho,
            "cp_j_kgk" => cp,
            other => {
                return Err(Error::Internal(format!(
                    "reference/{T}: unknown quantity {other}"
                )));
            }
        };
        out.push(super::table::check(
            "glycol",
            T,
            format!("propylene glycol x = {x}, {t} °C, {q}"),
            value,
            &row,
        )?);
    }
    Ok(())
}

fn if97(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "water_if97.csv";
    for row in parse(T, IF97)? {
        let (t_k, p_mpa, q) = (row.f64("t_k")?, row.f64("p_mpa")?, row.str("quantity")?);
        let (expected, tol, source) = row.expected()?;
        let (t_c, p_kpa) = (t_k - 273.15, p_mpa * 1000.0);
        let value = match q {
            "v_m3_kg" => 1.0 / water::liquid_density_kg_m3(t_c, p_kpa)?,
            "h_kj_kg" => water::liquid_enthalpy_kj_kg(t_c, p_kpa)?,
            "cp_kj_kgk" => water::liquid_cp_j_kgk(t_c, p_kpa)? / 1000.0,
            "psat_mpa" => water::saturation_pressure_kpa(t_c)? / 1000.0,
            "tsat_k" => water::saturation_temperature_c(p_kpa)? + 273.15,
            _ => return Err(unknown(T, q)),
        };
        out.push(check(
            T,
            format!("T = {t_k} K, p = {p_mpa} MPa, {q}"),
            value,
            expected,
            tol,
            source,
        ));
    }
    Ok(())
}

fn iapws(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "water_iapws.csv";
    for row in parse(T, IAPWS)? {
        let (t_c, p_kpa, q) = (row.f64("t_c")?, row.f64("p_kpa")?, row.str("quantity")?);
        let (expected, tol, source) = row.expected()?;
        let value = match q {
            "rho_kg_m3" => water::liquid_density_kg_m3(t_c, p_kpa)?,
            "cp_j_kgk" => water::liquid_cp_j_kgk(t_c, p_kpa)?,
            "h_kj_kg" => water::liquid_enthalpy_kj_kg(t_c, p_kpa)?,
            _ => return Err(unknown(T, q)),
        };
        out.push(check(
            T,
            format!("{t_c} °C, {p_kpa} kPa, {q}"),
            value,
            expected,
            tol,
            source,
        ));
    }
    Ok(())
}

/// Heat stored in a 5-node tank started `ΔT` above the reference, against `V ρ cp ΔT`.
fn tank_heat(out: &mut Vec<Check>) -> Result<()> {
    const T: &str = "storage_tank.csv";
    for row in parse(T, TANK)? {
        let (v, t_c, p_kpa, dt) = (
            row.f64("volume_m3")?,
            row.f64("t_c")?,
            row.f64("p_kpa")?,
            row.f64("delta_t_k")?,
        );
        let q = row.str("quantity")?;
        if q != "heat_j" {
            return Err(unknown(T, q));
        }
        let (expected, tol, source) = row.expected()?;
        let rho = water::liquid_density_kg_m3(t_c, p_kpa)?;
        let cp = water::liquid_cp_j_kgk(t_c, p_kpa)?;
        let spec = TankSpec {
            volume_m3: v,
            height_m: 2.0,
            ua_w_k: 0.0,
            nodes: 5,
            t_init_c: t_c + dt,
            cp_j_kgk: cp,
            rho_kg_m3: rho,
        };
        spec.validate()?;
        let value = Tank::new(&spec).stored_j(t_c);
        out.push(check(
            T,
            format!("{v} m³ at {t_c} °C +{dt} K, tank stored_j"),
            value,
            expected,
            tol,
            source.clone(),
        ));
        let helper = energy_to_heat_j(v, rho, cp, dt);
        out.push(check(
            T,
            format!("{v} m³ at {t_c} °C +{dt} K, energy_to_heat_j"),
            helper,
            expected,
            tol,
            source,
        ));
    }
    Ok(())
}

/// ρ, cp of water at 60 °C, 300 kPa (IF97).
fn water_60() -> Result<(f64, f64)> {
    Ok((
        water::liquid_density_kg_m3(60.0, 300.0)?,
        water::liquid_cp_j_kgk(60.0, 300.0)?,
    ))
}

/// One step of a fully mixed (1-node) tank against exact exponential decay.
fn tank_loss(out: &mut Vec<Check>) -> Result<()> {
    let (rho, cp) = water_60()?;
    // (volume m³, UA W/K, T0 °C, room °C, step s)
    for (v, ua, t0, ta, dt) in [
        (1.0, 5.0, 80.0, 20.0, 3600.0),
        (0.3, 3.0, 60.0, 15.0, 3600.0),
        (2.0, 10.0, 90.0, 25.0, 86_400.0),
        (0.05, 50.0, 70.0, 20.0, 3600.0),
    ] {
        let spec = TankSpec {
            volume_m3: v,
            height_m: 1.5,
            ua_w_k: ua,
            nodes: 1,
            t_init_c: t0,
            cp_j_kgk: cp,
            rho_kg_m3: rho,
        };
        spec.validate()?;
        let mut tank = Tank::new(&spec);
        let r = tank.step(dt, &[], ta, 0.0);
        let mc = rho * v * cp;
        let x = ua * dt / mc;
        let exact = ta + (t0 - ta) * (-x).exp();
        // The model's loss step is the exact exponential, so only rounding separates them.
        let tol_t = 1e-9 * t0.abs().max(1.0);
        let src = "computed: T(t) = Ta + (T0 − Ta) exp(−UA t/(m cp)), fully mixed tank without flow (Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., §8.3)".to_string();
        let case = format!("mixed tank {v} m³, UA {ua} W/K, {t0}→ room {ta} °C over {dt} s");
        out.push(check(
            "computed",
            format!("{case}, T_end_c"),
            tank.t_mean_c(),
            exact,
            tol_t,
            src.clone(),
        ));
        out.push(check(
            "computed",
            format!("{case}, q_loss_j"),
            r.q_loss_j,
            mc * (t0 - exact),
            mc * tol_t,
            src,
        ));
    }
    Ok(())
}

/// Plug flow into a cold stratified tank, with a whole number of node masses passed (Courant
/// number 1, sharp front): delivered heat = ṁ cp (T_in − T_cold) t while the outlet is cold.
fn tank_charge(out: &mut Vec<Check>) -> Result<()> {
    let (rho, cp) = water_60()?;
    // (nodes, flow kg/s, node masses passed (< nodes), T_in, T_cold)
    for (nodes, flow, passed, t_in, t_cold) in [
        (10usize, 0.1, 4.0, 60.0, 20.0),
        (20, 0.5, 15.0, 85.0, 30.0),
        (5, 0.02, 1.0, 45.0, 12.0),
    ] {
        let spec = TankSpec {
            volume_m3: 1.0,
            height_m: 2.0,
            ua_w_k: 0.0,
            nodes,
            t_init_c: t_cold,
            cp_j_kgk: cp,
            rho_kg_m3: rho,
        };
        spec.validate()?;
        let mut tank = Tank::new(&spec);
        let m_node = rho * 1.0 / nodes as f64;
        let t = passed * m_node / flow;
        let r = tank.step(
            t,
            &[Stream {
                flow_kg_s: flow,
                t_in_c: t_in,
                inlet: Inlet::Top,
            }],
            20.0,
            0.0,
        );
        let ideal = flow * cp * (t_in - t_cold) * t;
        let case = format!(
            "charge {nodes}-node tank at {t_cold} °C, {flow} kg/s at {t_in} °C for {t:.1} s"
        );
        let src =
            "computed: Q = ṁ cp (T_in − T_cold) t while the plug front has not reached the outlet"
                .to_string();
        out.push(check(
            "computed",
            format!("{case}, q_in_j"),
            r.q_in_j[0],
            ideal,
            1e-9 * ideal,
            src.clone(),
        ));
        out.push(check(
            "computed",
            format!("{case}, t_out_c"),
            r.t_out_c[0],
            t_cold,
            1e-9,
            src,
        ));
    }
    Ok(())
}

/// Energy balance of a tank with two streams, losses and an element, over a day.
fn tank_balance(out: &mut Vec<Check>) {
    let spec = TankSpec {
        volume_m3: 2.0,
        height_m: 2.0,
        ua_w_k: 8.0,
        nodes: 10,
        t_init_c: 45.0,
        cp_j_kgk: 4182.3,
        rho_kg_m3: 983.3,
    };
    let mut tank = Tank::new(&spec);
    let before = tank.stored_j(0.0);
    let (mut q_in, mut q_aux, mut q_loss) = (0.0, 0.0, 0.0);
    for hour in 0..24 {
        let sun = (6..18).contains(&hour);
        let streams = [
            Stream {
                flow_kg_s: if sun { 0.3 } else { 0.0 },
                t_in_c: 80.0,
                inlet: Inlet::Stratified,
            },
            Stream {
                flow_kg_s: 0.2,
                t_in_c: 35.0,
                inlet: Inlet::Bottom,
            },
        ];
        let r = tank.step(3600.0, &streams, 20.0, if hour < 6 { 3000.0 } else { 0.0 });
        q_in += r.q_in_j.iter().sum::<f64>();
        q_aux += r.q_aux_j;
        q_loss += r.q_loss_j;
    }
    let resid = q_in + q_aux - q_loss - (tank.stored_j(0.0) - before);
    out.push(check(
        "computed",
        "tank 2 m³, 10 nodes, 24 h with stratified charge, discharge, element: balance residual, J".into(),
        resid,
        0.0,
        1e-9 * before,
        "computed: Σ q_in + q_aux − q_loss − Δstored = 0 (first law); tolerance 1e-9 of stored energy".into(),
    ));
}

fn pcm(out: &mut Vec<Check>) {
    let demo = PcmSpec::demo_paraffin_58();
    // Heat across the melt: Q = m [cs (T* − Ta) + λ + cl (Tb − T*)].
    for (ta, tb, range) in [
        (40.0, 70.0, 2.0),
        (40.0, 70.0, 0.0),
        (20.0, 59.5, 1.0),
        (55.0, 90.0, 4.0),
    ] {
        let spec = PcmSpec {
            melt_range_k: range,
            ..demo.clone()
        };
        let p = Pcm::new(&spec);
        let value = p.enthalpy_j(tb) - p.enthalpy_j(ta);
        let s = &spec;
        let expected = s.mass_kg
            * (s.cp_solid_j_kgk * (s.t_melt_c - ta)
                + s.latent_j_kg
                + s.cp_liquid_j_kgk * (tb - s.t_melt_c));
        out.push(check(
            "computed",
            format!("PCM (typical paraffin, 58 °C) {ta} → {tb} °C, melt range {range} K, heat J"),
            value,
            expected,
            1e-9 * expected,
            "computed: Q = m [cs (T* − T1) + λ + cl (T2 − T*)] (Mehling & Cabeza, Heat and cold storage with PCM, Springer 2008, ch. 1)".into(),
        ));
    }
    // Exchanger at an isothermal melt: q = ε ṁ cp (T_in − T*) t, ε = 1 − exp(−UA/(ṁ cp)).
    for (flow, t_in) in [(0.2, 75.0), (0.05, 65.0), (1.0, 50.0)] {
        // Start exactly at the melt point: solid (h = 0) for a charge, liquid (1e-12 K above,
        // negligible) for a discharge; one short step stays on the plateau, so T = T*.
        let t_init_c = if t_in >= demo.t_melt_c {
            demo.t_melt_c
        } else {
            demo.t_melt_c + 1e-12
        };
        let spec = PcmSpec {
            melt_range_k: 0.0,
            ua_loss_w_k: 0.0,
            t_init_c,
            ..demo.clone()
        };
        let mut p = Pcm::new(&spec);
        let c = flow * 4180.0;
        let eps = 1.0 - (-spec.ua_hx_w_k / c).exp();
        let dt = 600.0;
        let r = p.step(dt, flow, t_in, 4180.0, 20.0);
        let expected = eps * c * (t_in - spec.t_melt_c) * dt;
        out.push(check(
            "computed",
            format!("PCM isothermal melt at 58 °C, {flow} kg/s at {t_in} °C for {dt} s, q_in J"),
            r.q_in_j,
            expected,
            1e-9 * expected.abs(),
            "computed: q = ε ṁ cp (T_in − T*) t, ε = 1 − exp(−UA/(ṁ cp)) (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, 6th ed., §11.4, C_r = 0)".into(),
        ));
    }
    // Energy balance over two days of charge and discharge.
    let mut p = Pcm::new(&demo);
    let before = p.stored_j(0.0);
    let (mut q_in, mut q_loss) = (0.0, 0.0);
    for hour in 0..48 {
        let t_in = if hour % 24 < 10 { 80.0 } else { 35.0 };
        let r = p.step(3600.0, 0.25, t_in, 4180.0, 20.0);
        q_in += r.q_in_j;
        q_loss += r.q_loss_j;
    }
    let delta = p.stored_j(0.0) - before;
    out.push(check(
        "computed",
        "PCM (typical paraffin) 48 h charge/discharge: balance residual, J".into(),
        q_in - q_loss - delta,
        0.0,
        1e-9 * p.enthalpy_j(80.0),
        "computed: q_in − q_loss − Δstored = 0 (first law); tolerance 1e-9 of the enthalpy at 80 °C".into(),
    ));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_storage_check_passes() {
        let checks = checks().unwrap();
        assert!(checks.len() > 70, "{} checks", checks.len());
        let failed: Vec<_> = checks.iter().filter(|c| !c.passed()).collect();
        assert!(failed.is_empty(), "{failed:#?}");
    }
}
