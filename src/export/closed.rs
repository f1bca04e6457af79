//! Closed-form junction quantities as plain text, LaTeX (amsmath `align`, laid out for a column or page
//! width) and SymPy-parseable Python.

use crate::algebra::display::Disp;
use crate::algebra::render::{self, latex_lines, Names};
use crate::algebra::{RatFun, Shower};
use crate::junction::closed::{ClosedForms, ClosedState};
use crate::scenario::{ShellKind, Symbols};
use num_traits::Signed;
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
    disp: Disp,
    #[serde(skip)]
    value: RatFun,
}

/// Python keywords and names the SymPy output itself uses: a parameter with such a name gets a trailing `_`
/// as its Python variable (the SymPy symbol keeps the name).
const RESERVED: [&str; 22] = [
    "lambda", "def", "class", "for", "in", "is", "if", "else", "not", "and", "or", "from", "import", "as", "with",
    "sqrt", "pi", "exp", "log", "sign", "Abs", "symbols",
];

fn py_name(name: &str) -> String {
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

/// Plain text: one `lhs = rhs` line per quantity (the right-hand sides parse as junctura expressions).
pub fn text(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> String {
    let mut o = format!("# {provenance}\n");
    for h in header_lines(cf) {
        o.push_str(&format!("# {h}\n"));
    }
    for r in render_all(cf, symbols) {
        o.push_str(&format!("{} = {}\n", r.lhs, r.text));
    }
    o
}

/// Python: a SymPy snippet declaring the symbols and assigning each quantity.
pub fn sympy(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> String {
    let mut o = format!("# {provenance}\n");
    for h in header_lines(cf) {
        o.push_str(&format!("# {h}\n"));
    }
    o.push_str("from sympy import Abs, cos, cosh, exp, log, pi, sign, sin, sinh, sqrt, symbols, tan, tanh\n\n");
    // The radius is positive; parameters and state symbols are real.
    o.push_str(&format!("{r} = symbols('{r}', positive=True)\n", r = cf.radius));
    let mut vars: Vec<(String, String)> = cf.alg.param_names.iter().map(|p| (py_name(p), p.clone())).collect();
    for atom in cf.alg.atoms() {
        if let crate::algebra::AtomKind::Symbol(_, _, s) = atom {
            // c0, c1 in beta2_crit = -c0/c1 are the quantities assigned above, not symbols.
            if cf.get(s).is_none() {
                vars.push((s.clone(), s.clone()));
            }
        }
    }
    if !vars.is_empty() {
        let lhs: Vec<&str> = vars.iter().map(|v| v.0.as_str()).collect();
        let sy: Vec<&str> = vars.iter().map(|v| v.1.as_str()).collect();
        let comma = if lhs.len() == 1 { "," } else { "" };
        o.push_str(&format!("{}{comma} = symbols('{}', real=True)\n", lhs.join(", "), sy.join(" ")));
    }
    o.push('\n');
    for r in render_all(cf, symbols) {
        o.push_str(&format!("{} = {}\n", r.id, r.sympy));
    }
    o
}

/// Width estimate of a LaTeX left-hand side.
fn lhs_width(s: &str) -> f64 {
    render::latex_string_width(s)
}

/// The `align` (or `align*`) block, without a document around it: each quantity on its own equation,
/// aligned at `=`, long right-hand sides broken over lines that fit `layout.width_pt`.
pub fn latex_block(cf: &ClosedForms, symbols: &Symbols, layout: &LatexLayout) -> String {
    let names = names(cf, symbols);
    let shower = Shower::new(&cf.alg, &cf.pool);
    let rendered = render_all(cf, symbols);
    // Equations: (lhs, lines) in order; long fractions may add helper equations before their quantity.
    let mut eqs: Vec<(String, Vec<String>)> = Vec::new();
    let mut aux = 0;
    let max_lhs = rendered.iter().map(|r| lhs_width(&r.lhs_latex)).fold(0.0, f64::max);
    let number = if layout.numbered { 30.0 } else { 0.0 };
    let first = (0.93 * layout.width_pt - max_lhs - 14.0 - number).max(60.0);
    let rest = first - 10.0;
    for r in &rendered {
        match latex_lines(&r.disp, &names, first, rest) {
            Some(lines) => eqs.push((r.lhs_latex.clone(), lines)),
            None => {
                // c N/D with the numerator and denominator polynomials as their own equations.
                aux += 1;
                let c = r.value.num.rational_content();
                let nd = shower.rat(&RatFun::poly(r.value.num.primitive()));
                let dd = shower.rat(&RatFun::poly(r.value.den.clone()));
                let nl = latex_lines(&nd, &names, first, rest).unwrap_or_else(|| vec![render::latex(&nd, &names)]);
                let dl = latex_lines(&dd, &names, first, rest).unwrap_or_else(|| vec![render::latex(&dd, &names)]);
                let (nn, dn) = (format!("\\mathcal{{N}}_{{{aux}}}"), format!("\\mathcal{{D}}_{{{aux}}}"));
                let sign = if c.is_negative() { "-" } else { "" };
                let cn = c.numer().abs();
                let cnum = if cn == 1.into() { String::new() } else { cn.to_string() };
                let cden = if c.denom() == &1.into() { String::new() } else { c.denom().to_string() };
                let main = if dd == Disp::Int(1u32.into()) {
                    format!("{sign}{cnum}{nn}")
                } else {
                    format!("{sign}\\frac{{{cnum}{nn}}}{{{cden}{dn}}}")
                };
                eqs.push((r.lhs_latex.clone(), vec![main]));
                eqs.push((nn, nl));
                if dd != Disp::Int(1u32.into()) {
                    eqs.push((dn, dl));
                }
            }
        }
    }
    let env = if layout.numbered { "align" } else { "align*" };
    let mut o = format!("\\begin{{{env}}}\n");
    let n_eq = eqs.len();
    for (i, (lhs, lines)) in eqs.iter().enumerate() {
        for (k, line) in lines.iter().enumerate() {
            let body = if k == 0 {
                format!("  {lhs} &= {line}")
            } else {
                let l =
                    if line.starts_with('+') || line.starts_with('-') { format!("{{}}{line}") } else { line.clone() };
                format!("  &\\quad {l}")
            };
            o.push_str(&body);
            let last_row = k + 1 == lines.len();
            if layout.numbered && !last_row {
                o.push_str(" \\nonumber");
            }
            if !(last_row && i + 1 == n_eq) {
                o.push_str(" \\\\");
            }
            o.push('\n');
        }
    }
    o.push_str(&format!("\\end{{{env}}}\n"));
    o
}

/// LaTeX: a comment header (provenance, conventions, notes) and the `align` block.
pub fn latex(cf: &ClosedForms, symbols: &Symbols, layout: &LatexLayout, provenance: &str) -> String {
    let mut o = format!("% {provenance}\n% requires \\usepackage{{amsmath}}\n");
    for h in header_lines(cf) {
        o.push_str(&format!("% {h}\n"));
    }
    o.push_str(&latex_block(cf, symbols, layout));
    o
}

/// JSON: every quantity in every form, with the notes.
pub fn json(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> serde_json::Value {
    serde_json::json!({
        "provenance": provenance,
        "dimension": cf.dimension,
        "shell_kind": cf.kind.name(),
        "state": match cf.state { ClosedState::Static => "static", ClosedState::Moving => "moving" },
        "radius": cf.radius,
        "notes": cf.notes,
        "quantities": render_all(cf, symbols),
    })
}
