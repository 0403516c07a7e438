//! Like-for-like accounting: laws every option of every demo obeys, whatever its route.
//!
//! * No sun, no saving: an option whose field is set to zero area (no field) uses the
//!   reference's electricity and water and delivers its cooling, to 0.1 % — the backup chiller
//!   is the reference's plant, run by the same code. A desiccant unit keeps its evaporative
//!   (non-solar) part apart.
//! * Second law each hour: no heat-driven cooling above the Carnot COP of the hour's drive,
//!   sink and chilled-water temperatures; no engine above the Carnot efficiency.
//! * Exploration agrees with `evaluate`: the figure `size`/`sensitivity` read for an option at
//!   the scenario's own values is `evaluate`'s, for every option in any order.

use parhelion::feasibility::Evaluation;
use parhelion::feasibility::explore::Study;
use parhelion::scenario::{self, build};
use std::path::{Path, PathBuf};

const DEMOS: [&str; 2] = ["port-meridian-clinic", "qasr-alvar-office"];

fn path(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("scenarios")
        .join(format!("{name}.toml"))
}

fn evaluate(name: &str) -> Evaluation {
    let l = scenario::load(&path(name)).unwrap();
    build::evaluate(&l).unwrap()
}

/// Every heat-driven option with a field, evaluated with its field at zero area, against the
/// reference of the same run.
#[test]
fn no_sun_no_saving() {
    let mut checked = Vec::new();
    for name in DEMOS {
        let l = scenario::load(&path(name)).unwrap();
        let s = &l.scenario;
        let study = Study::new(&path(name)).unwrap();
        for (opt, sec) in &s.options {
            if !sec.route.is_heat_driven() || sec.field.is_none() {
                continue;
            }
            let key = format!("options.{opt}.field.gross_area_m2");
            let ev = study.evaluate(&[(key, 0.0)], Some(opt)).unwrap();
            let o = ev.options.iter().find(|o| &o.option == opt).unwrap();
            let r = ev
                .options
                .iter()
                .find(|o| o.option == ev.reference)
                .unwrap();
            let (a, b) = (&o.annual, &r.annual);
            let ctx = format!("{name}/{opt}");
            assert_eq!(o.gross_m2, 0.0, "{ctx}");
            assert_eq!(a.solar_heat_kwh, 0.0, "{ctx}");
            assert_eq!(a.cooling_solar_kwh, 0.0, "{ctx}");
            assert_eq!(a.solar_share_of_cooling, Some(0.0), "{ctx}");
            let close = |x: f64, y: f64| (x - y).abs() <= 1e-3 * y.abs().max(1.0);
            assert!(close(a.cooling_kwh, b.cooling_kwh), "{ctx}: cooling");
            assert!(close(a.unmet_kwh, b.unmet_kwh), "{ctx}: unmet");
            // A desiccant unit's evaporative cooling is a real saving without sun: its
            // electricity and water are held to the reference's only where it stays off.
            if a.cooling_evaporative_kwh > 0.0 {
                assert!(a.cooling_electric_kwh < b.cooling_electric_kwh, "{ctx}");
            } else {
                assert!(
                    close(a.electricity_kwh, b.electricity_kwh),
                    "{ctx}: electricity {} vs {}",
                    a.electricity_kwh,
                    b.electricity_kwh
                );
                assert!(
                    close(a.water_m3, b.water_m3),
                    "{ctx}: water {} vs {}",
                    a.water_m3,
                    b.water_m3
                );
                assert!(close(a.fuel_kwh, b.fuel_kwh), "{ctx}: fuel");
            }
            checked.push(ctx);
        }
    }
    // Both demos, absorption and Rankine on a water-cooled (clinic) and an air-cooled
    // (office) baseline.
    for want in [
        "port-meridian-clinic/solar-absorption",
        "port-meridian-clinic/solar-rankine",
        "qasr-alvar-office/solar-absorption",
    ] {
        assert!(checked.iter().any(|c| c == want), "{want} not checked");
    }
    assert!(
        checked
            .iter()
            .any(|c| c.starts_with("qasr-alvar-office/") && c.contains("rankine")),
        "{checked:?}"
    );
}

/// Carnot COP of a heat-driven chiller between drive, sink and chilled water (kelvin):
/// `(1 − T_sink/T_drive) · T_chw/(T_sink − T_chw)`; `None` where the lift is not positive.
fn carnot_cop(t_drive_c: f64, t_sink_c: f64, t_chw_c: f64) -> Option<f64> {
    let (d, s, c) = (t_drive_c + 273.15, t_sink_c + 273.15, t_chw_c + 273.15);
    (s > c && d > s).then(|| (1.0 - s / d) * c / (s - c))
}

#[test]
fn no_cop_above_carnot() {
    let mut hours = 0;
    for name in DEMOS {
        let ev = evaluate(name);
        for o in &ev.options {
            for r in &o.hours {
                let (Some(cop), Some(d), Some(s), Some(c)) =
                    (r.cop_thermal, r.t_drive_c, r.t_sink_c, r.t_chw_c)
                else {
                    continue;
                };
                let ctx = format!("{name}/{} hour {}", o.option, r.hour);
                if let Some(max) = carnot_cop(d, s, c) {
                    assert!(cop <= max, "{ctx}: COP {cop} above Carnot {max}");
                    hours += 1;
                }
                if let Some((_, eta)) = r.detail.iter().find(|(k, _)| *k == "engine_efficiency") {
                    let carnot = 1.0 - (s + 273.15) / (d + 273.15);
                    assert!(*eta <= carnot, "{ctx}: engine {eta} above Carnot {carnot}");
                }
            }
        }
    }
    assert!(hours > 1000, "only {hours} heat-driven hours checked");
}

/// `size` and `sensitivity` read an option's figure through `Study::figure_of`: at the
/// scenario's own values it must be `evaluate`'s figure for that option, whatever the
/// option's place in the file.
#[test]
fn exploration_agrees_with_evaluate() {
    for name in DEMOS {
        let ev = evaluate(name);
        let study = Study::new(&path(name)).unwrap();
        for o in &ev.options {
            for key in [
                "cooling_kwh",
                "electricity_kwh",
                "solar_share_of_cooling",
                "thermal_solar_fraction",
                "lcoc_per_mwh",
            ] {
                let want = parhelion::feasibility::explore::figure(&o.annual, key).unwrap();
                let got = study.figure_of(&[], &o.option, key).unwrap();
                match (want, got) {
                    (Some(w), Some(g)) => assert!(
                        (w - g).abs() <= 1e-9 * w.abs().max(1.0),
                        "{name}/{} {key}: {g} vs {w}",
                        o.option
                    ),
                    (w, g) => assert_eq!(w, g, "{name}/{} {key}", o.option),
                }
            }
        }
    }
}
