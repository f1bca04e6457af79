//! The fast plain-f64 path for map cells with a radius axis: A, B and two radial derivatives from compiled
//! tapes (a whole line of radii per batch call when the line runs along the radius), then sigma0, p0 and the
//! two coefficients of V''(a0) = c0 + c1 beta^2 in closed form.
//!
//! The closed form is the generic computation of [`crate::junction::Junction::v2_coefficients`] (Picard
//! expansion of Y = R [K^theta_theta] in second-order dual numbers, then V(R, Y)) written out by hand, so both
//! paths agree to rounding; the tests compare them on every shipped scenario and on random points.
//! Sign conventions and sources are those of [`crate::junction`]: n from minus into plus, \[X\] = X_plus - X_minus,
//! the Lanczos equation with 8 pi (Israel 1966; Poisson 2004 ch. 3), V''(a0) linear in beta^2 (Poisson & Visser
//! 1995; Garcia, Lobo & Visser 2012 for A != B and the flux term).

use super::class::CellClass;
use crate::expr::Tape;
use crate::junction::admissible;
use crate::scenario::{Keep, Scenario, ShellKind, Which};
use num_dual::{Dual2_64, Dual64};
use std::f64::consts::PI;

/// A(r), B(r) and their first two radial derivatives at one radius, one side.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Jet2 {
    /// [A, A', A''].
    pub a: [f64; 3],
    /// [B, B', B''].
    pub b: [f64; 3],
}

/// Static values of a timelike shell at one radius: sigma0, p0 and V''(a0) = c0 + c1 beta^2.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StaticCoefficients {
    /// Surface energy density sigma0.
    pub sigma: f64,
    /// Surface pressure p0.
    pub pressure: f64,
    /// V''(a0) at beta^2 = 0.
    pub c0: f64,
    /// dV''(a0)/d(beta^2).
    pub c1: f64,
}

/// Geometry of the junction that does not depend on the radius or the parameters.
#[derive(Debug, Clone, Copy)]
pub struct Shape {
    /// eps = n.n (+1 timelike).
    pub eps: f64,
    /// D - 2.
    pub n_ang: f64,
    /// Signs of n^r on [minus, plus].
    pub nu: [f64; 2],
    /// Timelike or spacelike (for the admissibility rule).
    pub kind: ShellKind,
    /// What [minus, plus] keep (for the admissibility rule).
    pub keep: [Keep; 2],
}

impl Shape {
    /// The shape of a scenario's junction.
    pub fn of(s: &Scenario) -> Shape {
        Shape {
            eps: s.shell.kind.eps(),
            n_ang: f64::from(s.dimension - 2),
            nu: [s.minus.normal_sign(), s.plus.normal_sign()],
            kind: s.shell.kind,
            keep: [s.minus.keep, s.plus.keep],
        }
    }
}

/// Static values at radius `a` from the jets of both sides, or the class that says why there is no static
/// shell (the same decisions, in the same order, as the generic path in `cell::static_point`).
///
/// Formulas (signature -+++, G = c = 1, n = D - 2, Lanczos equation as in [`crate::junction`]; Israel 1966;
/// Poisson 2004 ch. 3; conservation with the flux term of Garcia, Lobo & Visser 2012). Per side i:
/// x_i = nu_i sqrt(eps B_i), Phi_i = A_i'/(2A_i) - B_i'/(2B_i),
/// sigma0 = -eps n (x_+ - x_-)/(8 pi a), p0 = (eps/8 pi)([K^tau_tau] + (n - 1)\[x\]/a) with
/// K^tau_tau_i = nu_i eps B_i'/(2 sqrt(eps B_i)) + x_i Phi_i.
/// Along the motion Y(R) obeys Y' = G(R, Y) = 8 pi p(sigma) - (X_+ Phi_+ - X_- Phi_-) - (n - 1) Y/R with
/// sigma = -n Y/(8 pi R), X_+ = (Y + eps dB/Y)/2, X_- = (eps dB/Y - Y)/2, dB = B_+ - B_-, p = p0 + beta^2
/// (sigma - sigma0). At a: Y = y0 = x_+ - x_-, Y1 = G(a, y0), Y2 = dG/dR = Y2_0 + beta^2 8 pi sigma',
/// sigma' = -n (Y1/a - y0/a^2)/(8 pi). With T = dB/(2Y), V = eps (B_+ + B_-)/2 - T^2 - Y^2/4 gives
/// V'' = eps (B_+'' + B_-'')/2 - 2 (T'^2 + T T'') - (Y1^2 + y0 Y2)/2, linear in Y2 and hence in beta^2.
pub fn static_coefficients(shape: &Shape, a: f64, jets: &[Jet2; 2]) -> Result<StaticCoefficients, CellClass> {
    checked(shape, a, jets, coefficients(shape, a, jets, jets[1] == jets[0]))
}

