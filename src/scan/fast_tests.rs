//! The batched path (jets of compiled tapes, per point and over a line) against the generic reference path
//! (dual-number evaluation of the sides, `scan::cell::static_point`): both feed the one computation
//! `junction::point::static_coefficients` (itself checked against the SymPy derivation in tests/reference/ and
//! against Poisson & Visser 1995), so they must agree to a relative 1e-9 on every shipped timelike scenario and
//! on random points, and give the same class everywhere.

use super::*;
use crate::junction::Junction;
use crate::scan::cell::static_point;
use crate::scenario::Scenario;

/// A small deterministic generator (xorshift64*), so failures reproduce.
struct Rng(u64);
impl Rng {
    fn uniform(&mut self, lo: f64, hi: f64) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        let u = (self.0.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 11) as f64 / (1u64 << 53) as f64;
        lo + (hi - lo) * u
    }
}

fn close(a: f64, b: f64, scale: f64) -> bool {
    (a - b).abs() <= 1e-9 * (a.abs().max(b.abs()) + scale)
}

/// Compare both paths at radius `a` with parameters `params`; returns true if a static shell exists there.
fn agree(s: &Scenario, params: &[f64], a: f64, what: &str) -> bool {
    let fj = FastJunction::new(&s.model).expect("expression sides compile");
    let j = Junction::with_params(&s.model, params.to_vec());
    let generic = static_point(&j, a);
    let fast = static_coefficients(&fj.shape, a, &fj.point_jets(a, params));
    // The batch path over a line of radii gives the same jets as the per-point path.
    let mut sc = LineScratch { xs: vec![a * 0.9, a, a * 1.1], ..Default::default() };
    fj.eval_line_coefficients(params, &mut sc);
    let batch = fj.line_result(&sc, 1);
    match (generic, fast, batch) {
        (Ok((sg, pg, c0g, c1g)), Ok(f), Ok(b)) => {
            let scale = c0g.abs() + c1g.abs();
            // Relative to the size of the stress: p may vanish identically (dust in an extremal exterior).
            for (name, x, y) in [("sigma", sg, f.sigma), ("p", pg, f.pressure)] {
                assert!(close(x, y, 1e-6 * (sg.abs() + pg.abs())), "{what} a = {a}: {name} generic {x} fast {y}");
            }
            for (name, x, y) in [("c0", c0g, f.c0), ("c1", c1g, f.c1), ("c0 batch", c0g, b.c0), ("c1 batch", c1g, b.c1)]
            {
                assert!(close(x, y, scale), "{what} a = {a}: {name} generic {x} fast {y}");
            }
            true
        }
        (Err(g), Err(f), Err(b)) => {
            assert_eq!((g, g), (f, b), "{what} a = {a}: classes differ");
            false
        }
        (g, f, b) => panic!("{what} a = {a}: generic {g:?}, fast {f:?}, batch {b:?}"),
    }
}

fn shipped() -> Vec<(String, Scenario)> {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("scenarios");
    let mut out = Vec::new();
    for e in std::fs::read_dir(&dir).unwrap() {
        let p = e.unwrap().path();
        if p.extension().is_some_and(|x| x == "toml") {
            let s = Scenario::load(&p).unwrap();
            out.push((p.display().to_string(), s));
        }
    }
    assert!(out.len() >= 5, "the shipped scenarios were not found");
    out
}

#[test]
fn fast_path_matches_generic_on_every_shipped_timelike_scenario() {
    let mut checked = 0;
    for (name, s) in shipped() {
        if s.shell.kind != crate::model::ShellKind::Timelike {
            continue; // maps (and hence this path) are for timelike shells only
        }
        let mut found = 0;
        for i in 0..400 {
            let a = 0.05 + 12.0 * i as f64 / 400.0;
            found += usize::from(agree(&s, s.params.values(), a, &name));
        }
        assert!(found > 50, "{name}: only {found} radii with a static shell; the comparison is too thin");
        checked += 1;
    }
    assert!(checked >= 4);
}

const GENERAL: &str = r#"
name = "Different sides with A != B, a redshift factor and charge"
dimension = DIM
[parameters]
m1 = 1.0
m2 = 1.5
k = 0.3
q = 0.4
[minus]
A = "(1 - 2*m1/r)*exp(-2*k/r)"
B = "1 - 2*m1/r"
keep = "KEEP"
[plus]
A = "1 - 2*m2/r^(DIM-3) + q^2/r^(2*DIM-6)"
B = "(1 - 2*m2/r^(DIM-3) + q^2/r^(2*DIM-6))*(1 + k/r^2)"
keep = "outer"
"#;

