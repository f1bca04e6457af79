//! Checks of the junction, potential and statics code against published closed forms and worked examples.
//! The source of every reference value is named beside it.

use junctura::junction::potential::{potential_from_y, Law};
use junctura::junction::{Junction, StableWhen};
use junctura::scenario::Scenario;
use junctura::statics::tune::tune_at_radius;
use junctura::statics::{find_static_radii, Stability, StaticsOptions};
use std::f64::consts::PI;

fn scenario(minus: (&str, &str), plus: (&str, &str), params: &str, extra: &str) -> Scenario {
    let text = format!(
        "name = \"test\"\n[parameters]\n{params}\n[minus]\nA = \"{}\"\nkeep = \"{}\"\n[plus]\nA = \"{}\"\nkeep = \"{}\"\n{extra}",
        minus.0, minus.1, plus.0, plus.1
    );
    Scenario::parse(&text, None).unwrap()
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * a.abs().max(b.abs()).max(1e-300)
}

/// Poisson & Visser 1995 (Phys. Rev. D 52, 7318), Schwarzschild thin-shell wormhole:
/// sigma0 = -sqrt(1 - 2M/a)/(2 pi a), p0 = (1 - M/a)/(4 pi a sqrt(1 - 2M/a)); critical curve
/// beta^2_c = -(1 - 3M/a + 3M^2/a^2)/(2(1 - 2M/a)(1 - 3M/a)), diverging at a = 3M.
#[test]
fn poisson_visser_wormhole_static_values_and_critical_curve() {
    let s = scenario(("1 - 2*m/r", "outer"), ("1 - 2*m/r", "outer"), "m = 1.3", "");
    let j = Junction::new(&s);
    let m = 1.3;
    for a in [2.7, 3.5, 3.95, 4.0, 5.2, 10.0, 100.0] {
        let sv = j.static_values(a).unwrap();
        let b = 1.0 - 2.0 * m / a;
        assert!(close(sv.stress.sigma(), -b.sqrt() / (2.0 * PI * a), 1e-13));
        assert!(close(sv.stress.pressure(), (1.0 - m / a) / (4.0 * PI * a * b.sqrt()), 1e-13));
        let ls = j.linear_stability(&sv);
        let x = m / a;
        let pv = -(1.0 - 3.0 * x + 3.0 * x * x) / (2.0 * (1.0 - 2.0 * x) * (1.0 - 3.0 * x));
        assert!(close(ls.beta2_critical.unwrap(), pv, 1e-9), "a = {a}");
        let side = if a > 3.0 * m { StableWhen::Beta2Below } else { StableWhen::Beta2Above };
        assert_eq!(ls.stable_when, side);
    }
    // Near a = 3M the critical value diverges (Poisson & Visser 1995, fig. 1).
    let near = j.linear_stability(&j.static_values(3.0 * m * (1.0 + 1e-6)).unwrap());
    assert!(near.beta2_critical.unwrap().abs() > 1e5);
    // Exactly at a = 3M, V'' does not depend on beta^2 and is negative: no beta^2 stabilises the shell.
    let at = j.linear_stability(&j.static_values(3.0 * m).unwrap());
    assert_eq!(at.beta2_critical, None);
    assert_eq!(at.stable_when, StableWhen::Never);
}

/// Eiroa & Romero 2004 (Gen. Rel. Grav. 36, 651), charged thin-shell wormhole, static values (from memory):
/// sigma0 = -sqrt(1 - 2M/a + Q^2/a^2)/(2 pi a), p0 = (1 - M/a)/(4 pi a sqrt(1 - 2M/a + Q^2/a^2)).
#[test]
fn eiroa_romero_charged_wormhole() {
    let s = scenario(("1 - 2*m/r + q^2/r^2", "outer"), ("1 - 2*m/r + q^2/r^2", "outer"), "m = 1.0\nq = 0.6", "");
    let j = Junction::new(&s);
    for a in [2.0, 2.5, 3.0, 6.0] {
        let sv = j.static_values(a).unwrap();
        let b: f64 = 1.0 - 2.0 / a + 0.36 / (a * a);
        assert!(close(sv.stress.sigma(), -b.sqrt() / (2.0 * PI * a), 1e-13));
        assert!(close(sv.stress.pressure(), (1.0 - 1.0 / a) / (4.0 * PI * a * b.sqrt()), 1e-13));
    }
}

/// Lobo & Crawford 2004 (Class. Quantum Grav. 21, 391), Schwarzschild-de Sitter thin-shell wormhole, static
/// values (from memory): sigma0 = -sqrt(1 - 2M/a - L a^2/3)/(2 pi a),
/// p0 = (1 - M/a - 2 L a^2/3)/(4 pi a sqrt(1 - 2M/a - L a^2/3)).
#[test]
fn lobo_crawford_cosmological_constant_wormhole() {
    let s = scenario(("1 - 2*m/r - l*r^2/3", "outer"), ("1 - 2*m/r - l*r^2/3", "outer"), "m = 1.0\nl = 0.01", "");
    let j = Junction::new(&s);
    for a in [2.5, 4.0, 8.0] {
        let sv = j.static_values(a).unwrap();
        let b: f64 = 1.0 - 2.0 / a - 0.01 * a * a / 3.0;
        assert!(close(sv.stress.sigma(), -b.sqrt() / (2.0 * PI * a), 1e-13));
        let p = (1.0 - 1.0 / a - 2.0 * 0.01 * a * a / 3.0) / (4.0 * PI * a * b.sqrt());
        assert!(close(sv.stress.pressure(), p, 1e-12));
    }
}

