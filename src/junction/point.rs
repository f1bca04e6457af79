//! A static timelike shell at one radius from the jets of its two sides: the admissibility rule, the Lanczos
//! equation and V''(a0) = c0 + c1 beta^2, in one function that every map cell runs, whichever evaluator computed
//! the jets (dual-number evaluation of the sides in a [`super::Junction`], or the compiled tapes of the maps'
//! batched path, `scan::fast`). The formulas are those of [`super::lanczos::stress_unchecked`] and
//! [`super::potential::expand`], written once.

use super::admissible::{self, Inadmissible};
use super::lanczos::{stress_unchecked, StaticValues};
use super::potential::v2_linear_coefficients;
use super::Jet;
use crate::model::Shape;

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

/// Why there are no static values at a radius.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum NoStaticValues {
    /// The admissibility rule refuses the radius (with its reason).
    Refused(Inadmissible),
    /// The values are not finite there (the potential cannot be expanded, or a formula divides by zero).
    Undefined,
}

/// sigma0, p0, c0 and c1 at radius `a` from the jets of [minus, plus] (A, B and two derivatives each; third
/// derivatives are not read): the one admissibility rule ([`admissible::static_site`]) first, then the
/// stress ([`stress_unchecked`] at Rdot = Rddot = 0) and the two coefficients ([`v2_linear_coefficients`]),
/// which must be finite.
#[inline]
pub fn static_coefficients(shape: &Shape, a: f64, jets: [&Jet<f64>; 2]) -> Result<StaticCoefficients, NoStaticValues> {
    admissible::static_site(shape.kind, shape.keep, a, jets).map_err(NoStaticValues::Refused)?;
    finite(coefficients_unchecked(shape, a, jets))
}

/// The checks of [`static_coefficients`] on values already computed by [`coefficients_unchecked`] from the
/// same jets (the batched path computes a line of values first, then checks each).
#[inline]
pub fn check(
    shape: &Shape,
    a: f64,
    jets: [&Jet<f64>; 2],
    c: StaticCoefficients,
) -> Result<StaticCoefficients, NoStaticValues> {
    admissible::static_site(shape.kind, shape.keep, a, jets).map_err(NoStaticValues::Refused)?;
    finite(c)
}

fn finite(c: StaticCoefficients) -> Result<StaticCoefficients, NoStaticValues> {
    if c.sigma.is_finite() && c.pressure.is_finite() && c.c0.is_finite() && c.c1.is_finite() {
        Ok(c)
    } else {
        Err(NoStaticValues::Undefined)
    }
}

/// The values of [`static_coefficients`] without any check (NaN or infinite where the radius is refused):
/// branch-free, so that a loop over a line of radii can run several at once.
#[inline(always)]
pub fn coefficients_unchecked(shape: &Shape, a: f64, jets: [&Jet<f64>; 2]) -> StaticCoefficients {
    let stress = stress_unchecked(shape, jets, a, 0.0, 0.0);
    let sv = StaticValues { a, stress, jets: [*jets[0], *jets[1]] };
    let (c0, c1) = v2_linear_coefficients(shape, &sv);
    StaticCoefficients { sigma: stress.sigma(), pressure: stress.pressure(), c0, c1 }
}
