//! A catalogue of bad inputs, one row each: the real binary must exit with the right code (2 input,
//! 3 numerical, 4 I/O; README "Exit codes"), name the file and line/column or the parameter on stderr, and
//! never panic or print a backtrace.

use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

/// A scenario that loads: Schwarzschild thin-shell wormhole, m = 1 (horizon at r = 2), law p = w sigma.
const BASE: &str = r#"name = "bad-input base"
[parameters]
m = 1.0
w = -0.75
[minus]
A = "1 - 2*m/r"
keep = "outer"
[plus]
A = "1 - 2*m/r"
keep = "outer"
[shell]
pressure = "w*sigma"
"#;

/// BASE with the first occurrence of `from` replaced by `to` (panics in the test if `from` is absent).
fn edit(from: &str, to: &str) -> String {
    assert!(BASE.contains(from), "{from}");
    BASE.replacen(from, to, 1)
}

/// One row of the catalogue.
struct Case {
    /// Test name (also the scenario file name, so messages can be checked for it).
    name: &'static str,
    /// Scenario text written to `<name>.toml` (None: the row's arguments name their own paths).
    scenario: Option<String>,
    /// Arguments; `{S}` is the scenario path, `{D}` a fresh folder, `{F}` a regular file, `{R}` the repository.
    args: Vec<&'static str>,
    /// Expected exit code.
    code: i32,
    /// Texts that must appear on stderr (`{S}` and `{F}` are substituted).
    needles: Vec<&'static str>,
}

