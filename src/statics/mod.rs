//! Static shells with an equation of state: every static radius in an interval, each classified by V''(a0).
//!
//! A static radius a0 of a timelike shell with p = P(sigma) is a root of f(a) = p0(a) - P(sigma0(a)), where
//! sigma0, p0 are the static junction values (Poisson & Visser 1995; Garcia, Lobo & Visser 2012). The search runs
//! over the part of the interval where both sides are R-regions (the only places a static timelike shell can
//! sit), split at horizons, with the failure modes made explicit (see `roots`).

pub mod continuation;
pub mod sweep;
pub mod tune;

use crate::error::{Error, Result};
use crate::expr::Scalar;
use crate::junction::potential::Law;
use crate::junction::{admissible, Jet, Junction, StaticValues};
use crate::metric::{horizons, SideFns};
use crate::model::{Model, ShellKind, Which};
use crate::roots::{find_roots, RootKind, RootOptions};
use crate::scenario::Scenario;
use crate::tolerances::TOL;
use num_dual::{Dual2, Dual64};
use serde::Serialize;

/// Tolerances for static-radius work; the defaults are the named fields of [`crate::tolerances::Tolerances`].
#[derive(Debug, Clone, Copy)]
pub struct StaticsOptions {
    /// Root finding.
    pub roots: RootOptions,
    /// Relative |V''| below which a static radius is called marginal.
    pub marginal_tol: f64,
    /// Relative distance to a horizon below which a result is flagged as ill-conditioned.
    pub near_horizon: f64,
    /// Horizons are cut out of the search interval by this relative margin.
    pub horizon_margin: f64,
    /// |p0 - P(sigma0)| below this, relative to the size of the terms it is made of, counts as zero for the
    /// test of an identically satisfied static condition.
    pub identically_static_tol: f64,
    /// At least this many consecutive samples with a vanishing residual make a neutral interval.
    pub identically_static_run: usize,
}

impl Default for StaticsOptions {
    fn default() -> Self {
        StaticsOptions {
            roots: RootOptions { samples: 3000, ..Default::default() },
            marginal_tol: TOL.stability.marginal,
            near_horizon: TOL.horizon.near_warning,
            horizon_margin: TOL.statics.horizon_margin,
            identically_static_tol: TOL.statics.identically_static,
            identically_static_run: 8,
        }
    }
}

/// Linear verdict from V''(a0).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Stability {
    /// V'' > 0.
    Stable,
    /// V'' < 0.
    Unstable,
    /// |V''| within tolerance of zero: the linear test does not decide.
    Marginal,
}

impl Stability {
    /// Classify V'' relative to a scale.
    pub fn classify(v2: f64, scale: f64, tol: f64) -> Stability {
        if v2.abs() <= tol * scale.max(f64::MIN_POSITIVE) {
            Stability::Marginal
        } else if v2 > 0.0 {
            Stability::Stable
        } else {
            Stability::Unstable
        }
    }

    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            Stability::Stable => "stable",
            Stability::Unstable => "unstable",
            Stability::Marginal => "marginal",
        }
    }
}

/// One static radius.
#[derive(Debug, Clone, Serialize)]
pub struct StaticRadius {
    /// a0.
    pub radius: f64,
    /// sigma0.
    pub sigma: f64,
    /// p0 (= P(sigma0) to the residual).
    pub pressure: f64,
    /// V''(a0) with the scenario's law.
    pub potential_second_derivative: f64,
    /// Verdict.
    pub stability: Stability,
    /// beta^2 = P'(sigma0).
    pub beta2: f64,
    /// The critical beta^2 at a0 (null if V'' does not depend on beta^2).
    pub beta2_critical: Option<f64>,
    /// |p0 - P(sigma0)| at the returned radius.
    pub residual: f64,
    /// V(a0) and V'(a0): both vanish at a static solution (a check).
    pub potential: [f64; 2],
    /// Shell mass.
    pub shell_mass: f64,
    /// True for a double (tangent) root: ill-conditioned, may split or vanish under small changes.
    pub double_root: bool,
    /// True if within a relative 1e-6 of a horizon (ill-conditioned).
    pub near_horizon: bool,
    /// Energy conditions at the static values.
    pub energy_conditions: crate::junction::EnergyConditions,
}

