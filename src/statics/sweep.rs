//! Branches of static radii as one parameter varies, followed by pseudo-arclength continuation so that a branch
//! keeps its identity through folds (where two static radii merge and the curve turns back in the parameter).
//!
//! Method (Keller 1977, "Numerical solution of bifurcation and nonlinear eigenvalue problems"; common practice in
//! numerical continuation): the solution set of f(a, lambda) = p0 - P(sigma0) = 0 is a curve in the plane
//! (u, v) = (ln a scaled to the radius box, lambda scaled to the parameter range). From seeds (every static radius
//! found by a robust scan at each requested lambda) the curve is traced in both directions with a tangent
//! predictor and a Newton corrector on [f = 0, t.(x - x_pred) = 0]; exact partials come from dual numbers. Each
//! branch is reported where it crosses the requested lambda values, with its folds (turning points in lambda).

use super::{Stability, StaticsOptions};
use crate::error::{Error, Result};
use crate::junction::potential::Law;
use crate::junction::Junction;
use crate::newton::{self, NewtonOptions, StepTolerance, Termination};
use crate::scenario::Scenario;
use num_dual::Dual64;
use serde::Serialize;

/// One point of a branch at a requested parameter value.
#[derive(Debug, Clone, Serialize)]
pub struct BranchPoint {
    /// Parameter value.
    pub value: f64,
    /// Static radius.
    pub radius: f64,
    /// V''(a0) with the scenario's law.
    pub potential_second_derivative: f64,
    /// Verdict.
    pub stability: Stability,
}

/// A fold (turning point) of a branch: two static radii merge there.
#[derive(Debug, Clone, Serialize)]
pub struct Fold {
    /// Parameter value at the fold.
    pub value: f64,
    /// Radius at the fold.
    pub radius: f64,
}

/// One connected branch.
#[derive(Debug, Clone, Serialize)]
pub struct Branch {
    /// 1-based identifier.
    pub id: usize,
    /// Crossings of the requested parameter values, in order along the branch.
    pub points: Vec<BranchPoint>,
    /// Folds along the branch.
    pub folds: Vec<Fold>,
    /// The traced curve as (parameter value, radius), in order along the branch: the pseudo-arclength
    /// continuation steps, so it is dense where the branch turns (folds). For figures; not in the JSON.
    #[serde(skip)]
    pub curve: Vec<(f64, f64)>,
}

/// Result of a sweep.
#[derive(Debug, Clone, Serialize)]
pub struct SweepReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance.
    pub provenance: String,
    /// Varied parameter.
    pub parameter: String,
    /// Requested values.
    pub values: Vec<f64>,
    /// Radius box.
    pub radius_range: [f64; 2],
    /// Branches.
    pub branches: Vec<Branch>,
    /// Notes.
    pub notes: Vec<String>,
}

struct Ctx<'a> {
    s: &'a Scenario,
    k: usize,
    a_lo: f64,
    a_hi: f64,
    l_lo: f64,
    l_hi: f64,
}

