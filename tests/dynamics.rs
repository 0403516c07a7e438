//! Plant dynamics and controls that behave like a real plant: results independent of the
//! sub-step, a collector loop whose yield the dead-band control does not distort, and a field
//! whose heat capacity does what a lumped capacity does.

use parhelion::feasibility::explore::Study;
use parhelion::scenario::{self, build};
use std::path::{Path, PathBuf};

const DEMOS: [&str; 2] = ["port-meridian-clinic", "qasr-alvar-office"];

fn path(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("scenarios")
        .join(format!("{name}.toml"))
}

/// Halving the plant's sub-step (the default 8 per hour → 16) changes annual solar heat,
/// cooling and electricity of every option by less than 1 %.
#[test]
fn results_do_not_depend_on_the_sub_step() {
    for name in DEMOS {
        let l = scenario::load(&path(name)).unwrap();
        let p = build::prepare(&l).unwrap();
        let built = build::build_options(&l, &p).unwrap();
        let n = parhelion::plant::SUBSTEPS;
        let a = build::run_with_substeps(&l, &p, &built, n).unwrap();
        let b = build::run_with_substeps(&l, &p, &built, 2 * n).unwrap();
        let mut worst = Vec::new();
        for (x, y) in a.options.iter().zip(&b.options) {
            for (what, u, v) in [
                (
                    "solar heat",
                    x.annual.solar_heat_kwh,
                    y.annual.solar_heat_kwh,
                ),
                ("cooling", x.annual.cooling_kwh, y.annual.cooling_kwh),
                (
                    "electricity",
                    x.annual.electricity_kwh,
                    y.annual.electricity_kwh,
                ),
                (
                    "heat-driven cooling",
                    x.annual.cooling_solar_kwh,
                    y.annual.cooling_solar_kwh,
                ),
            ] {
                let rel = (u - v).abs() / u.abs().max(1.0);
                if rel >= 0.01 {
                    worst.push(format!("{name}/{} {what}: {u} vs {v} ({rel:.4})", x.option));
                }
            }
        }
        assert!(worst.is_empty(), "{worst:#?}");
    }
}

/// The options of the demos with a flat-plate or evacuated-tube field.
fn fields() -> Vec<(&'static str, &'static str)> {
    vec![
        ("port-meridian-clinic", "grid-chiller-solar-dhw"),
        ("port-meridian-clinic", "solar-absorption"),
        ("qasr-alvar-office", "chiller-solar-heating"),
        ("qasr-alvar-office", "solar-absorption"),
    ]
}

const FLOWS: [f64; 4] = [0.005, 0.015, 0.03, 0.05];

fn yield_of(study: &Study, opt: &str, edits: &[(String, f64)]) -> f64 {
    study
        .figure_of(edits, opt, "collector_yield_kwh_m2")
        .unwrap()
        .unwrap()
}

/// With a fully mixed store (one node, so stratification cannot favour low flow) and ideal
/// control (no dead-band), the annual yield rises with the specific flow: the collector
/// heat-removal factor rises with flow (Duffie & Beckman 4th ed. §6.7). (In the demos'
/// stratified stores a low flow keeps the store's bottom cold and the yield can fall at high
/// flow — the low-flow effect, Duffie & Beckman §10 and Wuestling, Klein & Duffie 1985, from
/// memory — so that case is not held to it.)
#[test]
fn yield_rises_with_flow_in_a_mixed_store() {
    for (demo, opt) in fields() {
        let study = Study::new(&path(demo)).unwrap();
        let mut last = 0.0;
        for f in FLOWS {
            let y = yield_of(
                &study,
                opt,
                &[
                    (format!("options.{opt}.field.flow_kg_s_m2"), f),
                    (format!("options.{opt}.storage.nodes"), 1.0),
                    (format!("options.{opt}.field.dt_off_k"), 0.0),
                ],
            );
            assert!(y > last, "{demo}/{opt}: {y} kWh/m² at {f} after {last}");
            last = y;
        }
    }
}

