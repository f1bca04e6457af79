//! The real binary over every shipped scenario, and the JSON contracts of the commands.

use serde_json::Value;
use std::path::PathBuf;
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn run_json(args: &[&str]) -> Value {
    let out = bin().args(args).output().unwrap();
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout)
        .unwrap_or_else(|e| panic!("{args:?}: {e}\n{}", String::from_utf8_lossy(&out.stdout)))
}

/// Scenario files shipped in scenarios/ (chain files live in scenarios/chains/ and have their own schema).
fn scenario_files() -> Vec<PathBuf> {
    let mut v: Vec<PathBuf> = std::fs::read_dir(root().join("scenarios"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .collect();
    v.sort();
    v
}

/// A radius where a static shell of the scenario's kind can sit: the middle (geometric) of the first region
/// interval that is of the right kind on both sides.
fn usable_radius(check: &Value, timelike: bool) -> Option<f64> {
    let want = if timelike { "r" } else { "t" };
    let regions = |side: &str| -> Vec<(f64, f64)> {
        check[side]["regions"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|r| r["kind"] == want)
            .map(|r| (r["from"].as_f64().unwrap(), r["to"].as_f64().unwrap()))
            .collect()
    };
    for (a0, a1) in regions("minus") {
        for (b0, b1) in regions("plus") {
            let (lo, hi) = (a0.max(b0), a1.min(b1));
            if hi > lo * 1.01 {
                return Some((lo * hi).sqrt().min(lo * 1.5));
            }
        }
    }
    None
}

#[test]
fn every_shipped_scenario_runs_check_derive_and_statics() {
    let files = scenario_files();
    assert!(files.len() >= 5);
    for f in files {
        let p = f.to_str().unwrap();
        let check = run_json(&["check", p, "--format", "json", "--from", "0.05", "--to", "50"]);
        let timelike = check["shell_kind"] == "timelike";
        let r = usable_radius(&check, timelike).unwrap_or_else(|| panic!("{p}: no usable radius"));
        let d = run_json(&["derive", p, "--radius", &r.to_string(), "--format", "json"]);
        if timelike {
            for key in
                ["radius", "sigma", "pressure", "shell_mass", "beta2_critical", "stable_when", "energy_conditions"]
            {
                assert!(d.get(key).is_some(), "{p}: derive JSON lacks {key}");
            }
            for key in ["null", "weak", "strong", "dominant"] {
                assert!(d["energy_conditions"][key].is_boolean());
            }
            assert!(["beta2_above", "beta2_below", "never", "always"].contains(&d["stable_when"].as_str().unwrap()));
        } else {
            for key in ["radius", "S_ll", "S_thth", "K_ll_jump", "K_thth_jump"] {
                assert!(d.get(key).is_some(), "{p}: derive JSON lacks {key}");
            }
        }
        let text = std::fs::read_to_string(&f).unwrap();
        if text.contains("pressure =") {
            let st = run_json(&["statics", p, "--format", "json"]);
            for sr in st["static_radii"].as_array().unwrap() {
                for key in ["radius", "sigma", "pressure", "potential_second_derivative", "stability"] {
                    assert!(sr.get(key).is_some(), "{p}: statics JSON lacks {key}");
                }
            }
        }
    }
}

/// Textbook Reissner-Nordstrom values (e.g. Chandrasekhar 1983, The Mathematical Theory of Black Holes, sec. 40;
/// from memory): horizons m +- sqrt(m^2 - q^2) = 1 +- 0.6 for m = 1, q = 0.8; circular photon orbit
/// (3m + sqrt(9m^2 - 8q^2))/2.
#[test]
fn check_reports_reissner_nordstrom_horizons_and_photon_orbit() {
    let p = root().join("scenarios/reissner-nordstrom-wormhole.toml");
    let v = run_json(&["check", p.to_str().unwrap(), "--format", "json", "--set", "q=0.8"]);
    let hs: Vec<f64> =
        v["plus"]["horizons"].as_array().unwrap().iter().map(|h| h["radius"].as_f64().unwrap()).collect();
    assert_eq!(hs.len(), 2);
    assert!((hs[0] - 0.4).abs() < 1e-12 && (hs[1] - 1.6).abs() < 1e-12, "{hs:?}");
    let ph = v["plus"]["photon_orbits"][0].as_f64().unwrap();
    assert!((ph - (3.0 + (9.0f64 - 8.0 * 0.64).sqrt()) / 2.0).abs() < 1e-12);
}

#[test]
fn derive_json_for_the_schwarzschild_wormhole_matches_poisson_visser() {
    // Poisson & Visser 1995: sigma0 = -sqrt(1 - 2M/a)/(2 pi a); beta^2_c(a = 4M) = -(1 - 3/4 + 3/16)/(2 (1/2)(1/4)).
    let p = root().join("scenarios/schwarzschild-wormhole-linear.toml");
    let d = run_json(&["derive", p.to_str().unwrap(), "--radius", "4", "--format", "json"]);
    let sigma = d["sigma"].as_f64().unwrap();
    assert!((sigma + (0.5f64).sqrt() / (8.0 * std::f64::consts::PI)).abs() < 1e-15);
    assert!((d["beta2_critical"].as_f64().unwrap() + 1.75).abs() < 1e-12);
    assert_eq!(d["stable_when"], "beta2_below");
    assert_eq!(d["energy_conditions"]["weak"], false);
}

#[test]
fn tune_puts_the_wormhole_at_four_m() {
    // w = -(1 - M/a)/(2(1 - 2M/a)) = -0.75 at a = 4M (from the static values of Poisson & Visser 1995).
    let p = root().join("scenarios/schwarzschild-wormhole-linear.toml");
    let v = run_json(&[
        "tune",
        p.to_str().unwrap(),
        "--solve",
        "w",
        "--radius",
        "4",
        "--set",
        "w=-0.6",
        "--format",
        "json",
    ]);
    let sols = v["solutions"].as_array().unwrap();
    assert_eq!(sols.len(), 1);
    assert!((sols[0]["w"].as_f64().unwrap() + 0.75).abs() < 1e-12);
    assert!(sols[0]["radius"].is_number() && sols[0]["potential_second_derivative"].is_number());
    assert!(sols[0]["stability"].is_string());
}

#[test]
fn sweep_keeps_one_branch_through_the_fold() {
    let p = root().join("scenarios/gravastar-linear.toml");
    let v = run_json(&[
        "sweep",
        p.to_str().unwrap(),
        "--vary",
        "w:0.2:1.2:11",
        "--from",
        "2.01",
        "--to",
        "20",
        "--format",
        "json",
    ]);
    let branches = v["branches"].as_array().unwrap();
    assert_eq!(branches.len(), 1, "{v}");
    let b = &branches[0];
    assert_eq!(b["folds"].as_array().unwrap().len(), 1);
    let kinds: Vec<&str> = b["points"].as_array().unwrap().iter().map(|p| p["stability"].as_str().unwrap()).collect();
    assert!(kinds.contains(&"stable") && kinds.contains(&"unstable"));
}

fn fails_with(args: &[&str], code: i32, needles: &[&str]) {
    let out = bin().args(args).output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(code), "{args:?}: {err}");
    for n in needles {
        assert!(err.contains(n), "{args:?}: '{n}' not in: {err}");
    }
    assert!(!err.contains("panicked") && !err.contains("RUST_BACKTRACE"), "{err}");
}

#[test]
fn radius_on_a_horizon_or_inside_is_refused_with_the_side_named() {
    let p = root().join("scenarios/reissner-nordstrom-wormhole.toml");
    let p = p.to_str().unwrap();
    fails_with(&["derive", p, "--radius", "1.6"], 3, &["horizon", "minus side"]);
    fails_with(&["derive", p, "--radius", "1.0"], 3, &["T-region", "minus side"]);
    fails_with(&["derive", p, "--radius", "3", "--set", "qq=1"], 2, &["unknown parameter 'qq'", "did you mean 'q'"]);
    fails_with(&["check", "/nonexistent/file.toml"], 4, &["/nonexistent/file.toml"]);
}

#[test]
fn broken_pipe_is_quiet() {
    // `junctura ... | head -c 1`: the reader closes early; the program must not panic.
    use std::io::Read;
    use std::process::Stdio;
    let p = root().join("scenarios/gravastar-linear.toml");
    let mut child = bin()
        .args(["derive", p.to_str().unwrap(), "--radius", "3"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut stdout = child.stdout.take().unwrap();
    let mut one = [0u8; 1];
    stdout.read_exact(&mut one).unwrap();
    drop(stdout);
    let out = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(!err.contains("panicked"), "{err}");
}

/// Every shipped scenario with a law runs `evolve` from each of its static radii (small kick, short run), and
/// the JSON summary carries its contract; the starting state satisfies the energy constraint by construction
/// (angular junction condition at rest, Poisson 2004 ch. 3), so the reported drift is small.
#[test]
fn every_shipped_scenario_with_a_law_runs_evolve() {
    let mut ran = 0;
    for f in scenario_files() {
        let p = f.to_str().unwrap();
        if !std::fs::read_to_string(&f).unwrap().contains("pressure =") {
            continue;
        }
        let st = run_json(&["statics", p, "--format", "json"]);
        for sr in st["static_radii"].as_array().unwrap() {
            let a0 = sr["radius"].as_f64().unwrap().to_string();
            let e = run_json(&["evolve", p, "--radius", &a0, "--kick", "1e-4", "--duration", "20", "--format", "json"]);
            for key in [
                "stop",
                "stop_detail",
                "fate",
                "turning_points_count",
                "linear_period",
                "measured_period",
                "period_ratio",
                "max_constraint_drift",
                "static_radius",
            ] {
                assert!(e.get(key).is_some(), "{p}: evolve JSON lacks {key}");
            }
            assert!(["oscillates", "collapses", "expands", "stopped"].contains(&e["fate"].as_str().unwrap()));
            assert!(e["max_constraint_drift"].as_f64().unwrap() < 1e-5, "{p}: {e}");
            assert_eq!(e["static_radius"].as_f64().unwrap().to_string(), a0);
            ran += 1;
        }
    }
    assert!(ran >= 3, "only {ran} evolve runs");
}

#[test]
fn evolve_writes_series_summary_and_figures() {
    let dir = tempfile::tempdir().unwrap();
    let p = root().join("scenarios/gravastar-linear.toml");
    let out = dir.path().join("ev");
    let e = run_json(&[
        "evolve",
        p.to_str().unwrap(),
        "--radius",
        "3.0638",
        "--kick",
        "0.01",
        "--duration",
        "100",
        "--format",
        "json",
        "--out",
        out.to_str().unwrap(),
        "--ensemble",
        "4",
        "--spread",
        "0.02",
    ]);
    for f in [
        "evolve.csv",
        "evolve.json",
        "evolve_radius.svg",
        "evolve_radius.pdf",
        "evolve_radius.png",
        "evolve_phase.svg",
        "evolve_phase.pdf",
        "evolve_phase.png",
    ] {
        assert!(out.join(f).is_file(), "missing {f}");
    }
    let csv = std::fs::read_to_string(out.join("evolve.csv")).unwrap();
    let mut lines = csv.lines();
    assert!(lines.next().unwrap().starts_with("# junctura "));
    assert!(lines.next().unwrap().starts_with("# evolve: "));
    // One comment line per event (turning points, the stop), then the header.
    let mut lines = lines.skip_while(|l| l.starts_with("# event: "));
    assert_eq!(
        lines.next().unwrap(),
        "tau [M],R [M],dR/dtau [1],sigma [1/M],p [1/M],Rdot^2+V [1],n^r_minus [1],n^r_plus [1]"
    );
    let rows: Vec<Vec<f64>> = lines.map(|l| l.split(',').map(|x| x.parse().unwrap()).collect()).collect();
    assert!(rows.len() > 100);
    // Proper time increases along the series.
    assert!(rows.windows(2).all(|w| w[1][0] > w[0][0]));
    // The ensemble: kicks -0.02, -0.00667, 0.00667, 0.02 about a stable radius stay bounded.
    assert_eq!(e["ensemble"]["members_count"], 4);
    assert_eq!(e["ensemble"]["bounded_fraction"].as_f64().unwrap(), 1.0);
    let svg = std::fs::read_to_string(out.join("evolve_phase.svg")).unwrap();
    assert!(svg.contains("R/M") && svg.contains("dR/dτ"));
}

#[test]
fn evolve_refuses_a_radius_that_is_not_static() {
    let p = root().join("scenarios/gravastar-linear.toml");
    let p = p.to_str().unwrap();
    fails_with(
        &["evolve", p, "--radius", "2.7", "--kick", "0.01", "--duration", "10"],
        2,
        &["not a static radius", "junctura statics"],
    );
    fails_with(&["evolve", p, "--radius", "1.5", "--kick", "0.01", "--duration", "10"], 3, &["--radius 1.5"]);
    fails_with(&["evolve", p, "--radius", "3.0638", "--kick", "0.01", "--duration", "-1"], 2, &["--duration"]);
    fails_with(&["evolve", p, "--radius", "3.0638", "--kick", "-2", "--duration", "10"], 3, &["--kick -2"]);
    let rn = root().join("scenarios/reissner-nordstrom-wormhole.toml");
    fails_with(
        &["evolve", rn.to_str().unwrap(), "--radius", "3", "--kick", "0.01", "--duration", "10"],
        2,
        &["no equation of state"],
    );
    let bw = root().join("scenarios/black-to-white-transition.toml");
    fails_with(
        &["evolve", bw.to_str().unwrap(), "--radius", "1", "--kick", "0.01", "--duration", "10"],
        2,
        &["timelike"],
    );
}

#[test]
fn statics_and_derive_print_markdown_tables_and_other_commands_refuse_markdown() {
    let p = root().join("scenarios/gravastar-linear.toml");
    let p = p.to_str().unwrap();
    let run = |args: &[&str]| {
        let out = bin().args(args).output().unwrap();
        assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
        String::from_utf8(out.stdout).unwrap()
    };
    // The same static radii as the JSON, one table row each (header and delimiter rows first).
    let st = run_json(&["statics", p, "--format", "json"]);
    let md = run(&["statics", p, "--format", "markdown"]);
    let rows: Vec<&str> = md.lines().filter(|l| l.starts_with('|')).collect();
    let radii = st["static_radii"].as_array().unwrap();
    assert_eq!(rows.len(), 2 + radii.len(), "{md}");
    for (row, r) in rows[2..].iter().zip(radii) {
        let a0: f64 = row.split('|').nth(2).unwrap().trim().parse().unwrap();
        let want = r["radius"].as_f64().unwrap();
        assert!((a0 - want).abs() <= 1e-5 * want, "{row} vs {want}");
    }
    let md = run(&["derive", p, "--radius", "3.0638", "--format", "markdown"]);
    assert!(md.contains("| quantity | value | unit |") && md.contains("| surface energy density sigma |"), "{md}");
    fails_with(&["sweep", p, "--vary", "w:0.3:1.2:3", "--format", "markdown"], 2, &["markdown"]);
    fails_with(&["statics", p, "--format", "sympy"], 2, &["sympy", "possible values: text, json, csv, markdown"]);
}
