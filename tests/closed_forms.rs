//! Closed forms (`junction::closed`, `closed-form` command) against the numeric path, against published closed
//! forms, and their size and exactness.
//!
//! Agreement: every shipped scenario and a set of further metrics (Schwarzschild, Reissner-Nordstrom, de Sitter
//! core, Schwarzschild-de Sitter, Hayward regular core, A != B redshift, D = 5, D = 6, spacelike surfaces),
//! each closed form evaluated at 20 random admissible points (radius, state and perturbed parameters) and
//! compared with the numeric path (`Junction::static_values`, `stress`, `flux_term`, `v2_coefficients`,
//! `potential_sigma`) to 1e-12 relative.

use junctura::algebra::RatFun;
use junctura::expr::Expr;
use junctura::junction::closed::{closed_forms, ClosedForms, ClosedState};
use junctura::junction::conditions::shell_mass;
use junctura::junction::{Junction, StaticValues};
use junctura::scenario::{Scenario, ShellKind, Which};

const REL: f64 = 1e-12;

/// Further metrics (demo values; the check is the agreement, not the numbers).
const EXTRA: [(&str, &str); 9] = [
    (
        "schwarzschild-standard",
        "[parameters]\nm = 1.0\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n",
    ),
    (
        "rn-asymmetric-wormhole",
        "[parameters]\nm1 = 1.0\nq1 = 0.5\nm2 = 1.5\nq2 = 0.8\n[minus]\nA = \"1 - 2*m1/r + q1^2/r^2\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m2/r + q2^2/r^2\"\nkeep = \"outer\"\n",
    ),
    (
        "de-sitter-core",
        "[parameters]\nm = 1.0\nlam = 0.05\n[minus]\nA = \"1 - lam*r^2/3\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[symbols]\nlam = '\\Lambda'\n",
    ),
    (
        "schwarzschild-de-sitter-wormhole",
        "[parameters]\nm = 1.0\nlam = 0.01\n[minus]\nA = \"1 - 2*m/r - lam*r^2/3\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r - lam*r^2/3\"\nkeep = \"outer\"\n",
    ),
    (
        "hayward-core",
        "[parameters]\nm = 1.0\nl = 0.3\n[minus]\nA = \"1 - 2*m*r^2/(r^3 + 2*m*l^2)\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n",
    ),
    (
        "redshift-standard",
        "[parameters]\nm = 1.0\nb = 0.3\nq = 0.4\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"(1 - 2*m/r)*exp(-2*b/r)\"\nB = \"1 - 2*m/r + q^2/r^2\"\nkeep = \"outer\"\n",
    ),
    (
        "tangherlini-wormhole-5d",
        "dimension = 5\n[parameters]\nmu = 1.0\n[minus]\nA = \"1 - mu/r^2\"\nkeep = \"outer\"\n[plus]\nA = \"1 - mu/r^2\"\nkeep = \"outer\"\n",
    ),
    (
        "tangherlini-standard-6d",
        "dimension = 6\n[parameters]\nmu = 1.0\nb = 0.2\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"(1 - mu/r^3)*exp(-b/r)\"\nB = \"1 - mu/r^3\"\nkeep = \"outer\"\n",
    ),
    (
        "spacelike-redshift",
        "[parameters]\nm1 = 1.0\nq1 = 0.3\nb1 = 0.2\nm2 = 1.5\n[minus]\nA = \"(1 - 2*m1/r)*exp(-2*b1/r)\"\nB = \"1 - 2*m1/r + q1^2/r^2\"\nkeep = \"black-hole\"\n[plus]\nA = \"1 - 2*m2/r\"\nkeep = \"white-hole\"\n[shell]\nkind = \"spacelike\"\n",
    ),
];

fn scenarios() -> Vec<(String, Scenario)> {
    let mut out = Vec::new();
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios");
    let mut files: Vec<_> = std::fs::read_dir(dir).unwrap().flatten().map(|e| e.path()).collect();
    files.sort();
    for p in files {
        if p.extension().is_some_and(|e| e == "toml") {
            out.push((p.display().to_string(), Scenario::load(&p).unwrap()));
        }
    }
    for (name, body) in EXTRA {
        let text = format!("name = \"{name}\"\n{body}");
        out.push((name.to_string(), Scenario::parse(&text, None).unwrap_or_else(|e| panic!("{name}: {e}"))));
    }
    out
}

