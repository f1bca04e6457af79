//! Evaluation of an expression tree over any (generalised) dual number type, so that values and exact
//! derivatives (with respect to the variable or to parameters) come from one code path.

use super::ast::{BinOp, Func, Node};
use num_dual::DualNum;

/// The number types expressions are evaluated with: `f64` and the dual numbers of `num-dual`
/// (nested as deep as needed).
pub trait Scalar: DualNum<f64> + Copy {}
impl<T: DualNum<f64> + Copy> Scalar for T {}

/// Evaluate `node` at variable value `x`, looking parameters up through `param`.
#[inline]
pub fn eval_node<T: Scalar, P: Fn(usize) -> T + Copy>(node: &Node, x: T, param: P) -> T {
    match node {
        Node::Num(v) => T::from(*v),
        Node::Pi => T::from(std::f64::consts::PI),
        Node::Var => x,
        Node::Param(k) => param(*k),
        Node::Neg(a) => -eval_node(a, x, param),
        Node::Bin(op, l, r) => {
            if *op == BinOp::Pow {
                return eval_pow(l, r, x, param);
            }
            let a = eval_node(l, x, param);
            let b = eval_node(r, x, param);
            match op {
                BinOp::Add => a + b,
                BinOp::Sub => a - b,
                BinOp::Mul => a * b,
                BinOp::Div => a / b,
                BinOp::Pow => unreachable!("handled above"),
            }
        }
        Node::Call(f, a) => apply(*f, eval_node(a, x, param)),
    }
}

/// Powers: integer literal exponents use repeated multiplication (exact for negative bases and at zero),
/// other constant exponents `powf`, and anything else `exp(b ln a)`.
#[inline]
fn eval_pow<T: Scalar, P: Fn(usize) -> T + Copy>(base: &Node, exp: &Node, x: T, param: P) -> T {
    let a = eval_node(base, x, param);
    if let Some(n) = exp.as_integer() {
        return a.powi(n);
    }
    if let Some(c) = exp.as_constant() {
        if c == 0.5 {
            return a.sqrt();
        }
        return a.powf(c);
    }
    let b = eval_node(exp, x, param);
    (b * a.ln()).exp()
}

/// Apply a built-in function.
#[inline]
pub fn apply<T: Scalar>(f: Func, a: T) -> T {
    match f {
        Func::Sqrt => a.sqrt(),
        Func::Exp => a.exp(),
        Func::Log => a.ln(),
        Func::Sin => a.sin(),
        Func::Cos => a.cos(),
        Func::Tan => a.tan(),
        Func::Sinh => a.sinh(),
        Func::Cosh => a.cosh(),
        // tanh as (1 - u)/(1 + u) with u = exp(-2|x|) <= 1: the dual parts stay accurate where tanh saturates
        // (the sinh/cosh quotient loses every digit of the higher derivatives there).
        Func::Tanh => {
            if a.re() >= 0.0 {
                let u = (a * -2.0).exp();
                (T::one() - u) / (T::one() + u)
            } else {
                let u = (a * 2.0).exp();
                (u - T::one()) / (u + T::one())
            }
        }
        // d|x|/dx is taken as sign(x), and +1 at exactly x = 0 (the right derivative).
        Func::Abs => {
            if a.re() < 0.0 {
                -a
            } else {
                a
            }
        }
        // Piecewise constant: all derivatives vanish (the jump at 0 is not represented).
        Func::Sign => {
            if a.re() < 0.0 {
                T::from(-1.0)
            } else {
                T::from(1.0)
            }
        }
    }
}
