//! Static radii at a parameter point from those of a neighbouring point, for maps over two parameters.
//!
//! The full search ([`super::search`]) samples the range densely for horizons and for roots of
//! f(a) = p0(a) - P(sigma0(a)). Next to a point already searched, the structure is known: how many horizons each
//! side has and how many static radii and poles of f lie between them. [`continue_search`] samples coarsely
//! (adding the midpoint between each two neighbouring predicted roots, so that a close pair near a fold stays
//! bracketed), refines every sign change with the safeguarded Newton-bisection of the full search started from
//! the neighbour's root (`roots::refine_from`; a bracket holding the neighbour's pole is only bisected), and
//! accepts the result only if it reproduces the neighbour's structure exactly: the same number of simple horizons
//! per side, the same number of static radii and of poles in each window between cuts, no radius double or
//! within 1e-6 of a horizon, and no sample where the static condition holds identically. Anything else returns
//! `None`, and the caller runs the full search; so does every model with a side whose B differs from A (its
//! zeros of A off a horizon cut the range and are not continued). Structure that appears between two coarse
//! samples and nowhere else (a pair of static radii closer than the coarse spacing, born between two neighbouring
//! cells) is found once it has grown to the spacing, or at the next full search (the first cell of every line).

use super::{
    classify, intervals_between, is_rounding, radius_notes, residual_with_jets, Cut, CutKind, StaticSearch,
    StaticsOptions,
};
use crate::junction::Junction;
use crate::metric::SideFns;
use crate::model::{MetricSide, Model, Which};
use crate::roots::{refine_from, sample_points};
use num_dual::Dual64;

/// Samples over the whole range for horizons, and over each searched interval for static radii.
pub const COARSE_SAMPLES: usize = 32;

/// The static radii at `params`, predicted by `prev` (the search at a neighbouring point of the same range) and
/// confirmed by a coarse search; `None` where the structure changed or cannot be confirmed cheaply.
pub fn continue_search(
    m: &Model,
    params: &[f64],
    prev: &StaticSearch,
    lo: f64,
    hi: f64,
    opts: &StaticsOptions,
) -> Option<StaticSearch> {
    let plain = prev.neutral_intervals.is_empty()
        && prev.cuts.iter().all(|c| c.kind == CutKind::Horizon)
        && prev.static_radii.iter().all(|r| !r.double_root && !r.near_horizon)
        && [&m.minus, &m.plus].iter().all(|s| s.metric.b_is_a());
    if !plain {
        return None;
    }
    let mut cuts = Vec::new();
    for w in [Which::Minus, Which::Plus] {
        let fns = SideFns::of(m.side(w), params);
        let value = |r: f64| Some(fns.b(r));
        let b = |r: f64| {
            let d: Dual64 = fns.b(Dual64::new(r, 1.0));
            Some((d.re, d.eps))
        };
        let guesses: Vec<f64> = prev.cuts.iter().filter(|c| c.side == w).map(|c| c.radius).collect();
        let (found, poles) = sign_changes(&value, &b, &samples_with_gaps(lo, hi, &guesses), (&guesses, &[]), opts)?;
        if !poles.is_empty() || found.len() != prev.cuts.iter().filter(|c| c.side == w).count() {
            return None;
        }
        cuts.extend(found.into_iter().map(|radius| Cut { radius, side: w, kind: CutKind::Horizon }));
    }
    let (intervals, mut notes, windows) = intervals_between(m, params, lo, hi, &cuts, opts);
    if windows != prev.windows {
        return None;
    }
    let j0 = Junction::with_params(m, params.to_vec());
    let j1: Junction<Dual64> = Junction::with_params(m, super::lift_params(params));
    // First-order jets suffice for sigma0, p0 and the rule; nested in Dual64 they give the residual's slope too.
    let jets =
        |j: &Junction<Dual64>, a: Dual64| (j.first_order_jet(Which::Minus, a), j.first_order_jet(Which::Plus, a));
    let f = |a: f64| {
        let x = Dual64::new(a, 1.0);
        let (jm, jp) = jets(&j1, x);
        residual_with_jets(&j1, x, jm, jp).map(|(v, _)| (v.re, v.eps))
    };
    let mut radii = Vec::new();
    let mut poles = Vec::new();
    for (iv, old) in intervals.iter().zip(&prev.intervals) {
        let inside = |r: f64| r >= old.from && r <= old.to;
        let guesses: Vec<f64> = prev.static_radii.iter().map(|r| r.radius).filter(|&r| inside(r)).collect();
        let xs = samples_with_gaps(iv.from, iv.to, &guesses);
        // One plain evaluation per sample serves the sign scan and the test for a neutral family.
        let neutral = std::cell::Cell::new(false);
        let value = |a: f64| {
            let (jm, jp) = (j0.first_order_jet(Which::Minus, a), j0.first_order_jet(Which::Plus, a));
            let (v, sv) = residual_with_jets(&j0, a, jm, jp)?;
            neutral.set(neutral.get() || is_rounding(v, &sv, opts));
            Some(v)
        };
        let known_poles: Vec<f64> = prev.poles_rejected.iter().copied().filter(|&p| inside(p)).collect();
        let (roots, new_poles) = sign_changes(&value, &f, &xs, (&guesses, &known_poles), opts)?;
        if neutral.get() {
            return None;
        }
        let before = prev.static_radii.iter().filter(|r| inside(r.radius)).count();
        let poles_before = prev.poles_rejected.iter().filter(|&&p| inside(p)).count();
        if roots.len() != before || new_poles.len() != poles_before {
            return None;
        }
        for a in roots {
            radii.push(classify(&j0, a, false, opts).filter(|r| !r.near_horizon)?);
        }
        poles.extend(new_poles);
    }
    radius_notes(&radii, &poles, &mut notes);
    Some(StaticSearch {
        intervals,
        neutral_intervals: vec![],
        static_radii: radii,
        poles_rejected: poles,
        notes,
        cuts,
        windows,
    })
}

