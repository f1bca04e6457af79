//! Adaptive Gauss-Kronrod quadrature (7-point Gauss embedded in the 15-point Kronrod rule) with global error
//! control: the subinterval with the largest error estimate is bisected until the summed estimate meets the
//! tolerance (Piessens et al., QUADPACK, 1983, routine QAG; nodes and weights from the same source).
//!
//! Integrable inverse-square-root endpoint singularities, as at a turning point of a radial geodesic
//! (dr/dtau ~ sqrt(r_t - r)), are removed by the substitution r = a + u^2 (lower end) or r = b - u^2 (upper end)
//! in [`integrate_sqrt_ends`]: the new integrand 2 u f(r(u)) is finite there.

use serde::Serialize;

/// Tolerances for quadrature, in one place.
#[derive(Debug, Clone, Copy)]
pub struct QuadOptions {
    /// Absolute tolerance on the integral.
    pub abs_tol: f64,
    /// Relative tolerance on the integral.
    pub rel_tol: f64,
    /// Maximum number of subintervals.
    pub max_intervals: usize,
}

impl Default for QuadOptions {
    fn default() -> Self {
        QuadOptions { abs_tol: 1e-300, rel_tol: 1e-12, max_intervals: 2000 }
    }
}

/// The result of a quadrature: value, error estimate, and whether the tolerance was met.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Quad {
    /// The integral.
    pub value: f64,
    /// Estimated absolute error.
    pub error: f64,
    /// True if the error estimate meets the tolerance.
    pub converged: bool,
    /// Number of subintervals used.
    pub intervals: usize,
}

// Kronrod nodes (positive half, descending) and weights; Gauss weights for the odd-indexed nodes. The digits
// are kept as published.
#[allow(clippy::excessive_precision)]
const XGK: [f64; 8] = [
    0.991_455_371_120_812_639_206_854_697_526_329,
    0.949_107_912_342_758_524_526_189_684_047_851,
    0.864_864_423_359_769_072_789_712_788_640_926,
    0.741_531_185_599_394_439_863_864_773_280_788,
    0.586_087_235_467_691_130_294_144_845_693_013,
    0.405_845_151_377_397_166_906_606_412_076_961,
    0.207_784_955_007_898_467_600_689_403_773_245,
    0.0,
];
#[allow(clippy::excessive_precision)]
const WGK: [f64; 8] = [
    0.022_935_322_010_529_224_963_732_008_058_970,
    0.063_092_092_629_978_553_290_700_663_189_204,
    0.104_790_010_322_250_183_839_876_322_541_518,
    0.140_653_259_715_525_918_745_189_590_510_238,
    0.169_004_726_639_267_902_826_583_426_598_550,
    0.190_350_578_064_785_409_913_256_402_421_014,
    0.204_432_940_075_298_892_414_161_999_234_649,
    0.209_482_141_084_727_828_012_999_174_891_714,
];
#[allow(clippy::excessive_precision)]
const WG: [f64; 4] = [
    0.129_484_966_168_869_693_270_611_432_679_082,
    0.279_705_391_489_276_667_901_467_771_423_780,
    0.381_830_050_505_118_944_950_369_775_488_975,
    0.417_959_183_673_469_387_755_102_040_816_327,
];

/// One 15-point Kronrod estimate on [a, b] and its difference from the embedded 7-point Gauss estimate.
fn gk15<F: Fn(f64) -> f64>(f: &F, a: f64, b: f64) -> (f64, f64) {
    let c = 0.5 * (a + b);
    let h = 0.5 * (b - a);
    let fc = f(c);
    let mut k = WGK[7] * fc;
    let mut g = WG[3] * fc;
    for j in 0..7 {
        let x = h * XGK[j];
        let s = f(c - x) + f(c + x);
        k += WGK[j] * s;
        if j % 2 == 1 {
            g += WG[j / 2] * s;
        }
    }
    (k * h, ((k - g) * h).abs())
}

/// Integrate `f` over [a, b] (a < b or a > b) with adaptive bisection. A non-finite integrand value makes the
/// result non-finite and unconverged; callers treat that as a numerical failure.
pub fn integrate<F: Fn(f64) -> f64>(f: &F, a: f64, b: f64, opts: &QuadOptions) -> Quad {
    if a == b {
        return Quad { value: 0.0, error: 0.0, converged: true, intervals: 0 };
    }
    let (v0, e0) = gk15(f, a, b);
    let mut parts: Vec<(f64, f64, f64, f64)> = vec![(a, b, v0, e0)];
    loop {
        let total: f64 = parts.iter().map(|p| p.2).sum();
        let err: f64 = parts.iter().map(|p| p.3).sum();
        let tol = opts.abs_tol.max(opts.rel_tol * total.abs());
        if !total.is_finite() || !err.is_finite() {
            return Quad { value: total, error: err, converged: false, intervals: parts.len() };
        }
        if err <= tol || parts.len() >= opts.max_intervals {
            return Quad { value: total, error: err, converged: err <= tol, intervals: parts.len() };
        }
        let (k, _) =
            parts.iter().enumerate().fold((0, -1.0), |best, (i, p)| if p.3 > best.1 { (i, p.3) } else { best });
        let (x0, x1, _, _) = parts.swap_remove(k);
        let m = 0.5 * (x0 + x1);
        if m == x0 || m == x1 {
            // Interval at the resolution of f64: cannot bisect further.
            let total: f64 = parts.iter().map(|p| p.2).sum::<f64>() + gk15(f, x0, x1).0;
            return Quad { value: total, error: err, converged: false, intervals: parts.len() + 1 };
        }
        let (vl, el) = gk15(f, x0, m);
        let (vr, er) = gk15(f, m, x1);
        parts.push((x0, m, vl, el));
        parts.push((m, x1, vr, er));
    }
}

