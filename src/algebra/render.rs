//! Rendering display trees as plain text (junctura's own expression syntax), SymPy-parseable Python and
//! LaTeX, with a width estimate for LaTeX and line breaking at sums.

use super::display::Disp;
use super::ratfun::{Alg, AtomKind};
use crate::expr::Func;
use crate::scenario::Symbols;

/// How each plain atom (radius, parameter, pi, symbol) is spelled in the three outputs.
#[derive(Clone, Debug)]
pub struct Names {
    text: Vec<String>,
    latex: Vec<String>,
    sympy: Vec<String>,
}

impl Names {
    /// Names for the atoms of `alg`: the radius spelled `radius` (text) / `radius_latex`, parameters by name,
    /// by the scenario's `[symbols]` table (LaTeX) and by `py(name)` (the Python variable of the SymPy output).
    pub fn new(alg: &Alg, radius: &str, radius_latex: &str, symbols: &Symbols, py: &dyn Fn(&str) -> String) -> Names {
        let (mut text, mut latex, mut sympy) = (Vec::new(), Vec::new(), Vec::new());
        for k in alg.atoms() {
            let (t, l, s) = match k {
                AtomKind::Radius => (radius.to_string(), radius_latex.to_string(), radius.to_string()),
                AtomKind::Param(i) => {
                    let n = &alg.param_names[*i];
                    (n.clone(), symbols.latex(n), py(n))
                }
                AtomKind::Pi => ("pi".into(), "\\pi".into(), "pi".into()),
                AtomKind::Symbol(t, l, s) => (t.clone(), l.clone(), s.clone()),
                _ => (String::new(), String::new(), String::new()),
            };
            text.push(t);
            latex.push(l);
            sympy.push(s);
        }
        Names { text, latex, sympy }
    }

    /// LaTeX of atom `v`.
    pub fn latex(&self, v: usize) -> &str {
        &self.latex[v]
    }
}

// Binding strengths for parenthesisation.
const SUM: u8 = 1;
const PROD: u8 = 2;
const NEG: u8 = 3;
const POW: u8 = 4;
const ATOM: u8 = 5;

/// Plain text or SymPy.
fn code(d: &Disp, n: &Names, sympy: bool) -> (String, u8) {
    let wrap = |d: &Disp, min: u8| {
        let (s, p) = code(d, n, sympy);
        if p < min {
            format!("({s})")
        } else {
            s
        }
    };
    let pw = if sympy { "**" } else { "^" };
    match d {
        Disp::Int(i) => (i.to_string(), ATOM),
        Disp::Sym(v) => (if sympy { n.sympy[*v].clone() } else { n.text[*v].clone() }, ATOM),
        Disp::Sqrt(x) => (format!("sqrt({})", wrap(x, 0)), ATOM),
        Disp::Func(f, x) => {
            let name = match (f, sympy) {
                (Func::Abs, true) => "Abs",
                (f, _) => f.name(),
            };
            (format!("{name}({})", wrap(x, 0)), ATOM)
        }
        Disp::PowGen(b, e) => (format!("{}{pw}{}", wrap(b, ATOM), wrap(e, ATOM)), POW),
        Disp::Pow(b, k) => (format!("{}{pw}{k}", wrap(b, ATOM)), POW),
        Disp::Prod(v) => (v.iter().map(|x| wrap(x, PROD)).collect::<Vec<_>>().join("*"), PROD),
        Disp::Frac(a, b) => (format!("{}/{}", wrap(a, PROD), wrap(b, POW)), PROD),
        Disp::Neg(x) => (format!("-{}", wrap(x, PROD)), NEG),
        Disp::Sum(v) => {
            let mut s = String::new();
            for (i, (neg, t)) in v.iter().enumerate() {
                let body = wrap(t, PROD);
                match (i, neg) {
                    (0, false) => s.push_str(&body),
                    (0, true) => s.push_str(&format!("-{body}")),
                    (_, false) => s.push_str(&format!(" + {body}")),
                    (_, true) => s.push_str(&format!(" - {body}")),
                }
            }
            (s, SUM)
        }
    }
}