fn case(
    name: &'static str,
    scenario: Option<String>,
    args: &[&'static str],
    code: i32,
    needles: &[&'static str],
) -> Case {
    Case { name, scenario, args: args.to_vec(), code, needles: needles.to_vec() }
}

fn catalogue() -> Vec<Case> {
    let base = || Some(BASE.to_string());
    let derive4 = &["derive", "{S}", "--radius", "4"][..];
    vec![
        // Orientation and signature (one admissibility rule for every command).
        case(
            "normal_sign_contradicting_keep",
            Some(edit("keep = \"outer\"\n[shell]", "keep = \"outer\"\nnormal_sign = -1\n[shell]")),
            derive4,
            2,
            &["{S}:11:15", "normal_sign = -1 contradicts keep = \"outer\"", "remove normal_sign"],
        ),
        case(
            "statics_on_a_signature_changing_side",
            Some(edit("[minus]\nA = \"1 - 2*m/r\"", "[minus]\nA = \"-(1 - 2*m/r)\"\nB = \"1 - 2*m/r\"")),
            &["statics", "{S}"],
            3,
            &["minus side", "changes signature", "zeros should coincide"],
        ),
        // Scenario files.
        case(
            "symbol_for_unknown_parameter",
            Some(format!("{BASE}[symbols]\nmm = '\\mu'\n")),
            derive4,
            2,
            &["{S}:14:1", "'mm'", "did you mean 'm'"],
        ),
        case(
            "symbol_not_a_string",
            Some(format!("{BASE}[symbols]\nw = 3\n")),
            derive4,
            2,
            &["{S}:14:1", "[symbols] w must be a non-empty string"],
        ),
        case(
            "malformed_toml",
            Some("name = \"t\"\n[minus\nA = \"1\"\n".into()),
            derive4,
            2,
            &["{S}:2:", "table header"],
        ),
        case(
            "unknown_key",
            Some(edit("keep = \"outer\"\n[plus]", "keep = \"outer\"\nfoo = 1\n[plus]")),
            derive4,
            2,
            &["{S}:8:1", "foo"],
        ),
        case(
            "missing_side",
            Some(BASE.split("[plus]").next().unwrap_or("").to_string()),
            derive4,
            2,
            &["{S}", "[plus] side is missing"],
        ),
        case("unknown_keep", Some(edit("keep = \"outer\"", "keep = \"outside\"")), derive4, 2, &["{S}:7:8", "outside"]),
        case(
            "dimension_below_four",
            Some(edit("[parameters]", "dimension = 3\n[parameters]")),
            derive4,
            2,
            &["{S}:2:13", "dimension = 3"],
        ),
        case("non_numeric_parameter", Some(edit("m = 1.0", "m = \"one\"")), derive4, 2, &["{S}:3:1", "parameter 'm'"]),
        case(
            "nan_parameter",
            Some(edit("m = 1.0", "m = nan")),
            derive4,
            2,
            &["{S}:3:1", "parameter 'm'", "not a finite"],
        ),
        case(
            "inf_parameter",
            Some(edit("m = 1.0", "m = inf")),
            derive4,
            2,
            &["{S}:3:1", "parameter 'm'", "not a finite"],
        ),
        case(
            "expression_syntax_error",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/ * r\"")),
            derive4,
            2,
            &["{S}:6:15", "[minus] A"],
        ),
        case(
            "unknown_function",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/r + foo(r)\"")),
            derive4,
            2,
            &["{S}:6:18", "unknown function 'foo'"],
        ),
        case(
            "unknown_name",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*mm/r\"")),
            derive4,
            2,
            &["{S}:6:12", "unknown name 'mm'", "did you mean 'm'"],
        ),
        case(
            "number_literal_overflows",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/r + 1e999\"")),
            derive4,
            2,
            &["{S}:6:18", "1e999"],
        ),
        case(
            "expression_nested_too_deep",
            Some(edit("A = \"1 - 2*m/r\"", &format!("A = \"{}r{}\"", "(".repeat(5000), ")".repeat(5000)))),
            derive4,
            2,
            &["{S}:6:", "nested"],
        ),
        case(
            "unknown_shell_kind",
            Some(edit("pressure", "kind = \"null\"\npressure")),
            derive4,
            2,
            &["{S}:12:8", "unknown shell kind"],
        ),
        // Values that do not exist at the radius asked for.
        case(
            "division_by_zero_at_radius",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/(r - 4)\"")),
            derive4,
            3,
            &["{S}", "radius 4", "A of the minus side", "not finite"],
        ),
        case(
            "log_of_negative_at_radius",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/r + log(r - 5)\"")),
            derive4,
            3,
            &["{S}", "A of the minus side", "log(r - 5)"],
        ),
        case(
            "sqrt_of_negative_in_plus_b",
            Some(edit("keep = \"outer\"\n[shell]", "B = \"1 - 2*m/r + sqrt(r - 5)\"\nkeep = \"outer\"\n[shell]")),
            derive4,
            3,
            &["{S}", "B of the plus side", "sqrt(r - 5)"],
        ),
        case(
            "derivative_not_finite_at_radius",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/r + sqrt(r - 4)\"")),
            derive4,
            3,
            &["{S}", "first derivative of A of the minus side"],
        ),
        case(
            "law_log_of_negative",
            Some(edit("w*sigma", "log(sigma)")),
            derive4,
            3,
            &["{S}", "[shell] pressure", "log(sigma)"],
        ),
        case(
            "moving_shell_division_by_zero",
            Some(edit("A = \"1 - 2*m/r\"", "A = \"1 - 2*m/(r - 4)\"")),
            &["derive", "{S}", "--radius", "4", "--velocity", "0.1"],
            3,
            &["A of the minus side"],
        ),
        // Command-line values.
        case(
            "set_unknown_name",
            base(),
            &["derive", "{S}", "--radius", "4", "--set", "zz=1"],
            2,
            &["--set zz=1", "unknown parameter 'zz'"],
        ),
        case(
            "set_non_numeric",
            base(),
            &["derive", "{S}", "--radius", "4", "--set", "m=abc"],
            2,
            &["--set m=abc", "not a number"],
        ),
        case(
            "set_nan",
            base(),
            &["derive", "{S}", "--radius", "4", "--set", "m=nan"],
            2,
            &["--set m=nan", "not a finite"],
        ),
        case(
            "set_without_value",
            base(),
            &["derive", "{S}", "--radius", "4", "--set", "m"],
            2,
            &["--set m", "NAME=VALUE"],
        ),
        case("radius_not_finite", base(), &["derive", "{S}", "--radius", "inf"], 2, &["--radius"]),
        case(
            "vary_lo_not_below_hi",
            base(),
            &["sweep", "{S}", "--vary", "w:-0.6:-1:5"],
            2,
            &["--vary w:-0.6:-1:5", "LO must be smaller"],
        ),
        case(
            "vary_zero_points",
            base(),
            &["sweep", "{S}", "--vary", "w:-1:-0.6:0"],
            2,
            &["--vary", "N must be at least 1"],
        ),
        case("vary_unknown_parameter", base(), &["sweep", "{S}", "--vary", "zz:0:1:5"], 2, &["zz"]),
        case(
            "x_lo_not_below_hi",
            base(),
            &["map", "{S}", "--x", "radius:3:2:5", "--y", "beta2:0:1:4", "--summary"],
            2,
            &["--x radius:3:2:5", "LO must be smaller"],
        ),
        case(
            "y_zero_points",
            base(),
            &["map", "{S}", "--x", "radius:2:3:5", "--y", "beta2:0:1:0", "--summary"],
            2,
            &["--y", "N must be at least 1"],
        ),
        case(
            "x_nan_bound",
            base(),
            &["map", "{S}", "--x", "radius:nan:3:5", "--y", "beta2:0:1:4", "--summary"],
            2,
            &["--x", "not finite"],
        ),
        case("from_not_below_to", base(), &["statics", "{S}", "--from", "5", "--to", "3"], 2, &["--from 5 --to 3"]),
        case("from_not_positive", base(), &["statics", "{S}", "--from", "0", "--to", "3"], 2, &["--from 0"]),
        case(
            "shard_out_of_range",
            base(),
            &["map", "{S}", "--x", "radius:2.5:3:5", "--y", "beta2:0:1:4", "--summary", "--shard", "5/4"],
            2,
            &["--shard 5/4"],
        ),
        // Horizons.
        case(
            "radius_inside_horizon_for_outer_keep",
            base(),
            &["derive", "{S}", "--radius", "1.5"],
            3,
            &["radius 1.5", "minus side", "T-region"],
        ),
        case(
            "radius_exactly_at_horizon",
            base(),
            &["derive", "{S}", "--radius", "2"],
            3,
            &["radius 2", "horizon", "minus side"],
        ),
        case(
            "tune_radius_exactly_at_horizon",
            base(),
            &["tune", "{S}", "--solve", "w", "--radius", "2"],
            3,
            &["radius 2", "horizon"],
        ),
        // Files.
        case(
            "missing_file",
            None,
            &["derive", "{D}/absent.toml", "--radius", "4"],
            4,
            &["absent.toml", "No such file"],
        ),
        case("unreadable_file_is_a_folder", None, &["check", "{D}"], 4, &["{D}: is a folder"]),
        case(
            "map_out_under_a_regular_file",
            base(),
            &["map", "{S}", "--x", "radius:2.5:3:3", "--y", "beta2:0:1:3", "--out", "{F}/sub"],
            4,
            &["{F}/sub"],
        ),
        case("report_out_under_a_regular_file", base(), &["report", "{S}", "--out", "{F}/sub"], 4, &["{F}/sub"]),
        case(
            "merge_missing_part",
            None,
            &["merge", "{D}/map.part-1-of-2.json", "--out", "{D}/merged"],
            4,
            &["map.part-1-of-2.json"],
        ),
        case("chain_missing_file", None, &["chain", "{D}/absent-chain.toml"], 4, &["absent-chain.toml"]),
        // Sizes that would not fit.
        case(
            "huge_map_to_files_is_refused",
            base(),
            &["map", "{S}", "--x", "radius:2:3:100000000", "--y", "beta2:0:1:100000000", "--out", "{D}/huge"],
            2,
            &["cells"],
        ),
        case(
            "huge_map_summary_is_refused",
            base(),
            &["map", "{S}", "--x", "radius:2:3:100000000", "--y", "beta2:0:1:100000000", "--summary"],
            2,
            &["cells"],
        ),
        case(
            "long_map_line_to_files_is_refused",
            base(),
            &["map", "{S}", "--x", "radius:2.5:3:20000000", "--y", "beta2:0:1:2", "--out", "{D}/long"],
            2,
            &["20000000 points", "--summary"],
        ),
        case(
            "huge_chain_is_refused",
            None,
            &["chain", "{R}/scenarios/chains/bounce-chain.toml", "--crossings", "1000000000000"],
            2,
            &["1000000000000 crossings"],
        ),
        case("huge_sweep_is_refused", base(), &["sweep", "{S}", "--vary", "w:-1:-0.6:100000000"], 2, &["--vary"]),
        // evolve from arbitrary initial data (wormhole BASE: B = 1 - 2/r, horizon r = 2, both sides keep outer).
        case(
            "evolve_sigma_without_a_shell_state",
            base(),
            &["evolve", "{S}", "--radius", "4", "--sigma", "-0.001", "--duration", "10"],
            2,
            &["--sigma -0.001", "--radius 4", "no shell state", "V(R, sigma)"],
        ),
        case(
            "evolve_sigma_on_the_other_branch",
            base(),
            &["evolve", "{S}", "--radius", "4", "--sigma", "0.3", "--direction", "inward", "--duration", "10"],
            2,
            &["--sigma 0.3", "other branch", "keep = \"outer\""],
        ),
        case(
            "evolve_sigma_without_a_direction",
            base(),
            &["evolve", "{S}", "--radius", "4", "--sigma", "-0.3", "--duration", "10"],
            2,
            &["--sigma -0.3", "--direction inward or --direction outward"],
        ),
        case(
            "evolve_sigma_zero",
            base(),
            &["evolve", "{S}", "--radius", "4", "--sigma", "0", "--duration", "10"],
            2,
            &["--sigma 0", "non-zero"],
        ),
        case(
            "evolve_velocity_too_slow_inside_a_horizon",
            base(),
            &["evolve", "{S}", "--radius", "1.5", "--velocity", "0.1", "--duration", "10"],
            2,
            &["--velocity 0.1", "--radius 1.5", "Rdot^2 + B", "no timelike shell state"],
        ),
        case(
            "evolve_velocity_in_a_t_region_needs_a_normal_sign",
            base(),
            &["evolve", "{S}", "--radius", "1.5", "--velocity", "2", "--duration", "10"],
            2,
            &["--velocity 2", "T-region", "normal_sign"],
        ),
        case(
            "evolve_start_on_a_horizon",
            base(),
            &["evolve", "{S}", "--radius", "2", "--velocity", "0.1", "--duration", "10"],
            2,
            &["--radius 2", "horizon of the minus side", "start slightly off"],
        ),
        case(
            "evolve_without_initial_data",
            base(),
            &["evolve", "{S}", "--radius", "4", "--duration", "10"],
            2,
            &["--kick DA, --velocity V or --sigma S"],
        ),
        case(
            "evolve_direction_without_sigma",
            base(),
            &["evolve", "{S}", "--radius", "4", "--direction", "inward", "--duration", "10"],
            2,
            &["--sigma"],
        ),
        case(
            "evolve_ensemble_needs_a_static_start",
            base(),
            &[
                "evolve",
                "{S}",
                "--radius",
                "5",
                "--velocity",
                "0.1",
                "--duration",
                "10",
                "--ensemble",
                "4",
                "--spread",
                "0.1",
            ],
            2,
            &["--ensemble", "static-radius start"],
        ),
        // Hardening: injected text, overflowing values, unbounded reads, extreme scales, late validation.
        case(
            "name_with_newline",
            Some(edit("name = \"bad-input base\"", "name = \"evil\\n0,0,1\"")),
            &["derive", "{S}", "--radius", "4", "--format", "csv"],
            2,
            &["{S}:1:8", "control character \\n"],
        ),
        case(
            "name_with_terminal_escape",
            Some(edit("name = \"bad-input base\"", "name = \"x\\u001b[2J\"")),
            derive4,
            2,
            &["{S}:1:8", "\\u{1b}"],
        ),
        case(
            "symbol_with_tex_file_command",
            Some(format!("{BASE}[symbols]\nw = '\\input{{/etc/passwd}}'\n")),
            derive4,
            2,
            &["{S}:14:1", "\\input"],
        ),
        case(
            "figure_label_with_control_character",
            base(),
            &["map", "{S}", "--x", "radius:2.5:3:3", "--y", "beta2:0:1:3", "--out", "{D}/o", "--ylabel", "a\u{7}"],
            2,
            &["--ylabel"],
        ),
        case(
            "axis_span_overflows",
            base(),
            &["map", "{S}", "--x", "radius:2.5:3:3", "--y", "w:-1.7e308:1.7e308:3", "--summary"],
            2,
            &["--y w:-1.7e308:1.7e308:3", "above 1e100"],
        ),
        case(
            "evolve_velocity_overflows",
            base(),
            &["evolve", "{S}", "--radius", "4", "--duration", "1", "--velocity", "1e200"],
            2,
            &["--velocity 1e200"],
        ),
        case(
            "geodesic_energy_overflows",
            base(),
            &["geodesic", "{S}", "--radius", "4", "--energy", "1e308", "--format", "csv"],
            2,
            &["--energy 1e308"],
        ),
        case("scenario_is_dev_zero", None, &["check", "/dev/zero"], 4, &["/dev/zero", "not a regular file"]),
        case(
            "parameter_too_large",
            base(),
            &["statics", "{S}", "--set", "m=1e60"],
            2,
            &["parameter 'm' = 1e60", "1e50"],
        ),
        case(
            "parameter_too_large_in_file",
            Some(edit("m = 1.0", "m = 1e300")),
            derive4,
            2,
            &["{S}:3:1", "parameter 'm' = 1e300"],
        ),
        case("parameter_too_small", base(), &["statics", "{S}", "--set", "m=1e-60"], 2, &["parameter 'm' = 1e-60"]),
        case(
            "report_bad_vary_before_any_file",
            base(),
            &["report", "{S}", "--out", "{D}/rep", "--vary", "ww:0:1:5"],
            2,
            &["--vary ww", "did you mean 'w'"],
        ),
        case(
            "negative_radius_without_equals",
            base(),
            &["derive", "{S}", "--radius", "-4"],
            2,
            &["--radius -4", "positive"],
        ),
        case(
            "negative_range_without_equals",
            base(),
            &["statics", "{S}", "--from", "-1", "--to", "5"],
            2,
            &["--from -1"],
        ),
        case(
            "dimension_above_the_limit",
            Some(edit("[parameters]", "dimension = 65\n[parameters]")),
            derive4,
            2,
            &["{S}:2:13", "4 <= D <= 64"],
        ),
        case(
            "long_unknown_name_answers_at_once",
            base(),
            &["derive", "{S}", "--radius", "4", "--set", long_name()],
            2,
            &["unknown parameter"],
        ),
    ]
}