impl Ctx<'_> {
    fn to_uv(&self, a: f64, l: f64) -> [f64; 2] {
        [(a / self.a_lo).ln() / (self.a_hi / self.a_lo).ln(), (l - self.l_lo) / (self.l_hi - self.l_lo)]
    }
    fn point_of(&self, x: [f64; 2]) -> (f64, f64) {
        (self.a_lo * ((self.a_hi / self.a_lo).ln() * x[0]).exp(), self.l_lo + x[1] * (self.l_hi - self.l_lo))
    }
    /// f and its gradient in (u, v).
    fn f(&self, x: [f64; 2]) -> Option<(f64, [f64; 2])> {
        let (a, l) = self.point_of(x);
        let mut g = [0.0; 2];
        let mut val = 0.0;
        for (slot, (da, dl)) in [(0usize, (1.0, 0.0)), (1usize, (0.0, 1.0))] {
            let mut p: Vec<Dual64> = self.s.params.values().iter().map(|&v| Dual64::from(v)).collect();
            p[self.k] = Dual64::new(l, dl);
            let j = Junction::with_params(&self.s.model, p);
            let (f, _) = super::residual(&j, Dual64::new(a, da))?;
            val = f.re;
            g[slot] = f.eps;
        }
        // chain rule to (u, v)
        let gu = g[0] * a * (self.a_hi / self.a_lo).ln();
        let gv = g[1] * (self.l_hi - self.l_lo);
        (val.is_finite() && gu.is_finite() && gv.is_finite()).then_some((val, [gu, gv]))
    }
    fn inside(&self, x: [f64; 2]) -> bool {
        (-1e-9..=1.0 + 1e-9).contains(&x[0]) && (-1e-9..=1.0 + 1e-9).contains(&x[1])
    }
    /// Newton's method on f along coordinate `axis` (0: u, the radius; 1: v, the parameter), the other held
    /// fixed; returns the converged point if |f| is then negligible against its gradient.
    fn newton_along(&self, mut x: [f64; 2], axis: usize) -> Option<[f64; 2]> {
        for _ in 0..50 {
            let (f, g) = self.f(x)?;
            if g[axis] == 0.0 {
                return None;
            }
            let d = -f / g[axis];
            x[axis] += d;
            if d.abs() < 1e-15 {
                break;
            }
        }
        let (f, g) = self.f(x)?;
        (f.abs() <= 1e-10 * (g[0].abs() + g[1].abs()).max(1e-300)).then_some(x)
    }
}

/// Locate a fold (an extremum of the parameter along the branch) between the polyline points x0 and x2 around the
/// turning vertex x1, by golden-section search on lambda(a) at fixed radius (f_lambda != 0 at a regular fold).
fn refine_fold(c: &Ctx, x0: [f64; 2], x1: [f64; 2], x2: [f64; 2]) -> Option<(f64, f64)> {
    let is_max = x1[1] > x0[1];
    let sign = if is_max { 1.0 } else { -1.0 };
    let (mut lo, mut hi) = (x0[0].min(x2[0]), x0[0].max(x2[0]));
    let obj = |u: f64| c.newton_along([u, x1[1]], 1).map(|x| x[1]).map(|v| sign * v);
    let gr = 0.5 * (5f64.sqrt() - 1.0);
    let mut a = hi - gr * (hi - lo);
    let mut b = lo + gr * (hi - lo);
    let (mut fa, mut fb) = (obj(a)?, obj(b)?);
    for _ in 0..80 {
        if fa > fb {
            hi = b;
            b = a;
            fb = fa;
            a = hi - gr * (hi - lo);
            fa = obj(a)?;
        } else {
            lo = a;
            a = b;
            fa = fb;
            b = lo + gr * (hi - lo);
            fb = obj(b)?;
        }
        if (hi - lo).abs() < 1e-13 {
            break;
        }
    }
    let u = 0.5 * (lo + hi);
    let v = c.newton_along([u, x1[1]], 1).map(|x| x[1])?;
    Some(c.point_of([u, v]))
}

/// The corrector: full Newton steps until they sum to less than 1e-13 in (u, v), at most 20.
const CORRECTOR: NewtonOptions =
    NewtonOptions { max_iterations: 20, damping_tries: 1, tolerance: StepTolerance::AbsoluteSum(1e-13) };

