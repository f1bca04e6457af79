//! LaTeX: closed forms as amsmath `align` blocks laid out for a text width, values and static solutions as
//! booktabs tables, numbers as `\times 10^{k}`.

use super::closed::{header_lines, names, render_all, LatexLayout};
use super::{Item, Renderer};
use crate::algebra::display::Disp;
use crate::algebra::render::{self, latex_lines};
use crate::algebra::{RatFun, Shower};
use crate::junction::closed::{closed_forms, ClosedForms, ClosedState};
use crate::report::derive::DeriveReport;
use crate::scenario::{Scenario, Symbols};
use crate::statics::StaticsReport;
use num_traits::Signed;

/// LaTeX: `derive`, `closed-form` and the table of static solutions; `check` has no formulas and prints its
/// text summary under `--format latex`.
pub struct Latex;

impl Renderer for Latex {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        Some(match item {
            Item::Survey(r) => super::text::survey(r),
            Item::Derive { report, scenario, layout } => derive(report, scenario, layout),
            Item::ClosedForms { forms, symbols, provenance, layout } => closed(forms, symbols, layout, provenance),
            Item::Statics(r) => statics(r),
            _ => return None,
        })
    }
}

/// LaTeX: the general template as a short comment preamble, the closed forms of the scenario's own metric
/// (`junction::closed`, simplified, laid out for `layout`; static forms for a shell at rest, the general
/// state otherwise) and the values in a small table (amsmath, booktabs).
pub fn derive(r: &DeriveReport, s: &Scenario, layout: &LatexLayout) -> String {
    let mut o = String::new();
    o.push_str(&format!("% {}\n% requires \\usepackage{{amsmath,booktabs}}\n", crate::text::one_line(&r.provenance)));
    o.push_str(&format!(
        "% {} shell, D = {}; minus side: A = {}, B = {}, keep {}; plus side: A = {}, B = {}, keep {}\n",
        r.shell_kind,
        r.dimension,
        r.minus.a_expr,
        r.minus.b_expr,
        r.minus.keep,
        r.plus.a_expr,
        r.plus.b_expr,
        r.plus.keep
    ));
    o.push_str("% general template (sides: + plus, - minus):\n");
    for f in &r.formulas {
        o.push_str(&format!("%   {}\n", f.text));
    }
    let state = if r.velocity == 0.0 && r.acceleration == 0.0 { ClosedState::Static } else { ClosedState::Moving };
    match closed_forms(s, state) {
        Ok(cf) => {
            for h in header_lines(&cf) {
                o.push_str(&format!("% {h}\n"));
            }
            o.push_str(&latex_block(&cf, &s.symbols, layout));
        }
        Err(e) => {
            o.push_str(&format!("% no closed forms: {e}\n\\begin{{align*}}\n"));
            let n = r.formulas.len();
            for (i, f) in r.formulas.iter().enumerate() {
                o.push_str(&format!("  {}{}\n", f.latex, if i + 1 < n { " \\\\" } else { "" }));
            }
            o.push_str("\\end{align*}\n");
        }
    }
    o.push_str("\\begin{tabular}{lr}\n\\toprule\nquantity & value \\\\\n\\midrule\n");
    o.push_str(&format!("$R$ & ${}$ \\\\\n", latex_num(r.radius)));
    if let (Some(s), Some(p)) = (r.sigma, r.pressure) {
        o.push_str(&format!("$\\sigma$ & ${}$ \\\\\n$p$ & ${}$ \\\\\n", latex_num(s), latex_num(p)));
    }
    if let (Some(s), Some(p)) = (r.s_ll, r.s_thth) {
        o.push_str(&format!(
            "$S^{{l}}{{}}_{{l}}$ & ${}$ \\\\\n$S^{{\\theta}}{{}}_{{\\theta}}$ & ${}$ \\\\\n",
            latex_num(s),
            latex_num(p)
        ));
    }
    if let Some(m) = r.shell_mass {
        o.push_str(&format!("$M_{{s}}$ & ${}$ \\\\\n", latex_num(m)));
    }
    if let Some(x) = r.flux_term {
        o.push_str(&format!("$\\Xi$ & ${}$ \\\\\n", latex_num(x)));
    }
    if let Some(Some(b)) = r.beta2_critical {
        o.push_str(&format!("$\\beta^{{2}}_{{c}}$ & ${}$ \\\\\n", latex_num(b)));
    }
    if let Some(sw) = r.stable_when {
        let w = match sw.name() {
            "beta2_above" => "$\\beta^{2}>\\beta^{2}_{c}$",
            "beta2_below" => "$\\beta^{2}<\\beta^{2}_{c}$",
            "always" => "every $\\beta^{2}$",
            _ => "no $\\beta^{2}$",
        };
        o.push_str(&format!("stable for & {w} \\\\\n"));
    }
    o.push_str("\\bottomrule\n\\end{tabular}\n");
    o
}

/// A booktabs table of static solutions, ready to `\input`.
pub fn statics(r: &StaticsReport) -> String {
    let mut o = format!(
        "% {}\n% equation of state: p = {}\n% requires \\usepackage{{booktabs}}\n",
        crate::text::one_line(&r.provenance),
        r.equation_of_state
    );
    o.push_str("\\begin{tabular}{rrrrrl}\n\\toprule\n$a_0/M$ & $\\sigma_0 M$ & $p_0 M$ & $\\beta^{2}$ & $V''(a_0) M^{2}$ & stability \\\\\n\\midrule\n");
    for s in &r.static_radii {
        let mut st = s.stability.name().to_string();
        if s.double_root || s.near_horizon {
            st.push_str("$^{*}$");
        }
        o.push_str(&format!(
            "${}$ & ${}$ & ${}$ & ${}$ & ${}$ & {} \\\\\n",
            latex_num(s.radius),
            latex_num(s.sigma),
            latex_num(s.pressure),
            latex_num(s.beta2),
            latex_num(s.potential_second_derivative),
            st
        ));
    }
    if r.static_radii.is_empty() {
        o.push_str("\\multicolumn{6}{c}{no static radius in the range} \\\\\n");
    }
    o.push_str("\\bottomrule\n\\end{tabular}\n");
    if r.static_radii.iter().any(|s| s.double_root || s.near_horizon) {
        o.push_str("% $^{*}$ ill-conditioned: a double root or within 1e-6 of a horizon\n");
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
pub fn closed(cf: &ClosedForms, symbols: &Symbols, layout: &LatexLayout, provenance: &str) -> String {
    let mut o = format!("% {provenance}\n% requires \\usepackage{{amsmath}}\n");
    for h in header_lines(cf) {
        o.push_str(&format!("% {h}\n"));
    }
    o.push_str(&latex_block(cf, symbols, layout));
    o
}

/// A number for LaTeX tables: 6 significant digits, scientific notation as `\times 10^{k}`.
pub fn latex_num(x: f64) -> String {
    match super::short(x) {
        super::Short::NotFinite => "\\text{--}".into(),
        super::Short::Fixed(s) => s,
        super::Short::Scientific(e) => {
            let m = x / 10f64.powi(e);
            format!("{}\\times 10^{{{e}}}", super::trim_zeros(&format!("{m:.5}")))
        }
    }
}
