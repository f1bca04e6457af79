//! Symbolic side of expressions: exact derivative trees and a value-preserving simplifier.
//!
//! `derivative` applies the textbook differentiation rules node by node (common practice); `simplify`
//! rewrites a tree into a tidy normal form (sums of products with one rational numeric coefficient each) without
//! changing its value at points where both forms are defined.

use super::ast::{BinOp, Func, Node};
use std::cmp::Ordering;

fn is_num(n: &Node, v: f64) -> bool {
    n.as_constant() == Some(v)
}

fn add(a: Node, b: Node) -> Node {
    if is_num(&a, 0.0) {
        b
    } else if is_num(&b, 0.0) {
        a
    } else {
        Node::bin(BinOp::Add, a, b)
    }
}

fn sub(a: Node, b: Node) -> Node {
    if is_num(&b, 0.0) {
        a
    } else if is_num(&a, 0.0) {
        Node::negate(b)
    } else {
        Node::bin(BinOp::Sub, a, b)
    }
}

fn mul(a: Node, b: Node) -> Node {
    if is_num(&a, 0.0) || is_num(&b, 0.0) {
        Node::Num(0.0)
    } else if is_num(&a, 1.0) {
        b
    } else if is_num(&b, 1.0) {
        a
    } else {
        Node::bin(BinOp::Mul, a, b)
    }
}

fn div(a: Node, b: Node) -> Node {
    if is_num(&b, 1.0) {
        a
    } else {
        Node::bin(BinOp::Div, a, b)
    }
}

fn pow(a: Node, b: Node) -> Node {
    Node::bin(BinOp::Pow, a, b)
}

/// The derivative of `node` with respect to the variable, as a new (unsimplified) tree.
///
/// Rules (common practice): sum, product and quotient rules; `u^n` with a constant exponent gives
/// `n u^(n-1) u'`; a constant base gives `a^v ln(a) v'`; the general power `u^v = exp(v ln u)` gives
/// `u^v (v' ln u + v u'/u)`; `abs'(u) = sign(u)` (with `sign(0) = +1`, the right derivative, as in the
/// evaluator) and `sign' = 0`. Subtrees that do not contain the variable differentiate to `0` directly.
pub fn derivative(node: &Node) -> Node {
    if !node.depends_on_var() {
        return Node::Num(0.0);
    }
    match node {
        Node::Var => Node::Num(1.0),
        Node::Num(_) | Node::Pi | Node::Param(_) => Node::Num(0.0),
        Node::Neg(a) => {
            let d = derivative(a);
            if is_num(&d, 0.0) {
                d
            } else {
                Node::negate(d)
            }
        }
        Node::Bin(op, l, r) => {
            let (l, r) = (l.as_ref(), r.as_ref());
            match op {
                BinOp::Add => add(derivative(l), derivative(r)),
                BinOp::Sub => sub(derivative(l), derivative(r)),
                BinOp::Mul => add(mul(derivative(l), r.clone()), mul(l.clone(), derivative(r))),
                BinOp::Div => {
                    let first = div(derivative(l), r.clone());
                    if !r.depends_on_var() {
                        return first;
                    }
                    let second = div(mul(l.clone(), derivative(r)), pow(r.clone(), Node::Num(2.0)));
                    if is_num(&first, 0.0) {
                        Node::negate(second)
                    } else {
                        sub(first, second)
                    }
                }
                BinOp::Pow => pow_derivative(node, l, r),
            }
        }
        Node::Call(f, a) => {
            let da = derivative(a);
            let a = a.as_ref().clone();
            let call = |g: Func, x: Node| Node::call(g, x);
            match f {
                Func::Sqrt => div(da, mul(Node::Num(2.0), call(Func::Sqrt, a))),
                Func::Exp => mul(call(Func::Exp, a), da),
                Func::Log => div(da, a),
                Func::Sin => mul(call(Func::Cos, a), da),
                Func::Cos => Node::negate(mul(call(Func::Sin, a), da)),
                Func::Tan => div(da, pow(call(Func::Cos, a), Node::Num(2.0))),
                Func::Sinh => mul(call(Func::Cosh, a), da),
                Func::Cosh => mul(call(Func::Sinh, a), da),
                Func::Tanh => div(da, pow(call(Func::Cosh, a), Node::Num(2.0))),
                Func::Abs => mul(call(Func::Sign, a), da),
                Func::Sign => Node::Num(0.0),
            }
        }
    }
}

