//! One side's geometry: A(r), B(r) and their derivatives, horizons (roots of B), R- and T-regions, and
//! circular photon orbits (extrema of A/r^2).

use crate::expr::{Expr, Scalar};
use crate::model::{Metric, MetricSide, SideModel};
use crate::roots::{find_roots, Root, RootKind, RootOptions};
use crate::scenario::Scenario;
use num_dual::{Dual2, Dual3};
use serde::Serialize;

/// One side bound to fixed real parameter values: A and B over any number type, evaluated only through the
/// side's [`MetricSide`] impl (so horizons, regions and photon orbits work for every kind of side).
#[derive(Debug)]
pub struct SideFns<'a, M: MetricSide = Metric> {
    /// The side's metric functions.
    pub side: &'a M,
    /// Parameter values.
    pub params: &'a [f64],
    /// True for the view whose "B" is the side's A ([`SideFns::a_as_b`]).
    a_as_b: bool,
}

impl<M: MetricSide> Clone for SideFns<'_, M> {
    fn clone(&self) -> Self {
        *self
    }
}

impl<M: MetricSide> Copy for SideFns<'_, M> {}

impl<'a> SideFns<'a> {
    /// Bind a model side to parameter values.
    pub fn of(side: &'a SideModel, params: &'a [f64]) -> Self {
        SideFns::new(&side.metric, params)
    }
}

impl<'a, M: MetricSide> SideFns<'a, M> {
    /// Bind any metric side to parameter values.
    pub fn new(side: &'a M, params: &'a [f64]) -> Self {
        SideFns { side, params, a_as_b: false }
    }

    /// The same side seen with A in the place of B: its "horizons" are the zeros of A (statics cuts a range at
    /// the zeros of A where B is given separately).
    pub fn a_as_b(&self) -> Self {
        SideFns { a_as_b: true, ..*self }
    }

    /// True when B is the same function as A (on this view).
    pub fn b_is_a(&self) -> bool {
        self.a_as_b || self.side.b_is_a()
    }

    /// B as an expression, where the side has one (the rational shortcut for horizons).
    fn b_expression(&self) -> Option<&'a Expr> {
        self.side.expressions().map(|(a, b)| if self.a_as_b { a } else { b })
    }

    /// A(r).
    #[inline]
    pub fn a<T: Scalar>(&self, r: T) -> T {
        let p = self.params;
        self.side.a(r, move |k| T::from(p[k]))
    }

    /// B(r).
    #[inline]
    pub fn b<T: Scalar>(&self, r: T) -> T {
        if self.a_as_b {
            return self.a(r);
        }
        let p = self.params;
        self.side.b(r, move |k| T::from(p[k]))
    }

    /// dA/dr evaluated at a dual-number radius: A' as a Dual2 from one third-order evaluation.
    #[inline]
    pub fn a_prime_dual2(&self, r0: f64) -> (Dual2<f64, f64>, Dual2<f64, f64>) {
        let d: Dual3<f64, f64> = self.a(Dual3::new(r0, 1.0, 0.0, 0.0));
        (Dual2::new(d.re, d.v1, d.v2), Dual2::new(d.v1, d.v2, d.v3))
    }

    /// B and B' at a radius, each as a Dual2 in the radius (from one third-order evaluation).
    #[inline]
    pub fn b_prime_dual2(&self, r0: f64) -> (Dual2<f64, f64>, Dual2<f64, f64>) {
        let d: Dual3<f64, f64> = self.b(Dual3::new(r0, 1.0, 0.0, 0.0));
        (Dual2::new(d.re, d.v1, d.v2), Dual2::new(d.v1, d.v2, d.v3))
    }
}

/// An R-region (B > 0: r is a space coordinate) or a T-region (B < 0: r is a time coordinate).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum RegionKind {
    /// B > 0.
    R,
    /// B < 0.
    T,
}

/// An interval of r between horizons with one region kind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Region {
    /// Lower end.
    pub from: f64,
    /// Upper end.
    pub to: f64,
    /// R or T.
    pub kind: RegionKind,
}

/// A horizon: a root of B.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Horizon {
    /// Areal radius.
    pub radius: f64,
    /// True for a degenerate (double) root, e.g. extremal Reissner-Nordstrom.
    pub degenerate: bool,
    /// dB/dr at the horizon (for a Killing horizon with A = B this is twice the surface gravity).
    pub b_slope: f64,
}

