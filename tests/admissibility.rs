//! One admissibility rule (`junction::admissible`) for every command: `derive`, `statics`, maps and `evolve`
//! refuse the same points for the same reasons, and a `normal_sign` that contradicts `keep` is refused at load.
//!
//! The rule itself is common practice (a static timelike shell needs r = const timelike on both sides, B > 0,
//! away from horizons; A and B of one sign, else the metric changes signature); these tests check that every
//! path applies it identically.

use junctura::junction::{admissible, Junction};
use junctura::scan::cell::CellClass;
use junctura::scan::fast::{static_coefficients, FastJunction};
use junctura::scenario::{Scenario, ShellKind, Which};
use junctura::statics::{admissible_at, residual};
use std::process::Command;

mod common;
use common::{length_scale, shipped_scenarios, Rng};

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_junctura"))
}

/// A side whose A changes sign where B does not (A < 0 < B outside r = 2m): signature (-,-,+,+) there.
const SIGNATURE_FLIP: &str = r#"name = "signature flip"
[parameters]
m = 1.0
w = -0.75
[minus]
A = "-(1 - 2*m/r)"
B = "1 - 2*m/r"
keep = "outer"
[plus]
A = "1 - 2*m/r"
keep = "outer"
[shell]
pressure = "w*sigma"
"#;

/// A timelike shell whose plus side keeps a T-region (with the sign of n^r stated), Schwarzschild m = 1.
const KEEP_T_REGION: &str = r#"name = "timelike shell kept in a T-region"
[parameters]
m = 1.0
w = 0.2
[minus]
A = "1"
keep = "inner"
[plus]
A = "1 - 2*m/r"
keep = "black-hole"
normal_sign = 1
[shell]
pressure = "w*sigma"
"#;

fn scenarios() -> Vec<(String, Scenario)> {
    let mut out = shipped_scenarios();
    for (name, text) in [("signature flip", SIGNATURE_FLIP), ("keep T-region", KEEP_T_REGION)] {
        out.push((name.into(), Scenario::parse(text, None).unwrap()));
    }
    out.sort_by(|a, b| a.0.cmp(&b.0));
    out
}

#[test]
fn derive_statics_and_maps_agree_on_every_point() {
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let (mut admitted, mut refused) = (0, 0);
    for (name, s) in scenarios() {
        if s.shell.kind != ShellKind::Timelike {
            continue; // maps and statics are for timelike shells
        }
        let params = s.params.values();
        let scale = length_scale(&s);
        let j = Junction::new(&s);
        let fj = FastJunction::new(&s.model).expect("expression sides compile");
        for _ in 0..300 {
            let r = rng.uniform(0.02, 12.0) * scale;
            let (jm, jp) = (j.jet(Which::Minus, r), j.jet(Which::Plus, r));
            let derive = j.check_static_radius(r, &jm, &jp);
            let rule = admissible_at(&s.model, params, r);
            let map = static_coefficients(&fj.shape, r, &fj.point_jets(r, params));
            let statics = residual(&j, r);
            // Finite A'' and B'' (derive checks them too) hold at every sampled point of these metrics.
            assert_eq!(derive.is_ok(), rule.is_ok(), "{name} r = {r}: derive {derive:?} vs the rule {rule:?}");
            match rule {
                Ok(()) => {
                    admitted += 1;
                    assert!(
                        !matches!(map, Err(CellClass::InsideHorizon)),
                        "{name} r = {r}: admitted, but the map says inside a horizon"
                    );
                }
                Err(why) => {
                    refused += 1;
                    assert!(map.is_err(), "{name} r = {r}: refused ({why}) but the map found a static shell");
                    assert_eq!(map.unwrap_err(), CellClass::refused(why), "{name} r = {r}: {why}");
                    assert!(statics.is_none(), "{name} r = {r}: refused ({why}) but statics evaluates a residual");
                }
            }
        }
    }
    assert!(admitted > 1000 && refused > 200, "both outcomes sampled: {admitted} admitted, {refused} refused");
}

