//! Equations of state p = P(sigma) of a timelike shell, evaluated over any number type.

use crate::expr::{Expr, Scalar};

/// A barotropic equation of state p = P(sigma), with parameters supplied by `param`. beta^2 = P'(sigma) comes
/// from evaluating it at a dual number (`Junction::law_and_slope`).
pub trait EquationOfState {
    /// P(sigma).
    fn pressure<U: Scalar, P: Fn(usize) -> U + Copy>(&self, sigma: U, param: P) -> U;
    /// The law as an expression in sigma, where it is one (closed forms, provenance).
    fn expression(&self) -> Option<&Expr>;
}

/// A law typed as an expression in sigma.
#[derive(Debug, Clone)]
pub struct ExprLaw(pub Expr);

impl EquationOfState for ExprLaw {
    #[inline]
    fn pressure<U: Scalar, P: Fn(usize) -> U + Copy>(&self, sigma: U, param: P) -> U {
        self.0.eval_with(sigma, param)
    }
    fn expression(&self) -> Option<&Expr> {
        Some(&self.0)
    }
}

/// The equations of state junctura knows; a new family is one `EquationOfState` impl and one variant here.
#[derive(Debug, Clone)]
pub enum Eos {
    /// p = P(sigma) typed as an expression.
    Expr(ExprLaw),
}

impl EquationOfState for Eos {
    #[inline]
    fn pressure<U: Scalar, P: Fn(usize) -> U + Copy>(&self, sigma: U, param: P) -> U {
        match self {
            Eos::Expr(l) => l.pressure(sigma, param),
        }
    }
    fn expression(&self) -> Option<&Expr> {
        match self {
            Eos::Expr(l) => l.expression(),
        }
    }
}
