//! Radial geodesics on one side: turning points, proper and coordinate time between radii.
//!
//! For ds^2 = -A dt^2 + dr^2/B + r^2 dOmega^2 and radial motion the Killing energy E = -u_t is conserved
//! (per unit mass for a timelike particle; for a null ray u is the wave vector normalised by u_t = -E).
//! With u^t = dt/dtau = E/A and the normalisation u.u = -1 (timelike) or 0 (null):
//!   (dr/dtau)^2 = (B/A) (E^2 - A)   (timelike),     (dr/dlambda)^2 = (B/A) E^2   (null)
//! (common practice; for A = B it is the radial case L = 0 of the Schwarzschild effective-potential equation,
//! Hartle 2003 ch. 9 - equation numbers from memory). Turning points of a timelike particle are the radii where A(r) = E^2 (and B != 0).

use super::quad::{integrate_sqrt_ends_by_offset, mean_over, Quad, QuadOptions};
use crate::error::{Error, Result};
use crate::metric::SideFns;
use crate::roots::{find_roots, RootOptions};
use serde::Serialize;

/// No second-derivative helper for the root finder (only simple roots matter here).
type NoCurvature = fn(f64) -> Option<(f64, f64)>;

/// Timelike (massive) or null (light) test particle.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Particle {
    /// u.u = -1; E is the Killing energy per unit mass.
    Timelike,
    /// k.k = 0; E = -k_t sets the normalisation of the affine parameter.
    Null,
}

/// A radial geodesic of Killing energy E on one side.
#[derive(Debug, Clone, Copy)]
pub struct Radial<'a> {
    /// The side's metric functions.
    pub fns: SideFns<'a>,
    /// Killing energy E = -u_t.
    pub energy: f64,
    /// Timelike or null.
    pub particle: Particle,
    same_ab: bool,
}

impl<'a> Radial<'a> {
    /// A radial geodesic with energy `energy` on the side `fns`.
    pub fn new(fns: SideFns<'a>, energy: f64, particle: Particle) -> Self {
        let same_ab = fns.b_is_a();
        Radial { fns, energy, particle, same_ab }
    }

    /// B/A at r (exactly 1 when the side has A = B, which avoids 0/0 on a horizon).
    fn b_over_a(&self, r: f64) -> f64 {
        if self.same_ab {
            1.0
        } else {
            self.fns.b(r) / self.fns.a(r)
        }
    }

    /// (dr/dtau)^2 = (B/A)(E^2 - A) for a timelike particle, (dr/dlambda)^2 = (B/A) E^2 for a null one
    /// (module doc; sign convention u_t = -E).
    pub fn radial_speed_sq(&self, r: f64) -> f64 {
        let e2 = self.energy * self.energy;
        match self.particle {
            Particle::Timelike => self.b_over_a(r) * (e2 - self.fns.a(r)),
            Particle::Null => self.b_over_a(r) * e2,
        }
    }

    /// dt/dtau = E/A (from u_t = -E and g_tt = -A).
    pub fn dt_dtau(&self, r: f64) -> f64 {
        self.energy / self.fns.a(r)
    }

    /// Turning points on [lo, hi]: the radii where A(r) = E^2 (timelike only; a radial null ray has none).
    pub fn turning_points(&self, lo: f64, hi: f64, opts: &RootOptions) -> Vec<f64> {
        if self.particle == Particle::Null {
            return Vec::new();
        }
        let e2 = self.energy * self.energy;
        let f = |r: f64| {
            let d: num_dual::Dual64 = self.fns.a(num_dual::Dual64::new(r, 1.0));
            Some((d.re - e2, d.eps))
        };
        let g: Option<&NoCurvature> = None;
        // Where A is constant and equal to E^2 (e.g. E = 1 in flat space) every radius is a root with zero slope:
        // the particle rests there and has no turning point.
        find_roots(&f, g, lo, hi, opts).roots.into_iter().filter(|r| r.slope != 0.0).map(|r| r.x).collect()
    }

