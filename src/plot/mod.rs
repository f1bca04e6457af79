//! Paper-ready figures: a plain [`Figure`] description in, SVG text, PNG bytes or PDF bytes out.
//!
//! Two looks ([`StyleName`]): `journal` (serif text in the embedded STIX General, which matches LaTeX
//! documents set in Times/STIX; ticks inside on all four sides) and `classic` (the embedded DejaVu Sans,
//! ticks outside on the left and bottom). Both embed their fonts: no system fonts are used. Width (one
//! column 8.5 cm, two columns 17.8 cm, or any), aspect, log axes and the legend position are in [`Look`].
//! Curves use the colour-blind-safe Okabe-Ito palette and dash patterns that keep them apart in greyscale;
//! dashes are real dash patterns (`stroke-dasharray` in the SVG, the dash operator in the PDF). A dense 2-D
//! map of categories is embedded as one bitmap under vector axes and curves.
//!
//! Layout is computed in points before drawing ([`layout`]): every text box and every data line is known,
//! so labels are put where they hide nothing and tests can check that. Every output carries the figure's
//! provenance line: an XML comment and `<metadata>` in the SVG, the document information in the PDF, a
//! `tEXt` chunk in the PNG.
//!
//! The renderers are pure; [`write_figure`] and [`write_panels`] are the helpers that write files
//! (`stem.svg`, `stem.pdf`, `stem.png`), through [`crate::output::write_atomic`].
//!
//! ```
//! use junctura::plot::{render_svg, Figure, LineStyle, Marker, RefLine, Series};
//! let m = 1.0;
//! // V(a) = 1 - 2M/a for a Schwarzschild thin-shell wormhole with a static sigma, just as a curve to draw.
//! let pts: Vec<(f64, f64)> = (0..200).map(|i| 2.0 + 8.0 * i as f64 / 199.0).map(|a| (a, 1.0 - 2.0 * m / a)).collect();
//! let fig = Figure {
//!     x_label: "a/M".into(),
//!     y_label: "V(a)".into(),
//!     series: vec![Series { label: "V".into(), points: pts, style: LineStyle::Solid, colour: 0 }],
//!     markers: vec![Marker { x: 3.0, y: 1.0 / 3.0, label: "a₀".into(), filled: false, colour: 1 }],
//!     ref_lines: vec![RefLine::vertical(2.0 * m, "horizon")],
//!     provenance: "example; m = 1".into(),
//!     ..Figure::default()
//! };
//! let svg = render_svg(&fig).unwrap();
//! assert!(svg.contains("a/M") && svg.contains("V(a)") && svg.contains("example; m = 1"));
//! ```

// Drawing needs the `figures` feature (fonts, SVG rasteriser, PDF writer). Without it the figure descriptions
// stay and `unsupported.rs` stands in for `draw.rs`: every function that would draw returns an error saying so.
#[cfg(feature = "figures")]
mod draw;
#[cfg(not(feature = "figures"))]
#[path = "unsupported.rs"]
mod draw;
#[cfg(feature = "figures")]
mod encode;
#[cfg_attr(not(feature = "figures"), allow(dead_code))]
mod geom;
#[cfg(feature = "figures")]
mod pdf_canon;
#[cfg(feature = "figures")]
mod raster;
#[cfg(feature = "figures")]
mod scene;
#[cfg(feature = "figures")]
mod style;
#[cfg(feature = "figures")]
mod text;
#[cfg(feature = "figures")]
mod window;

pub use draw::*;
pub use geom::contour_segments;

/// The look of a figure: style, size, log axes, legend position.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Look {
    /// Fonts, sizes, tick direction.
    pub style: StyleName,
    /// Width in cm (one journal column: 8.5, two columns: 17.8).
    pub width_cm: f64,
    /// Height / width of the canvas (of each panel's share in a grid).
    pub aspect: f64,
    /// Logarithmic horizontal axis.
    pub log_x: bool,
    /// Logarithmic vertical axis.
    pub log_y: bool,
    /// Where the legend goes.
    pub legend: LegendPos,
    /// Fill opacity of bands (lower it where many bands overlap).
    pub band_opacity: f64,
}

