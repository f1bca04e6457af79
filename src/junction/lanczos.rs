//! Extrinsic curvature on each side and the surface stress tensor from the Lanczos equation.

use super::{Jet, Junction};
use crate::error::{Error, Result};
use crate::expr::Scalar;
use crate::model::{Shape, ShellKind, Which};

/// Mixed components of the extrinsic curvatures and of the surface stress tensor at one shell state.
#[derive(Debug, Clone, Copy)]
pub struct Stress<T> {
    /// K^s_s on [minus, plus] (s = tau for a timelike shell, l for a spacelike one).
    pub k_ss: [T; 2],
    /// K^theta_theta on [minus, plus].
    pub k_thth: [T; 2],
    /// S^s_s.
    pub s_ss: T,
    /// S^theta_theta.
    pub s_thth: T,
    /// n^r on [minus, plus] (= nu_i W_i).
    pub n_r: [T; 2],
}

impl<T: Scalar> Stress<T> {
    /// Surface energy density sigma = -S^tau_tau (timelike shells).
    pub fn sigma(&self) -> T {
        -self.s_ss
    }

    /// Surface pressure p = S^theta_theta (timelike shells).
    pub fn pressure(&self) -> T {
        self.s_thth
    }

    /// [K^s_s] = plus - minus.
    pub fn k_ss_jump(&self) -> T {
        self.k_ss[1] - self.k_ss[0]
    }

    /// [K^theta_theta] = plus - minus.
    pub fn k_thth_jump(&self) -> T {
        self.k_thth[1] - self.k_thth[0]
    }
}

/// A static shell: its radius, stress and Y = R [K^theta_theta] (the quantity the potential is built from).
#[derive(Debug, Clone, Copy)]
pub struct StaticValues<T> {
    /// Radius a.
    pub a: T,
    /// Stress at Rdot = Rddot = 0.
    pub stress: Stress<T>,
    /// Jets of A and B on [minus, plus] at a.
    pub jets: [Jet<T>; 2],
}

/// A shell state that cannot exist: on `side`, W^2 = Rdot^2 + eps B = `w2` <= 0.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NoState {
    /// The side where it fails.
    pub side: Which,
    /// W^2 there.
    pub w2: f64,
}

/// Extrinsic curvature and surface stress at a shell state (r, Rdot, Rddot) from the jets of both sides
/// ([minus, plus]; A, B and their first derivatives are read) and the junction's shape: the one place the
/// Lanczos equation is evaluated, whatever computed the jets (dual-number evaluation of the sides in
/// [`Junction::stress_with_jets`], compiled tapes in the maps' batched path).
///
/// Formula (module docs; Poisson 2004 ch. 3 for A = B, D = 4; generalised to A != B and D dimensions):
/// S^s_s = eps (D-2) [K^theta_theta] / (8 pi), S^theta_theta = (eps / 8 pi) ([K^s_s] + (D-3) [K^theta_theta]).
#[inline]
pub fn stress_of<T: Scalar>(
    shape: &Shape,
    jets: [&Jet<T>; 2],
    r: T,
    rdot: T,
    rddot: T,
) -> std::result::Result<Stress<T>, NoState> {
    for (which, jet) in [Which::Minus, Which::Plus].into_iter().zip(jets) {
        let w2 = rdot * rdot + jet.b[0] * shape.eps;
        if w2.re() <= 0.0 {
            return Err(NoState { side: which, w2: w2.re() });
        }
    }
    Ok(stress_unchecked(shape, jets, r, rdot, rddot))
}

/// [`stress_of`] without its check (NaN where W^2 <= 0): branch-free, so that a loop over many radii can run
/// several at once.
#[inline(always)]
pub fn stress_unchecked<T: Scalar>(shape: &Shape, jets: [&Jet<T>; 2], r: T, rdot: T, rddot: T) -> Stress<T> {
    let mut k_ss = [T::zero(); 2];
    let mut k_thth = [T::zero(); 2];
    let mut n_r = [T::zero(); 2];
    for (i, jet) in jets.into_iter().enumerate() {
        let [av, ap, ..] = jet.a;
        let [bv, bp, ..] = jet.b;
        let w = (rdot * rdot + bv * shape.eps).sqrt();
        let phi_p = super::redshift_gradient(av, ap, bv, bp);
        let x = w * shape.nu[i];
        n_r[i] = x;
        k_thth[i] = x / r;
        k_ss[i] = (rddot + bp * (0.5 * shape.eps)) / w * shape.nu[i] + x * phi_p;
    }
    let pi8 = 8.0 * std::f64::consts::PI;
    let jump_th = k_thth[1] - k_thth[0];
    let jump_ss = k_ss[1] - k_ss[0];
    let s_ss = jump_th * (shape.eps * shape.n_ang / pi8);
    let s_thth = (jump_ss + jump_th * (shape.n_ang - 1.0)) * (shape.eps / pi8);
    Stress { k_ss, k_thth, s_ss, s_thth, n_r }
}

impl<'a, T: Scalar> Junction<'a, T> {
    /// Extrinsic curvature and surface stress at a shell state (R, Rdot, Rddot), derivatives with respect to the
    /// shell's own proper time (timelike) or proper length (spacelike): [`stress_of`] with this junction's shape.
    /// Returns an error where W_i^2 = Rdot^2 + eps B_i <= 0 (no such shell state exists on that side).
    pub fn stress_with_jets(&self, jm: &Jet<T>, jp: &Jet<T>, r: T, rdot: T, rddot: T) -> Result<Stress<T>> {
        stress_of(&self.shape, [jm, jp], r, rdot, rddot).map_err(|NoState { side, w2 }| {
            let what = match self.shape.kind {
                ShellKind::Timelike => "Rdot^2 + B",
                ShellKind::Spacelike => "(dR/dl)^2 - B",
            };
            Error::numerical(format!(
                "on the {side} side {what} = {w2:.6e} <= 0 at R = {}: the shell cannot have this state there",
                r.re()
            ))
            .with_hint("a timelike shell inside a T-region must move fast enough (|Rdot|^2 > |B|); check the radius and the shell kind")
        })
    }

    /// Stress at a general state, evaluating A and B at R.
    pub fn stress(&self, r: T, rdot: T, rddot: T) -> Result<Stress<T>> {
        let jm = self.jet(Which::Minus, r);
        let jp = self.jet(Which::Plus, r);
        self.stress_with_jets(&jm, &jp, r, rdot, rddot)
    }

    /// Static shell at radius `a` (Rdot = Rddot = 0), after checking that a static shell of this kind can sit
    /// there (regions, horizons). For a timelike shell in 4D this is the textbook
    /// sigma0 = -(1/4 pi a) sum_i zeta_i sqrt(B_i), p0 = (1/8 pi a) sum_i zeta_i sqrt(B_i)(1 + a A_i'/(2 A_i))
    /// (physics notes; Visser 1995, Lorentzian Wormholes, ch. 15 for the symmetric wormhole).
    pub fn static_values(&self, a: T) -> Result<StaticValues<T>> {
        let jm = self.jet(Which::Minus, a);
        let jp = self.jet(Which::Plus, a);
        self.check_static_radius(a.re(), &jm, &jp)?;
        let stress = self.stress_with_jets(&jm, &jp, a, T::zero(), T::zero())?;
        Ok(StaticValues { a, stress, jets: [jm, jp] })
    }
}
