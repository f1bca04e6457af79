//! Maps against an independent calculation, shards merged byte for byte, and provenance in every report file.

use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn ok(args: &[&str]) -> String {
    let out = bin().args(args).output().unwrap();
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8(out.stdout).unwrap()
}

fn linspace(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    (0..n).map(|i| if i + 1 == n { hi } else { lo + (hi - lo) * i as f64 / (n - 1) as f64 }).collect()
}

/// Classification counts of a (radius, beta^2) map of the Schwarzschild thin-shell wormhole against the closed-form
/// criterion of Poisson & Visser 1995 (Phys. Rev. D 52, 7318): stable iff beta^2 < beta^2_c for a > 3M and
/// beta^2 > beta^2_c for 2M < a < 3M, beta^2_c = -(1 - 3M/a + 3M^2/a^2)/(2(1 - 2M/a)(1 - 3M/a)); a <= 2M is inside
/// the horizon.
#[test]
fn map_counts_match_the_poisson_visser_criterion() {
    let p = root().join("scenarios/schwarzschild-wormhole-linear.toml");
    let (nx, ny) = (97, 61);
    let out = ok(&[
        "map",
        p.to_str().unwrap(),
        "--x",
        &format!("radius:1.5:9:{nx}"),
        "--y",
        &format!("beta2:-3:3:{ny}"),
        "--summary",
    ]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let (mut stable, mut unstable, mut inside) = (0u64, 0u64, 0u64);
    for a in linspace(1.5, 9.0, nx) {
        for b in linspace(-3.0, 3.0, ny) {
            if a <= 2.0 {
                inside += 1;
                continue;
            }
            let x = 1.0 / a;
            let crit = -(1.0 - 3.0 * x + 3.0 * x * x) / (2.0 * (1.0 - 2.0 * x) * (1.0 - 3.0 * x));
            let st = if a > 3.0 { b < crit } else { b > crit };
            if st {
                stable += 1
            } else {
                unstable += 1
            }
        }
    }
    assert_eq!(v["cells"], (nx * ny) as u64);
    assert_eq!(v["stable_cells"], stable, "{v}");
    assert_eq!(v["unstable_cells"], unstable);
    assert_eq!(v["inside_horizon_cells"], inside);
    assert_eq!(v["no_static_cells"], 0);
}

/// Sharded runs merged with `merge` give exactly the bytes of the unsharded run.
#[test]
fn shards_merge_byte_identically() {
    let tmp = tempfile::tempdir().unwrap();
    let p = root().join("scenarios/reissner-nordstrom-wormhole.toml");
    let p = p.to_str().unwrap();
    let whole = tmp.path().join("whole");
    let parts = tmp.path().join("parts");
    let merged = tmp.path().join("merged");
    let axes = ["--x", "radius:1.7:6:37", "--y", "q:0:0.95:23", "--beta2", "-1"];
    let mut args = vec!["map", p];
    args.extend(axes);
    args.extend(["--out", whole.to_str().unwrap()]);
    ok(&args);
    let mut part_files = Vec::new();
    for k in 1..=3 {
        let shard = format!("{k}/3");
        let mut a = vec!["map", p];
        a.extend(axes);
        a.extend(["--out", parts.to_str().unwrap(), "--shard", &shard]);
        ok(&a);
        part_files.push(parts.join(format!("map.part-{k}-of-3.json")));
    }
    // Give the parts in a shuffled order: merge sorts them.
    let mut a = vec!["merge".to_string()];
    for i in [2usize, 0, 1] {
        a.push(part_files[i].to_str().unwrap().to_string());
    }
    a.extend(["--out".into(), merged.to_str().unwrap().into()]);
    let a: Vec<&str> = a.iter().map(|s| s.as_str()).collect();
    ok(&a);
    for f in ["map.csv", "map.json", "map.svg", "map.pdf", "map.png"] {
        let x = std::fs::read(whole.join(f)).unwrap();
        let y = std::fs::read(merged.join(f)).unwrap();
        assert!(x == y, "{f} differs between the whole and the merged run");
    }
    // A missing part is refused.
    let out =
        bin().args(["merge", part_files[0].to_str().unwrap(), "--out", merged.to_str().unwrap()]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
}

fn provenance_in(path: &Path, hash: &str) -> bool {
    let bytes = std::fs::read(path).unwrap();
    let text = String::from_utf8_lossy(&bytes);
    text.contains(hash)
}

/// Every file of a report names the scenario's hash (provenance), the PDF figures carry it in their metadata,
/// and summary.md lists every file.
#[test]
fn report_files_carry_provenance() {
    let tmp = tempfile::tempdir().unwrap();
    let p = root().join("scenarios/gravastar-linear.toml");
    let text = std::fs::read(&p).unwrap();
    use sha2::Digest;
    let hash = format!("{:x}", sha2::Sha256::digest(&text));
    let short = &hash[..16];
    ok(&["report", p.to_str().unwrap(), "--out", tmp.path().to_str().unwrap(), "--vary", "w:0.4:1.0:13"]);
    let summary = std::fs::read_to_string(tmp.path().join("summary.md")).unwrap();
    let mut n = 0;
    for e in std::fs::read_dir(tmp.path()).unwrap() {
        let f = e.unwrap().path();
        let name = f.file_name().unwrap().to_str().unwrap().to_string();
        if name.ends_with(".png") {
            // PNG text chunks are compressed or plain; the plot tests check them. Check the file is listed.
            assert!(summary.contains(&name));
            continue;
        }
        assert!(provenance_in(&f, short), "{name} lacks the scenario hash");
        if name != "summary.md" {
            assert!(summary.contains(&name), "summary.md does not list {name}");
        }
        n += 1;
    }
    assert!(n >= 15, "only {n} files");
    for stem in ["potential", "sigma_pressure", "map_radius_beta2", "sweep"] {
        for ext in ["svg", "pdf", "png"] {
            assert!(tmp.path().join(format!("{stem}.{ext}")).exists(), "{stem}.{ext}");
        }
    }
}

/// The demo runs end to end and writes a report per bundled scenario; its PDFs render when poppler is present.
#[test]
fn demo_runs_and_its_pdfs_render() {
    let tmp = tempfile::tempdir().unwrap();
    ok(&["demo", "--out", tmp.path().to_str().unwrap()]);
    for d in ["gravastar", "wormhole", "transition"] {
        assert!(tmp.path().join(d).join("summary.md").exists(), "{d}");
    }
    let pdf = tmp.path().join("gravastar/potential.pdf");
    if Command::new("pdftoppm").arg("-v").output().is_err() {
        eprintln!("note: pdftoppm not installed; PDF rendering not checked here (CI installs poppler-utils)");
        return;
    }
    let out = Command::new("pdftoppm")
        .args(["-png", "-r", "50", pdf.to_str().unwrap(), tmp.path().join("page").to_str().unwrap()])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let page = std::fs::read_dir(tmp.path())
        .unwrap()
        .filter_map(|e| e.ok())
        .any(|e| e.file_name().to_string_lossy().starts_with("page"));
    assert!(page, "pdftoppm wrote no page");
}

/// Dust (p = 0) with flat space inside and extremal Reissner-Nordstrom outside, B = (1 - m/r)^2: p0 = 0 at every
/// radius, so every radius is static and V'' = 0 identically (neutral; the same family `statics` reports as a
/// neutral interval; common practice: the extremal charged dust shell is in equilibrium at any radius). Regression:
/// the map's marginal rule lacked the 1/a0^2 term of the statics rule and called rounding noise stable or
/// unstable (13 of these 60 cells were marginal).
#[test]
fn map_calls_the_neutral_extremal_dust_family_marginal_everywhere() {
    let p = root().join("scenarios/extremal-charged-dust.toml");
    let out = ok(&["map", p.to_str().unwrap(), "--x", "radius:1.5:10:15", "--y", "m:1:1.3:4", "--summary"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["cells"], 60);
    assert_eq!(v["marginal_cells"], 60, "{out}");
}

/// derive's "not a static radius of that law" warning follows the one rule `statics::law_holds`,
/// |p0 - P(sigma0)| <= 1e-9 (|p0| + |sigma0|). The extremal charged dust shell is static at every radius (common
/// practice; p0 there is rounding noise of order 1e-18, P = 0): no warning. Regression: derive scaled the
/// residual by |p0| + |P(sigma0)| alone, which is rounding noise itself for dust, and called those radii not
/// static. The Schwarzschild wormhole with p = w sigma, w = -0.75, is static only at a0 = m (1 + 4w)/(1 + 2w)
/// = 4 (Poisson & Visser 1995, static sigma0 and p0): no warning there, a warning at a = 5.
#[test]
fn derive_warns_exactly_where_the_law_does_not_hold() {
    use junctura::report::derive::{derive, State};
    use junctura::scenario::Scenario;
    let warned = |file: &str, r: f64| {
        let s = Scenario::load(&root().join(file)).unwrap();
        let d = derive(&s, State::at_rest(r)).unwrap();
        d.warnings.iter().any(|w| w.contains("not a static radius of that law"))
    };
    for r in [1.7, 2.5, 3.3, 6.0, 40.0] {
        assert!(!warned("scenarios/extremal-charged-dust.toml", r), "dust at r = {r}");
    }
    assert!(!warned("scenarios/schwarzschild-wormhole-linear.toml", 4.0));
    assert!(warned("scenarios/schwarzschild-wormhole-linear.toml", 5.0));
    assert!(warned("scenarios/schwarzschild-wormhole-linear.toml", 4.0 * (1.0 + 1e-6)));
}

/// Shards written by the library and merged by the library: the merged counts equal those of the whole map
/// computed at once without files (`scan::summarize_lines`, the independent path), for a (radius, parameter)
/// map and a map over two parameters; the merged files are the map's.
#[test]
fn library_merge_of_library_shards_gives_the_whole_maps_summary() {
    use junctura::files::{merge_parts, write_map};
    use junctura::plot::FigureOptions;
    use junctura::report::map::map_spec;
    use junctura::scan::{shard_lines, summarize_lines};
    use junctura::scenario::Scenario;
    let cases = [
        ("scenarios/reissner-nordstrom-wormhole.toml", "radius:1.7:6:13", "q:0:0.95:7", Some(-1.0), 3),
        ("scenarios/schwarzschild-wormhole-linear.toml", "m:0.5:2:4", "w:-0.9:-0.6:5", None, 2),
    ];
    for (file, x, y, beta2, n) in cases {
        let s = Scenario::load(&root().join(file)).unwrap();
        let spec = map_spec(&s, x, y, beta2, None, None).unwrap();
        let tmp = tempfile::tempdir().unwrap();
        let mut parts = Vec::new();
        for k in 0..n {
            let lines = shard_lines(spec.n_lines(), k, n);
            write_map(&s, &spec, lines, Some((k, n)), tmp.path(), &FigureOptions::default(), &|_, _| {}).unwrap();
            parts.push(tmp.path().join(format!("map.part-{}-of-{n}.json", k + 1)));
        }
        // In reverse order: the merge sorts them by shard.
        let given: Vec<PathBuf> = parts.iter().rev().cloned().collect();
        let out = tmp.path().join("merged");
        let merged = merge_parts(&given, &out, &FigureOptions::default()).unwrap();
        let whole = summarize_lines(&s, &spec, 0..spec.n_lines()).unwrap();
        assert_eq!(merged.map.summary, whole, "{file}");
        // Every grid point is one cell (common practice: the grid has x.n * y.n points).
        assert_eq!(merged.map.summary.cells, (spec.x.n * spec.y.n) as u64, "{file}");
        assert_eq!(merged.map.data_rows, merged.map.summary.cells, "{file}");
        assert_eq!(merged.map.shard, None);
        assert_eq!(merged.parts, parts);
        let names: Vec<String> =
            merged.written.iter().map(|p| p.file_name().unwrap().to_string_lossy().into_owned()).collect();
        assert_eq!(names, ["map.csv", "map.json", "map.svg", "map.pdf", "map.png"], "{file}");
        // map.json holds the returned metadata.
        let json: serde_json::Value = serde_json::from_slice(&std::fs::read(out.join("map.json")).unwrap()).unwrap();
        assert_eq!(json, serde_json::to_value(&merged.map).unwrap(), "{file}");
    }
}

/// The library's merge refusals are data: the refused part (or the parts present) as the value of the request
/// field `parts`, and hints that name the field `shard`, never a command-line option.
#[test]
fn library_merge_refusals_name_the_parts_and_no_option() {
    use junctura::files::{merge_parts, write_map};
    use junctura::plot::FigureOptions;
    use junctura::report::map::map_spec;
    use junctura::scan::shard_lines;
    use junctura::scenario::Scenario;
    use junctura::{Problem, RequestField};
    let s = Scenario::load(&root().join("scenarios/schwarzschild-wormhole-linear.toml")).unwrap();
    let spec = map_spec(&s, "m:0.5:2:4", "w:-0.9:-0.6:4", None, None, None).unwrap();
    let tmp = tempfile::tempdir().unwrap();
    let fig = FigureOptions::default();
    for k in [0, 2] {
        write_map(&s, &spec, shard_lines(spec.n_lines(), k, 3), Some((k, 3)), tmp.path(), &fig, &|_, _| {}).unwrap();
    }
    let part = |k: usize| tmp.path().join(format!("map.part-{k}-of-3.json"));
    let out = tmp.path().join("merged");
    let no_option = |e: &junctura::Error| assert!(!e.to_string().contains("--"), "{e}");

    let missing = merge_parts(&[part(3), part(1)], &out, &fig).unwrap_err();
    no_option(&missing);
    assert_eq!(missing.message, "merge needs all 3 parts exactly once; got parts 1, 3");
    assert_eq!(missing.problem, Problem::BadRequest { field: RequestField::Parts, value: "1, 3".into() });
    assert_eq!(missing.fields(), [RequestField::Shard]);

    let twice = merge_parts(&[part(1), part(1), part(3)], &out, &fig).unwrap_err();
    assert_eq!(twice.problem, Problem::BadRequest { field: RequestField::Parts, value: "1, 1, 3".into() });

    // A part whose rows were edited is named as the refused value.
    write_map(&s, &spec, shard_lines(spec.n_lines(), 1, 3), Some((1, 3)), tmp.path(), &fig, &|_, _| {}).unwrap();
    let csv = part(2).with_extension("csv");
    let text = std::fs::read_to_string(&csv).unwrap();
    std::fs::write(&csv, format!("{text}{}", text.lines().last().unwrap()) + "\n").unwrap();
    let edited = merge_parts(&[part(1), part(2), part(3)], &out, &fig).unwrap_err();
    no_option(&edited);
    assert_eq!(
        edited.problem,
        Problem::BadRequest { field: RequestField::Parts, value: part(2).display().to_string() }
    );
    assert_eq!(edited.fields(), [RequestField::Shard]);
    assert!(!out.join("map.csv").exists() && !out.join("map.json").exists());

    let none = merge_parts(&[], &out, &fig).unwrap_err();
    no_option(&none);
    assert_eq!(none.fields(), [RequestField::Parts]);
}
