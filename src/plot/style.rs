//! Look of the figures: the two styles (journal: serif STIX text, ticks inside on all four sides; classic:
//! DejaVu Sans, ticks outside), the colour palette, the embedded fonts and the tick-label formatter.

use crate::error::Error;

/// Family name of the embedded STIX General (serif, Times-like text that matches LaTeX documents set in
/// Times/STIX, SIL Open Font License 1.1, `assets/fonts/`), as registered in the font database.
pub(crate) const SERIF_FAMILY: &str = "STIXGeneral";
/// Family name of the embedded DejaVu Sans (the `classic` look and the fallback for missing glyphs).
pub(crate) const SANS_FAMILY: &str = "DejaVu Sans";
/// The STIX General regular font file, embedded in the binary.
pub(crate) const SERIF_FONT: &[u8] = include_bytes!("../../assets/fonts/STIXGeneral-Regular.otf");

/// Raster resolution of the PNG output, dots per inch.
pub(crate) const PNG_DPI: f64 = 300.0;

/// Sizes and choices of one look. Lengths in printer's points.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Style {
    /// Font family written into the SVG.
    pub family: &'static str,
    /// Axis labels, panel titles.
    pub label_pt: f64,
    /// Tick labels.
    pub tick_pt: f64,
    /// Legend, annotations, notes.
    pub legend_pt: f64,
    /// Curves, frame, reference lines.
    pub curve_pt: f64,
    pub frame_pt: f64,
    pub ref_pt: f64,
    /// Marker radius.
    pub marker_pt: f64,
    /// Major tick length; ticks point into the plot when `ticks_inside`.
    pub tick_len: f64,
    pub ticks_inside: bool,
    /// Ticks on all four sides (else left and bottom only).
    pub ticks_all_sides: bool,
    /// Frame the legend.
    pub legend_frame: bool,
}

impl Style {
    /// The style of a look.
    pub(crate) fn of(name: super::StyleName) -> Style {
        match name {
            super::StyleName::Journal => Style {
                family: SERIF_FAMILY,
                label_pt: 9.0,
                tick_pt: 8.0,
                legend_pt: 7.5,
                curve_pt: 1.0,
                frame_pt: 0.6,
                ref_pt: 0.6,
                marker_pt: 2.2,
                tick_len: 3.5,
                ticks_inside: true,
                ticks_all_sides: true,
                legend_frame: false,
            },
            super::StyleName::Classic => Style {
                family: SANS_FAMILY,
                label_pt: 8.5,
                tick_pt: 7.5,
                legend_pt: 7.0,
                curve_pt: 1.0,
                frame_pt: 0.6,
                ref_pt: 0.6,
                marker_pt: 2.2,
                tick_len: 3.0,
                ticks_inside: false,
                ticks_all_sides: false,
                legend_frame: true,
            },
        }
    }
}

/// The Okabe-Ito colour-blind-safe palette (Okabe & Ito 2008, "Color Universal Design", eight colours),
/// reordered so that the first colours differ most in lightness and stay apart in greyscale: blue,
/// vermillion, bluish green, reddish purple, orange, sky blue, black, yellow. `colour` indices wrap.
pub(crate) const PALETTE: [(u8, u8, u8); 8] = [
    (0x00, 0x72, 0xB2),
    (0xD5, 0x5E, 0x00),
    (0x00, 0x9E, 0x73),
    (0xCC, 0x79, 0xA7),
    (0xE6, 0x9F, 0x00),
    (0x56, 0xB4, 0xE9),
    (0x00, 0x00, 0x00),
    (0xF0, 0xE4, 0x42),
];

/// Grey for reference lines and their labels.
pub(crate) const GREY: (u8, u8, u8) = (0x77, 0x77, 0x77);

/// Colour of palette entry `i` (wrapping).
pub(crate) fn colour(i: usize) -> (u8, u8, u8) {
    PALETTE[i % PALETTE.len()]
}