/// Derivative of `node = base^exp` (see [`derivative`] for the rules).
fn pow_derivative(node: &Node, base: &Node, exp: &Node) -> Node {
    let db = derivative(base);
    if let Some(n) = exp.as_integer() {
        if n == 0 {
            return Node::Num(0.0);
        }
        let lowered = pow(base.clone(), Node::Num(f64::from(n) - 1.0));
        return mul(mul(Node::Num(f64::from(n)), lowered), db);
    }
    if let Some(c) = exp.as_constant() {
        return mul(mul(Node::Num(c), pow(base.clone(), Node::Num(c - 1.0))), db);
    }
    if !exp.depends_on_var() {
        let lowered = pow(base.clone(), sub(exp.clone(), Node::Num(1.0)));
        return mul(mul(exp.clone(), lowered), db);
    }
    let de = derivative(exp);
    let ln = Node::call(Func::Log, base.clone());
    if !base.depends_on_var() {
        return mul(mul(node.clone(), ln), de);
    }
    mul(node.clone(), add(mul(de, ln), div(mul(exp.clone(), db), base.clone())))
}

/// A numeric coefficient kept as a reduced fraction `n/d` while both are integers (so `2*m/3` stays
/// readable), and as a plain float otherwise (`d = 1`).
#[derive(Debug, Clone, Copy, PartialEq)]
struct Coef {
    n: f64,
    d: f64,
}

fn is_int(v: f64) -> bool {
    v.fract() == 0.0 && v.abs() < 9.0e15
}

fn gcd(mut a: u64, mut b: u64) -> u64 {
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a
}

impl Coef {
    const ONE: Coef = Coef { n: 1.0, d: 1.0 };

    fn new(n: f64, d: f64) -> Option<Coef> {
        if d == 0.0 || !n.is_finite() || !d.is_finite() {
            return None;
        }
        let (n, d) = if d < 0.0 { (-n, -d) } else { (n, d) };
        if n == 0.0 {
            return Some(Coef { n: 0.0, d: 1.0 });
        }
        if is_int(n) && is_int(d) {
            let g = gcd(n.abs() as u64, d as u64) as f64;
            return Some(Coef { n: n / g, d: d / g });
        }
        let v = n / d;
        v.is_finite().then_some(Coef { n: v, d: 1.0 })
    }

    fn mul(self, o: Coef) -> Option<Coef> {
        Coef::new(self.n * o.n, self.d * o.d)
    }

    fn add(self, o: Coef) -> Option<Coef> {
        if self.d == o.d {
            return Coef::new(self.n + o.n, self.d);
        }
        Coef::new(self.n * o.d + o.n * self.d, self.d * o.d)
    }

    fn powi(self, k: i32) -> Option<Coef> {
        if k >= 0 {
            Coef::new(self.n.powi(k), self.d.powi(k))
        } else {
            Coef::new(self.d.powi(-k), self.n.powi(-k))
        }
    }
}

/// A product `coef * prod(base^exp)`: bases sorted and distinct, exponents non-zero constants (integer,
/// rational or decimal).
type Factors = Vec<(Node, Coef)>;

impl Coef {
    fn int(self) -> Option<i32> {
        (self.d == 1.0 && is_int(self.n) && self.n.abs() <= 1.0e6).then_some(self.n as i32)
    }
}

