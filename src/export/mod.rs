//! Pure renderers: results in, text bytes out, one file per output format. Nothing here writes files (see
//! `output`, and `files` for the folders of `report` and `map`).
//!
//! Every result a command prints is an [`Item`]; every output format is a [`Format`] with one [`Renderer`]
//! in its own file (`text.rs`, `csv.rs`, `json.rs`, `latex.rs`, `markdown.rs`, `sympy.rs`). [`render`] picks
//! the renderer; a format that does not offer an item is an input error, not a panic. Adding a format is one
//! new file with a `Renderer`, one [`Format`] variant and its name (DEVELOPERS.md, "Adding an output format").
//!
//! ```
//! use junctura::export::{render, Format, Item};
//! use junctura::scenario::Scenario;
//! let s = Scenario::parse(
//!     "name = \"w\"\n[parameters]\nm = 1.0\nw = -0.75\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n\
//!      [plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[shell]\npressure = \"w*sigma\"\n",
//!     None,
//! )
//! .unwrap();
//! let st = junctura::statics::find_static_radii(&s, 2.5, 10.0, &Default::default()).unwrap();
//! let table = render(Format::Markdown, &Item::Statics(&st)).unwrap();
//! assert!(table.contains("| a0 [M] |"));
//! assert!(render(Format::Sympy, &Item::Statics(&st)).is_err());
//! ```

pub mod closed;
pub mod csv;
pub mod json;
pub mod latex;
pub mod map;
pub mod markdown;
pub mod sympy;
pub mod text;

use crate::dynamics::EvolveReport;
use crate::geodesic::{ChainReport, CrossingReport};
use crate::junction::closed::ClosedForms;
use crate::report::derive::DeriveReport;
use crate::scenario::{Scenario, Symbols};
use crate::statics::sweep::SweepReport;
use crate::statics::tune::TuneReport;
use crate::statics::StaticsReport;
use crate::survey::SurveyReport;
use closed::LatexLayout;

/// A number with 6 significant digits, as the LaTeX and Markdown tables print it ([`short`]).
pub(crate) enum Short {
    /// NaN or infinite.
    NotFinite,
    /// Zero or 1e-3 <= |x| < 1e5: fixed notation, trailing zeros dropped, never `-0`.
    Fixed(String),
    /// Otherwise: the decimal exponent, for the format's own scientific notation.
    Scientific(i32),
}

/// The short form of `x` shared by [`latex_num`] and [`markdown::md_num`].
pub(crate) fn short(x: f64) -> Short {
    if !x.is_finite() {
        return Short::NotFinite;
    }
    if x == 0.0 {
        return Short::Fixed("0".into());
    }
    let e = x.abs().log10().floor() as i32;
    if !(-3..5).contains(&e) {
        return Short::Scientific(e);
    }
    let s = format!("{:.*}", (5 - e).clamp(0, 8) as usize, x);
    match trim_zeros(&s) {
        "-0" => Short::Fixed("0".into()),
        t => Short::Fixed(t.to_string()),
    }
}

/// `s` without the trailing zeros of its fraction (and without the point when nothing is left after it).
pub(crate) fn trim_zeros(s: &str) -> &str {
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.')
    } else {
        s
    }
}

pub use crate::text::num;
pub use latex::latex_num;

/// An output format: the values of every command's `--format`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Format {
    /// Readable summary.
    Text,
    /// Pretty-printed JSON: one object.
    Json,
    /// CSV: provenance comment lines, a header line with units, one row per point.
    Csv,
    /// LaTeX: formulas (amsmath) or tables (booktabs).
    Latex,
    /// Markdown tables for notes.
    Markdown,
    /// A Python/SymPy snippet.
    Sympy,
}

impl Format {
    /// Every format, in the order `--help` lists them.
    pub const ALL: [Format; 6] =
        [Format::Text, Format::Json, Format::Latex, Format::Csv, Format::Markdown, Format::Sympy];

    /// The name on the command line (`--format NAME`).
    pub fn name(self) -> &'static str {
        match self {
            Format::Text => "text",
            Format::Json => "json",
            Format::Csv => "csv",
            Format::Latex => "latex",
            Format::Markdown => "markdown",
            Format::Sympy => "sympy",
        }
    }

    /// The format called `name`, if any.
    pub fn parse(name: &str) -> Option<Format> {
        Format::ALL.into_iter().find(|f| f.name() == name)
    }

    /// One line for `--help` (no final period, as clap prints its own help lines).
    pub fn help(self) -> &'static str {
        match self {
            Format::Text => "Readable summary",
            Format::Json => "One JSON object on stdout",
            Format::Csv => "CSV: a provenance comment line, a header line with units, one row per point",
            Format::Latex => "LaTeX: formulas (amsmath) or a table (booktabs)",
            Format::Markdown => "A Markdown table for notes",
            Format::Sympy => "A Python/SymPy snippet: symbols declared, one assignment per quantity",
        }
    }

    /// The renderer of this format.
    pub fn renderer(self) -> &'static dyn Renderer {
        match self {
            Format::Text => &text::Text,
            Format::Json => &json::Json,
            Format::Csv => &csv::Csv,
            Format::Latex => &latex::Latex,
            Format::Markdown => &markdown::Markdown,
            Format::Sympy => &sympy::Sympy,
        }
    }
}

