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