/// Everything `check` reports for one side.
#[derive(Debug, Clone, Serialize)]
pub struct SideSurvey {
    /// Horizons in the range.
    pub horizons: Vec<Horizon>,
    /// R- and T-regions covering the range.
    pub regions: Vec<Region>,
    /// Radii of circular photon orbits (extrema of A/r^2) inside R-regions.
    pub photon_orbits: Vec<f64>,
    /// Sign changes of B rejected as poles (B passes through infinity there).
    pub poles: Vec<f64>,
}

/// Horizons of a side in [lo, hi]: every root of B, simple or degenerate, and the poles of B (sign changes
/// through infinity). Roots come from the sampled search of `roots::find_roots` (sign changes, and minima of |B|
/// where B and B' vanish together: double roots); when B is rational in r, the real roots of its numerator from
/// the companion matrix (`rational`, for a side with expressions) replace the sampled ones near them, giving
/// degenerate horizons to rounding.
pub fn horizons<M: MetricSide>(fns: &SideFns<M>, lo: f64, hi: f64, opts: &RootOptions) -> (Vec<Horizon>, Vec<f64>) {
    let (mut hs, poles) = sampled_horizons(fns, lo, hi, opts);
    if let Some((num, den)) = fns.b_expression().and_then(|b| crate::rational::rational(b, fns.params)) {
        let dscale = den.iter().fold(0.0f64, |m, c| m.max(c.abs()));
        let exact: Vec<Horizon> = crate::rational::real_roots(&num, lo, hi)
            .into_iter()
            .filter(|&(x, _)| {
                let d = den.iter().rev().fold(0.0, |acc, c| acc * x + c);
                d.abs() > 1e-12 * dscale * x.abs().max(1.0).powi(den.len() as i32 - 1)
            })
            .map(|(x, k)| {
                let d: Dual2<f64, f64> = fns.b(Dual2::new(x, 1.0, 0.0));
                Horizon { radius: x, degenerate: k >= 2, b_slope: if k >= 2 { 0.0 } else { d.v1 } }
            })
            .collect();
        let tol = crate::tolerances::TOL.horizon.root_cluster;
        hs.retain(|h| !exact.iter().any(|e| (e.radius - h.radius).abs() <= tol * e.radius.abs().max(1e-300)));
        hs.extend(exact);
        hs.sort_by(|a, b| a.radius.total_cmp(&b.radius));
    }
    (hs, poles)
}

fn sampled_horizons<M: MetricSide>(fns: &SideFns<M>, lo: f64, hi: f64, opts: &RootOptions) -> (Vec<Horizon>, Vec<f64>) {
    let f = |r: f64| {
        let d: Dual2<f64, f64> = fns.b(Dual2::new(r, 1.0, 0.0));
        Some((d.re, d.v1))
    };
    let g = |r: f64| {
        let d: Dual2<f64, f64> = fns.b(Dual2::new(r, 1.0, 0.0));
        Some((d.v1, d.v2))
    };
    let scan = find_roots(&f, Some(&g), lo, hi, opts);
    let hs = scan
        .roots
        .iter()
        .map(|r: &Root| Horizon { radius: r.x, degenerate: r.kind == RootKind::Double, b_slope: r.slope })
        .collect();
    (hs, scan.poles.iter().map(|p| p.x).collect())
}

/// R- and T-regions on [lo, hi] given the horizons there.
///
/// Every horizon cuts the range, simple or degenerate, and so does every pole of B; the kind of each piece is
/// the sign of B at its midpoint (geometric midpoint when the piece spans more than two decades). Pieces are
/// not merged across a horizon: a degenerate (double) horizon such as r = M of extremal Reissner-Nordstrom,
/// B = (1 - M/r)^2, separates two R-regions, which are reported as two regions of the same kind with the
/// double horizon between them (B >= 0 on both sides; common practice, e.g. Carter 1966 for the extremal
/// case, from memory). Only a pole between two pieces of the same kind is merged over.
pub fn regions<M: MetricSide>(fns: &SideFns<M>, lo: f64, hi: f64, horizons: &[Horizon], poles: &[f64]) -> Vec<Region> {
    let mut cuts: Vec<(f64, bool)> = horizons.iter().map(|h| (h.radius, true)).collect();
    cuts.extend(poles.iter().map(|&p| (p, false)));
    cuts.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut edges = vec![(lo, false)];
    edges.extend(cuts.into_iter().filter(|c| c.0 > lo && c.0 < hi));
    edges.push((hi, false));
    let mut out: Vec<Region> = Vec::new();
    for w in edges.windows(2) {
        let (x0, x1) = (w[0].0, w[1].0);
        let mid = if x0 > 0.0 && x1 / x0 > 100.0 { (x0 * x1).sqrt() } else { 0.5 * (x0 + x1) };
        let kind = region_kind_at(fns, mid, x0, x1);
        let horizon_before = w[0].1;
        match out.last_mut() {
            Some(last) if last.kind == kind && !horizon_before => last.to = x1,
            _ => out.push(Region { from: x0, to: x1, kind }),
        }
    }
    out
}

