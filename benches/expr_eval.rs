//! Throughput of value, first and second derivative of metric functions over 100k points: tree walk per
//! point (dual numbers), tape per point (dual numbers) and tape batch (structure of arrays).
//!
//! Run with `cargo bench --bench expr_eval`.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use junctura::expr::Expr;
use num_dual::{Dual2_64, Dual3_64};
use std::hint::black_box;
use std::time::Duration;

const POINTS: usize = 100_000;

fn cases() -> Vec<(&'static str, Expr, Vec<f64>)> {
    let names: Vec<String> = ["m", "q", "l"].iter().map(|s| s.to_string()).collect();
    let parse = |s: &str| Expr::parse(s, "r", &names).expect("benchmark expression parses");
    vec![
        ("charged", parse("1 - 2*m/r + q^2/r^2"), vec![1.0, 0.6, 0.0]),
        ("hayward", parse("1 - 2*m*r^2/(r^3 + 2*m*l^2)"), vec![1.0, 0.0, 0.4]),
    ]
}

fn bench(c: &mut Criterion) {
    let xs: Vec<f64> = (0..POINTS).map(|i| 2.5 + 20.0 * i as f64 / POINTS as f64).collect();
    let mut group = c.benchmark_group("expr_eval");
    group.throughput(Throughput::Elements(POINTS as u64));
    group.sample_size(10).warm_up_time(Duration::from_millis(500)).measurement_time(Duration::from_secs(2));
    let (mut f, mut df, mut d2f, mut d3f) =
        (vec![0.0; POINTS], vec![0.0; POINTS], vec![0.0; POINTS], vec![0.0; POINTS]);
    for (name, e, ps) in cases() {
        let tape = e.tape();
        group.bench_function(BenchmarkId::new("d2_tree_per_point", name), |b| {
            b.iter(|| {
                for (i, &x) in xs.iter().enumerate() {
                    let d: Dual2_64 = e.eval_at(Dual2_64::new(x, 1.0, 0.0), &ps);
                    (f[i], df[i], d2f[i]) = (d.re, d.v1, d.v2);
                }
                black_box(&f);
            })
        });
        group.bench_function(BenchmarkId::new("d2_tape_per_point", name), |b| {
            b.iter(|| {
                for (i, &x) in xs.iter().enumerate() {
                    let d = tape.eval(Dual2_64::new(x, 1.0, 0.0), |k| Dual2_64::from(ps[k]));
                    (f[i], df[i], d2f[i]) = (d.re, d.v1, d.v2);
                }
                black_box(&f);
            })
        });
        group.bench_function(BenchmarkId::new("d2_tape_evaluator_per_point", name), |b| {
            b.iter(|| {
                let mut ev = tape.evaluator::<Dual2_64>(&ps);
                for (i, &x) in xs.iter().enumerate() {
                    let d = ev.eval(Dual2_64::new(x, 1.0, 0.0));
                    (f[i], df[i], d2f[i]) = (d.re, d.v1, d.v2);
                }
                black_box(&f);
            })
        });
        group.bench_function(BenchmarkId::new("d2_tape_batch", name), |b| {
            b.iter(|| {
                tape.eval_batch_d2(&xs, &ps, &mut f, &mut df, &mut d2f);
                black_box(&f);
            })
        });
        group.bench_function(BenchmarkId::new("d3_tree_per_point", name), |b| {
            b.iter(|| {
                for (i, &x) in xs.iter().enumerate() {
                    let d: Dual3_64 = e.eval_at(Dual3_64::new(x, 1.0, 0.0, 0.0), &ps);
                    (f[i], df[i], d2f[i], d3f[i]) = (d.re, d.v1, d.v2, d.v3);
                }
                black_box(&f);
            })
        });
        group.bench_function(BenchmarkId::new("d3_tape_batch", name), |b| {
            b.iter(|| {
                tape.eval_batch_d3(&xs, &ps, &mut f, &mut df, &mut d2f, &mut d3f);
                black_box(&f);
            })
        });
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