/// Israel 1966 (Nuovo Cimento B 44, 1); Poisson 2004 (A Relativist's Toolkit, sec. 3.9): a pressureless dust
/// shell, flat inside, Schwarzschild mass M outside, obeys M = m sqrt(1 + Rdot^2) - m^2/(2R) with m = 4 pi R^2
/// sigma constant. Check (i) the angular junction condition gives that M for any (R, Rdot), and (ii) at the
/// acceleration of free fall Rddot = -V'(R)/2 (with sigma = m/(4 pi R^2)) the pressure from the tau-tau
/// component vanishes.
#[test]
fn israel_dust_shell() {
    let mass = 1.0;
    let s = scenario(("1", "inner"), ("1 - 2*M/r", "outer"), "M = 1.0", "");
    let j = Junction::new(&s);
    for (r, rdot) in [(3.0, 0.2), (5.0, -0.7), (10.0, 1.5), (2.5, 0.0)] {
        let st = j.stress(r, rdot, 0.0).unwrap();
        let m = 4.0 * PI * r * r * st.sigma();
        let big_m = m * (1.0f64 + rdot * rdot).sqrt() - m * m / (2.0 * r);
        assert!(close(big_m, mass, 1e-13), "R = {r}: {big_m}");
        // V(R) for dust: sigma(R) = m/(4 pi R^2) with m fixed; V' by a central difference of the exact V.
        let v = |rr: f64| {
            let sigma = m / (4.0 * PI * rr * rr);
            j.potential_sigma(rr, sigma)
        };
        let h = 1e-5 * r;
        let v1 = (v(r + h) - v(r - h)) / (2.0 * h);
        let rddot = -v1 / 2.0;
        // Consistency of the state with Rdot^2 + V = 0.
        assert!((v(r) + rdot * rdot).abs() < 1e-12);
        let p = j.stress(r, rdot, rddot).unwrap().pressure();
        assert!(p.abs() < 1e-9, "R = {r}: p = {p}");
    }
}

/// Tuning the linear law p = w sigma so that the Schwarzschild wormhole is static at a = 4M:
/// w = -(1 - M/a)/(2(1 - 2M/a)) = -0.75 (from the static values of Poisson & Visser 1995), and its static radius
/// for given w < -1/2 is a0 = M (1 + 4w)/(1 + 2w) (same source, solved for a).
#[test]
fn linear_law_wormhole_tuning_and_static_radius() {
    let s = scenario(
        ("1 - 2*m/r", "outer"),
        ("1 - 2*m/r", "outer"),
        "m = 1.0\nw = -0.6",
        "[shell]\npressure = \"w*sigma\"\n",
    );
    let opts = StaticsOptions::default();
    let rep = tune_at_radius(&s, "w", 4.0, None, &opts).unwrap();
    assert_eq!(rep.solutions.len(), 1);
    assert!(close(rep.solutions[0].value, -0.75, 1e-12));
    // da0/dw = 2M/(1 + 2w)^2 = 8 at w = -0.75 (derivative of the closed form).
    assert!(close(rep.solutions[0].d_radius_d_parameter.unwrap(), 8.0, 1e-9));
    for w in [-0.6, -0.75, -1.0, -3.0] {
        let mut sc = s.clone();
        sc.params.set("w", w).unwrap();
        let rep = find_static_radii(&sc, 2.0001, 1e4, &opts).unwrap();
        let expect = (1.0 + 4.0 * w) / (1.0 + 2.0 * w);
        assert_eq!(rep.static_radii.len(), 1, "w = {w}");
        assert!(close(rep.static_radii[0].radius, expect, 1e-12), "w = {w}");
        let sr = &rep.static_radii[0];
        assert!(sr.potential[0].abs() < 1e-12 && sr.potential[1].abs() < 1e-12);
    }
}

