//! The maximal radius of a bounded radial timelike orbit and its distance to the horizon below it, carried
//! to full relative precision even when it is 1e-70 horizon radii away.
//!
//! Precision method (no arbitrary precision needed): the apex r_max solves A(r_max) = E^2 (radial turning
//! point, see [`super::radial`]). When r_max - r_h is tiny compared with r_h, r_max itself is not
//! representable apart from r_h in f64, so junctura never forms the difference: it solves for
//! delta = r_max - r_h directly from the Taylor series of A about the horizon (A(r_h) = 0 taken as exact),
//!   A'(r_h) delta + A''(r_h) delta^2/2 + A'''(r_h) delta^3/6 = E^2,
//! with exact derivatives from dual numbers, and integrates the proper distance
//!   s = int_{r_h}^{r_max} dr / sqrt(B) = int_0^1 2 sqrt(delta) dx / sqrt(b1 + b2 delta x^2 + b3 delta^2 x^4)
//! (r = r_h + delta x^2, b_k = B^(k)(r_h)/k!, B(r_h) = 0). The series is used while delta < 1e-5 r_h, where its
//! truncation error (delta/r_h)^3 is below 1e-15; elsewhere the apex comes from root finding on A - E^2 and the
//! distance from quadrature with the 1/sqrt horizon end removed by substitution. E^2 is carried (not E or
//! 1 - E), so tiny energies lose nothing.

use super::quad::{integrate, integrate_sqrt_ends_by_offset, mean_over, QuadOptions};
use crate::error::{Error, Result};
use crate::metric::SideFns;
use crate::roots::{find_roots, RootOptions};
use num_dual::{Dual3, Dual64};
use serde::Serialize;

/// No second-derivative helper for the root finder (only simple roots matter here).
type NoCurvature = fn(f64) -> Option<(f64, f64)>;

/// Below this ratio (r_max - r_h)/r_h the near-horizon series is used.
pub const SERIES_MAX: f64 = 1e-5;

/// How the apex was located.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ApexMethod {
    /// Taylor series of A and B about the horizon, solved for r_max - r_h directly.
    NearHorizonSeries,
    /// Root finding on A(r) - E^2 and quadrature for the proper distance.
    RootFinding,
}

/// The maximal radius of a bounded radial orbit and its distance to the horizon below it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Apex {
    /// r_max, where A(r_max) = E^2 (in f64 it may round to the horizon radius: use `areal_distance`).
    pub radius: f64,
    /// The horizon (largest root of A below r_max), if any.
    pub horizon: Option<f64>,
    /// r_max - r_h, carried directly (not a difference of rounded radii).
    pub areal_distance: Option<f64>,
    /// Proper radial distance int_{r_h}^{r_max} dr/sqrt(B) at fixed t.
    pub proper_distance: Option<f64>,
    /// How it was computed.
    pub method: ApexMethod,
}

fn a_and_slope(fns: &SideFns, r: f64) -> (f64, f64) {
    let d: Dual64 = fns.a(Dual64::new(r, 1.0));
    (d.re, d.eps)
}

/// Polish a simple root of A(r) = target with Newton steps (exact slopes from dual numbers) while they help:
/// the bracketing search stops at a relative tolerance, and distances between nearby roots need the last bits.
fn polish(fns: &SideFns, target: f64, mut r: f64) -> (f64, f64) {
    let (mut a, mut s) = a_and_slope(fns, r);
    for _ in 0..8 {
        let next = r - (a - target) / s;
        let (an, sn) = a_and_slope(fns, next);
        if !(an.is_finite() && sn.is_finite()) || (an - target).abs() >= (a - target).abs() {
            break;
        }
        (r, a, s) = (next, an, sn);
    }
    (r, s)
}

fn roots_of_a(fns: &SideFns, lo: f64, hi: f64, opts: &RootOptions) -> Vec<(f64, f64)> {
    let f = |r: f64| Some(a_and_slope(fns, r));
    let g: Option<&NoCurvature> = None;
    find_roots(&f, g, lo, hi, opts).roots.into_iter().map(|r| polish(fns, 0.0, r.x)).collect()
}

/// Taylor coefficients [f, f', f''/2, f'''/6] at r from one third-order dual evaluation.
fn taylor(d: Dual3<f64, f64>) -> [f64; 4] {
    [d.re, d.v1, d.v2 / 2.0, d.v3 / 6.0]
}

