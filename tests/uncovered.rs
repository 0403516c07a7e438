//! An uncovered collector (ISO 9806:2017 quasi-dynamic coefficients) in a whole-year scenario:
//! the clinic demo's solar hot-water option with its flat plates swapped for a pool-type
//! absorber (coefficients typical of the class, invented).

use parhelion::plant::simulate;
use parhelion::scenario::{self, Loaded, build};
use std::path::PathBuf;

const POOL: &str = r#"[collectors.pool]
kind = "uncovered"
eta0 = 0.85
a1_w_m2k = 12.0
a2_w_m2k2 = 0.0
area_basis = "gross"
gross_m2 = 5.0
aperture_m2 = 5.0
iam_b0 = 0.1
iam_diffuse = 0.95
c3_j_m3k = 3.0
c4 = 0.5
c6_s_m = 0.04

"#;

const OPTION: &str = "grid-chiller-solar-dhw";

/// The clinic demo with the pool absorber on the solar hot-water option and, if given, the same
/// wind speed in every month.
fn text(wind_m_s: Option<f64>) -> String {
    let dir = env!("CARGO_MANIFEST_DIR");
    let mut t = std::fs::read_to_string(format!("{dir}/scenarios/port-meridian-clinic.toml"))
        .expect("demo scenario");
    let at = t.find("[options.grid-chiller]").expect("first option");
    t.insert_str(at, POOL);
    let field = format!("[options.{OPTION}.field]\ncollector = \"flat-plate\"");
    assert!(t.contains(&field), "demo layout changed");
    t = t.replace(
        &field,
        &format!("[options.{OPTION}.field]\ncollector = \"pool\""),
    );
    if let Some(u) = wind_m_s {
        t = t.replacen(
            "[weather]\n",
            &format!(
                "[weather]\nwind_monthly_m_s = [{}]\n",
                vec![u.to_string(); 12].join(", ")
            ),
            1,
        );
    }
    t
}

fn loaded(text: &str) -> Loaded {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("scenarios");
    Loaded {
        scenario: scenario::from_str("uncovered.toml", text).unwrap_or_else(|e| panic!("{e}")),
        path: dir.join("uncovered.toml"),
        base_dir: dir,
    }
}

/// Solar heat into the store over the year from the option with the pool absorber, kWh.
fn solar_heat_kwh(wind_m_s: Option<f64>) -> f64 {
    let l = loaded(&text(wind_m_s));
    let p = build::prepare(&l).unwrap_or_else(|e| panic!("{e}"));
    let built = build::build_options(&l, &p).unwrap_or_else(|e| panic!("{e}"));
    let o = built
        .iter()
        .find(|b| b.plant.name == OPTION)
        .expect("the option");
    let y = build::year_inputs(&l, &p, parhelion::plant::SUBSTEPS);
    simulate(&o.plant, &y)
        .iter()
        .map(|r| r.solar_heat_kwh)
        .sum()
}

/// The scenario runs, the uncovered field collects heat, and it collects less in a windier
/// year (the c3 and c6 terms both take heat away with wind).
#[test]
fn uncovered_scenario_runs_and_wind_costs_heat() {
    let calm = solar_heat_kwh(Some(1.0));
    let windy = solar_heat_kwh(Some(5.0));
    assert!(calm > 0.0, "calm year {calm} kWh");
    assert!(windy < calm, "windy {windy} kWh ≥ calm {calm} kWh");
    // without the key, 2 m/s: between the two
    let default = solar_heat_kwh(None);
    assert!(
        windy < default && default < calm,
        "{windy} {default} {calm}"
    );
}

/// The whole evaluation of the modified scenario runs and reports the option.
#[test]
fn uncovered_scenario_evaluates() {
    let l = loaded(&text(None));
    let ev = build::evaluate(&l).unwrap_or_else(|e| panic!("{e}"));
    let o = ev
        .options
        .iter()
        .find(|o| o.option == OPTION)
        .expect("the option");
    assert!(o.annual.solar_heat_kwh > 0.0);
}

/// An uncovered collector without its long-wave coefficient is refused, naming the key.
#[test]
fn uncovered_needs_c4() {
    let t = text(None).replace("c4 = 0.5\n", "");
    let e = scenario::from_str("uncovered.toml", &t)
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("collectors.pool.c4") && e.contains("uncovered"),
        "{e}"
    );
}
