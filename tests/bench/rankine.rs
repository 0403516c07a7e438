//! Benchmark: one hourly step of route `rankine-vc` (`heat_request` + `run`) with the
//! saturation tables already built, for the default R245fa engine and for a steam engine
//! (IAPWS-IF97, no tables). Target < 20 µs median. Run with `cargo bench --bench rankine`.

use criterion::{Criterion, criterion_group, criterion_main};
use parhelion::components::chiller_electric::{ChillerSpec, Condenser};
use parhelion::load::LoadHour;
use parhelion::routes::rankine_vc::{RankineVcSpec, build};
use parhelion::routes::{HeatSupplied, HourConditions, Route};
use std::hint::black_box;

fn step(c: &mut Criterion) {
    for (name, toml_text, t_base) in [
        ("rankine-vc/hour", "", 95.0),
        (
            "rankine-vc/hour-steam",
            "engine_fluid = \"water\"\nt_supply_design_c = 170.0",
            130.0,
        ),
    ] {
        hour_bench(c, name, toml_text, t_base);
    }
}

fn hour_bench(c: &mut Criterion, name: &str, toml_text: &str, t_base: f64) {
    let spec: RankineVcSpec = toml::from_str(toml_text).expect("spec parses");
    let route =
        build(&spec, &ChillerSpec::typical(Condenser::WaterCooled, 100.0)).expect("route builds");
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
            ventilation_m3_h: 0.0,
        },
    };
    c.bench_function(name, |b| {
        let mut i = 0usize;
        b.iter(|| {
            i = (i + 1) % 8760;
            hour.hour = i;
            hour.t_wb_c = 18.0 + (i % 10) as f64;
            let t_top = t_base + (i % 40) as f64;
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
