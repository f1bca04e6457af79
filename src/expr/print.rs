//! Printing expression trees as plain text (re-parsable, minimal parentheses) and as LaTeX.
//!
//! The general functions [`text_of`] and [`latex_of`] take the spelling of the variable and of each parameter
//! from the caller, so that a formula can be printed with another symbol substituted for the variable (for
//! example the shell radius `a` for `r`). [`Expr::to_text`] and [`Expr::to_latex`] use the expression's own names.

use super::ast::{BinOp, Func, Node};
use super::Expr;

// Binding strength of a printed form: an operand printed weaker than its context needs gets parentheses.
const SUM: u8 = 1;
const PROD: u8 = 2;
const NEG: u8 = 3;
const POW: u8 = 4;
const ATOM: u8 = 5;

/// Shortest decimal that reads back to the same `f64`; integer values print without a decimal point, very
/// large or small magnitudes in exponent form (`1.5e-20`). `v` must be non-negative.
fn number_text(v: f64) -> String {
    if v != 0.0 && !(1.0e-4..1.0e15).contains(&v) {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}

/// Plain text of `node` with the variable spelled `var` and parameter `k` spelled `param(k)`.
///
/// The text parses back (with the same names) to a tree of the same value: operators `+ - * / ^`, spaces
/// only around `+` and `-`, parentheses only where precedence requires them, e.g. `1 - 2*m/r + q^2/r^2`.
pub fn text_of(node: &Node, var: &str, param: &dyn Fn(usize) -> String) -> String {
    TextPrinter { var, param }.wrap(node, 0)
}

struct TextPrinter<'a> {
    var: &'a str,
    param: &'a dyn Fn(usize) -> String,
}

impl TextPrinter<'_> {
    fn wrap(&self, node: &Node, min: u8) -> String {
        let (s, p) = self.render(node);
        if p < min {
            format!("({s})")
        } else {
            s
        }
    }

    /// Text of the right operand of `+`/`-`, with the sign folded in: `a + -b` prints `a - b`.
    fn signed_operand(&self, node: &Node, minus: bool) -> String {
        let (flip, inner) = match node {
            Node::Neg(x) => (true, self.wrap(x, PROD)),
            Node::Num(v) if *v < 0.0 => (true, number_text(-v)),
            _ => (false, self.wrap(node, PROD)),
        };
        let op = if minus != flip { " - " } else { " + " };
        format!("{op}{inner}")
    }

    fn render(&self, node: &Node) -> (String, u8) {
        match node {
            Node::Num(v) if *v < 0.0 => (format!("-{}", number_text(-v)), NEG),
            Node::Num(v) => (number_text(*v), ATOM),
            Node::Pi => ("pi".into(), ATOM),
            Node::Var => (self.var.to_string(), ATOM),
            Node::Param(k) => ((self.param)(*k), ATOM),
            Node::Neg(a) => match self.render(a) {
                // `-(a*b)` and `(-a)*b` are the same number exactly, so the product needs no parentheses.
                (s, PROD) => (format!("-{s}"), PROD),
                (s, p) if p >= POW => (format!("-{s}"), NEG),
                (s, _) => (format!("-({s})"), NEG),
            },
            Node::Call(f, a) => (format!("{}({})", f.name(), self.wrap(a, 0)), ATOM),
            Node::Bin(op, l, r) => match op {
                BinOp::Add | BinOp::Sub => {
                    (format!("{}{}", self.wrap(l, SUM), self.signed_operand(r, *op == BinOp::Sub)), SUM)
                }
                BinOp::Mul | BinOp::Div => {
                    let sym = if *op == BinOp::Mul { '*' } else { '/' };
                    (format!("{}{sym}{}", self.wrap(l, PROD), self.wrap(r, NEG)), PROD)
                }
                BinOp::Pow => (format!("{}^{}", self.wrap(l, ATOM), self.wrap(r, NEG)), POW),
            },
        }
    }
}

const GREEK: [&str; 34] = [
    "alpha",
    "beta",
    "gamma",
    "delta",
    "epsilon",
    "varepsilon",
    "zeta",
    "eta",
    "theta",
    "vartheta",
    "iota",
    "kappa",
    "lambda",
    "mu",
    "nu",
    "xi",
    "rho",
    "varrho",
    "sigma",
    "tau",
    "upsilon",
    "phi",
    "varphi",
    "chi",
    "psi",
    "omega",
    "Gamma",
    "Delta",
    "Theta",
    "Lambda",
    "Xi",
    "Sigma",
    "Phi",
    "Psi",
];