/// The value of a constant exponent: a number, possibly negated, or a quotient of such (`3/2` after
/// simplification).
fn const_exp(e: &Node) -> Option<Coef> {
    match e {
        Node::Num(v) => Coef::new(*v, 1.0),
        Node::Neg(x) => const_exp(x).and_then(|c| c.mul(Coef { n: -1.0, d: 1.0 })),
        Node::Bin(BinOp::Div, a, b) => {
            let (a, b) = (const_exp(a)?, const_exp(b)?);
            Coef::new(a.n * b.d, a.d * b.n)
        }
        _ => None,
    }
}

/// Rank for the canonical factor order: numbers, pi, parameters, the variable, calls, then the rest; a
/// power ranks with its base (so `m^r*log(m)`, `q^2*r`).
fn rank(n: &Node) -> u8 {
    match n {
        Node::Num(_) => 0,
        Node::Pi => 1,
        Node::Param(_) => 2,
        Node::Var => 3,
        Node::Call(..) => 4,
        Node::Bin(BinOp::Pow, b, _) => rank(b),
        Node::Neg(_) => 6,
        Node::Bin(..) => 7,
    }
}

fn variant(n: &Node) -> u8 {
    match n {
        Node::Num(_) => 0,
        Node::Pi => 1,
        Node::Param(_) => 2,
        Node::Var => 3,
        Node::Call(..) => 4,
        Node::Neg(_) => 5,
        Node::Bin(op, ..) => 6 + *op as u8,
    }
}

/// A total order on trees, used to sort factors so that equal products compare equal.
fn node_cmp(a: &Node, b: &Node) -> Ordering {
    rank(a).cmp(&rank(b)).then_with(|| variant(a).cmp(&variant(b))).then_with(|| match (a, b) {
        (Node::Num(x), Node::Num(y)) => x.total_cmp(y),
        (Node::Param(i), Node::Param(j)) => i.cmp(j),
        (Node::Call(f, x), Node::Call(g, y)) => (*f as u8).cmp(&(*g as u8)).then_with(|| node_cmp(x, y)),
        (Node::Neg(x), Node::Neg(y)) => node_cmp(x, y),
        (Node::Bin(_, l1, r1), Node::Bin(_, l2, r2)) => node_cmp(l1, l2).then_with(|| node_cmp(r1, r2)),
        _ => Ordering::Equal,
    })
}

/// Flatten products, quotients, negations and constant powers of `node` (raised to `exp`) into `coef` and
/// `out`. Returns `None` when a numeric step would divide by zero or overflow (the caller then keeps the node).
///
/// Only rewrites that keep the value wherever the original is defined are made: products and signs are
/// split only under integer powers (`(a*b)^(1/2)` is not `a^(1/2)*b^(1/2)` for negative `a`, `b`), and
/// `(x^n)^c` with an even integer `n` and a non-integer `c` is left alone (`(x^2)^(1/2) = |x|`).
fn collect_factors(node: &Node, exp: Coef, coef: &mut Coef, out: &mut Factors) -> Option<()> {
    let int = exp.int();
    match node {
        Node::Num(v) if int.is_some() => *coef = coef.mul(Coef::new(*v, 1.0)?.powi(int?)?)?,
        // A constant to a fractional power folds only when the result is an integer (`sqrt(4) = 2`).
        Node::Num(v) if is_int(v.powf(exp.n / exp.d)) => *coef = coef.mul(Coef::new(v.powf(exp.n / exp.d), 1.0)?)?,
        Node::Neg(a) if int.is_some() => {
            if int? % 2 != 0 {
                *coef = coef.mul(Coef { n: -1.0, d: 1.0 })?;
            }
            collect_factors(a, exp, coef, out)?;
        }
        Node::Bin(BinOp::Mul, l, r) if int.is_some() => {
            collect_factors(l, exp, coef, out)?;
            collect_factors(r, exp, coef, out)?;
        }
        Node::Bin(BinOp::Div, l, r) if int.is_some() => {
            collect_factors(l, exp, coef, out)?;
            collect_factors(r, Coef { n: -exp.n, d: exp.d }, coef, out)?;
        }
        Node::Bin(BinOp::Pow, b, e) if const_exp(e).is_some() => {
            let c = const_exp(e)?;
            if int.is_none() && c.int().is_some_and(|n| n % 2 == 0) {
                out.push((node.clone(), exp));
            } else {
                collect_factors(b, exp.mul(c)?, coef, out)?;
            }
        }
        Node::Call(Func::Sqrt, b) => collect_factors(b, exp.mul(Coef { n: 1.0, d: 2.0 })?, coef, out)?,
        _ => out.push((node.clone(), exp)),
    }
    Some(())
}

