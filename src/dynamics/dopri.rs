//! One step of the Dormand-Prince 5(4) embedded Runge-Kutta pair, and its step-size controller.
//!
//! Coefficients: Dormand & Prince 1980 (J. Comput. Appl. Math. 6, 19), as tabulated in Hairer, Norsett &
//! Wanner, Solving Ordinary Differential Equations I (2nd ed., 1993), sec. II.5, table 5.2 ("DOPRI5"). The
//! solution is advanced with the fifth-order weights (local extrapolation); the difference to the embedded
//! fourth-order weights estimates the local error. The last stage is evaluated at the new point with the
//! fifth-order weights, so it is the derivative there (first same as last): an accepted step costs six new
//! right-hand-side evaluations.
//!
//! Written here rather than taken from a crate: the integrator is ~100 lines, the shell's right-hand side can
//! fail (a stage lands inside a horizon, the law is undefined there) and the driver needs that failure as data
//! to shrink the step, and the project keeps its dependency list short.

/// Length of the state vector.
pub const N: usize = 3;

/// A state vector.
pub type Vec3 = [f64; N];

const A: [[f64; 6]; 7] = [
    [0.0, 0.0, 0.0, 0.0, 0.0, 0.0],
    [1.0 / 5.0, 0.0, 0.0, 0.0, 0.0, 0.0],
    [3.0 / 40.0, 9.0 / 40.0, 0.0, 0.0, 0.0, 0.0],
    [44.0 / 45.0, -56.0 / 15.0, 32.0 / 9.0, 0.0, 0.0, 0.0],
    [19372.0 / 6561.0, -25360.0 / 2187.0, 64448.0 / 6561.0, -212.0 / 729.0, 0.0, 0.0],
    [9017.0 / 3168.0, -355.0 / 33.0, 46732.0 / 5247.0, 49.0 / 176.0, -5103.0 / 18656.0, 0.0],
    [35.0 / 384.0, 0.0, 500.0 / 1113.0, 125.0 / 192.0, -2187.0 / 6784.0, 11.0 / 84.0],
];

/// Fifth-order weights (equal to the last row of A).
const B5: [f64; 7] = [35.0 / 384.0, 0.0, 500.0 / 1113.0, 125.0 / 192.0, -2187.0 / 6784.0, 11.0 / 84.0, 0.0];

/// Fourth-order (embedded) weights.
const B4: [f64; 7] =
    [5179.0 / 57600.0, 0.0, 7571.0 / 16695.0, 393.0 / 640.0, -92097.0 / 339200.0, 187.0 / 2100.0, 1.0 / 40.0];

/// Error tolerances and step-size control of the integrator.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerances {
    /// Relative tolerance per component.
    pub rtol: f64,
    /// Absolute tolerance per component.
    pub atol: f64,
    /// Safety factor on the optimal step (common practice: 0.9).
    pub safety: f64,
    /// Largest growth of the step from one step to the next.
    pub max_growth: f64,
    /// Largest shrink of the step after a rejected step.
    pub max_shrink: f64,
}

impl Default for Tolerances {
    fn default() -> Self {
        Tolerances { rtol: 1e-10, atol: 1e-12, safety: 0.9, max_growth: 5.0, max_shrink: 0.2 }
    }
}

/// The outcome of one attempted step.
#[derive(Debug, Clone, Copy)]
pub struct Step<X> {
    /// The fifth-order solution at t + h.
    pub y: Vec3,
    /// The derivative at t + h (the last stage).
    pub dy: Vec3,
    /// Whatever the right-hand side reports besides the derivative, at t + h.
    pub extra: X,
    /// Scaled RMS error estimate; the step is acceptable when it is at most 1.
    pub err: f64,
}

/// Attempt one step of size `h` from (`y`, `dy` = f(y)). `f` returns the derivative and an extra value, or an
/// error (a halt) that aborts the step. The system is autonomous (no explicit time), so the stage abscissae
/// c = (0, 1/5, 3/10, 4/5, 8/9, 1, 1) are not needed.
pub fn step<X, E>(
    f: &impl Fn(&Vec3) -> Result<(Vec3, X), E>,
    y: &Vec3,
    dy: &Vec3,
    h: f64,
    tol: &Tolerances,
) -> Result<Step<X>, E> {
    let mut k = [[0.0; N]; 7];
    k[0] = *dy;
    let mut extra = None;
    for s in 1..7 {
        let mut ys = *y;
        for (i, yi) in ys.iter_mut().enumerate() {
            let mut acc = 0.0;
            for (r, kr) in k.iter().enumerate().take(s) {
                acc += A[s][r] * kr[i];
            }
            *yi += h * acc;
        }
        let (d, x) = f(&ys)?;
        k[s] = d;
        if s == 6 {
            extra = Some((ys, x));
        }
    }
    let (y5, x) = match extra {
        Some(v) => v,
        None => unreachable!("the stage loop always reaches the last stage"),
    };
    let mut sum = 0.0;
    for i in 0..N {
        let mut e = 0.0;
        for (s, ks) in k.iter().enumerate() {
            e += (B5[s] - B4[s]) * ks[i];
        }
        let sc = tol.atol + tol.rtol * y[i].abs().max(y5[i].abs());
        sum += (h * e / sc).powi(2);
    }
    Ok(Step { y: y5, dy: k[6], extra: x, err: (sum / N as f64).sqrt() })
}