/// Plain text in junctura's expression syntax (parses back with the same names).
pub fn text(d: &Disp, n: &Names) -> String {
    code(d, n, false).0
}

/// Python/SymPy source (`sqrt`, `pi`, `**`; parse with `sympy.parse_expr` and the symbols declared).
pub fn sympy(d: &Disp, n: &Names) -> String {
    code(d, n, true).0
}

/// LaTeX (math mode) and its estimated width in points at 10 pt.
pub fn latex(d: &Disp, n: &Names) -> String {
    lx(d, n).0
}

/// Estimated width in points (10 pt Computer Modern, display style).
pub fn width(d: &Disp, n: &Names) -> f64 {
    lx(d, n).1
}

const CH: f64 = 5.2; // a letter or digit
const BIN: f64 = 12.2; // a binary + or - with its spacing
const DELIM: f64 = 4.6; // one \left( or \right)

/// Width estimate of a short LaTeX string (a left-hand side such as `\sigma_{0}(a)`), in points.
pub fn latex_string_width(s: &str) -> f64 {
    atom_width(s)
}

/// Approximate width in points of one glyph in 10 pt Computer Modern math italic.
fn glyph(c: char) -> f64 {
    match c {
        '0'..='9' => 5.0,
        'm' | 'w' => 8.8,
        'M' | 'W' => 9.8,
        'i' | 'j' | 'l' | '\'' => 3.5,
        'A'..='Z' => 7.8,
        'a'..='z' => 5.7,
        _ => 6.0,
    }
}

/// Width of a LaTeX atom string such as `m`, `\lambda`, `q_{2}`, `\mathrm{mu}`, or a whole radicand atom
/// like `\sqrt{1-\frac{2 m}{a}+\frac{q^{2}}{a^{2}}}`: scripts count 0.7 of their base size for their own group
/// only, a fraction as its wider part, a root with its sign, binary signs with their spacing.
fn atom_width(s: &str) -> f64 {
    let chars: Vec<char> = s.chars().collect();
    let mut pos = 0;
    latex_width(&chars, &mut pos, false).max(CH * 0.7)
}

/// Width of LaTeX from `pos` up to the end (or up to the closing brace when `group`, which is consumed).
fn latex_width(c: &[char], pos: &mut usize, group: bool) -> f64 {
    let mut w = 0.0;
    let mut first = true;
    while *pos < c.len() {
        let ch = c[*pos];
        *pos += 1;
        match ch {
            '}' if group => return w,
            '{' => w += latex_width(c, pos, true),
            '\\' => {
                let start = *pos;
                while *pos < c.len() && c[*pos].is_ascii_alphabetic() {
                    *pos += 1;
                }
                let name: String = c[start..*pos].iter().collect();
                match name.as_str() {
                    "frac" | "dfrac" | "tfrac" => {
                        let a = latex_arg(c, pos);
                        let b = latex_arg(c, pos);
                        w += a.max(b) + 2.4;
                    }
                    "sqrt" => w += latex_arg(c, pos) + 9.0,
                    "left" | "right" | "bigl" | "bigr" | "Bigl" | "Bigr" | "biggl" | "biggr" => {
                        if *pos < c.len() {
                            *pos += 1;
                        }
                        w += DELIM;
                    }
                    "mathrm" | "mathit" | "mathbf" | "mathcal" | "operatorname" | "text" => {}
                    "cdot" | "times" => w += 7.8,
                    "," | "" => {
                        if *pos < c.len() && !c[*pos].is_ascii_alphabetic() {
                            *pos += 1;
                        }
                        w += 1.7;
                    }
                    _ => w += 6.0,
                }
            }
            '^' | '_' => w += 0.7 * latex_arg(c, pos),
            ' ' => {}
            '+' | '-' | '=' => w += if first { 7.8 } else { BIN },
            ch => w += glyph(ch),
        }
        first = false;
    }
    w
}