/// LaTeX for a name typed by a user: Greek letter names become their commands (`alpha` -> `\alpha`,
/// `Lambda` -> `\Lambda`), the part after the first `_` becomes a subscript (`r_0` -> `r_{0}`), trailing
/// digits too (`m1` -> `m_{1}`), and other multi-letter names are set upright (`mass` -> `\mathrm{mass}`).
pub fn name_latex(name: &str) -> String {
    if let Some((base, sub)) = name.split_once('_') {
        if !base.is_empty() && !sub.is_empty() {
            return format!("{}_{{{}}}", name_latex(base), name_latex(sub));
        }
    }
    let letters = name.trim_end_matches(|c: char| c.is_ascii_digit());
    if !letters.is_empty() && letters.len() < name.len() {
        return format!("{}_{{{}}}", name_latex(letters), &name[letters.len()..]);
    }
    if name.chars().count() == 1 || name.chars().all(|c| c.is_ascii_digit()) {
        name.to_string()
    } else if GREEK.contains(&name) || name == "Upsilon" || name == "Omega" {
        format!("\\{name}")
    } else {
        format!("\\mathrm{{{}}}", name.replace('_', "\\_"))
    }
}

/// LaTeX for a non-negative number: integers plainly, others in shortest decimal form, very large or small
/// magnitudes as `1.5\times10^{-20}`.
fn number_latex(v: f64) -> (String, u8) {
    let t = number_text(v);
    match t.split_once('e') {
        None => (t, ATOM),
        Some(("1", e)) => (format!("10^{{{e}}}"), POW),
        Some((m, e)) => (format!("{m}\\times10^{{{e}}}"), PROD),
    }
}

/// LaTeX of `node` with the variable spelled `var_latex` and parameter `k` spelled `param_latex(k)` (both
/// already LaTeX, e.g. from [`name_latex`]).
///
/// Quotients print as `\frac`, products by juxtaposition (`2m`, with `\cdot` before a factor that starts with
/// a digit), powers as `x^{n}`, negative constant powers as `\frac{1}{x^{n}}`, and the functions as
/// `\sqrt{...}`, `e^{...}` (or `\exp\left(...\right)` for long arguments), `\ln`, `\sin`, ..., `\left|x\right|`
/// and `\operatorname{sgn}`. Example: `1 - 2*m/r + q^2/r^2` prints `1-\frac{2m}{r}+\frac{q^{2}}{r^{2}}`.
pub fn latex_of(node: &Node, var_latex: &str, param_latex: &dyn Fn(usize) -> String) -> String {
    LatexPrinter { var: var_latex, param: param_latex }.render(node).0
}

struct LatexPrinter<'a> {
    var: &'a str,
    param: &'a dyn Fn(usize) -> String,
}

fn paren(s: &str) -> String {
    format!("\\left({s}\\right)")
}

/// Arguments longer than this print with `\exp\left(...\right)` instead of `e^{...}`.
const EXP_INLINE_MAX: usize = 24;