/// Share of white mixed into each palette colour for category-map fills, chosen so that the first four
/// fills are far apart in lightness (about 121, 166, 212 and 238 on a 0-255 luma scale) and stay
/// distinguishable in a greyscale print, while overlaid black or coloured curves remain visible.
const CATEGORY_WHITE: [f64; 8] = [0.45, 0.7, 0.0, 0.85, 0.15, 0.35, 0.55, 0.0];

/// Fill colour of category colour index `i` of a map (palette colour mixed with white, wrapping).
pub(crate) fn category_fill(i: usize) -> (u8, u8, u8) {
    let white = CATEGORY_WHITE[i % PALETTE.len()];
    let (r, g, b) = colour(i);
    let mix = |c: u8| (c as f64 + (255.0 - c as f64) * white).round() as u8;
    (mix(r), mix(g), mix(b))
}

/// An error for a figure that could not be drawn or encoded (treated as an I/O-class failure: no output is
/// written).
pub(crate) fn render_error(msg: impl Into<String>) -> Error {
    Error::io_msg(format!("drawing the figure failed: {}", msg.into()))
        .with_hint("this is a problem with the figure renderer, not with your scenario; please report it")
}

/// Compact tick label: `decimals` places, trailing zeros removed, never `-0`; very large or small
/// magnitudes in short scientific form (`2e-05` becomes `2e-5`).
pub(crate) fn tick_label(v: f64, decimals: usize) -> String {
    let scale = 10f64.powi(decimals as i32);
    let v = if (v * scale).round() == 0.0 { 0.0 } else { v };
    if v != 0.0 && (v.abs() >= 1e5 || v.abs() < 1e-4) {
        return compact_exponent(&format!("{v:e}"));
    }
    let mut s = format!("{:.*}", decimals, v);
    if s.contains('.') {
        s = s.trim_end_matches('0').trim_end_matches('.').to_string();
    }
    if s == "-0" {
        s = "0".into();
    }
    s.replace('-', "\u{2212}")
}

/// Shorten Rust's `{:e}` output: mantissa to four significant digits, e.g. `1.2345678e5` -> `1.235e5`.
fn compact_exponent(s: &str) -> String {
    let (m, e) = s.split_once('e').unwrap_or((s, "0"));
    let m: f64 = m.parse().unwrap_or(0.0);
    let mut ms = format!("{m:.3}");
    ms = ms.trim_end_matches('0').trim_end_matches('.').to_string();
    format!("{ms}e{e}").replace('-', "\u{2212}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tick_labels_are_compact_and_never_negative_zero() {
        assert_eq!(tick_label(-0.0, 1), "0");
        assert_eq!(tick_label(-1e-17, 2), "0");
        assert_eq!(tick_label(2.50, 2), "2.5");
        assert_eq!(tick_label(3.0, 1), "3");
        assert_eq!(tick_label(-0.25, 2), "\u{2212}0.25");
        assert_eq!(tick_label(150000.0, 0), "1.5e5");
        assert_eq!(tick_label(2e-5, 6), "2e\u{2212}5");
    }

    /// Luma with ITU-R BT.709 weights on the encoded values (common practice for a greyscale estimate).
    fn luma((r, g, b): (u8, u8, u8)) -> f64 {
        0.2126 * r as f64 + 0.7152 * g as f64 + 0.0722 * b as f64
    }

    fn min_pairwise_gap(l: &[f64]) -> f64 {
        let mut gap = f64::INFINITY;
        for i in 0..l.len() {
            for j in 0..i {
                gap = gap.min((l[i] - l[j]).abs());
            }
        }
        gap
    }

    #[test]
    fn palette_entries_differ_in_greyscale() {
        // Line colours: the first four differ somewhat in luma; line styles carry the rest.
        let lines: Vec<f64> = (0..4).map(|i| luma(colour(i))).collect();
        assert!(min_pairwise_gap(&lines) > 5.0, "line colours too close in greyscale: {lines:?}");
        // Map fills have no second cue, so the first four must be well apart.
        let fills: Vec<f64> = (0..4).map(|i| luma(category_fill(i))).collect();
        assert!(min_pairwise_gap(&fills) > 20.0, "map fills too close in greyscale: {fills:?}");
    }
}
