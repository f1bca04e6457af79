//! A Python/SymPy snippet of the closed forms: symbols declared, one assignment per quantity.

use super::closed::{header_lines, py_name, render_all};
use super::{Item, Renderer};
use crate::junction::closed::ClosedForms;
use crate::scenario::Symbols;

/// SymPy: `closed-form` only.
pub struct Sympy;

impl Renderer for Sympy {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        match item {
            Item::ClosedForms { forms, symbols, provenance, .. } => Some(closed(forms, symbols, provenance)),
            _ => None,
        }
    }
}

/// `closed-form`: a SymPy snippet declaring the symbols and assigning each quantity.
pub fn closed(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> String {
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
