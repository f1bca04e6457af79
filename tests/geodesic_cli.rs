//! Integration tests: the real `junctura` binary on the shipped scenarios for `geodesic` and `chain`.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn run(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_junctura")).current_dir(root()).args(args).output().expect("run junctura")
}

fn json(args: &[&str]) -> serde_json::Value {
    let out = run(args);
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("valid JSON")
}

#[test]
fn geodesic_static_shell_energy_and_keys() {
    // Static shell, flat inside, Schwarzschild outside: E_plus = E_minus sqrt(A_plus(R)/A_minus(R))
    // (physics notes; common practice) = 1.1 sqrt(1 - 2/4).
    let v = json(&["geodesic", "scenarios/star-shell.toml", "--radius", "4", "--energy", "1.1", "--format", "json"]);
    for key in [
        "energy_minus",
        "energy_plus",
        "relative_lorentz_factor",
        "relative_lorentz_factor_check",
        "can_cross",
        "reason",
        "minus",
        "plus",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    let e = v["energy_plus"].as_f64().unwrap();
    assert!((e - 1.1 * 0.5f64.sqrt()).abs() < 1e-13, "{e}");
    // Bounded on the plus side: R_max = 2M/(1 - E^2) (textbook, Schwarzschild radial geodesics).
    let rmax = v["plus"]["max_radius"]["radius"].as_f64().unwrap();
    assert!((rmax - 2.0 / (1.0 - e * e)).abs() < 1e-10, "{rmax}");
    // Static shell: the relative Lorentz factor is the particle's own gamma = E/sqrt(A) in the static frame.
    let g = v["relative_lorentz_factor"].as_f64().unwrap();
    assert!((g - 1.1).abs() < 1e-13 && (v["relative_lorentz_factor_check"].as_f64().unwrap() - g).abs() < 1e-12);
}

#[test]
fn geodesic_same_metric_keeps_energy_and_refusal_is_data() {
    // Same metric on both sides (a wormhole throat): E is unchanged (common practice).
    let v = json(&[
        "geodesic",
        "scenarios/reissner-nordstrom-wormhole.toml",
        "--radius",
        "3",
        "--energy",
        "0.95",
        "--format",
        "json",
    ]);
    assert_eq!(v["can_cross"], true);
    assert!((v["energy_plus"].as_f64().unwrap() - 0.95).abs() < 1e-14);
    let v = json(&["geodesic", "scenarios/star-shell.toml", "--radius", "4", "--energy", "0.5", "--format", "json"]);
    assert_eq!(v["can_cross"], false);
    assert!(v["reason"].as_str().unwrap().contains("turns before"));
    assert!(v["energy_plus"].is_null());
}

#[test]
fn geodesic_bounce_and_bad_input() {
    // Spacelike bounce at R = 1 from mass 1 to mass 0.9: E_plus = E sqrt((1.8 - 1)/(2 - 1)) (kept t-component).
    let v = json(&[
        "geodesic",
        "scenarios/bounce-stage.toml",
        "--radius",
        "1",
        "--energy",
        "0.9",
        "--null",
        "--format",
        "json",
    ]);
    assert!((v["energy_plus"].as_f64().unwrap() - 0.9 * 0.8f64.sqrt()).abs() < 1e-14);
    assert!(v["relative_lorentz_factor"].is_null(), "light has no Lorentz factor");
    let out = run(&["geodesic", "scenarios/bounce-stage.toml", "--radius", "1.9", "--energy", "0.9"]);
    assert_eq!(out.status.code(), Some(2), "R = 1.9 lies in the plus side's R-region: input error");
    assert!(String::from_utf8_lossy(&out.stderr).contains("hint:"));
    let out = run(&["geodesic", "scenarios/star-shell.toml", "--radius", "2", "--energy", "0.9"]);
    assert_eq!(out.status.code(), Some(3), "a shell on a horizon is a numerical error");
}

#[test]
fn chain_demo_reaches_a_planck_length_and_writes_files() {
    let dir = tempfile::tempdir().unwrap();
    let out_dir = dir.path().to_str().unwrap();
    let v =
        json(&["chain", "scenarios/chains/bounce-chain.toml", "--mass", "1Msun", "--format", "json", "--out", out_dir]);
    for key in ["chain", "provenance", "rows", "first_within_areal", "first_within_proper", "threshold_m", "series"] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 300);
    // Exact map for this demo (bounce at R = m, mass ratio 0.9): E_k^2 = 0.81 * 0.8^k and the apex is
    // 2 m_k E_k^2/(1 - E_k^2) above the horizon 2 m_k, m_k = 0.9^k (R_max = 2M/(1 - E^2), textbook).
    // G M_sun/c^2 = 1476.625 m (IAU 2015).
    let k = 100;
    let row = &rows[k - 1];
    let e2 = 0.81 * 0.8f64.powi(k as i32);
    let mk = 0.9f64.powi(k as i32);
    let delta = 2.0 * mk * e2 / (1.0 - e2);
    let got = row["apex"]["areal_distance"].as_f64().unwrap();
    assert!((got / delta - 1.0).abs() < 1e-11, "{got} vs {delta}");
    let got_m = row["areal_distance_m"].as_f64().unwrap();
    assert!((got_m / (delta * 1476.625) - 1.0).abs() < 1e-5);
    // First crossing with the apex within one Planck length (1.616255e-35 m, CODATA 2018) in areal radius.
    let lp = 1.616255e-35 / 1476.625038;
    let first = (1..=300).find(|&k| {
        let e2 = 0.81 * 0.8f64.powi(k);
        2.0 * 0.9f64.powi(k) * e2 / (1.0 - e2) <= lp
    });
    assert_eq!(v["first_within_areal"].as_u64().map(|x| x as usize), first.map(|x| x as usize));
    // Files: CSV with provenance comment then a header with units; JSON parses.
    let csv = std::fs::read_to_string(Path::new(out_dir).join("bounce-chain.csv")).unwrap();
    let mut lines = csv.lines();
    assert!(lines.next().unwrap().starts_with("# junctura"));
    assert!(lines.next().unwrap().contains("areal_distance [m]"));
    assert_eq!(csv.lines().count(), 302);
    let j: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(Path::new(out_dir).join("bounce-chain.json")).unwrap()).unwrap();
    assert_eq!(j["rows"].as_array().unwrap().len(), 300);
    // The figure of the approach to the horizon, in all three formats.
    for ext in ["svg", "pdf", "png"] {
        assert!(Path::new(out_dir).join(format!("bounce-chain_chain_distance.{ext}")).exists(), "{ext}");
    }
}

#[test]
fn chain_bad_mass_unit_is_an_input_error() {
    let out = run(&["chain", "scenarios/chains/bounce-chain.toml", "--mass", "3parsec"]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("unknown mass unit 'parsec'") && err.contains("hint:"), "{err}");
}
