//! Energy conditions on a timelike shell and the shell's mass.

use serde::Serialize;

/// Which pointwise energy conditions the surface stress satisfies.
///
/// Null: sigma + p >= 0. Weak: sigma >= 0 and sigma + p >= 0. Strong: sigma + p >= 0 and
/// sigma + (D-2) p >= 0. Dominant: sigma >= |p|. (Common practice for a perfect-fluid shell with D - 2 equal
/// principal pressures; Visser 1995, Lorentzian Wormholes, ch. 12 for D = 4.)
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct EnergyConditions {
    /// Null energy condition.
    pub null: bool,
    /// Weak energy condition.
    pub weak: bool,
    /// Strong energy condition.
    pub strong: bool,
    /// Dominant energy condition.
    pub dominant: bool,
}

impl EnergyConditions {
    /// Evaluate for surface energy density `sigma` and pressure `p` in D dimensions. Values within a relative
    /// 1e-12 of a boundary count as satisfying it (so a marginal case is not decided by rounding).
    pub fn evaluate(sigma: f64, p: f64, dimension: u32) -> EnergyConditions {
        let tol = 1e-12 * sigma.abs().max(p.abs());
        let ge = |x: f64| x >= -tol;
        let nd = f64::from(dimension - 2);
        let null = ge(sigma + p);
        EnergyConditions {
            null,
            weak: null && ge(sigma),
            strong: null && ge(sigma + nd * p),
            dominant: ge(sigma - p.abs()),
        }
    }
}

/// The shell's mass M_s = Omega_(D-2) a^(D-2) sigma (proper area times surface energy density; Israel 1966,
/// M_s = 4 pi a^2 sigma in D = 4).
pub fn shell_mass(a: f64, sigma: f64, dimension: u32) -> f64 {
    super::unit_sphere_area(dimension - 2) * a.powi(dimension as i32 - 2) * sigma
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exotic_wormhole_matter_violates_weak() {
        // Static thin-shell wormholes need sigma < 0 (Visser 1995, ch. 15).
        let ec = EnergyConditions::evaluate(-0.1, 0.05, 4);
        assert!(!ec.weak && !ec.dominant && !ec.null);
        let dust = EnergyConditions::evaluate(0.1, 0.0, 4);
        assert!(dust.null && dust.weak && dust.strong && dust.dominant);
    }
}
