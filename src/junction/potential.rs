//! The shell's equation of motion Rdot^2 + V(R) = 0, the conservation law with its flux term, and the Taylor
//! expansion of V about a static radius along the motion (for linearised stability).
//!
//! With Y = R [K^theta_theta] = X_plus - X_minus, X_i = n^r_i, the identities X_plus^2 - X_minus^2 = eps (B_plus -
//! B_minus) and Rdot^2 = X_i^2 - eps B_i give (squaring the angular junction condition; Israel 1966; Poisson
//! 2004 ch. 3 for D = 4, A = B)
//! ```text
//! V(R) = eps (B_plus + B_minus)/2 - ((B_plus - B_minus)/(2 Y))^2 - Y^2/4,
//! timelike:  Y = -kappa,  kappa = 8 pi R sigma / (D - 2)   (kappa = m_s / R in D = 4, m_s = 4 pi R^2 sigma).
//! ```
//! The theta-theta component, with K^s_s_i = dX_i/dR + X_i Phi_i' along the motion, gives for a timelike shell
//! ```text
//! dY/dR = 8 pi p - (X_plus Phi_plus' - X_minus Phi_minus') - (D - 3) Y / R,
//! equivalently  sigma' = -(D - 2)(sigma + p)/R + Xi,   Xi = (D - 2)(X_plus Phi_plus' - X_minus Phi_minus')/(8 pi R),
//! ```
//! the conservation law with the flux term Xi that vanishes when A_i = B_i (Garcia, Lobo & Visser 2012,
//! Phys. Rev. D 86, 044026, eq. for sigma' in D = 4). With X_plus = (Y + eps dB/Y)/2, X_minus = (eps dB/Y - Y)/2
//! this is an ODE for Y(R) once p = P(sigma) is given.

use super::{Junction, StaticValues};
use crate::expr::Scalar;
use crate::model::Shape;
use num_dual::{Dual2, DualNum};

/// The equation of state used along the motion.
#[derive(Debug, Clone, Copy)]
pub enum Law<T> {
    /// p = p0 + beta^2 (sigma - sigma0): the linearised law of Poisson & Visser 1995.
    Linear {
        /// beta^2 = dp/dsigma at the static radius.
        beta2: T,
    },
    /// The scenario's own p(sigma).
    Scenario,
}

/// V from B on both sides and Y = R [K^theta_theta] (module docs).
#[inline]
pub fn potential_from_y<U: Scalar>(eps: f64, b_minus: U, b_plus: U, y: U) -> U {
    let db = b_plus - b_minus;
    let t = db / (y * 2.0);
    (b_plus + b_minus) * (0.5 * eps) - t * t - y * y * 0.25
}

impl<'a, T: Scalar> Junction<'a, T> {
    /// kappa = 8 pi R sigma / (D - 2) for a timelike shell (so that Y = -kappa).
    pub fn kappa(&self, r: T, sigma: T) -> T {
        r * sigma * (8.0 * std::f64::consts::PI / self.n_ang())
    }

    /// V(R) for a timelike shell with surface energy density sigma at R.
    pub fn potential_sigma(&self, r: T, sigma: T) -> T {
        let bm = self.jet(crate::model::Which::Minus, r).b[0];
        let bp = self.jet(crate::model::Which::Plus, r).b[0];
        potential_from_y(self.shape.eps, bm, bp, -self.kappa(r, sigma))
    }

    /// The flux term Xi = (D-2)(X_plus Phi_plus' - X_minus Phi_minus')/(8 pi R) of the conservation law
    /// (module docs; Garcia, Lobo & Visser 2012) at the shell state in `sv`: a static radius, or a moving state
    /// whose normals X_i = n^r_i = nu_i sqrt(Rdot^2 + B_i) are in `sv.stress` (zero when A = B on both sides).
    pub fn flux_term(&self, sv: &StaticValues<T>) -> T {
        let f = self.flux_sum(sv);
        f * (self.n_ang() / (8.0 * std::f64::consts::PI)) / sv.a
    }