impl std::fmt::Display for Format {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}

/// A result to render, with what its renderers need besides the result struct.
#[derive(Debug, Clone, Copy)]
pub enum Item<'a> {
    /// `check`: both sides' horizons, regions, photon orbits.
    Survey(&'a SurveyReport),
    /// `derive`: junction quantities at one state; LaTeX prints the closed forms of `scenario` for `layout`.
    Derive {
        /// The values.
        report: &'a DeriveReport,
        /// The scenario they came from (its closed forms and symbols).
        scenario: &'a Scenario,
        /// LaTeX layout of the closed forms.
        layout: LatexLayout,
    },
    /// `closed-form`: the exact closed forms.
    ClosedForms {
        /// The forms.
        forms: &'a ClosedForms,
        /// LaTeX names of the parameters.
        symbols: &'a Symbols,
        /// Provenance line.
        provenance: &'a str,
        /// LaTeX layout.
        layout: LatexLayout,
    },
    /// `statics`: the static radii of a law.
    Statics(&'a StaticsReport),
    /// `tune`: parameter values that put a static shell where asked.
    Tune(&'a TuneReport),
    /// `sweep`: branches of static radii.
    Sweep(&'a SweepReport),
    /// `evolve`: the nonlinear motion (CSV: the time series; JSON: the summary).
    Evolve(&'a EvolveReport),
    /// `geodesic`: one crossing.
    Crossing(&'a CrossingReport),
    /// `chain`: crossings over a chain of shells.
    Chain(&'a ChainReport),
}

impl Item<'_> {
    /// The command that prints this item, for messages.
    pub fn command(&self) -> &'static str {
        match self {
            Item::Survey(_) => "check",
            Item::Derive { .. } => "derive",
            Item::ClosedForms { .. } => "closed-form",
            Item::Statics(_) => "statics",
            Item::Tune(_) => "tune",
            Item::Sweep(_) => "sweep",
            Item::Evolve(_) => "evolve",
            Item::Crossing(_) => "geodesic",
            Item::Chain(_) => "chain",
        }
    }
}

/// One output format.
pub trait Renderer {
    /// `item` in this format, or `None` where the format does not offer it.
    fn render(&self, item: &Item<'_>) -> Option<String>;
}

/// `item` in `format`; an input error naming the formats that do offer it when `format` does not.
pub fn render(format: Format, item: &Item<'_>) -> crate::Result<String> {
    format.renderer().render(item).ok_or_else(|| {
        let offered: Vec<&str> =
            Format::ALL.into_iter().filter(|f| f.renderer().render(item).is_some()).map(Format::name).collect();
        let message =
            crate::phrase![crate::RequestField::Format, format!(" {format}: `{}` does not offer it", item.command())];
        crate::Error::request(crate::ErrorKind::Input, crate::RequestField::Format, format, message)
            .with_hint(format!("use one of: {}", offered.join(", ")))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Six significant digits (common practice for tables), both table formats' notations from one rule.
    #[test]
    fn short_numbers_agree_between_latex_and_markdown() {
        // Rounded by hand to 6 significant digits (common practice; none of these is a tie).
        for (x, fixed) in
            [(0.0012345678, "0.00123457"), (-3.0638123456, "-3.06381"), (99999.4, "99999.4"), (2.5, "2.5")]
        {
            assert!(matches!(short(x), Short::Fixed(ref s) if s == fixed), "{x}");
            assert_eq!(latex_num(x), fixed);
            assert_eq!(markdown::md_num(x), fixed);
        }
        assert!(matches!(short(0.0), Short::Fixed(ref s) if s == "0"));
        assert!(matches!(short(-0.0), Short::Fixed(ref s) if s == "0"));
        // Outside 1e-3 <= |x| < 1e5: the decimal exponent (common practice).
        assert!(matches!(short(123456.0), Short::Scientific(5)));
        assert!(matches!(short(-0.000123456789), Short::Scientific(-4)));
        assert_eq!(latex_num(123456.0), "1.23456\\times 10^{5}");
        assert_eq!(markdown::md_num(123456.0), "1.23456e5");
        assert!(matches!(short(f64::INFINITY), Short::NotFinite));
        assert_eq!(trim_zeros("1.50000"), "1.5");
        assert_eq!(trim_zeros("2.000"), "2");
        assert_eq!(trim_zeros("100"), "100");
    }
}