impl Default for Look {
    fn default() -> Self {
        Look {
            style: StyleName::Classic,
            width_cm: 8.5,
            aspect: 0.75,
            log_x: false,
            log_y: false,
            legend: LegendPos::Auto,
            band_opacity: 0.25,
        }
    }
}

/// Figure control given by the user (command-line options): each `Some` / `true` overrides what the figure
/// would otherwise use. Applied to every figure a command writes.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct FigureOptions {
    /// Style.
    pub style: Option<StyleName>,
    /// Width in cm.
    pub width_cm: Option<f64>,
    /// Height / width.
    pub aspect: Option<f64>,
    /// Horizontal axis limits.
    pub x_limits: Option<(f64, f64)>,
    /// Vertical axis limits.
    pub y_limits: Option<(f64, f64)>,
    /// Logarithmic horizontal axis (not applied to maps).
    pub log_x: bool,
    /// Logarithmic vertical axis (not applied to maps).
    pub log_y: bool,
    /// Horizontal axis label.
    pub x_label: Option<String>,
    /// Vertical axis label.
    pub y_label: Option<String>,
    /// Legend position.
    pub legend: Option<LegendPos>,
}

impl FigureOptions {
    /// The look these options give, starting from `default_style`.
    pub fn look(&self, default_style: StyleName) -> Look {
        let d = Look::default();
        Look {
            style: self.style.unwrap_or(default_style),
            width_cm: self.width_cm.unwrap_or(d.width_cm),
            aspect: self.aspect.unwrap_or(d.aspect),
            log_x: self.log_x,
            log_y: self.log_y,
            legend: self.legend.unwrap_or(d.legend),
            band_opacity: d.band_opacity,
        }
    }

    /// Apply the options to `fig` (log axes only to figures without a category map).
    pub fn apply(&self, fig: &mut Figure, default_style: StyleName) {
        let mut look = Look { band_opacity: fig.look.band_opacity, ..self.look(default_style) };
        if fig.categories.is_some() {
            look.log_x = false;
            look.log_y = false;
        }
        fig.look = look;
        if let Some(r) = self.x_limits {
            fig.x_range = Some(r);
        }
        if let Some(r) = self.y_limits {
            fig.y_range = Some(r);
        }
        if let Some(l) = &self.x_label {
            fig.x_label = l.clone();
        }
        if let Some(l) = &self.y_label {
            fig.y_label = l.clone();
        }
    }
}

/// The two looks.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum StyleName {
    /// Serif text (STIX General), ticks inside on all four sides, unframed legend.
    Journal,
    /// Sans-serif text (DejaVu Sans), ticks outside on the left and bottom, framed legend.
    #[default]
    Classic,
}

impl StyleName {
    /// Parse `journal` or `classic`.
    pub fn parse(s: &str) -> Option<StyleName> {
        match s {
            "journal" => Some(StyleName::Journal),
            "classic" => Some(StyleName::Classic),
            _ => None,
        }
    }
}

/// Legend position.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum LegendPos {
    /// Inside the plot where it covers no data, else above the plot.
    #[default]
    Auto,
    /// Inside, upper right corner.
    UpperRight,
    /// Inside, upper left corner.
    UpperLeft,
    /// Inside, lower right corner.
    LowerRight,
    /// Inside, lower left corner.
    LowerLeft,
    /// Above the plot, in rows.
    Above,
    /// No legend.
    None,
}

impl LegendPos {
    /// Parse `auto`, `upper-right`, `upper-left`, `lower-right`, `lower-left`, `above` or `none`.
    pub fn parse(s: &str) -> Option<LegendPos> {
        Some(match s {
            "auto" => LegendPos::Auto,
            "upper-right" => LegendPos::UpperRight,
            "upper-left" => LegendPos::UpperLeft,
            "lower-right" => LegendPos::LowerRight,
            "lower-left" => LegendPos::LowerLeft,
            "above" => LegendPos::Above,
            "none" => LegendPos::None,
            _ => return None,
        })
    }
}

