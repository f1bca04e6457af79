//! User-typed expressions: parse text into a tree, evaluate it with exact derivatives (dual numbers), and
//! print it back symbolically (plain text and LaTeX).
//!
//! ```
//! use junctura::expr::Expr;
//! let params = vec!["m".to_string(), "q".to_string()];
//! let b = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &params).unwrap();
//! let [f, df, d2f, _] = b.derivatives(2.0, &[1.0, 0.5]);
//! assert!((f - (1.0 - 1.0 + 0.0625)).abs() < 1e-15);
//! assert!((df - (2.0 / 4.0 - 2.0 * 0.25 / 8.0)).abs() < 1e-15);
//! assert!((d2f - (-4.0 / 8.0 + 6.0 * 0.25 / 16.0)).abs() < 1e-15);
//! ```
//!
//! Symbolic derivatives, printing, and a compiled tape for many points:
//!
//! ```
//! use junctura::expr::Expr;
//! let params = vec!["m".to_string(), "q".to_string()];
//! let b = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &params).unwrap();
//! assert_eq!(b.derivative().to_text(), "2*m/r^2 - 2*q^2/r^3");
//! assert_eq!(b.to_latex(), r"1-\frac{2m}{r}+\frac{q^{2}}{r^{2}}");
//! let xs = [2.0, 3.0, 4.0];
//! let (mut f, mut df, mut d2f) = ([0.0; 3], [0.0; 3], [0.0; 3]);
//! b.tape().eval_batch_d2(&xs, &[1.0, 0.5], &mut f, &mut df, &mut d2f);
//! assert!((df[0] - (2.0 / 4.0 - 2.0 * 0.25 / 8.0)).abs() < 1e-15);
//! ```

pub mod ast;
pub mod eval;
mod inst;
mod jets;
pub mod parse;
pub mod print;
pub mod symbolic;
pub mod tape;
#[cfg(test)]
mod testgen;

pub use ast::{BinOp, Func, Node};
pub use eval::Scalar;
pub use parse::ParseError;
pub use print::{latex_of, name_latex, text_of};
pub use symbolic::{derivative, simplify};
pub use tape::{Tape, TapeEval};

use num_dual::{Dual3, Dual64};
use std::sync::Arc;

/// A parsed expression in one variable (`r` or `sigma`) and named parameters.
#[derive(Debug, Clone, PartialEq)]
pub struct Expr {
    source: String,
    var: String,
    params: Arc<[String]>,
    node: Node,
}

impl Expr {
    /// Parse `source` as a function of `var` with parameter names `params`.
    pub fn parse(source: &str, var: &str, params: &[String]) -> Result<Expr, ParseError> {
        let node = parse::Parser::parse(source, var, params)?;
        Ok(Expr { source: source.to_string(), var: var.to_string(), params: params.into(), node })
    }

    /// Build an expression directly from a tree (used by code that constructs formulas).
    pub fn from_node(node: Node, var: &str, params: &[String]) -> Expr {
        Expr { source: String::new(), var: var.to_string(), params: params.into(), node }
    }

    /// The text as typed.
    pub fn source(&self) -> &str {
        &self.source
    }

    /// The variable's name.
    pub fn var(&self) -> &str {
        &self.var
    }

    /// The parameter names, in the order `Node::Param` indexes them.
    pub fn param_names(&self) -> &[String] {
        &self.params
    }

    /// The expression tree.
    pub fn node(&self) -> &Node {
        &self.node
    }

    /// Evaluate at `x` with parameters of the same number type (for derivatives with respect to parameters).
    #[inline]
    pub fn eval<T: Scalar>(&self, x: T, params: &[T]) -> T {
        eval::eval_node(&self.node, x, |k| params[k])
    }

    /// Evaluate at `x` (any number type) with real parameter values.
    #[inline]
    pub fn eval_at<T: Scalar>(&self, x: T, params: &[f64]) -> T {
        eval::eval_node(&self.node, x, |k| T::from(params[k]))
    }

    /// Evaluate at `x` with parameters supplied by a function (e.g. lifted into a nested dual type).
    #[inline]
    pub fn eval_with<T: Scalar, P: Fn(usize) -> T + Copy>(&self, x: T, param: P) -> T {
        eval::eval_node(&self.node, x, param)
    }

    /// Plain value.
    #[inline]
    pub fn value(&self, x: f64, params: &[f64]) -> f64 {
        self.eval_at(x, params)
    }

