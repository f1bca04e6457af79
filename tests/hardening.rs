//! Regression tests for defects found by an adversarial run (planted links, injected text, tampered map parts,
//! overflowing spans, unbounded reads, extreme scales, nondeterministic PDF, late validation). Each test is
//! named after what broke.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn wormhole() -> String {
    root().join("scenarios/schwarzschild-wormhole-linear.toml").display().to_string()
}

fn run(args: &[&str]) -> Output {
    bin().args(args).output().unwrap()
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

fn small_map(dir: &Path) -> Output {
    run(&["map", &wormhole(), "--x", "m:0.5:2:4", "--y", "w:-0.9:-0.6:4", "--out", &dir.display().to_string()])
}

fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> =
        std::fs::read_dir(dir).unwrap().map(|e| e.unwrap().file_name().to_string_lossy().into_owned()).collect();
    v.sort();
    v
}

#[cfg(unix)]
#[test]
fn planted_symlink_at_output_name_does_not_overwrite_victim() {
    let t = tempfile::tempdir().unwrap();
    let victim = t.path().join("victim.txt");
    std::fs::write(&victim, "precious").unwrap();
    let out = t.path().join("out");
    std::fs::create_dir(&out).unwrap();
    std::os::unix::fs::symlink(&victim, out.join("map.csv")).unwrap();
    let o = small_map(&out);
    assert_eq!(o.status.code(), Some(4), "{}", stderr(&o));
    assert!(stderr(&o).contains("symbolic link"), "{}", stderr(&o));
    assert_eq!(std::fs::read_to_string(&victim).unwrap(), "precious");
}

#[cfg(unix)]
#[test]
fn planted_symlinks_at_old_temp_names_do_not_overwrite_victim() {
    // The temporary name used to be `.NAME.tmp-PID`, predictable from the next process ids.
    let t = tempfile::tempdir().unwrap();
    let victim = t.path().join("victim.txt");
    std::fs::write(&victim, "precious").unwrap();
    let out = t.path().join("out");
    std::fs::create_dir(&out).unwrap();
    let me = std::process::id();
    for pid in me..me + 400 {
        for n in ["map.csv", "map.json", "map.svg", "map.pdf", "map.png"] {
            std::os::unix::fs::symlink(&victim, out.join(format!(".{n}.tmp-{pid}"))).unwrap();
        }
    }
    let o = small_map(&out);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(std::fs::read_to_string(&victim).unwrap(), "precious");
    assert!(std::fs::read_to_string(out.join("map.csv")).unwrap().starts_with("# junctura"));
}

#[cfg(unix)]
#[test]
fn planted_hardlink_at_output_name_leaves_victim_untouched() {
    let t = tempfile::tempdir().unwrap();
    let victim = t.path().join("victim.txt");
    std::fs::write(&victim, "precious").unwrap();
    let out = t.path().join("out");
    std::fs::create_dir(&out).unwrap();
    std::fs::hard_link(&victim, out.join("map.csv")).unwrap();
    let o = small_map(&out);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(std::fs::read_to_string(&victim).unwrap(), "precious");
    assert!(std::fs::read_to_string(out.join("map.csv")).unwrap().starts_with("# junctura"));
}

#[cfg(unix)]
#[test]
fn stale_temp_files_of_killed_runs_are_cleaned_up() {
    let t = tempfile::tempdir().unwrap();
    let mut child = Command::new("true").spawn().unwrap();
    let dead = child.id();
    child.wait().unwrap();
    std::fs::write(t.path().join(format!(".map.csv.tmp-{dead}")), "half").unwrap();
    std::fs::write(t.path().join(format!(".map.png.tmp-{dead}-0123abcd")), "half").unwrap();
    std::fs::write(t.path().join("keep.tmp-1"), "user file").unwrap();
    let o = small_map(t.path());
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(names(t.path()), ["keep.tmp-1", "map.csv", "map.json", "map.pdf", "map.png", "map.svg"]);
}

/// The wormhole scenario with its name replaced by `name` (TOML basic-string escapes allowed).
fn named_scenario(dir: &Path, name: &str) -> String {
    let text = std::fs::read_to_string(wormhole()).unwrap();
    let first = text.lines().find(|l| l.starts_with("name = ")).unwrap().to_string();
    let p = dir.join("named.toml");
    std::fs::write(&p, text.replacen(&first, &format!("name = \"{name}\""), 1)).unwrap();
    p.display().to_string()
}

