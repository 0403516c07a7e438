//! Reference checks for the collector area (see `checks/mod.rs` for the table format).
//!
//! Tables (made by `reference/scripts/make_collector_iso9806.py`, standard library only):
//! * `collector_iso9806.csv` – ISO 9806:2017 steady-state efficiency, one-parameter IAM,
//!   useful power, outlet temperature and gain, no-flow temperature; Duffie & Beckman 4th ed.
//!   §6.19–6.20 mean-to-inlet conversion for linear collectors.
//! * `collector_hx_ntu.csv` – counterflow ε–NTU, Incropera 7th ed. Table 11.3.
//! * `collector_pipe.csv` – pipe outlet and loss, Incropera 7th ed. eq. 8.46.
//! * `collector_hx_factor.csv` – F_R'/F_R, Duffie & Beckman 4th ed. eq. 10.2.3.
//! * `collector_quasi_dynamic.csv` – the ISO 9806:2017 quasi-dynamic model without the c5 term
//!   (wind, long-wave): useful power, outlet and no-flow temperature by hand calculation
//!   (`reference/scripts/make_collector_quasi_dynamic.py`, standard library only).
//!
//! Computed checks: the outlet energy balance `ṁ cp ΔT = q(tm)` for every outlet row, the
//! ε–NTU `Cr → 1` limit, and the perfect-exchanger limit of F_R'/F_R.

use super::Check;
use super::table::{Row, parse};
use crate::components::collector::{Ambient, AreaBasis, CollectorKind, CollectorSpec};
use crate::components::hx::{collector_hx_factor, effectiveness_counterflow};
use crate::components::pipe::Pipe;
use crate::error::{Error, Result};

const ISO: &str = include_str!("../../reference/collector_iso9806.csv");
const NTU: &str = include_str!("../../reference/collector_hx_ntu.csv");
const PIPE: &str = include_str!("../../reference/collector_pipe.csv");
const HXF: &str = include_str!("../../reference/collector_hx_factor.csv");
const QD_TABLE: &str = "collector_quasi_dynamic.csv";
const QD: &str = include_str!("../../reference/collector_quasi_dynamic.csv");

const GROUP: &str = "collector";

/// Every collector check.
pub fn checks() -> Result<Vec<Check>> {
    let mut out = Vec::new();
    iso9806(&mut out)?;
    quasi_dynamic(&mut out)?;
    ntu(&mut out)?;
    pipe(&mut out)?;
    hx_factor(&mut out)?;
    Ok(out)
}

/// The table a collector row comes from (the quasi-dynamic table has a wind column).
fn row_table(row: &Row) -> &'static str {
    if row.str("wind_m_s").is_ok() {
        QD_TABLE
    } else {
        "collector_iso9806.csv"
    }
}

/// A collector spec from a table row: the steady-state columns, and c3, c4, c6 where the table
/// has them.
fn spec_from(row: &Row) -> Result<CollectorSpec> {
    let kind = match row.str("kind")? {
        "flat-plate" => CollectorKind::FlatPlate,
        "evacuated-tube" => CollectorKind::EvacuatedTube,
        "concentrating" => CollectorKind::Concentrating,
        "uncovered" => CollectorKind::Uncovered,
        other => {
            return Err(Error::Internal(format!(
                "reference/{}: unknown kind `{other}`",
                row_table(row)
            )));
        }
    };
    // The quasi-dynamic columns, where the table has them.
    let opt = |key: &str| row.str(key).ok().map(|_| row.f64(key)).transpose();
    let spec = CollectorSpec {
        kind,
        eta0: row.f64("eta0")?,
        a1_w_m2k: row.f64("a1_w_m2k")?,
        a2_w_m2k2: row.f64("a2_w_m2k2")?,
        area_basis: AreaBasis::Aperture,
        gross_m2: 2.5,
        aperture_m2: 2.3,
        iam_b0: Some(row.f64("iam_b0")?),
        iam_table: None,
        iam_diffuse: row.f64("iam_diffuse")?,
        heat_capacity_kj_m2k: None,
        c5_j_m2k: None,
        c3_j_m3k: opt("c3_j_m3k")?,
        c4: opt("c4")?,
        c6_s_m: opt("c6_s_m")?,
        max_temp_c: None,
    };
    spec.validate()
        .map_err(|e| Error::Internal(format!("reference/{}: {e}", row_table(row))))?;
    Ok(spec)
}