/// Width of one argument: a braced group or a single character / command.
fn latex_arg(c: &[char], pos: &mut usize) -> f64 {
    while *pos < c.len() && c[*pos] == ' ' {
        *pos += 1;
    }
    if *pos >= c.len() {
        return 0.0;
    }
    if c[*pos] == '{' {
        *pos += 1;
        return latex_width(c, pos, true);
    }
    if c[*pos] == '\\' {
        let mut end = *pos + 1;
        while end < c.len() && c[end].is_ascii_alphabetic() {
            end += 1;
        }
        let piece: Vec<char> = c[*pos..end.max(*pos + 2).min(c.len())].to_vec();
        *pos = end.max(*pos + 2).min(c.len());
        let mut p = 0;
        return latex_width(&piece, &mut p, false);
    }
    *pos += 1;
    glyph(c[*pos - 1])
}

fn paren(s: (String, f64)) -> (String, f64) {
    (format!("\\left({}\\right)", s.0), s.1 + 2.0 * DELIM)
}

fn lx(d: &Disp, n: &Names) -> (String, f64) {
    match d {
        Disp::Int(i) => {
            let s = i.to_string();
            let w = 5.0 * s.len() as f64;
            (s, w)
        }
        Disp::Sym(v) => (n.latex[*v].clone(), atom_width(&n.latex[*v])),
        Disp::Sqrt(x) => {
            let (s, w) = lx(x, n);
            (format!("\\sqrt{{{s}}}"), w + 9.0)
        }
        Disp::Func(f, x) => {
            let (s, w) = paren(lx(x, n));
            let name = match f {
                Func::Abs => return (format!("\\left|{}\\right|", lx(x, n).0), lx(x, n).1 + 2.0 * 2.8),
                Func::Sign => "\\operatorname{sign}",
                Func::Log => "\\ln",
                Func::Exp => "\\exp",
                Func::Sin => "\\sin",
                Func::Cos => "\\cos",
                Func::Tan => "\\tan",
                Func::Sinh => "\\sinh",
                Func::Cosh => "\\cosh",
                Func::Tanh => "\\tanh",
                Func::Sqrt => "\\sqrt",
            };
            (format!("{name}{s}"), w + 16.0)
        }
        Disp::PowGen(b, e) => {
            let (bs, bw) = base(b, n);
            let (es, ew) = lx(e, n);
            (format!("{bs}^{{{es}}}"), bw + 0.7 * ew)
        }
        Disp::Pow(b, k) => {
            let (bs, bw) = base(b, n);
            let k = k.to_string();
            (format!("{bs}^{{{k}}}"), bw + 0.7 * CH * k.len() as f64)
        }
        Disp::Prod(v) => {
            let mut s = String::new();
            let mut w = 0.0;
            let mut prev_int = false;
            for x in v {
                let (xs, xw) = match x {
                    Disp::Sum(_) => paren(lx(x, n)),
                    Disp::Frac(..) => lx(x, n),
                    Disp::Neg(_) => paren(lx(x, n)),
                    _ => lx(x, n),
                };
                let is_int = matches!(x, Disp::Int(_));
                if prev_int && is_int {
                    s.push_str("\\cdot ");
                    w += 7.8;
                } else if !s.is_empty() && xs.starts_with(|c: char| c.is_ascii_alphanumeric()) {
                    s.push(' ');
                }
                s.push_str(&xs);
                w += xw;
                prev_int = is_int;
            }
            (s, w)
        }
        Disp::Frac(a, b) => {
            let (sa, wa) = lx(a, n);
            let (sb, wb) = lx(b, n);
            (format!("\\frac{{{sa}}}{{{sb}}}"), wa.max(wb) + 2.4)
        }
        Disp::Neg(x) => {
            let (s, w) = match **x {
                Disp::Sum(_) => paren(lx(x, n)),
                _ => lx(x, n),
            };
            (format!("-{s}"), w + 7.8)
        }
        Disp::Sum(v) => {
            let mut s = String::new();
            let mut w = 0.0;
            for (i, (neg, t)) in v.iter().enumerate() {
                let (ts, tw) = term(t, n);
                if i == 0 {
                    if *neg {
                        s.push('-');
                        w += 7.8;
                    }
                } else {
                    s.push_str(if *neg { "-" } else { "+" });
                    w += BIN;
                }
                s.push_str(&ts);
                w += tw;
            }
            (s, w)
        }
    }
}

