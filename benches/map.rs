//! Per-cell throughput of the map evaluator on 300 x 300 maps of the charged thin-shell wormhole, fast path
//! against the generic reference path: (radius, beta2), where the junction work is shared along a beta^2
//! line, and (radius, q) at a fixed beta^2, where every cell needs its own junction evaluation.
//!
//! Run with `cargo bench --bench map`.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use junctura::scan::{summarize_lines_with, Axis, MapSpec, Method};
use junctura::scenario::Scenario;
use std::hint::black_box;
use std::time::Duration;

const N: usize = 300;

fn bench(c: &mut Criterion) {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios/reissner-nordstrom-wormhole.toml");
    let mut s = Scenario::load(std::path::Path::new(path)).expect("the shipped scenario loads");
    s.params.set("q", 0.5).expect("q is a parameter");
    let r_plus = |q: f64| 1.0 + (1.0 - q * q).sqrt();
    let ax = |name: &str, lo: f64, hi: f64| Axis::new(&s, name, lo, hi, N).expect("axis");
    let maps = [
        (
            "radius_beta2",
            MapSpec::new(&s, ax("radius", 1.05 * r_plus(0.5), 10.0), ax("beta2", -3.0, 3.0), None, (1.0, 10.0)),
        ),
        (
            "radius_q",
            MapSpec::new(&s, ax("radius", 1.05 * r_plus(0.95), 10.0), ax("q", 0.0, 0.95), Some(-0.5), (1.0, 10.0)),
        ),
    ];
    let mut group = c.benchmark_group("map");
    group.throughput(Throughput::Elements((N * N) as u64));
    group.sample_size(10).warm_up_time(Duration::from_millis(300)).measurement_time(Duration::from_secs(2));
    let pool = rayon::ThreadPoolBuilder::new().num_threads(1).build().expect("thread pool");
    for (name, spec) in maps {
        let spec = spec.expect("map spec");
        for (label, method) in [("fast", Method::Fast), ("generic", Method::Generic)] {
            group.bench_function(BenchmarkId::new(label, name), |b| {
                b.iter(|| {
                    pool.install(|| black_box(summarize_lines_with(&s, &spec, 0..spec.n_lines(), method).expect("map")))
                })
            });
        }
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