/// Trace the curve from `x0` in direction `dir` (+1/-1 along the tangent); returns the polyline.
fn trace(c: &Ctx, x0: [f64; 2], dir: f64, h0: f64, max_steps: usize) -> Vec<[f64; 2]> {
    let mut pts = vec![x0];
    let mut x = x0;
    let mut h = h0;
    let Some((_, g)) = c.f(x) else { return pts };
    let norm = (g[0] * g[0] + g[1] * g[1]).sqrt();
    let mut t = [-g[1] / norm * dir, g[0] / norm * dir];
    for step in 0..max_steps {
        let pred = [x[0] + h * t[0], x[1] + h * t[1]];
        // Newton corrector on F = [f, t.(y - pred)].
        let system = |y: [f64; 2]| {
            let (f, g) = c.f(y)?;
            Some(([f, t[0] * (y[0] - pred[0]) + t[1] * (y[1] - pred[1])], [g, t]))
        };
        let out = newton::solve(system, |_| true, pred, &CORRECTOR);
        let (y, ok) = (out.x, matches!(out.termination, Termination::Converged { .. }));
        let dist = ((y[0] - x[0]).powi(2) + (y[1] - x[1]).powi(2)).sqrt();
        if !ok || dist > 3.0 * h || dist < 0.1 * h {
            h *= 0.5;
            if h < 1e-9 {
                break;
            }
            continue;
        }
        let Some((_, g)) = c.f(y) else { break };
        let norm = (g[0] * g[0] + g[1] * g[1]).sqrt();
        let mut tn = [-g[1] / norm, g[0] / norm];
        if tn[0] * t[0] + tn[1] * t[1] < 0.0 {
            tn = [-tn[0], -tn[1]];
        }
        t = tn;
        x = y;
        pts.push(x);
        if !c.inside(x) {
            break;
        }
        // A closed curve: back at the start.
        if step > 10 && ((x[0] - x0[0]).powi(2) + (x[1] - x0[1]).powi(2)).sqrt() < 0.5 * h {
            break;
        }
        h = (h * 1.3).min(h0);
    }
    pts
}

/// The point where the segment p-q of the traced curve crosses an end of the parameter range (v = 0 or 1 in
/// scaled coordinates), as (parameter, radius).
fn edge_point(c: &Ctx, p: [f64; 2], q: [f64; 2]) -> (f64, f64) {
    let v = if p[1] < 0.0 || q[1] < 0.0 { 0.0 } else { 1.0 };
    let t = if q[1] != p[1] { ((v - p[1]) / (q[1] - p[1])).clamp(0.0, 1.0) } else { 0.0 };
    let (a, l) = c.point_of([p[0] + t * (q[0] - p[0]), v]);
    (l, a)
}

/// Follow every branch of static radii as parameter `name` runs over `values` (sorted, at least 2),
/// with radii in [a_lo, a_hi].
pub fn sweep(
    s: &Scenario,
    name: &str,
    values: &[f64],
    a_lo: f64,
    a_hi: f64,
    opts: &StaticsOptions,
) -> Result<SweepReport> {
    sweep_with_progress(s, name, values, a_lo, a_hi, opts, &|_, _| {})
}

