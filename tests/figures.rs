//! Figures as a journal takes them: real dash patterns in SVG and PDF, no text box over another or over a data
//! line, every label on the canvas, embedded and extractable PDF fonts, and family curves that match the
//! published closed forms.

use junctura::plot::{layout, layout_panels, render_svg, Figure, Layout, Look, StyleName, TextKind};
use junctura::report::figures;
use junctura::scenario::Scenario;
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::Command;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn load(name: &str) -> Scenario {
    let p = root().join("scenarios").join(name);
    Scenario::parse(&std::fs::read_to_string(&p).unwrap(), Some(p)).unwrap()
}

fn journal(mut f: Figure) -> Figure {
    f.look.style = StyleName::Journal;
    f
}

/// Every figure type the tool writes, for one scenario with a law (gravastar) and the wormhole family.
fn all_figures() -> Vec<(String, Figure)> {
    let s = load("gravastar-linear.toml");
    let (lo, hi) = junctura::report::bundle::plot_range(&s).unwrap();
    let (slo, shi) = junctura::metric::default_range(&s);
    let st = junctura::statics::find_static_radii(&s, slo, shi, &Default::default()).unwrap();
    let ov = figures::overlays(&s, lo, hi);
    let mut out = vec![
        ("potential".to_string(), figures::potential_figure(&s, &st).unwrap()),
        ("sigma_pressure".to_string(), figures::sigma_pressure_figure_with(&s, lo, hi, Some(&ov))),
    ];
    let x = junctura::scan::Axis::new(&s, "radius", lo, hi, 60).unwrap();
    let y = junctura::scan::Axis::new(&s, "beta2", -3.0, 3.0, 40).unwrap();
    let spec = junctura::scan::MapSpec::new(&s, x, y, None, (lo, hi)).unwrap();
    let cells = junctura::scan::evaluate_lines(&s, &spec, 0..spec.n_lines()).unwrap().concat();
    out.push(("map".to_string(), figures::map_figure_with(s.provenance(), &spec, &cells, Some(&ov), &s.symbols)));
    let values: Vec<f64> = (0..30).map(|i| junctura::scan::grid_value(0.3, 1.2, i, 30)).collect();
    let sw = junctura::statics::sweep::sweep(&s, "w", &values, lo, hi, &Default::default()).unwrap();
    out.push(("sweep".to_string(), figures::sweep_figure(&sw)));
    let rn = load("reissner-nordstrom-wormhole.toml");
    for (stem, f) in figures::family_figures(&rn, "q", &[0.0, 0.5, 0.9], 2.05, 10.0).unwrap() {
        out.push((stem, f));
    }
    out
}

/// No two text boxes overlap, no text box is crossed by a data line, every text lies on the canvas.
fn check_layout(name: &str, l: &Layout) {
    let canvas = junctura::plot::BBox { x0: 0.0, y0: 0.0, x1: l.canvas.0, y1: l.canvas.1 };
    for (i, t) in l.texts.iter().enumerate() {
        assert!(t.bbox.inside(&canvas), "{name}: {:?} {:?} leaves the canvas {:?}", t.text, t.bbox, l.canvas);
        for u in &l.texts[..i] {
            assert!(!t.bbox.overlaps(&u.bbox), "{name}: text {:?} overlaps {:?}", t.text, u.text);
        }
        for line in &l.data_lines {
            assert!(!t.bbox.hits(line), "{name}: a data line crosses the text {:?} ({:?})", t.text, t.kind);
        }
    }
    // A label left out for lack of room is named in a note.
    let notes: String =
        l.texts.iter().filter(|t| t.kind == TextKind::Note).map(|t| t.text.as_str()).collect::<Vec<_>>().join(" ");
    for d in &l.dropped {
        assert!(notes.contains(d.as_str()), "{name}: label {d:?} dropped without a note ({notes:?})");
    }
    if let Some(lb) = l.legend {
        for line in &l.data_lines {
            assert!(!lb.hits(line), "{name}: a data line crosses the legend");
        }
    }
}

