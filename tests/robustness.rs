//! Numerical edge cases and output safety, through the real binary: poles are never static radii, folds and
//! near-horizon radii are flagged, data files hold no NaN/inf without a status, results do not depend on the
//! number of threads, and an interrupted map leaves no partial file.

use serde_json::Value;
use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn ok(args: &[&str]) -> Vec<u8> {
    let out = bin().args(args).output().unwrap();
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    out.stdout
}

fn json(args: &[&str]) -> Value {
    serde_json::from_slice(&ok(args)).unwrap()
}

/// Schwarzschild thin-shell wormhole with a law p = w sigma + c.
fn wormhole(dir: &Path, name: &str, w: f64, c: f64) -> PathBuf {
    let p = dir.join(format!("{name}.toml"));
    let text = format!(
        "name = \"{name}\"\n[parameters]\nm = 1.0\nw = {w:?}\nc = {c:?}\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[shell]\npressure = \"w*sigma + c\"\n"
    );
    std::fs::write(&p, text).unwrap();
    p
}

/// Static wormhole values sigma0(a), p0(a) for Schwarzschild mass 1 on both sides (Poisson & Visser 1995,
/// Phys. Rev. D 52, 7318, eqs. for sigma0 and p0; the 4D static forms of the physics notes with zeta = +1 twice):
/// sigma0 = -sqrt(B)/(2 pi a), p0 = sqrt(B) (1 + a A'/(2A)) / (4 pi a) = sqrt(B) (a - 1) / (4 pi a (a - 2)).
fn sigma0(a: f64) -> f64 {
    -(1.0 - 2.0 / a).sqrt() / (2.0 * std::f64::consts::PI * a)
}
fn p0(a: f64) -> f64 {
    (1.0 - 2.0 / a).sqrt() * (a - 1.0) / (4.0 * std::f64::consts::PI * a * (a - 2.0))
}

/// Fourth-order central difference (common practice).
fn d(f: fn(f64) -> f64, a: f64) -> f64 {
    let h = 1e-3;
    (f(a - 2.0 * h) - 8.0 * f(a - h) + 8.0 * f(a + h) - f(a + 2.0 * h)) / (12.0 * h)
}

#[test]
fn a_pole_of_the_residual_is_never_a_static_radius() {
    // The Chaplygin gravastar: sigma0 changes sign at a^3 = 6 m / l = 120 (scenario comment, from sigma0 of the
    // physics notes), where p0 - P(sigma0) = p0 + c/sigma0 jumps through infinity: a sign change, not a root.
    let p = root().join("scenarios/gravastar-chaplygin.toml");
    let v = json(&["statics", p.to_str().unwrap(), "--from", "3", "--to", "7", "--format", "json"]);
    let pole = 120f64.cbrt();
    let rejected: Vec<f64> = v["poles_rejected"].as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect();
    assert!(rejected.iter().any(|r| (r - pole).abs() < 1e-6), "{rejected:?} should contain {pole}");
    for s in v["static_radii"].as_array().unwrap() {
        let a = s["radius"].as_f64().unwrap();
        assert!((a - pole).abs() > 1e-3, "pole reported as a static radius: {s}");
        assert!(s["residual"].as_f64().unwrap().abs() < 1e-8, "{s}");
    }
}

#[test]
fn a_double_root_is_flagged_as_ill_conditioned() {
    // Choose the law p = w sigma + c tangent to the static curve (sigma0(a), p0(a)) at a = 4M: then
    // p0(a) - P(sigma0(a)) has a double root there (a fold of the static branch; common practice).
    let a = 4.0;
    let w = d(p0, a) / d(sigma0, a);
    let c = p0(a) - w * sigma0(a);
    let dir = tempfile::tempdir().unwrap();
    let p = wormhole(dir.path(), "fold", w, c);
    let v = json(&["statics", p.to_str().unwrap(), "--from", "2.5", "--to", "8", "--format", "json"]);
    let radii = v["static_radii"].as_array().unwrap();
    let near: Vec<&Value> = radii.iter().filter(|s| (s["radius"].as_f64().unwrap() - a).abs() < 1e-3).collect();
    assert!(!near.is_empty(), "no static radius near the fold: {v}");
    assert!(near.iter().all(|s| s["double_root"] == Value::Bool(true)), "{near:?}");
    // A transversal root of the same family (w = -0.75, c = 0: a0 = M (1 + 4w)/(1 + 2w) = 4M, Poisson &
    // Visser 1995) is not flagged.
    let p = wormhole(dir.path(), "simple", -0.75, 0.0);
    let v = json(&["statics", p.to_str().unwrap(), "--from", "2.5", "--to", "8", "--format", "json"]);
    let s = &v["static_radii"][0];
    assert!((s["radius"].as_f64().unwrap() - 4.0).abs() < 1e-9, "{v}");
    assert_eq!(s["double_root"], Value::Bool(false));
    assert_eq!(s["near_horizon"], Value::Bool(false));
}

