//! Benchmarks: one full year of each bundled demo scenario.
//!
//! `evaluate/*` is the whole `parhelion evaluate` work (weather synthesis, sun positions,
//! psychrometrics, building model, every option's hour loop, aggregation) without file
//! output; `plant/*` is the hour loops alone on prepared inputs, which is what a parameter
//! sweep repeats. Run with `cargo bench --bench year`.

use criterion::{Criterion, criterion_group, criterion_main};
use parhelion::scenario::{self, build};
use std::hint::black_box;
use std::path::Path;

const DEMOS: [&str; 2] = ["port-meridian-clinic", "qasr-alvar-office"];

fn year(c: &mut Criterion) {
    for demo in DEMOS {
        let path = format!("{}/scenarios/{demo}.toml", env!("CARGO_MANIFEST_DIR"));
        let l = scenario::load(Path::new(&path)).expect("demo scenario loads");
        c.bench_function(&format!("evaluate/{demo}"), |b| {
            b.iter(|| black_box(build::evaluate(&l).expect("demo runs")))
        });
        let p = build::prepare(&l).expect("demo prepares");
        let built = build::build_options(&l, &p).expect("demo builds");
        c.bench_function(&format!("plant/{demo}"), |b| {
            b.iter(|| black_box(build::run(&l, &p, &built).expect("demo runs")))
        });
    }
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(20);
    targets = year
}
criterion_main!(benches);
