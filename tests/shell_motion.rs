//! Shell motion from arbitrary initial data and through horizons, checked against the independent quadratures
//! of `tests/reference/shell_motion_reference.py` (`shell_motion_golden.json`) and against closed forms.

use junctura::dynamics::integrate::EventKind;
use junctura::dynamics::{evolve, EvolveOptions, EvolveReport, Fate, Start};
use junctura::scenario::Scenario;
use junctura::statics::{find_static_radii, StaticsOptions};
use serde_json::Value;
use std::path::PathBuf;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn scenario(name: &str) -> Scenario {
    Scenario::load(&root().join("scenarios").join(name)).unwrap()
}

fn golden() -> Value {
    let p = root().join("tests/reference/shell_motion_golden.json");
    serde_json::from_str(&std::fs::read_to_string(p).unwrap()).unwrap()
}

fn g(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("golden value {key} missing"))
}

fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

/// The events of one kind (and side), in order.
fn events<'a>(
    rep: &'a EvolveReport,
    kind: EventKind,
    side: Option<&str>,
) -> Vec<&'a junctura::dynamics::integrate::Event> {
    rep.events.iter().filter(|e| e.kind == kind && (side.is_none() || e.side == side)).collect()
}

/// Dust shell, flat inside, Schwarzschild outside, released from rest at R0 (Israel 1966; Poisson 2004 sec. 3.9):
/// the proper time to the horizon R = 2M and to R = 0, and the radius where the exterior normal flips, against
/// the quadrature of M = m sqrt(1 + Rdot^2) - m^2/(2R) (shell_motion_reference.py, case 1). The Israel energy
/// stays M inside the horizon too.
#[test]
fn dust_shell_falls_through_its_horizon_to_the_centre_on_the_quadrature_times() {
    let s = scenario("dust-collapse.toml");
    assert_eq!(s.params.get("m").unwrap(), 1.0);
    for case in golden()["dust"].as_array().unwrap() {
        assert_eq!(g(case, "mass_M"), 1.0);
        let r0 = g(case, "start_radius");
        let rep = evolve(&s, r0, Start::Moving(0.0), 100.0, None, &EvolveOptions::default()).unwrap();
        assert!(rel(rep.initial.sigma, g(case, "sigma_start")) < 1e-12, "{}", rep.initial.sigma);
        assert_eq!(rep.stop, "center", "{}", rep.stop_detail);
        assert_eq!(rep.fate, Fate::Collapses);
        assert!(rel(rep.tau_end, g(case, "tau_to_center")) < 1e-7, "R0 = {r0}: tau_end {}", rep.tau_end);
        let hc = events(&rep, EventKind::HorizonCrossing, Some("plus"));
        assert_eq!(hc.len(), 1, "{:?}", rep.events);
        assert!((hc[0].radius - 2.0).abs() < 1e-9);
        assert!(rel(hc[0].tau, g(case, "tau_to_horizon")) < 1e-8, "R0 = {r0}: horizon at tau {}", hc[0].tau);
        assert!(hc[0].detail.contains("R-region -> T-region"), "{}", hc[0].detail);
        let flips = events(&rep, EventKind::NormalFlip, Some("plus"));
        assert_eq!(flips.len(), 1);
        // Located on the cubic interpolant of (R, sigma) inside one step: a few 1e-7.
        assert!(rel(flips[0].radius, g(case, "normal_flip_radius")) < 1e-6, "flip at {}", flips[0].radius);
        assert!(events(&rep, EventKind::HorizonCrossing, Some("minus")).is_empty());
        assert_eq!(rep.sides[1].region_end, Some(junctura::metric::RegionKind::T));
        let m = g(case, "rest_mass_m");
        // Relative to the size of its terms, m sqrt(1 + Rdot^2), which grows without bound as R -> 0.
        for smp in &rep.samples {
            let u = (1.0 + smp.rdot * smp.rdot).sqrt();
            let e = m * u - m * m / (2.0 * smp.radius);
            assert!((e - 1.0).abs() < 1e-8 * u, "R0 = {r0}: M = {e} at R = {}", smp.radius);
        }
        // Asked to stop at the horizon, it ends there, at the same proper time.
        let o = EvolveOptions { stop_at_horizon: true, ..EvolveOptions::default() };
        let rep = evolve(&s, r0, Start::Moving(0.0), 100.0, None, &o).unwrap();
        assert_eq!(rep.stop, "horizon");
        assert!((rep.tau_end - g(case, "tau_to_horizon")).abs() < 1e-6, "{}", rep.tau_end);
    }
}

