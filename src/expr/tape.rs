//! Flat instruction tapes: an expression tree compiled once into straight-line code for fast repeated
//! evaluation.
//!
//! Each instruction writes its own slot (single assignment) and reads only earlier slots. Constant subtrees
//! are folded, repeated subtrees are computed once, integer powers become a square, a reciprocal or `powi`.
//! Instructions that depend only on parameters come first, so the batch evaluators compute them once per call
//! and run only the variable-dependent part per point. The numerical semantics are those of the tree
//! evaluator ([`super::eval`]): integer literal exponents use `powi`, other constant exponents `powf`
//! (`sqrt` for `0.5`), anything else `exp(b ln a)`.
//!
//! ```
//! use junctura::expr::Expr;
//! let params = vec!["m".to_string()];
//! let e = Expr::parse("1 - 2*m/r", "r", &params).unwrap();
//! let tape = e.tape();
//! let xs = [2.0, 4.0];
//! let (mut f, mut df, mut d2f) = ([0.0; 2], [0.0; 2], [0.0; 2]);
//! tape.eval_batch_d2(&xs, &[1.0], &mut f, &mut df, &mut d2f);
//! assert_eq!(f, [0.0, 0.5]);
//! assert_eq!(df, [0.5, 0.125]);
//! assert_eq!(tape.eval(2.0, |_| 1.0), 0.0);
//! ```

use super::ast::{BinOp, Func, Node};
use super::eval::{apply, eval_node, Scalar};
use super::inst::{Inst, BLOCK};
use std::collections::HashMap;

/// Hashable identity of an instruction, for sharing repeated subtrees.
fn key(inst: &Inst) -> (u8, u64, u64) {
    match *inst {
        Inst::Const(v) => (0, v.to_bits(), 0),
        Inst::Var => (1, 0, 0),
        Inst::Param(k) => (2, k as u64, 0),
        Inst::Neg(a) => (3, a.into(), 0),
        Inst::Add(a, b) => (4, a.into(), b.into()),
        Inst::Sub(a, b) => (5, a.into(), b.into()),
        Inst::Mul(a, b) => (6, a.into(), b.into()),
        Inst::Div(a, b) => (7, a.into(), b.into()),
        Inst::Square(a) => (8, a.into(), 0),
        Inst::Powi(a, n) => (9, a.into(), n as u64),
        Inst::Powf(a, c) => (10, a.into(), c.to_bits()),
        Inst::Call(f, a) => (11 + f as u8, a.into(), 0),
    }
}

/// A compiled expression (see the module documentation).
#[derive(Debug, Clone, PartialEq)]
pub struct Tape {
    insts: Vec<Inst>,
    /// Instructions `0..n_pre` do not depend on the variable.
    n_pre: usize,
    /// The slot holding the result.
    out: usize,
}

#[derive(Default)]
struct Builder {
    insts: Vec<Inst>,
    var_dep: Vec<bool>,
    memo: HashMap<(u8, u64, u64), u32>,
}

fn is_constant(n: &Node) -> bool {
    match n {
        Node::Num(_) | Node::Pi => true,
        Node::Var | Node::Param(_) => false,
        Node::Neg(a) | Node::Call(_, a) => is_constant(a),
        Node::Bin(_, l, r) => is_constant(l) && is_constant(r),
    }
}

impl Builder {
    fn emit(&mut self, inst: Inst) -> u32 {
        let k = key(&inst);
        if let Some(&i) = self.memo.get(&k) {
            return i;
        }
        let dep = |i: u32| self.var_dep[i as usize];
        let d = match inst {
            Inst::Const(_) | Inst::Param(_) => false,
            Inst::Var => true,
            Inst::Neg(a) | Inst::Square(a) | Inst::Powi(a, _) | Inst::Powf(a, _) | Inst::Call(_, a) => dep(a),
            Inst::Add(a, b) | Inst::Sub(a, b) | Inst::Mul(a, b) | Inst::Div(a, b) => dep(a) || dep(b),
        };
        let i = self.insts.len() as u32;
        self.insts.push(inst);
        self.var_dep.push(d);
        self.memo.insert(k, i);
        i
    }