#[test]
fn no_text_overlaps_text_or_data_and_all_labels_are_on_the_canvas() {
    for (name, f) in all_figures() {
        for style in [StyleName::Journal, StyleName::Classic] {
            let mut f = f.clone();
            f.look.style = style;
            let l = layout(&f).unwrap();
            assert!(l.texts.iter().any(|t| t.kind == TextKind::AxisLabel), "{name}: no axis label");
            assert!(l.texts.iter().filter(|t| t.kind == TextKind::Tick).count() >= 4, "{name}: too few ticks");
            check_layout(&format!("{name} ({style:?})"), &l);
        }
    }
    // Width, aspect and a 2 x 2 grid of panels.
    let figs: Vec<Figure> = all_figures().into_iter().filter(|(n, _)| n.starts_with("family")).map(|x| x.1).collect();
    let mut look = Look { style: StyleName::Journal, width_cm: 17.8, ..Look::default() };
    let l = layout_panels(&figs[..2], 2, &look).unwrap();
    assert_eq!(l.plots.len(), 2);
    check_layout("panels", &l);
    look.width_cm = 8.5;
    let one = layout(&Figure { look, ..figs[0].clone() }).unwrap();
    // 8.5 cm = 240.94 pt (1 in = 72 pt = 2.54 cm).
    assert!((one.canvas.0 - 240.94).abs() < 0.01, "{:?}", one.canvas);
}

/// Regression: energy-condition boundaries were staircases of separate cell edges, each too short for its dash
/// pattern, so they printed solid. Now they are contours: long polylines with a dash array in the SVG and the
/// dash operator in the PDF.
#[test]
fn energy_condition_boundaries_are_dashed_in_svg_and_pdf() {
    let (_, map) = all_figures().into_iter().find(|(n, _)| n == "map").unwrap();
    let map = journal(map);
    let weak = map.series.iter().find(|s| s.label == "weak EC boundary").expect("no weak EC boundary");
    let runs: Vec<usize> = weak.points.split(|p| !p.0.is_finite()).map(|r| r.len()).filter(|&n| n > 0).collect();
    assert!(runs.iter().all(|&n| n >= 10), "boundary pieces too short for a dash pattern: {runs:?}");
    let svg = render_svg(&map).unwrap();
    assert!(svg.contains("stroke-dasharray=\"4 2\""), "SVG has no dashed path");
    assert!(svg.contains("stroke-dasharray=\"1 1.5\""), "SVG has no dotted path");
    let pdf = junctura::plot::render_pdf(&map).unwrap();
    let content = inflate_streams(&pdf);
    let dash = regex_like_dash(&content);
    assert!(dash, "the PDF content has no dash operator ([on off] phase d)");
}

/// The decompressed content of every Flate stream of a PDF.
fn inflate_streams(pdf: &[u8]) -> String {
    let mut out = String::new();
    let mut i = 0;
    while let Some(k) = find(&pdf[i..], b"stream") {
        let start = i + k + 6;
        let start = if pdf[start..].starts_with(b"\r\n") {
            start + 2
        } else {
            start + usize::from(pdf.get(start) == Some(&b'\n'))
        };
        let Some(end) = find(&pdf[start..], b"endstream") else { break };
        let mut s = String::new();
        if flate2::read::ZlibDecoder::new(&pdf[start..start + end]).read_to_string(&mut s).is_ok() {
            out.push_str(&s);
        } else {
            out.push_str(&String::from_utf8_lossy(&pdf[start..start + end]));
        }
        i = start + end + 9;
    }
    out
}

fn find(h: &[u8], n: &[u8]) -> Option<usize> {
    h.windows(n.len()).position(|w| w == n)
}

/// True if the content has `[a b ...] phase d` with a non-empty array (PDF 32000-1, 8.4.3.6).
fn regex_like_dash(content: &str) -> bool {
    content.split('[').skip(1).any(|rest| {
        let Some((arr, after)) = rest.split_once(']') else { return false };
        let nums = arr.split_whitespace().filter(|t| t.parse::<f64>().is_ok()).count();
        let mut tail = after.split_whitespace();
        nums >= 2 && tail.next().is_some_and(|p| p.parse::<f64>().is_ok()) && tail.next() == Some("d")
    })
}