/// Thin-shell gravastar (Visser & Wiltshire 2004, Class. Quantum Grav. 21, 1135): de Sitter core, Schwarzschild
/// exterior. Static values (their eqs. for sigma and p, from memory):
/// sigma0 = -(1/(4 pi a)) (sqrt(1 - 2M/a) - sqrt(1 - L a^2/3)),
/// p0 = (1/(8 pi a)) ((1 - M/a)/sqrt(1 - 2M/a) - (1 - 2 L a^2/3)/sqrt(1 - L a^2/3)).
/// With p = w sigma (w = 0.6, L = 0.05, M = 1: demo values) there are two static radii. Their stability is checked
/// against an independent route: for A = B and a linear law the conservation law integrates to
/// sigma(a) = sigma0 (a0/a)^(2(1+w)) (Poisson & Visser 1995), and V(a) built from it is differentiated by finite
/// differences.
#[test]
fn visser_wiltshire_gravastar_two_static_radii() {
    let (m, l, w) = (1.0, 0.05, 0.6);
    let s = scenario(
        ("1 - l*r^2/3", "inner"),
        ("1 - 2*m/r", "outer"),
        "m = 1.0\nl = 0.05\nw = 0.6",
        "[shell]\npressure = \"w*sigma\"\n",
    );
    let rep = find_static_radii(&s, 2.0001, 7.7, &StaticsOptions::default()).unwrap();
    assert_eq!(rep.static_radii.len(), 2);
    let j = Junction::new(&s);
    let mut verdicts = vec![];
    for sr in &rep.static_radii {
        let a: f64 = sr.radius;
        let bo = 1.0 - 2.0 * m / a;
        let bi = 1.0 - l * a * a / 3.0;
        let sigma = -(bo.sqrt() - bi.sqrt()) / (4.0 * PI * a);
        let p = ((1.0 - m / a) / bo.sqrt() - (1.0 - 2.0 * l * a * a / 3.0) / bi.sqrt()) / (8.0 * PI * a);
        assert!(close(sr.sigma, sigma, 1e-12) && close(sr.pressure, p, 1e-12));
        assert!((p - w * sigma).abs() < 1e-14);
        let v = |x: f64| j.potential_sigma(x, sigma * (a / x).powf(2.0 * (1.0 + w)));
        let h = 1e-4;
        let v2_fd = (v(a + h) - 2.0 * v(a) + v(a - h)) / (h * h);
        assert!(close(sr.potential_second_derivative, v2_fd, 1e-5), "{} vs {v2_fd}", sr.potential_second_derivative);
        verdicts.push(sr.stability);
    }
    assert_eq!(verdicts, vec![Stability::Unstable, Stability::Stable]);
}

/// A Chaplygin-type law p = -c/sigma (Kamenshchik, Moschella & Pasquier 2001, Phys. Lett. B 511, 265) on a shell
/// whose sigma0 changes sign where a^3 = 6m/l (equal sqrt(B) on both sides): the sign change of p0 - P(sigma0)
/// there is a pole and must not be reported as a static radius.
#[test]
fn chaplygin_pole_is_not_a_static_radius() {
    let s = scenario(
        ("1 - l*r^2/3", "inner"),
        ("1 - 2*m/r", "outer"),
        "m = 1.0\nl = 0.05\nc = 0.001",
        "[shell]\npressure = \"-c/sigma\"\n",
    );
    let rep = find_static_radii(&s, 2.01, 7.7, &StaticsOptions::default()).unwrap();
    let pole = (6.0f64 / 0.05).cbrt();
    assert!(rep.static_radii.iter().all(|r| (r.radius - pole).abs() > 1e-3), "{:?}", rep.static_radii);
    assert!(rep.poles_rejected.iter().any(|p| (p - pole).abs() < 1e-6), "{:?}", rep.poles_rejected);
}

/// Internal consistency at every static radius: V(a0) = V'(a0) = 0 and the critical beta^2 equals dp/dsigma
/// along the family of static solutions when that family is the marginal one: at a fold of the static branch of
/// a linear law (where V'' = 0), beta^2 = w equals beta^2_crit.
#[test]
fn beta2_critical_equals_law_slope_at_a_fold() {
    let s = scenario(
        ("1 - l*r^2/3", "inner"),
        ("1 - 2*m/r", "outer"),
        "m = 1.0\nl = 0.05\nw = 0.6",
        "[shell]\npressure = \"w*sigma\"\n",
    );
    let rep = junctura::statics::tune::tune_marginal(&s, "w", 2.05, 4.0, Some((0.0, 2.0)), &StaticsOptions::default())
        .unwrap();
    assert_eq!(rep.solutions.len(), 1);
    let sol = &rep.solutions[0];
    let mut sc = s.clone();
    sc.params.set("w", sol.value).unwrap();
    let j = Junction::new(&sc);
    let sv = j.static_values(sol.radius).unwrap();
    let ls = j.linear_stability(&sv);
    assert!(close(ls.beta2_critical.unwrap(), sol.value, 1e-7), "{:?} vs {}", ls.beta2_critical, sol.value);
    let v = j.potential_taylor(&sv, Law::Scenario).unwrap();
    assert!(v[0].abs() < 1e-13 && v[1].abs() < 1e-12 && v[2].abs() < 1e-9, "{v:?}");
    // The same potential by its closed form at the static point is zero (angular junction condition).
    let y = sv.stress.n_r[1] - sv.stress.n_r[0];
    assert!(potential_from_y(1.0, sv.jets[0].b[0], sv.jets[1].b[0], y).abs() < 1e-14);
}