/// The quasi-dynamic table: the steady-state columns plus c3, c4, c6, wind and long-wave.
fn quasi_dynamic(out: &mut Vec<Check>) -> Result<()> {
    for row in parse(QD_TABLE, QD)? {
        let c = spec_from(&row)?;
        let (aoi, gb, gd) = (
            row.f64("aoi_deg")?,
            row.f64("g_beam_w_m2")?,
            row.f64("g_diffuse_w_m2")?,
        );
        let t = row.f64("t_c")?;
        let amb = Ambient {
            t_air_c: row.f64("ta_c")?,
            wind_m_s: row.f64("wind_m_s")?,
            long_wave_w_m2: row.f64("long_wave_w_m2")?,
        };
        let quantity = row.str("quantity")?;
        let value = match quantity {
            "useful_w_m2" => c.useful_in(gb, gd, aoi, t, &amb),
            "t_out_c" => {
                let (flow, cp) = (row.f64("flow_kg_s_m2")?, row.f64("cp_j_kgk")?);
                c.outlet_in(t, flow, cp, gb, gd, aoi, &amb).0
            }
            "stagnation_c" => c.stagnation_in(gb, gd, aoi, &amb),
            other => {
                return Err(Error::Internal(format!(
                    "reference/{QD_TABLE}: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: GROUP,
            table: QD_TABLE,
            case: format!("{}, {quantity}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

fn iso9806(out: &mut Vec<Check>) -> Result<()> {
    for row in parse("collector_iso9806.csv", ISO)? {
        let c = spec_from(&row)?;
        let (aoi, gb, gd) = (
            row.f64("aoi_deg")?,
            row.f64("g_beam_w_m2")?,
            row.f64("g_diffuse_w_m2")?,
        );
        let (t, ta) = (row.f64("t_c")?, row.f64("ta_c")?);
        let (flow, cp) = (row.f64("flow_kg_s_m2")?, row.f64("cp_j_kgk")?);
        let quantity = row.str("quantity")?;
        let value = match quantity {
            "efficiency" => c.efficiency(t, ta, gb + gd),
            "iam_beam" => c.iam_beam(aoi),
            "useful_w_m2" => c.useful_w_m2(gb, gd, aoi, t, ta),
            "stagnation_c" => c.stagnation_c(gb, gd, aoi, ta),
            "t_out_c" | "q_w_m2" => {
                let (t_out, q) = c.outlet(t, flow, cp, gb, gd, aoi, ta);
                if quantity == "t_out_c" {
                    // round trip: the energy carried equals the model's q at the mean temperature
                    let q_model = c.useful_w_m2(gb, gd, aoi, 0.5 * (t + t_out), ta);
                    out.push(Check {
                        group: GROUP,
                        table: "computed",
                        case: format!("{}, energy balance W/m2", row.str("case")?),
                        value: flow * cp * (t_out - t),
                        expected: q_model,
                        tolerance: 1e-9,
                        source: "m cp (t_out - t_in) = q((t_in + t_out)/2), ISO 9806:2017 steady-state model".into(),
                    });
                    t_out
                } else {
                    q
                }
            }
            other => {
                return Err(Error::Internal(format!(
                    "reference/collector_iso9806.csv: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: GROUP,
            table: "collector_iso9806.csv",
            case: format!("{}, {quantity}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

fn ntu(out: &mut Vec<Check>) -> Result<()> {
    for row in parse("collector_hx_ntu.csv", NTU)? {
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: GROUP,
            table: "collector_hx_ntu.csv",
            case: format!("{}, {}", row.str("case")?, row.str("quantity")?),
            value: effectiveness_counterflow(row.f64("ntu")?, row.f64("c_ratio")?),
            expected,
            tolerance,
            source,
        });
    }
    for ntu in [0.5, 2.0, 10.0] {
        out.push(Check {
            group: GROUP,
            table: "computed",
            case: format!("counterflow NTU {ntu} Cr = 1 - 1e-9 continuity, effectiveness"),
            value: effectiveness_counterflow(ntu, 1.0 - 1e-9),
            expected: ntu / (1.0 + ntu),
            tolerance: 1e-8,
            source: "limit Cr -> 1 of Incropera 7th ed. Table 11.3 counterflow: NTU/(1 + NTU)"
                .into(),
        });
    }
    Ok(())
}

fn pipe(out: &mut Vec<Check>) -> Result<()> {
    for row in parse("collector_pipe.csv", PIPE)? {
        let p = Pipe {
            length_m: row.f64("length_m")?,
            ua_w_mk: row.f64("ua_w_mk")?,
        };
        let args = (
            row.f64("t_in_c")?,
            row.f64("flow_kg_s")?,
            row.f64("cp_j_kgk")?,
            row.f64("t_amb_c")?,
        );
        let quantity = row.str("quantity")?;
        let value = match quantity {
            "t_out_c" => p.outlet_c(args.0, args.1, args.2, args.3, p.length_m),
            "loss_w" => p.loss_w(args.0, args.1, args.2, args.3, p.length_m),
            other => {
                return Err(Error::Internal(format!(
                    "reference/collector_pipe.csv: unknown quantity `{other}`"
                )));
            }
        };
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: GROUP,
            table: "collector_pipe.csv",
            case: format!("{}, {quantity}", row.str("case")?),
            value,
            expected,
            tolerance,
            source,
        });
    }
    Ok(())
}

fn hx_factor(out: &mut Vec<Check>) -> Result<()> {
    for row in parse("collector_hx_factor.csv", HXF)? {
        let (expected, tolerance, source) = row.expected()?;
        out.push(Check {
            group: GROUP,
            table: "collector_hx_factor.csv",
            case: format!("{}, {}", row.str("case")?, row.str("quantity")?),
            value: collector_hx_factor(
                row.f64("area_m2")?,
                row.f64("fr_ul_w_m2k")?,
                row.f64("c_collector_w_k")?,
                row.f64("eff")?,
                row.f64("c_min_w_k")?,
            ),
            expected,
            tolerance,
            source,
        });
    }
    out.push(Check {
        group: GROUP,
        table: "computed",
        case: "perfect exchanger (eps = 1) with C_min = C_c, fr_ratio".into(),
        value: collector_hx_factor(100.0, 4.0, 3000.0, 1.0, 3000.0),
        expected: 1.0,
        tolerance: 1e-15,
        source: "Duffie & Beckman 4th ed. eq. 10.2.3 with eps C_min = C_c gives F_R'/F_R = 1"
            .into(),
    });
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every collector check passes, and each table contributed its rows.
    #[test]
    fn all_collector_checks_pass() {
        let checks = checks().unwrap();
        let failed: Vec<_> = checks.iter().filter(|c| !c.passed()).collect();
        assert!(failed.is_empty(), "failed: {failed:#?}");
        for (table, n) in [
            ("collector_iso9806.csv", 27),
            ("collector_hx_ntu.csv", 9),
            ("collector_pipe.csv", 6),
            ("collector_hx_factor.csv", 3),
        ] {
            assert_eq!(
                checks.iter().filter(|c| c.table == table).count(),
                n,
                "{table}"
            );
        }
        assert!(checks.iter().filter(|c| c.table == "computed").count() >= 10);
    }
}
