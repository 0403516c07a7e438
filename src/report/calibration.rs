//! The `calibrate` verb's output: an absorption machine fitted to its datasheet, as a
//! terminal table or JSON.

use super::table::{new_table, right};
use crate::components::absorption_cycle::Machine;
use crate::components::absorption_fit::{BOUND_RMS_CAPACITY, BOUND_RMS_COP, FitReport};

const EXCHANGERS: [&str; 4] = ["generator", "absorber", "condenser", "evaporator"];

fn uas(m: &Machine) -> [f64; 4] {
    [m.ua_gen_kw_k, m.ua_abs_kw_k, m.ua_cond_kw_k, m.ua_evap_kw_k]
}

/// Fitted values, then the model against every datasheet row, then the RMS errors against
/// their bounds and the verdict.
pub fn render(option: &str, f: &FitReport) -> String {
    let mut out = format!(
        "Option {option}: absorption machine fitted to {}\n({} rows, {} Levenberg–Marquardt steps)\n\n",
        f.file,
        f.rows.len(),
        f.iterations
    );
    let mut t = new_table(&["heat exchanger", "UA multiplier", "fitted UA kW/K"]);
    for ((name, k), ua) in EXCHANGERS
        .iter()
        .zip(f.calibration.ua_multipliers)
        .zip(uas(&f.machine))
    {
        t.add_row(vec![
            name.to_string(),
            format!("{k:.3}"),
            format!("{ua:.2}"),
        ]);
    }
    t.add_row(vec![
        "solution HX effectiveness".to_string(),
        format!("{:.3}", f.calibration.sol_hx_effectiveness),
        String::new(),
    ]);
    right(&mut t, 1);
    out.push_str(&format!("{t}\n\n"));
    let mut t = new_table(&[
        "line",
        "hot water in °C",
        "cooling water in °C",
        "chilled water out °C",
        "capacity kW",
        "model kW",
        "error %",
        "COP",
        "model COP",
        "error",
    ]);
    for r in &f.rows {
        t.add_row(vec![
            r.row.line.to_string(),
            format!("{:.1}", r.row.t_hw_in_c),
            format!("{:.1}", r.row.t_cw_in_c),
            format!("{:.1}", r.row.t_chw_out_c),
            format!("{:.1}", r.row.capacity_kw),
            format!("{:.1}", r.capacity_kw),
            format!("{:+.1}", 100.0 * r.capacity_error()),
            format!("{:.3}", r.row.cop),
            format!("{:.3}", r.cop),
            format!("{:+.3}", r.cop_error()),
        ]);
    }
    right(&mut t, 0);
    out.push_str(&format!("{t}\n\n"));
    out.push_str(&format!(
        "RMS capacity error {:.2} % (bound {:.0} %), RMS COP error {:.3} (bound {:.2}): {}\n",
        100.0 * f.rms_capacity,
        100.0 * BOUND_RMS_CAPACITY,
        f.rms_cop,
        BOUND_RMS_COP,
        if f.within_bounds() {
            "accepted; `evaluate` runs the fitted machine"
        } else {
            "REFUSED; `evaluate` will not run this option"
        }
    ));
    out
}

/// One JSON object per fitted option (keys named by quantity and unit).
pub fn json(option: &str, f: &FitReport) -> serde_json::Value {
    let ua = uas(&f.machine);
    serde_json::json!({
        "option": option,
        "datasheet": f.file,
        "ua_multiplier": {
            "generator": f.calibration.ua_multipliers[0],
            "absorber": f.calibration.ua_multipliers[1],
            "condenser": f.calibration.ua_multipliers[2],
            "evaporator": f.calibration.ua_multipliers[3],
        },
        "ua_kw_k": {
            "generator": ua[0], "absorber": ua[1], "condenser": ua[2], "evaporator": ua[3],
        },
        "sol_hx_effectiveness": f.calibration.sol_hx_effectiveness,
        "iterations": f.iterations,
        "rms_capacity_pct": 100.0 * f.rms_capacity,
        "rms_cop": f.rms_cop,
        "bound_rms_capacity_pct": 100.0 * BOUND_RMS_CAPACITY,
        "bound_rms_cop": BOUND_RMS_COP,
        "accepted": f.within_bounds(),
        "rows": f.rows.iter().map(|r| serde_json::json!({
            "line": r.row.line,
            "t_hw_in_c": r.row.t_hw_in_c,
            "t_cw_in_c": r.row.t_cw_in_c,
            "t_chw_out_c": r.row.t_chw_out_c,
            "capacity_kw": r.row.capacity_kw,
            "model_capacity_kw": r.capacity_kw,
            "capacity_error_pct": 100.0 * r.capacity_error(),
            "cop": r.row.cop,
            "model_cop": r.cop,
            "cop_error": r.cop_error(),
        })).collect::<Vec<_>>(),
    })
}