/// A search interval (part of the requested range where both sides are R-regions).
#[derive(Debug, Clone, Copy, Serialize)]
pub struct Interval {
    /// Lower end.
    pub from: f64,
    /// Upper end.
    pub to: f64,
}

/// The result of a static-radius search.
#[derive(Debug, Clone, Serialize)]
pub struct StaticsReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance line.
    pub provenance: String,
    /// The law p(sigma) as typed.
    pub equation_of_state: String,
    /// Requested range.
    pub from: f64,
    /// Requested range.
    pub to: f64,
    /// Intervals searched (the requested range split at horizons, keeping R-regions on both sides).
    pub intervals: Vec<Interval>,
    /// Intervals on which the static condition holds identically (p0 - P(sigma0) vanishes to rounding relative
    /// to its terms): every radius there is static and neutral (V = V' = V'' = 0 along the family); no roots are
    /// listed inside them.
    pub neutral_intervals: Vec<Interval>,
    /// Static radii, sorted (none inside a neutral interval).
    pub static_radii: Vec<StaticRadius>,
    /// Sign changes rejected as poles (e.g. where sigma0 = 0 under a Chaplygin law).
    pub poles_rejected: Vec<f64>,
    /// Notes for the reader (horizon splits, ill-conditioned roots).
    pub notes: Vec<String>,
}

/// f(a) = p0(a) - P(sigma0(a)) and the static values, at any number type; `None` where a static timelike shell
/// cannot sit (a side not in an R-region) or the law is undefined.
pub fn residual<T: Scalar>(j: &Junction<T>, a: T) -> Option<(T, StaticValues<T>)> {
    residual_with_jets(j, a, j.jet(Which::Minus, a), j.jet(Which::Plus, a))
}

/// [`residual`] from the two sides' jets at `a` (first derivatives suffice: [`Junction::first_order_jet`]).
pub fn residual_with_jets<T: Scalar>(j: &Junction<T>, a: T, jm: Jet<T>, jp: Jet<T>) -> Option<(T, StaticValues<T>)> {
    let re = |j: &Jet<T>| Jet { a: j.a.map(|x| x.re()), b: j.b.map(|x| x.re()) };
    admissible::static_site(j.shape.kind, j.shape.keep, a.re(), [&re(&jm), &re(&jp)]).ok()?;
    let stress = j.stress_with_jets(&jm, &jp, a, T::zero(), T::zero()).ok()?;
    let p_law = j.eos_at(stress.sigma(), |t| t)?;
    let f = stress.pressure() - p_law;
    if !f.re().is_finite() {
        return None;
    }
    Some((f, StaticValues { a, stress, jets: [jm, jp] }))
}

/// True when the law holds at a radius: |p0 - P(sigma0)| <= `Tolerances::statics.law_residual` (|p0| + |sigma0|),
/// with `f` = p0 - P(sigma0) as [`residual`] gives it. The one test of "is this a static radius of the law" for
/// a radius given by the user (evolve's static start, derive's warning); |sigma0| in the scale keeps the test
/// meaningful where p0 and P(sigma0) both vanish (a dust shell).
pub fn law_holds(f: f64, sigma0: f64, p0: f64) -> bool {
    f.abs() <= crate::tolerances::TOL.statics.law_residual * (p0.abs() + sigma0.abs()).max(f64::MIN_POSITIVE)
}

/// Parameters lifted into a dual type (constants).
pub fn lift_params<T: Scalar>(params: &[f64]) -> Vec<T> {
    params.iter().map(|&p| T::from(p)).collect()
}

