//! Finding every root of a function of one variable on an interval, with the failure modes of thin-shell
//! work made explicit: poles that look like sign changes, double (tangent) roots, and roots that are too
//! close to call.
//!
//! Method: sample the interval (log-spaced when it spans more than two decades), bracket every sign change
//! and refine it with a safeguarded Newton-bisection iteration (Press et al., Numerical Recipes, 3rd ed.,
//! 2007, sec. 9.4, "rtsafe"), using exact derivatives from dual numbers. A bracket whose |f| grows as it
//! shrinks is a pole, not a root. Local minima of |f| between samples with a sign change of f' are refined
//! as roots of f'; where f is also zero there the root is reported as a double root (ill-conditioned).

/// Root-finding settings; the default tolerances are the named fields of `tolerances::Tolerances::roots`.
#[derive(Debug, Clone, Copy)]
pub struct RootOptions {
    /// Number of samples across the interval.
    pub samples: usize,
    /// Relative tolerance on the root's position.
    pub x_rel_tol: f64,
    /// Maximum iterations per bracket.
    pub max_iter: usize,
    /// A converged point with |f| larger than this times the typical |f| scale is treated as a pole.
    pub pole_ratio: f64,
    /// Relative |f| below which a tangent point counts as a double root.
    pub double_root_tol: f64,
}

impl Default for RootOptions {
    fn default() -> Self {
        let t = crate::tolerances::TOL.roots;
        RootOptions {
            samples: 2000,
            x_rel_tol: t.x_rel,
            max_iter: 200,
            pole_ratio: t.pole_ratio,
            double_root_tol: t.double_root,
        }
    }
}

/// How a root was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RootKind {
    /// A sign change, refined to tolerance: well conditioned.
    Simple,
    /// A tangent point (f and f' vanish): no sign change, ill-conditioned, may split or vanish under a small
    /// change of parameters.
    Double,
}

/// One root.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Root {
    /// Position.
    pub x: f64,
    /// Simple or double.
    pub kind: RootKind,
    /// |f| at the returned position.
    pub residual: f64,
    /// f' at the root.
    pub slope: f64,
}

/// A sign change that was rejected because |f| blows up there.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pole {
    /// Approximate position.
    pub x: f64,
}

/// All roots found, plus rejected poles (so callers can tell users about them).
#[derive(Debug, Clone, Default)]
pub struct RootScan {
    /// Roots, sorted.
    pub roots: Vec<Root>,
    /// Sign changes rejected as poles.
    pub poles: Vec<Pole>,
}

/// Sample points on [lo, hi]: log-spaced when 0 < lo and hi/lo > 100, linear otherwise. Both ends included.
pub fn sample_points(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    let n = n.max(2);
    if lo > 0.0 && hi / lo > 100.0 {
        crate::spacing::log(lo, hi, n)
    } else {
        crate::spacing::linear(lo, hi, n)
    }
}

/// Safeguarded Newton-bisection on a bracket [a, b] with f(a) f(b) < 0. `f` returns (value, derivative).
pub fn refine<F: Fn(f64) -> Option<(f64, f64)>>(f: &F, a: f64, b: f64, opts: &RootOptions) -> Option<f64> {
    let (fa, _) = f(a)?;
    let (fb, _) = f(b)?;
    refine_from(f, (a, fa), (b, fb), 0.5 * (a + b), opts)
}