/// xorshift64*: deterministic pseudo-random numbers in [0, 1).
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        (self.0.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn close(id: &str, what: &str, got: f64, want: f64, scale: f64) {
    let tol = REL * want.abs().max(scale);
    assert!((got - want).abs() <= tol, "{id}: {what}: closed form {got:e} vs numeric {want:e} (tol {tol:e})");
}

/// (D-2)/(8 pi) times the sum of |K| over both sides: the size of the terms of the Lanczos jumps.
fn kscale(st: &junctura::junction::Stress<f64>, dimension: u32) -> f64 {
    let k: f64 = st.k_ss.iter().chain(st.k_thth.iter()).map(|x| x.abs()).sum();
    k * f64::from(dimension - 2) / (8.0 * std::f64::consts::PI)
}

fn value(cf: &ClosedForms, id: &str, vals: &[twofloat::TwoFloat]) -> f64 {
    cf.alg.eval(&cf.get(id).unwrap_or_else(|| panic!("quantity {id}")).value, vals)
}

/// Perturb every non-zero parameter by up to +-20%.
fn perturbed(s: &Scenario, rng: &mut Rng) -> Scenario {
    let mut t = s.clone();
    for (k, name) in s.params.names().iter().enumerate() {
        let v = s.params.values()[k];
        t.params.set(name, v * (0.8 + 0.4 * rng.next())).unwrap();
    }
    t
}

/// A radius where a static shell of the scenario's kind can sit (both sides in their regions), if one is
/// found by sampling.
fn admissible_radius(s: &Scenario, rng: &mut Rng) -> Option<f64> {
    let j = Junction::new(s);
    let l = junctura::metric::length_scale(s);
    for _ in 0..400 {
        let a = l * (0.05 + 12.0 * rng.next());
        if j.static_values(a).is_ok() {
            return Some(a);
        }
    }
    None
}

#[test]
fn closed_forms_agree_with_the_numeric_path() {
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let mut checked = 0;
    let mut stability_points = 0;
    for (id, s0) in scenarios() {
        let cf = closed_forms(&s0, ClosedState::Static).unwrap_or_else(|e| panic!("{id}: {e}"));
        let cm = closed_forms(&s0, ClosedState::Moving).unwrap_or_else(|e| panic!("{id}: {e}"));
        let mut points = 0;
        let mut tries = 0;
        while points < 20 {
            tries += 1;
            assert!(tries < 200, "{id}: no admissible points");
            let s = perturbed(&s0, &mut rng);
            let Some(a) = admissible_radius(&s, &mut rng) else { continue };
            let j = Junction::new(&s);
            let sv = j.static_values(a).unwrap();
            let ps = s.params.values();
            let sigma_any = 0.01 + 0.1 * rng.next();
            // c0, c1 stand for themselves only in beta2_crit = -c0/c1 (set below).
            let vals = cf.alg.atom_values(a, ps, &[("sigma", sigma_any), ("c0", 1.0), ("c1", 1.0)]).unwrap();
            match s.shell.kind {
                ShellKind::Timelike => {
                    let (sg, p) = (sv.stress.sigma(), sv.stress.pressure());
                    // Relative to the size of the terms whose jump makes sigma and p (a jump between nearly
                    // equal sides loses relative precision in the numeric path itself).
                    let scale = kscale(&sv.stress, s.dimension);
                    close(&id, "sigma0", value(&cf, "sigma0", &vals), sg, scale);
                    close(&id, "p0", value(&cf, "p0", &vals), p, scale);
                    close(&id, "sigma0 + p0", value(&cf, "sigma0_plus_p0", &vals), sg + p, scale);
                    let nd = f64::from(s.dimension - 2);
                    let key = if s.dimension == 4 {
                        "sigma0_plus_2p0".to_string()
                    } else {
                        format!("sigma0_plus_{}p0", s.dimension - 2)
                    };
                    close(&id, "sigma0 + (D-2) p0", value(&cf, &key, &vals), sg + nd * p, scale);
                    close(&id, "sigma0 - p0", value(&cf, "sigma0_minus_p0", &vals), sg - p, scale);
                    close(
                        &id,
                        "shell mass",
                        value(&cf, "shell_mass", &vals),
                        shell_mass(a, sg, s.dimension),
                        shell_mass(a, scale, s.dimension),
                    );
                    let xi = j.flux_term(&sv);
                    close(&id, "flux", value(&cf, "flux", &vals), xi, scale);
                    close(&id, "V", value(&cf, "potential", &vals), j.potential_sigma(a, sigma_any), 1e-3);
                    // V'' divides by the shell's mass; where sigma is a jump between nearly equal sides
                    // (|sigma| far below the size of its terms) the numeric sigma keeps only a few digits and
                    // its V'' cannot serve as the reference at 1e-12: such points check sigma, p and V only.
                    if sg.abs() >= 1e-4 * scale {
                        let (c0, c1) = j.v2_coefficients(&sv);
                        let cs = c0.abs().max(c1.abs());
                        // The numeric V'' comes from a dual-number Taylor expansion along the motion whose terms
                        // exceed |V''| severalfold: relative to 10 max(|c0|, |c1|) (V'' for 0 <= beta^2 <= 10).
                        close(&id, "c0", value(&cf, "c0", &vals), c0, 10.0 * cs);
                        close(&id, "c1", value(&cf, "c1", &vals), c1, 10.0 * cs);
                        if c1.abs() > 1e-6 * cs {
                            let (k0, k1) = (value(&cf, "c0", &vals), value(&cf, "c1", &vals));
                            let vb =
                                cf.alg.atom_values(a, ps, &[("sigma", sigma_any), ("c0", k0), ("c1", k1)]).unwrap();
                            let crit = cf.alg.eval(&cf.get("beta2_crit").unwrap().value, &vb);
                            close(&id, "beta2_crit", crit, -c0 / c1, 10.0 * cs / c1.abs());
                        }
                        stability_points += 1;
                    }
                    // Moving state.
                    let (rdot, rddot) = (rng.next() - 0.5, rng.next() - 0.5);
                    let st = j.stress(a, rdot, rddot).unwrap();
                    let mv =
                        cm.alg.atom_values(a, ps, &[("Rdot", rdot), ("Rddot", rddot), ("sigma", sigma_any)]).unwrap();
                    let sc = kscale(&st, s.dimension);
                    close(&id, "moving sigma", value(&cm, "sigma", &mv), st.sigma(), sc);
                    close(&id, "moving p", value(&cm, "p", &mv), st.pressure(), sc);
                    let msv = StaticValues { a, stress: st, jets: [j.jet(Which::Minus, a), j.jet(Which::Plus, a)] };
                    close(&id, "moving flux", value(&cm, "flux", &mv), j.flux_term(&msv), sc);
                }
                ShellKind::Spacelike => {
                    let sc = kscale(&sv.stress, s.dimension);
                    close(&id, "S_ll", value(&cf, "S_ll", &vals), sv.stress.s_ss, sc);
                    close(&id, "S_thth", value(&cf, "S_thth", &vals), sv.stress.s_thth, sc);
                    let (rp, rpp) = (rng.next() - 0.5, rng.next() - 0.5);
                    let st = j.stress(a, rp, rpp).unwrap();
                    let mv = cm.alg.atom_values(a, ps, &[("Rp", rp), ("Rpp", rpp)]).unwrap();
                    let sc = kscale(&st, s.dimension);
                    close(&id, "moving S_ll", value(&cm, "S_ll", &mv), st.s_ss, sc);
                    close(&id, "moving S_thth", value(&cm, "S_thth", &mv), st.s_thth, sc);
                }
            }
            points += 1;
            checked += 1;
        }
    }
    assert!(checked >= 20 * 16, "{checked} points");
    // Most points are well conditioned: the V'' coefficients were checked at nearly all of them.
    assert!(stability_points >= 15 * 16, "{stability_points} points with c0, c1 checked");
}

/// A published formula (junctura syntax, variable `a`) as a rational function in the context of `cf`.
fn published(cf: &mut ClosedForms, text: &str) -> RatFun {
    let e = Expr::parse(text, "a", &cf.alg.param_names).unwrap();
    cf.alg.from_node(e.node()).unwrap()
}

fn assert_same(cf: &mut ClosedForms, id: &str, text: &str) {
    let want = published(cf, text);
    let got = cf.get(id).unwrap().value.clone();
    let diff = cf.alg.sub(&got, &want);
    assert!(diff.is_zero(), "{id}: closed form differs from the published {text}");
}

fn printed(cf: &ClosedForms, s: &Scenario, id: &str) -> junctura::export::closed::Rendered {
    junctura::export::closed::render_all(cf, &s.symbols).into_iter().find(|r| r.id == id).unwrap()
}

fn load(name: &str) -> Scenario {
    Scenario::load(std::path::Path::new(&format!("{}/scenarios/{name}", env!("CARGO_MANIFEST_DIR")))).unwrap()
}

/// Operators of a formula typed in junctura's syntax (binary operators, unary minus, function calls).
fn ops_of(text: &str, params: &[String]) -> usize {
    fn count(n: &junctura::expr::Node) -> usize {
        use junctura::expr::Node;
        match n {
            Node::Num(_) | Node::Pi | Node::Var | Node::Param(_) => 0,
            Node::Neg(x) | Node::Call(_, x) => 1 + count(x),
            Node::Bin(_, l, r) => 1 + count(l) + count(r),
        }
    }
    count(Expr::parse(text, "a", params).unwrap().node())
}

/// Poisson & Visser 1995 (Phys. Rev. D 52, 7318), Schwarzschild thin-shell wormhole:
/// sigma0 = -sqrt(1 - 2M/a)/(2 pi a), p0 = (1 - M/a)/(4 pi a sqrt(1 - 2M/a)),
/// beta^2_crit = -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a)(1 - 3M/a)).
#[test]
fn schwarzschild_wormhole_matches_poisson_visser_exactly() {
    let s = load("schwarzschild-wormhole-linear.toml");
    let mut cf = closed_forms(&s, ClosedState::Static).unwrap();
    let pv_sigma = "-sqrt(1 - 2*m/a)/(2*pi*a)";
    let pv_crit = "-(1 - 3*m/a + 3*m^2/a^2)/(2*(1 - 2*m/a)*(1 - 3*m/a))";
    assert_same(&mut cf, "sigma0", pv_sigma);
    assert_same(&mut cf, "p0", "(1 - m/a)/(4*pi*a*sqrt(1 - 2*m/a))");
    assert_same(&mut cf, "beta2_crit", pv_crit);
    // Printed exactly as published.
    assert_eq!(printed(&cf, &s, "sigma0").text, pv_sigma);
    // Size: no more operators than the published form.
    let ours = printed(&cf, &s, "beta2_crit");
    assert!(ours.operators <= ops_of(pv_crit, &cf.alg.param_names), "{} has {} operators", ours.text, ours.operators);
}

/// Eiroa & Romero 2004 (Gen. Rel. Grav. 36, 651), charged thin-shell wormhole (from memory):
/// sigma0 = -sqrt(1 - 2M/a + Q^2/a^2)/(2 pi a), p0 = (1 - M/a)/(4 pi a sqrt(1 - 2M/a + Q^2/a^2)), stability
/// boundary beta^2 = -a (a^3 - 3M a^2 + 3M^2 a - M Q^2) / (2 (a^2 - 2M a + Q^2)(a^2 - 3M a + 2 Q^2)).
#[test]
fn charged_wormhole_matches_eiroa_romero_exactly() {
    let s = load("reissner-nordstrom-wormhole.toml");
    let mut cf = closed_forms(&s, ClosedState::Static).unwrap();
    let er_sigma = "-sqrt(1 - 2*m/a + q^2/a^2)/(2*pi*a)";
    let er_crit = "-a*(a^3 - 3*m*a^2 + 3*m^2*a - m*q^2)/(2*(a^2 - 2*m*a + q^2)*(a^2 - 3*m*a + 2*q^2))";
    assert_same(&mut cf, "sigma0", er_sigma);
    assert_same(&mut cf, "p0", "(1 - m/a)/(4*pi*a*sqrt(1 - 2*m/a + q^2/a^2))");
    assert_same(&mut cf, "beta2_crit", er_crit);
    assert_eq!(printed(&cf, &s, "sigma0").text, er_sigma);
    let ours = printed(&cf, &s, "beta2_crit");
    assert!(ours.operators <= ops_of(er_crit, &cf.alg.param_names), "{} has {} operators", ours.text, ours.operators);
}

/// Visser & Wiltshire 2004 (Class. Quantum Grav. 21, 1135), thin-shell gravastar, de Sitter interior
/// 1 - l a^2/3 (their k a^2 with k = 8 pi rho/3 = Lambda/3) and Schwarzschild exterior:
/// sigma0 = -(1/(4 pi a)) (sqrt(1 - 2M/a) - sqrt(1 - l a^2/3)).
#[test]
fn gravastar_matches_visser_wiltshire_exactly() {
    let s = load("gravastar-linear.toml");
    let mut cf = closed_forms(&s, ClosedState::Static).unwrap();
    assert_same(&mut cf, "sigma0", "-(sqrt(1 - 2*m/a) - sqrt(1 - l*a^2/3))/(4*pi*a)");
    assert_eq!(printed(&cf, &s, "sigma0").text, "-(sqrt(1 - 2*m/a) - sqrt(1 - l*a^2/3))/(4*pi*a)");
}

/// Exactness: decimal literals typed by the user come out as exact rationals, and no printed closed form of
/// any scenario contains a decimal point (common practice: exact coefficients).
#[test]
fn no_floats_in_closed_forms() {
    let text = "name = \"decimals\"\n[parameters]\nm = 1.0\n[minus]\nA = \"1 - 0.5*m/r - 0.05*r^2\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n";
    let s = Scenario::parse(text, None).unwrap();
    let cf = closed_forms(&s, ClosedState::Static).unwrap();
    let r = printed(&cf, &s, "sigma0");
    assert!(r.text.contains("m/(2*a)") && r.text.contains("a^2/20"), "{}", r.text);
    let mut all = scenarios();
    all.push(("decimals".into(), s));
    for (id, s) in all {
        for state in [ClosedState::Static, ClosedState::Moving] {
            let cf = closed_forms(&s, state).unwrap();
            for r in junctura::export::closed::render_all(&cf, &s.symbols) {
                for (form, t) in [("text", &r.text), ("sympy", &r.sympy), ("latex", &r.latex)] {
                    assert!(!t.contains('.'), "{id} {}: {form} has a decimal point: {t}", r.id);
                }
                for bad in ["+1[", "-2/(8", "+ -", "- -", "*1*", "*1)", "^1*", "^1)"] {
                    assert!(!r.text.contains(bad), "{id} {}: artefact {bad:?} in {}", r.id, r.text);
                }
            }
        }
    }
}

/// Determinism: the same scenario gives the same output, byte for byte.
#[test]
fn closed_forms_are_deterministic() {
    let s = load("gravastar-chaplygin.toml");
    let a = junctura::export::text::closed(&closed_forms(&s, ClosedState::Static).unwrap(), &s.symbols, "p");
    let b = junctura::export::text::closed(&closed_forms(&s, ClosedState::Static).unwrap(), &s.symbols, "p");
    assert_eq!(a, b);
}

/// The command: every format runs on a shipped scenario, a bad width is refused with exit code 2 and a hint.
#[test]
fn closed_form_command_formats_and_errors() {
    let run = |args: &[&str]| std::process::Command::new(env!("CARGO_BIN_EXE_junctura")).args(args).output().unwrap();
    let f = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios/schwarzschild-wormhole-linear.toml");
    let text = String::from_utf8(run(&["closed-form", f]).stdout).unwrap();
    assert!(text.contains("sigma0(a) = -sqrt(1 - 2*m/a)/(2*pi*a)"), "{text}");
    let py = String::from_utf8(run(&["closed-form", f, "--format", "sympy"]).stdout).unwrap();
    assert!(
        py.contains("a = symbols('a', positive=True)") && py.contains("sigma0 = -sqrt(1 - 2*m/a)/(2*pi*a)"),
        "{py}"
    );
    let js: serde_json::Value =
        serde_json::from_slice(&run(&["closed-form", f, "--format", "json", "--state", "moving"]).stdout).unwrap();
    assert_eq!(js["state"], "moving");
    assert!(js["quantities"].as_array().unwrap().iter().any(|q| q["id"] == "sigma"));
    let bad = run(&["closed-form", f, "--width", "wide"]);
    assert_eq!(bad.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&bad.stderr).contains("--width wide"));
}