#[test]
fn newline_in_scenario_name_is_refused_with_its_location() {
    let t = tempfile::tempdir().unwrap();
    let s = named_scenario(t.path(), "evil\\n0,0,1,2,3\\n\\\\input{/etc/passwd}");
    let line = std::fs::read_to_string(&s).unwrap().lines().position(|l| l.starts_with("name = ")).unwrap() + 1;
    let o = run(&["derive", &s, "--radius", "4", "--format", "csv"]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    let e = stderr(&o);
    assert!(e.contains(&format!("{s}:{line}:8")) && e.contains("control character \\n"), "{e}");
    assert!(o.stdout.is_empty());
}

#[test]
fn escape_sequence_in_scenario_name_never_reaches_the_terminal() {
    let t = tempfile::tempdir().unwrap();
    let s = named_scenario(t.path(), "x\\u001b]0;owned\\u0007");
    let o = run(&["check", &s]);
    assert_eq!(o.status.code(), Some(2));
    assert!(!o.stderr.contains(&0x1b) && !o.stderr.contains(&0x07), "{}", stderr(&o));
}

#[test]
fn tex_command_in_symbol_is_refused() {
    let t = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(wormhole()).unwrap();
    let p = t.path().join("sym.toml");
    std::fs::write(&p, format!("{text}\n[symbols]\nw = '\\omega$ \\input{{/etc/passwd}} $'\n")).unwrap();
    let o = run(&["derive", &p.display().to_string(), "--radius", "4", "--format", "latex"]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("[symbols] w contains '$'"), "{}", stderr(&o));
}

#[cfg(unix)]
#[test]
fn newline_in_scenario_file_name_stays_inside_comment_lines() {
    let t = tempfile::tempdir().unwrap();
    let p = t.path().join("a\n0,9,9\nb.toml");
    std::fs::copy(wormhole(), &p).unwrap();
    for format in ["csv", "latex"] {
        let o = run(&["derive", &p.display().to_string(), "--radius", "4", "--format", format]);
        assert!(o.status.success(), "{}", stderr(&o));
        let out = String::from_utf8(o.stdout).unwrap();
        let marker = if format == "csv" { "#" } else { "%" };
        let first = out.lines().next().unwrap();
        assert!(first.starts_with(marker) && first.contains("a\\n0,9,9\\nb.toml"), "{first}");
        assert!(!out.lines().any(|l| l.starts_with("0,9,9")), "{out}");
    }
}

#[test]
fn control_character_in_figure_label_is_refused() {
    let t = tempfile::tempdir().unwrap();
    let o = run(&[
        "map",
        &wormhole(),
        "--x",
        "m:0.5:2:3",
        "--y",
        "w:-0.9:-0.6:3",
        "--xlabel",
        "a\u{1b}[31m",
        "--out",
        &t.path().display().to_string(),
    ]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("--xlabel"));
    assert!(names(t.path()).is_empty());
}

/// Two map parts of a 4 x 4 map (equal sizes) in `dir`; returns the part JSON paths.
fn two_parts(dir: &Path) -> [PathBuf; 2] {
    for k in ["1/2", "2/2"] {
        let o = run(&[
            "map",
            &wormhole(),
            "--x",
            "m:0.5:2:4",
            "--y",
            "w:-0.9:-0.6:4",
            "--shard",
            k,
            "--out",
            &dir.display().to_string(),
        ]);
        assert!(o.status.success(), "{}", stderr(&o));
    }
    [dir.join("map.part-1-of-2.json"), dir.join("map.part-2-of-2.json")]
}

fn merge(parts: &[PathBuf; 2], out: &Path) -> Output {
    run(&[
        "merge",
        &parts[0].display().to_string(),
        &parts[1].display().to_string(),
        "--out",
        &out.display().to_string(),
    ])
}

/// Rewrite the data-row count and hash in a part JSON to match its (edited) CSV, as a forger would.
fn reseal(json: &Path) {
    use sha2::Digest;
    let csv = std::fs::read_to_string(json.with_extension("csv")).unwrap();
    let mut m: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(json).unwrap()).unwrap();
    let body = csv.strip_prefix(m["csv_header"].as_str().unwrap()).unwrap().to_string();
    m["data_rows"] = body.matches('\n').count().into();
    m["data_sha256"] = format!("{:x}", sha2::Sha256::digest(body.as_bytes())).into();
    std::fs::write(json, serde_json::to_string_pretty(&m).unwrap()).unwrap();
}