/// Where the search range is cut: a horizon (a root of B), a pole of B, or a zero of A off a horizon.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CutKind {
    /// A simple root of B.
    Horizon,
    /// A degenerate (double) root of B.
    DegenerateHorizon,
    /// A sign change of B through a pole.
    Pole,
    /// A zero of A that is not a zero of B (the metric changes signature there).
    AZero,
}

/// One cut of the search range.
#[derive(Debug, Clone, Copy)]
pub struct Cut {
    /// Radius.
    pub radius: f64,
    /// The side it belongs to.
    pub side: Which,
    /// What vanishes or diverges there.
    pub kind: CutKind,
}

/// The note a cut leaves in a statics report.
pub(crate) fn cut_note(c: &Cut) -> String {
    let (r, w) = (c.radius, c.side);
    match c.kind {
        CutKind::Horizon | CutKind::DegenerateHorizon => {
            format!("the range is split at the horizon r = {r:.12} of the {w} side")
        }
        CutKind::Pole => format!("the range is split where B of the {w} side passes through a pole near r = {r:.6}"),
        CutKind::AZero => format!("the range is split where A of the {w} side vanishes off a horizon, r = {r:.12}"),
    }
}

/// The parts of [lo, hi] where both sides are R-regions (B > 0), with horizons cut out by a small margin.
pub fn r_region_intervals(
    m: &Model,
    params: &[f64],
    lo: f64,
    hi: f64,
    opts: &StaticsOptions,
) -> (Vec<Interval>, Vec<String>) {
    let cuts = range_cuts(m, params, lo, hi, opts);
    let (out, notes, _) = intervals_between(m, params, lo, hi, &cuts, opts);
    (out, notes)
}

/// Every cut of [lo, hi]: horizons and poles of B on each side, zeros of A off a horizon where B is given.
pub fn range_cuts(m: &Model, params: &[f64], lo: f64, hi: f64, opts: &StaticsOptions) -> Vec<Cut> {
    let mut cuts: Vec<Cut> = vec![];
    for w in [Which::Minus, Which::Plus] {
        let fns = SideFns::of(m.side(w), params);
        let (hs, poles) = horizons(&fns, lo, hi, &opts.roots);
        for h in hs {
            let kind = if h.degenerate { CutKind::DegenerateHorizon } else { CutKind::Horizon };
            cuts.push(Cut { radius: h.radius, side: w, kind });
        }
        for p in poles {
            cuts.push(Cut { radius: p, side: w, kind: CutKind::Pole });
        }
        if !fns.b_is_a() {
            // Zeros of A that are not zeros of B bound the parts where the metric changes signature.
            let a_fns = fns.a_as_b();
            let at_horizon = |x: f64| cuts.iter().any(|c| (c.radius - x).abs() <= 1e-9 * x.abs().max(1.0));
            let zeros: Vec<f64> = horizons(&a_fns, lo, hi, &opts.roots)
                .0
                .into_iter()
                .map(|h| h.radius)
                .filter(|&x| !at_horizon(x))
                .collect();
            for x in zeros {
                cuts.push(Cut { radius: x, side: w, kind: CutKind::AZero });
            }
        }
    }
    cuts
}

