//! Benchmark: one hourly step of the desiccant route (`heat_request` + `run`), including the
//! regeneration-temperature solve, on a humid hour (wheel regenerating, Brent on t_regen) and
//! a dry hour (wheel stopped). Target: < 20 µs median in release. Needs a `[[bench]]` entry
//! (name = "desiccant", path = "tests/bench/desiccant.rs", harness = false).

use criterion::{Criterion, criterion_group, criterion_main};
use parhelion::components::chiller_electric::{ChillerSpec, Condenser};
use parhelion::load::LoadHour;
use parhelion::props::psychro;
use parhelion::routes::desiccant::{DesiccantSpec, build};
use parhelion::routes::{HeatSupplied, HourConditions, Route};
use std::hint::black_box;

fn hour(t_db_c: f64, w_kg_kg: f64, sensible_kw: f64, latent_kw: f64) -> HourConditions {
    HourConditions {
        hour: 4000,
        t_db_c,
        w_kg_kg,
        t_wb_c: psychro::wet_bulb_c(t_db_c, w_kg_kg, 101.325).expect("valid state"),
        p_kpa: 101.325,
        load: LoadHour {
            sensible_kw,
            latent_kw,
            heating_kw: 0.0,
            t_in_c: 26.0,
            // Building ventilation equal to the unit's flow (10 000 m³/h): the unit runs.
            ventilation_m3_h: 10_000.0,
        },
    }
}

fn step(c: &mut Criterion) {
    let route = build(
        &DesiccantSpec::typical(10_000.0),
        &ChillerSpec::typical(Condenser::WaterCooled, 200.0),
    )
    .expect("typical unit builds");
    for (name, h) in [
        ("desiccant/humid-hour", hour(30.0, 0.012, 20.0, 5.0)),
        ("desiccant/dry-hour", hour(40.0, 0.006, 30.0, 2.0)),
    ] {
        c.bench_function(name, |b| {
            b.iter(|| {
                let req = route.heat_request(black_box(&h), Some(70.0));
                let heat = req.map(|r| HeatSupplied {
                    solar_kwh: r.heat_kwh,
                    backup_kwh: 0.0,
                });
                black_box(route.run(&h, Some(70.0), heat))
            })
        });
    }
}

criterion_group!(benches, step);
criterion_main!(benches);