fn edit_csv(json: &Path, f: impl FnOnce(Vec<String>) -> Vec<String>) {
    let p = json.with_extension("csv");
    let lines: Vec<String> = std::fs::read_to_string(&p).unwrap().lines().map(String::from).collect();
    std::fs::write(&p, f(lines).join("\n") + "\n").unwrap();
}

fn assert_merge_refused(parts: &[PathBuf; 2], out: &Path, needle: &str) {
    let o = merge(parts, out);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains(needle), "{}", stderr(&o));
    assert!(!out.join("map.csv").exists() && !out.join("map.json").exists());
}

#[test]
fn merge_refuses_part_truncated_at_a_row_boundary() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(t.path());
    edit_csv(&parts[1], |mut l| {
        l.pop();
        l
    });
    assert_merge_refused(&parts, &t.path().join("m"), "data rows");
    // Even with the count and hash rewritten, the missing cell is found.
    reseal(&parts[1]);
    assert_merge_refused(&parts, &t.path().join("m"), "hold 8 cells");
}

#[test]
fn merge_refuses_part_with_extra_rows() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(t.path());
    edit_csv(&parts[0], |mut l| {
        let last = l.last().unwrap().clone();
        l.push(last);
        l
    });
    assert_merge_refused(&parts, &t.path().join("m"), "data rows");
    reseal(&parts[0]);
    assert_merge_refused(&parts, &t.path().join("m"), "hold 8 cells");
}

#[test]
fn merge_refuses_nan_in_a_part() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(t.path());
    edit_csv(&parts[0], |mut l| {
        let n = l.len() - 1;
        let mut f: Vec<String> = l[n].split(',').map(String::from).collect();
        f[5] = "NaN".into();
        l[n] = f.join(",");
        l
    });
    assert_merge_refused(&parts, &t.path().join("m"), "SHA-256");
    reseal(&parts[0]);
    assert_merge_refused(&parts, &t.path().join("m"), "not a map data row");
}

#[test]
fn merge_refuses_swapped_part_files() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(t.path());
    let (a, b) = (parts[0].with_extension("csv"), parts[1].with_extension("csv"));
    let tmp = t.path().join("swap");
    std::fs::rename(&a, &tmp).unwrap();
    std::fs::rename(&b, &a).unwrap();
    std::fs::rename(&tmp, &b).unwrap();
    assert_merge_refused(&parts, &t.path().join("m"), "SHA-256");
    reseal(&parts[0]);
    reseal(&parts[1]);
    assert_merge_refused(&parts, &t.path().join("m"), "expected (0, 0)");
}

/// Axes edited in both part files (with the line count to match) to more cells than any map writes: refused
/// before the row count is multiplied out (it overflowed and panicked).
#[test]
fn merge_refuses_part_axes_too_large_to_write() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(t.path());
    for (axis, lines) in [("x", 4u64), ("y", 1 << 63)] {
        for p in &parts {
            let mut m: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(p).unwrap()).unwrap();
            m["spec"]["x"]["n"] = 4.into();
            m["spec"]["y"]["n"] = 4.into();
            m["spec"][axis]["n"] = (1u64 << 63).into();
            m["lines"] = lines.into();
            std::fs::write(p, serde_json::to_string_pretty(&m).unwrap()).unwrap();
        }
        assert_merge_refused(&parts, &t.path().join("m"), "more than a map writes to files");
    }
}

#[test]
fn merge_of_untouched_parts_still_matches_the_whole_map() {
    let t = tempfile::tempdir().unwrap();
    let parts = two_parts(&t.path().join("parts"));
    let o = merge(&parts, &t.path().join("m"));
    assert!(o.status.success(), "{}", stderr(&o));
    let w = small_map(&t.path().join("whole"));
    assert!(w.status.success());
    for f in ["map.csv", "map.json"] {
        assert_eq!(
            std::fs::read(t.path().join("m").join(f)).unwrap(),
            std::fs::read(t.path().join("whole").join(f)).unwrap(),
            "{f}"
        );
    }
}

