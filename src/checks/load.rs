//! Reference checks for the load area (see `checks/mod.rs` for the table format).
//!
//! * `load_rc5_rcbsim.csv` – single hour steps of the ISO 13790 5R1C network (free-floating,
//!   heating and cooling, all five mass classes) against the PyPI library rcbsim 0.3b0.
//! * `load_latent_ashrae.csv` – ventilation latent load against the ASHRAE Handbook—
//!   Fundamentals 2017 ch. 18 relation `q_l = 3010 Q ΔW`.
//! * computed – the steady-state limit of the network, the free-floating decay of the mass
//!   node against the analytic exponential, and the hourly energy balance of the network.

use super::Check;
use super::table::parse;
use crate::error::{Error, Result};
use crate::load::rc5::{self, HourDrive, MassClass, Network};

const RC5_RCBSIM: &str = include_str!("../../reference/load_rc5_rcbsim.csv");
const LATENT_ASHRAE: &str = include_str!("../../reference/load_latent_ashrae.csv");

fn mass_class(s: &str) -> Result<MassClass> {
    Ok(match s {
        "very-light" => MassClass::VeryLight,
        "light" => MassClass::Light,
        "medium" => MassClass::Medium,
        "heavy" => MassClass::Heavy,
        "very-heavy" => MassClass::VeryHeavy,
        other => {
            return Err(Error::Internal(format!(
                "reference/load_rc5_rcbsim.csv: unknown mass class `{other}`"
            )));
        }
    })
}

