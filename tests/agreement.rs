//! `statics`, `derive` and `map` agree on whether a static shell exists and on its linear class (stable, unstable
//! or marginal, with the one marginal rule), at random points of every shipped scenario with a timelike shell.
//!
//! Points of the first kind are 1000 random radii per scenario. Where the scenario has a law p = P(sigma), beta^2
//! is the law's slope P'(sigma0) at the radius; without a law the point also draws a beta^2, given to the map as
//! `--beta2`. derive reports V''(a0) = c0 + c1 beta^2 by its two coefficients; the map cell at that radius (radius
//! axis, one cell) carries its class and V''. Points of the second kind are random parameter values of a scenario
//! with a law: statics finds the static radii (`statics::find_static_radii`) and classifies them; the map cell and
//! derive at each of those radii, with those parameters, must say the same.
//!
//! The marginal rule is the statics one (`junction::stability::marginal_scale`, `StaticsOptions::marginal_tol`):
//! |V''| <= tol (|c0| + |c1 beta^2| + 1/a0^2) is marginal. The comparisons fail if a path drifts from the others:
//! a map whose marginal band is scaled differently, a beta^2 taken as P'(p0) instead of P'(sigma0) on the fast
//! map path, a sign slip in c1, or a radius the map admits while derive refuses it.
//!
//! Regression: the map's marginal band once lacked the 1/a0^2 term of the statics rule, so where V'' vanishes
//! identically (the extremal charged dust shell: every radius static and neutral) it called cells stable or
//! unstable at random; every comparison below is strict.

mod common;

use common::{length_scale, shipped_scenarios, Rng};
use junctura::junction::stability::{marginal_scale, LinearStability};
use junctura::report::derive::{derive, State};
use junctura::scan::cell::{Cell, CellClass, Evaluator};
use junctura::scan::grid::{Axis, MapSpec};
use junctura::scenario::{Scenario, ShellKind};
use junctura::statics::{find_static_radii, Stability, StaticsOptions};

/// Random radii per scenario.
const RADII: usize = 1000;
/// Random parameter draws per scenario with a law (each gives that law's static radii, often one or two).
const DRAWS: usize = 40;

/// The map's cell at radius r with the scenario's parameters (a one-cell map: radius x first parameter).
fn map_cell(s: &Scenario, r: f64, beta2: Option<f64>) -> Cell {
    let (name, value) = (&s.params.names()[0], s.params.values()[0]);
    let x = Axis::new(s, "radius", r, r, 1).unwrap();
    let y = Axis::new(s, name, value, value, 1).unwrap();
    let spec = MapSpec::new(s, x, y, beta2, junctura::metric::default_range(s)).unwrap();
    Evaluator::new(s, &spec).unwrap().line(0)[0]
}

/// V'' = c0 + c1 beta^2 at radius a0, and its class by the statics rule.
fn linear_class(c0: f64, c1: f64, beta2: f64, a0: f64) -> (f64, f64, Stability) {
    let v2 = c0 + c1 * beta2;
    let m = marginal_scale(&LinearStability::from_coefficients(c0, c1), beta2, a0);
    (v2, m, Stability::classify(v2, m, StaticsOptions::default().marginal_tol))
}

fn as_cell_class(st: Stability) -> CellClass {
    match st {
        Stability::Stable => CellClass::Stable,
        Stability::Unstable => CellClass::Unstable,
        Stability::Marginal => CellClass::Marginal,
    }
}

/// What derive says at rest at radius r: (V'', its marginal scale, class), None if no static shell with a finite
/// beta^2 exists there. `beta2` is the fixed value for a scenario without a law.
fn derived(s: &Scenario, r: f64, beta2: Option<f64>, at: &str) -> Option<(f64, f64, Stability)> {
    let d = derive(s, State::at_rest(r)).ok()?;
    let (c0, c1) = (d.v2_at_beta2_zero?, d.v2_slope?);
    let beta2 = match (&d.equation_of_state, beta2) {
        (Some(eos), None) => eos.beta2,
        (None, Some(b)) => b,
        _ => panic!("{at}: a law and a fixed beta^2 at once"),
    };
    beta2.is_finite().then(|| linear_class(c0, c1, beta2, r))
}