/// Charged dust (flat inside, Reissner-Nordstrom outside, m < Q < M) started with its rest mass at R0 moving
/// inward: |Rdot| at the start from the energy constraint, the crossings of r_+ and r_- inward, the bounce at
/// R = (Q^2 - m^2)/(2 (M - m)) from M = m sqrt(1 + Rdot^2) - m^2/(2R) + Q^2/(2R), and both crossings outward,
/// against shell_motion_reference.py (case 2).
#[test]
fn charged_dust_bounces_inside_the_inner_horizon_and_reexpands() {
    let s = scenario("charged-dust-bounce.toml");
    let c = &golden()["charged_dust"];
    assert_eq!(s.params.get("m").unwrap(), g(c, "mass_M"));
    assert_eq!(s.params.get("q").unwrap(), g(c, "charge_Q"));
    let start = Start::Sigma { sigma: g(c, "sigma_start"), outward: Some(false) };
    let rep = evolve(&s, g(c, "start_radius"), start, 3.0, None, &EvolveOptions::default()).unwrap();
    assert!(rel(-rep.initial.rdot, g(c, "start_speed")) < 1e-12, "{}", rep.initial.rdot);
    let turns = events(&rep, EventKind::TurningPoint, None);
    assert_eq!(turns.len(), 1);
    assert!(rel(turns[0].radius, g(c, "bounce_radius")) < 1e-8, "bounce at {}", turns[0].radius);
    // The closed form of the bounce (from the first integral at Rdot = 0).
    let (mm, q, m) = (g(c, "mass_M"), g(c, "charge_Q"), g(c, "rest_mass_m"));
    assert!(rel(turns[0].radius, (q * q - m * m) / (2.0 * (mm - m))) < 1e-8);
    assert!(rel(turns[0].tau, g(c, "tau_bounce")) < 1e-8);
    let hc = events(&rep, EventKind::HorizonCrossing, Some("plus"));
    let want = [
        ("horizon_outer", "tau_outer_inward", "inward"),
        ("horizon_inner", "tau_inner_inward", "inward"),
        ("horizon_inner", "tau_inner_outward", "outward"),
        ("horizon_outer", "tau_outer_outward", "outward"),
    ];
    assert_eq!(hc.len(), want.len(), "{:?}", rep.events);
    for (e, (r, t, dir)) in hc.iter().zip(want) {
        assert!(rel(e.radius, g(c, r)) < 1e-10, "{} vs {}", e.radius, g(c, r));
        assert!(rel(e.tau, g(c, t)) < 1e-8, "{t}: {} vs {}", e.tau, g(c, t));
        assert!(e.detail.contains(dir), "{}", e.detail);
    }
    for smp in &rep.samples {
        let e = m * (1.0 + smp.rdot * smp.rdot).sqrt() - m * m / (2.0 * smp.radius) + q * q / (2.0 * smp.radius);
        assert!((e - mm).abs() < 1e-7, "M = {e} at R = {}", smp.radius);
        let mu = 4.0 * std::f64::consts::PI * smp.radius * smp.radius * smp.sigma;
        assert!((mu - m).abs() < 1e-8, "rest mass {mu}");
    }
}

/// A domain wall p = -sigma between a de Sitter interior and a Schwarzschild-de Sitter exterior (Blau,
/// Guendelman & Guth 1987, sec. II): the tension is conserved exactly (sigma' = -(2/R)(sigma + p) = 0), the
/// wall turns at the root of Rdot^2 = beta_-^2 - B_- and expands through the exterior cosmological horizon and
/// the interior de Sitter horizon at the proper times of shell_motion_reference.py (case 3).
#[test]
fn de_sitter_wall_turns_at_the_root_of_the_potential_and_crosses_the_cosmological_horizons() {
    let s = scenario("de-sitter-bubble-wall.toml");
    let c = &golden()["de_sitter_wall"];
    assert_eq!(s.params.get("m").unwrap(), g(c, "mass_M"));
    assert_eq!(s.params.get("lin").unwrap(), g(c, "lambda_in"));
    assert_eq!(s.params.get("lout").unwrap(), g(c, "lambda_out"));
    let sigma = g(c, "sigma");
    let rep = evolve(
        &s,
        g(c, "start_radius"),
        Start::Sigma { sigma, outward: Some(false) },
        30.0,
        None,
        &EvolveOptions::default(),
    )
    .unwrap();
    assert!(rel(-rep.initial.rdot, g(c, "start_speed")) < 1e-12);
    for smp in &rep.samples {
        assert!(rel(smp.sigma, sigma) < 1e-12, "tension drifted to {}", smp.sigma);
    }
    let turns = events(&rep, EventKind::TurningPoint, None);
    assert_eq!(turns.len(), 1);
    assert!(rel(turns[0].radius, g(c, "turning_radius")) < 1e-8, "turn at {}", turns[0].radius);
    assert!(rel(turns[0].tau, g(c, "tau_turn")) < 1e-8);
    let out = events(&rep, EventKind::HorizonCrossing, Some("plus"));
    assert_eq!(out.len(), 1);
    assert!(rel(out[0].radius, g(c, "cosmological_horizon_out")) < 1e-10);
    assert!(rel(out[0].tau, g(c, "tau_cosmological_out")) < 1e-7, "{}", out[0].tau);
    let inn = events(&rep, EventKind::HorizonCrossing, Some("minus"));
    assert_eq!(inn.len(), 1);
    assert!(rel(inn[0].radius, g(c, "horizon_in")) < 1e-10);
    assert!(rel(inn[0].tau, g(c, "tau_horizon_in")) < 1e-7, "{}", inn[0].tau);
    assert_eq!(rep.fate, Fate::Expands);
    // At the turning point both normals point to increasing r (beta_+ > 0 there, the reference says).
    assert!(g(c, "beta_plus_at_turn") > 0.0);
    assert!(events(&rep, EventKind::NormalFlip, None).is_empty());
}