#[test]
fn overflowing_axis_span_is_refused_before_any_cell() {
    let rn = root().join("scenarios/reissner-nordstrom-wormhole.toml").display().to_string();
    let t = tempfile::tempdir().unwrap();
    let o = run(&[
        "map",
        &rn,
        "--x",
        "radius:1.7:6:3",
        "--y",
        "q:-1.7e308:1.7e308:3",
        "--beta2",
        "-1",
        "--out",
        &t.path().display().to_string(),
    ]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("--y q:-1.7e308:1.7e308:3"), "{}", stderr(&o));
    assert!(names(t.path()).is_empty());
}

#[test]
fn huge_evolve_velocity_is_refused_not_written_as_nan() {
    let o = run(&["evolve", &wormhole(), "--radius", "4", "--duration", "1", "--velocity", "1e200", "--format", "csv"]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("--velocity 1e200"), "{}", stderr(&o));
    assert!(o.stdout.is_empty());
}

#[test]
fn huge_geodesic_energy_is_refused_not_written_as_nan() {
    let star = root().join("scenarios/star-shell.toml").display().to_string();
    for format in ["csv", "json", "text"] {
        let o = run(&["geodesic", &star, "--radius", "4", "--energy", "1e308", "--format", format]);
        assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
        assert!(stderr(&o).contains("--energy 1e308"), "{}", stderr(&o));
        assert!(o.stdout.is_empty());
    }
}

#[test]
fn largest_accepted_values_give_finite_data() {
    // At the accepted bound every data row must still be finite (the CSV guard would refuse otherwise).
    let o = run(&["evolve", &wormhole(), "--radius", "4", "--duration", "1", "--velocity", "1e100", "--format", "csv"]);
    let out = String::from_utf8_lossy(&o.stdout);
    assert!(o.status.success() || o.status.code() == Some(3), "{}", stderr(&o));
    for row in out.lines().filter(|l| !l.starts_with('#')) {
        assert!(!row.split(',').any(|f| f.eq_ignore_ascii_case("nan") || f.ends_with("inf")), "{row}");
    }
}

#[test]
fn repeated_report_runs_give_byte_identical_pdfs() {
    // The figures with several fonts and resources (families, maps) used to change from run to run.
    let rn = root().join("scenarios/reissner-nordstrom-wormhole.toml").display().to_string();
    let t = tempfile::tempdir().unwrap();
    let mut runs: Vec<Vec<(String, Vec<u8>)>> = Vec::new();
    for k in 0..3 {
        let d = t.path().join(format!("r{k}"));
        let o = run(&["report", &rn, "--out", &d.display().to_string(), "--family", "q=0,0.3,0.6"]);
        assert!(o.status.success(), "{}", stderr(&o));
        let pdfs: Vec<(String, Vec<u8>)> = names(&d)
            .into_iter()
            .filter(|n| n.ends_with(".pdf"))
            .map(|n| (n.clone(), std::fs::read(d.join(&n)).unwrap()))
            .collect();
        assert!(pdfs.len() >= 5, "{:?}", names(&d));
        runs.push(pdfs);
    }
    for (a, b) in runs[0].iter().zip(&runs[1]).chain(runs[0].iter().zip(&runs[2])) {
        assert_eq!(a.0, b.0);
        assert!(a.1 == b.1, "{} differs between runs", a.0);
    }
}

#[test]
fn bad_vary_in_report_writes_no_file() {
    let t = tempfile::tempdir().unwrap();
    let d = t.path().join("rep");
    let o = run(&["report", &wormhole(), "--out", &d.display().to_string(), "--vary", "ww:0:1:5"]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("--vary ww") && stderr(&o).contains("did you mean"), "{}", stderr(&o));
    assert!(!d.exists() || names(&d).is_empty());
    // A scenario without an equation of state cannot be swept: said before anything is written.
    let rn = root().join("scenarios/reissner-nordstrom-wormhole.toml").display().to_string();
    let o = run(&["report", &rn, "--out", &d.display().to_string(), "--vary", "q:0:0.9:5"]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("equation of state"), "{}", stderr(&o));
    assert!(!d.exists() || names(&d).is_empty());
}

