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