    fn node(&mut self, n: &Node) -> u32 {
        if is_constant(n) && !matches!(n, Node::Num(_)) {
            return self.emit(Inst::Const(eval_node(n, 0.0, |_| f64::NAN)));
        }
        match n {
            Node::Num(v) => self.emit(Inst::Const(*v)),
            Node::Pi => self.emit(Inst::Const(std::f64::consts::PI)),
            Node::Var => self.emit(Inst::Var),
            Node::Param(k) => self.emit(Inst::Param(*k)),
            Node::Neg(a) => {
                let a = self.node(a);
                self.emit(Inst::Neg(a))
            }
            Node::Call(f, a) => {
                let a = self.node(a);
                self.emit(Inst::Call(*f, a))
            }
            Node::Bin(BinOp::Pow, b, e) => {
                let bi = self.node(b);
                if let Some(k) = e.as_integer() {
                    return match k {
                        0 => self.emit(Inst::Const(1.0)),
                        1 => bi,
                        2 => self.emit(Inst::Square(bi)),
                        _ => self.emit(Inst::Powi(bi, k)),
                    };
                }
                if let Some(c) = e.as_constant() {
                    return if c == 0.5 { self.emit(Inst::Call(Func::Sqrt, bi)) } else { self.emit(Inst::Powf(bi, c)) };
                }
                let ei = self.node(e);
                let ln = self.emit(Inst::Call(Func::Log, bi));
                let prod = self.emit(Inst::Mul(ei, ln));
                self.emit(Inst::Call(Func::Exp, prod))
            }
            Node::Bin(op, l, r) => {
                let (a, b) = (self.node(l), self.node(r));
                self.emit(match op {
                    BinOp::Add => Inst::Add(a, b),
                    BinOp::Sub => Inst::Sub(a, b),
                    BinOp::Mul => Inst::Mul(a, b),
                    BinOp::Div => Inst::Div(a, b),
                    BinOp::Pow => unreachable!("matched above"),
                })
            }
        }
    }
}

/// Evaluate one instruction on already computed slots.
#[inline(always)]
fn step<T: Scalar>(inst: Inst, s: &[T], x: T, param: &impl Fn(usize) -> T) -> T {
    let g = |i: u32| s[i as usize];
    match inst {
        Inst::Const(v) => T::from(v),
        Inst::Var => x,
        Inst::Param(k) => param(k),
        Inst::Neg(a) => -g(a),
        Inst::Add(a, b) => g(a) + g(b),
        Inst::Sub(a, b) => g(a) - g(b),
        Inst::Mul(a, b) => g(a) * g(b),
        Inst::Div(a, b) => g(a) / g(b),
        Inst::Square(a) => g(a) * g(a),
        Inst::Powi(a, n) => g(a).powi(n),
        Inst::Powf(a, c) => g(a).powf(c),
        Inst::Call(f, a) => apply(f, g(a)),
    }
}

/// Tapes with at most this many slots evaluate per point on the stack (no allocation).
const STACK_SLOTS: usize = 48;
/// A smaller stack buffer for short tapes (less to initialise per point).
const SMALL_SLOTS: usize = 16;

impl Tape {
    /// Compile a tree.
    pub fn compile(node: &Node) -> Tape {
        let mut b = Builder::default();
        let out = b.node(node);
        // Stable partition: parameter-only instructions first; operands still precede their users.
        let mut map = vec![0u32; b.insts.len()];
        let mut order: Vec<usize> = (0..b.insts.len()).filter(|&i| !b.var_dep[i]).collect();
        let n_pre = order.len();
        order.extend((0..b.insts.len()).filter(|&i| b.var_dep[i]));
        for (new, &old) in order.iter().enumerate() {
            map[old] = new as u32;
        }
        let m = |i: u32| map[i as usize];
        let insts = order
            .iter()
            .map(|&old| match b.insts[old] {
                Inst::Neg(a) => Inst::Neg(m(a)),
                Inst::Add(a, c) => Inst::Add(m(a), m(c)),
                Inst::Sub(a, c) => Inst::Sub(m(a), m(c)),
                Inst::Mul(a, c) => Inst::Mul(m(a), m(c)),
                Inst::Div(a, c) => Inst::Div(m(a), m(c)),
                Inst::Square(a) => Inst::Square(m(a)),
                Inst::Powi(a, n) => Inst::Powi(m(a), n),
                Inst::Powf(a, c) => Inst::Powf(m(a), c),
                Inst::Call(f, a) => Inst::Call(f, m(a)),
                other => other,
            })
            .collect();
        Tape { insts, n_pre, out: m(out) as usize }
    }

    /// Number of instructions (slots).
    pub fn len(&self) -> usize {
        self.insts.len()
    }

    /// True if the tape has no instructions (never the case for a compiled tree).
    pub fn is_empty(&self) -> bool {
        self.insts.is_empty()
    }

    /// Evaluate at `x` with parameter `k` given by `param(k)`, for any number type (plain `f64` or dual
    /// numbers for derivatives). Does not allocate for tapes of up to 48 slots.
    #[inline]
    pub fn eval<T: Scalar>(&self, x: T, param: impl Fn(usize) -> T) -> T {
        if self.insts.len() <= SMALL_SLOTS {
            let mut buf = [T::zero(); SMALL_SLOTS];
            self.run(x, &param, &mut buf)
        } else if self.insts.len() <= STACK_SLOTS {
            let mut buf = [T::zero(); STACK_SLOTS];
            self.run(x, &param, &mut buf)
        } else {
            let mut buf = vec![T::zero(); self.insts.len()];
            self.run(x, &param, &mut buf)
        }
    }

