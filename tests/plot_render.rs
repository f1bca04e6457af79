//! Figures end to end: each output format is produced, carries its text, font and provenance, and (when
//! poppler's `pdftoppm`/`pdftotext` are installed) the PDF renders to a non-blank page with real text.

use junctura::plot::{
    render_pdf, render_png, render_svg, write_figure, Band, CategoryMap, Figure, LineStyle, Marker, RefLine, Series,
};
use std::process::Command;

const PROVENANCE: &str = "scenario=test-wormhole sha256=0123abcd m=1 q=0.5 junctura-test";

/// A figure like the ones the tool makes: V(a) for three parameter values, one with a gap (NaN) where the
/// potential is undefined, a band where a condition holds, static radii and reference lines. The curves
/// are V(a) = 1 - 2m/a - (k/a)^2 shapes chosen only to look like potentials; nothing here checks physics.
pub fn demo_figure() -> Figure {
    let a_grid: Vec<f64> = (0..400).map(|i| 2.0 + 8.0 * i as f64 / 399.0).collect();
    let curve = |q: f64| -> Vec<(f64, f64)> {
        a_grid
            .iter()
            .map(|&a| {
                let v = 1.0 - 2.0 / a + q * q / (a * a) - 0.6 * (-(a - 3.5 - q).powi(2)).exp();
                (a, if (a - 6.0).abs() < 0.3 && q > 0.9 { f64::NAN } else { v })
            })
            .collect()
    };
    Figure {
        title: None,
        x_label: "a/M".into(),
        y_label: "V(a)".into(),
        x_range: None,
        y_range: None,
        series: (0..3)
            .map(|i| Series {
                label: format!("Q/M = {}", [0.0, 0.5, 1.0][i]),
                points: curve([0.0, 0.5, 1.0][i]),
                style: LineStyle::cycle(i),
                colour: i,
            })
            .collect(),
        bands: vec![Band::XInterval { label: "σ + p ≥ 0".into(), from: 4.5, to: 7.0, colour: 4 }],
        markers: vec![
            Marker { x: 3.1, y: 0.0, label: "a₀ (unstable)".into(), filled: false, colour: 0 },
            Marker { x: 8.0, y: 0.75, label: "a₀ (stable)".into(), filled: true, colour: 1 },
        ],
        ref_lines: vec![RefLine::vertical(2.0, "r₊"), RefLine::horizontal(0.0, "V = 0")],
        categories: None,
        provenance: PROVENANCE.into(),
        ..Figure::default()
    }
}

fn have(tool: &str) -> bool {
    Command::new(tool).arg("-v").output().is_ok()
}

#[test]
fn svg_carries_labels_size_and_provenance() {
    let svg = render_svg(&demo_figure()).unwrap();
    assert!(svg.len() > 5_000, "SVG suspiciously small: {} bytes", svg.len());
    for text in ["a/M", "V(a)", "Q/M = 0.5", "σ + p ≥ 0", "V = 0"] {
        assert!(svg.contains(text), "SVG lacks the text {text:?}");
    }
    assert!(svg.contains("width=\"8.500cm\""), "SVG is not single-column width");
    assert!(svg.contains(&format!("<!-- {PROVENANCE} -->")));
    assert!(svg.contains("<metadata>") && svg.matches(PROVENANCE).count() >= 2);
    assert!(svg.contains("font-family=\"DejaVu Sans\""));
}

#[test]
fn tick_labels_never_show_negative_zero() {
    let mut fig = demo_figure();
    fig.y_range = Some((-1.0, 1.0));
    fig.x_range = Some((-2.0, 10.0));
    let svg = render_svg(&fig).unwrap();
    let labels: Vec<&str> = svg
        .split("<text")
        .skip(1)
        .filter_map(|t| t.split_once('>').and_then(|(_, rest)| rest.split_once("</text>")).map(|(s, _)| s.trim()))
        .collect();
    assert!(labels.contains(&"0"), "no zero tick among {labels:?}");
    for l in &labels {
        assert!(!["-0", "\u{2212}0", "-0.0", "\u{2212}0.0"].contains(l), "negative zero tick {l:?}");
        assert!(!l.contains(".000"), "tick label not compact: {l:?}");
    }
}

#[test]
fn png_is_300_dpi_single_column_with_provenance_chunk() {
    let png = render_png(&demo_figure()).unwrap();
    let decoder = png::Decoder::new(png.as_slice());
    let mut reader = decoder.read_info().unwrap();
    let info = reader.info();
    // 8.5 cm at 300 dpi = 8.5 / 2.54 * 300 = 1004 pixels (common practice for single-column figures).
    assert_eq!(info.width, 1004);
    let dims = info.pixel_dims.expect("no pHYs chunk");
    assert_eq!(dims.xppu, 11811); // 300 dpi in pixels per metre
    let comment = info.uncompressed_latin1_text.iter().find(|t| t.keyword == "Comment").expect("no Comment chunk");
    assert_eq!(comment.text, PROVENANCE);
    let mut buf = vec![0; reader.output_buffer_size()];
    reader.next_frame(&mut buf).unwrap();
    let dark = buf.chunks(3).filter(|p| p.iter().all(|&c| c < 100)).count();
    assert!(dark > 5_000, "too few dark pixels ({dark}): text and axes missing?");
}