/// The product normal form of `node`: coefficient and sorted, merged factors with non-zero exponents.
fn product_parts(node: &Node) -> (Coef, Factors) {
    let mut coef = Coef::ONE;
    let mut raw = Vec::new();
    let opaque = || (Coef::ONE, vec![(node.clone(), Coef::ONE)]);
    if collect_factors(node, Coef::ONE, &mut coef, &mut raw).is_none() {
        return opaque();
    }
    raw.sort_by(|a, b| node_cmp(&a.0, &b.0));
    let mut merged: Factors = Vec::with_capacity(raw.len());
    for (b, e) in raw {
        match merged.last_mut() {
            Some((last, le)) if *last == b => match le.add(e) {
                Some(s) => *le = s,
                None => return opaque(),
            },
            _ => merged.push((b, e)),
        }
    }
    // sign(x)^2 = 1 for every x (sign is -1 or +1 here).
    for (b, e) in merged.iter_mut() {
        if let (Node::Call(Func::Sign, _), Some(n)) = (&*b, e.int()) {
            *e = Coef { n: f64::from(n.rem_euclid(2)), d: 1.0 };
        }
    }
    merged.retain(|(_, e)| e.n != 0.0);
    if coef.n == 0.0 {
        merged.clear();
    }
    (coef, merged)
}

/// `base^e` for a positive constant exponent: `sqrt` for one half, a quotient for other fractions.
fn power_node(base: &Node, e: Coef) -> Node {
    if e == Coef::ONE {
        return base.clone();
    }
    if e == (Coef { n: 1.0, d: 2.0 }) {
        return Node::call(Func::Sqrt, base.clone());
    }
    let exp = if e.d == 1.0 { Node::Num(e.n) } else { Node::bin(BinOp::Div, Node::Num(e.n), Node::Num(e.d)) };
    pow(base.clone(), exp)
}

/// Rebuild `coef * prod(base^exp)` as `[-](c * numerator factors) / (d * denominator factors)`.
fn build_product(coef: Coef, factors: &[(Node, Coef)]) -> Node {
    if coef.n == 0.0 {
        return Node::Num(0.0);
    }
    let chain = |first: Option<Node>, positive: bool| {
        let mut acc = first;
        for (b, e) in factors.iter().filter(|(_, e)| (e.n > 0.0) == positive) {
            let f = power_node(b, Coef { n: e.n.abs(), d: e.d });
            acc = Some(match acc {
                None => f,
                Some(a) => Node::bin(BinOp::Mul, a, f),
            });
        }
        acc
    };
    let cn = coef.n.abs();
    let numer = chain((cn != 1.0).then_some(Node::Num(cn)), true).unwrap_or(Node::Num(1.0));
    let denom = chain((coef.d != 1.0).then_some(Node::Num(coef.d)), false);
    let q = match denom {
        None => numer,
        Some(d) => Node::bin(BinOp::Div, numer, d),
    };
    if coef.n < 0.0 {
        Node::negate(q)
    } else {
        q
    }
}

/// Flatten sums and differences of `node` into product-normal terms, merging terms with equal factors.
fn collect_terms(node: &Node, negate: bool, out: &mut Vec<(Coef, Factors)>) -> Option<()> {
    match node {
        Node::Bin(BinOp::Add, l, r) => {
            collect_terms(l, negate, out)?;
            collect_terms(r, negate, out)?;
        }
        Node::Bin(BinOp::Sub, l, r) => {
            collect_terms(l, negate, out)?;
            collect_terms(r, !negate, out)?;
        }
        Node::Neg(a) => collect_terms(a, !negate, out)?,
        _ => {
            let (mut c, f) = product_parts(node);
            if negate {
                c.n = -c.n;
            }
            match out.iter_mut().find(|(_, g)| *g == f) {
                Some((c0, _)) => *c0 = c0.add(c)?,
                None => out.push((c, f)),
            }
        }
    }
    Some(())
}