/// The apex of a bounded radial timelike orbit with E^2 = `energy_sq` through r = `from`, searching up to
/// `hi`: the first radius above `from` where A = E^2 (module doc for the method and precision). Returns
/// `Ok(None)` for an orbit that reaches `hi` without turning (unbounded there).
pub fn max_radius(
    fns: &SideFns,
    energy_sq: f64,
    from: f64,
    hi: f64,
    roots: &RootOptions,
    quad: &QuadOptions,
) -> Result<Option<Apex>> {
    if !(energy_sq.is_finite() && energy_sq >= 0.0) {
        return Err(Error::input(format!("E^2 = {energy_sq} must be a finite non-negative number")));
    }
    let (a_from, _) = a_and_slope(fns, from);
    if a_from - energy_sq > 1e-12 * a_from.abs().max(energy_sq) {
        return Err(Error::numerical(format!(
            "a particle with E^2 = {energy_sq} cannot be at r = {from}: A(r) = {a_from} > E^2"
        ))
        .with_hint("the radial motion is real only where A(r) <= E^2"));
    }
    // The horizon that matters: the first root of A above `from` when `from` is inside it (A < 0), else the
    // largest root of A below `from` at which A increases.
    let horizon = if a_from < 0.0 {
        roots_of_a(fns, from, hi, roots).into_iter().find(|(_, s)| *s > 0.0)
    } else {
        roots_of_a(fns, 1e-6 * from, from, roots).into_iter().rev().find(|(_, s)| *s > 0.0)
    };
    if let Some((h, slope)) = horizon {
        let delta0 = energy_sq / slope;
        let near = delta0 < SERIES_MAX * h && (a_from < 0.0 || from - h <= delta0 * (1.0 + 1e-6));
        if near {
            return series_apex(fns, energy_sq, h, quad).map(Some);
        }
    }
    // Root finding on A - E^2 above `from`.
    let f = |r: f64| {
        let (a, s) = a_and_slope(fns, r);
        Some((a - energy_sq, s))
    };
    let g: Option<&NoCurvature> = None;
    let scan = find_roots(&f, g, from, hi, roots);
    let Some(turn) = scan.roots.iter().find(|r| r.slope > 0.0) else { return Ok(None) };
    let rmax = polish(fns, energy_sq, turn.x).0;
    let h = roots_of_a(fns, 1e-6 * rmax, rmax, roots).into_iter().rev().find(|(_, s)| *s > 0.0).map(|x| x.0);
    let (areal, proper) = match h {
        Some(h) if h < rmax => {
            let b_mid = fns.b(0.5 * (h + rmax));
            if b_mid <= 0.0 {
                return Err(Error::numerical(format!(
                    "B <= 0 between the horizon r = {h} and the apex r = {rmax}: A and B do not vanish together"
                ))
                .with_hint("junctura needs a common horizon of A and B (A = e^(2 Phi) B) for this distance"));
            }
            // Near the horizon end B(h + x) = x * mean(B') (no cancellation; B(h) = 0 by definition of h).
            let f = |lower: bool, x: f64| {
                let b = if lower && x < 0.05 * h {
                    x * mean_slope(fns, h, x)
                } else {
                    fns.b(if lower { h + x } else { rmax - x })
                };
                if b > 0.0 {
                    1.0 / b.sqrt()
                } else {
                    0.0
                }
            };
            (Some(rmax - h), Some(integrate_sqrt_ends_by_offset(&f, h, rmax, quad).value))
        }
        _ => (None, None),
    };
    Ok(Some(Apex {
        radius: rmax,
        horizon: h,
        areal_distance: areal,
        proper_distance: proper,
        method: ApexMethod::RootFinding,
    }))
}

/// (B(h + x) - B(h))/x as the mean of B' over [h, h + x] (exact B' from dual numbers; see [`mean_over`]).
fn mean_slope(fns: &SideFns, h: f64, x: f64) -> f64 {
    mean_over(&|r: f64| fns.b(Dual64::new(r, 1.0)).eps, h, x)
}

