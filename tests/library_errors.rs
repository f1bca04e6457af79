//! Library errors speak of request fields ("radius", "the axis x"), never of command-line options: the
//! command-line program adds its option names (`src/cli/common.rs`, `flag`). Two checks: bad requests run
//! through the library give messages and hints without an option, and no string literal in the library's
//! non-test code (outside `src/cli/`) names one.

use junctura::geodesic::{Chain, ChainRequest, CrossingRequest, Particle};
use junctura::request::{parse_axis, parse_pair, range, value, RangeRequest};
use junctura::scenario::Scenario;
use junctura::{Error, Problem, RequestField};
use std::path::{Path, PathBuf};

/// Whether `text` has `--` followed by a letter (an option such as `--radius`) that does not continue a word.
fn names_an_option(text: &str) -> bool {
    let b = text.as_bytes();
    (0..b.len().saturating_sub(2)).any(|i| {
        b[i] == b'-'
            && b[i + 1] == b'-'
            && b[i + 2].is_ascii_alphabetic()
            && (i == 0 || !(b[i - 1].is_ascii_alphanumeric() || b[i - 1] == b'-'))
    })
}

#[test]
fn the_option_detector_finds_options_and_only_options() {
    assert!(names_an_option("--radius 4: must be positive"));
    assert!(names_an_option("give --from LO --to HI"));
    assert!(names_an_option("(split the scan with --shard)"));
    assert!(!names_an_option("radius 4: must be positive"));
    assert!(!names_an_option("a -- b, x--y, 1e--3, ---"));
}

fn no_option(e: &Error) {
    assert!(!names_an_option(&e.to_string()), "the library names an option: {e}");
}

#[test]
fn bad_requests_through_the_library_name_fields() {
    let s = Scenario::load(Path::new("scenarios/schwarzschild-wormhole-linear.toml")).unwrap();
    let c = Chain::load(Path::new("scenarios/chains/bounce-chain.toml")).unwrap();
    let cross = |radius: f64, energy: f64, shell_velocity: f64| CrossingRequest {
        radius,
        shell_velocity,
        energy_minus: energy,
        particle: Particle::Timelike,
        direction: None,
    };
    let chain = |crossings: Option<usize>, mass: Option<&str>, within: Option<&str>| ChainRequest {
        crossings,
        mass: mass.map(String::from),
        within: within.map(String::from),
    };
    let errors: Vec<(Error, RequestField)> = vec![
        (value(RequestField::Energy, f64::NAN).unwrap_err(), RequestField::Energy),
        (value(RequestField::Radius, 1e200).unwrap_err(), RequestField::Radius),
        (range(Some(3.0), Some(2.0), (1.0, 2.0)).unwrap_err(), RequestField::From),
        (range(Some(0.0), Some(2.0), (1.0, 2.0)).unwrap_err(), RequestField::From),
        (junctura::survey::check(&s, &RangeRequest { from: Some(-1.0), to: None }).unwrap_err(), RequestField::From),
        (parse_axis(RequestField::X, "radius:3:2:5").unwrap_err(), RequestField::X),
        (parse_axis(RequestField::Y, "beta2:0:1:200000000").unwrap_err(), RequestField::Y),
        (parse_pair(RequestField::Within, "2:1").unwrap_err(), RequestField::Within),
        (junctura::geodesic::report(&s, &cross(-1.0, 1.0, 0.0)).unwrap_err(), RequestField::Radius),
        (junctura::geodesic::report(&s, &cross(4.0, f64::INFINITY, 0.0)).unwrap_err(), RequestField::Energy),
        (junctura::geodesic::report(&s, &cross(4.0, 1.0, 1e300)).unwrap_err(), RequestField::ShellVelocity),
        (junctura::geodesic::chain(&c, &chain(Some(0), None, None)).unwrap_err(), RequestField::Crossings),
        (junctura::geodesic::chain(&c, &chain(None, Some("3parsec"), None)).unwrap_err(), RequestField::Mass),
        (junctura::geodesic::chain(&c, &chain(None, Some("kg"), None)).unwrap_err(), RequestField::Mass),
        (junctura::geodesic::chain(&c, &chain(Some(3), None, Some("1lP"))).unwrap_err(), RequestField::Within),
    ];
    for (e, field) in &errors {
        no_option(e);
        assert!(e.fields().contains(field), "{e}: names {:?}, expected {field:?}", e.fields());
        if let Problem::BadRequest { field: f, .. } = &e.problem {
            assert!(e.fields().contains(f), "{e}");
        }
        // The front end's rendering replaces exactly the field names.
        let shown = e.render(&|f| if f == *field { "<FIELD>" } else { f.name() });
        assert!(shown.contains("<FIELD>"), "{shown}");
    }
    let bad_x = &errors[5].0;
    assert_eq!(bad_x.problem, Problem::BadRequest { field: RequestField::X, value: "radius:3:2:5".into() });
}