/// The searched intervals between cuts (ends nudged off horizons until admitted), the notes, and for each
/// interval the index of the window between cuts it came from.
pub(crate) fn intervals_between(
    m: &Model,
    params: &[f64],
    lo: f64,
    hi: f64,
    cuts: &[Cut],
    opts: &StaticsOptions,
) -> (Vec<Interval>, Vec<String>, Vec<usize>) {
    let mut notes: Vec<String> = cuts.iter().map(cut_note).collect();
    let mut cuts: Vec<f64> = cuts.iter().map(|c| c.radius).collect();
    cuts.sort_by(|a, b| a.total_cmp(b));
    let mut edges = vec![lo];
    edges.extend(cuts.into_iter().filter(|c| *c > lo && *c < hi));
    edges.push(hi);
    let mut out = Vec::new();
    let mut window = Vec::new();
    for (wi, w) in edges.windows(2).enumerate() {
        let (mut a, mut b) = (w[0] * (1.0 + opts.horizon_margin), w[1] * (1.0 - opts.horizon_margin));
        // Ends next to a horizon move inward until the admissibility rule accepts them (the horizon tolerance
        // scales with r |B'|), so that the searched interval starts where `derive` would accept a radius.
        let on_horizon =
            |r: f64| matches!(admissible_at(m, params, r), Err(admissible::Inadmissible::OnHorizon { .. }));
        let mut margin = opts.horizon_margin;
        while on_horizon(a) && margin < 1e-3 && a < b {
            margin *= 2.0;
            a = w[0] * (1.0 + margin);
        }
        let mut margin = opts.horizon_margin;
        while on_horizon(b) && margin < 1e-3 && a < b {
            margin *= 2.0;
            b = w[1] * (1.0 - margin);
        }
        if b <= a {
            continue;
        }
        let mid = 0.5 * (a + b);
        match admissible_at(m, params, mid) {
            Ok(()) => {
                out.push(Interval { from: a, to: b });
                window.push(wi);
            }
            Err(why @ admissible::Inadmissible::Signature { side, .. }) => notes.push(format!(
                "skipped {:.6} < r < {:.6}: the metric of the {side} side changes signature there ({why} at r = {mid:.6}; no shell can sit there)",
                w[0], w[1]
            )),
            Err(admissible::Inadmissible::KeepContradicts { side, keep, .. }) => notes.push(format!(
                "skipped {:.6} < r < {:.6}: the {side} side keeps \"{}\" (a T-region) but is an R-region there",
                w[0],
                w[1],
                keep.name()
            )),
            Err(_) => notes.push(format!(
                "skipped {:.6} < r < {:.6}: a side is a T-region there (no static timelike shell)",
                w[0], w[1]
            )),
        }
    }
    (out, notes, window)
}

/// The admissibility rule ([`admissible::static_site`]) for a static shell of the model at radius r.
pub fn admissible_at(m: &Model, params: &[f64], r: f64) -> std::result::Result<(), admissible::Inadmissible> {
    let j = Junction::with_params(m, params.to_vec());
    let jets = [j.jet(Which::Minus, r), j.jet(Which::Plus, r)];
    admissible::static_site(m.kind, [m.minus.keep, m.plus.keep], r, [&jets[0], &jets[1]])
}

/// Classify one static radius with the model's law.
pub fn classify(j: &Junction<f64>, a: f64, double_root: bool, opts: &StaticsOptions) -> Option<StaticRadius> {
    let (f, sv) = residual(j, a)?;
    let ls = j.linear_stability(&sv);
    let sigma = sv.stress.sigma();
    let (_, beta) = j.law_and_slope(sigma)?;
    let v = j.potential_taylor(&sv, Law::Scenario)?;
    let scale = crate::junction::stability::marginal_scale(&ls, beta, a);
    let near = sv.jets.iter().any(|j| admissible::near_horizon(a, j.b[0], j.b[1], opts.near_horizon));
    Some(StaticRadius {
        radius: a,
        sigma,
        pressure: sv.stress.pressure(),
        potential_second_derivative: v[2],
        stability: Stability::classify(v[2], scale, opts.marginal_tol),
        beta2: beta,
        beta2_critical: ls.beta2_critical,
        residual: f.abs(),
        potential: [v[0], v[1]],
        shell_mass: crate::junction::conditions::shell_mass(a, sigma, j.dimension),
        double_root,
        near_horizon: near,
        energy_conditions: crate::junction::EnergyConditions::evaluate(sigma, sv.stress.pressure(), j.dimension),
    })
}

