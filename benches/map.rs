//! Per-cell throughput of the map evaluator on 300 x 300 maps of the charged thin-shell wormhole, fast path
//! against the generic reference path: (radius, beta2), where the junction work is shared along a beta^2
//! line, and (radius, q) at a fixed beta^2, where every cell needs its own junction evaluation; and a map over two
//! parameters of the linear-law gravastar, static radii continued from cell to cell against the full search.
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

    // Two parameters, no radius axis: static radii continued from the neighbouring cell (fast) against the full
    // search in every cell (generic), on the linear-law gravastar. 60 x 60: the full search costs ~1 ms per cell.
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios/gravastar-linear.toml");
    let g = Scenario::load(std::path::Path::new(path)).expect("the shipped scenario loads");
    let ax = |name: &str, lo: f64, hi: f64| Axis::new(&g, name, lo, hi, 60).expect("axis");
    let spec = MapSpec::new(&g, ax("l", 0.01, 0.2), ax("w", 0.1, 1.5), None, (1e-3, 20.0)).expect("map spec");
    let mut group = c.benchmark_group("map_two_parameters");
    group.throughput(Throughput::Elements((60 * 60) as u64));
    group.sample_size(10).warm_up_time(Duration::from_millis(300)).measurement_time(Duration::from_secs(4));
    for (label, method) in [("continued", Method::Fast), ("full_search", Method::Generic)] {
        group.bench_function(BenchmarkId::new(label, "l_w"), |b| {
            b.iter(|| {
                pool.install(|| black_box(summarize_lines_with(&g, &spec, 0..spec.n_lines(), method).expect("map")))
            })
        });
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