/// The next step size after a step with scaled error `err` (standard controller for a pair of order 5(4):
/// h_new = h * safety * err^(-1/5), limited in growth and shrink; Hairer, Norsett & Wanner 1993, eq. II.4.13).
pub fn next_step(h: f64, err: f64, tol: &Tolerances) -> f64 {
    let fac =
        if err <= 0.0 { tol.max_growth } else { (tol.safety * err.powf(-0.2)).clamp(tol.max_shrink, tol.max_growth) };
    h * fac
}

/// Cubic Hermite interpolation between (y0, d0) at s = 0 and (y1, d1) at s = 1 of a step of length h
/// (common practice; fourth-order accurate in h for a smooth solution).
pub fn hermite(y0: f64, d0: f64, y1: f64, d1: f64, h: f64, s: f64) -> f64 {
    let s2 = s * s;
    let s3 = s2 * s;
    (2.0 * s3 - 3.0 * s2 + 1.0) * y0 + (s3 - 2.0 * s2 + s) * h * d0 + (-2.0 * s3 + 3.0 * s2) * y1 + (s3 - s2) * h * d1
}

/// The fraction s in (0, 1] of a step where the Hermite interpolant of a quantity with values y0, y1 of
/// opposite sign first reaches zero (bisection on the cubic, to rounding).
pub fn hermite_root(y0: f64, d0: f64, y1: f64, d1: f64, h: f64) -> f64 {
    let (mut lo, mut hi) = (0.0, 1.0);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        let v = hermite(y0, d0, y1, d1, h, mid);
        if (v > 0.0) == (y0 > 0.0) && v != 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fixed(f: &impl Fn(&Vec3) -> Result<(Vec3, ()), ()>, y0: Vec3, t: f64, n: usize) -> Vec3 {
        let h = t / n as f64;
        let tol = Tolerances::default();
        let mut y = y0;
        for _ in 0..n {
            let (d, _) = f(&y).unwrap();
            y = step(f, &y, &d, h, &tol).unwrap().y;
        }
        y
    }

    /// The pair is of order 5: halving a fixed step divides the global error of y' = y on [0, 1] by about
    /// 2^5 = 32 (Dormand & Prince 1980; exact solution e^t, common practice). Steps 1/16 and 1/32.
    #[test]
    fn fifth_order_convergence() {
        let f = |y: &Vec3| Ok::<_, ()>(([y[0], 0.0, 0.0], ()));
        let e1 = (fixed(&f, [1.0, 0.0, 0.0], 1.0, 16)[0] - 1f64.exp()).abs();
        let e2 = (fixed(&f, [1.0, 0.0, 0.0], 1.0, 32)[0] - 1f64.exp()).abs();
        let ratio = e1 / e2;
        assert!(
            ratio > 28.0 && ratio < 36.0,
            "error ratio (order 4 would give 16, order 6 64) {ratio} (e1 = {e1:e}, e2 = {e2:e})"
        );
    }

    /// The embedded error estimate is of order h^5 per step: for y' = y the estimate shrinks by ~32 when h halves.
    #[test]
    fn error_estimate_scales_as_h5() {
        let f = |y: &Vec3| Ok::<_, ()>(([y[0], 0.0, 0.0], ()));
        let tol = Tolerances { rtol: 0.0, atol: 1.0, ..Tolerances::default() };
        let y = [1.0, 0.0, 0.0];
        let e1 = step(&f, &y, &y, 0.1, &tol).unwrap().err;
        let e2 = step(&f, &y, &y, 0.05, &tol).unwrap().err;
        assert!((e1 / e2 - 32.0).abs() < 3.0, "{}", e1 / e2);
    }

    /// A cubic is reproduced exactly by the Hermite interpolant (common practice).
    #[test]
    fn hermite_reproduces_cubics_and_finds_roots() {
        let p = |t: f64| t * t * t - 2.0 * t + 0.5;
        let dp = |t: f64| 3.0 * t * t - 2.0;
        let (t0, h) = (0.1, 0.4);
        for s in [0.0, 0.3, 0.7, 1.0] {
            let v = hermite(p(t0), dp(t0), p(t0 + h), dp(t0 + h), h, s);
            assert!((v - p(t0 + s * h)).abs() < 1e-14);
        }
        // The root of t^3 - 2t + 0.5 between 0.1 and 0.5 (a sign change there): the interpolant is the cubic.
        let s = hermite_root(p(t0), dp(t0), p(t0 + h), dp(t0 + h), h);
        assert!(p(t0 + s * h).abs() < 1e-14);
    }
}