/// The parts of a search interval where the static condition holds identically: runs of at least
/// `opts.identically_static_run` consecutive samples (`roots::sample_points`, as in the root search) at which
/// |p0 - P(sigma0)| <= `opts.identically_static_tol` * (sum of |K^tau_tau_i| and |K^theta_theta_i| over 8 pi + |P|),
/// i.e. the residual is rounding noise of the terms it is built from. An isolated root never qualifies: near a
/// simple (double) root the residual is that small only within ~1e-10 (1e-5) of the radius, far less than the
/// sample spacing. Example: dust (p = 0), flat inside, extremal Reissner-Nordstrom outside: p0 = 0 at every radius.
pub fn neutral_intervals(j: &Junction<f64>, iv: &Interval, opts: &StaticsOptions) -> Vec<Interval> {
    let xs = crate::roots::sample_points(iv.from, iv.to, opts.roots.samples);
    let zero: Vec<bool> = xs.iter().map(|&a| residual_is_rounding(j, a, opts)).collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < xs.len() {
        if !zero[i] {
            i += 1;
            continue;
        }
        let start = i;
        while i < xs.len() && zero[i] {
            i += 1;
        }
        if i - start >= opts.identically_static_run.max(2) {
            out.push(Interval { from: xs[start], to: xs[i - 1] });
        }
    }
    out
}

/// The static radii of a model's law in a range: the searched intervals, neutral intervals, radii, rejected
/// poles and notes (the physics of [`StaticsReport`] without the scenario's metadata).
#[derive(Debug, Clone)]
pub struct StaticSearch {
    /// Intervals searched.
    pub intervals: Vec<Interval>,
    /// Intervals on which the static condition holds identically.
    pub neutral_intervals: Vec<Interval>,
    /// Static radii, sorted.
    pub static_radii: Vec<StaticRadius>,
    /// Sign changes rejected as poles.
    pub poles_rejected: Vec<f64>,
    /// Notes for the reader.
    pub notes: Vec<String>,
    /// Where the range was cut (horizons, poles, zeros of A).
    pub cuts: Vec<Cut>,
    /// For each searched interval, the index of the window between consecutive cuts it lies in.
    pub windows: Vec<usize>,
}

/// True where |p0 - P(sigma0)| is rounding noise of the terms it is built from (the test of
/// [`neutral_intervals`]).
pub(crate) fn residual_is_rounding(j: &Junction<f64>, a: f64, opts: &StaticsOptions) -> bool {
    residual(j, a).is_some_and(|(f, sv)| is_rounding(f, &sv, opts))
}

/// The test of [`residual_is_rounding`] on a residual already computed.
pub(crate) fn is_rounding(f: f64, sv: &StaticValues<f64>, opts: &StaticsOptions) -> bool {
    let st = &sv.stress;
    let terms = (st.k_ss.iter().chain(&st.k_thth).map(|k| k.abs()).sum::<f64>()) / (8.0 * std::f64::consts::PI)
        + (st.pressure() - f).abs();
    f.abs() <= opts.identically_static_tol * terms && terms > 0.0
}

/// Every static radius of the scenario's equation of state in [lo, hi], at the scenario's parameter values.
pub fn find_static_radii(s: &Scenario, lo: f64, hi: f64, opts: &StaticsOptions) -> Result<StaticsReport> {
    let eos = s.shell.eos.as_ref().ok_or_else(|| {
        Error::input(format!("{}: the scenario has no equation of state", s.origin.label()))
            .with_hint("add [shell] pressure = \"...\" (e.g. \"w*sigma\"), or use `junctura derive` for beta^2 stability at a chosen radius")
    })?;
    let found = search(&s.model, s.params.values(), lo, hi, opts).map_err(|e| e.context(s.origin.label()))?;
    Ok(StaticsReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        equation_of_state: eos.source().to_string(),
        from: lo,
        to: hi,
        intervals: found.intervals,
        neutral_intervals: found.neutral_intervals,
        static_radii: found.static_radii,
        poles_rejected: found.poles_rejected,
        notes: found.notes,
    })
}