/// Normal form of a sum/product/negation/integer-power node whose children are already simplified.
fn normalize(node: Node) -> Node {
    let mut terms = Vec::new();
    if collect_terms(&node, false, &mut terms).is_none() {
        return node;
    }
    let mut acc: Option<Node> = None;
    for (c, f) in terms.into_iter().filter(|(c, _)| c.n != 0.0) {
        acc = Some(match acc {
            None => build_product(c, &f),
            Some(a) if c.n < 0.0 => Node::bin(BinOp::Sub, a, build_product(Coef { n: -c.n, d: c.d }, &f)),
            Some(a) => Node::bin(BinOp::Add, a, build_product(c, &f)),
        });
    }
    acc.unwrap_or(Node::Num(0.0))
}

/// A finite integer value (after folding a constant), if it is one; non-integers stay symbolic.
fn integer_result(v: f64) -> Option<Node> {
    (v.is_finite() && is_int(v)).then(|| if v < 0.0 { Node::negate(Node::Num(-v)) } else { Node::Num(v.abs()) })
}

fn simplify_once(node: &Node) -> Node {
    match node {
        Node::Num(v) if *v < 0.0 => Node::negate(Node::Num(-v)),
        Node::Num(v) => Node::Num(v.abs()),
        Node::Pi | Node::Var | Node::Param(_) => node.clone(),
        Node::Neg(a) => normalize(Node::negate(simplify_once(a))),
        Node::Bin(BinOp::Pow, b, e) => {
            let (b, e) = (simplify_once(b), simplify_once(e));
            if const_exp(&e).is_some() {
                return normalize(pow(b, e));
            }
            if is_num(&b, 1.0) {
                return Node::Num(1.0);
            }
            if let (Some(x), Some(y)) = (b.as_constant(), e.as_constant()) {
                if let Some(n) = integer_result(x.powf(y)) {
                    return n;
                }
            }
            pow(b, e)
        }
        Node::Bin(op, l, r) => normalize(Node::bin(*op, simplify_once(l), simplify_once(r))),
        Node::Call(Func::Sqrt, a) => normalize(Node::call(Func::Sqrt, simplify_once(a))),
        Node::Call(f, a) => {
            let a = simplify_once(a);
            if let Some(v) = a.as_constant() {
                if let Some(n) = integer_result(super::eval::apply(*f, v)) {
                    return n;
                }
            }
            Node::call(*f, a)
        }
    }
}

/// Simplify `node` without changing its value (at points where both trees are defined).
///
/// Folds numeric constants (keeping `pi` symbolic; functions of constants fold only to integers), removes
/// neutral elements (`x*1`, `x+0`, `x/1`, `x^1`, `x^0`, `0*x`, `--x`, `-(0)`), gathers each product into one
/// rational coefficient times sorted factors with merged integer powers (`2*m*3 -> 6*m`,
/// `a*(b/c) -> a*b/c`, `(r^2)^2 -> r^4`), pulls signs out of products (`-(a)*b -> -(a*b)`), writes
/// `x + (-y)` as `x - y` and merges like terms (`m/r + m/r -> 2*m/r`). Constant powers of the same base
/// combine where that keeps the value (`sqrt(x)*x^(3/2)/x^3 -> 1/x`). Sums keep their order of appearance.
pub fn simplify(node: &Node) -> Node {
    let mut cur = simplify_once(node);
    for _ in 0..8 {
        let next = simplify_once(&cur);
        if next == cur {
            break;
        }
        cur = next;
    }
    cur
}

#[cfg(test)]
#[path = "symbolic_tests.rs"]
mod tests;
