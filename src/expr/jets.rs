//! Forward-mode derivative arithmetic on blocks of points (structure of arrays), used by the tape's batch
//! evaluators: a slot holds `N` rows of `BLOCK` lanes, row `k` being the k-th derivative with respect to the
//! variable (`N` is 1 to 4: value up to third derivative).
//!
//! Rules (common practice): Leibniz's rule for products, the recursive quotient rule
//! `w^(k) = (u^(k) - sum_{i<k} C(k,i) w^(i) v^(k-i)) / v`, and Faa di Bruno's formula for a function of one
//! argument: `(g∘u)' = g' u'`, `(g∘u)'' = g'' u'^2 + g' u''`, `(g∘u)''' = g''' u'^3 + 3 g'' u' u'' + g' u'''`.

use super::ast::Func;
use super::inst::{Inst, BLOCK};

type Jet = [f64; 4];

#[inline(always)]
fn load<const N: usize>(a: &[f64], j: usize) -> Jet {
    let mut u = [0.0; 4];
    for (k, uk) in u.iter_mut().enumerate().take(N) {
        *uk = a[k * BLOCK + j];
    }
    u
}

#[inline(always)]
fn store<const N: usize>(dst: &mut [f64], j: usize, w: Jet) {
    for (k, wk) in w.iter().enumerate().take(N) {
        dst[k * BLOCK + j] = *wk;
    }
}

#[inline(always)]
fn mul(u: Jet, v: Jet) -> Jet {
    [
        u[0] * v[0],
        u[1] * v[0] + u[0] * v[1],
        u[2] * v[0] + 2.0 * u[1] * v[1] + u[0] * v[2],
        u[3] * v[0] + 3.0 * (u[2] * v[1] + u[1] * v[2]) + u[0] * v[3],
    ]
}

#[inline(always)]
fn div(u: Jet, v: Jet) -> Jet {
    let r = 1.0 / v[0];
    let w0 = u[0] * r;
    let w1 = (u[1] - w0 * v[1]) * r;
    let w2 = (u[2] - 2.0 * w1 * v[1] - w0 * v[2]) * r;
    let w3 = (u[3] - 3.0 * (w2 * v[1] + w1 * v[2]) - w0 * v[3]) * r;
    [w0, w1, w2, w3]
}

/// Faa di Bruno's formula up to third order, given `g` and its first three derivatives at `u[0]`.
#[inline(always)]
fn chain(g: Jet, u: Jet) -> Jet {
    [
        g[0],
        g[1] * u[1],
        g[2] * u[1] * u[1] + g[1] * u[2],
        g[3] * u[1] * u[1] * u[1] + 3.0 * g[2] * u[1] * u[2] + g[1] * u[3],
    ]
}

#[inline(always)]
fn unary<const N: usize>(a: &[f64], dst: &mut [f64], n: usize, g: impl Fn(f64) -> Jet) {
    for j in 0..n {
        let u = load::<N>(a, j);
        store::<N>(dst, j, chain(g(u[0]), u));
    }
}

#[inline(always)]
fn binary<const N: usize>(a: &[f64], b: &[f64], dst: &mut [f64], n: usize, op: impl Fn(Jet, Jet) -> Jet) {
    for j in 0..n {
        store::<N>(dst, j, op(load::<N>(a, j), load::<N>(b, j)));
    }
}

/// `u^n` and its derivatives for `n` outside {0, 1, 2} (the tape turns those into constants, copies and
/// squares), from one `powi`: `p = u^(n-3)`, `u^n = p u^3`, `(u^n)' = n p u^2`, ...
#[inline(always)]
fn powi_jet(u: f64, n: i32) -> Jet {
    let nf = f64::from(n);
    let p = u.powi(n - 3);
    let pu = p * u;
    let pu2 = pu * u;
    [pu2 * u, nf * pu2, nf * (nf - 1.0) * pu, nf * (nf - 1.0) * (nf - 2.0) * p]
}

fn sign(u: f64) -> f64 {
    if u < 0.0 {
        -1.0
    } else {
        1.0
    }
}

