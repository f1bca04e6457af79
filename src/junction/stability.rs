//! Linearised stability of a static shell in the beta^2 = dp/dsigma parameterisation.
//!
//! V''(a0) is linear in beta^2 (beta^2 enters only through sigma''(a0), linearly), so two evaluations give
//! V''(a0) = c0 + c1 beta^2, one critical value beta^2_c = -c0/c1 and the side on which V'' > 0 (Poisson &
//! Visser 1995, Phys. Rev. D 52, 7318; Garcia, Lobo & Visser 2012, Phys. Rev. D 86, 044026).

use super::potential::v2_linear_coefficients;
use super::{Junction, StaticValues};
use crate::expr::Scalar;
use crate::tolerances::TOL;
use serde::Serialize;

/// On which side of the critical beta^2 the shell is stable.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum StableWhen {
    /// Stable for beta^2 > beta^2_c.
    Beta2Above,
    /// Stable for beta^2 < beta^2_c.
    Beta2Below,
    /// No beta^2 makes it stable.
    Never,
    /// Every beta^2 makes it stable.
    Always,
}

impl StableWhen {
    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            StableWhen::Beta2Above => "beta2_above",
            StableWhen::Beta2Below => "beta2_below",
            StableWhen::Never => "never",
            StableWhen::Always => "always",
        }
    }
}

/// V''(a0) = c0 + c1 beta^2 and what follows from it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LinearStability {
    /// V''(a0) at beta^2 = 0.
    pub v2_at_beta2_zero: f64,
    /// dV''(a0)/d(beta^2).
    pub v2_slope: f64,
    /// The critical beta^2 (None when V'' does not depend on beta^2).
    pub beta2_critical: Option<f64>,
    /// Where the shell is stable.
    pub stable_when: StableWhen,
}

/// The scale that |V''(a0)| is compared with for the marginal rule: |c0| + |c1 beta^2| (the two terms of
/// V'' = c0 + c1 beta^2, Poisson & Visser 1995) plus 1/a0^2, the natural size of V'' for a potential of order one
/// varying on the scale a0 (common practice). Without the last term a law whose static condition holds
/// identically (V'' = 0 exactly, c0 and c1 beta^2 round-off) would be called stable or unstable at random.
pub fn marginal_scale(ls: &LinearStability, beta2: f64, a0: f64) -> f64 {
    marginal_scale_of(ls.v2_at_beta2_zero, ls.v2_slope * beta2, a0)
}

/// [`marginal_scale`] from the two terms c0 and c1 beta^2 of V''(a0) (maps hold the coefficients, not a
/// [`LinearStability`]).
#[inline]
pub fn marginal_scale_of(c0: f64, c1_beta2: f64, a0: f64) -> f64 {
    c0.abs() + c1_beta2.abs() + 1.0 / (a0 * a0)
}

impl LinearStability {
    /// Classify from the two coefficients.
    pub fn from_coefficients(c0: f64, c1: f64) -> LinearStability {
        let scale = c0.abs().max(c1.abs());
        if c1.abs() <= TOL.stability.beta2_slope * scale || scale == 0.0 {
            let stable_when = if c0 > 0.0 { StableWhen::Always } else { StableWhen::Never };
            return LinearStability { v2_at_beta2_zero: c0, v2_slope: c1, beta2_critical: None, stable_when };
        }
        let stable_when = if c1 > 0.0 { StableWhen::Beta2Above } else { StableWhen::Beta2Below };
        LinearStability { v2_at_beta2_zero: c0, v2_slope: c1, beta2_critical: Some(-c0 / c1), stable_when }
    }

    /// V''(a0) at a given beta^2.
    pub fn v2(&self, beta2: f64) -> f64 {
        self.v2_at_beta2_zero + self.v2_slope * beta2
    }
}

impl<'a, T: Scalar> Junction<'a, T> {
    /// The two coefficients of V''(a0) = c0 + c1 beta^2 at a static radius (timelike shells;
    /// [`v2_linear_coefficients`]).
    pub fn v2_coefficients(&self, sv: &StaticValues<T>) -> (T, T) {
        v2_linear_coefficients(&self.shape, sv)
    }
}

impl<'a> Junction<'a, f64> {
    /// Linearised stability at a static radius.
    pub fn linear_stability(&self, sv: &StaticValues<f64>) -> LinearStability {
        let (c0, c1) = self.v2_coefficients(sv);
        LinearStability::from_coefficients(c0, c1)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::Scenario;

    const WORMHOLE: &str = r#"
name = "Schwarzschild thin-shell wormhole"
[parameters]
m = 1.0
[minus]
A = "1 - 2*m/r"
keep = "outer"
[plus]
A = "1 - 2*m/r"
keep = "outer"
"#;

    /// Poisson & Visser 1995 (Phys. Rev. D 52, 7318), critical curve of the Schwarzschild thin-shell wormhole:
    /// beta^2_c = -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a)(1 - 3M/a)); stable below it for a > 3M, above it for
    /// 2M < a < 3M.
    #[test]
    fn schwarzschild_wormhole_matches_poisson_visser() {
        let s = Scenario::parse(WORMHOLE, None).unwrap();
        let j = Junction::new(&s);
        for a in [2.2, 2.5, 2.9, 3.1, 4.0, 7.0, 20.0] {
            let sv = j.static_values(a).unwrap();
            let ls = j.linear_stability(&sv);
            let x = 1.0 / a;
            let pv = -(1.0 - 3.0 * x + 3.0 * x * x) / (2.0 * (1.0 - 2.0 * x) * (1.0 - 3.0 * x));
            let got = ls.beta2_critical.unwrap();
            assert!((got - pv).abs() < 1e-10 * pv.abs().max(1.0), "a = {a}: {got} vs {pv}");
            let expect = if a > 3.0 { StableWhen::Beta2Below } else { StableWhen::Beta2Above };
            assert_eq!(ls.stable_when, expect, "a = {a}");
            // Static solution: V(a) = V'(a) = 0 (for the law through the static values).
            let v = j.potential_taylor(&sv, crate::junction::potential::Law::Linear { beta2: 0.3 }).unwrap();
            assert!(v[0].abs() < 1e-14 && v[1].abs() < 1e-13, "{v:?}");
        }
    }
}