    fn flux_sum(&self, sv: &StaticValues<T>) -> T {
        let phi = |i: usize| {
            let j = &sv.jets[i];
            super::redshift_gradient(j.a[0], j.a[1], j.b[0], j.b[1])
        };
        sv.stress.n_r[1] * phi(1) - sv.stress.n_r[0] * phi(0)
    }

    /// [V(a), V'(a), V''(a)] at a static radius of a timelike shell, following sigma(R) along the motion with
    /// the given law ([`expand`] with the law's p(sigma)). V(a) and V'(a) vanish at a static solution (V'(a) only
    /// if the law holds there); V''(a) decides linear stability (Poisson & Visser 1995; Garcia, Lobo & Visser 2012).
    pub fn potential_taylor(&self, sv: &StaticValues<T>, law: Law<T>) -> Option<[T; 3]> {
        match law {
            Law::Linear { beta2 } => expand_linear(&self.shape, sv, beta2),
            Law::Scenario => expand(&self.shape, sv, |sigma| self.eos_at(sigma, lift)),
        }
    }
}

/// A number as a second-order dual number with zero derivatives.
#[inline]
fn lift<T: Scalar>(t: T) -> Dual2<T, f64> {
    Dual2::new(t, T::zero(), T::zero())
}

/// [`expand`] with the linearised law p = p0 + beta^2 (sigma - sigma0) of Poisson & Visser 1995.
#[inline]
pub fn expand_linear<T: Scalar>(shape: &Shape, sv: &StaticValues<T>, beta2: T) -> Option<[T; 3]> {
    let (sigma0, p0) = (sv.stress.sigma(), sv.stress.pressure());
    expand(shape, sv, |sigma| Some(lift(p0) + (sigma - lift(sigma0)) * lift(beta2)))
}

/// The parts of the ODE for Y(R) (module docs) that do not depend on the law, expanded about a static radius.
struct Expansion<T: Scalar> {
    /// 1/R with R = a + h.
    r_inv: Dual2<T, f64>,
    /// B on [minus, plus] and B_plus - B_minus.
    b: [Dual2<T, f64>; 2],
    db: Dual2<T, f64>,
    /// Phi' on [minus, plus].
    phi: [Dual2<T, f64>; 2],
    /// Y(a) = R [K^theta_theta] at the static radius.
    y0: T,
    eps: f64,
    n_ang: f64,
}

impl<T: Scalar> Expansion<T> {
    #[inline(always)]
    fn new(shape: &Shape, sv: &StaticValues<T>) -> Expansion<T> {
        let d2 = |j: &[T; 4], k: usize| Dual2::new(j[k], j[k + 1], j[k + 2]);
        let [jm, jp] = &sv.jets;
        let b = [d2(&jm.b, 0), d2(&jp.b, 0)];
        let phi = |j: &super::Jet<T>| super::redshift_gradient(d2(&j.a, 0), d2(&j.a, 1), d2(&j.b, 0), d2(&j.b, 1));
        Expansion {
            r_inv: Dual2::new(sv.a, T::one(), T::zero()).recip(),
            b,
            db: b[1] - b[0],
            phi: [phi(jm), phi(jp)],
            y0: sv.stress.n_r[1] - sv.stress.n_r[0],
            eps: shape.eps,
            n_ang: shape.n_ang,
        }
    }

    /// sigma(R) from Y, and the right-hand side G(R, Y) without its 8 pi p term.
    #[inline(always)]
    fn parts(&self, y: Dual2<T, f64>) -> (Dual2<T, f64>, Dual2<T, f64>) {
        let pi8 = 8.0 * std::f64::consts::PI;
        let y_r = y * self.r_inv;
        let sigma = y_r * (-self.n_ang / pi8);
        let ratio = self.db * self.eps * y.recip();
        let xp = (y + ratio) * 0.5;
        let xm = (ratio - y) * 0.5;
        let flux = xp * self.phi[1] - xm * self.phi[0];
        (sigma, -flux - y_r * (self.n_ang - 1.0))
    }

