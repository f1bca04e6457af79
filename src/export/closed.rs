//! Closed-form junction quantities prepared for every output form: each quantity rendered as text, SymPy and
//! one-line LaTeX ([`render_all`]), the header lines, and the LaTeX layout (`--width`, numbering). The
//! formats themselves are in `text.rs`, `latex.rs`, `sympy.rs` and `json.rs`.

use crate::algebra::display::Disp;
use crate::algebra::render::{self, Names};
use crate::algebra::{RatFun, Shower};
use crate::junction::closed::{ClosedForms, ClosedState};
use crate::model::ShellKind;
use crate::scenario::Symbols;
use serde::Serialize;

/// Width of one journal column (8.5 cm) in TeX points.
pub const COLUMN_PT: f64 = 8.5 / 2.54 * 72.27;
/// Width of a full page of text (17 cm) in TeX points.
pub const PAGE_PT: f64 = 17.0 / 2.54 * 72.27;

/// A LaTeX text width (`--width`): `column` (8.5 cm), `page` (17 cm) or centimetres, into TeX points.
pub fn parse_width(w: &str) -> crate::Result<f64> {
    use crate::{error::ErrorKind, phrase, RequestField::Width};
    match w {
        "column" => Ok(COLUMN_PT),
        "page" => Ok(PAGE_PT),
        other => {
            let cm: f64 = other.trim_end_matches("cm").parse().map_err(|_| {
                let message = phrase![Width, format!(" {other}: not `column`, `page` or a width in cm")];
                crate::Error::request(ErrorKind::Input, Width, other, message).with_hint_phrase(phrase![
                    "e.g. ",
                    Width,
                    " column, ",
                    Width,
                    " page, ",
                    Width,
                    " 12.5"
                ])
            })?;
            if !(cm.is_finite() && (3.0..=100.0).contains(&cm)) {
                let message = phrase![Width, format!(" {other}: a text width between 3 and 100 cm is expected")];
                return Err(crate::Error::request(ErrorKind::Input, Width, other, message));
            }
            Ok(cm / 2.54 * 72.27)
        }
    }
}

/// How the LaTeX is laid out.
#[derive(Debug, Clone, Copy)]
pub struct LatexLayout {
    /// The text width the equations must fit, in TeX points.
    pub width_pt: f64,
    /// `align` with one number per quantity (true) or `align*` (false).
    pub numbered: bool,
}

impl Default for LatexLayout {
    fn default() -> Self {
        LatexLayout { width_pt: COLUMN_PT, numbered: true }
    }
}

/// One quantity in every output form.
#[derive(Debug, Clone, Serialize)]
pub struct Rendered {
    /// Identifier (SymPy variable name).
    pub id: String,
    /// Left-hand side, plain text.
    pub lhs: String,
    /// Left-hand side, LaTeX.
    pub lhs_latex: String,
    /// Right-hand side in junctura's expression syntax.
    pub text: String,
    /// Right-hand side as SymPy source.
    pub sympy: String,
    /// Right-hand side in LaTeX (one line).
    pub latex: String,
    /// Number of operators of the printed form.
    pub operators: usize,
    #[serde(skip)]
    pub(super) disp: Disp,
    #[serde(skip)]
    pub(super) value: RatFun,
}

/// Python keywords and names the SymPy output itself uses: a parameter with such a name gets a trailing `_`
/// as its Python variable (the SymPy symbol keeps the name).
const RESERVED: [&str; 22] = [
    "lambda", "def", "class", "for", "in", "is", "if", "else", "not", "and", "or", "from", "import", "as", "with",
    "sqrt", "pi", "exp", "log", "sign", "Abs", "symbols",
];

pub(super) fn py_name(name: &str) -> String {
    if RESERVED.contains(&name) || matches!(name, "a" | "R" | "sigma" | "Rdot" | "Rddot" | "Rp" | "Rpp") {
        format!("{name}_")
    } else {
        name.to_string()
    }
}

/// Names of the atoms: the radius as `a` or `R`, parameters by the `[symbols]` table in LaTeX.
pub fn names(cf: &ClosedForms, symbols: &Symbols) -> Names {
    Names::new(&cf.alg, cf.radius, cf.radius, symbols, &py_name)
}

/// Render every quantity.
pub fn render_all(cf: &ClosedForms, symbols: &Symbols) -> Vec<Rendered> {
    let names = names(cf, symbols);
    let shower = Shower::new(&cf.alg, &cf.pool);
    cf.quantities
        .iter()
        .map(|q| {
            let d = shower.rat(&q.value);
            Rendered {
                id: q.id.clone(),
                lhs: q.text_lhs.clone(),
                lhs_latex: q.latex_lhs.clone(),
                text: render::text(&d, &names),
                sympy: render::sympy(&d, &names),
                latex: render::latex(&d, &names),
                operators: d.ops(),
                disp: d,
                value: q.value.clone(),
            }
        })
        .collect()
}

/// The comment lines that go with the formulas: state, conventions and notes.
pub fn header_lines(cf: &ClosedForms) -> Vec<String> {
    let state = match (cf.state, cf.kind) {
        (ClosedState::Static, ShellKind::Timelike) => "static timelike shell at radius a",
        (ClosedState::Static, ShellKind::Spacelike) => "static spacelike surface r = R",
        (ClosedState::Moving, ShellKind::Timelike) => "moving timelike shell R(tau)",
        (ClosedState::Moving, ShellKind::Spacelike) => "spacelike shell R(l)",
    };
    let mut v = vec![format!(
        "closed forms, {state}, D = {}; G = c = 1, sigma = -S^tau_tau, p = S^theta_theta, parameters symbolic",
        cf.dimension
    )];
    v.extend(cf.notes.iter().cloned());
    v
}