/// The class decisions of [`static_coefficients`] applied to values computed without them: the one
/// admissibility rule ([`admissible::static_side`]), then finite values.
#[inline(always)]
fn checked(shape: &Shape, a: f64, jets: &[Jet2; 2], c: StaticCoefficients) -> Result<StaticCoefficients, CellClass> {
    for ((side, keep), j) in [Which::Minus, Which::Plus].into_iter().zip(shape.keep).zip(jets) {
        admissible::static_side(shape.kind, keep, side, a, j.a[0], j.b[0], j.b[1]).map_err(CellClass::refused)?;
    }
    if !(c.sigma.is_finite() && c.pressure.is_finite() && c.c0.is_finite() && c.c1.is_finite()) {
        return Err(CellClass::NoStatic);
    }
    Ok(c)
}

/// The formulas of [`static_coefficients`] without any check (branch-free, so a loop over a line can run
/// several radii at once); `same` says that both sides have identical jets.
#[inline(always)]
fn coefficients(shape: &Shape, a: f64, jets: &[Jet2; 2], same: bool) -> StaticCoefficients {
    let Shape { eps, n_ang: n, nu, .. } = *shape;
    let pi8 = 8.0 * PI;
    // Per side: w = sqrt(eps B), Phi, Phi' and eps B'/(2 w); computed once when both sides are the same function.
    let side = |j: &Jet2| {
        let [av, a1, a2] = j.a;
        let [bv, b1, b2] = j.b;
        let (ia, ib) = (1.0 / av, 1.0 / bv);
        let (ra, rb) = (a1 * ia, b1 * ib);
        let w = (bv * eps).sqrt();
        let phi = 0.5 * (ra - rb);
        let dphi = 0.5 * (a2 * ia - ra * ra - b2 * ib + rb * rb);
        (w, phi, dphi, b1 * (0.5 * eps) / w)
    };
    let s0 = side(&jets[0]);
    let s1 = if same { s0 } else { side(&jets[1]) };
    let mut x = [0.0; 2];
    let mut k_ss = [0.0; 2];
    let mut phi = [0.0; 2];
    let mut dphi = [0.0; 2];
    for (i, (w, ph, dph, kb)) in [s0, s1].into_iter().enumerate() {
        x[i] = w * nu[i];
        phi[i] = ph;
        dphi[i] = dph;
        k_ss[i] = kb * nu[i] + x[i] * ph;
    }
    let ia = 1.0 / a;
    let jump_th = (x[1] - x[0]) * ia;
    let jump_ss = k_ss[1] - k_ss[0];
    let sigma = -(jump_th * (eps * n / pi8));
    let p = (jump_ss + jump_th * (n - 1.0)) * (eps / pi8);
    // Second-order expansion of Y(R) about a.
    let y0 = x[1] - x[0];
    let iy = 1.0 / y0;
    let db = [jets[1].b[0] - jets[0].b[0], jets[1].b[1] - jets[0].b[1], jets[1].b[2] - jets[0].b[2]];
    let xp = (y0 + db[0] * eps * iy) * 0.5;
    let xm = (db[0] * eps * iy - y0) * 0.5;
    let y1 = p * pi8 - (xp * phi[1] - xm * phi[0]) - y0 * (n - 1.0) * ia;
    let d_ratio = eps * (db[1] - db[0] * y1 * iy) * iy;
    let xp1 = (y1 + d_ratio) * 0.5;
    let xm1 = (d_ratio - y1) * 0.5;
    let flux1 = xp1 * phi[1] + xp * dphi[1] - xm1 * phi[0] - xm * dphi[0];
    let dyr = (y1 - y0 * ia) * ia;
    let y2_0 = -flux1 - (n - 1.0) * dyr;
    let y2_beta = -n * dyr;
    // V'' = v_fixed + k Y2.
    let t = 0.5 * db[0] * iy;
    let t1 = 0.5 * (db[1] - db[0] * y1 * iy) * iy;
    let t2_fixed = (0.5 * db[2] - (db[1] - db[0] * y1 * iy) * y1 * iy) * iy;
    let v_fixed = eps * (jets[1].b[2] + jets[0].b[2]) * 0.5 - 2.0 * (t1 * t1 + t * t2_fixed) - y1 * y1 * 0.5;
    let k = t * db[0] * iy * iy - y0 * 0.5;
    let c0 = v_fixed + k * y2_0;
    let c1 = k * y2_beta;
    StaticCoefficients { sigma, pressure: p, c0, c1 }
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
    coef: [Vec<f64>; 4],
    vals: Vec<[Vec<f64>; 3]>,
}