fn have(tool: &str) -> bool {
    Command::new(tool).arg("-v").output().is_ok()
}

#[test]
fn pdf_fonts_are_embedded_and_text_is_extractable() {
    let dir = tempfile::tempdir().unwrap();
    let figs = all_figures();
    let (_, f) = figs.iter().find(|(n, _)| n == "sigma_pressure").unwrap();
    let paths = junctura::plot::write_figure(&journal(f.clone()), dir.path(), "sp").unwrap();
    let pdf = paths.iter().find(|p| p.extension().is_some_and(|e| e == "pdf")).unwrap();
    if !have("pdffonts") || !have("pdftotext") {
        eprintln!("note: pdffonts/pdftotext (poppler-utils) not on PATH; skipping the PDF font check");
        return;
    }
    let out = Command::new("pdffonts").arg(pdf).output().unwrap();
    let table = String::from_utf8_lossy(&out.stdout);
    let rows: Vec<&str> = table.lines().skip(2).filter(|l| !l.trim().is_empty()).collect();
    assert!(!rows.is_empty(), "pdffonts lists no font:\n{table}");
    assert!(rows.iter().any(|r| r.contains("STIXGeneral")), "the serif font is not used:\n{table}");
    for r in &rows {
        // Columns: name type encoding emb sub uni object ID; "emb" is the 4th from the end of the flags.
        let cols: Vec<&str> = r.split_whitespace().collect();
        let emb = cols[cols.len() - 5];
        assert_eq!(emb, "yes", "font not embedded: {r}");
    }
    let txt = Command::new("pdftotext").arg(pdf).arg("-").output().unwrap();
    let txt = String::from_utf8_lossy(&txt.stdout);
    for want in ["a/M", "σ", "weak EC only"] {
        assert!(txt.contains(want), "PDF text lacks {want:?}: {txt}");
    }
}

/// Critical beta^2 of the Reissner-Nordstrom thin-shell wormhole (Eiroa & Romero 2004, Gen. Rel. Grav. 36, 651;
/// closed form re-derived in tests/reference/wormhole_critical.py), M = 1:
/// beta^2_c = -a (a^3 - 3 M a^2 + 3 M^2 a - M Q^2) / (2 (a^2 - 3 M a + 2 Q^2)(a^2 - 2 M a + Q^2)).
/// At Q = 0 it is Poisson & Visser 1995 (Phys. Rev. D 52, 7318):
/// -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a)(1 - 3M/a)).
fn rn_beta2_crit(a: f64, q: f64) -> f64 {
    let m = 1.0;
    -a * (a.powi(3) - 3.0 * m * a * a + 3.0 * m * m * a - m * q * q)
        / (2.0 * (a * a - 3.0 * m * a + 2.0 * q * q) * (a * a - 2.0 * m * a + q * q))
}