    /// Refuse an interval on which the motion is not real (a turning point strictly inside it).
    fn check_interval(&self, r1: f64, r2: f64, opts: &RootOptions) -> Result<()> {
        let (lo, hi) = if r1 < r2 { (r1, r2) } else { (r2, r1) };
        let slack = 1e-9 * hi.abs().max(1e-300);
        let scan_lo = if lo > 0.0 { lo } else { 1e-9 * hi };
        for t in self.turning_points(scan_lo, hi, opts) {
            if t > lo + slack && t < hi - slack {
                return Err(Error::numerical(format!(
                    "the radial geodesic with E = {} turns at r = {t} between r = {r1} and r = {r2}",
                    self.energy
                ))
                .with_hint("integrate up to the turning point (the maximal radius) instead"));
            }
        }
        let mid = 0.5 * (lo + hi);
        if self.radial_speed_sq(mid) < 0.0 {
            return Err(Error::numerical(format!(
                "a particle with E = {} cannot be between r = {r1} and r = {r2}: (dr/dtau)^2 < 0 there (E^2 < A)",
                self.energy
            ))
            .with_hint("raise the energy or choose radii where A(r) <= E^2"));
        }
        Ok(())
    }

    /// E^2 - A (timelike) or E^2 (null) at distance x from the end `end` of an interval, moving into it
    /// (`inward_sign` = +1 from a lower end, -1 from an upper end). At an end that is a turning point
    /// (E^2 = A there) the difference is formed as g(end) - s x mean(A') without cancellation.
    fn gap_from_end(&self, end: f64, inward_sign: f64, x: f64) -> f64 {
        let e2 = self.energy * self.energy;
        if self.particle == Particle::Null {
            return e2;
        }
        let a_end: f64 = self.fns.a(end);
        let g_end = e2 - a_end;
        let turning = g_end.abs() <= 1e-8 * e2.max(a_end.abs()) && x < 0.05 * end.abs();
        if turning {
            let slope = |r: f64| self.fns.a(num_dual::Dual64::new(r, 1.0)).eps;
            g_end - inward_sign * x * mean_over(&slope, end, inward_sign * x)
        } else {
            e2 - self.fns.a(end + inward_sign * x)
        }
    }

    /// |dr/dtau| at distance x from an end of [lo, hi] (see `gap_from_end`).
    fn speed_from_end(&self, lo: f64, hi: f64, lower: bool, x: f64) -> (f64, f64) {
        let (end, s) = if lower { (lo, 1.0) } else { (hi, -1.0) };
        let r = end + s * x;
        let v = self.b_over_a(r) * self.gap_from_end(end, s, x);
        (r, if v > 0.0 { v.sqrt() } else { 0.0 })
    }

    /// Proper time (timelike) or affine parameter (null, normalised by u_t = -E) between r1 and r2:
    /// int dr / |dr/dtau| with the module's formula for (dr/dtau)^2, by adaptive Gauss-Kronrod quadrature; the
    /// 1/sqrt singularity at a turning point end is removed by a substitution
    /// ([`integrate_sqrt_ends`](super::quad::integrate_sqrt_ends)).
    pub fn proper_time(&self, r1: f64, r2: f64, roots: &RootOptions, quad: &QuadOptions) -> Result<Quad> {
        self.check_interval(r1, r2, roots)?;
        let (lo, hi) = if r1 < r2 { (r1, r2) } else { (r2, r1) };
        let f = |lower: bool, x: f64| {
            let (_, v) = self.speed_from_end(lo, hi, lower, x);
            if v > 0.0 {
                1.0 / v
            } else {
                0.0
            }
        };
        finish(integrate_sqrt_ends_by_offset(&f, r1, r2, quad).abs_value(), "proper time", r1, r2)
    }

    /// Coordinate time between r1 and r2: int (dt/dtau) / |dr/dtau| dr = int (E/A) / |dr/dtau| dr (timelike),
    /// int dr / sqrt(A B) (null); it diverges at a horizon (A = 0) between the radii, which is refused.
    pub fn coordinate_time(&self, r1: f64, r2: f64, roots: &RootOptions, quad: &QuadOptions) -> Result<Quad> {
        self.check_interval(r1, r2, roots)?;
        let (lo, hi) = if r1 < r2 { (r1, r2) } else { (r2, r1) };
        let a_root = |r: f64| {
            let d: num_dual::Dual64 = self.fns.a(num_dual::Dual64::new(r, 1.0));
            Some((d.re, d.eps))
        };
        let g: Option<&NoCurvature> = None;
        if let Some(h) = find_roots(&a_root, g, lo.max(1e-12 * hi), hi, roots).roots.first() {
            return Err(Error::numerical(format!(
                "the coordinate time from r = {r1} to r = {r2} diverges: A = 0 (a horizon) at r = {}",
                h.x
            ))
            .with_hint("t is singular on a horizon; use the proper time there"));
        }
        let f = |lower: bool, x: f64| {
            let (r, v) = self.speed_from_end(lo, hi, lower, x);
            if v > 0.0 {
                (self.energy / self.fns.a(r)).abs() / v
            } else {
                0.0
            }
        };
        finish(integrate_sqrt_ends_by_offset(&f, r1, r2, quad).abs_value(), "coordinate time", r1, r2)
    }
}