/// The near-horizon series solution for delta = r_max - r_h and the proper distance (module doc).
fn series_apex(fns: &SideFns, energy_sq: f64, h: f64, quad: &QuadOptions) -> Result<Apex> {
    let a = taylor(fns.a(Dual3::new(h, 1.0, 0.0, 0.0)));
    let b = taylor(fns.b(Dual3::new(h, 1.0, 0.0, 0.0)));
    if b[0].abs() > 1e-9 * b[1].abs() * h || b[1] <= 0.0 {
        return Err(Error::numerical(format!(
            "A vanishes at r = {h} but B = {} there (B' = {}): no common horizon",
            b[0], b[1]
        ))
        .with_hint("junctura needs a common horizon of A and B (A = e^(2 Phi) B) for near-horizon distances"));
    }
    let poly = |d: f64| d * (a[1] + d * (a[2] + d * a[3]));
    let dpoly = |d: f64| a[1] + d * (2.0 * a[2] + d * 3.0 * a[3]);
    let mut delta = energy_sq / a[1];
    for _ in 0..50 {
        let step = (poly(delta) - energy_sq) / dpoly(delta);
        delta -= step;
        if step.abs() <= 1e-17 * delta.abs() {
            break;
        }
    }
    if delta.is_finite() && delta < 1e-280 * h && energy_sq > 0.0 {
        return Err(Error::numerical(format!(
            "r_max - r_h = {delta:e} (E^2 = {energy_sq:e}) is below the range of f64 numbers"
        ))
        .with_hint_phrase(crate::phrase![
            "the orbit hugs the horizon closer than f64 can carry; stop the chain earlier (",
            crate::RequestField::Crossings,
            ")"
        ]));
    }
    if !(delta.is_finite() && delta >= 0.0) {
        return Err(Error::numerical(format!(
            "near-horizon series for the apex failed at r_h = {h:e} (derivatives of A out of f64 range?)"
        )));
    }
    let f = |x: f64| 2.0 * delta.sqrt() / (b[1] + b[2] * delta * x * x + b[3] * delta * delta * x.powi(4)).sqrt();
    let q = integrate(&f, 0.0, 1.0, quad);
    Ok(Apex {
        radius: h + delta,
        horizon: Some(h),
        areal_distance: Some(delta),
        proper_distance: Some(q.value),
        method: ApexMethod::NearHorizonSeries,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::expr::Expr;
    use crate::model::{ExprSide, Metric};

    /// Proper radial distance from the Schwarzschild horizon to r = 2M + delta:
    /// sqrt(r (r - 2M)) + 2M ln(sqrt(r/2M) + sqrt(r/2M - 1)), the elementary antiderivative of (1 - 2M/r)^(-1/2)
    /// (common practice; checked by differentiation), written with asinh so it is exact for tiny delta.
    fn schwarzschild_proper(m: f64, delta: f64) -> f64 {
        (delta * (2.0 * m + delta)).sqrt() + 2.0 * m * (delta / (2.0 * m)).sqrt().asinh()
    }

    #[test]
    fn schwarzschild_apex_is_2m_over_1_minus_e2_in_both_regimes() {
        // R_max = 2M/(1 - E^2) (textbook; Hartle 2003 ch. 9), so R_max - 2M = 2M E^2/(1 - E^2).
        let e = Expr::parse("1 - 2*m/r", "r", &["m".to_string()]).unwrap();
        for m in [1.0, 3.0] {
            let p = [m];
            let side = Metric::Expr(ExprSide::new(e.clone(), None));
            let fns = SideFns::new(&side, &p);
            for e2 in [0.64, 1e-3, 1e-7, 1e-40, 1e-120] {
                let ap =
                    max_radius(&fns, e2, m, 1e6, &RootOptions::default(), &QuadOptions::default()).unwrap().unwrap();
                let delta = 2.0 * m * e2 / (1.0 - e2);
                let d = ap.areal_distance.unwrap();
                assert!((d - delta).abs() < 1e-11 * delta, "E^2={e2}: {d} vs {delta} ({:?})", ap.method);
                let s = schwarzschild_proper(m, delta);
                let ps = ap.proper_distance.unwrap();
                assert!((ps - s).abs() < 1e-10 * s, "E^2={e2}: {ps} vs {s}");
                let expect = if e2 < 1e-5 { ApexMethod::NearHorizonSeries } else { ApexMethod::RootFinding };
                assert_eq!(ap.method, expect, "E^2={e2}");
            }
        }
    }

    #[test]
    fn reissner_nordstrom_apex_from_inside_the_t_region() {
        // A = (r - r+)(r - r-)/r^2 with r+- = m +- sqrt(m^2 - q^2) (textbook), so A = E^2 gives
        // delta = E^2 (r+ + delta)^2 / (r+ - r- + delta), solved here by fixed-point iteration.
        let names = vec!["m".to_string(), "q".to_string()];
        let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &names).unwrap();
        let p = [1.0, 0.8];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let (rp, rm) = (1.6, 0.4);
        for e2 in [0.5, 1e-30] {
            let mut delta = 0.0;
            for _ in 0..200 {
                delta = e2 * (rp + delta) * (rp + delta) / (rp - rm + delta);
            }
            let ap = max_radius(&fns, e2, 1.0, 1e3, &RootOptions::default(), &QuadOptions::default()).unwrap().unwrap();
            assert!((ap.horizon.unwrap() - rp).abs() < 1e-13);
            assert!((ap.areal_distance.unwrap() - delta).abs() < 1e-11 * delta, "{ap:?} vs {delta}");
        }
    }

    #[test]
    fn unbounded_orbit_has_no_apex_and_forbidden_start_is_refused() {
        let e = Expr::parse("1 - 2*m/r", "r", &["m".to_string()]).unwrap();
        let p = [1.0];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let none = max_radius(&fns, 1.2, 1.0, 1e4, &RootOptions::default(), &QuadOptions::default()).unwrap();
        assert!(none.is_none());
        let err = max_radius(&fns, 0.25, 10.0, 1e4, &RootOptions::default(), &QuadOptions::default()).unwrap_err();
        assert!(err.message.contains("cannot be at r = 10"), "{err}");
    }
}