#[test]
fn family_curves_match_the_wormhole_closed_forms() {
    // Sample values printed by tests/reference/wormhole_critical.py (SymPy): q = 0.5, a = 4: -1.49494949494949;
    // q = 0, a = 6: -0.875 (Poisson & Visser 1995 closed form).
    assert!((rn_beta2_crit(4.0, 0.5) + 1.49494949494949).abs() < 1e-12);
    assert!((rn_beta2_crit(6.0, 0.0) + 0.875).abs() < 1e-12);
    let rn = load("reissner-nordstrom-wormhole.toml");
    let qs = [0.0, 0.3, 0.6, 0.9];
    let figs = figures::family_figures(&rn, "q", &qs, 2.05, 10.0).unwrap();
    let crit = &figs.iter().find(|(n, _)| n == "family_q_beta2_critical").unwrap().1;
    assert_eq!(crit.series.len(), 4);
    for (s, &q) in crit.series.iter().zip(&qs) {
        assert_eq!(s.label, format!("q = {q}"));
        let pts: Vec<(f64, f64)> = s.points.iter().copied().filter(|p| p.1.is_finite()).collect();
        assert!(pts.len() > 200, "q = {q}: only {} drawn points", pts.len());
        for &(a, b) in pts.iter().step_by(23) {
            let want = rn_beta2_crit(a, q);
            assert!((b - want).abs() <= 1e-7 * want.abs().max(1.0), "q = {q}, a = {a}: drawn {b}, closed form {want}");
        }
    }
    // The Schwarzschild scenario, its own file, through the same path.
    let sw = load("schwarzschild-wormhole-linear.toml");
    let figs = figures::family_figures(&sw, "m", &[1.0], 2.05, 10.0).unwrap();
    for &(a, b) in figs[0].1.series[0].points.iter().filter(|p| p.1.is_finite()).step_by(31) {
        let want = -(1.0 - 3.0 / a + 3.0 / (a * a)) / (2.0 * (1.0 - 2.0 / a) * (1.0 - 3.0 / a));
        assert!((b - want).abs() <= 1e-7 * want.abs().max(1.0), "a = {a}: drawn {b}, Poisson-Visser {want}");
    }
    // The stable side is shaded: one band per curve.
    assert_eq!(crit.bands.len(), 4);
}

#[test]
fn report_with_a_family_writes_the_family_and_panel_figures() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_junctura"))
        .arg("report")
        .arg(root().join("scenarios/reissner-nordstrom-wormhole.toml"))
        .arg("--out")
        .arg(dir.path())
        .args(["--family", "q=0,0.3,0.6,0.9", "--width", "page", "--legend", "above"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    for stem in ["family_q_beta2_critical", "family_q_sigma", "family_q_pressure", "family_q_maps"] {
        for ext in ["svg", "pdf", "png"] {
            assert!(dir.path().join(format!("{stem}.{ext}")).exists(), "{stem}.{ext} missing");
        }
    }
    let svg = std::fs::read_to_string(dir.path().join("family_q_beta2_critical.svg")).unwrap();
    assert!(svg.contains("width=\"17.800cm\"") && svg.contains("font-family=\"STIXGeneral\""));
    let md = std::fs::read_to_string(dir.path().join("summary.md")).unwrap();
    assert!(md.contains("no equation of state"), "summary.md does not say there is no law: {md}");
    let bad = Command::new(env!("CARGO_BIN_EXE_junctura"))
        .arg("report")
        .arg(root().join("scenarios/reissner-nordstrom-wormhole.toml"))
        .arg("--out")
        .arg(dir.path().join("x"))
        .args(["--family", "qq=0,1"])
        .output()
        .unwrap();
    assert_eq!(bad.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&bad.stderr).contains("qq"));
}

