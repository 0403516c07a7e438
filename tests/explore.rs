//! Design exploration: sizing against a known answer, monotonicity that physics demands,
//! and bad input to the exploration verbs.

use parhelion::feasibility::explore::{self, SizeResult, Study};
use proptest::prelude::*;
use std::path::{Path, PathBuf};
use std::process::Command;

fn demo(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("scenarios")
        .join(format!("{name}.toml"))
}

const OPT: &str = "grid-chiller-solar-dhw";

/// The heat demand is exactly proportional to the litres of hot water a day (same profile,
/// temperatures and water properties): sizing `dhw_l_per_day` to twice the demo's annual heat
/// demand must find twice the demo's litres, within the solver's tolerance on x.
#[test]
fn size_finds_a_known_answer() {
    let study = Study::new(&demo("port-meridian-clinic")).unwrap();
    let key = "heat_demand.dhw_l_per_day";
    let l0 = study.value(key).unwrap();
    let base = study
        .figure_of(&[], OPT, "heat_demand_kwh")
        .unwrap()
        .unwrap();
    let tol = 0.5;
    match explore::size_to_target(
        &study,
        OPT,
        "heat_demand_kwh",
        2.0 * base,
        key,
        0.5 * l0,
        4.0 * l0,
        tol,
    )
    .unwrap()
    {
        SizeResult::Met { value, .. } => {
            assert!((value - 2.0 * l0).abs() <= tol, "{value} vs {}", 2.0 * l0)
        }
        other => panic!("{other:?}"),
    }
    // A target outside what the range reaches is reported, with the best reachable.
    match explore::size_to_target(
        &study,
        OPT,
        "heat_demand_kwh",
        100.0 * base,
        key,
        0.5 * l0,
        4.0 * l0,
        tol,
    )
    .unwrap()
    {
        SizeResult::Unreachable { best_value, .. } => assert_eq!(best_value, 4.0 * l0),
        other => panic!("{other:?}"),
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 6, ..ProptestConfig::default() })]

    /// More collector area never lowers the solar heat collected (same store, same year).
    #[test]
    fn more_area_never_collects_less(a in 20.0f64..120.0, extra in 5.0f64..60.0) {
        let study = Study::new(&demo("port-meridian-clinic")).unwrap();
        let key = format!("options.{OPT}.field.gross_area_m2");
        let q = |x: f64| study.figure_of(&[(key.clone(), x)], OPT, "solar_heat_kwh").unwrap().unwrap();
        prop_assert!(q(a + extra) >= q(a) - 1e-6);
    }

    /// A higher electricity price never lowers the savings of an option that uses less grid
    /// electricity than the electric reference (PV here): its NPV against the reference rises.
    #[test]
    fn dearer_electricity_never_lowers_pv_savings(p in 0.05f64..0.3, dp in 0.01f64..0.2) {
        let study = Study::new(&demo("port-meridian-clinic")).unwrap();
        let npv = |price: f64| {
            study
                .figure_of(&[("economics.electricity_price_per_kwh".into(), price)], "pv-chiller", "npv_vs_reference")
                .unwrap()
                .unwrap()
        };
        prop_assert!(npv(p + dp) >= npv(p) - 1e-6);
    }
}

fn run(args: &[&str]) -> (i32, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args(args)
        .output()
        .unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stderr).to_string(),
    )
}

