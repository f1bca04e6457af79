//! The Israel junction conditions for a thin shell r = R(s) between the `minus` and `plus` sides.
//!
//! Conventions (see the README, "Conventions"): signature (-,+,+,+), G = c = 1, the Lanczos factor 8 pi in every
//! dimension D. The unit normal n points from minus into plus; eps = n.n = +1 for a timelike shell (s = proper
//! time tau) and -1 for a spacelike shell (s = proper length l). On each side i the sign of n^r is
//! nu_i = `Side::normal_sign()`, so that with W_i = sqrt(Rdot^2 + eps B_i)
//! ```text
//! n^r_i = nu_i W_i,   K^theta_theta_i = nu_i W_i / R,
//! K^s_s_i = nu_i (Rddot + eps B_i'/2) / W_i + nu_i W_i Phi_i',   Phi_i' = A_i'/(2 A_i) - B_i'/(2 B_i),
//! S_ab = -(eps / 8 pi) ([K_ab] - [K] h_ab),   [X] = X_plus - X_minus      (Lanczos equation)
//! ```
//! (Israel 1966, Nuovo Cimento B 44, 1; Barrabes & Israel 1991, Phys. Rev. D 43, 1129; Poisson, A Relativist's
//! Toolkit, 2004, ch. 3). Every path is checked against an independent SymPy derivation from first principles in
//! `tests/reference/junction_reference.py`.
//!
//! The computations are generic over the number type `T` of the parameters (f64, or a dual number when a
//! derivative with respect to a parameter is wanted); radial derivatives of A and B come from third-order dual
//! numbers, exact to rounding.

pub mod admissible;
pub mod closed;
pub mod conditions;
pub mod formula;
pub mod lanczos;
pub mod point;
pub mod potential;
pub mod stability;

use crate::error::{Error, Result};
use crate::expr::Scalar;
use crate::model::{EquationOfState, MetricSide, Model, Shape, Which};
use crate::scenario::Scenario;
use num_dual::Dual3;

pub use conditions::EnergyConditions;
pub use lanczos::{StaticValues, Stress};
pub use stability::{LinearStability, StableWhen};

/// A(r), B(r) and their first three radial derivatives at one radius.
#[derive(Debug, Clone, Copy)]
pub struct Jet<T> {
    /// [A, A', A'', A'''].
    pub a: [T; 4],
    /// [B, B', B'', B'''].
    pub b: [T; 4],
}

/// Phi' = A'/(2A) - B'/(2B) of one side, the redshift gradient in the flux term of the conservation law
/// (physics notes); exactly zero when the jets of A and B coincide (A = B), so that it stays finite on a horizon.
pub fn phi_prime(jet: &Jet<f64>) -> f64 {
    if jet.a[0] == jet.b[0] && jet.a[1] == jet.b[1] {
        return 0.0;
    }
    redshift_gradient(jet.a[0], jet.a[1], jet.b[0], jet.b[1])
}

/// Phi' = A'/(2A) - B'/(2B) from A, A', B and B' of any number type (a dual number carries its radial
/// derivatives): the one place the formula is written. Phi is the redshift function of the metric written as
/// -e^{2 Phi} B dt^2 + dr^2/B + r^2 dOmega^2, the form of Garcia, Lobo & Visser 2012 (Phys. Rev. D 86, 044026;
/// from memory), so A = e^{2 Phi} B and Phi = ln(A/B)/2; Phi' = 0 where A = B. It enters K^s_s = (n^r)^(-1)
/// (Rddot + eps B'/2) + n^r Phi' (module docs).
#[inline(always)]
pub fn redshift_gradient<U: Scalar>(a: U, a1: U, b: U, b1: U) -> U {
    a1 / (a * 2.0) - b1 / (b * 2.0)
}

/// A shell between two sides, bound to parameter values of number type `T`.
#[derive(Debug, Clone)]
pub struct Junction<'a, T: Scalar = f64> {
    /// Spacetime dimension D.
    pub dimension: u32,
    /// The geometry the formulas read (kind, eps, D - 2, normal signs, kept parts; `Model::shape`).
    pub shape: Shape,
    /// The model: both sides' metric functions and the equation of state.
    pub model: &'a Model,
    /// Parameter values, in the model's order.
    pub params: Vec<T>,
}

impl<'a> Junction<'a, f64> {
    /// The junction of a scenario at its current parameter values.
    pub fn new(s: &'a Scenario) -> Junction<'a, f64> {
        Junction::with_params(&s.model, s.params.values().to_vec())
    }

    /// The law at sigma: (P(sigma), beta^2 = P'(sigma)) by one dual-number evaluation; `None` without a law.
    /// The one place beta^2 of the scenario's equation of state is computed (statics, maps, figures, evolve).
    pub fn law_and_slope(&self, sigma: f64) -> Option<(f64, f64)> {
        self.eos_at(num_dual::Dual64::new(sigma, 1.0), num_dual::Dual64::from).map(|d| (d.re, d.eps))
    }

    /// One side's A and B bound to this junction's parameter values (for horizon finding in `metric`).
    pub fn side_fns(&self, which: Which) -> crate::metric::SideFns<'_> {
        crate::metric::SideFns::of(self.model.side(which), &self.params)
    }
}