/// [`sweep`], calling `progress(done, total)` after each requested value has been scanned for seeds.
pub fn sweep_with_progress(
    s: &Scenario,
    name: &str,
    values: &[f64],
    a_lo: f64,
    a_hi: f64,
    opts: &StaticsOptions,
    progress: &dyn Fn(usize, usize),
) -> Result<SweepReport> {
    let k = s.params.index(name).map_err(|e| e.context_phrase(crate::phrase![crate::RequestField::Vary]))?;
    if values.len() < 2 {
        let message = crate::phrase![crate::RequestField::Vary, " needs at least 2 values (N >= 2)"];
        return Err(Error::request(crate::ErrorKind::Input, crate::RequestField::Vary, values.len(), message));
    }
    let (l_lo, l_hi) = (values[0], values[values.len() - 1]);
    let c = Ctx { s, k, a_lo, a_hi, l_lo, l_hi };
    let mut notes = Vec::new();
    // Seeds: every static radius at every requested value.
    let mut seeds: Vec<(usize, [f64; 2])> = Vec::new();
    for (i, &l) in values.iter().enumerate() {
        let params = s.params.values_with(name, l)?;
        let rep = super::search(&s.model, &params, a_lo, a_hi, opts).map_err(|e| e.context(s.origin.label()))?;
        for r in rep.static_radii {
            seeds.push((i, c.to_uv(r.radius, l)));
        }
        progress(i + 1, values.len());
    }
    let h0 = (0.5 / values.len() as f64).min(0.02);
    let max_steps = 40 * values.len() + 4000;
    let mut covered = vec![false; seeds.len()];
    let mut branches = Vec::new();
    for si in 0..seeds.len() {
        if covered[si] {
            continue;
        }
        let x0 = seeds[si].1;
        let mut back = trace(&c, x0, -1.0, h0, max_steps);
        let fwd = trace(&c, x0, 1.0, h0, max_steps);
        back.reverse();
        back.pop();
        back.extend(fwd);
        let poly = back;
        // Crossings of the requested parameter values, in order along the curve.
        let mut points = Vec::new();
        for w in poly.windows(2) {
            for (vi, &l) in values.iter().enumerate() {
                let v = (l - l_lo) / (l_hi - l_lo);
                let (v0, v1) = (w[0][1], w[1][1]);
                if (v0 - v) * (v1 - v) > 0.0 || v0 == v1 {
                    continue;
                }
                let tt = if v1 != v0 { (v - v0) / (v1 - v0) } else { 0.0 };
                let guess = [w[0][0] + tt * (w[1][0] - w[0][0]), v];
                if let Some(x) = c.newton_along(guess, 0) {
                    let (a, _) = c.point_of(x);
                    if points.iter().any(|p: &(usize, f64)| p.0 == vi && (p.1 - a).abs() < 1e-9 * a) {
                        continue;
                    }
                    points.push((vi, a));
                }
            }
        }
        // Mark seeds on this branch as covered.
        for (sj, (vi, x)) in seeds.iter().enumerate() {
            let (a, _) = c.point_of(*x);
            if points.iter().any(|p| p.0 == *vi && (p.1 - a).abs() <= 1e-7 * a) {
                covered[sj] = true;
            }
        }
        covered[si] = true;
        // Folds: sign changes of dv along the polyline, located by a parabola through three points.
        let mut folds = Vec::new();
        for w in poly.windows(3) {
            let (d0, d1) = (w[1][1] - w[0][1], w[2][1] - w[1][1]);
            if d0 * d1 < 0.0 {
                let (a, l) = refine_fold(&c, w[0], w[1], w[2]).unwrap_or_else(|| c.point_of(w[1]));
                folds.push(Fold { value: l, radius: a });
            }
        }
        let points: Vec<BranchPoint> = points
            .into_iter()
            .filter_map(|(vi, a)| {
                let j = Junction::with_params(&s.model, s.params.values_with(name, values[vi]).ok()?);
                let (_, sv) = super::residual(&j, a)?;
                let ls = j.linear_stability(&sv);
                let v2 = j.potential_taylor(&sv, Law::Scenario)?[2];
                // The one marginal rule (`stability::marginal_scale`), with the slope at its full size.
                let scale = crate::junction::stability::marginal_scale(&ls, 1.0, a);
                Some(BranchPoint {
                    value: values[vi],
                    radius: a,
                    potential_second_derivative: v2,
                    stability: Stability::classify(v2, scale, opts.marginal_tol),
                })
            })
            .collect();
        if points.is_empty() {
            continue;
        }
        for f in &folds {
            notes.push(format!(
                "branch {}: fold near {name} = {:.8}, a = {:.8}: two static radii merge there (stability changes across it)",
                branches.len() + 1,
                f.value,
                f.radius
            ));
        }
        // The traced curve inside the parameter range, cut exactly at its ends (linear between the steps
        // across an end, in the scaled coordinates).
        let mut curve: Vec<(f64, f64)> = Vec::new();
        let inside = |v: f64| (-1e-12..=1.0 + 1e-12).contains(&v);
        for (k, x) in poly.iter().enumerate() {
            if inside(x[1]) {
                if k > 0 && !inside(poly[k - 1][1]) {
                    curve.push(edge_point(&c, poly[k - 1], *x));
                }
                let (a, l) = c.point_of(*x);
                curve.push((l, a));
            } else if k > 0 && inside(poly[k - 1][1]) {
                curve.push(edge_point(&c, poly[k - 1], *x));
            }
        }
        curve.retain(|p| p.0.is_finite() && p.1.is_finite());
        branches.push(Branch { id: branches.len() + 1, points, folds, curve });
    }
    Ok(SweepReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        parameter: name.to_string(),
        values: values.to_vec(),
        radius_range: [a_lo, a_hi],
        branches,
        notes,
    })
}