fn term(t: &Disp, n: &Names) -> (String, f64) {
    match t {
        Disp::Sum(_) | Disp::Neg(_) => paren(lx(t, n)),
        _ => lx(t, n),
    }
}

fn base(b: &Disp, n: &Names) -> (String, f64) {
    match b {
        Disp::Sym(_) | Disp::Int(_) => lx(b, n),
        Disp::Func(..) => {
            let (s, w) = lx(b, n);
            (format!("\\left[{s}\\right]"), w + 2.0 * DELIM)
        }
        _ => paren(lx(b, n)),
    }
}

/// LaTeX of `d` broken into lines: the first at most `first` points wide, the others at most `rest`.
/// Breaks fall between the terms of a sum; a long fraction with a sum on top is written as
/// `\frac{c}{den}\biggl[ ... \biggr]` and broken inside the bracket; a long product with a sum factor
/// likewise. Returns None when no break makes it fit (a single indivisible term, or a denominator wider than a
/// line): the caller then writes the numerator and denominator as separate equations.
pub fn latex_lines(d: &Disp, n: &Names, first: f64, rest: f64) -> Option<Vec<String>> {
    let (s, w) = lx(d, n);
    if w <= first {
        return Some(vec![s]);
    }
    let (neg, core) = match d {
        Disp::Neg(x) => (true, x.as_ref()),
        other => (false, other),
    };
    let sign = if neg { "-" } else { "" };
    let sw = if neg { 7.8 } else { 0.0 };
    match core {
        Disp::Sum(terms) => {
            let terms =
                if neg { terms.iter().map(|(ng, t)| (!ng, t.clone())).collect::<Vec<_>>() } else { terms.clone() };
            break_sum(&terms, n, "", first, rest, "")
        }
        Disp::Frac(a, b) => {
            let (bs, bw) = lx(b, n);
            let (pre, sum) = split_sum_factor(a)?;
            let pre_s = pre.as_ref().map(|p| lx(p, n)).unwrap_or(("1".into(), CH));
            let head = format!("{sign}\\frac{{{}}}{{{bs}}}\\biggl[", pre_s.0);
            let hw = sw + pre_s.1.max(bw) + 2.4 + 6.0;
            if hw > 0.7 * first {
                return None;
            }
            break_sum(&sum, n, &head, first - hw, rest - 6.0, "\\biggr]")
        }
        Disp::Prod(v) => break_prod(v, n, sign, sw, first, rest),
        _ => None,
    }
}

/// A product broken between its factors (continuation lines start with `\times`); a sum factor that does
/// not fit is bracketed and broken inside.
fn break_prod(v: &[Disp], n: &Names, sign: &str, sw: f64, first: f64, rest: f64) -> Option<Vec<String>> {
    let mut lines: Vec<String> = Vec::new();
    let mut cur = sign.to_string();
    let mut cur_w = sw;
    let mut limit = first;
    const TIMES: f64 = 12.0;
    for f in v {
        let (fs, fw) = match f {
            Disp::Sum(_) | Disp::Neg(_) => paren(lx(f, n)),
            _ => lx(f, n),
        };
        let fresh = cur_w <= sw;
        if cur_w + fw <= limit {
            cur.push(' ');
            cur.push_str(&fs);
            cur_w += fw;
            continue;
        }
        if !fresh && fw + TIMES <= rest {
            lines.push(std::mem::take(&mut cur));
            cur = format!("\\times {fs}");
            cur_w = TIMES + fw;
            limit = rest;
            continue;
        }
        let Disp::Sum(terms) = f else { return None };
        if !fresh && limit - cur_w < 0.4 * rest {
            lines.push(std::mem::take(&mut cur));
            cur = "\\times".to_string();
            cur_w = TIMES;
            limit = rest;
        }
        let sub = break_sum(terms, n, "\\biggl[", limit - cur_w - 6.0, rest - 6.0, "\\biggr]")?;
        cur.push(' ');
        cur.push_str(&sub[0]);
        if sub.len() > 1 {
            lines.push(std::mem::take(&mut cur));
            lines.extend(sub[1..sub.len() - 1].iter().cloned());
            cur = sub[sub.len() - 1].clone();
        }
        cur_w = rest;
        limit = rest;
    }
    lines.push(cur);
    Some(lines)
}