/// The dead-band control (the demos' `dt_on_k`/`dt_off_k`) collects within 3 % of ideal
/// control (`dt_off_k = 0`, pump on whenever the outlet rises) on the demos' own fields and
/// stores, at their own flow and over 0.005–0.05 kg/(s·m²). (The largest cost, 2.6 % for the
/// office's evacuated tubes at 0.05, is the control's real one: a rise under 2 K keeps a
/// 1.5 K dead-band cycling in weak sun.)
#[test]
fn dead_band_costs_little() {
    for (demo, opt) in fields() {
        let study = Study::new(&path(demo)).unwrap();
        let own = study
            .value(&format!("options.{opt}.field.flow_kg_s_m2"))
            .unwrap_or(0.02); // the schema's default flow
        for f in [own, 0.005, 0.03, 0.05] {
            let flow = (format!("options.{opt}.field.flow_kg_s_m2"), f);
            let with = yield_of(&study, opt, std::slice::from_ref(&flow));
            let ideal = yield_of(
                &study,
                opt,
                &[flow, (format!("options.{opt}.field.dt_off_k"), 0.0)],
            );
            let rel = (with - ideal) / ideal;
            assert!(rel.abs() < 0.03, "{demo}/{opt} at {f}: {with} vs {ideal}");
        }
    }
}

/// Machine starts cost their thermal mass's warm-up: in every start hour of the clinic's
/// absorption and Rankine options the ledger's start-up heat is `C (t_drive − t_room)` with
/// `C` the route's thermal mass (whenever the hour's heat covered it), and the year's start-up
/// heat is the sum over its starts — N starts, N warm-ups.
#[test]
fn starts_cost_their_warm_up() {
    let l = scenario::load(&path("port-meridian-clinic")).unwrap();
    let p = build::prepare(&l).unwrap();
    let built = build::build_options(&l, &p).unwrap();
    let ev = build::run(&l, &p, &built).unwrap();
    for opt in ["solar-absorption", "solar-rankine"] {
        let b = built.iter().find(|b| b.plant.name == opt).unwrap();
        let c_kj_k = b.plant.route.start_up().unwrap().thermal_mass_kj_k;
        let t_room = b.plant.solar.as_ref().unwrap().t_room_c;
        let o = ev.options.iter().find(|o| o.option == opt).unwrap();
        let (mut n, mut sum) = (0u32, 0.0);
        for r in &o.hours {
            if r.machine_starts == 0 {
                assert_eq!(r.startup_heat_kwh, 0.0);
                continue;
            }
            n += 1;
            sum += r.startup_heat_kwh;
            if let Some(t_drive) = r.t_drive_c {
                let want = c_kj_k * (t_drive - t_room) / 3600.0;
                assert!(
                    (r.startup_heat_kwh - want).abs() <= 1e-9 * want.max(1.0),
                    "{opt} hour {}: {} vs {want}",
                    r.hour,
                    r.startup_heat_kwh
                );
            }
        }
        assert!(n > 50, "{opt}: {n} starts");
        assert_eq!(o.annual.machine_starts, n);
        assert!((o.annual.startup_heat_kwh - sum).abs() < 1e-9 * sum.max(1.0));
    }
}

/// A minimum off time holds: with `min_off_h = 12` no start follows a stop by fewer than twelve
/// hours without driving heat, and the machine starts less often (the demo's machine restarts
/// after 7–11 h off on about fifty mornings).
#[test]
fn minimum_off_time_holds() {
    let study = Study::new(&path("port-meridian-clinic")).unwrap();
    let opt = "solar-absorption";
    let starts = |edits: &[(String, f64)]| {
        let ev = study.evaluate(edits, Some(opt)).unwrap();
        ev.options.into_iter().find(|o| o.option == opt).unwrap()
    };
    let free = starts(&[]);
    let held = starts(&[(format!("options.{opt}.absorption.starts.min_off_h"), 12.0)]);
    assert!(held.annual.machine_starts < free.annual.machine_starts);
    let h = &held.hours;
    for i in 1..h.len() {
        if h[i].machine_starts == 1 {
            // hours without driving heat just before this start
            let rest = h[..i]
                .iter()
                .rev()
                .take_while(|r| r.heat_to_route_kwh <= 0.0)
                .count();
            assert!(
                rest >= 12 || rest == i,
                "hour {i}: restarted after {rest} h off"
            );
        }
    }
}