/// Apply `f` lane by lane (the derivatives of each built-in function, common practice).
fn call<const N: usize>(f: Func, a: &[f64], dst: &mut [f64], n: usize) {
    match f {
        Func::Sqrt => unary::<N>(a, dst, n, |u| {
            let s = u.sqrt();
            let h = 0.5 / s;
            [s, h, -0.5 * h / u, 0.75 * h / (u * u)]
        }),
        Func::Exp => unary::<N>(a, dst, n, |u| {
            let e = u.exp();
            [e; 4]
        }),
        Func::Log => unary::<N>(a, dst, n, |u| {
            let r = 1.0 / u;
            [u.ln(), r, -r * r, 2.0 * r * r * r]
        }),
        Func::Sin => unary::<N>(a, dst, n, |u| {
            let (s, c) = u.sin_cos();
            [s, c, -s, -c]
        }),
        Func::Cos => unary::<N>(a, dst, n, |u| {
            let (s, c) = u.sin_cos();
            [c, -s, -c, s]
        }),
        Func::Tan => unary::<N>(a, dst, n, |u| {
            let t = u.tan();
            let sec2 = 1.0 + t * t;
            [t, sec2, 2.0 * t * sec2, sec2 * (2.0 + 6.0 * t * t)]
        }),
        Func::Sinh => unary::<N>(a, dst, n, |u| {
            let (s, c) = (u.sinh(), u.cosh());
            [s, c, s, c]
        }),
        Func::Cosh => unary::<N>(a, dst, n, |u| {
            let (s, c) = (u.sinh(), u.cosh());
            [c, s, c, s]
        }),
        Func::Tanh => unary::<N>(a, dst, n, |u| {
            // sech^2 from cosh, not 1 - tanh^2 (which cancels to 0 once tanh rounds to 1).
            let (t, c) = (u.tanh(), u.cosh());
            let s = 1.0 / (c * c);
            [t, s, -2.0 * t * s, 4.0 * t * t * s - 2.0 * s * s]
        }),
        Func::Abs => unary::<N>(a, dst, n, |u| [sign(u) * u, sign(u), 0.0, 0.0]),
        // Piecewise constant: derivatives are exactly zero even where the argument's are not finite.
        Func::Sign => {
            for (j, &u) in a[..n].iter().enumerate() {
                store::<N>(dst, j, [sign(u), 0.0, 0.0, 0.0]);
            }
        }
    }
}

/// Execute one instruction for the first `xs.len()` lanes. `lo` holds all earlier slots (stride `N*BLOCK`),
/// `dst` is this instruction's slot.
pub(super) fn apply_block<const N: usize>(inst: Inst, xs: &[f64], lo: &[f64], dst: &mut [f64]) {
    let n = xs.len();
    let stride = N * BLOCK;
    let slot = |i: u32| &lo[i as usize * stride..(i as usize + 1) * stride];
    match inst {
        // Constants and parameters live in the parameter-only prelude; handled here for completeness.
        Inst::Const(_) | Inst::Param(_) => {
            let v = if let Inst::Const(v) = inst { v } else { f64::NAN };
            dst.fill(0.0);
            dst[..n].fill(v);
        }
        Inst::Var => {
            for (j, &x) in xs.iter().enumerate() {
                store::<N>(dst, j, [x, 1.0, 0.0, 0.0]);
            }
        }
        Inst::Neg(a) => {
            let a = slot(a);
            for k in 0..N {
                for j in 0..n {
                    dst[k * BLOCK + j] = -a[k * BLOCK + j];
                }
            }
        }
        Inst::Add(a, b) | Inst::Sub(a, b) => {
            let (a, b) = (slot(a), slot(b));
            let s = if matches!(inst, Inst::Add(..)) { 1.0 } else { -1.0 };
            for k in 0..N {
                for j in 0..n {
                    dst[k * BLOCK + j] = a[k * BLOCK + j] + s * b[k * BLOCK + j];
                }
            }
        }
        Inst::Mul(a, b) => binary::<N>(slot(a), slot(b), dst, n, mul),
        Inst::Div(a, b) => binary::<N>(slot(a), slot(b), dst, n, div),
        Inst::Square(a) => {
            let a = slot(a);
            for j in 0..n {
                let u = load::<N>(a, j);
                let w = [
                    u[0] * u[0],
                    2.0 * u[0] * u[1],
                    2.0 * (u[1] * u[1] + u[0] * u[2]),
                    2.0 * (u[0] * u[3] + 3.0 * u[1] * u[2]),
                ];
                store::<N>(dst, j, w);
            }
        }
        Inst::Powi(a, p) => unary::<N>(slot(a), dst, n, |u| powi_jet(u, p)),
        Inst::Powf(a, c) => unary::<N>(slot(a), dst, n, |u| {
            let (c1, c2) = (c - 1.0, c - 2.0);
            [u.powf(c), c * u.powf(c1), c * c1 * u.powf(c2), c * c1 * c2 * u.powf(c - 3.0)]
        }),
        Inst::Call(f, a) => call::<N>(f, slot(a), dst, n),
    }
}