impl LatexPrinter<'_> {
    fn wrap(&self, node: &Node, min: u8) -> String {
        let (s, p) = self.render(node);
        if p < min {
            paren(&s)
        } else {
            s
        }
    }

    /// A factor of a juxtaposed product: sums and anything starting with a sign get parentheses.
    fn factor(&self, node: &Node) -> String {
        let (s, p) = self.render(node);
        if p < PROD || s.starts_with('-') {
            paren(&s)
        } else {
            s
        }
    }

    fn render(&self, node: &Node) -> (String, u8) {
        match node {
            Node::Num(v) if *v < 0.0 => (format!("-{}", number_latex(-v).0), NEG),
            Node::Num(v) => number_latex(*v),
            Node::Pi => ("\\pi".into(), ATOM),
            Node::Var => (self.var.to_string(), ATOM),
            Node::Param(k) => ((self.param)(*k), ATOM),
            Node::Neg(a) => (format!("-{}", self.wrap(a, PROD)), NEG),
            Node::Call(f, a) => self.call(*f, a),
            Node::Bin(op, l, r) => match op {
                BinOp::Add | BinOp::Sub => {
                    let left = self.render(l).0;
                    let (flip, right) = match r.as_ref() {
                        Node::Neg(x) => (true, self.wrap(x, PROD)),
                        Node::Num(v) if *v < 0.0 => (true, number_latex(-v).0),
                        x => (false, self.wrap(x, if *op == BinOp::Sub { PROD } else { SUM })),
                    };
                    let minus = (*op == BinOp::Sub) != flip;
                    let right = if right.starts_with('-') && minus { paren(&right) } else { right };
                    let sep = if minus {
                        "-"
                    } else if right.starts_with('-') {
                        ""
                    } else {
                        "+"
                    };
                    (format!("{left}{sep}{right}"), SUM)
                }
                BinOp::Mul => {
                    let (a, b) = (self.wrap(l, PROD), self.factor(r));
                    (format!("{a}{}{b}", juxtapose(&a, &b)), PROD)
                }
                BinOp::Div => {
                    // `-c/x` parses as `(-c)/x`; print the sign in front of the fraction.
                    let (num, p) = self.render(l);
                    let (sign, num) = match num.strip_prefix('-') {
                        Some(rest) if p >= PROD => ("-", rest.to_string()),
                        _ => ("", num),
                    };
                    let prec = if sign.is_empty() { PROD } else { NEG };
                    (format!("{sign}\\frac{{{num}}}{{{}}}", self.render(r).0), prec)
                }
                BinOp::Pow => match r.as_constant() {
                    Some(c) if c < 0.0 => {
                        let p = self.power(l, &Node::Num(-c));
                        (format!("\\frac{{1}}{{{p}}}"), PROD)
                    }
                    _ => (self.power(l, r), POW),
                },
            },
        }
    }

    fn power(&self, base: &Node, exp: &Node) -> String {
        let b = self.wrap(base, ATOM);
        format!("{b}^{{{}}}", self.render(exp).0)
    }

    fn call(&self, f: Func, a: &Node) -> (String, u8) {
        let arg = self.render(a).0;
        let named = |cmd: &str| (format!("\\{cmd}{}", paren(&arg)), ATOM);
        match f {
            Func::Sqrt => (format!("\\sqrt{{{arg}}}"), POW),
            Func::Exp if arg.len() <= EXP_INLINE_MAX => (format!("e^{{{arg}}}"), POW),
            Func::Exp => named("exp"),
            Func::Log => named("ln"),
            Func::Sin => named("sin"),
            Func::Cos => named("cos"),
            Func::Tan => named("tan"),
            Func::Sinh => named("sinh"),
            Func::Cosh => named("cosh"),
            Func::Tanh => named("tanh"),
            Func::Abs => (format!("\\left|{arg}\\right|"), ATOM),
            Func::Sign => named("operatorname{sgn}"),
        }
    }
}

/// What goes between two juxtaposed factors: `\cdot` before a digit (so `2\cdot3` is not read as `23`) or
/// after a number before a fraction, a space after a control word before a letter (`\pi r`), else nothing.
fn juxtapose(a: &str, b: &str) -> &'static str {
    let first = b.chars().next().unwrap_or(' ');
    let last = a.chars().last().unwrap_or(' ');
    if first.is_ascii_digit() || (last.is_ascii_digit() && b.starts_with("\\frac")) {
        "\\cdot "
    } else if first.is_ascii_alphabetic() && ends_with_control_word(a) {
        " "
    } else {
        ""
    }
}

fn ends_with_control_word(s: &str) -> bool {
    let letters = s.trim_end_matches(|c: char| c.is_ascii_alphabetic());
    letters.len() < s.len() && letters.ends_with('\\')
}

impl Expr {
    /// Plain text with minimal parentheses, e.g. `1 - 2*m/r + q^2/r^2` (see [`text_of`]).
    pub fn to_text(&self) -> String {
        let names = self.param_names();
        text_of(self.node(), self.var(), &|k| names.get(k).cloned().unwrap_or_else(|| format!("p{k}")))
    }

    /// LaTeX, e.g. `1-\frac{2m}{r}+\frac{q^{2}}{r^{2}}`, with Greek and subscripted names (see [`latex_of`]
    /// and [`name_latex`]).
    pub fn to_latex(&self) -> String {
        let names = self.param_names();
        let param = |k: usize| names.get(k).map_or_else(|| format!("p_{{{k}}}"), |n| name_latex(n));
        latex_of(self.node(), &name_latex(self.var()), &param)
    }
}

#[cfg(test)]
#[path = "print_tests.rs"]
mod tests;