/// The kind of region at `mid`, a point of (x0, x1) between horizons: the sign of B there, and if B happens to
/// vanish to rounding at that point (a horizon missed by the sampler), the sign at the quarter points.
fn region_kind_at<M: MetricSide>(fns: &SideFns<M>, mid: f64, x0: f64, x1: f64) -> RegionKind {
    let mut b: f64 = fns.b(mid);
    if b == 0.0 || !b.is_finite() {
        let q = [0.5 * (x0 + mid), 0.5 * (mid + x1)];
        b = q.iter().map(|&x| fns.b(x)).find(|v: &f64| *v != 0.0 && v.is_finite()).unwrap_or(b);
    }
    if b > 0.0 {
        RegionKind::R
    } else {
        RegionKind::T
    }
}

/// The region kind of a side at one radius (sign of B; a horizon counts as the region of neither kind and
/// returns `None`, as does a non-finite B).
pub fn region_at<M: MetricSide>(fns: &SideFns<M>, r: f64) -> Option<RegionKind> {
    let b: f64 = fns.b(r);
    if !b.is_finite() || b == 0.0 {
        None
    } else if b > 0.0 {
        Some(RegionKind::R)
    } else {
        Some(RegionKind::T)
    }
}

/// Circular photon orbits: extrema of A/r^2, i.e. roots of r A' - 2 A, kept where B > 0 and A > 0.
/// (For any static spherically symmetric metric the radial null geodesic potential is L^2 A/r^2; common
/// practice, e.g. Hartle 2003 sec. 9.3 for Schwarzschild's r = 3M.)
pub fn photon_orbits<M: MetricSide>(fns: &SideFns<M>, lo: f64, hi: f64, opts: &RootOptions) -> Vec<f64> {
    let h = |r: f64| {
        let d: Dual3<f64, f64> = fns.a(Dual3::new(r, 1.0, 0.0, 0.0));
        // g = r A' - 2A, g' = r A'' - A', g'' = r A''' .
        (d.v1 * r - 2.0 * d.re, d.v2 * r - d.v1, d.v3 * r)
    };
    let f = |r: f64| {
        let (g, gp, _) = h(r);
        Some((g, gp))
    };
    let fp = |r: f64| {
        let (_, gp, gpp) = h(r);
        Some((gp, gpp))
    };
    find_roots(&f, Some(&fp), lo, hi, opts)
        .roots
        .into_iter()
        .map(|r| r.x)
        .filter(|&r| fns.b(r) > 0.0 && fns.a(r) > 0.0)
        .collect()
}

/// Survey one side over [lo, hi].
pub fn survey<M: MetricSide>(fns: &SideFns<M>, lo: f64, hi: f64, opts: &RootOptions) -> SideSurvey {
    let (hs, poles) = horizons(fns, lo, hi, opts);
    let regions = regions(fns, lo, hi, &hs, &poles);
    let photon_orbits = photon_orbits(fns, lo, hi, opts);
    SideSurvey { horizons: hs, regions, photon_orbits, poles }
}

/// A length scale for default ranges: the largest |parameter| (at least 1), a proxy for M in geometric units.
pub fn length_scale(scenario: &Scenario) -> f64 {
    scenario.params.values().iter().fold(1.0f64, |m, v| m.max(v.abs()))
}