/// Terms of a sum: (negative?, term).
type SumTerms = Vec<(bool, Disp)>;

/// Split a numerator into (prefactor, sum): `c m (sum)` or a bare sum.
fn split_sum_factor(a: &Disp) -> Option<(Option<Disp>, SumTerms)> {
    match a {
        Disp::Sum(t) => Some((None, t.clone())),
        Disp::Prod(v) => {
            let idx = v.iter().position(|x| matches!(x, Disp::Sum(_)))?;
            let Disp::Sum(t) = &v[idx] else { return None };
            let mut others: Vec<Disp> =
                v.iter().enumerate().filter(|(i, _)| *i != idx).map(|(_, x)| x.clone()).collect();
            let pre = match others.len() {
                0 => None,
                1 => others.pop(),
                _ => Some(Disp::Prod(others)),
            };
            Some((pre, t.clone()))
        }
        _ => None,
    }
}

fn break_sum(terms: &[(bool, Disp)], n: &Names, head: &str, first: f64, rest: f64, tail: &str) -> Option<Vec<String>> {
    let mut lines: Vec<String> = Vec::new();
    let mut cur = head.to_string();
    let mut cur_w = 0.0;
    let mut limit = first;
    for (i, (neg, t)) in terms.iter().enumerate() {
        let (ts, tw) = term(t, n);
        let op = match (i, neg) {
            (0, false) => "",
            (0, true) => "-",
            (_, false) => "+",
            (_, true) => "-",
        };
        let ow = if i == 0 {
            if *neg {
                7.8
            } else {
                0.0
            }
        } else {
            BIN
        };
        if cur_w + ow + tw <= limit {
            cur.push_str(op);
            cur.push_str(&ts);
            cur_w += ow + tw;
            continue;
        }
        if cur_w > 0.0 && ow + tw <= rest {
            lines.push(std::mem::take(&mut cur));
            limit = rest;
            cur.push_str(op);
            cur.push_str(&ts);
            cur_w = ow + tw;
            continue;
        }
        // The term does not fit on a line of its own: break inside it.
        if cur_w > 0.0 && limit - cur_w < 0.4 * rest {
            lines.push(std::mem::take(&mut cur));
            cur_w = 0.0;
            limit = rest;
        }
        let here = latex_lines(t, n, limit - cur_w - ow, rest).filter(|sub| sub.len() > 1);
        let sub = match here {
            Some(sub) => sub,
            // Not breakable after what is already on this line: start the term on a fresh line.
            None if cur_w > 0.0 => {
                lines.push(std::mem::take(&mut cur));
                latex_lines(t, n, rest - ow, rest).filter(|sub| sub.len() > 1)?
            }
            None => return None,
        };
        cur.push_str(op);
        cur.push_str(&sub[0]);
        lines.push(std::mem::take(&mut cur));
        lines.extend(sub[1..sub.len() - 1].iter().cloned());
        cur = sub[sub.len() - 1].clone();
        cur_w = rest;
        limit = rest;
    }
    cur.push_str(tail);
    lines.push(cur);
    Some(lines)
}

#[cfg(test)]
mod tests {
    use super::atom_width;

    /// Widths typeset by pdflatex (10 pt Computer Modern, display style, measured with `\setbox0\hbox{$...$}`
    /// and `\the\wd0`): the estimate stays within 20% so line breaking keeps its margin.
    #[test]
    fn atom_widths_follow_the_typeset_widths() {
        for (s, typeset) in [
            // \sqrt{1-\frac{2 m}{a}+\frac{q^{2}}{a^{2}}}: 67.8 pt (pdflatex, measured here).
            ("\\sqrt{1-\\frac{2 m}{a}+\\frac{q^{2}}{a^{2}}}", 67.8),
            // q_{2}: 9.0 pt; \lambda: 5.8 pt (pdflatex, measured here).
            ("q_{2}", 9.0),
            ("\\lambda", 5.8),
        ] {
            let w = atom_width(s);
            assert!((w - typeset).abs() <= 0.2 * typeset, "{s}: estimated {w} pt, typeset {typeset} pt");
        }
    }
}
