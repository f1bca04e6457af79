//! Every LaTeX file of closed forms compiles inside a minimal amsmath document at the width it was laid out for,
//! with no overfull line (common practice: pdflatex's "Overfull \hbox" warning). Skipped, with a message, when
//! `pdflatex` is not installed (`.ci/run` installs it).

use std::path::Path;
use std::process::Command;

fn have_pdflatex() -> bool {
    Command::new("pdflatex").arg("--version").output().map(|o| o.status.success()).unwrap_or(false)
}

fn junctura(args: &[&str]) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_junctura")).args(args).output().unwrap();
    assert!(out.status.success(), "junctura {args:?}: {}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8(out.stdout).unwrap()
}

/// Compile `body` in an article with the given text width; returns the log.
fn compile(dir: &Path, name: &str, body: &str, width_cm: f64) -> String {
    let doc = format!(
        "\\documentclass{{article}}\n\\usepackage{{amsmath,booktabs}}\n\\allowdisplaybreaks\n\\setlength{{\\textwidth}}{{{width_cm}cm}}\n\\begin{{document}}\n{body}\n\\end{{document}}\n"
    );
    let tex = dir.join(format!("{name}.tex"));
    std::fs::write(&tex, doc).unwrap();
    let out = Command::new("pdflatex")
        .args(["-interaction=nonstopmode", "-halt-on-error"])
        .arg(&tex)
        .current_dir(dir)
        .output()
        .unwrap();
    let log = std::fs::read_to_string(dir.join(format!("{name}.log"))).unwrap_or_default();
    assert!(out.status.success(), "{name}: pdflatex failed:\n{}", &log[log.len().saturating_sub(3000)..]);
    log
}

fn scenario_files() -> Vec<String> {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios");
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == "toml"))
        .map(|p| p.display().to_string())
        .collect();
    v.sort();
    v
}

#[test]
fn closed_form_latex_compiles_without_overfull_lines() {
    if !have_pdflatex() {
        eprintln!("skipped: pdflatex is not installed (apt-get install texlive-latex-base texlive-latex-recommended)");
        return;
    }
    let dir = tempfile::tempdir().unwrap();
    let mut n = 0;
    for (k, f) in scenario_files().iter().enumerate() {
        for (width, cm) in [("column", 8.5), ("page", 17.0), ("11", 11.0)] {
            for numbering in ["on", "off"] {
                for state in ["static", "moving"] {
                    let tex = junctura(&[
                        "closed-form",
                        f,
                        "--format",
                        "latex",
                        "--width",
                        width,
                        "--numbering",
                        numbering,
                        "--state",
                        state,
                    ]);
                    let name = format!("c{k}-{width}-{numbering}-{state}");
                    let log = compile(dir.path(), &name, &tex, cm);
                    assert!(
                        !log.contains("Overfull \\hbox"),
                        "{f} ({width}, numbering {numbering}, {state}): overfull line\n{tex}"
                    );
                    n += 1;
                }
            }
        }
        // derive --format latex (the report's formulas.tex uses the same renderer, column width).
        let tex = junctura(&[
            "derive",
            f,
            "--radius",
            if f.contains("transition") || f.contains("bounce-stage") { "1" } else { "4" },
            "--format",
            "latex",
        ]);
        let log = compile(dir.path(), &format!("d{k}"), &tex, 8.5);
        assert!(!log.contains("Overfull \\hbox"), "{f}: derive --format latex has an overfull line\n{tex}");
    }
    assert!(n >= 7 * 12);
}
