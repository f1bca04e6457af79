//! `derive` as readable text and as LaTeX.

use super::closed::LatexLayout;
use super::{latex_num, num};
use crate::junction::closed::{closed_forms, ClosedState};
use crate::report::derive::DeriveReport;
use crate::scenario::Scenario;

/// Readable summary: formulas first, then the values.
pub fn text(r: &DeriveReport) -> String {
    let timelike = r.shell_kind == "timelike";
    let mut o = String::new();
    o.push_str(&format!(
        "scenario: {}\n# {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance)
    ));
    o.push_str(&format!(
        "{} shell, D = {}, R = {}{}\n",
        r.shell_kind,
        r.dimension,
        num(r.radius),
        if r.velocity != 0.0 || r.acceleration != 0.0 {
            format!(", dR/ds = {}, d2R/ds2 = {}", num(r.velocity), num(r.acceleration))
        } else {
            " (static)".into()
        }
    ));
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "  [{name}] keep = {}, n^r sign {:+}:  A(r) = {},  B(r) = {}\n",
            sd.keep, sd.normal_sign, sd.a_expr, sd.b_expr
        ));
    }
    o.push_str("\nformulas (sides: + plus, - minus):\n");
    for f in &r.formulas {
        o.push_str(&format!("  {}\n", f.text));
    }
    o.push_str("\nvalues:\n");
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "  {name}: A = {}  B = {}  A' = {}  B' = {}  n^r = {}  K^s_s = {}  K^theta_theta = {}\n",
            num(sd.a),
            num(sd.b),
            num(sd.a_prime),
            num(sd.b_prime),
            num(sd.n_r),
            num(sd.k_ss),
            num(sd.k_thth)
        ));
    }
    o.push_str(&format!("  [K^s_s] = {}   [K^theta_theta] = {}\n", num(r.k_ss_jump), num(r.k_thth_jump)));
    if timelike {
        let sigma = r.sigma.unwrap_or(f64::NAN);
        let p = r.pressure.unwrap_or(f64::NAN);
        o.push_str(&format!("  surface energy density sigma = {}\n", num(sigma)));
        o.push_str(&format!("  surface pressure p = {}\n", num(p)));
        if let Some(m) = r.shell_mass {
            o.push_str(&format!("  shell mass M_s = {}\n", num(m)));
        }
    } else {
        o.push_str(&format!("  S^l_l = {}   (not an energy density)\n", num(r.s_ll.unwrap_or(f64::NAN))));
        o.push_str(&format!("  S^theta_theta = {}   (not a pressure)\n", num(r.s_thth.unwrap_or(f64::NAN))));
    }
    o.push_str(&format!("  V(R) = {}\n", num(r.potential)));
    if let Some(v1) = r.potential_first_derivative {
        o.push_str(&format!("  V'(a) = {}  (zero at a static solution: a check)\n", num(v1)));
    }
    if let Some(x) = r.flux_term {
        o.push_str(&format!("  flux term Xi = {}\n", num(x)));
    }
    if let (Some(c0), Some(c1), Some(sw)) = (r.v2_at_beta2_zero, r.v2_slope, r.stable_when) {
        o.push_str(&format!("  V''(a) = {} + ({}) beta^2\n", num(c0), num(c1)));
        let crit = r.beta2_critical.flatten();
        let verdict = match (sw.name(), crit) {
            ("beta2_above", Some(b)) => format!("stable for beta^2 > {}", num(b)),
            ("beta2_below", Some(b)) => format!("stable for beta^2 < {}", num(b)),
            ("always", _) => "stable for every beta^2".to_string(),
            _ => "unstable for every beta^2".to_string(),
        };
        o.push_str(&format!("  linear stability: {verdict}\n"));
    }
    if let Some(e) = &r.equation_of_state {
        o.push_str(&format!(
            "  equation of state p = {}: P(sigma0) = {}, residual p0 - P = {}, beta^2 = {}, V''(a) = {}\n",
            e.law,
            num(e.pressure_from_law),
            num(e.residual),
            num(e.beta2),
            num(e.potential_second_derivative)
        ));
    }
    if let Some(ec) = &r.energy_conditions {
        let yn = |b: bool| if b { "holds" } else { "violated" };
        o.push_str(&format!(
            "  energy conditions: null {}, weak {}, strong {}, dominant {}\n",
            yn(ec.null),
            yn(ec.weak),
            yn(ec.strong),
            yn(ec.dominant)
        ));
    }
    for w in &r.warnings {
        o.push_str(&format!("\nwarning: {w}\n"));
    }
    o
}

/// LaTeX: the general template as a short comment preamble, the closed forms of the scenario's own metric
/// (`junction::closed`, simplified, laid out for `layout`; static forms for a shell at rest, the general
/// state otherwise) and the values in a small table (amsmath, booktabs).
pub fn latex(r: &DeriveReport, s: &Scenario, layout: &LatexLayout) -> String {
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
            for h in super::closed::header_lines(&cf) {
                o.push_str(&format!("% {h}\n"));
            }
            o.push_str(&super::closed::latex_block(&cf, &s.symbols, layout));
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

/// One CSV row with the main values (provenance comment, header with units). Fields that do not exist for the
/// shell kind are empty.
pub fn csv(r: &DeriveReport) -> String {
    let o = |x: Option<f64>| x.map(num).unwrap_or_default();
    let ec = r.energy_conditions;
    let b =
        |f: fn(&crate::junction::EnergyConditions) -> bool| ec.as_ref().map(|e| f(e).to_string()).unwrap_or_default();
    format!(
        "# {}\nshell_kind,radius [M],velocity [1],acceleration [1/M],sigma [1/M],pressure [1/M],S_ll [1/M],S_thth [1/M],K_ss_jump [1/M],K_thth_jump [1/M],shell_mass [M],potential [1],beta2_critical [1],stable_when,null,weak,strong,dominant,flux_term [1/M^2]\n{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
        crate::text::one_line(&r.provenance),
        r.shell_kind,
        num(r.radius),
        num(r.velocity),
        num(r.acceleration),
        o(r.sigma),
        o(r.pressure),
        o(r.s_ll),
        o(r.s_thth),
        num(r.k_ss_jump),
        num(r.k_thth_jump),
        o(r.shell_mass),
        num(r.potential),
        o(r.beta2_critical.flatten()),
        r.stable_when.map(|s| s.name()).unwrap_or(""),
        b(|e| e.null),
        b(|e| e.weak),
        b(|e| e.strong),
        b(|e| e.dominant),
        o(r.flux_term),
    )
}
