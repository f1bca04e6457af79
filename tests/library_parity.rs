//! The library computes what the command line prints: for every shipped scenario, `check`, `geodesic` and
//! `chain` called as library functions (with the request a front end fills) give exactly the JSON that
//! `junctura COMMAND ... --format json` prints, and the same failure (exit code of the error's kind) where the
//! request is refused.

use junctura::geodesic::{Chain, ChainRequest, CrossingRequest, Particle};
use junctura::request::RangeRequest;
use junctura::scenario::Scenario;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn run(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_junctura")).current_dir(root()).args(args).output().expect("run junctura")
}

/// The shipped scenario files (every one runs here).
fn scenarios() -> Vec<PathBuf> {
    let mut v: Vec<PathBuf> = std::fs::read_dir(root().join("scenarios"))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.sort();
    assert!(v.len() >= 10, "shipped scenarios missing: {v:?}");
    v
}

/// The path relative to the repository, as the command line is given it (provenance lines name it; cargo runs
/// integration tests in the package folder, so the library loads the same relative path).
fn rel(p: &Path) -> String {
    p.strip_prefix(root()).unwrap().display().to_string()
}

/// The library's result as the command line prints it (pretty JSON and one newline).
fn json_of<T: serde::Serialize>(v: &T) -> String {
    serde_json::to_string_pretty(v).unwrap() + "\n"
}

/// CLI stdout equals the library's JSON on success; on failure both fail with the same exit code.
fn same<T: serde::Serialize>(what: &str, lib: junctura::Result<T>, out: Output) {
    match lib {
        Ok(r) => {
            assert!(out.status.success(), "{what}: the CLI failed: {}", String::from_utf8_lossy(&out.stderr));
            let (cli, lib) = (String::from_utf8(out.stdout).unwrap(), json_of(&r));
            let first = cli.lines().zip(lib.lines()).find(|(a, b)| a != b);
            assert!(cli == lib, "{what}: first differing line (CLI, library): {first:?}");
        }
        Err(e) => {
            assert_eq!(out.status.code(), Some(e.kind.exit_code()), "{what}: library error {e}");
            assert!(out.stdout.is_empty(), "{what}");
        }
    }
}

#[test]
fn check_of_every_scenario_is_the_cli_json() {
    for p in scenarios() {
        let path = rel(&p);
        let s = Scenario::load(Path::new(&path)).unwrap();
        same(&path, junctura::survey::check(&s, &RangeRequest::default()), run(&["check", &path, "--format", "json"]));
        let req = RangeRequest { from: Some(0.7), to: Some(30.0) };
        same(
            &path,
            junctura::survey::check(&s, &req),
            run(&["check", &path, "--from", "0.7", "--to", "30", "--format", "json"]),
        );
        // A refused range fails the same way in both.
        let bad = RangeRequest { from: Some(3.0), to: Some(2.0) };
        same(&path, junctura::survey::check(&s, &bad), run(&["check", &path, "--from", "3", "--to", "2"]));
    }
}

#[test]
fn geodesic_of_every_scenario_is_the_cli_json() {
    // Radii inside and outside the horizons of the shipped scenarios (m = 1 or of order 1), bound and unbound
    // energies, particles and light rays, a moving shell: each either crosses, cannot cross (data), or is
    // refused by the library exactly where the command line refuses it.
    let mut crossed = 0;
    for p in scenarios() {
        let path = rel(&p);
        let s = Scenario::load(Path::new(&path)).unwrap();
        for (radius, energy, null, velocity) in
            [(1.0, 0.9, false, 0.0), (4.0, 1.1, false, 0.0), (4.0, 0.9, true, 0.0), (6.0, 0.95, false, -0.2)]
        {
            let req = CrossingRequest {
                radius,
                shell_velocity: velocity,
                energy_minus: energy,
                particle: if null { Particle::Null } else { Particle::Timelike },
                direction: None,
            };
            let lib = junctura::geodesic::report(&s, &req);
            crossed += lib.as_ref().map(|r| r.can_cross as usize).unwrap_or(0);
            let (r, e, v) = (radius.to_string(), energy.to_string(), velocity.to_string());
            let mut args = vec!["geodesic", &path, "--radius", &r, "--energy", &e, "--shell-velocity", &v];
            if null {
                args.push("--null");
            }
            args.extend(["--format", "json"]);
            same(&format!("{path} {args:?}"), lib, run(&args));
        }
    }
    assert!(crossed >= 10, "too few crossings exercised: {crossed}");
}

#[test]
fn chain_is_the_cli_json() {
    let path = "scenarios/chains/bounce-chain.toml";
    let c = Chain::load(Path::new(path)).unwrap();
    let cases: [(ChainRequest, Vec<&str>); 4] = [
        (ChainRequest { crossings: Some(12), ..Default::default() }, vec!["--crossings", "12"]),
        (
            ChainRequest { crossings: Some(40), mass: Some("1Msun".into()), ..Default::default() },
            vec!["--crossings", "40", "--mass", "1Msun"],
        ),
        (
            ChainRequest { crossings: None, mass: Some("2e30kg".into()), within: Some("1e-20m".into()) },
            vec!["--mass", "2e30kg", "--within", "1e-20m"],
        ),
        (ChainRequest { crossings: Some(0), ..Default::default() }, vec!["--crossings", "0"]),
    ];
    for (req, extra) in cases {
        let mut args = vec!["chain", path, "--format", "json"];
        args.extend(extra);
        let lib = junctura::geodesic::chain(&c, &req);
        if let Ok(r) = &lib {
            // The CSV and figures the command writes with --out come from the same report.
            assert!(junctura::export::csv::chain(&r.run, &r.provenance, r.unit.as_ref()).starts_with("# "), "{args:?}");
            assert!(!r.figures().is_empty(), "{args:?}");
        }
        same(&format!("{args:?}"), lib, run(&args));
    }
}
