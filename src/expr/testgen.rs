//! Test support: random expression trees and a list of typical metric functions and equations of state.

use super::ast::{BinOp, Func, Node};
use proptest::prelude::*;

/// Parameter names used by the samples and the random trees (indices 0..4).
pub fn names() -> Vec<String> {
    ["m", "q", "l", "alpha"].iter().map(|s| s.to_string()).collect()
}

/// Typical metric functions in `r` (parameters `m`, `q`, `l`, `alpha`).
pub const METRICS: [&str; 12] = [
    "1 - 2*m/r",
    "1 - 2*m/r + q^2/r^2",
    "1 - 2*m/r - l*r^2/3",
    "1 - 2*m*r^2/(r^3 + 2*m*l^2)",
    "1 - 2*m*r^2/(r^2 + q^2)^(3/2)",
    "exp(-2*m/r)",
    "(1 - 2*m/r)*exp(2*alpha*r)",
    "1 - 2*m/r + q^2/r^2 - l*r^2/3 + alpha*log(r/q)",
    "sqrt(1 + r^2) + cos(r)*tan(r/5) + sinh(r/3) - cosh(q/r) + tanh(r)",
    "abs(r - 2)^1.5 + r^q + 2^r + r^r",
    "sin(pi*r/4)^2 - 1/(1 + r^2)^0.5 + r^-3",
    "-(m - r)^3/((2*r)^2*(-r))",
];

/// Random trees over the variable and four parameters, mixing every operator and function.
pub fn arb_node() -> impl Strategy<Value = Node> {
    let leaf = prop_oneof![
        3 => Just(Node::Var),
        2 => (0usize..4).prop_map(Node::Param),
        2 => prop::sample::select(vec![0.5, 1.0, 2.0, 3.0, 0.25, 1.5, 0.0]).prop_map(Node::Num),
        1 => Just(Node::Pi),
    ];
    leaf.prop_recursive(4, 24, 2, |inner| {
        prop_oneof![
            1 => inner.clone().prop_map(Node::negate),
            4 => (prop::sample::select(vec![BinOp::Add, BinOp::Sub, BinOp::Mul, BinOp::Div]), inner.clone(), inner.clone())
                .prop_map(|(op, l, r)| Node::bin(op, l, r)),
            1 => (inner.clone(), prop::sample::select(vec![-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0, 0.5, 1.5, -0.5]))
                .prop_map(|(b, e)| {
                    let e = if e < 0.0 { Node::negate(Node::Num(-e)) } else { Node::Num(e) };
                    Node::bin(BinOp::Pow, b, e)
                }),
            1 => (inner.clone(), inner.clone()).prop_map(|(b, e)| Node::bin(BinOp::Pow, b, e)),
            2 => (prop::sample::select(Func::ALL.to_vec()), inner).prop_map(|(f, a)| Node::call(f, a)),
        ]
    })
}

/// True if `a` and `b` agree to `rel` relative to `scale` (or are both NaN / the same infinity).
pub fn close(a: f64, b: f64, rel: f64, scale: f64) -> bool {
    if a.is_nan() || b.is_nan() {
        return a.is_nan() && b.is_nan();
    }
    if a.is_infinite() || b.is_infinite() {
        return a == b;
    }
    (a - b).abs() <= rel * (1.0 + scale.abs() + a.abs().max(b.abs()))
}
