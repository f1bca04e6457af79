//! Can a shell sit at this radius? The one rule, used by `derive`, `statics`, maps and `evolve`, so that every
//! command refuses the same points for the same reason.
//!
//! A static shell at r = a needs, on each side (common practice; the R/T-region language as in the module doc of
//! [`crate::junction`]):
//! 1. A, B and B' finite there;
//! 2. a not (numerically) on a horizon: |B| > `Tolerances::horizon.on_horizon` (1 + a |B'|) — the junction formulas divide by
//!    sqrt(|B|), and a shell on a horizon is a null shell;
//! 3. no change of signature: A and B of one sign (their zeros coincide);
//! 4. the region the shell kind needs: B > 0 (an R-region, r = const timelike) for a timelike shell, B < 0 for a
//!    spacelike one;
//! 5. the region the side's `keep` names: `inner`/`outer` are R-regions, `black-hole`/`white-hole` T-regions.
//!
//! A moving shell needs only 1 and 3 (it crosses horizons; see `dynamics`).

use super::Jet;
pub use crate::model::Inadmissible;
use crate::model::{Keep, ShellKind, Which};
use crate::tolerances::TOL;

/// True if r is numerically on a zero of B: |B| <= tol (1 + r |B'|). The one horizon-distance test.
#[inline]
pub fn near_horizon(r: f64, b: f64, b1: f64, tol: f64) -> bool {
    b.abs() <= tol * (1.0 + r * b1.abs())
}

/// Rules 1 and 3 (finite, no signature change): what a moving shell needs at each radius it passes.
#[inline]
pub fn signature(side: Which, a: f64, b: f64, b1: f64) -> Result<(), Inadmissible> {
    if !(a.is_finite() && b.is_finite() && b1.is_finite()) {
        return Err(Inadmissible::NotFinite { side });
    }
    // A = 0 = B at a horizon is allowed; opposite signs, or exactly one of them zero, are not.
    if a * b < 0.0 || (a == 0.0) != (b == 0.0) {
        return Err(Inadmissible::Signature { side, a, b });
    }
    Ok(())
}

/// All five rules for one side of a static shell at radius r, from A, B and B' there.
#[inline]
pub fn static_side(
    kind: ShellKind,
    keep: Keep,
    side: Which,
    r: f64,
    a: f64,
    b: f64,
    b1: f64,
) -> Result<(), Inadmissible> {
    if !(a.is_finite() && b.is_finite() && b1.is_finite()) {
        return Err(Inadmissible::NotFinite { side });
    }
    if near_horizon(r, b, b1, TOL.horizon.on_horizon) {
        return Err(Inadmissible::OnHorizon { side, b });
    }
    signature(side, a, b, b1)?;
    let r_region = b > 0.0;
    if r_region != (kind == ShellKind::Timelike) {
        return Err(Inadmissible::WrongRegion { side, b, kind });
    }
    if keep.is_r_region() != r_region {
        return Err(Inadmissible::KeepContradicts { side, b, keep });
    }
    Ok(())
}

/// The rule for a static shell at r on both sides (minus first), from their jets.
#[inline]
pub fn static_site(kind: ShellKind, keep: [Keep; 2], r: f64, jets: [&Jet<f64>; 2]) -> Result<(), Inadmissible> {
    for ((side, keep), jet) in [Which::Minus, Which::Plus].into_iter().zip(keep).zip(jets) {
        static_side(kind, keep, side, r, jet.a[0], jet.b[0], jet.b[1])?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn jet(a: f64, b: f64, b1: f64) -> Jet<f64> {
        Jet { a: [a, 0.0, 0.0, 0.0], b: [b, b1, 0.0, 0.0] }
    }

    #[test]
    fn each_rule_gives_its_own_reason() {
        let (t, s) = (ShellKind::Timelike, ShellKind::Spacelike);
        let rr = [Keep::Inner, Keep::Outer];
        let ok = jet(0.5, 0.5, 0.1);
        assert_eq!(static_site(t, rr, 3.0, [&ok, &ok]), Ok(()));
        let nan = jet(f64::NAN, 0.5, 0.1);
        assert_eq!(static_site(t, rr, 3.0, [&ok, &nan]), Err(Inadmissible::NotFinite { side: Which::Plus }));
        let on = jet(1e-12, 1e-12, 0.3);
        assert!(matches!(static_site(t, rr, 3.0, [&on, &ok]), Err(Inadmissible::OnHorizon { side: Which::Minus, .. })));
        let flip = jet(-0.5, 0.5, 0.1);
        assert!(matches!(static_site(t, rr, 3.0, [&ok, &flip]), Err(Inadmissible::Signature { .. })));
        let zero_a = jet(0.0, 0.5, 0.1);
        assert!(matches!(static_site(t, rr, 3.0, [&zero_a, &ok]), Err(Inadmissible::Signature { .. })));
        let inside = jet(-0.5, -0.5, 0.1);
        assert!(matches!(static_site(t, rr, 3.0, [&inside, &ok]), Err(Inadmissible::WrongRegion { .. })));
        assert!(matches!(static_site(s, rr, 3.0, [&ok, &ok]), Err(Inadmissible::WrongRegion { .. })));
        assert!(matches!(
            static_site(s, rr, 3.0, [&inside, &inside]),
            Err(Inadmissible::KeepContradicts { side: Which::Minus, keep: Keep::Inner, .. })
        ));
        let th = [Keep::BlackHole, Keep::WhiteHole];
        assert_eq!(static_site(s, th, 3.0, [&inside, &inside]), Ok(()));
        assert!(matches!(static_site(t, th, 3.0, [&ok, &ok]), Err(Inadmissible::KeepContradicts { .. })));
    }

    #[test]
    fn a_moving_shell_may_sit_on_a_horizon_but_not_change_signature() {
        assert_eq!(signature(Which::Plus, 0.0, 0.0, 1.0), Ok(()));
        assert_eq!(signature(Which::Plus, -1e-3, -2e-3, 1.0), Ok(()));
        assert!(signature(Which::Plus, -1e-3, 2e-3, 1.0).is_err());
        assert!(signature(Which::Plus, 1.0, f64::INFINITY, 1.0).is_err());
    }
}