#[test]
fn a_static_radius_next_to_the_horizon_is_flagged() {
    // a0 = M (1 + 4w)/(1 + 2w) (Poisson & Visser 1995) equals 2M (1 + delta) for w = -(1 + 2 delta)/(4 delta).
    let delta = 1e-8;
    let w = -(1.0 + 2.0 * delta) / (4.0 * delta);
    let dir = tempfile::tempdir().unwrap();
    let p = wormhole(dir.path(), "edge", w, 0.0);
    let v = json(&["statics", p.to_str().unwrap(), "--from", "1.5", "--to", "3", "--format", "json"]);
    let radii = v["static_radii"].as_array().unwrap();
    let want = 2.0 * (1.0 + delta);
    let s = radii.iter().find(|s| (s["radius"].as_f64().unwrap() - want).abs() < 1e-9).unwrap_or_else(|| panic!("{v}"));
    assert_eq!(s["near_horizon"], Value::Bool(true), "{s}");
}

/// Every data line of a CSV: no field is NaN or infinite, and a row with empty fields says why in `status`.
fn assert_csv_clean(what: &str, text: &str, status: &str) {
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<&str> = lines.next().unwrap_or_else(|| panic!("{what}: no header")).split(',').collect();
    let k = header
        .iter()
        .position(|h| *h == status)
        .unwrap_or_else(|| panic!("{what}: no '{status}' column in {header:?}"));
    let mut rows = 0;
    for line in lines {
        rows += 1;
        let fields: Vec<&str> = line.split(',').collect();
        assert_eq!(fields.len(), header.len(), "{what}: {line}");
        for f in &fields {
            let t = f.trim().trim_matches('"').to_ascii_lowercase();
            assert!(
                !matches!(t.as_str(), "nan" | "-nan" | "inf" | "-inf" | "+inf" | "infinity" | "-infinity"),
                "{what}: non-finite field in {line}"
            );
        }
        if fields.iter().any(|f| f.is_empty()) {
            assert!(!fields[k].trim_matches('"').is_empty(), "{what}: empty fields without a status: {line}");
        }
    }
    assert!(rows > 0, "{what}: no data rows");
}

#[test]
fn data_files_of_runs_with_failing_cells_hold_no_nan_or_inf() {
    let dir = tempfile::tempdir().unwrap();
    let base = wormhole(dir.path(), "wh", -0.75, 0.0);
    let b = base.to_str().unwrap();
    // Map: half the radii lie inside the horizon r = 2M (failing cells).
    let out = dir.path().join("map");
    ok(&["map", b, "--x", "radius:1:3:21", "--y", "beta2:-1:1:5", "--out", out.to_str().unwrap()]);
    let csv = std::fs::read_to_string(out.join("map.csv")).unwrap();
    assert!(csv.contains("inside_horizon"));
    assert_csv_clean("map.csv", &csv, "class");
    // A parameter map where some cells have no static shell at all.
    let out2 = dir.path().join("map2");
    ok(&[
        "map",
        b,
        "--x",
        "w:-2:0.5:9",
        "--y",
        "m:0.5:1.5:3",
        "--from",
        "2.1",
        "--to",
        "10",
        "--out",
        out2.to_str().unwrap(),
    ]);
    let csv = std::fs::read_to_string(out2.join("map.csv")).unwrap();
    assert!(csv.contains("no_static"), "{csv}");
    assert_csv_clean("map.csv (parameter axes)", &csv, "class");
    // Statics with a rejected pole, and a sweep through values without static radii.
    let chap = root().join("scenarios/gravastar-chaplygin.toml");
    let csv = String::from_utf8(ok(&["statics", chap.to_str().unwrap(), "--format", "csv"])).unwrap();
    assert_csv_clean("statics csv", &csv, "stability");
    let csv =
        String::from_utf8(ok(&["sweep", b, "--vary", "w:-2:0.5:26", "--from", "2.1", "--to", "10", "--format", "csv"]))
            .unwrap();
    assert_csv_clean("sweep csv", &csv, "stability");
    // A chain of shell crossings.
    let chain = root().join("scenarios/chains/bounce-chain.toml");
    let csv =
        String::from_utf8(ok(&["chain", chain.to_str().unwrap(), "--crossings", "40", "--format", "csv"])).unwrap();
    assert_csv_clean("chain csv", &csv, "status");
}

