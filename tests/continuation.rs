//! Maps over two parameters: static radii continued from the neighbouring cell (the default path) against the
//! full static-radius search in every cell (the reference path), and against a closed form.

use junctura::scan::{evaluate_lines_with, Axis, Cell, MapSpec, Method};
use junctura::scenario::Scenario;

fn load(name: &str) -> Scenario {
    let path = format!("{}/scenarios/{name}", env!("CARGO_MANIFEST_DIR"));
    Scenario::load(std::path::Path::new(&path)).expect("shipped scenario loads")
}

fn map(s: &Scenario, x: (&str, f64, f64), y: (&str, f64, f64), n: usize, range: (f64, f64), m: Method) -> Vec<Cell> {
    let ax = |(name, lo, hi): (&str, f64, f64)| Axis::new(s, name, lo, hi, n).expect("axis");
    let spec = MapSpec::new(s, ax(x), ax(y), None, range).expect("map spec");
    evaluate_lines_with(s, &spec, 0..spec.n_lines(), m).expect("map").concat()
}

/// Every cell has the same class, the same number of static radii with the same classes, and the same radii to
/// a relative 1e-9 on both paths.
fn assert_paths_agree(s: &Scenario, x: (&str, f64, f64), y: (&str, f64, f64), range: (f64, f64)) {
    let fast = map(s, x, y, 24, range, Method::Fast);
    let full = map(s, x, y, 24, range, Method::Generic);
    assert_eq!(fast.len(), full.len());
    let mut with_radii = 0;
    for (a, b) in fast.iter().zip(&full) {
        let at = format!("{} cell ({}, {}) = ({}, {})", s.name, a.ix, a.iy, a.x, a.y);
        assert_eq!(a.class, b.class, "{at}");
        assert_eq!(a.n_static, b.n_static, "{at}");
        assert_eq!(a.root_classes, b.root_classes, "{at}");
        for (ra, rb) in a.roots.iter().zip(&b.roots) {
            assert!(ra.is_nan() && rb.is_nan() || (ra - rb).abs() <= 1e-9 * rb.abs(), "{at}: {ra} vs {rb}");
        }
        with_radii += usize::from(a.n_static > 0);
    }
    assert!(with_radii > 20, "{}: only {with_radii} cells with a static radius; the map tests nothing", s.name);
}

#[test]
fn continued_radii_match_the_full_search_for_the_linear_gravastar() {
    assert_paths_agree(&load("gravastar-linear.toml"), ("l", 0.01, 0.2), ("w", 0.1, 1.5), (1e-3, 20.0));
}

#[test]
fn continued_radii_match_the_full_search_for_the_chaplygin_gravastar() {
    assert_paths_agree(&load("gravastar-chaplygin.toml"), ("l", 0.01, 0.2), ("c", 1e-4, 0.01), (1e-3, 20.0));
}

#[test]
fn continued_radii_match_the_full_search_for_the_schwarzschild_wormhole() {
    assert_paths_agree(&load("schwarzschild-wormhole-linear.toml"), ("m", 0.5, 2.0), ("w", -0.95, -0.3), (1e-3, 60.0));
}

/// Schwarzschild thin-shell wormhole with p = w sigma: the static values sigma0 = -sqrt(1 - 2m/a)/(2 pi a),
/// p0 = (1 - m/a)/(4 pi a sqrt(1 - 2m/a)) (Poisson & Visser 1995) give p0 = w sigma0 at
/// a0 = m (1 + 4w)/(1 + 2w), outside the horizon for -1 < w < -1/2 and nowhere for -1/2 < w < -1/4 (solved by
/// hand from the published sigma0, p0).
#[test]
fn continued_radii_of_the_linear_wormhole_follow_the_closed_form() {
    let s = load("schwarzschild-wormhole-linear.toml");
    let cells = map(&s, ("m", 0.5, 2.0), ("w", -0.95, -0.3), 24, (1e-3, 60.0), Method::Fast);
    let mut checked = 0;
    for c in &cells {
        let (m, w) = (c.x, c.y);
        let a0 = m * (1.0 + 4.0 * w) / (1.0 + 2.0 * w);
        if w < -0.5 && a0 < 60.0 * (1.0 - 1e-6) {
            assert_eq!(c.n_static, 1, "m = {m}, w = {w}");
            assert!((c.roots[0] - a0).abs() <= 1e-10 * a0, "m = {m}, w = {w}: {} vs {a0}", c.roots[0]);
            checked += 1;
        } else if w > -0.5 && w < -0.25 {
            assert_eq!(c.n_static, 0, "m = {m}, w = {w}");
        }
    }
    assert!(checked > 100, "{checked}");
}