/// Extremal Reissner-Nordstrom, B = (1 - M/r)^2: a dust shell thrown inward crosses the double horizon r = M
/// (reported as a crossing of a degenerate horizon, R-region on both sides) and bounces at
/// R = (M^2 - mu^2)/(2 (M - mu)) (the charged-dust first integral with Q = M), mu = R0 (sqrt(1 + V0^2) -
/// sqrt(V0^2 + B(R0))) from the junction condition (Israel 1966). With --stop-at-horizon it stops at r = M.
#[test]
fn extremal_horizon_is_crossed_and_reported() {
    let s = scenario("extremal-charged-dust.toml");
    let mm = s.params.get("m").unwrap();
    let (r0, v0) = (3.0f64, -0.5f64);
    let rep = evolve(&s, r0, Start::Moving(v0), 20.0, None, &EvolveOptions::default()).unwrap();
    let hc = events(&rep, EventKind::HorizonCrossing, Some("plus"));
    assert_eq!(hc.len(), 2, "{:?}", rep.events);
    assert!((hc[0].radius - mm).abs() < 1e-7);
    assert!(hc[0].detail.contains("degenerate") && hc[0].detail.contains("R-region -> R-region"), "{}", hc[0].detail);
    let b0 = (1.0 - mm / r0).powi(2);
    let mu = r0 * ((1.0 + v0 * v0).sqrt() - (v0 * v0 + b0).sqrt());
    let turns = events(&rep, EventKind::TurningPoint, None);
    assert_eq!(turns.len(), 1);
    assert!(rel(turns[0].radius, (mm * mm - mu * mu) / (2.0 * (mm - mu))) < 1e-8, "{}", turns[0].radius);
    assert!(rep.sides[1].horizons.iter().any(|h| h.1 && (h.0 - mm).abs() < 1e-7));
    let o = EvolveOptions { stop_at_horizon: true, ..EvolveOptions::default() };
    let rep = evolve(&s, r0, Start::Moving(v0), 20.0, None, &o).unwrap();
    assert_eq!(rep.stop, "horizon", "{}", rep.stop_detail);
    assert!((rep.radius_range[0] - mm).abs() < 1e-6, "stopped at {}", rep.radius_range[0]);
    assert_eq!(rep.fate, Fate::Collapses);
}