#[test]
fn map_csv_prints_grid_values_exactly_and_names_its_columns_once() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_junctura"))
        .arg("map")
        .arg(root().join("scenarios/schwarzschild-wormhole-linear.toml"))
        .args(["--x", "radius:2.5:6:8", "--y", "beta2:-0.5:0.5:11", "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let csv = std::fs::read_to_string(dir.path().join("map.csv")).unwrap();
    let header = csv.lines().find(|l| l.starts_with("ix,")).unwrap();
    let names: Vec<&str> = header.split(',').collect();
    for n in &names {
        assert_eq!(names.iter().filter(|m| *m == n).count(), 1, "column {n} repeated in {header}");
    }
    assert!(!csv.contains("Fixed(") && !csv.contains("Axis"), "internal names in the comments");
    // beta2 grid: -0.5, -0.4, ..., 0.5 printed as such (no 0.30000000000000004).
    let ys: Vec<&str> = csv.lines().filter(|l| l.starts_with("0,")).map(|l| l.split(',').nth(3).unwrap()).collect();
    assert_eq!(ys, ["-0.5", "-0.4", "-0.3", "-0.2", "-0.1", "0.0", "0.1", "0.2", "0.3", "0.4", "0.5"]);
}

#[test]
fn parameter_map_provenance_names_the_axis_range_and_every_root() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_junctura"))
        .arg("map")
        .arg(root().join("scenarios/gravastar-linear.toml"))
        .args(["--x", "w:0.3:1.2:6", "--y", "l:0.02:0.08:4", "--root-rule", "largest", "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let csv = std::fs::read_to_string(dir.path().join("map.csv")).unwrap();
    let first = csv.lines().next().unwrap();
    assert!(first.contains("w=0.3..1.2 (map axis)") && first.contains("l=0.02..0.08 (map axis)"), "{first}");
    assert!(!first.contains("w=0.6"), "{first}");
    assert!(csv.contains("root rule largest"));
    // Cells with two static radii list both (the gravastar law has an inner unstable and an outer stable
    // radius for w above the fold), and the class follows the largest.
    let two: Vec<&str> = csv
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("ix,"))
        .filter(|l| l.split(',').nth(15) == Some("2"))
        .collect();
    assert!(!two.is_empty(), "no cell with two static radii");
    for l in two {
        let f: Vec<&str> = l.split(',').collect();
        let (r1, r2): (f64, f64) = (f[16].parse().unwrap(), f[18].parse().unwrap());
        assert!(r1 < r2, "{l}");
        assert_eq!(f[4].parse::<f64>().unwrap(), r2, "class must refer to the largest radius: {l}");
        assert_eq!(f[10], f[19], "{l}");
    }
    let _ = Path::new(".");
}

/// Regression: `report` searched static radii only up to r = 12 M and missed what `statics` finds. For the
/// Schwarzschild thin-shell wormhole with p = w sigma the static radius follows from sigma0 = -sqrt(f)/(2 pi a),
/// p0 = (1 - M/a)/(4 pi a sqrt(f)) (Poisson & Visser 1995): p0/sigma0 = -(a - M)/(2(a - 2M)) = w, so
/// a0 = M (1 + 4w)/(1 + 2w); w = -0.5373 puts it at 15.40 M. With w = 0.5 it would be 1.5 M, inside the horizon:
/// no static radius, and summary.md must say so.
#[test]
fn report_finds_far_static_radii_and_says_when_there_are_none() {
    let dir = tempfile::tempdir().unwrap();
    let run = |w: &str, out: &Path| {
        let o = Command::new(env!("CARGO_BIN_EXE_junctura"))
            .arg("report")
            .arg(root().join("scenarios/schwarzschild-wormhole-linear.toml"))
            .args(["--set", &format!("w={w}"), "--out"])
            .arg(out)
            .output()
            .unwrap();
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    };
    let far = dir.path().join("far");
    run("-0.5373", &far);
    let w = -0.5373f64;
    let want = (1.0 + 4.0 * w) / (1.0 + 2.0 * w);
    let csv = std::fs::read_to_string(far.join("statics.csv")).unwrap();
    let found: Vec<f64> = csv
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("radius"))
        .filter_map(|l| l.split(',').next()?.parse().ok())
        .collect();
    assert!(found.iter().any(|a| (a - want).abs() < 1e-6 * want), "a0 = {want} not in {found:?}");
    assert!(far.join("potential.png").exists());
    let none = dir.path().join("none");
    run("0.5", &none);
    let md = std::fs::read_to_string(none.join("summary.md")).unwrap();
    assert!(md.contains("no static radius was found"), "{md}");
}