/// Integrate `f(r)` over [a, b] (a < b or a > b) where `f` may blow up like 1/sqrt at either end: the lower
/// half uses r = a + u^2, the upper half r = b - u^2, so each piece integrates the finite 2 u f(r(u)) over
/// u in [0, sqrt((b - a)/2)]. Smooth integrands are unharmed by the substitution.
pub fn integrate_sqrt_ends<F: Fn(f64) -> f64>(f: &F, a: f64, b: f64, opts: &QuadOptions) -> Quad {
    let (lo, hi) = if a < b { (a, b) } else { (b, a) };
    let g = |lower: bool, x: f64| if lower { f(lo + x) } else { f(hi - x) };
    integrate_sqrt_ends_by_offset(&g, a, b, opts)
}

/// As [`integrate_sqrt_ends`], but the integrand is given as `f(lower, x)`: its value at distance x >= 0 from
/// the lower end (`lower = true`) or from the upper end of [min(a, b), max(a, b)]. This lets a caller evaluate
/// quantities that vanish at an end (such as E^2 - A at a turning point) without cancellation.
pub fn integrate_sqrt_ends_by_offset<F: Fn(bool, f64) -> f64>(f: &F, a: f64, b: f64, opts: &QuadOptions) -> Quad {
    if a == b {
        return Quad { value: 0.0, error: 0.0, converged: true, intervals: 0 };
    }
    let (lo, hi, sign) = if a < b { (a, b, 1.0) } else { (b, a, -1.0) };
    let half = 0.5 * (hi - lo);
    let umax = half.sqrt();
    let lower = |u: f64| if u == 0.0 { 0.0 } else { 2.0 * u * f(true, u * u) };
    let upper = |u: f64| if u == 0.0 { 0.0 } else { 2.0 * u * f(false, u * u) };
    let sub = QuadOptions { abs_tol: opts.abs_tol * 0.5, ..*opts };
    let ql = integrate(&lower, 0.0, umax, &sub);
    let qu = integrate(&upper, 0.0, umax, &sub);
    Quad {
        value: sign * (ql.value + qu.value),
        error: ql.error + qu.error,
        converged: ql.converged && qu.converged,
        intervals: ql.intervals + qu.intervals,
    }
}

/// The mean of `g` over [start, start + x] (x of either sign) by 5-point Gauss-Legendre (Abramowitz & Stegun
/// 1964, table 25.4). With g = f' this is (f(start + x) - f(start))/x without cancellation, exact to (x/L)^10
/// for a function varying on a scale L.
pub fn mean_over<F: Fn(f64) -> f64>(g: &F, start: f64, x: f64) -> f64 {
    #[allow(clippy::excessive_precision)]
    const NODES: [(f64, f64); 5] = [
        (0.0, 0.568_888_888_888_888_9),
        (0.538_469_310_105_683_1, 0.478_628_670_499_366_5),
        (-0.538_469_310_105_683_1, 0.478_628_670_499_366_5),
        (0.906_179_845_938_664, 0.236_926_885_056_189_1),
        (-0.906_179_845_938_664, 0.236_926_885_056_189_1),
    ];
    NODES.iter().map(|(t, w)| 0.5 * w * g(start + 0.5 * x * (1.0 + t))).sum()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn smooth_integrals() {
        // int_0^pi sin = 2; int_0^1 e^x = e - 1 (elementary).
        let q = integrate(&f64::sin, 0.0, std::f64::consts::PI, &QuadOptions::default());
        assert!(q.converged && (q.value - 2.0).abs() < 1e-14, "{q:?}");
        let q = integrate(&f64::exp, 1.0, 0.0, &QuadOptions::default());
        assert!((q.value + (std::f64::consts::E - 1.0)).abs() < 1e-14, "{q:?}");
    }

    #[test]
    fn inverse_square_root_ends() {
        // int_0^1 dx / sqrt(x (1 - x)) = pi (elementary: x = sin^2 theta).
        let f = |x: f64| 1.0 / (x * (1.0 - x)).sqrt();
        let q = integrate_sqrt_ends(&f, 0.0, 1.0, &QuadOptions::default());
        assert!(q.converged && (q.value - std::f64::consts::PI).abs() < 1e-12, "{q:?}");
        let q = integrate_sqrt_ends(&f, 1.0, 0.0, &QuadOptions::default());
        assert!((q.value + std::f64::consts::PI).abs() < 1e-12, "{q:?}");
    }

    #[test]
    fn mean_of_derivative_is_a_difference_quotient_without_cancellation() {
        // (cos(1 + x) - cos 1)/x for tiny x: the mean of -sin over [1, 1 + x] (elementary).
        let x = 1e-12;
        let m = mean_over(&|t: f64| -t.sin(), 1.0, x);
        let exact = -(1.0f64 + 0.5 * x).sin() * (0.5 * x).sin() * 2.0 / x;
        assert!((m - exact).abs() < 1e-15, "{m} vs {exact}");
        let m = mean_over(&|t: f64| 3.0 * t * t, 2.0, -1.0);
        assert!((m - (8.0 - 1.0)).abs() < 1e-14);
    }

    #[test]
    fn non_finite_integrand_is_not_converged() {
        let q = integrate(&|x: f64| 1.0 / x, -1.0, 1.0, &QuadOptions::default());
        assert!(!q.converged || !q.value.is_finite() || q.error > 1e-3, "{q:?}");
    }
}
