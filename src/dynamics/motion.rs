//! The shell's equations of motion in its proper time: the right-hand side of the ODE for (R, Rdot, sigma), the
//! energy constraint that is monitored along the way, and the reasons the right-hand side can refuse a state.

use super::dopri::Vec3;
use crate::junction::potential::potential_from_y;
use crate::junction::{admissible, phi_prime, Junction};
use crate::model::Which;
use crate::tolerances::TOL;
use num_dual::Dual64;

/// Why the motion cannot be continued from a state (a stop condition).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Halt {
    /// B of a side reaches zero while horizons are not to be crossed (`EvolveOptions::stop_at_horizon`).
    Horizon(Which),
    /// R reaches (numerically) zero.
    Center,
    /// Rdot^2 + B <= 0 on a side: no timelike shell state exists there.
    NoShellState,
    /// The equation of state is undefined at this sigma (e.g. sigma passes through zero under p = -c/sigma).
    LawUndefined,
    /// A and B of a side have opposite signs: the metric changes signature there.
    Signature(Which),
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
            Halt::Signature(_) => "signature_change",
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

/// The geometry of one shell state: B and n^r on each side.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Normals {
    /// B_minus(R), B_plus(R).
    pub b: [f64; 2],
    /// n^r on [minus, plus]: X_plus = (Y + \[B\]/Y)/2, X_minus = (\[B\]/Y - Y)/2 with Y = -kappa (module docs of
    /// `junction::potential`); on the constraint surface X_i^2 = Rdot^2 + B_i.
    pub n_r: [f64; 2],
}

/// The equations of motion of a timelike shell with the scenario's equation of state p = P(sigma).
///
/// Formulation (this is what is integrated; see the module docs of `junction::potential` and `junction`):
/// ```text
/// dR/dtau     = Rdot
/// dsigma/dtau = Rdot * dsigma/dR,   dsigma/dR = -(D-2)(sigma + p)/R + Xi,
///               Xi = (D-2)(X_plus Phi_plus' - X_minus Phi_minus')/(8 pi R)
/// dRdot/dtau  = -(1/2) dV/dR,   V(R, Y) = (B_plus + B_minus)/2 - ((B_plus - B_minus)/(2Y))^2 - Y^2/4,
///               Y = -8 pi R sigma/(D-2), dV/dR the total derivative along sigma(R) above
/// X_plus = (Y + [B]/Y)/2,  X_minus = ([B]/Y - Y)/2        (the normals n^r_i, from X_plus - X_minus = Y and
///                                                           X_plus^2 - X_minus^2 = B_plus - B_minus)
/// ```
/// (Israel 1966; Poisson 2004 ch. 3; the flux term Xi as in Garcia, Lobo & Visser 2012). Nothing here divides
/// by B or by W_i = |X_i|: the motion is regular through horizons (B_i = 0, where W_i = |Rdot| stays finite)
/// and through the zeros of X_i, where the sign of n^r on a side flips (possible only in a T-region, since
/// X_i^2 = Rdot^2 + B_i). The second-order equation is the tau-derivative of the energy constraint
/// Rdot^2 + V(R, sigma) = 0, which is therefore a first integral: it holds at the start by construction and its
/// drift along the run measures the integration error. On the constraint surface this is the Lanczos
/// theta-theta equation p = S^theta_theta solved for Rddot. Sign convention: n points from minus into plus.
/// The flux term needs Phi_i' = A_i'/(2A_i) - B_i'/(2B_i), which is exactly zero when A_i = B_i and otherwise
/// finite through a horizon only if A_i/B_i is regular there.
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

    /// B and n^r on both sides at radius `r` with surface energy density `sigma` (formulas on [`Motion`]).
    pub fn normals(&self, r: f64, sigma: f64) -> Normals {
        let bm = self.j.jet(Which::Minus, r).b[0];
        let bp = self.j.jet(Which::Plus, r).b[0];
        let y = -self.j.kappa(r, sigma);
        let db = bp - bm;
        Normals { b: [bm, bp], n_r: [0.5 * (db / y - y), 0.5 * (y + db / y)] }
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
            if !(jet.b[0].is_finite() && jet.a[0].is_finite() && jet.b[1].is_finite() && jet.a[1].is_finite()) {
                return Err(Halt::NonFinite);
            }
            if admissible::signature(w, jet.a[0], jet.b[0], jet.b[1]).is_err() {
                return Err(Halt::Signature(w));
            }
        }
        if self.singular_at_zero && sigma * self.sigma_sign <= 0.0 {
            return Err(Halt::LawUndefined);
        }
        let p = match self.j.eos_at(sigma, |t| t) {
            Some(p) if p.is_finite() => p,
            _ => return Err(Halt::LawUndefined),
        };
        let n_ang = self.j.n_ang();
        let pi8 = 8.0 * std::f64::consts::PI;
        let yy = -self.j.kappa(r, sigma);
        if yy == 0.0 {
            return Err(Halt::NonFinite);
        }
        let db = jp.b[0] - jm.b[0];
        let (xm, xp) = (0.5 * (db / yy - yy), 0.5 * (yy + db / yy));
        let flux = xp * phi_prime(&jp) - xm * phi_prime(&jm);
        let dsigma_dr = -n_ang * (sigma + p) / r + n_ang * flux / (pi8 * r);
        let dy_dr = -(pi8 / n_ang) * (sigma + r * dsigma_dr);
        let v = potential_from_y(
            self.j.shape.eps,
            Dual64::new(jm.b[0], jm.b[1]),
            Dual64::new(jp.b[0], jp.b[1]),
            Dual64::new(yy, dy_dr),
        );
        let d = [rdot, -0.5 * v.eps, rdot * dsigma_dr];
        let constraint = rdot * rdot + v.re;
        if !(d.iter().all(|x| x.is_finite()) && constraint.is_finite()) {
            return Err(Halt::NonFinite);
        }
        Ok((d, Aux { pressure: p, constraint }))
    }

    /// True if R is (numerically) on a horizon of either side: |B| within `tol` relative to 1 + R |B'|, the
    /// same test as `Junction::check_static_radius` with `Tolerances::horizon.on_horizon` there.
    pub fn near_horizon(&self, r: f64, tol: f64) -> Option<Which> {
        [Which::Minus, Which::Plus].into_iter().find(|&w| {
            let jet = self.j.jet(w, r);
            admissible::near_horizon(r, jet.b[0], jet.b[1], tol.max(TOL.horizon.on_horizon))
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