impl FastJunction {
    /// Compile the scenario's metric functions (and law, if any).
    pub fn new(s: &Scenario) -> FastJunction {
        let mut tapes: Vec<Tape> = Vec::new();
        let mut which = [0usize; 4];
        for (k, e) in [&s.minus.a, &s.minus.b, &s.plus.a, &s.plus.b].into_iter().enumerate() {
            let t = e.tape();
            which[k] = match tapes.iter().position(|u| *u == t) {
                Some(i) => i,
                None => {
                    tapes.push(t);
                    tapes.len() - 1
                }
            };
        }
        FastJunction { tapes, which, eos: s.shell.eos.as_ref().map(|e| e.tape()), shape: Shape::of(s) }
    }

    /// Number of distinct metric functions evaluated per radius.
    pub fn distinct_functions(&self) -> usize {
        self.tapes.len()
    }

    /// Jets of both sides at one radius (per-point tape evaluation in second-order dual numbers).
    pub fn point_jets(&self, r: f64, params: &[f64]) -> [Jet2; 2] {
        let mut v = [[0.0; 3]; 4];
        for (i, t) in self.tapes.iter().enumerate() {
            let d: Dual2_64 = t.eval(Dual2_64::new(r, 1.0, 0.0), |k| Dual2_64::from(params[k]));
            v[i] = [d.re, d.v1, d.v2];
        }
        let w = self.which;
        [Jet2 { a: v[w[0]], b: v[w[1]] }, Jet2 { a: v[w[2]], b: v[w[3]] }]
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
    /// batch, then the closed form over the whole line (read with [`FastJunction::line_result`]).
    pub fn eval_line_coefficients(&self, params: &[f64], scratch: &mut LineScratch) {
        self.eval_line(params, scratch);
        let n = scratch.xs.len();
        for c in scratch.coef.iter_mut() {
            c.resize(n, 0.0);
        }
        if self.which[0] == self.which[2] && self.which[1] == self.which[3] {
            self.line_loop::<true>(scratch);
        } else {
            self.line_loop::<false>(scratch);
        }
    }

    /// The closed form over a line, structure of arrays (so the compiler can run several radii at once).
    fn line_loop<const SAME: bool>(&self, scratch: &mut LineScratch) {
        let n = scratch.xs.len();
        let xs = &scratch.xs[..n];
        let col = |k: usize, d: usize| &scratch.vals[self.which[k]][d][..n];
        let (am, bm, ap, bp) = (
            [col(0, 0), col(0, 1), col(0, 2)],
            [col(1, 0), col(1, 1), col(1, 2)],
            [col(2, 0), col(2, 1), col(2, 2)],
            [col(3, 0), col(3, 1), col(3, 2)],
        );
        let [o_s, o_p, o_c0, o_c1] = &mut scratch.coef;
        let (o_s, o_p, o_c0, o_c1) = (&mut o_s[..n], &mut o_p[..n], &mut o_c0[..n], &mut o_c1[..n]);
        for j in 0..n {
            let jets = [
                Jet2 { a: [am[0][j], am[1][j], am[2][j]], b: [bm[0][j], bm[1][j], bm[2][j]] },
                Jet2 { a: [ap[0][j], ap[1][j], ap[2][j]], b: [bp[0][j], bp[1][j], bp[2][j]] },
            ];
            let c = coefficients(&self.shape, xs[j], &jets, SAME);
            (o_s[j], o_p[j], o_c0[j], o_c1[j]) = (c.sigma, c.pressure, c.c0, c.c1);
        }
    }

    /// The static values at point `j` of the line last evaluated by [`FastJunction::eval_line_coefficients`],
    /// with the checks of [`static_coefficients`].
    #[inline]
    pub fn line_result(&self, scratch: &LineScratch, j: usize) -> Result<StaticCoefficients, CellClass> {
        let [s, p, c0, c1] = &scratch.coef;
        checked(
            &self.shape,
            scratch.xs[j],
            &self.line_jets(scratch, j),
            StaticCoefficients { sigma: s[j], pressure: p[j], c0: c0[j], c1: c1[j] },
        )
    }

    /// Jets at point `j` of the line last evaluated by [`FastJunction::eval_line`].
    #[inline]
    pub fn line_jets(&self, scratch: &LineScratch, j: usize) -> [Jet2; 2] {
        let g = |k: usize| {
            let v = &scratch.vals[self.which[k]];
            [v[0][j], v[1][j], v[2][j]]
        };
        [Jet2 { a: g(0), b: g(1) }, Jet2 { a: g(2), b: g(3) }]
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