/// Regressions of the sweep figure: the fold tip was drawn as a vertical segment in one class, the fold marker
/// sat half outside the frame, and the legend named "stable" with no stable branch drawn.
#[test]
fn sweep_pieces_meet_at_the_fold_and_the_legend_names_only_drawn_classes() {
    let all = all_figures();
    let f = &all.iter().find(|(n, _)| n == "sweep").unwrap().1;
    let fold = f.markers.first().expect("the gravastar sweep has a fold (Visser & Wiltshire 2004 two-radius case)");
    let (x0, x1) = f.x_range.unwrap();
    let (y0, y1) = f.y_range.unwrap();
    assert!(fold.x > x0 && fold.x < x1 && fold.y > y0 && fold.y < y1, "fold marker on or outside the frame");
    let drawn: Vec<_> = f.series.iter().filter(|s| s.points.len() > 1).collect();
    let stable: Vec<_> = drawn.iter().filter(|s| s.style == junctura::plot::LineStyle::Solid).collect();
    let unstable: Vec<_> = drawn.iter().filter(|s| s.style != junctura::plot::LineStyle::Solid).collect();
    assert!(!stable.is_empty() && !unstable.is_empty());
    // A stable and an unstable piece end where the parameter turns (the fold), within the marker's precision.
    let ends = |s: &junctura::plot::Series| [s.points[0], *s.points.last().unwrap()];
    let near = |p: (f64, f64)| ((p.0 - fold.x) / (x1 - x0)).abs() < 2e-3 && ((p.1 - fold.y) / (y1 - y0)).abs() < 2e-3;
    assert!(stable.iter().any(|s| ends(s).iter().any(|&p| near(p))), "no stable piece ends at the fold");
    assert!(unstable.iter().any(|s| ends(s).iter().any(|&p| near(p))), "no unstable piece ends at the fold");
    // Dense near the fold: the last step into it is short compared with the branch.
    for s in &drawn {
        for w in s.points.windows(2) {
            let d = (((w[1].0 - w[0].0) / (x1 - x0)).powi(2) + ((w[1].1 - w[0].1) / (y1 - y0)).powi(2)).sqrt();
            assert!(d < 0.06, "coarse step {d} between {:?} and {:?}", w[0], w[1]);
        }
    }
    // Only unstable points: no "stable" legend row.
    let mut rep = junctura::statics::sweep::SweepReport {
        scenario: "t".into(),
        provenance: "t".into(),
        parameter: "w".into(),
        values: vec![0.0, 1.0],
        radius_range: [2.0, 4.0],
        branches: vec![],
        notes: vec![],
    };
    let pt = |v: f64, r: f64| junctura::statics::sweep::BranchPoint {
        value: v,
        radius: r,
        potential_second_derivative: -1.0,
        stability: junctura::statics::Stability::Unstable,
    };
    rep.branches.push(junctura::statics::sweep::Branch {
        id: 1,
        points: vec![pt(0.0, 3.0), pt(1.0, 3.5)],
        folds: vec![],
        curve: vec![(0.0, 3.0), (0.5, 3.25), (1.0, 3.5)],
    });
    let f = figures::sweep_figure(&rep);
    let labels: Vec<&str> = f.series.iter().map(|s| s.label.as_str()).filter(|l| !l.is_empty()).collect();
    assert_eq!(labels, ["unstable"]);
}

/// Regression: the potential's point labels overlapped the curves and repeated the legend, and a symmetric
/// vertical range left a third of the plot empty.
#[test]
fn potential_has_no_point_labels_and_fills_its_range() {
    let all = all_figures();
    let f = &all.iter().find(|(n, _)| n == "potential").unwrap().1;
    assert!(f.markers.iter().all(|m| m.label.is_empty()));
    let (y0, y1) = f.y_range.unwrap();
    assert!(y0 < 0.0 && y1 > 0.0, "V = 0 must be shown");
    let (x0, x1) = f.x_range.unwrap();
    let vals: Vec<f64> = f
        .series
        .iter()
        .flat_map(|s| s.points.iter().filter(|p| p.0 >= x0 && p.0 <= x1 && p.1.is_finite()).map(|p| p.1.clamp(y0, y1)))
        .collect();
    let (lo, hi) = vals.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| (a.min(v), b.max(v)));
    assert!(
        (hi - lo) / (y1 - y0) > 0.8,
        "curves fill only {:.0} % of the vertical range",
        100.0 * (hi - lo) / (y1 - y0)
    );
}