#[cfg(unix)]
#[test]
fn fifo_as_scenario_is_refused_without_hanging() {
    let t = tempfile::tempdir().unwrap();
    let fifo = t.path().join("pipe.toml");
    assert!(Command::new("mkfifo").arg(&fifo).status().unwrap().success());
    // Nobody writes to the pipe: reading it would block for ever.
    let o = run(&["check", &fifo.display().to_string()]);
    assert_eq!(o.status.code(), Some(4), "{}", stderr(&o));
    assert!(stderr(&o).contains("not a regular file"), "{}", stderr(&o));
}

#[test]
fn scenario_larger_than_the_cap_is_refused() {
    let t = tempfile::tempdir().unwrap();
    let p = t.path().join("huge.toml");
    let mut text = std::fs::read_to_string(wormhole()).unwrap();
    text.push_str(&"#".repeat(17 << 20));
    std::fs::write(&p, text).unwrap();
    let o = run(&["check", &p.display().to_string()]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("larger than 16 MiB"), "{}", stderr(&o));
}

#[test]
fn utf16_scenario_is_bad_input_with_a_hint() {
    let t = tempfile::tempdir().unwrap();
    let p = t.path().join("utf16.toml");
    let text = std::fs::read_to_string(wormhole()).unwrap();
    let mut bytes = vec![0xFF, 0xFE];
    for u in text.encode_utf16() {
        bytes.extend_from_slice(&u.to_le_bytes());
    }
    std::fs::write(&p, &bytes).unwrap();
    let o = run(&["check", &p.display().to_string()]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("UTF-16") && stderr(&o).contains("save the file as UTF-8"), "{}", stderr(&o));
    // Without its byte-order mark too.
    std::fs::write(&p, &bytes[2..]).unwrap();
    let o = run(&["check", &p.display().to_string()]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("UTF-8"), "{}", stderr(&o));
}

/// Static radius of the Schwarzschild thin-shell wormhole with p = w sigma: a0 = m (1 + 4w) / (1 + 2w)
/// (static sigma0, p0 of Poisson & Visser 1995, Phys. Rev. D 52, 7318), so a0 = 4 m at w = -0.75.
#[test]
fn large_and_small_masses_keep_their_static_shell() {
    for m in [1e20, 1e45, 1e-20] {
        let o = run(&["statics", &wormhole(), "--set", &format!("m={m:e}"), "--format", "json"]);
        assert!(o.status.success(), "m = {m}: {}", stderr(&o));
        let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
        let radii = v["static_radii"].as_array().unwrap();
        assert_eq!(radii.len(), 1, "m = {m}: {v}");
        let a0 = radii[0]["radius"].as_f64().unwrap();
        assert!((a0 / (4.0 * m) - 1.0).abs() < 1e-9, "m = {m}: a0 = {a0}");
    }
}

#[test]
fn flat_sum_of_many_terms_is_not_too_deep() {
    // 1 - 2 m / r written as 1 - (2 m / r) / 300 repeated 300 times.
    let t = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(wormhole()).unwrap();
    let long = format!("1 {}", vec!["- 2*m/r/300"; 300].join(" "));
    let p = t.path().join("flat.toml");
    std::fs::write(&p, text.replace("A = \"1 - 2*m/r\"", &format!("A = \"{long}\""))).unwrap();
    let a = run(&["derive", &p.display().to_string(), "--radius", "4", "--format", "json"]);
    assert!(a.status.success(), "{}", stderr(&a));
    let b = run(&["derive", &wormhole(), "--radius", "4", "--format", "json"]);
    let (a, b): (serde_json::Value, serde_json::Value) =
        (serde_json::from_slice(&a.stdout).unwrap(), serde_json::from_slice(&b.stdout).unwrap());
    let (sa, sb) = (a["sigma"].as_f64().unwrap(), b["sigma"].as_f64().unwrap());
    assert!((sa / sb - 1.0).abs() < 1e-12, "{sa} vs {sb}");
}

#[test]
fn negative_values_need_no_equals_sign() {
    let o = run(&["statics", &wormhole(), "--from", "-1", "--to", "5"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--from -1: radii must be positive"), "{}", stderr(&o));
}
