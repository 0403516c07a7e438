//! Benchmark: one hourly step of route `rankine-vc` (`heat_request` + `run`) with the
//! saturation tables already built. Target < 20 µs median. Run with
//! `cargo bench --bench rankine` (the `[[bench]]` entry is added by the lead).

use criterion::{Criterion, criterion_group, criterion_main};
use parhelion::components::chiller_electric::{ChillerSpec, Condenser};
use parhelion::load::LoadHour;
use parhelion::routes::rankine_vc::{RankineVcSpec, build};
use parhelion::routes::{HeatSupplied, HourConditions, Route};
use std::hint::black_box;

fn step(c: &mut Criterion) {
    let spec: RankineVcSpec = toml::from_str("").expect("default spec parses");
    let route = build(&spec, &ChillerSpec::typical(Condenser::WaterCooled, 100.0))
        .expect("default route builds");
    let mut hour = HourConditions {
        hour: 4000,
        t_db_c: 32.0,
        w_kg_kg: 0.015,
        t_wb_c: 24.0,
        p_kpa: 101.325,
        load: LoadHour {
            sensible_kw: 50.0,
            latent_kw: 10.0,
            heating_kw: 0.0,
            t_in_c: 24.0,
        },
    };
    c.bench_function("rankine-vc/hour", |b| {
        let mut i = 0usize;
        b.iter(|| {
            i = (i + 1) % 8760;
            hour.hour = i;
            hour.t_wb_c = 18.0 + (i % 10) as f64;
            let t_top = 95.0 + (i % 40) as f64;
            let req = route.heat_request(black_box(&hour), Some(t_top));
            let heat = req.map(|r| HeatSupplied {
                solar_kwh: 0.7 * r.heat_kwh,
                backup_kwh: 0.0,
            });
            black_box(route.run(&hour, Some(t_top), heat))
        })
    });
}

criterion_group!(benches, step);
criterion_main!(benches);