    /// As [`Tape::eval`], reusing `scratch` (resized as needed) as the slot buffer.
    #[inline]
    pub fn eval_with_scratch<T: Scalar>(&self, x: T, param: impl Fn(usize) -> T, scratch: &mut Vec<T>) -> T {
        scratch.resize(self.insts.len(), T::zero());
        self.run(x, &param, scratch)
    }

    #[inline(always)]
    fn run<T: Scalar>(&self, x: T, param: &impl Fn(usize) -> T, slots: &mut [T]) -> T {
        for (i, inst) in self.insts.iter().enumerate() {
            slots[i] = step(*inst, slots, x, param);
        }
        slots[self.out]
    }

    /// An evaluator for many points at fixed real parameters: the parameter-only instructions run once here,
    /// each [`TapeEval::eval`] runs only the variable-dependent ones, in a buffer reused across points.
    pub fn evaluator<T: Scalar>(&self, params: &[f64]) -> TapeEval<'_, T> {
        let slots =
            self.prelude(params).into_iter().map(T::from).chain((self.n_pre..self.insts.len()).map(|_| T::zero()));
        TapeEval { tape: self, slots: slots.collect() }
    }

    /// Values of the parameter-only instructions (`0..n_pre`) for real parameters; a parameter index past
    /// the end of `params` reads as NaN.
    fn prelude(&self, params: &[f64]) -> Vec<f64> {
        let mut pre = vec![0.0; self.n_pre];
        let param = |k: usize| params.get(k).copied().unwrap_or(f64::NAN);
        for i in 0..self.n_pre {
            pre[i] = step(self.insts[i], &pre, f64::NAN, &param);
        }
        pre
    }

    /// Values at every point of `xs` into `out` (same length), with real parameters `params`.
    ///
    /// # Panics
    /// If `out` and `xs` differ in length (a programming error, not an input error).
    pub fn eval_batch(&self, xs: &[f64], params: &[f64], out: &mut [f64]) {
        self.batch::<1>(xs, params, &mut [out]);
    }

    /// Values and first two derivatives with respect to the variable at every point of `xs`, exact to
    /// rounding (forward-mode Taylor arithmetic, structure of arrays over blocks of points).
    ///
    /// # Panics
    /// If an output slice differs in length from `xs` (a programming error, not an input error).
    pub fn eval_batch_d2(&self, xs: &[f64], params: &[f64], f: &mut [f64], df: &mut [f64], d2f: &mut [f64]) {
        self.batch::<3>(xs, params, &mut [f, df, d2f]);
    }

    /// As [`Tape::eval_batch_d2`], with the third derivative as well.
    ///
    /// # Panics
    /// If an output slice differs in length from `xs` (a programming error, not an input error).
    pub fn eval_batch_d3(
        &self,
        xs: &[f64],
        params: &[f64],
        f: &mut [f64],
        df: &mut [f64],
        d2f: &mut [f64],
        d3f: &mut [f64],
    ) {
        self.batch::<4>(xs, params, &mut [f, df, d2f, d3f]);
    }

    /// Batch evaluation of `N - 1` derivatives; `outs[k][i]` receives the k-th derivative at `xs[i]`.
    fn batch<const N: usize>(&self, xs: &[f64], params: &[f64], outs: &mut [&mut [f64]; N]) {
        for o in outs.iter() {
            assert_eq!(o.len(), xs.len(), "tape batch: output length must equal the number of points");
        }
        let pre = self.prelude(params);
        let stride = N * BLOCK;
        let mut buf = vec![0.0; self.insts.len() * stride];
        for (i, v) in pre.iter().enumerate() {
            buf[i * stride..i * stride + BLOCK].fill(*v);
        }
        let last = self.out * stride;
        for (chunk_no, chunk) in xs.chunks(BLOCK).enumerate() {
            let n = chunk.len();
            for i in self.n_pre..self.insts.len() {
                let (lo, hi) = buf.split_at_mut(i * stride);
                super::jets::apply_block::<N>(self.insts[i], chunk, lo, &mut hi[..stride]);
            }
            let start = chunk_no * BLOCK;
            for (k, o) in outs.iter_mut().enumerate() {
                o[start..start + n].copy_from_slice(&buf[last + k * BLOCK..last + k * BLOCK + n]);
            }
        }
    }
}

#[cfg(test)]
#[path = "tape_tests.rs"]
mod tests;

/// Per-point evaluation at fixed parameters with a reused slot buffer (see [`Tape::evaluator`]).
#[derive(Debug, Clone)]
pub struct TapeEval<'a, T> {
    tape: &'a Tape,
    slots: Vec<T>,
}

impl<T: Scalar> TapeEval<'_, T> {
    /// The expression's value at `x` (with derivatives when `T` is a dual number seeded in `x`).
    #[inline]
    pub fn eval(&mut self, x: T) -> T {
        let t = self.tape;
        let no_param = |_: usize| T::from(f64::NAN);
        for i in t.n_pre..t.insts.len() {
            self.slots[i] = step(t.insts[i], &self.slots, x, &no_param);
        }
        self.slots[t.out]
    }
}