#[test]
fn signature_changing_side_is_refused_by_statics_as_by_derive() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("flip.toml");
    std::fs::write(&path, SIGNATURE_FLIP).unwrap();
    let run = |args: &[&str]| {
        let out = bin().args(args).arg(&path).output().unwrap();
        (
            out.status.code(),
            String::from_utf8_lossy(&out.stdout).into_owned(),
            String::from_utf8_lossy(&out.stderr).into_owned(),
        )
    };
    let (code, _, err) = run(&["derive", "--radius", "4"]);
    assert_eq!(code, Some(3), "{err}");
    assert!(err.contains("changes signature") && err.contains("minus side"), "{err}");
    let (code, out, err) = run(&["statics"]);
    assert_eq!(code, Some(3), "statics must refuse as derive does: {out}{err}");
    assert!(err.contains("changes signature") && err.contains("minus side"), "{err}");
    let (code, _, err) = run(&["evolve", "--radius", "4", "--velocity", "0.1", "--duration", "5"]);
    assert_eq!(code, Some(2), "{err}");
    assert!(err.contains("changes signature"), "{err}");
    let (code, out, err) = run(&["map", "--x", "radius:3:6:4", "--y", "w:-1:0:3", "--summary"]);
    assert_eq!(code, Some(0), "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["no_static_cells"], 12, "{out}");
}

#[test]
fn statics_notes_a_signature_change_on_part_of_the_range() {
    // A = B (1 + r - 5) changes sign at r = 4 only: the part r < 4 of the R-region r > 2 is skipped with a note.
    let text = SIGNATURE_FLIP.replace("A = \"-(1 - 2*m/r)\"", "A = \"(1 - 2*m/r)*(r - 4)\"");
    let s = Scenario::parse(&text, None).unwrap();
    let report = junctura::statics::find_static_radii(&s, 2.5, 40.0, &Default::default()).unwrap();
    assert!(report.notes.iter().any(|n| n.contains("changes signature")), "{:?}", report.notes);
    assert!(report.intervals.iter().all(|iv| iv.from > 4.0), "{:?}", report.intervals);
    assert!(report.static_radii.iter().all(|sr| sr.radius > 4.0));
}

#[test]
fn normal_sign_contradicting_keep_is_refused() {
    let base = "name = \"n\"\n[parameters]\nm = 1.0\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n";
    // keep = "outer" on the plus side of a timelike shell fixes n^r > 0 (the normal points from minus into plus).
    assert!(Scenario::parse(&format!("{base}normal_sign = 1\n"), None).is_ok());
    let e = Scenario::parse(&format!("{base}normal_sign = -1\n"), None).unwrap_err().to_string();
    assert!(e.contains("10:15") && e.contains("contradicts keep = \"outer\""), "{e}");
    // Spacelike shell: a black-hole interior fixes n^r < 0 for the future-directed normal.
    let spacelike = "name = \"n\"\n[parameters]\nm = 1.0\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"black-hole\"\nnormal_sign = 1\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"white-hole\"\n[shell]\nkind = \"spacelike\"\n";
    let e = Scenario::parse(spacelike, None).unwrap_err().to_string();
    assert!(e.contains("[minus] normal_sign = +1 contradicts keep = \"black-hole\""), "{e}");
    // Where keep does not fix the sign (a timelike shell in a T-region) the explicit sign is required and kept.
    let s = Scenario::parse(KEEP_T_REGION, None).unwrap();
    assert_eq!(s.plus.normal_sign(), 1.0);
}

#[test]
fn each_reason_names_its_side() {
    let s = Scenario::parse(KEEP_T_REGION, None).unwrap();
    // At r = 4 the plus side is an R-region, but it keeps "black-hole".
    let why = admissible_at(&s.model, s.params.values(), 4.0).unwrap_err();
    assert!(matches!(why, admissible::Inadmissible::KeepContradicts { side: Which::Plus, .. }), "{why:?}");
    // At r = 1 it is a T-region: no static timelike shell.
    let why = admissible_at(&s.model, s.params.values(), 1.0).unwrap_err();
    assert!(matches!(why, admissible::Inadmissible::WrongRegion { side: Which::Plus, .. }), "{why:?}");
    assert_eq!(why.side(), Which::Plus);
}