fn with_threads(n: &str, args: &[&str]) -> Vec<u8> {
    let out = bin().env("RAYON_NUM_THREADS", n).args(args).output().unwrap();
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    out.stdout
}

#[test]
fn map_results_do_not_depend_on_the_number_of_threads() {
    let dir = tempfile::tempdir().unwrap();
    let wh = wormhole(dir.path(), "wh", -0.75, 0.0);
    let rn = root().join("scenarios/reissner-nordstrom-wormhole.toml");
    let maps: [Vec<&str>; 2] = [
        // Parameter axes: static radii solved per cell, classes and counts reduced across threads.
        vec![wh.to_str().unwrap(), "--x", "w:-2:-0.55:24", "--y", "m:0.5:1.5:20", "--from", "2.1", "--to", "20"],
        // Radius and beta^2 axes, including radii inside the inner and outer horizons.
        vec![rn.to_str().unwrap(), "--x", "radius:0.3:6:60", "--y", "beta2:-2:2:40"],
    ];
    for (i, m) in maps.iter().enumerate() {
        let mut summary = vec!["map"];
        summary.extend(m);
        summary.push("--summary");
        assert_eq!(with_threads("1", &summary), with_threads("2", &summary), "{summary:?}");
        let mut files = Vec::new();
        for n in ["1", "2"] {
            let out = dir.path().join(format!("m{i}-t{n}"));
            let mut args = vec!["map"];
            args.extend(m);
            args.extend(["--out", out.to_str().unwrap()]);
            with_threads(n, &args);
            files.push((std::fs::read(out.join("map.csv")).unwrap(), std::fs::read(out.join("map.json")).unwrap()));
        }
        assert!(files[0].0 == files[1].0, "map.csv differs between 1 and 2 threads: {m:?}");
        assert!(files[0].1 == files[1].1, "map.json differs between 1 and 2 threads: {m:?}");
    }
}

#[cfg(unix)]
#[test]
fn sigterm_during_map_out_leaves_no_partial_file() {
    use std::process::Stdio;
    use std::time::{Duration, Instant};
    let dir = tempfile::tempdir().unwrap();
    let base = wormhole(dir.path(), "wh", -0.75, 0.0);
    let out = dir.path().join("big");
    // Parameter axes: every cell solves for static radii, so this runs for minutes unless stopped.
    let mut child = bin()
        .args([
            "map",
            base.to_str().unwrap(),
            "--x",
            "w:-2:-0.6:3000",
            "--y",
            "m:0.5:1.5:3000",
            "--from",
            "2.1",
            "--to",
            "50",
            "--out",
        ])
        .arg(&out)
        .stdout(Stdio::null())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let has_temp = |d: &Path| {
        std::fs::read_dir(d)
            .map(|it| it.flatten().any(|e| e.file_name().to_string_lossy().contains(".tmp-")))
            .unwrap_or(false)
    };
    let start = Instant::now();
    while !has_temp(&out) {
        assert!(start.elapsed() < Duration::from_secs(60), "no temporary file appeared");
        assert!(child.try_wait().unwrap().is_none(), "the map finished before it could be interrupted");
        std::thread::sleep(Duration::from_millis(20));
    }
    std::thread::sleep(Duration::from_millis(200));
    let pid = child.id().to_string();
    assert!(Command::new("kill").args(["-TERM", &pid]).status().unwrap().success());
    let status = child.wait().unwrap();
    let mut err = String::new();
    std::io::Read::read_to_string(child.stderr.as_mut().unwrap(), &mut err).unwrap();
    assert_eq!(status.code(), Some(143), "exit status {status:?}; stderr: {err}");
    let names: Vec<String> =
        std::fs::read_dir(&out).unwrap().flatten().map(|e| e.file_name().to_string_lossy().to_string()).collect();
    assert!(names.iter().all(|n| !n.contains(".tmp-") && n != "map.csv" && n != "map.json"), "left behind: {names:?}");
    assert!(!err.contains("panicked"), "{err}");
}