#[test]
fn fast_path_matches_generic_at_random_points_with_flux_and_higher_dimension() {
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let mut found = 0;
    for dim in [4, 5, 6] {
        for keep in ["inner", "outer"] {
            let text = GENERAL.replace("DIM", &dim.to_string()).replace("KEEP", keep);
            let s = Scenario::parse(&text, None).unwrap();
            for _ in 0..300 {
                let params =
                    [rng.uniform(0.1, 2.0), rng.uniform(0.1, 2.0), rng.uniform(-0.5, 0.8), rng.uniform(0.0, 1.0)];
                let a = rng.uniform(0.2, 15.0);
                found += usize::from(agree(&s, &params, a, &format!("D = {dim}, minus keeps {keep}, {params:?}")));
            }
        }
    }
    assert!(found > 600, "only {found} random points had a static shell");
}

#[test]
fn identical_metric_functions_are_compiled_once() {
    let s = Scenario::parse(
        &std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios/reissner-nordstrom-wormhole.toml"))
            .unwrap(),
        None,
    )
    .unwrap();
    assert_eq!(FastJunction::new(&s.model).unwrap().distinct_functions(), 1);
    let t = Scenario::parse(&GENERAL.replace("DIM", "4").replace("KEEP", "outer"), None).unwrap();
    assert_eq!(FastJunction::new(&t.model).unwrap().distinct_functions(), 4);
}

/// Whole maps, every orientation and every beta^2 source: the fast evaluator gives the cells of the generic one.
#[test]
fn fast_maps_equal_generic_maps() {
    use crate::scan::{evaluate_lines_with, Axis, MapSpec, Method};
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("scenarios");
    let rn = Scenario::load(&root.join("reissner-nordstrom-wormhole.toml")).unwrap();
    let grav = Scenario::load(&root.join("gravastar-linear.toml")).unwrap();
    let ax = |s: &Scenario, name: &str, lo: f64, hi: f64, n: usize| Axis::new(s, name, lo, hi, n).unwrap();
    let specs = [
        (&rn, MapSpec::new(&rn, ax(&rn, "radius", 1.2, 8.0, 23), ax(&rn, "beta2", -3.0, 3.0, 17), None, (1.0, 9.0))),
        (&rn, MapSpec::new(&rn, ax(&rn, "beta2", -3.0, 3.0, 17), ax(&rn, "radius", 1.2, 8.0, 23), None, (1.0, 9.0))),
        (&rn, MapSpec::new(&rn, ax(&rn, "radius", 1.05, 8.0, 31), ax(&rn, "q", 0.0, 1.2, 19), Some(-0.5), (1.0, 9.0))),
        (&rn, MapSpec::new(&rn, ax(&rn, "q", 0.0, 1.2, 19), ax(&rn, "radius", 1.05, 8.0, 31), Some(0.4), (1.0, 9.0))),
        (
            &grav,
            MapSpec::new(&grav, ax(&grav, "radius", 1.5, 7.0, 29), ax(&grav, "w", -1.0, 1.0, 13), None, (1.0, 9.0)),
        ),
    ];
    for (k, (s, spec)) in specs.into_iter().enumerate() {
        let spec = spec.unwrap();
        let all = 0..spec.n_lines();
        let fast = evaluate_lines_with(s, &spec, all.clone(), Method::Fast).unwrap();
        let generic = evaluate_lines_with(s, &spec, all, Method::Generic).unwrap();
        let mut statics = 0;
        for (f, g) in fast.iter().flatten().zip(generic.iter().flatten()) {
            assert_eq!((f.ix, f.iy, f.class, f.energy_bits), (g.ix, g.iy, g.class, g.energy_bits), "map {k}");
            for (x, y) in [(f.sigma, g.sigma), (f.pressure, g.pressure), (f.v2, g.v2), (f.beta2, g.beta2)] {
                assert!(x.to_bits() == y.to_bits() || close(x, y, g.v2.abs().max(1e-300)), "map {k}: {f:?} vs {g:?}");
            }
            statics += usize::from(f.n_static == 1);
        }
        assert!(statics > 20, "map {k}: only {statics} cells with a static shell");
    }
}