/// The default radius range for surveys: [1e-3 l, 1e3 L] with L from [`length_scale`] and l = 1, or the smallest
/// non-zero |parameter| when that is below 1e-3 (so a tiny mass, e.g. m = 1e-20, still has its static radii in
/// range; the root search samples radii logarithmically).
pub fn default_range(scenario: &Scenario) -> (f64, f64) {
    let l = length_scale(scenario);
    let small = scenario.params.values().iter().map(|v| v.abs()).filter(|&v| v > 0.0).fold(1.0f64, f64::min);
    let low = if small < 1e-3 { small } else { 1.0 };
    (1e-3 * low, 1e3 * l)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::ExprSide;

    #[test]
    fn reissner_nordstrom_horizons_and_photon_orbit() {
        // Textbook: r_pm = m +- sqrt(m^2 - q^2); photon sphere (3m + sqrt(9m^2 - 8q^2))/2
        // (e.g. Chandrasekhar, The Mathematical Theory of Black Holes, 1983, sec. 40; from memory).
        let names = vec!["m".to_string(), "q".to_string()];
        let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &names).unwrap();
        let p = [1.0, 0.8];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let s = survey(&fns, 0.01, 100.0, &RootOptions::default());
        assert_eq!(s.horizons.len(), 2);
        assert!((s.horizons[0].radius - 0.4).abs() < 1e-13);
        assert!((s.horizons[1].radius - 1.6).abs() < 1e-13);
        assert_eq!(s.photon_orbits.len(), 1);
        let ph = (3.0 + (9.0f64 - 8.0 * 0.64).sqrt()) / 2.0;
        assert!((s.photon_orbits[0] - ph).abs() < 1e-12);
        let kinds: Vec<RegionKind> = s.regions.iter().map(|r| r.kind).collect();
        assert_eq!(kinds, vec![RegionKind::R, RegionKind::T, RegionKind::R]);
    }

    #[test]
    fn extremal_horizon_is_degenerate() {
        let names = vec!["m".to_string(), "q".to_string()];
        let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &names).unwrap();
        let p = [1.0, 1.0];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let (hs, _) = horizons(&fns, 0.01, 100.0, &RootOptions::default());
        assert_eq!(hs.len(), 1);
        assert!(hs[0].degenerate);
        // Exact to rounding: the numerator r^2 - 2r + 1 has the double root 1 (companion matrix, `rational`).
        assert!((hs[0].radius - 1.0).abs() < 1e-14, "{}", hs[0].radius);
    }

    /// Extremal Reissner-Nordstrom, B = (1 - M/r)^2 >= 0: an R-region on both sides of the double horizon r = M
    /// (B > 0 for r != M; common practice). Regression: the geometric midpoint of the default range landed
    /// exactly on r = M and the whole range was called a T-region.
    #[test]
    fn extremal_exterior_is_an_r_region_on_both_sides_of_the_double_horizon() {
        let names = vec!["m".to_string()];
        let e = Expr::parse("(1 - m/r)^2", "r", &names).unwrap();
        let p = [1.3];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let s = survey(&fns, 1.3e-3, 1.3e3, &RootOptions::default());
        assert_eq!(s.horizons.len(), 1, "{:?}", s.horizons);
        assert!(s.horizons[0].degenerate);
        assert!((s.horizons[0].radius - 1.3).abs() < 1e-7);
        let kinds: Vec<RegionKind> = s.regions.iter().map(|r| r.kind).collect();
        assert_eq!(kinds, vec![RegionKind::R, RegionKind::R]);
        assert!((s.regions[0].to - s.horizons[0].radius).abs() < 1e-12);
    }

    /// A nearly extremal pair of horizons closer together than the sample spacing is still found as two simple
    /// roots: Reissner-Nordstrom with q = 0.99999 m has r_pm = m (1 +- sqrt(1 - 0.99999^2)) (textbook).
    #[test]
    fn nearly_extremal_pair_between_samples_is_split() {
        let names = vec!["m".to_string(), "q".to_string()];
        let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &names).unwrap();
        let p = [1.0, 0.99999];
        let side = Metric::Expr(ExprSide::new(e.clone(), None));
        let fns = SideFns::new(&side, &p);
        let s = survey(&fns, 1e-3, 1e3, &RootOptions::default());
        let d = (1.0f64 - 0.99999f64 * 0.99999).sqrt();
        assert_eq!(s.horizons.len(), 2, "{:?}", s.horizons);
        assert!((s.horizons[0].radius - (1.0 - d)).abs() < 1e-10);
        assert!((s.horizons[1].radius - (1.0 + d)).abs() < 1e-10);
        let kinds: Vec<RegionKind> = s.regions.iter().map(|r| r.kind).collect();
        assert_eq!(kinds, vec![RegionKind::R, RegionKind::T, RegionKind::R]);
    }

    /// Reissner-Nordstrom written as Rust arithmetic, not as an expression: A = B = 1 - 2m/r + q^2/r^2 with
    /// m = parameter 0, q = parameter 1. It has no expressions, so the horizon search cannot take the rational
    /// shortcut and must evaluate the side through `MetricSide` alone.
    struct ArithmeticReissnerNordstrom;

    impl MetricSide for ArithmeticReissnerNordstrom {
        fn a<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
            let (m, q) = (param(0), param(1));
            T::one() - m * 2.0 / r + q * q / (r * r)
        }
        fn b<T: Scalar, P: Fn(usize) -> T + Copy>(&self, r: T, param: P) -> T {
            self.a(r, param)
        }
        fn b_is_a(&self) -> bool {
            true
        }
        fn expressions(&self) -> Option<(&Expr, &Expr)> {
            None
        }
    }

    /// Horizons, regions and photon orbits of a side that is only a `MetricSide` impl come out of the same
    /// functions the expression sides use: r_pm = m +- sqrt(m^2 - q^2) (common practice; e.g. Chandrasekhar 1983,
    /// sec. 40, from memory), the photon sphere (3m + sqrt(9m^2 - 8q^2))/2 (same source), R, T, R regions.
    #[test]
    fn a_side_written_as_rust_arithmetic_has_the_reissner_nordstrom_horizons() {
        let side = ArithmeticReissnerNordstrom;
        for (m, q) in [(1.0, 0.8), (2.5, 1.0), (1.0, 0.3), (0.7, 0.69)] {
            let p = [m, q];
            let fns = SideFns::new(&side, &p);
            assert!(fns.b_is_a());
            let s = survey(&fns, 1e-3, 1e3, &RootOptions::default());
            let d: f64 = (m * m - q * q).sqrt();
            assert_eq!(s.horizons.len(), 2, "m={m} q={q}: {:?}", s.horizons);
            assert!((s.horizons[0].radius - (m - d)).abs() < 1e-12 * m, "m={m} q={q}: {:?}", s.horizons);
            assert!((s.horizons[1].radius - (m + d)).abs() < 1e-12 * m, "m={m} q={q}: {:?}", s.horizons);
            assert!(s.horizons.iter().all(|h| !h.degenerate));
            // B'(r_+) = (r_+ - r_-) / r_+^2 from B = (r - r_+)(r - r_-)/r^2 (common practice).
            let slope = 2.0 * d / ((m + d) * (m + d));
            assert!((s.horizons[1].b_slope - slope).abs() < 1e-10 * slope.abs(), "{:?}", s.horizons[1]);
            let kinds: Vec<RegionKind> = s.regions.iter().map(|r| r.kind).collect();
            assert_eq!(kinds, vec![RegionKind::R, RegionKind::T, RegionKind::R]);
            let ph = (3.0 * m + (9.0 * m * m - 8.0 * q * q).sqrt()) / 2.0;
            assert_eq!(s.photon_orbits.len(), 1);
            assert!((s.photon_orbits[0] - ph).abs() < 1e-12 * ph);
        }
        // Extremal, q = m: one double horizon at r = m, found by the sampled search alone (no rational shortcut
        // without expressions, so to the sampler's accuracy).
        let p = [1.0, 1.0];
        let (hs, _) = horizons(&SideFns::new(&side, &p), 1e-3, 1e3, &RootOptions::default());
        assert_eq!(hs.len(), 1, "{hs:?}");
        assert!(hs[0].degenerate);
        assert!((hs[0].radius - 1.0).abs() < 1e-7, "{hs:?}");
    }

    /// The view with A in the place of B finds the zeros of A, not of B: A = 1 - 2m/r, B = 1 has its only zero
    /// of A at r = 2m and no horizon (common practice).
    #[test]
    fn a_as_b_view_finds_the_zeros_of_a() {
        let names = vec!["m".to_string()];
        let a = Expr::parse("1 - 2*m/r", "r", &names).unwrap();
        let b = Expr::parse("1", "r", &names).unwrap();
        let side = Metric::Expr(ExprSide::new(a, Some(b)));
        let p = [1.5];
        let fns = SideFns::new(&side, &p);
        assert!(!fns.b_is_a());
        assert!(horizons(&fns, 1e-3, 1e3, &RootOptions::default()).0.is_empty());
        let view = fns.a_as_b();
        assert!(view.b_is_a());
        let (zeros, _) = horizons(&view, 1e-3, 1e3, &RootOptions::default());
        assert_eq!(zeros.len(), 1, "{zeros:?}");
        assert!((zeros[0].radius - 3.0).abs() < 1e-14, "{zeros:?}");
    }
}