    /// Value and first three derivatives with respect to the variable, exact to rounding.
    #[inline]
    pub fn derivatives(&self, x: f64, params: &[f64]) -> [f64; 4] {
        let d: Dual3<f64, f64> = self.eval_at(Dual3::new(x, 1.0, 0.0, 0.0), params);
        [d.re, d.v1, d.v2, d.v3]
    }

    /// Value and first three derivatives at every point of `xs`, written into `out` (same length).
    pub fn derivatives_batch(&self, xs: &[f64], params: &[f64], out: &mut [[f64; 4]]) {
        for (x, o) in xs.iter().zip(out.iter_mut()) {
            *o = self.derivatives(*x, params);
        }
    }

    /// Derivative with respect to parameter `k` at `x`.
    pub fn param_derivative(&self, x: f64, params: &[f64], k: usize) -> f64 {
        let ps: Vec<Dual64> =
            params.iter().enumerate().map(|(j, &v)| Dual64::new(v, if j == k { 1.0 } else { 0.0 })).collect();
        self.eval(Dual64::from(x), &ps).eps
    }

    /// The simplified derivative with respect to the variable, as a new expression with the same names (its
    /// source text is the printed derivative). See [`symbolic::derivative`] for the rules.
    pub fn derivative(&self) -> Expr {
        self.with_node(simplify(&derivative(&self.node)))
    }

    /// The same function in simplified form (see [`symbolic::simplify`]); the source text is the printed
    /// simplified tree.
    pub fn simplified(&self) -> Expr {
        self.with_node(simplify(&self.node))
    }

    /// Compile into a flat instruction tape for fast repeated evaluation (see [`Tape`]).
    pub fn tape(&self) -> Tape {
        Tape::compile(&self.node)
    }

    fn with_node(&self, node: Node) -> Expr {
        let mut e = Expr { source: String::new(), var: self.var.clone(), params: self.params.clone(), node };
        e.source = e.to_text();
        e
    }

    /// True if the expression depends on its variable.
    pub fn depends_on_var(&self) -> bool {
        self.node.depends_on_var()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn names() -> Vec<String> {
        vec!["m".into(), "q".into(), "l".into()]
    }

    #[test]
    fn integer_powers_of_negative_bases() {
        let e = Expr::parse("r^3 + r^-2", "r", &[]).unwrap();
        let [f, d1, ..] = e.derivatives(-2.0, &[]);
        assert_eq!(f, -8.0 + 0.25);
        assert_eq!(d1, 12.0 + 2.0 / 8.0);
    }

    #[test]
    fn parameter_derivative() {
        let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &names()).unwrap();
        let d = e.param_derivative(2.0, &[1.0, 0.5, 0.0], 1);
        assert!((d - 2.0 * 0.5 / 4.0).abs() < 1e-15);
    }

    const EXPRS: [&str; 6] = [
        "1 - 2*m/r + q^2/r^2",
        "1 - 2*m*r^2/(r^3 + 2*m*q^2)",
        "exp(-2*m/r) * (1 + q*sin(r))",
        "1 - 2*m/r - l*r^2/3 + cosh(q/r) - tanh(r)",
        "sqrt(1 + r^2) + log(r) + cos(r)*tan(r/5) + sinh(r/3)",
        "abs(r - 7)^1.5 + r^q",
    ];

    proptest! {
        /// Property: automatic derivatives agree with central differences of the next-lower derivative.
        #[test]
        fn derivatives_match_central_differences(r in 1.1f64..6.0, m in 0.1f64..1.0, q in 0.0f64..0.9, l in -0.1f64..0.1) {
            let ps = [m, q, l];
            for src in EXPRS {
                let e = Expr::parse(src, "r", &names()).unwrap();
                let h = 1e-5 * r;
                let up = e.derivatives(r + h, &ps);
                let dn = e.derivatives(r - h, &ps);
                let mid = e.derivatives(r, &ps);
                for k in 0..3 {
                    let fd = (up[k] - dn[k]) / (2.0 * h);
                    let scale = 1.0 + mid[k + 1].abs() + up[k].abs() / h * 1e-10;
                    prop_assert!((fd - mid[k + 1]).abs() < 1e-5 * scale, "{} d{}: ad {} fd {}", src, k + 1, mid[k + 1], fd);
                }
            }
        }
    }
}