/// [`refine`] on a bracket whose end values are known, starting from `x0` (a predicted root, e.g. the root at a
/// neighbouring parameter point) when it lies strictly inside the bracket, else from the midpoint.
pub fn refine_from<F: Fn(f64) -> Option<(f64, f64)>>(
    f: &F,
    (mut a, fa): (f64, f64),
    (mut b, fb): (f64, f64),
    x0: f64,
    opts: &RootOptions,
) -> Option<f64> {
    if fa == 0.0 {
        return Some(a);
    }
    if fb == 0.0 {
        return Some(b);
    }
    if fa.signum() == fb.signum() {
        return None;
    }
    // Orient so that f(a) < 0 < f(b).
    if fa > 0.0 {
        std::mem::swap(&mut a, &mut b);
    }
    let inside = x0 > a.min(b) && x0 < a.max(b);
    let mut x = if inside { x0 } else { 0.5 * (a + b) };
    let mut dx_old = (b - a).abs();
    let mut dx = dx_old;
    let (mut fx, mut dfx) = f(x)?;
    for _ in 0..opts.max_iter {
        let newton_out = ((x - b) * dfx - fx) * ((x - a) * dfx - fx) > 0.0;
        let slow = (2.0 * fx).abs() > (dx_old * dfx).abs();
        dx_old = dx;
        if newton_out || slow || !dfx.is_finite() || dfx == 0.0 {
            dx = 0.5 * (b - a);
            x = a + dx;
        } else {
            dx = fx / dfx;
            x -= dx;
        }
        if dx.abs() <= opts.x_rel_tol * x.abs().max(1e-300) {
            return Some(x);
        }
        let v = f(x)?;
        fx = v.0;
        dfx = v.1;
        if fx == 0.0 {
            return Some(x);
        }
        if fx < 0.0 {
            a = x;
        } else {
            b = x;
        }
        if (b - a).abs() <= 2.0 * f64::EPSILON * x.abs() {
            return Some(x);
        }
    }
    Some(x)
}

/// Find every root of `f` on [lo, hi]. `f` returns (value, derivative), or `None` where it is undefined.
/// `fpp`, if given, returns (f', f'') and is used to locate double roots.
pub fn find_roots<F, G>(f: &F, fpp: Option<&G>, lo: f64, hi: f64, opts: &RootOptions) -> RootScan
where
    F: Fn(f64) -> Option<(f64, f64)>,
    G: Fn(f64) -> Option<(f64, f64)>,
{
    let xs = sample_points(lo, hi, opts.samples);
    let vals: Vec<Option<(f64, f64)>> =
        xs.iter().map(|&x| f(x).filter(|v| v.0.is_finite() && v.1.is_finite())).collect();
    // Typical scale of |f| for residual tests: median of the finite sampled values.
    let mut mags: Vec<f64> = vals.iter().flatten().map(|v| v.0.abs()).filter(|v| *v > 0.0).collect();
    mags.sort_by(|a, b| a.total_cmp(b));
    let scale = if mags.is_empty() { 1.0 } else { mags[mags.len() / 2].max(1e-300) };
    let mut out = RootScan::default();
    let finite: Vec<usize> = (0..xs.len()).filter(|&i| vals[i].is_some()).collect();
    for w in finite.windows(2) {
        let (i, j) = (w[0], w[1]);
        let (Some((f0, d0)), Some((f1, d1))) = (vals[i], vals[j]) else { continue };
        if j > i + 1 {
            // Undefined or infinite samples in between: a sign change across them is a pole or a gap in the
            // domain, never a root.
            if f0.signum() != f1.signum() {
                out.poles.push(Pole { x: xs[i + 1] });
            }
            continue;
        }
        if f0 == 0.0 {
            push_root(&mut out, f, xs[i], RootKind::Simple);
            continue;
        }
        if f0.signum() != f1.signum() && f1 != 0.0 {
            match refine(f, xs[i], xs[j], opts) {
                Some(x) => {
                    let res = f(x).map(|v| v.0.abs()).unwrap_or(f64::INFINITY);
                    // A pole: the sign change survives but |f| at the "root" is large compared with the
                    // function's typical size and with the bracket ends.
                    if !(res <= opts.pole_ratio * scale * 1e-6 || res <= f0.abs().min(f1.abs())) || !res.is_finite() {
                        out.poles.push(Pole { x });
                    } else {
                        push_root(&mut out, f, x, RootKind::Simple);
                    }
                }
                None => out.poles.push(Pole { x: 0.5 * (xs[i] + xs[j]) }),
            }
        } else if d0.signum() != d1.signum() && f0.signum() == f1.signum() {
            // |f| has a local minimum between samples without a sign change: maybe a double root.
            if let Some(g) = fpp {
                if let Some(x) = refine(g, xs[i], xs[j], opts) {
                    if let Some((fx, dfx)) = f(x) {
                        if fx.abs() <= opts.double_root_tol * scale.max(f0.abs().max(f1.abs())) {
                            out.roots.push(Root { x, kind: RootKind::Double, residual: fx.abs(), slope: dfx });
                        } else if fx.signum() != f0.signum() && fx.is_finite() {
                            // f dips through zero and back between two samples: two simple roots closer than
                            // the sample spacing (a nearly degenerate pair), one on each side of the extremum.
                            for (a, b) in [(xs[i], x), (x, xs[j])] {
                                if let Some(r) = refine(f, a, b, opts) {
                                    push_root(&mut out, f, r, RootKind::Simple);
                                }
                            }
                        }
                    }
                }
            }
        }
    }
    if let (Some(v), Some(x)) = (vals.last().copied().flatten(), xs.last()) {
        if v.0 == 0.0 {
            push_root(&mut out, f, *x, RootKind::Simple);
        }
    }
    out.roots.sort_by(|a, b| a.x.total_cmp(&b.x));
    out.roots.dedup_by(|a, b| (a.x - b.x).abs() <= 1e-12 * a.x.abs().max(1.0));
    out
}