/// Dust (p = 0) in an extremal exterior: the rest mass at rest is M at every radius, so the static condition
/// holds identically outside r = M (p0 = (1/8 pi)(M/r^2 - M/r^2) = 0; common practice). `statics` reports one
/// neutral interval and no roots; evolve from such a radius calls V''(a0) marginal and gives no growth time.
#[test]
fn identically_static_law_is_one_neutral_interval() {
    let s = scenario("extremal-charged-dust.toml");
    let mm = s.params.get("m").unwrap();
    let rep = find_static_radii(&s, 0.01, 100.0, &StaticsOptions::default()).unwrap();
    assert!(rep.static_radii.is_empty(), "{} roots listed", rep.static_radii.len());
    assert_eq!(rep.neutral_intervals.len(), 1);
    let n = rep.neutral_intervals[0];
    // The interval starts where the one horizon rule (junction::admissible, |B| > 1e-9 (1 + r |B'|)) admits a
    // static shell: next to the double horizon B = (1 - M/r)^2 that is r - M ~ M sqrt(1e-9) ~ 3e-5 M.
    assert!(rel(n.from, mm) < 1e-4 && rel(n.to, 100.0) < 1e-6, "{n:?}");
    assert!(junctura::statics::admissible_at(&s.model, s.params.values(), n.from).is_ok());
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_junctura"))
        .args(["statics", root().join("scenarios/extremal-charged-dust.toml").to_str().unwrap()])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(text.matches("is static (neutral)").count(), 1, "{text}");
    assert!(!text.contains("a0 ="), "{text}");
    let ev = evolve(&s, 5.0, Start::Kick(0.01), 10.0, None, &EvolveOptions::default()).unwrap();
    assert_eq!(ev.linear_verdict, Some("marginal"));
    assert!(ev.linear_growth_time.is_none() && ev.linear_period.is_none());
}

/// `derive` at a moving state reports the flux term Xi = (D-2)(X_plus Phi_plus' - X_minus Phi_minus')/(8 pi R)
/// (Garcia, Lobo & Visser 2012). Interior A = 1 + k r^2, B = 1 (Phi_-' = k r/(1 + k r^2), X_- = sqrt(1 + Rdot^2)),
/// Schwarzschild exterior (Phi_+' = 0): Xi = -sqrt(1 + Rdot^2) k/(4 pi (1 + k R^2)) in D = 4 (worked by hand from
/// that formula; common practice).
#[test]
fn derive_reports_the_flux_term_of_a_moving_state() {
    let s = Scenario::parse(
        r#"
name = "A != B interior"
[parameters]
m = 1.0
k = -0.01
[minus]
A = "1 + k*r^2"
B = "1"
keep = "inner"
[plus]
A = "1 - 2*m/r"
keep = "outer"
"#,
        None,
    )
    .unwrap();
    let (r, v, k) = (5.0f64, 0.3f64, -0.01f64);
    let state = junctura::report::derive::State { radius: r, velocity: v, acceleration: 0.02 };
    let rep = junctura::report::derive::derive(&s, state).unwrap();
    let want = -(1.0 + v * v).sqrt() * k / (4.0 * std::f64::consts::PI * (1.0 + k * r * r));
    let xi = rep.flux_term.expect("flux term of a moving state");
    assert!(rel(xi, want) < 1e-12, "{xi} vs {want}");
    let csv = junctura::export::csv::derive(&rep);
    assert!(csv.lines().nth(1).unwrap().ends_with(",flux_term [1/M^2]"), "{csv}");
    assert!(junctura::export::text::derive(&rep).contains("flux term Xi"));
}

/// The command line carries the same run: `--sigma S --direction inward` on the charged-dust scenario lists the
/// four horizon crossings and the bounce in the JSON and as `# event:` lines in the CSV (proper times as in
/// shell_motion_reference.py, case 2).
#[test]
fn evolve_command_lists_the_events_in_json_and_csv() {
    let c = &golden()["charged_dust"];
    let p = root().join("scenarios/charged-dust-bounce.toml");
    let sigma = c["sigma_start"].as_f64().unwrap().to_string();
    let run = |fmt: &str| {
        let out = std::process::Command::new(env!("CARGO_BIN_EXE_junctura"))
            .args(["evolve", p.to_str().unwrap(), "--radius", "5", "--sigma", &sigma, "--direction", "inward"])
            .args(["--duration", "3", "--format", fmt])
            .output()
            .unwrap();
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
        String::from_utf8(out.stdout).unwrap()
    };
    let v: Value = serde_json::from_str(&run("json")).unwrap();
    assert!(v["static_radius"].is_null());
    let crossings: Vec<f64> = v["events"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["kind"] == "horizon_crossing")
        .map(|e| e["tau"].as_f64().unwrap())
        .collect();
    let want = ["tau_outer_inward", "tau_inner_inward", "tau_inner_outward", "tau_outer_outward"].map(|k| g(c, k));
    assert_eq!(crossings.len(), 4);
    for (t, w) in crossings.iter().zip(want) {
        assert!(rel(*t, w) < 1e-8, "{t} vs {w}");
    }
    assert_eq!(v["sides"][1]["horizon_crossings"], 4);
    let csv = run("csv");
    assert_eq!(csv.lines().filter(|l| l.starts_with("# event: horizon_crossing")).count(), 4);
    assert_eq!(csv.lines().filter(|l| l.starts_with("# event: turning_point")).count(), 1);
}