/// `--set NAME=1` with a 100 KB name (the suggestion search used to take seconds on it).
fn long_name() -> &'static str {
    Box::leak(format!("{}=1", "x".repeat(100_000)).into_boxed_str())
}

fn subst(s: &str, scen: &Path, dir: &Path, file: &Path) -> String {
    s.replace("{S}", &scen.display().to_string())
        .replace("{D}", &dir.display().to_string())
        .replace("{F}", &file.display().to_string())
        .replace("{R}", env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn every_bad_input_fails_cleanly_with_its_exit_code_and_location() {
    let tmp = tempfile::tempdir().unwrap();
    let file = tmp.path().join("a-regular-file");
    std::fs::write(&file, "not a folder").unwrap();
    let mut failures = Vec::new();
    let cases = catalogue();
    for c in &cases {
        let dir = tmp.path().join(format!("dir-{}", c.name));
        std::fs::create_dir_all(&dir).unwrap();
        let scen: PathBuf = dir.join(format!("{}.toml", c.name));
        if let Some(text) = &c.scenario {
            std::fs::write(&scen, text).unwrap();
        }
        let args: Vec<String> = c.args.iter().map(|a| subst(a, &scen, &dir, &file)).collect();
        let out = bin().args(&args).output().unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        let mut why = Vec::new();
        if out.status.code() != Some(c.code) {
            why.push(format!("exit code {:?}, expected {}", out.status.code(), c.code));
        }
        for n in &c.needles {
            let n = subst(n, &scen, &dir, &file);
            if !err.contains(&n) {
                why.push(format!("'{n}' not on stderr"));
            }
        }
        let lower = err.to_lowercase();
        if lower.contains("panicked") || lower.contains("backtrace") || lower.contains("stack overflow") {
            why.push("panic or backtrace on stderr".into());
        }
        if !err.starts_with("error: ") {
            why.push("stderr does not start with 'error: '".into());
        }
        let stdout = String::from_utf8_lossy(&out.stdout);
        if stdout.contains("NaN") || stdout.contains("inf") {
            why.push("NaN or inf printed on stdout".into());
        }
        if !why.is_empty() {
            failures.push(format!("{}: {}\n  args: {args:?}\n  stderr: {err}", c.name, why.join("; ")));
        }
    }
    assert!(
        failures.is_empty(),
        "{} of {} bad-input cases failed:\n{}",
        failures.len(),
        cases.len(),
        failures.join("\n")
    );
}

#[test]
fn catalogue_names_are_unique() {
    let cases = catalogue();
    let mut names: Vec<&str> = cases.iter().map(|c| c.name).collect();
    names.sort();
    names.dedup();
    assert_eq!(names.len(), cases.len());
}

#[test]
fn statics_over_a_range_inside_the_horizon_says_why_nothing_was_found() {
    // An R-region keep = "outer" with the whole range inside the horizon r = 2M: no static timelike shell can
    // exist there (common practice: B < 0 makes r = const spacelike), and the output must say so, not stay silent.
    let tmp = tempfile::tempdir().unwrap();
    let p = tmp.path().join("inside.toml");
    std::fs::write(&p, BASE).unwrap();
    let out = bin()
        .args(["statics", p.to_str().unwrap(), "--from", "1", "--to", "1.8", "--format", "json"])
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["static_radii"].as_array().unwrap().len(), 0);
    let notes = v["notes"].to_string();
    assert!(notes.contains("T-region"), "{notes}");
}