/// Compare the map cell with derive at radius r; returns the map's class.
fn compare_at(s: &Scenario, r: f64, beta2: Option<f64>, at: &str) -> CellClass {
    let cell = map_cell(s, r, beta2);
    let d = derived(s, r, beta2, at);
    let map_exists = !matches!(cell.class, CellClass::NoStatic | CellClass::InsideHorizon);
    assert_eq!(d.is_some(), map_exists, "{at}: derive {d:?} vs map {:?}", cell.class);
    let Some((v2, m, class)) = d else { return cell.class };
    // The same V'' to rounding of its terms (common practice: 1e-9 of the marginal scale).
    assert!((cell.v2 - v2).abs() <= 1e-9 * m, "{at}: map V'' = {:e}, derive V'' = {v2:e}", cell.v2);
    assert_eq!(cell.class, as_cell_class(class), "{at}: map V'' = {:e}, derive V'' = {v2:e}", cell.v2);
    cell.class
}

fn timelike_scenarios() -> Vec<(String, Scenario)> {
    let out: Vec<_> = shipped_scenarios().into_iter().filter(|(_, s)| s.shell.kind == ShellKind::Timelike).collect();
    assert!(out.len() >= 5, "only {} timelike scenarios", out.len());
    out
}

#[test]
fn derive_and_map_agree_at_random_radii() {
    let mut rng = Rng(0x51_7cc1_b727_220a);
    let mut seen = [0usize; 5];
    for (name, s) in timelike_scenarios() {
        let scale = length_scale(&s);
        for _ in 0..RADII {
            let r = rng.uniform(0.02, 12.0) * scale;
            let beta2 = s.shell.eos.is_none().then(|| rng.uniform(-3.0, 3.0));
            seen[compare_at(&s, r, beta2, &format!("{name} r = {r:e} beta2 = {beta2:?}")) as usize] += 1;
        }
    }
    // Both verdicts, marginal cells (the neutral extremal dust family) and missing shells occur among the samples,
    // so every comparison above ran.
    let [stable, unstable, marginal, none, horizon] = seen;
    assert!(stable > 500 && unstable > 500 && none + horizon > 500, "classes sampled: {seen:?}");
    assert!(marginal > 100, "classes sampled: {seen:?}");
}

#[test]
fn statics_classifies_its_static_radii_as_derive_and_map_do() {
    let opts = StaticsOptions {
        roots: junctura::roots::RootOptions { samples: 300, ..Default::default() },
        ..Default::default()
    };
    let mut rng = Rng(0x2545_f491_4f6c_dd1d);
    let (mut radii, mut classes) = (0, [0usize; 3]);
    for (name, s) in timelike_scenarios().into_iter().filter(|(_, s)| s.shell.eos.is_some()) {
        let (lo, hi) = junctura::metric::default_range(&s);
        for _ in 0..DRAWS {
            // Every parameter scaled by a factor in [0.8, 1.2].
            let mut sc = s.clone();
            for (k, v) in s.params.values().iter().enumerate() {
                sc.params.set(&s.params.names()[k].clone(), v * rng.uniform(0.8, 1.2)).unwrap();
            }
            let Ok(rep) = find_static_radii(&sc, lo, hi, &opts) else { continue };
            for sr in &rep.static_radii {
                let at = format!("{name} {:?} a0 = {:e}", sc.params.values(), sr.radius);
                let cell = compare_at(&sc, sr.radius, None, &at);
                assert_eq!(
                    cell,
                    as_cell_class(sr.stability),
                    "{at}: statics V'' = {:e}",
                    sr.potential_second_derivative
                );
                let (v2, m, class) = derived(&sc, sr.radius, None, &at).unwrap();
                assert_eq!(class, sr.stability, "{at}: derive V'' = {v2:e}");
                assert!((sr.potential_second_derivative - v2).abs() <= 1e-9 * m, "{at}: statics vs derive V''");
                radii += 1;
                classes[sr.stability as usize] += 1;
            }
        }
    }
    // Stable and unstable static radii both occur (gravastar-linear has one of each, Poisson & Visser 1995 style).
    assert!(radii > 50 && classes[0] > 10 && classes[1] > 10, "{radii} static radii, classes {classes:?}");
}