/// Hour steps against rcbsim 0.3b0.
fn rc5_rcbsim() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    for row in parse("load_rc5_rcbsim.csv", RC5_RCBSIM)? {
        let net = Network::new(
            row.f64("a_f_m2")?,
            mass_class(row.str("mass_class")?)?,
            row.f64("ua_opaque_w_k")?,
            row.f64("ua_windows_w_k")?,
        )?;
        let t_e = row.f64("t_e_c")?;
        let d = HourDrive {
            t_e_c: t_e,
            t_sup_c: t_e,
            h_ve_w_k: row.f64("h_ve_w_k")?,
            phi_int_w: row.f64("phi_int_w")?,
            phi_sol_w: row.f64("phi_sol_w")?,
            t_heat_set_c: row.f64("t_heat_c")?,
            t_cool_set_c: row.f64("t_cool_c")?,
        };
        let r = rc5::step(&net, row.f64("t_m_prev_c")?, &d);
        let q = row.str("quantity")?;
        let value = match q {
            "phi_hc_w" => r.phi_hc_w,
            "t_air_c" => r.t_air_c,
            "t_s_c" => r.t_s_c,
            "t_m_end_c" => r.t_m_end_c,
            other => {
                return Err(Error::Internal(format!(
                    "reference/load_rc5_rcbsim.csv: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: "load",
            table: "load_rc5_rcbsim.csv",
            case: format!("{}, {q}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(out)
}

/// Latent ventilation load against ASHRAE's `q_l = 3010 Q ΔW`.
fn latent_ashrae() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    for row in parse("load_latent_ashrae.csv", LATENT_ASHRAE)? {
        let value = rc5::latent_w(
            row.f64("air_m3_h")?,
            row.f64("w_out_kg_kg")?,
            row.f64("w_in_kg_kg")?,
            0.0,
            0.0,
        );
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: "load",
            table: "load_latent_ashrae.csv",
            case: format!("{}, latent_w", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(out)
}

/// Run `drive` repeatedly from `t_m0` until the mass node stops moving; the last hour.
fn settle(net: &Network, d: &HourDrive, t_m0: f64) -> rc5::StepResult {
    let mut t_m = t_m0;
    let mut r = rc5::step(net, t_m, d);
    for _ in 0..1_000_000 {
        r = rc5::step(net, t_m, d);
        if (r.t_m_end_c - t_m).abs() < 1e-13 {
            break;
        }
        t_m = r.t_m_end_c;
    }
    r
}

/// Buildings used by the computed checks: (name, A_f, mass, H_tr,op, H_tr,w, H_ve).
const NETS: [(&str, f64, MassClass, f64, f64, f64); 3] = [
    (
        "office 100 m² medium",
        100.0,
        MassClass::Medium,
        60.0,
        40.0,
        100.0,
    ),
    (
        "hall 250 m² very light",
        250.0,
        MassClass::VeryLight,
        150.0,
        200.0,
        300.0,
    ),
    (
        "archive 80 m² very heavy",
        80.0,
        MassClass::VeryHeavy,
        40.0,
        30.0,
        20.0,
    ),
];

/// Steady state: no gains, constant θ_e and set-point; the need settles to
/// `(H_ve + 1/(1/H_tr,is + 1/(H_tr,w + H_tr,op))) (θ_set − θ_e)`.
fn steady_state() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    for (name, a_f, mass, h_op, h_w, h_ve) in NETS {
        let net = Network::new(a_f, mass, h_op, h_w)?;
        // Cooling at 26 °C with 35 °C outdoors, heating at 20 °C with −10 °C and with 5 °C.
        for (t_e, t_h, t_c) in [(35.0, 20.0, 26.0), (-10.0, 20.0, 26.0), (5.0, 21.0, 24.0)] {
            let d = HourDrive {
                t_e_c: t_e,
                t_sup_c: t_e,
                h_ve_w_k: h_ve,
                phi_int_w: 0.0,
                phi_sol_w: 0.0,
                t_heat_set_c: t_h,
                t_cool_set_c: t_c,
            };
            let r = settle(&net, &d, 22.0);
            let t_set = if t_e > t_c { t_c } else { t_h };
            let h_is = rc5::H_IS_W_M2K * rc5::LAMBDA_AT * a_f;
            let h_total = h_ve + 1.0 / (1.0 / h_is + 1.0 / (h_w + h_op));
            let expected = h_total * (t_set - t_e);
            out.push(Check {
                group: "load",
                table: "computed",
                case: format!("{name}, steady state θ_e = {t_e} °C, θ_set = {t_set} °C, phi_hc_w"),
                value: r.phi_hc_w,
                expected,
                tolerance: 1e-6 * expected.abs(),
                source:
                    "closed form: Φ = (H_ve + 1/(1/H_tr,is + 1/(H_tr,w + H_tr,op)))(θ_set − θ_e), \
                         the conductance of the ISO 13790 5R1C network from air node to outdoors \
                         (H_tr,ms and H_tr,em in series = H_tr,op), H_tr,is = 3.45 × 4.5 A_f"
                        .to_string(),
            });
        }
    }
    Ok(out)
}

/// Free-floating decay: no gains, no HVAC, θ_m0 = 30 °C, θ_e = 10 °C. The massless air and
/// star nodes leave the mass a single conductance `H_tr,em + H_tr,3` to outdoors, so
/// `θ_m(t) − θ_e = (θ_m0 − θ_e) exp(−t/τ)`, `τ = C_m/(H_tr,em + H_tr,3)`. Crank–Nicolson
/// differs per hour by the factor `exp(−x³/12 + O(x⁵))`, `x = 3600/τ`: after N hours the
/// tolerance is twice that bound, `2 |θ_m0 − θ_e| e^{−N x} N x³/12`.
fn free_decay() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    for (name, a_f, mass, h_op, h_w, h_ve) in NETS {
        let net = Network::new(a_f, mass, h_op, h_w)?;
        let (t0, t_e) = (30.0, 10.0);
        let d = HourDrive {
            t_e_c: t_e,
            t_sup_c: t_e,
            h_ve_w_k: h_ve,
            phi_int_w: 0.0,
            phi_sol_w: 0.0,
            t_heat_set_c: f64::NEG_INFINITY,
            t_cool_set_c: f64::INFINITY,
        };
        let h1 = 1.0 / (1.0 / h_ve + 1.0 / net.h_tr_is_w_k);
        let h2 = h1 + h_w;
        let h3 = 1.0 / (1.0 / h2 + 1.0 / net.h_tr_ms_w_k);
        let tau_s = net.c_m_j_k / (net.h_tr_em_w_k + h3);
        let x = 3600.0 / tau_s;
        let n = (tau_s / 3600.0).round().max(1.0) as usize; // about one time constant
        let mut t_m = t0;
        for _ in 0..n {
            t_m = rc5::step(&net, t_m, &d).t_m_end_c;
        }
        let nf = n as f64;
        let decay = (-nf * x).exp();
        let expected = t_e + (t0 - t_e) * decay;
        let tolerance = 2.0 * (t0 - t_e) * decay * nf * x.powi(3) / 12.0;
        out.push(Check {
            group: "load",
            table: "computed",
            case: format!(
                "{name}, free-floating decay after {n} h (τ = {:.1} h), t_m_c",
                tau_s / 3600.0
            ),
            value: t_m,
            expected,
            tolerance,
            source: "analytic: θ_m − θ_e = (θ_m0 − θ_e) exp(−t/τ), τ = C_m/(H_tr,em + H_tr,3) \
                     (ISO 13790 eqs. C.6–C.8); tolerance = 2 × Crank–Nicolson truncation N x³/12"
                .to_string(),
        });
    }
    Ok(out)
}

/// Energy balance of each hour over three days of varying weather, gains and set-points:
/// `Φ_ia + Φ_st + Φ_m + Φ_HC = H_ve(θ_air − θ_sup) + H_tr,w(θ_s − θ_e) + H_tr,em(θ_m − θ_e)
/// + C_m (θ_m,t − θ_m,t−1)/3600`, the largest residual relative to the sum of the magnitudes.
fn energy_balance() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    for (name, a_f, mass, h_op, h_w, h_ve) in NETS {
        let net = Network::new(a_f, mass, h_op, h_w)?;
        let mut t_m = 22.0;
        let mut worst: f64 = 0.0;
        for h in 0..72 {
            let hf = h as f64;
            let day = (2.0 * std::f64::consts::PI * (hf - 9.0) / 24.0).cos();
            let occupied = (h % 24) >= 8 && (h % 24) < 18;
            let t_e = 12.0 + 14.0 * day + if h >= 48 { -15.0 } else { 0.0 };
            let d = HourDrive {
                t_e_c: t_e,
                t_sup_c: t_e,
                h_ve_w_k: if occupied { h_ve } else { 0.2 * h_ve },
                phi_int_w: if occupied { 25.0 * a_f } else { 2.0 * a_f },
                phi_sol_w: (30.0 * a_f * (-day)).max(0.0),
                t_heat_set_c: if occupied { 20.0 } else { 16.0 },
                t_cool_set_c: if occupied { 26.0 } else { f64::INFINITY },
            };
            let r = rc5::step(&net, t_m, &d);
            let (ia, st, m) = rc5::split_gains(&net, d.phi_int_w, d.phi_sol_w);
            let terms = [
                ia,
                st,
                m,
                r.phi_hc_w,
                -d.h_ve_w_k * (r.t_air_c - d.t_sup_c),
                -net.h_tr_w_w_k * (r.t_s_c - t_e),
                -net.h_tr_em_w_k * (r.t_m_c - t_e),
                -net.c_m_j_k * (r.t_m_end_c - t_m) / 3600.0,
            ];
            let residual: f64 = terms.iter().sum();
            let scale: f64 = terms.iter().map(|v| v.abs()).sum();
            worst = worst.max(residual.abs() / scale);
            t_m = r.t_m_end_c;
        }
        out.push(Check {
            group: "load",
            table: "computed",
            case: format!("{name}, 72 h energy balance, max relative residual"),
            value: worst,
            expected: 0.0,
            tolerance: 1e-9,
            source: "conservation: node gains + Φ_HC = conductance flows + C_m Δθ_m/Δt each hour \
                     (ISO 13790 Annex C network, θ_m the hour mean of eq. C.9)"
                .to_string(),
        });
    }
    Ok(out)
}

/// Every load check.
pub fn checks() -> crate::Result<Vec<Check>> {
    let mut out = rc5_rcbsim()?;
    out.extend(latent_ashrae()?);
    out.extend(steady_state()?);
    out.extend(free_decay()?);
    out.extend(energy_balance()?);
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn all_load_checks_pass() {
        let checks = checks().unwrap();
        assert!(
            checks.len() >= 28 + 2 + 9 + 3 + 3,
            "{} checks",
            checks.len()
        );
        for c in &checks {
            assert!(
                c.passed(),
                "{}: value {} expected {} ± {}",
                c.case,
                c.value,
                c.expected,
                c.tolerance
            );
        }
    }
}
