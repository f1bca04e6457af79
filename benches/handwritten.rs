//! A hand-written Rust loop with the closed-form V''(a0) of the charged (Reissner-Nordstrom) thin-shell
//! wormhole over the (radius, q) grid, single- and two-threaded, timed against junctura's map evaluator on the
//! same grid (library call, same thread counts). It prints the counts of both (they must agree) and the times.
//!
//! Run with `cargo bench --bench handwritten` (or through `benches/run_baseline.sh`).
//!
//! The formula, derived by hand for a symmetric wormhole with A = B = f and D = 4 from V = f - (2 pi a sigma)^2
//! and the conservation law sigma' = -(2/a)(sigma + p), p' = beta^2 sigma' (the same form as the charged
//! thin-shell wormhole analysis of Eiroa & Romero 2004, Gen. Rel. Grav. 36, 651, from memory; for m only it
//! reproduces Poisson & Visser 1995's critical curve):
//! ```text
//! sigma0 = -sqrt(f)/(2 pi a),  p0 = (sqrt(f) + a f'/(2 sqrt(f)))/(4 pi a),
//! V''(a0) = f'' - f'^2/(2 f) - (2 f - a f')/a^2 (1 + 2 beta^2),   f = 1 - 2m/a + q^2/a^2.
//! ```

use junctura::junction::EnergyConditions;
use junctura::scan::cell::{classify_v2, energy_bits};
use junctura::scan::{summarize_lines, Axis, CellClass, MapSpec, Summary};
use junctura::scenario::Scenario;
use std::time::Instant;

const N: usize = 3000;
const M: f64 = 1.0;
const BETA2: f64 = -0.5;
const Q_MAX: f64 = 0.95;

/// linspace as the map axes compute it (both ends exact).
fn value(lo: f64, hi: f64, n: usize, i: usize) -> f64 {
    if i + 1 == n {
        hi
    } else {
        lo + (hi - lo) * i as f64 / (n - 1) as f64
    }
}

/// The hand-written loop over the lines q_j, j in `lines`, all radii each.
fn hand_loop(r_lo: f64, lines: std::ops::Range<usize>) -> Summary {
    let mut acc = Summary::default();
    let pi = std::f64::consts::PI;
    for j in lines {
        let q = value(0.0, Q_MAX, N, j);
        let q2 = q * q;
        for i in 0..N {
            let a = value(r_lo, 10.0, N, i);
            let ia = 1.0 / a;
            let f = 1.0 - 2.0 * M * ia + q2 * ia * ia;
            let f1 = (2.0 * M - 2.0 * q2 * ia) * ia * ia;
            let f2 = (-4.0 * M + 6.0 * q2 * ia) * ia * ia * ia;
            // The same horizon test as the map (a relative 1e-9 of B).
            if f <= 1e-9 * (1.0 + a * f1.abs()) {
                acc.add(CellClass::InsideHorizon, 0);
                continue;
            }
            let sf = f.sqrt();
            let sigma = -sf * ia / (2.0 * pi);
            let p = (sf + 0.5 * a * f1 / sf) * ia / (4.0 * pi);
            let k = (2.0 * f - a * f1) * ia * ia;
            let c0 = f2 - f1 * f1 / (2.0 * f) - k;
            let c1 = -2.0 * k;
            let (_, class) = classify_v2(c0, c1, BETA2, a);
            acc.add(class, energy_bits(EnergyConditions::evaluate(sigma, p, 4)));
        }
    }
    acc
}

fn best_of<F: FnMut() -> Summary>(runs: usize, mut f: F) -> (f64, Summary) {
    let mut best = f64::INFINITY;
    let mut out = Summary::default();
    for _ in 0..runs {
        let t = Instant::now();
        out = std::hint::black_box(f());
        best = best.min(t.elapsed().as_secs_f64());
    }
    (best, out)
}

fn main() {
    let r_lo = 1.05 * (M + (M * M - Q_MAX * Q_MAX).sqrt());
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios/reissner-nordstrom-wormhole.toml");
    let s = Scenario::load(std::path::Path::new(path)).expect("the shipped scenario loads");
    let x = Axis::new(&s, "radius", r_lo, 10.0, N).expect("radius axis");
    let y = Axis::new(&s, "q", 0.0, Q_MAX, N).expect("q axis");
    let spec = MapSpec::new(&s, x, y, Some(BETA2), (1.0, 10.0)).expect("map spec");
    let pool = |t: usize| rayon::ThreadPoolBuilder::new().num_threads(t).build().expect("thread pool");
    let runs = 5;
    println!("grid: radius {r_lo:.6}..10 x q 0..{Q_MAX}, {N} x {N}, m = {M}, beta2 = {BETA2}; best of {runs}");
    let (h1, hs) = best_of(runs, || hand_loop(r_lo, 0..N));
    let (h2, hs2) = best_of(runs, || {
        std::thread::scope(|sc| {
            let a = sc.spawn(|| hand_loop(r_lo, 0..N / 2));
            let b = hand_loop(r_lo, N / 2..N);
            a.join().expect("worker").merge(&b)
        })
    });
    let (j1, js) = pool(1).install(|| best_of(runs, || summarize_lines(&s, &spec, 0..N).expect("map")));
    let (j2, js2) = pool(2).install(|| best_of(runs, || summarize_lines(&s, &spec, 0..N).expect("map")));
    assert_eq!(hs, hs2);
    assert_eq!(js, js2, "junctura's counts depend on the thread count");
    println!(
        "counts hand-written: stable {} unstable {} marginal {} inside_horizon {} null_energy {}",
        hs.stable_cells, hs.unstable_cells, hs.marginal_cells, hs.inside_horizon_cells, hs.null_energy_cells
    );
    println!(
        "counts junctura:     stable {} unstable {} marginal {} inside_horizon {} null_energy {}",
        js.stable_cells, js.unstable_cells, js.marginal_cells, js.inside_horizon_cells, js.null_energy_cells
    );
    println!("counts_equal {}", hs == js);
    println!("handwritten_1t_s {h1:.4}");
    println!("handwritten_2t_s {h2:.4}");
    println!("junctura_1t_s {j1:.4}");
    println!("junctura_2t_s {j2:.4}");
    println!("ratio_junctura_over_handwritten_1t {:.2}", j1 / h1);
    println!("ratio_junctura_over_handwritten_2t {:.2}", j2 / h2);
}