/// A figure: axes, curves, shaded bands, marked points, reference lines and an optional category map.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Figure {
    /// Optional title above the plot (papers usually put this in the caption instead).
    pub title: Option<String>,
    /// Horizontal axis label, physics notation in plain Unicode (e.g. "a/M", "β²").
    pub x_label: String,
    /// Vertical axis label.
    pub y_label: String,
    /// Horizontal range; None takes it from the category map if there is one, else from the data.
    pub x_range: Option<(f64, f64)>,
    /// Vertical range; None takes it from the category map if there is one, else from the data (with 5 %
    /// padding).
    pub y_range: Option<(f64, f64)>,
    /// Curves.
    pub series: Vec<Series>,
    /// Shaded regions.
    pub bands: Vec<Band>,
    /// Labelled points (filled or open).
    pub markers: Vec<Marker>,
    /// Dotted grey reference lines (horizons, V = 0, ...).
    pub ref_lines: Vec<RefLine>,
    /// A dense 2-D map of categories, drawn as one embedded bitmap under everything else.
    pub categories: Option<CategoryMap>,
    /// One line saying what produced the figure: scenario, hash, parameters, tool version.
    pub provenance: String,
    /// Notes printed under the plot (e.g. where a curve is clipped).
    pub notes: Vec<String>,
    /// Style, size, log axes, legend position.
    pub look: Look,
}

/// One curve. Points with a non-finite coordinate (NaN, ±inf) are gaps: the line breaks there.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Legend text; an empty label keeps the curve out of the legend.
    pub label: String,
    /// Points in data coordinates, in drawing order.
    pub points: Vec<(f64, f64)>,
    /// Dash pattern.
    pub style: LineStyle,
    /// Palette index (wraps around the eight palette colours).
    pub colour: usize,
}

/// Line dash pattern.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum LineStyle {
    /// Continuous line.
    #[default]
    Solid,
    /// Long dashes.
    Dashed,
    /// Short dots.
    Dotted,
    /// Alternating dash and dot.
    DashDot,
}

impl LineStyle {
    /// The i-th style of the cycle Solid, Dashed, DashDot, Dotted (pair it with palette index i so that
    /// curves differ both in colour and in pattern).
    pub fn cycle(i: usize) -> Self {
        [LineStyle::Solid, LineStyle::Dashed, LineStyle::DashDot, LineStyle::Dotted][i % 4]
    }

    #[cfg_attr(not(feature = "figures"), allow(dead_code))] // used by the encoders
    /// On/off lengths in points (empty: solid).
    pub(crate) fn pattern_pt(self) -> &'static [f64] {
        match self {
            LineStyle::Solid => &[],
            LineStyle::Dashed => &[4.0, 2.0],
            LineStyle::Dotted => &[1.0, 1.5],
            LineStyle::DashDot => &[4.0, 1.5, 1.0, 1.5],
        }
    }
}

/// A shaded region.
#[derive(Debug, Clone, PartialEq)]
pub enum Band {
    /// The full height of the plot between two x values (e.g. where a condition holds).
    XInterval {
        /// Legend text (empty: not in the legend).
        label: String,
        /// Left end.
        from: f64,
        /// Right end.
        to: f64,
        /// Palette index.
        colour: usize,
    },
    /// The region between two curves sampled at the same x: `(x, y_low, y_high)`; a non-finite entry
    /// breaks the band.
    Between {
        /// Legend text (empty: not in the legend).
        label: String,
        /// Samples `(x, y_low, y_high)`.
        points: Vec<(f64, f64, f64)>,
        /// Palette index.
        colour: usize,
    },
}

/// A labelled point, e.g. a static radius: filled for stable, open for unstable. Non-finite points are
/// skipped.
#[derive(Debug, Clone, PartialEq)]
pub struct Marker {
    /// x in data coordinates.
    pub x: f64,
    /// y in data coordinates.
    pub y: f64,
    /// Text written beside the point (may be empty).
    pub label: String,
    /// Filled disc (true) or open circle (false).
    pub filled: bool,
    /// Palette index.
    pub colour: usize,
}