    /// Y to second order from G at the previous order: Y(a) = y0, Y'(a) = G, Y''(a) = dG/dR.
    #[inline(always)]
    fn next(&self, g: Dual2<T, f64>) -> Dual2<T, f64> {
        Dual2::new(self.y0, g.re, g.v1)
    }

    /// [V, V', V''] on an expansion of Y.
    #[inline(always)]
    fn potential(&self, y: Dual2<T, f64>) -> [T; 3] {
        let v = potential_from_y(self.eps, self.b[0], self.b[1], y);
        [v.re, v.v1, v.v2]
    }
}

/// [V(a), V'(a), V''(a)] at a static radius of a timelike shell from the static values `sv` (the jets of both
/// sides and the stress there) and the law p(sigma) along the motion (`pressure`, `None` where it is undefined):
/// the one expansion of the potential, whatever computed the jets.
///
/// Method: Taylor-mode automatic differentiation. Y(R) is expanded to second order about a by Picard
/// iteration of the ODE of the module docs in second-order dual numbers: Y(a) = y0 is known, the first
/// iteration fixes Y'(a) = G(a, y0), the second Y''(a) = dG/dR (the first-order part of G needs only the
/// first-order part of Y); then V is evaluated on the expansion. Of the jets only A, B and their first two
/// derivatives matter: the third derivatives enter only second-order parts of G, which are discarded.
pub fn expand<T: Scalar, P>(shape: &Shape, sv: &StaticValues<T>, pressure: P) -> Option<[T; 3]>
where
    P: Fn(Dual2<T, f64>) -> Option<Dual2<T, f64>>,
{
    let e = Expansion::new(shape, sv);
    let pi8 = 8.0 * std::f64::consts::PI;
    let mut y = lift(e.y0);
    for _ in 0..2 {
        let (sigma, rest) = e.parts(y);
        y = e.next(pressure(sigma)? * pi8 + rest);
    }
    Some(e.potential(y))
}

/// V''(a0) = c0 + c1 beta^2 with the linearised law (Poisson & Visser 1995), from one expansion: beta^2 enters
/// only through 8 pi beta^2 sigma'(a0) in Y''(a0) (at R = a0, p = p0 whatever beta^2), so the law-free parts are
/// computed once and V'' is evaluated at beta^2 = 0 and 1 (the coefficients may be non-finite where a formula
/// divides by zero, e.g. Y(a) = 0; callers check).
#[inline(always)]
pub fn v2_linear_coefficients<T: Scalar>(shape: &Shape, sv: &StaticValues<T>) -> (T, T) {
    let e = Expansion::new(shape, sv);
    let pi8 = 8.0 * std::f64::consts::PI;
    let p0 = lift(sv.stress.pressure() * pi8);
    let (_, rest) = e.parts(lift(e.y0));
    let (sigma, rest) = e.parts(e.next(rest + p0));
    let g = rest + p0;
    // beta^2 = 0, and beta^2 = 1: Y''(a0) gains 8 pi sigma'(a0).
    let c0 = e.potential(e.next(g))[2];
    let c1 = e.potential(Dual2::new(e.y0, g.re, g.v1 + sigma.v1 * pi8))[2] - c0;
    (c0, c1)
}

impl<'a> Junction<'a, f64> {
    /// V(R) on the given radii for a timelike shell that is static at `sv.a`, following sigma(R) along the
    /// motion with `law`: the ODE for Y = R [K^theta_theta] of the module docs is integrated from a0 outward and
    /// inward with classical fourth-order Runge-Kutta steps of at most 1/200 of the span (sub-stepped between
    /// requested radii), then V = V(R, Y(R)). Points where the state leaves the domain (a side's B <= 0, the
    /// law undefined) are NaN.
    pub fn potential_curve(&self, sv: &StaticValues<f64>, law: Law<f64>, radii: &[f64]) -> Vec<f64> {
        let y0 = sv.stress.n_r[1] - sv.stress.n_r[0];
        let start = (sv.a, y0, sv.stress.sigma(), sv.stress.pressure());
        self.potential_curve_from(start, law, radii, false)
    }

