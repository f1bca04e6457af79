//! Look of the figures: the colour palette, sizes in printer's points, dash patterns, the embedded font and
//! the tick-label formatter.

use crate::error::{Error, ErrorKind, Result};
use std::sync::OnceLock;

/// Font family name under which the embedded DejaVu Sans is registered with the drawing library and looked
/// up by the SVG-to-PDF converter.
pub(crate) const FONT_FAMILY: &str = "DejaVu Sans";

/// Figure width: one journal column, 8.5 cm, in printer's points (1 in = 72 pt = 2.54 cm).
pub(crate) const WIDTH_PT: f64 = 8.5 / 2.54 * 72.0;
/// Figure height in points (aspect 3:4, so two figures stack in a column).
pub(crate) const HEIGHT_PT: f64 = WIDTH_PT * 0.75;
/// Raster resolution of the PNG output, dots per inch.
pub(crate) const PNG_DPI: f64 = 300.0;
/// Device pixels per point in the SVG (and so the PDF): plotters snaps to whole pixels, so the vector
/// outputs are drawn on a 4x finer grid than points and scaled back by the SVG's physical size.
pub(crate) const SVG_PX_PER_PT: f64 = 4.0;

/// Font sizes (em, points): axis labels and title, tick labels, legend and annotations.
pub(crate) const LABEL_PT: f64 = 8.5;
pub(crate) const TICK_PT: f64 = 7.5;
pub(crate) const LEGEND_PT: f64 = 7.0;
/// Stroke widths in points: curves, axes frame, reference lines.
pub(crate) const CURVE_PT: f64 = 1.0;
pub(crate) const FRAME_PT: f64 = 0.6;
pub(crate) const REF_PT: f64 = 0.6;
/// Marker radius in points.
pub(crate) const MARKER_PT: f64 = 2.2;

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

/// Register DejaVu Sans (bundled with the program, so no system fonts are needed) with the drawing
/// library, once per process. Returns an error if the font bytes are rejected.
pub(crate) fn ensure_font() -> Result<()> {
    static REGISTERED: OnceLock<std::result::Result<(), String>> = OnceLock::new();
    REGISTERED
        .get_or_init(|| {
            plotters::style::register_font(FONT_FAMILY, plotters::style::FontStyle::Normal, dejavu::sans::regular())
                .map_err(|_| "the bundled DejaVu Sans font could not be parsed".to_string())
        })
        .clone()
        .map_err(render_error)
}

/// An error for a figure that could not be drawn or encoded (treated as an I/O-class failure: no output is
/// written).
pub(crate) fn render_error(msg: impl Into<String>) -> Error {
    Error {
        kind: ErrorKind::Io,
        message: format!("drawing the figure failed: {}", msg.into()),
        hint: Some("this is a problem with the figure renderer, not with your scenario; please report it".into()),
    }
}

/// Number of decimals that tick labels on an axis spanning `span` need, for about six ticks.
pub(crate) fn tick_decimals(span: f64) -> usize {
    if span.is_nan() || span <= 0.0 || !span.is_finite() {
        return 2;
    }
    // One decimal more than the step's leading digit needs, so steps like 0.25 print in full; trailing
    // zeros are trimmed by `tick_label`.
    let step = span / 6.0;
    (1 - step.log10().floor() as i64).clamp(0, 8) as usize
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

    #[test]
    fn decimals_follow_the_span() {
        assert_eq!(tick_decimals(10.0), 1);
        assert_eq!(tick_decimals(60.0), 0);
        assert_eq!(tick_decimals(0.06), 3);
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