/// Direction of a reference line.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Orientation {
    /// x = const.
    Vertical,
    /// y = const.
    Horizontal,
}

/// A reference line across the plot with a small label placed where it hides nothing (a horizon radius,
/// V = 0, ...): dotted grey unless given a colour and pattern.
#[derive(Debug, Clone, PartialEq)]
pub struct RefLine {
    /// Vertical (x = at) or horizontal (y = at).
    pub orientation: Orientation,
    /// Position in data coordinates.
    pub at: f64,
    /// Label written beside the line (may be empty).
    pub label: String,
    /// Palette index (None: grey).
    pub colour: Option<usize>,
    /// Dash pattern (None: fine dots).
    pub style: Option<LineStyle>,
}

impl RefLine {
    /// The line x = `at`.
    pub fn vertical(at: f64, label: impl Into<String>) -> Self {
        RefLine { orientation: Orientation::Vertical, at, label: label.into(), colour: None, style: None }
    }
    /// The line y = `at`.
    pub fn horizontal(at: f64, label: impl Into<String>) -> Self {
        RefLine { orientation: Orientation::Horizontal, at, label: label.into(), colour: None, style: None }
    }
    /// The same line in palette colour `colour` with dash pattern `style`.
    pub fn drawn(self, colour: usize, style: LineStyle) -> Self {
        RefLine { colour: Some(colour), style: Some(style), ..self }
    }
}

/// A dense map of categories on a regular grid, drawn as one bitmap.
#[derive(Debug, Clone, PartialEq)]
pub struct CategoryMap {
    /// x grid: (first cell's left edge, last cell's right edge, number of cells).
    pub x: (f64, f64, usize),
    /// y grid: (bottom edge, top edge, number of cells).
    pub y: (f64, f64, usize),
    /// Category index per cell, row-major: y index outer (row 0 at the bottom), x index inner.
    pub cells: Vec<u8>,
    /// Category names (for the legend) and palette indices, indexed by the cell values.
    pub categories: Vec<(String, usize)>,
}

#[cfg(all(test, feature = "figures"))]
mod tests {
    use super::window::plot_window;
    use super::*;
    use crate::error::ErrorKind;
    use std::path::Path;

    fn line(points: Vec<(f64, f64)>) -> Series {
        Series { label: "s".into(), points, style: LineStyle::Solid, colour: 0 }
    }

    #[test]
    fn window_fits_the_data_with_vertical_padding() {
        let fig = Figure { series: vec![line(vec![(0.0, 0.0), (1.0, f64::NAN), (2.0, 10.0)])], ..Figure::default() };
        let w = plot_window(&fig).unwrap();
        assert_eq!((w.x0, w.x1), (0.0, 2.0));
        assert_eq!((w.y0, w.y1), (-0.5, 10.5));
    }

    #[test]
    fn bad_ranges_and_maps_are_input_errors() {
        let fig = Figure { x_range: Some((1.0, 1.0)), series: vec![line(vec![(0.0, 0.0)])], ..Figure::default() };
        let e = plot_window(&fig).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Input);
        assert!(e.message.contains("x_range"));
        let map =
            CategoryMap { x: (0.0, 1.0, 2), y: (0.0, 1.0, 2), cells: vec![0, 0, 0], categories: vec![("a".into(), 0)] };
        let e = plot_window(&Figure { categories: Some(map.clone()), ..Figure::default() }).unwrap_err();
        assert!(e.message.contains("3 cells"), "{}", e.message);
        let map = CategoryMap { cells: vec![0, 1, 0, 0], ..map };
        let e = plot_window(&Figure { categories: Some(map), ..Figure::default() }).unwrap_err();
        assert!(e.message.contains("value 1"), "{}", e.message);
        let e = plot_window(&Figure { series: vec![line(vec![(f64::NAN, 1.0)])], ..Figure::default() }).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Input);
    }

    #[test]
    fn bad_stem_is_rejected_before_rendering() {
        let e = write_figure(&Figure::default(), Path::new("."), "a/b").unwrap_err();
        assert_eq!(e.kind, ErrorKind::Input);
    }
}