#[test]
fn sweep_runs_a_grid_and_refuses_bad_ranges() {
    let s = demo("port-meridian-clinic");
    let s = s.to_str().unwrap();
    let out = std::env::temp_dir().join(format!("parhelion-sweep-{}.csv", std::process::id()));
    let o = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args([
            "sweep",
            s,
            "--option",
            OPT,
            "--quiet",
            "--out",
            out.to_str().unwrap(),
        ])
        .args([
            "--set",
            &format!("options.{OPT}.field.gross_area_m2=40:60:20"),
        ])
        .args(["--set", &format!("options.{OPT}.storage.volume_m3=3:4:1")])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let text = std::fs::read_to_string(&out).unwrap();
    // 2 × 2 designs, each the option and the reference.
    assert_eq!(text.lines().count(), 1 + 4 * 2);
    assert!(
        text.lines()
            .next()
            .unwrap()
            .contains("solar_share_of_cooling")
    );
    std::fs::remove_file(&out).unwrap();
    for bad in ["=40:60:0", "=40:60:-5", "=60:40:5", "=40:60"] {
        let (code, err) = run(&[
            "sweep",
            s,
            "--set",
            &format!("options.{OPT}.field.gross_area_m2{bad}"),
        ]);
        assert_eq!(code, 2, "{bad}: {err}");
        assert!(err.contains("START:STOP:STEP"), "{err}");
    }
}

#[test]
fn exploration_bad_input() {
    let s = demo("port-meridian-clinic");
    let s = s.to_str().unwrap();
    // Bounded work (robustness issue): a step so small its count overflows an integer, a grid
    // of 10⁸ designs and absurd sample counts are refused with exit 2, never a panic or abort.
    let key = "options.solar-absorption.field.gross_area_m2";
    let (code, err) = run(&["sweep", s, "--set", &format!("{key}=100:400:1e-17")]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("100 000 values"), "{err}");
    let (code, err) = run(&[
        "sweep",
        s,
        "--set",
        &format!("{key}=1:10000:1"),
        "--set",
        "options.solar-absorption.storage.volume_m3=1:10000:1",
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("at most 100000 designs"), "{err}");
    for n in ["18446744073709551615", "1000000000"] {
        let (code, err) = run(&["uncertainty", s, "--samples", n]);
        assert_eq!(code, 2, "{n}: {err}");
    }
    // A key that does not exist: named, with a suggestion.
    let (code, err) = run(&[
        "sweep",
        s,
        "--set",
        &format!("options.{OPT}.field.gross_area_m3=40:60:20"),
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("did you mean `gross_area_m2`"), "{err}");
    let (code, err) = run(&["sweep", s, "--set", "optons.x.y=1:2:1"]);
    assert_eq!(code, 2);
    assert!(err.contains("did you mean `options`"), "{err}");
    // A fraction's target outside [0, 1].
    let (code, err) = run(&[
        "size",
        s,
        "--option",
        OPT,
        "--target",
        "thermal_solar_fraction=1.4",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("[0, 1]"), "{err}");
    // An unknown figure.
    let (code, err) = run(&[
        "size",
        s,
        "--option",
        OPT,
        "--minimize",
        "solar_share_of_cooliing",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.contains("did you mean `solar_share_of_cooling`"),
        "{err}"
    );
    // Zero samples.
    let (code, err) = run(&["uncertainty", s, "--samples", "0"]);
    assert_eq!(code, 2);
    assert!(err.contains("at least 1 sample"), "{err}");
}

#[test]
fn sensitivity_and_uncertainty_run() {
    let s = demo("port-meridian-clinic");
    let s = s.to_str().unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args(["sensitivity", s, "--option", OPT])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let t = String::from_utf8_lossy(&o.stdout);
    assert!(
        t.contains("weather.irradiation_scale") && t.contains("swing"),
        "{t}"
    );
    let o = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args(["uncertainty", s, "--samples", "4", "--seed", "3"])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let t = String::from_utf8_lossy(&o.stdout);
    assert!(t.contains("P10 / P50 / P90") && t.contains("4 of 4"), "{t}");
    // Reproducible for a seed.
    let again = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args(["uncertainty", s, "--samples", "4", "--seed", "3"])
        .output()
        .unwrap();
    assert_eq!(o.stdout, again.stdout);
    // --quiet: the same run prints nothing on standard output.
    let quiet = Command::new(env!("CARGO_BIN_EXE_parhelion"))
        .args(["uncertainty", s, "--samples", "1", "--quiet"])
        .output()
        .unwrap();
    assert_eq!(quiet.status.code(), Some(0));
    assert!(quiet.stdout.is_empty());
}
