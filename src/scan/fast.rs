//! The batched plain-f64 path for map cells with a radius axis: A, B and two radial derivatives from compiled
//! tapes (a whole line of radii per batch call when the line runs along the radius), then the static values of
//! the one generic computation, [`crate::junction::point::static_coefficients`] (the same function the generic
//! evaluator runs on dual-number jets of the sides; nothing here repeats a formula).
//! Sign conventions and sources are those of [`crate::junction`]: n from minus into plus, \[X\] = X_plus - X_minus,
//! the Lanczos equation with 8 pi (Israel 1966; Poisson 2004 ch. 3), V''(a0) linear in beta^2 (Poisson & Visser
//! 1995; Garcia, Lobo & Visser 2012 for A != B and the flux term).

use super::class::CellClass;
use crate::expr::Tape;
pub use crate::junction::point::StaticCoefficients;
use crate::junction::point::{self, NoStaticValues};
use crate::junction::Jet;
use crate::model::{EquationOfState, MetricSide, Model, Shape};
use num_dual::{Dual2_64, Dual64};

/// Static values at radius `a` from the jets of both sides ([`point::static_coefficients`]), or the class that
/// says why there is no static shell.
#[inline]
pub fn static_coefficients(shape: &Shape, a: f64, jets: &[Jet<f64>; 2]) -> Result<StaticCoefficients, CellClass> {
    point::static_coefficients(shape, a, [&jets[0], &jets[1]]).map_err(class_of)
}

/// The class of a cell without static values.
fn class_of(why: NoStaticValues) -> CellClass {
    match why {
        NoStaticValues::Refused(w) => CellClass::refused(w),
        NoStaticValues::Undefined => CellClass::NoStatic,
    }
}

/// A jet from a value and two derivatives (the tapes compute no third derivative; nothing at a static radius
/// reads it, so it is NaN and would show if something did).
#[inline]
fn jet2(a: [f64; 3], b: [f64; 3]) -> Jet<f64> {
    Jet { a: [a[0], a[1], a[2], f64::NAN], b: [b[0], b[1], b[2], f64::NAN] }
}

/// Compiled A and B of both sides, identical functions evaluated once, plus the law's tape.
#[derive(Debug, Clone)]
pub struct FastJunction {
    /// Distinct tapes among [A_-, B_-, A_+, B_+].
    tapes: Vec<Tape>,
    /// Index into `tapes` of A_-, B_-, A_+, B_+.
    which: [usize; 4],
    eos: Option<Tape>,
    /// Radius-independent geometry.
    pub shape: Shape,
}

/// Reusable buffers for one line of radii (one per worker thread).
#[derive(Debug, Default)]
pub struct LineScratch {
    /// Radii of the line.
    pub xs: Vec<f64>,
    /// Parameter values of the current point.
    pub params: Vec<f64>,
    coef: Vec<StaticCoefficients>,
    vals: Vec<[Vec<f64>; 3]>,
}

impl FastJunction {
    /// Compile the model's metric functions (and law, if any); `None` when a side or the law is not given by
    /// expressions (such a model takes the generic evaluator, which needs only the `MetricSide` and
    /// `EquationOfState` traits).
    pub fn new(model: &Model) -> Option<FastJunction> {
        let (am, bm) = model.minus.metric.expressions()?;
        let (ap, bp) = model.plus.metric.expressions()?;
        let eos = match &model.law {
            Some(law) => Some(law.expression()?.tape()),
            None => None,
        };
        let mut tapes: Vec<Tape> = Vec::new();
        let mut which = [0usize; 4];
        for (k, e) in [am, bm, ap, bp].into_iter().enumerate() {
            let t = e.tape();
            which[k] = match tapes.iter().position(|u| *u == t) {
                Some(i) => i,
                None => {
                    tapes.push(t);
                    tapes.len() - 1
                }
            };
        }
        Some(FastJunction { tapes, which, eos, shape: model.shape() })
    }

    /// Number of distinct metric functions evaluated per radius.
    pub fn distinct_functions(&self) -> usize {
        self.tapes.len()
    }

    /// Jets of both sides at one radius (per-point tape evaluation in second-order dual numbers).
    pub fn point_jets(&self, r: f64, params: &[f64]) -> [Jet<f64>; 2] {
        let mut v = [[0.0; 3]; 4];
        for (i, t) in self.tapes.iter().enumerate() {
            let d: Dual2_64 = t.eval(Dual2_64::new(r, 1.0, 0.0), |k| Dual2_64::from(params[k]));
            v[i] = [d.re, d.v1, d.v2];
        }
        let w = self.which;
        [jet2(v[w[0]], v[w[1]]), jet2(v[w[2]], v[w[3]])]
    }

    /// Evaluate every distinct function with two derivatives at the radii `scratch.xs` (batch tape evaluation);
    /// read the results with [`FastJunction::line_jets`].
    pub fn eval_line(&self, params: &[f64], scratch: &mut LineScratch) {
        let n = scratch.xs.len();
        scratch.vals.resize_with(self.tapes.len(), Default::default);
        for (t, v) in self.tapes.iter().zip(scratch.vals.iter_mut()) {
            for col in v.iter_mut() {
                col.resize(n, 0.0);
            }
            let [f, df, d2f] = v;
            t.eval_batch_d2(&scratch.xs, params, f, df, d2f);
        }
    }

    /// Static values at every radius of `scratch.xs` with parameters `params`: the metric functions in one
    /// batch, then [`point::coefficients_unchecked`] over the whole line (branch-free, so that the compiler can
    /// run several radii at once); [`FastJunction::line_result`] applies the checks.
    pub fn eval_line_coefficients(&self, params: &[f64], scratch: &mut LineScratch) {
        self.eval_line(params, scratch);
        let mut coef = std::mem::take(&mut scratch.coef);
        coef.clear();
        coef.extend((0..scratch.xs.len()).map(|j| {
            let jets = self.line_jets(scratch, j);
            point::coefficients_unchecked(&self.shape, scratch.xs[j], [&jets[0], &jets[1]])
        }));
        scratch.coef = coef;
    }

    /// The static values at point `j` of the line last evaluated by [`FastJunction::eval_line_coefficients`],
    /// with the checks of [`static_coefficients`].
    #[inline]
    pub fn line_result(&self, scratch: &LineScratch, j: usize) -> Result<StaticCoefficients, CellClass> {
        let jets = self.line_jets(scratch, j);
        point::check(&self.shape, scratch.xs[j], [&jets[0], &jets[1]], scratch.coef[j]).map_err(class_of)
    }

    /// Jets at point `j` of the line last evaluated by [`FastJunction::eval_line`].
    #[inline(always)]
    pub fn line_jets(&self, scratch: &LineScratch, j: usize) -> [Jet<f64>; 2] {
        let g = |k: usize| {
            let v = &scratch.vals[self.which[k]];
            [v[0][j], v[1][j], v[2][j]]
        };
        [jet2(g(0), g(1)), jet2(g(2), g(3))]
    }

    /// The law's slope P'(sigma) at `sigma` (NaN without a law).
    pub fn law_slope(&self, sigma: f64, params: &[f64]) -> f64 {
        match &self.eos {
            Some(t) => t.eval(Dual64::new(sigma, 1.0), |k| Dual64::from(params[k])).eps,
            None => f64::NAN,
        }
    }
}

#[cfg(test)]
#[path = "fast_tests.rs"]
mod tests;
