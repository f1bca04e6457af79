//! The shell's equations of motion in its proper time: the right-hand side of the ODE for (R, Rdot, sigma), the
//! energy constraint that is monitored along the way, and the reasons the right-hand side can refuse a state.

use super::dopri::Vec3;
use crate::junction::potential::potential_from_y;
use crate::junction::{Junction, HORIZON_TOL};
use crate::scenario::Which;

/// Why the motion cannot be continued from a state (a stop condition).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Halt {
    /// B of a side reaches zero: the shell would cross that side's horizon.
    Horizon(Which),
    /// R reaches (numerically) zero.
    Center,
    /// Rdot^2 + B <= 0 on a side: no timelike shell state exists there.
    NoShellState,
    /// The equation of state is undefined at this sigma (e.g. sigma passes through zero under p = -c/sigma).
    LawUndefined,
    /// A value became NaN or infinite.
    NonFinite,
}

impl Halt {
    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            Halt::Horizon(_) => "horizon",
            Halt::Center => "center",
            Halt::NoShellState => "no_shell_state",
            Halt::LawUndefined => "law_undefined",
            Halt::NonFinite => "non_finite",
        }
    }
}

/// Values that come with the derivative at a state.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Aux {
    /// p = P(sigma).
    pub pressure: f64,
    /// Rdot^2 + V(R, sigma): zero on an exact solution.
    pub constraint: f64,
}

/// The equations of motion of a timelike shell with the scenario's equation of state p = P(sigma).
///
/// Formulation (this is what is integrated; see the module docs of `junction::potential` and `junction`):
/// ```text
/// dR/dtau     = Rdot
/// dRdot/dtau  = Rddot  from the Lanczos equation  p = S^theta_theta(R, Rdot, Rddot) = P(sigma),
///               which is linear in Rddot:  Rddot = (P(sigma) - S0) / (S1 - S0),  S0,1 = S^theta_theta at Rddot = 0, 1
/// dsigma/dtau = Rdot * dsigma/dR,   dsigma/dR = -(D-2)(sigma + p)/R + Xi,
///               Xi = (D-2)(X_plus Phi_plus' - X_minus Phi_minus')/(8 pi R),  X_i = n^r_i = nu_i sqrt(Rdot^2 + B_i)
/// ```
/// (Israel 1966; Poisson 2004 ch. 3; the flux term Xi as in Garcia, Lobo & Visser 2012). The angular junction
/// condition sigma = -(D-2)[X]/(8 pi R), squared into the energy constraint Rdot^2 + V(R, sigma) = 0 with V from
/// `potential_from_y` and Y = -8 pi R sigma/(D-2), is not imposed: it is preserved by the exact flow (the
/// conservation law above is its tau-derivative combined with the theta-theta equation), so its residual
/// measures the integration error. Sign convention: n points from minus into plus, X_i = nu_i W_i.
#[derive(Debug, Clone)]
pub struct Motion<'j, 'a> {
    /// The junction (timelike shell with a law).
    pub j: &'j Junction<'a, f64>,
    /// True when P(sigma) is undefined or not finite at sigma = 0: the motion must then stop before sigma
    /// changes sign.
    pub singular_at_zero: bool,
    /// The sign of sigma at the start (used with `singular_at_zero`).
    pub sigma_sign: f64,
}

impl<'j, 'a> Motion<'j, 'a> {
    /// Equations of motion for a shell starting with surface energy density `sigma_start`.
    pub fn new(j: &'j Junction<'a, f64>, sigma_start: f64) -> Self {
        let singular_at_zero = !j.eos_at(0.0, |t| t).is_some_and(f64::is_finite);
        Motion { j, singular_at_zero, sigma_sign: if sigma_start < 0.0 { -1.0 } else { 1.0 } }
    }

    /// The derivative of y = (R, Rdot, sigma) with respect to proper time, with p and the constraint residual.
    pub fn rhs(&self, y: &Vec3) -> Result<(Vec3, Aux), Halt> {
        let [r, rdot, sigma] = *y;
        if !(r.is_finite() && rdot.is_finite() && sigma.is_finite()) {
            return Err(Halt::NonFinite);
        }
        if r <= 0.0 {
            return Err(Halt::Center);
        }
        let jm = self.j.jet(Which::Minus, r);
        let jp = self.j.jet(Which::Plus, r);
        for (w, jet) in [(Which::Minus, &jm), (Which::Plus, &jp)] {
            if !(jet.b[0].is_finite() && jet.a[0].is_finite()) {
                return Err(Halt::NonFinite);
            }
            if jet.b[0] <= 0.0 || jet.a[0] <= 0.0 {
                return Err(Halt::Horizon(w));
            }
        }
        if self.singular_at_zero && sigma * self.sigma_sign <= 0.0 {
            return Err(Halt::LawUndefined);
        }
        let p = match self.j.eos_at(sigma, |t| t) {
            Some(p) if p.is_finite() => p,
            _ => return Err(Halt::LawUndefined),
        };
        let s0 = self.j.stress_with_jets(&jm, &jp, r, rdot, 0.0).map_err(|_| Halt::NoShellState)?;
        let s1 = self.j.stress_with_jets(&jm, &jp, r, rdot, 1.0).map_err(|_| Halt::NoShellState)?;
        let rddot = (p - s0.s_thth) / (s1.s_thth - s0.s_thth);
        let phi = |jet: &crate::junction::Jet<f64>| jet.a[1] / (2.0 * jet.a[0]) - jet.b[1] / (2.0 * jet.b[0]);
        let n_ang = self.j.n_ang();
        let pi8 = 8.0 * std::f64::consts::PI;
        let flux = s0.n_r[1] * phi(&jp) - s0.n_r[0] * phi(&jm);
        let dsigma_dr = -n_ang * (sigma + p) / r + n_ang * flux / (pi8 * r);
        let v = potential_from_y(self.j.eps, jm.b[0], jp.b[0], -self.j.kappa(r, sigma));
        let d = [rdot, rddot, rdot * dsigma_dr];
        let constraint = rdot * rdot + v;
        if !(d.iter().all(|x| x.is_finite()) && constraint.is_finite()) {
            return Err(Halt::NonFinite);
        }
        Ok((d, Aux { pressure: p, constraint }))
    }

    /// True if R is (numerically) on a horizon of either side: |B| within `tol` relative to 1 + R |B'|, the
    /// same test as `Junction::check_static_radius` with `HORIZON_TOL` there.
    pub fn near_horizon(&self, r: f64, tol: f64) -> Option<Which> {
        [Which::Minus, Which::Plus].into_iter().find(|&w| {
            let jet = self.j.jet(w, r);
            jet.b[0].abs() <= tol.max(HORIZON_TOL) * (1.0 + r * jet.b[1].abs())
        })
    }
}

/// The Israel-Poisson energy of a dust shell with flat interior and Schwarzschild exterior of mass M:
/// M = m sqrt(1 + Rdot^2) - m^2/(2R), m = 4 pi R^2 sigma (Israel 1966; Poisson 2004, A Relativist's Toolkit,
/// sec. 3.9; D = 4, G = c = 1, sigma > 0 for positive rest mass).
pub fn dust_shell_energy(r: f64, rdot: f64, sigma: f64) -> f64 {
    let m = 4.0 * std::f64::consts::PI * r * r * sigma;
    m * (1.0 + rdot * rdot).sqrt() - m * m / (2.0 * r)
}
