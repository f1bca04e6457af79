//! Metric sides: A(r) and B(r) of -A dt^2 + dr^2/B + r^2 dOmega^2, evaluated over any number type.

use crate::expr::{Expr, Scalar};

/// A(r) and B(r) of one side, evaluated at a radius of any number type with parameters supplied by `param`
/// (so that a parameter can be a dual number when a derivative with respect to it is wanted).
pub trait MetricSide {
    /// A(r) (g_tt = -A).
    fn a<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T;
    /// B(r) (g_rr = 1/B).
    fn b<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T;
    /// True when B is the same function as A (one evaluation serves both).
    fn b_is_a(&self) -> bool;
    /// A and B as expressions, where the side has them (closed forms, rational horizons, formula printing).
    fn expressions(&self) -> Option<(&Expr, &Expr)>;
}

/// A side given by two expressions in r (B = A unless the file gives B).
#[derive(Debug, Clone)]
pub struct ExprSide {
    /// A(r).
    pub a: Expr,
    /// B(r).
    pub b: Expr,
    /// True if B was given separately.
    pub b_given: bool,
    /// True if B is the same function as A: not given, or given as the same expression.
    pub b_is_a: bool,
}

impl ExprSide {
    /// The side with A(r) = `a` and B(r) = `b`, or B = A when `b` is `None`.
    pub fn new(a: Expr, b: Option<Expr>) -> ExprSide {
        match b {
            Some(b) => ExprSide { b_is_a: a == b, a, b, b_given: true },
            None => ExprSide { b: a.clone(), a, b_given: false, b_is_a: true },
        }
    }
}

impl MetricSide for ExprSide {
    #[inline]
    fn a<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
        self.a.eval_with(r, param)
    }
    #[inline]
    fn b<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
        self.b.eval_with(r, param)
    }
    fn b_is_a(&self) -> bool {
        self.b_is_a
    }
    fn expressions(&self) -> Option<(&Expr, &Expr)> {
        Some((&self.a, &self.b))
    }
}

/// The metric sides junctura knows; a new kind of side is one `MetricSide` impl and one variant here.
#[derive(Debug, Clone)]
pub enum Metric {
    /// A and B typed as expressions.
    Expr(ExprSide),
}

impl MetricSide for Metric {
    #[inline]
    fn a<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
        match self {
            Metric::Expr(s) => s.a(r, param),
        }
    }
    #[inline]
    fn b<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
        match self {
            Metric::Expr(s) => s.b(r, param),
        }
    }
    fn b_is_a(&self) -> bool {
        match self {
            Metric::Expr(s) => s.b_is_a(),
        }
    }
    fn expressions(&self) -> Option<(&Expr, &Expr)> {
        match self {
            Metric::Expr(s) => s.expressions(),
        }
    }
}