fn push_root<F: Fn(f64) -> Option<(f64, f64)>>(out: &mut RootScan, f: &F, x: f64, kind: RootKind) {
    let (v, d) = f(x).unwrap_or((f64::NAN, f64::NAN));
    out.roots.push(Root { x, kind, residual: v.abs(), slope: d });
}

#[cfg(test)]
mod tests {
    use super::*;

    type Deriv = fn(f64) -> Option<(f64, f64)>;

    fn none() -> Option<&'static Deriv> {
        None
    }

    #[test]
    fn finds_all_simple_roots() {
        let f = |x: f64| {
            Some((
                (x - 1.0) * (x - 2.0) * (x - 3.5),
                (x - 2.0) * (x - 3.5) + (x - 1.0) * (x - 3.5) + (x - 1.0) * (x - 2.0),
            ))
        };
        let s = find_roots(&f, none(), 0.5, 5.0, &RootOptions::default());
        let xs: Vec<f64> = s.roots.iter().map(|r| r.x).collect();
        assert_eq!(xs.len(), 3);
        for (x, e) in xs.iter().zip([1.0, 2.0, 3.5]) {
            assert!((x - e).abs() < 1e-13);
        }
    }

    #[test]
    fn pole_is_not_a_root() {
        let f = |x: f64| Some((1.0 / (x - 2.0), -1.0 / (x - 2.0).powi(2)));
        let s = find_roots(&f, none(), 1.0, 3.0, &RootOptions { samples: 101, ..Default::default() });
        assert!(s.roots.is_empty(), "{:?}", s.roots);
        assert_eq!(s.poles.len(), 1);
    }

    #[test]
    fn double_root_is_flagged() {
        let f = |x: f64| Some(((x - 2.0).powi(2), 2.0 * (x - 2.0)));
        let g = |x: f64| Some((2.0 * (x - 2.0), 2.0));
        let s = find_roots(&f, Some(&g), 0.3, 5.0, &RootOptions { samples: 100, ..Default::default() });
        assert_eq!(s.roots.len(), 1);
        assert_eq!(s.roots[0].kind, RootKind::Double);
        assert!((s.roots[0].x - 2.0).abs() < 1e-12);
    }

    #[test]
    fn close_pair_between_two_samples_gives_two_simple_roots() {
        // (x - 2)^2 - 1e-8: roots 2 -+ 1e-4, far closer than the sample spacing 0.047 (exact by construction).
        let f = |x: f64| Some(((x - 2.0).powi(2) - 1e-8, 2.0 * (x - 2.0)));
        let g = |x: f64| Some((2.0 * (x - 2.0), 2.0));
        let s = find_roots(&f, Some(&g), 0.3, 5.0, &RootOptions { samples: 100, ..Default::default() });
        assert_eq!(s.roots.len(), 2, "{:?}", s.roots);
        assert!(s.roots.iter().all(|r| r.kind == RootKind::Simple));
        assert!((s.roots[0].x - (2.0 - 1e-4)).abs() < 1e-12);
        assert!((s.roots[1].x - (2.0 + 1e-4)).abs() < 1e-12);
    }
}