/// Every static radius of the model's equation of state in [lo, hi] at the parameter values `params`.
pub fn search(m: &Model, params: &[f64], lo: f64, hi: f64, opts: &StaticsOptions) -> Result<StaticSearch> {
    if m.law.is_none() {
        return Err(Error::input("the model has no equation of state"));
    }
    if m.kind != ShellKind::Timelike {
        return Err(Error::input("static radii with an equation of state need a timelike shell"));
    }
    let cuts = range_cuts(m, params, lo, hi, opts);
    let (intervals, mut notes, windows) = intervals_between(m, params, lo, hi, &cuts, opts);
    if intervals.is_empty() {
        // The same refusal as `derive` where the whole range is refused for the metric itself (a signature
        // change, or a keep the region contradicts), rather than an empty list.
        let mid = 0.5 * (lo + hi);
        match admissible_at(m, params, mid) {
            Err(
                why @ (admissible::Inadmissible::Signature { .. } | admissible::Inadmissible::KeepContradicts { .. }),
            ) => {
                return Err(crate::junction::admissible_error(mid, why)
                    .context(format!("no static shell can sit anywhere in {lo} < r < {hi}")));
            }
            _ => notes.push(
                "no part of the range has both sides in an R-region: no static timelike shell is possible".into(),
            ),
        }
    }
    let j1: Junction<Dual64> = Junction::with_params(m, lift_params(params));
    let j2: Junction<Dual2<f64, f64>> = Junction::with_params(m, lift_params(params));
    let j0 = Junction::with_params(m, params.to_vec());
    let f = |a: f64| residual(&j1, Dual64::new(a, 1.0)).map(|(v, _)| (v.re, v.eps));
    let fp = |a: f64| residual(&j2, Dual2::new(a, 1.0, 0.0)).map(|(v, _)| (v.v1, v.v2));
    let mut radii = Vec::new();
    let mut poles = Vec::new();
    let mut neutral = Vec::new();
    for iv in &intervals {
        let nv = neutral_intervals(&j0, iv, opts);
        // A sample spacing of slack on each side: the run's ends are the last samples found neutral.
        let step = (iv.to - iv.from) / opts.roots.samples as f64;
        let inside =
            |x: f64| nv.iter().any(|n| x >= n.from - step.max(1e-6 * n.from) && x <= n.to + step.max(1e-6 * n.to));
        let scan = find_roots(&f, Some(&fp), iv.from, iv.to, &opts.roots);
        poles.extend(scan.poles.iter().map(|p| p.x).filter(|&x| !inside(x)));
        neutral.extend(nv.iter().copied());
        for r in scan.roots.into_iter().filter(|r| !inside(r.x)) {
            if let Some(sr) = classify(&j0, r.x, r.kind == RootKind::Double, opts) {
                radii.push(sr);
            }
        }
    }
    radius_notes(&radii, &poles, &mut notes);
    Ok(StaticSearch {
        intervals,
        neutral_intervals: neutral,
        static_radii: radii,
        poles_rejected: poles,
        notes,
        cuts,
        windows,
    })
}

/// The notes on ill-conditioned radii (double roots, near a horizon, near a fold) and rejected poles.
pub(crate) fn radius_notes(radii: &[StaticRadius], poles: &[f64], notes: &mut Vec<String>) {
    for sr in radii {
        if sr.double_root {
            notes.push(format!("a0 = {:.10} is a double root (p0 - P(sigma0) touches zero without crossing): ill-conditioned, a small change of parameters splits or removes it", sr.radius));
        }
        if sr.near_horizon {
            notes.push(format!("a0 = {:.10} is within a relative 1e-6 of a horizon: ill-conditioned", sr.radius));
        }
    }
    for p in poles {
        notes.push(format!("p0 - P(sigma0) changes sign through a pole near a = {p:.8}: not a static radius"));
    }
    for w in radii.windows(2) {
        if (w[1].radius - w[0].radius).abs() < 1e-6 * w[0].radius {
            notes.push(format!(
                "static radii {:.10} and {:.10} are very close: they are near a fold (ill-conditioned)",
                w[0].radius, w[1].radius
            ));
        }
    }
}