#[test]
fn pdf_embeds_font_and_provenance_and_renders() {
    let pdf = render_pdf(&demo_figure()).unwrap();
    assert!(pdf.starts_with(b"%PDF"));
    let has = |needle: &[u8]| pdf.windows(needle.len()).any(|w| w == needle);
    assert!(has(b"/FontFile") || has(b"/FontDescriptor"), "PDF embeds no font");
    assert!(has(PROVENANCE.as_bytes()), "PDF document info lacks the provenance");
    // Page width 8.5 cm = 240.94 pt.
    assert!(has(b"/MediaBox [0 0 240.9"), "PDF page is not 8.5 cm wide");

    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("fig.pdf");
    std::fs::write(&path, &pdf).unwrap();
    if !have("pdftoppm") {
        eprintln!("note: pdftoppm (poppler-utils) not on PATH; skipping the PDF rendering check");
        return;
    }
    let out = dir.path().join("page");
    let st = Command::new("pdftoppm").args(["-png", "-r", "150", "-singlefile"]).arg(&path).arg(&out).status().unwrap();
    assert!(st.success(), "pdftoppm failed on our PDF");
    let bytes = std::fs::read(dir.path().join("page.png")).unwrap();
    let mut reader = png::Decoder::new(bytes.as_slice()).read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size()];
    let frame = reader.next_frame(&mut buf).unwrap();
    let channels = frame.color_type.samples();
    let dark = buf[..frame.buffer_size()].chunks(channels).filter(|p| p.iter().take(3).all(|&c| c < 100)).count();
    assert!(dark > 1_000, "rendered PDF page is (nearly) blank: {dark} dark pixels");
    if have("pdftotext") {
        let txt = Command::new("pdftotext").arg(&path).arg("-").output().unwrap();
        let txt = String::from_utf8_lossy(&txt.stdout);
        assert!(txt.contains("a/M") && txt.contains("V(a)"), "PDF text not extractable: {txt:?}");
    }
}

#[test]
fn nan_breaks_the_line_and_empty_series_are_fine() {
    let base = |y2: f64| Figure {
        x_label: "x".into(),
        y_label: "y".into(),
        series: vec![
            Series {
                label: "gap".into(),
                points: vec![(0.0, 0.0), (1.0, 1.0), (2.0, y2), (3.0, 0.0), (4.0, 1.0)],
                style: LineStyle::Solid,
                colour: 1,
            },
            Series { label: "empty".into(), points: vec![], style: LineStyle::Dashed, colour: 2 },
        ],
        provenance: "nan-gap".into(),
        ..Figure::default()
    };
    // Paths stroked in palette colour 1, vermillion #D55E00 (Okabe & Ito 2008).
    let count = |svg: &str| {
        svg.split("<path").skip(1).filter(|el| el.split("/>").next().unwrap_or("").contains("#d55e00")).count()
    };
    let whole = render_svg(&base(0.5)).unwrap();
    let gapped = render_svg(&base(f64::NAN)).unwrap();
    // One path for the curve plus one legend sample, against two curve pieces plus the sample.
    assert_eq!(count(&whole), 2, "unbroken curve should be one path (plus its legend sample)");
    assert_eq!(count(&gapped), 3, "a NaN must split the curve into two paths");
}

#[test]
fn write_figure_writes_three_files() {
    let dir = tempfile::tempdir().unwrap();
    let paths = write_figure(&demo_figure(), &dir.path().join("figs"), "potential").unwrap();
    let names: Vec<String> = paths.iter().map(|p| p.file_name().unwrap().to_string_lossy().into_owned()).collect();
    assert_eq!(names, ["potential.svg", "potential.pdf", "potential.png"]);
    for p in &paths {
        assert!(std::fs::metadata(p).unwrap().len() > 1000, "{} is tiny", p.display());
    }
}

#[test]
fn dense_category_map_stays_small_in_svg_and_pdf() {
    let (nx, ny) = (300usize, 200usize);
    let cells: Vec<u8> = (0..nx * ny).map(|i| ((i % nx) * 3 / nx + (i / nx) * 2 / ny) as u8).collect();
    let fig = Figure {
        x_label: "a/M".into(),
        y_label: "β²".into(),
        categories: Some(CategoryMap {
            x: (2.0, 10.0, nx),
            y: (-2.0, 2.0, ny),
            cells,
            categories: vec![("none".into(), 6), ("unstable".into(), 1), ("stable".into(), 0), ("both".into(), 2)],
        }),
        series: vec![Series {
            label: "β²_crit".into(),
            points: (0..200).map(|i| 3.2 + 6.8 * i as f64 / 199.0).map(|a| (a, 1.0 - 4.0 / a)).collect(),
            style: LineStyle::Solid,
            colour: 6,
        }],
        provenance: PROVENANCE.into(),
        ..Figure::default()
    };
    let svg = render_svg(&fig).unwrap();
    assert_eq!(svg.matches("<image").count(), 1, "the map must be one embedded bitmap");
    assert!(svg.len() < 200_000, "SVG with a {nx}x{ny} map is {} bytes", svg.len());
    let pdf = render_pdf(&fig).unwrap();
    assert!(pdf.windows(13).any(|w| w == b"/Subtype /Ima"), "the PDF dropped the embedded bitmap");
    assert!(pdf.len() < 300_000, "PDF is {} bytes", pdf.len());
}
