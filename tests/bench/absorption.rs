//! Bench: one hourly step of the absorption route (heat_request + run), and a warm-started
//! cycle solve. Register with `[[bench]] name = "absorption" path = "tests/bench/absorption.rs"
//! harness = false`.

use criterion::{Criterion, criterion_group, criterion_main};
use parhelion::components::absorption_cycle::{Machine, Mode, Rating};
use parhelion::components::chiller_electric::{ChillerSpec, Condenser};
use parhelion::load::LoadHour;
use parhelion::routes::absorption::{AbsorptionSpec, build};
use parhelion::routes::{HeatSupplied, HourConditions, Route};
use std::hint::black_box;

fn bench(c: &mut Criterion) {
    let spec: AbsorptionSpec = toml::from_str("").expect("defaults");
    let route = build(
        spec,
        &ChillerSpec::typical(Condenser::WaterCooled, 35.0),
        None,
    )
    .expect("build");
    let hour = HourConditions {
        hour: 4000,
        t_db_c: 30.0,
        w_kg_kg: 0.015,
        t_wb_c: 24.0,
        p_kpa: 101.325,
        load: LoadHour {
            sensible_kw: 18.0,
            latent_kw: 4.0,
            heating_kw: 0.0,
            t_in_c: 25.0,
            ventilation_m3_h: 0.0,
        },
    };
    // The route memoises the last hour (heat_request and run solve the same hour): each
    // iteration is a new hour index with a slightly different wet-bulb, so every iteration
    // solves afresh, warm-started from the previous one as in the hour loop.
    let mut n = 0usize;
    c.bench_function("absorption hour (heat_request + run)", |b| {
        b.iter(|| {
            n += 1;
            let mut hour = hour;
            hour.hour = n;
            hour.t_wb_c = 24.0 + 0.5 * (n % 2) as f64;
            let r = route.heat_request(black_box(&hour), Some(85.0));
            let h = r.map(|q| HeatSupplied {
                solar_kwh: q.heat_kwh,
                backup_kwh: 0.0,
            });
            black_box(route.run(&hour, Some(85.0), h))
        })
    });
    let m = Machine::size(Rating::typical(35.0)).expect("size");
    let warm = m
        .solve(Mode::MeetLoad { q_evap_kw: 20.0 }, 29.0, 7.0, None)
        .expect("solve");
    c.bench_function("absorption cycle solve, warm start", |b| {
        b.iter(|| {
            black_box(m.solve(
                Mode::MeetLoad { q_evap_kw: 21.0 },
                black_box(29.5),
                7.0,
                Some(&warm),
            ))
        })
    });
}

criterion_group!(benches, bench);
criterion_main!(benches);