trait AbsValue {
    fn abs_value(self) -> Self;
}

impl AbsValue for Quad {
    fn abs_value(mut self) -> Self {
        self.value = self.value.abs();
        self
    }
}

fn finish(q: Quad, what: &str, r1: f64, r2: f64) -> Result<Quad> {
    if !q.value.is_finite() {
        return Err(Error::numerical(format!("the {what} from r = {r1} to r = {r2} is not finite"))
            .with_hint("the integrand is singular inside the interval (a horizon or r = 0?)"));
    }
    Ok(q)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::expr::Expr;
    use crate::model::{ExprSide, Metric};

    fn schwarzschild() -> Expr {
        Expr::parse("1 - 2*m/r", "r", &["m".to_string()]).unwrap()
    }

    #[test]
    fn free_fall_from_rest_takes_pi_m_times_rmax_over_2m_to_the_three_halves() {
        // Misner, Thorne & Wheeler 1973, sec. 31.4 (equation number 31.10 from memory; cycloid r = (R/2)(1 + cos eta), tau = (R/2)
        // sqrt(R/2M)(eta + sin eta)): from rest at R_max to r = 0 takes tau = pi M (R_max/2M)^(3/2).
        let e = schwarzschild();
        for (m, energy) in [(1.0, 0.8), (2.5, 0.3), (1.0, 0.99)] {
            let p = [m];
            let side = Metric::Expr(ExprSide::new(e.clone(), None));
            let fns = SideFns::new(&side, &p);
            let rad = Radial::new(fns, energy, Particle::Timelike);
            let rmax = 2.0 * m / (1.0 - energy * energy);
            let tp = rad.turning_points(0.01, 1e3, &RootOptions::default());
            assert_eq!(tp.len(), 1);
            assert!((tp[0] - rmax).abs() < 1e-12 * rmax, "{tp:?} vs {rmax}");
            let q = rad.proper_time(rmax, 0.0, &RootOptions::default(), &QuadOptions::default()).unwrap();
            let exact = std::f64::consts::PI * m * (rmax / (2.0 * m)).powf(1.5);
            assert!(q.converged, "{q:?}");
            assert!((q.value - exact).abs() < 1e-9 * exact, "{} vs {exact}", q.value);
        }
    }

    #[test]
    fn radial_light_coordinate_time_follows_the_tortoise_coordinate() {
        // r* = r + 2M ln(r/2M - 1) for Schwarzschild (common practice; e.g. Hartle 2003 ch. 12, from memory).
        let e = schwarzschild();
        let p = [1.0];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let rad = Radial::new(fns, 1.0, Particle::Null);
        let q = rad.coordinate_time(3.0, 10.0, &RootOptions::default(), &QuadOptions::default()).unwrap();
        let rs = |r: f64| r + 2.0 * (r / 2.0 - 1.0).ln();
        assert!((q.value - (rs(10.0) - rs(3.0))).abs() < 1e-11, "{q:?}");
        let e = rad.coordinate_time(1.0, 3.0, &RootOptions::default(), &QuadOptions::default()).unwrap_err();
        assert!(e.message.contains("horizon"), "{e}");
    }

    #[test]
    fn interval_past_a_turning_point_is_refused() {
        let e = schwarzschild();
        let p = [1.0];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let rad = Radial::new(fns, 0.8, Particle::Timelike);
        let err = rad.proper_time(3.0, 8.0, &RootOptions::default(), &QuadOptions::default()).unwrap_err();
        assert!(err.message.contains("turns at r = 5.55"), "{err}");
    }
}