impl<'a, T: Scalar> Junction<'a, T> {
    /// The junction of a model with the given parameter values (of any number type).
    pub fn with_params(model: &'a Model, params: Vec<T>) -> Junction<'a, T> {
        Junction { dimension: model.dimension, shape: model.shape(), model, params }
    }

    /// (D - 2) as a float: the number of angular directions on the shell.
    pub fn n_ang(&self) -> f64 {
        self.shape.n_ang
    }

    /// A, B and three derivatives of side `which` at radius `r`.
    pub fn jet(&self, which: Which, r: T) -> Jet<T> {
        let side = &self.model.side(which).metric;
        let x = Dual3::new(r, T::one(), T::zero(), T::zero());
        let lift = |k: usize| Dual3::new(self.params[k], T::zero(), T::zero(), T::zero());
        let a: Dual3<T, f64> = side.a(x, lift);
        let b: Dual3<T, f64> = if side.b_is_a() { a } else { side.b(x, lift) };
        Jet { a: [a.re, a.v1, a.v2, a.v3], b: [b.re, b.v1, b.v2, b.v3] }
    }

    /// A, B and their first radial derivatives of side `which` at radius `r`, from one first-order dual
    /// evaluation each; the second and third derivatives are NaN. Enough for the static junction values
    /// (sigma0, p0 and the admissibility rule), at about a third of the cost of [`Junction::jet`].
    pub fn first_order_jet(&self, which: Which, r: T) -> Jet<T> {
        let side = &self.model.side(which).metric;
        let x = num_dual::Dual::new(r, T::one());
        let lift = |k: usize| num_dual::Dual::new(self.params[k], T::zero());
        let a: num_dual::Dual<T, f64> = side.a(x, lift);
        let b: num_dual::Dual<T, f64> = if side.b_is_a() { a } else { side.b(x, lift) };
        let nan = T::from(f64::NAN);
        Jet { a: [a.re, a.eps, nan, nan], b: [b.re, b.eps, nan, nan] }
    }

    /// Evaluate the equation of state P(sigma) at any number type built on `T`.
    pub fn eos_at<U: Scalar, L: Fn(T) -> U + Copy>(&self, sigma: U, lift: L) -> Option<U> {
        self.model.law.as_ref().map(|l| l.pressure(sigma, |k| lift(self.params[k])))
    }

    /// Check that A, B and their derivatives up to `order` (at most 3) of side `which` are finite at radius
    /// `r`; the error names the side, the function (A or B, with its expression) and the derivative.
    pub fn check_finite_jet(&self, which: Which, r: f64, jet: &Jet<T>, order: usize) -> Result<()> {
        let sources = self.model.side(which).metric.expressions().map(|(a, b)| [a.source(), b.source()]);
        const WHAT: [&str; 4] =
            ["", "the first derivative of ", "the second derivative of ", "the third derivative of "];
        for (k, what) in WHAT.iter().enumerate().take(order.min(3) + 1) {
            for (i, name, v) in [(0, "A", jet.a[k].re()), (1, "B", jet.b[k].re())] {
                if !v.is_finite() {
                    let typed = sources.map(|s| format!(" ({name} = \"{}\" gives {v})", s[i])).unwrap_or_default();
                    return Err(Error::numerical(format!(
                        "radius {r}: {what}{name} of the {which} side is not finite there{typed}"
                    ))
                    .with_hint(format!(
                        "{name} is singular or undefined at r = {r} (a division by zero, or log/sqrt of a negative number); choose another radius"
                    )));
                }
            }
        }
        Ok(())
    }

    /// Check that a static shell can sit at `a`: A, B and two derivatives finite (with the expression named),
    /// then the one admissibility rule ([`admissible::static_site`]) as an error naming the side.
    pub fn check_static_radius(&self, a: f64, jm: &Jet<T>, jp: &Jet<T>) -> Result<()> {
        for (which, jet) in [(Which::Minus, jm), (Which::Plus, jp)] {
            self.check_finite_jet(which, a, jet, 2)?;
        }
        let re = |j: &Jet<T>| Jet { a: j.a.map(|x| x.re()), b: j.b.map(|x| x.re()) };
        admissible::static_site(self.shape.kind, self.shape.keep, a, [&re(jm), &re(jp)])
            .map_err(|why| admissible_error(a, why))
    }
}

/// The error for a radius the admissibility rule refuses: a contradiction with `keep` is bad input (exit 2),
/// the rest are numerical (exit 3).
pub fn admissible_error(a: f64, why: admissible::Inadmissible) -> Error {
    let msg = format!("radius {a}: {why}");
    let e = match why {
        admissible::Inadmissible::KeepContradicts { .. } => Error::input(msg),
        _ => Error::numerical(msg),
    };
    e.with_hint(why.hint()).with_problem(crate::Problem::Inadmissible { radius: a, reason: why })
}

/// Area of the unit n-sphere, Omega_n = 2 pi^((n+1)/2) / Gamma((n+1)/2) (common practice), by the recursion
/// Omega_n = 2 pi Omega_(n-2) / (n - 1) with Omega_0 = 2, Omega_1 = 2 pi.
pub fn unit_sphere_area(n: u32) -> f64 {
    let pi = std::f64::consts::PI;
    let (mut k, mut area) = if n % 2 == 0 { (0, 2.0) } else { (1, 2.0 * pi) };
    while k < n {
        k += 2;
        area *= 2.0 * pi / f64::from(k - 1);
    }
    area
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sphere_areas() {
        // Omega_2 = 4 pi, Omega_3 = 2 pi^2, Omega_4 = 8 pi^2/3 (common practice).
        let pi = std::f64::consts::PI;
        assert!((unit_sphere_area(2) - 4.0 * pi).abs() < 1e-14);
        assert!((unit_sphere_area(3) - 2.0 * pi * pi).abs() < 1e-13);
        assert!((unit_sphere_area(4) - 8.0 * pi * pi / 3.0).abs() < 1e-13);
    }
}