    /// V(R) on the given radii along sigma(R) of the law, started from any state (a0, Y0, sigma0, p0) with
    /// Y0 = R [K^theta_theta] = -8 pi a0 sigma0/(D-2) (the method of [`Junction::potential_curve`]). With
    /// `through_horizons` the curve continues into T-regions (the normals X_i are algebraic in Y there and
    /// nothing divides by B, `dynamics::Motion`); otherwise it stops where a side's B <= 0.
    pub fn potential_curve_from(
        &self,
        start: (f64, f64, f64, f64),
        law: Law<f64>,
        radii: &[f64],
        through_horizons: bool,
    ) -> Vec<f64> {
        use crate::model::Which;
        let (a0, y0, sigma0, p0) = start;
        let n_ang = self.n_ang();
        let pi8 = 8.0 * std::f64::consts::PI;
        let rhs = |r: f64, y: f64| -> Option<f64> {
            let jm = self.jet(Which::Minus, r);
            let jp = self.jet(Which::Plus, r);
            let outside = |w: Which, j: &super::Jet<f64>| {
                if through_horizons {
                    super::admissible::signature(w, j.a[0], j.b[0], j.b[1]).is_err()
                } else {
                    j.b[0] <= 0.0
                }
            };
            if outside(Which::Minus, &jm) || outside(Which::Plus, &jp) {
                return None;
            }
            let phi = super::phi_prime;
            let sigma = -y * n_ang / (r * pi8);
            let p = match law {
                Law::Linear { beta2 } => p0 + beta2 * (sigma - sigma0),
                Law::Scenario => self.eos_at(sigma, |t| t)?,
            };
            let db = jp.b[0] - jm.b[0];
            let xp = 0.5 * (y + db * self.shape.eps / y);
            let xm = 0.5 * (db * self.shape.eps / y - y);
            let v = pi8 * p - (xp * phi(&jp) - xm * phi(&jm)) - (n_ang - 1.0) * y / r;
            v.is_finite().then_some(v)
        };
        let span = radii.iter().fold(0.0f64, |m, r| m.max((r - a0).abs())).max(1e-12);
        let hmax = span / 200.0;
        let integrate = |from: f64, y: f64, to: f64| -> Option<f64> {
            let n = ((to - from).abs() / hmax).ceil().max(1.0) as usize;
            let h = (to - from) / n as f64;
            let (mut r, mut y) = (from, y);
            for _ in 0..n {
                let k1 = rhs(r, y)?;
                let k2 = rhs(r + 0.5 * h, y + 0.5 * h * k1)?;
                let k3 = rhs(r + 0.5 * h, y + 0.5 * h * k2)?;
                let k4 = rhs(r + h, y + h * k3)?;
                y += h / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
                r += h;
            }
            Some(y)
        };
        let mut out = vec![f64::NAN; radii.len()];
        let mut order: Vec<usize> = (0..radii.len()).collect();
        order.sort_by(|&i, &j| radii[i].total_cmp(&radii[j]));
        // Outward from a0, then inward, carrying the state between requested radii.
        for dir in [1.0, -1.0] {
            let (mut r, mut y) = (a0, Some(y0));
            let idx: Vec<usize> = if dir > 0.0 {
                order.iter().copied().filter(|&i| radii[i] >= a0).collect()
            } else {
                order.iter().rev().copied().filter(|&i| radii[i] < a0).collect()
            };
            for i in idx {
                y = y.and_then(|yy| integrate(r, yy, radii[i]));
                r = radii[i];
                if let Some(yy) = y {
                    let bm = self.jet(Which::Minus, r).b[0];
                    let bp = self.jet(Which::Plus, r).b[0];
                    out[i] = potential_from_y(self.shape.eps, bm, bp, yy);
                }
            }
        }
        out
    }
}