#[test]
fn figure_options_set_size_limits_labels_and_log_axes() {
    use junctura::plot::{FigureOptions, LegendPos, LineStyle, Series};
    // y = 10^-x: a straight line on a log axis.
    let pts: Vec<(f64, f64)> = (0..50).map(|i| (i as f64 / 10.0, 10f64.powf(-(i as f64) / 10.0))).collect();
    let mut f = Figure {
        x_label: "x".into(),
        y_label: "y".into(),
        series: vec![Series { label: "10⁻ˣ".into(), points: pts, style: LineStyle::Solid, colour: 0 }],
        provenance: "options test".into(),
        ..Figure::default()
    };
    let opts = FigureOptions {
        width_cm: Some(17.8),
        aspect: Some(0.5),
        x_limits: Some((0.0, 4.0)),
        log_y: true,
        y_label: Some("y (log scale)".into()),
        legend: Some(LegendPos::LowerLeft),
        ..FigureOptions::default()
    };
    opts.apply(&mut f, StyleName::Journal);
    let l = layout(&f).unwrap();
    // 17.8 cm = 504.57 pt; aspect 0.5.
    assert!((l.canvas.0 - 504.57).abs() < 0.01 && (l.canvas.1 - 0.5 * l.canvas.0).abs() < 0.01, "{:?}", l.canvas);
    let ticks: Vec<&str> = l.texts.iter().filter(|t| t.kind == TextKind::Tick).map(|t| t.text.as_str()).collect();
    for want in ["10⁻⁴", "10⁻¹", "10⁰", "4"] {
        assert!(ticks.contains(&want), "no tick {want:?} in {ticks:?}");
    }
    assert!(l.texts.iter().any(|t| t.kind == TextKind::AxisLabel && t.text == "y (log scale)"));
    // Lower-left legend: its box is in the lower left quarter of the plot.
    let (p, lb) = (l.plots[0], l.legend.unwrap());
    assert!(lb.x0 < 0.5 * (p.x0 + p.x1) && lb.y1 > 0.5 * (p.y0 + p.y1));
    check_layout("options", &l);
    // The line is straight in the drawn coordinates (log axis): the midpoint lies on the chord.
    let line = &l.data_lines[0];
    let (a, b, m) = (line[0], line[line.len() - 1], line[line.len() / 2]);
    let t = (m.0 - a.0) / (b.0 - a.0);
    assert!((a.1 + t * (b.1 - a.1) - m.1).abs() < 0.5, "not straight on the log axis");
}

/// evolve and chain take the figure options too (common practice: every figure a command writes is
/// controllable without editing code).
#[test]
fn evolve_and_chain_figures_follow_the_figure_options() {
    let dir = tempfile::tempdir().unwrap();
    let run = |args: &[&str]| {
        let out = std::process::Command::new(env!("CARGO_BIN_EXE_junctura")).args(args).output().unwrap();
        assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    };
    let d = dir.path().to_str().unwrap();
    let dust = root().join("scenarios/dust-collapse.toml");
    let chain = root().join("scenarios/chains/bounce-chain.toml");
    run(&["evolve", dust.to_str().unwrap(), "--radius", "10", "--velocity", "0", "--duration", "100", "--out", d]);
    let classic = std::fs::read_to_string(dir.path().join("evolve_radius.svg")).unwrap();
    assert!(!classic.contains("font-family=\"STIXGeneral\""));
    run(&[
        "evolve",
        dust.to_str().unwrap(),
        "--radius",
        "10",
        "--velocity",
        "0",
        "--duration",
        "100",
        "--out",
        d,
        "--style",
        "journal",
        "--width",
        "page",
        "--ylabel",
        "shell radius R/M",
    ]);
    run(&["chain", chain.to_str().unwrap(), "--out", d, "--style", "journal", "--width", "page"]);
    for f in ["evolve_radius.svg", "evolve_phase.svg", "bounce-chain_chain_distance.svg"] {
        let svg = std::fs::read_to_string(dir.path().join(f)).unwrap();
        assert!(svg.contains("width=\"17.800cm\"") && svg.contains("font-family=\"STIXGeneral\""), "{f}");
    }
    let radius = std::fs::read_to_string(dir.path().join("evolve_radius.svg")).unwrap();
    assert!(radius.contains("shell radius R/M"));
}