/// The coarse samples of [lo, hi] plus the midpoint between each two consecutive predicted roots: a pair of
/// roots closer together than the coarse spacing (near a fold) is then still bracketed while it persists.
fn samples_with_gaps(lo: f64, hi: f64, predicted: &[f64]) -> Vec<f64> {
    let mut xs = sample_points(lo, hi, COARSE_SAMPLES);
    xs.extend(predicted.windows(2).map(|w| 0.5 * (w[0] + w[1])).filter(|&m| m > lo && m < hi));
    xs.sort_by(f64::total_cmp);
    xs.dedup();
    xs
}

/// Every sign change of `value` between consecutive samples `xs`, refined to a root of `f` (value and
/// derivative) and sorted into roots and poles (a sign change where |f| does not drop below its end values);
/// `None` if the function is undefined at a sample or vanishes exactly at one. Newton starts from the predicted
/// roots (`predicted.0`, the neighbour's, in order) that fall in a bracket, else from its midpoint. A bracket
/// that holds a predicted pole (`predicted.1`) and no predicted root is bisected on `value` alone to a relative
/// width of `Tolerances::statics.pole_width`: a pole only bounds the search, and Newton steps are of no use next to one.
fn sign_changes<V, F>(
    value: &V,
    f: &F,
    xs: &[f64],
    predicted: (&[f64], &[f64]),
    opts: &StaticsOptions,
) -> Option<(Vec<f64>, Vec<f64>)>
where
    V: Fn(f64) -> Option<f64>,
    F: Fn(f64) -> Option<(f64, f64)>,
{
    let vs: Vec<f64> = xs.iter().map(|&x| value(x)).collect::<Option<_>>()?;
    if vs.iter().any(|&v| v == 0.0 || !v.is_finite()) {
        return None;
    }
    let (mut roots, mut poles) = (Vec::new(), Vec::new());
    for k in 0..xs.len() - 1 {
        if vs[k].signum() != vs[k + 1].signum() {
            let (a, b) = (xs[k], xs[k + 1]);
            let within = |g: &f64| *g > a && *g < b;
            let guess = predicted.0.iter().copied().find(within);
            let end_min = vs[k].abs().min(vs[k + 1].abs());
            let refined = |x0: f64| {
                let x = refine_from(f, (a, vs[k]), (b, vs[k + 1]), x0, &opts.roots)?;
                Some((x, f(x)?.0))
            };
            let (x, v) = match (guess, predicted.1.iter().any(within)) {
                // Not a pole after all: a root, refined to full precision from where the bisection stopped.
                (None, true) => match bisect(value, (a, vs[k]), (b, vs[k + 1]))? {
                    (x, v) if v.abs() <= end_min => refined(x)?,
                    pole => pole,
                },
                _ => refined(guess.unwrap_or(0.5 * (a + b)))?,
            };
            if v.abs() > end_min {
                poles.push(x);
            } else {
                roots.push(x);
            }
        }
    }
    Some((roots, poles))
}

/// Bisection of a sign change of `value` on [a, b] to a relative width of `Tolerances::statics.pole_width`:
/// the midpoint and the value there.
fn bisect<V: Fn(f64) -> Option<f64>>(value: &V, (mut a, fa): (f64, f64), (mut b, _): (f64, f64)) -> Option<(f64, f64)> {
    let mut m = 0.5 * (a + b);
    let mut vm = value(m)?;
    while (b - a).abs() > crate::tolerances::TOL.statics.pole_width * m.abs() {
        if vm.signum() == fa.signum() {
            a = m;
        } else {
            b = m;
        }
        m = 0.5 * (a + b);
        vm = value(m)?;
        if vm == 0.0 {
            break;
        }
    }
    Some((m, vm))
}