/// String literals under `src/` outside `src/cli/` that may still name options: (file, a fragment of the
/// literal, why). Each entry must still match something, so the list only shrinks.
const NOT_YET: &[(&str, &str, &str)] = &[
    // Result text, not errors: part of evolve's and tune's output, which must stay byte-identical.
    ("src/dynamics/integrate.rs", "(--stop-at-horizon)", "a stop reason in evolve's report"),
    ("src/dynamics/run.rs", "is not exactly static; using the static radius", "a note in evolve's report"),
    ("src/statics/tune.rs", "widen the search with --within", "a note in tune's report"),
];

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.is_dir() {
            rust_files(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

/// The string literals of one line of code (comments and text outside quotes dropped; escapes skipped).
fn literals(line: &str) -> Vec<String> {
    let code = line.trim_start();
    if code.starts_with("//") {
        return Vec::new();
    }
    let (mut out, mut cur, mut inside, mut escaped) = (Vec::new(), String::new(), false, false);
    let chars: Vec<char> = code.chars().collect();
    for (i, &ch) in chars.iter().enumerate() {
        if inside {
            if escaped {
                escaped = false;
            } else if ch == '\\' {
                escaped = true;
            } else if ch == '"' {
                inside = false;
                out.push(std::mem::take(&mut cur));
            } else {
                cur.push(ch);
            }
        } else if ch == '/' && chars.get(i + 1) == Some(&'/') {
            break;
        } else if ch == '"' && !(i > 0 && chars[i - 1] == '\'' && chars.get(i + 1) == Some(&'\'')) {
            inside = true;
        }
    }
    if inside {
        out.push(cur); // a literal continued on the next line
    }
    out
}

#[test]
fn no_library_string_names_a_command_line_option() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let mut files = Vec::new();
    rust_files(&root.join("src"), &mut files);
    files.sort();
    let (mut found, mut used) = (Vec::new(), vec![false; NOT_YET.len()]);
    for f in &files {
        let rel = f.strip_prefix(&root).unwrap().to_string_lossy().replace('\\', "/");
        if rel.starts_with("src/cli/") || rel == "src/main.rs" || rel.ends_with("_tests.rs") {
            continue;
        }
        let text = std::fs::read_to_string(f).unwrap();
        for (n, line) in text.lines().enumerate() {
            if line.trim_start().starts_with("#[cfg(test)]") {
                break; // unit tests at the end of the file may drive options
            }
            for lit in literals(line) {
                if names_an_option(&lit) {
                    match NOT_YET.iter().position(|(p, frag, _)| *p == rel && lit.contains(frag)) {
                        Some(k) => used[k] = true,
                        None => found.push(format!("{rel}:{}: \"{lit}\"", n + 1)),
                    }
                }
            }
        }
    }
    for (k, (p, frag, why)) in NOT_YET.iter().enumerate() {
        assert!(used[k], "{p} no longer has \"{frag}\" ({why}): drop it from NOT_YET");
    }
    assert!(found.is_empty(), "library strings that name command-line options:\n{}", found.join("\n"));
    assert!(files.len() > 50, "src/ not found: {} files", files.len());
}

#[test]
fn problems_carry_their_data() {
    let e = Scenario::parse("name = \"x\"\n[parameters]\nm = \n", Some("bad.toml".into())).unwrap_err();
    assert_eq!(e.problem, Problem::Parse { file: "bad.toml".into(), line: 3, column: 5 }, "{e}");
    let text = std::fs::read_to_string("scenarios/schwarzschild-wormhole-linear.toml").unwrap();
    let mut s = Scenario::parse(&text, None).unwrap();
    let e = s.params.set("ww", 1.0).unwrap_err();
    assert_eq!(e.problem, Problem::UnknownParameter { name: "ww".into(), suggestion: Some("w".into()) });
    // Schwarzschild sides (m = 1): the horizon is at r = 2 (Schwarzschild 1916), r = 1.5 lies inside it.
    use junctura::junction::admissible::Inadmissible;
    use junctura::report::derive::{derive, State};
    let at = |radius: f64| derive(&s, State { radius, velocity: 0.0, acceleration: 0.0 }).unwrap_err().problem;
    assert!(
        matches!(at(2.0), Problem::Inadmissible { radius, reason: Inadmissible::OnHorizon { .. } } if radius == 2.0)
    );
    assert!(matches!(at(1.5), Problem::Inadmissible { radius, .. } if radius == 1.5), "{:?}", at(1.5));
    let e = Scenario::load(Path::new("/nonexistent/scenario.toml")).unwrap_err();
    assert_eq!(e.problem, Problem::Io { path: "/nonexistent/scenario.toml".into() });
}
