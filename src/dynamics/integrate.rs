//! The integration driver: adaptive Dormand-Prince steps along the shell's motion, turning points and crossings
//! of the static radius located inside steps, and every stop condition made explicit.

use super::dopri::{hermite, hermite_root, next_step, step, Tolerances, Vec3};
use super::motion::{Halt, Motion};
use crate::model::Which;
use serde::Serialize;

/// Tolerances and limits of `evolve`, in one place.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EvolveOptions {
    /// Error control of the Runge-Kutta pair.
    pub tol: Tolerances,
    /// Stop after this many turning points (Rdot changing sign; the start at rest does not count).
    pub max_turns: usize,
    /// Stop after this many accepted steps.
    pub max_steps: usize,
    /// Smallest step, relative to max(duration, R at the start); below it the motion is stopped.
    pub min_step: f64,
    /// First step, relative to R at the start.
    pub initial_step: f64,
    /// |B| below this (relative to 1 + R |B'|) counts as reaching a horizon.
    pub horizon_tol: f64,
    /// R below this fraction of the starting R counts as reaching the centre.
    pub center_tol: f64,
    /// Keep the time series (false for ensemble members, which keep only their summary).
    pub keep_samples: bool,
    /// An ensemble member counts as bounded if it never moves farther than this many spreads S from a0.
    pub bound_factor: f64,
    /// Stop where the shell reaches a horizon of either side (B -> 0) instead of crossing it.
    pub stop_at_horizon: bool,
    /// A step underflow below this fraction of the starting R while moving inward counts as reaching the
    /// centre (R -> 0 is approached with |Rdot| -> infinity, e.g. a dust shell, where the steps shrink like R^2).
    pub center_underflow: f64,
}

impl Default for EvolveOptions {
    fn default() -> Self {
        EvolveOptions {
            tol: Tolerances::default(),
            max_turns: 20,
            max_steps: 2_000_000,
            min_step: 1e-13,
            initial_step: 1e-3,
            horizon_tol: 1e-9,
            center_tol: 1e-6,
            keep_samples: true,
            bound_factor: 10.0,
            stop_at_horizon: false,
            center_underflow: 1e-3,
        }
    }
}

/// Why the integration ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum StopReason {
    /// The requested duration was reached.
    Duration,
    /// The maximum number of turning points was reached (the run ends exactly at the last one).
    MaxTurns,
    /// A side's B reached zero and `stop_at_horizon` was asked for.
    Horizon,
    /// R reached (numerically) zero.
    Center,
    /// Rdot^2 + B <= 0 on a side.
    NoShellState,
    /// The equation of state is undefined (e.g. sigma reaching zero under p = -c/sigma).
    LawUndefined,
    /// A and B of a side have opposite signs there (the metric changes signature).
    SignatureChange,
    /// A value became NaN or infinite.
    NonFinite,
    /// The error control asked for a step below the smallest allowed step (a singularity of the motion).
    StepUnderflow,
    /// The step limit was reached.
    StepLimit,
}

impl StopReason {
    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            StopReason::Duration => "duration",
            StopReason::MaxTurns => "max_turns",
            StopReason::Horizon => "horizon",
            StopReason::Center => "center",
            StopReason::NoShellState => "no_shell_state",
            StopReason::LawUndefined => "law_undefined",
            StopReason::SignatureChange => "signature_change",
            StopReason::NonFinite => "non_finite",
            StopReason::StepUnderflow => "step_underflow",
            StopReason::StepLimit => "step_limit",
        }
    }

    fn from_halt(h: Halt) -> (StopReason, Option<Which>) {
        match h {
            Halt::Horizon(w) => (StopReason::Horizon, Some(w)),
            Halt::Center => (StopReason::Center, None),
            Halt::NoShellState => (StopReason::NoShellState, None),
            Halt::LawUndefined => (StopReason::LawUndefined, None),
            Halt::Signature(w) => (StopReason::SignatureChange, Some(w)),
            Halt::NonFinite => (StopReason::NonFinite, None),
        }
    }
}

/// One accepted point of the motion.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Sample {
    /// Proper time tau.
    pub tau: f64,
    /// R.
    pub radius: f64,
    /// dR/dtau.
    pub rdot: f64,
    /// sigma.
    pub sigma: f64,
    /// p = P(sigma).
    pub pressure: f64,
    /// Rdot^2 + V(R, sigma) (zero on an exact solution).
    pub constraint: f64,
    /// n^r on [minus, plus] (`Motion::normals`): its sign is the direction of the normal in r on that side.
    pub n_r: [f64; 2],
}

/// A turning point (Rdot = 0), located by Hermite interpolation inside the step.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TurningPoint {
    /// Proper time.
    pub tau: f64,
    /// Radius there.
    pub radius: f64,
}

/// A crossing of the reference radius a0.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Crossing {
    /// Proper time.
    pub tau: f64,
    /// True when moving outward.
    pub outward: bool,
}

/// What happened at an event of the motion.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EventKind {
    /// R passed through a horizon of a side (a root of B, simple or degenerate).
    HorizonCrossing,
    /// Rdot changed sign.
    TurningPoint,
    /// n^r on a side passed through zero and changed sign (only possible in a T-region, X_i^2 = Rdot^2 + B_i).
    NormalFlip,
    /// R reached (numerically) zero.
    Center,
    /// The run ended (the stop word is in the detail).
    Stop,
}

impl EventKind {
    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            EventKind::HorizonCrossing => "horizon_crossing",
            EventKind::TurningPoint => "turning_point",
            EventKind::NormalFlip => "normal_flip",
            EventKind::Center => "center",
            EventKind::Stop => "stop",
        }
    }
}

/// One event along the motion, located inside its step on cubic Hermite interpolants.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Event {
    /// What happened.
    pub kind: EventKind,
    /// Proper time.
    pub tau: f64,
    /// Radius.
    pub radius: f64,
    /// The side it concerns ("minus" or "plus"), if any.
    pub side: Option<&'static str>,
    /// A sentence for the reader (direction, region on each side of a horizon, new sign of the normal).
    pub detail: String,
}

/// The integrated motion and what happened along it.
#[derive(Debug, Clone, PartialEq)]
pub struct Trajectory {
    /// Accepted points (empty unless `keep_samples`).
    pub samples: Vec<Sample>,
    /// Turning points in order.
    pub turning_points: Vec<TurningPoint>,
    /// Crossings of a0 in order.
    pub crossings: Vec<Crossing>,
    /// Horizon crossings, turning points, normal flips, the centre and the stop, in order of tau.
    pub events: Vec<Event>,
    /// The horizons of [minus, plus] that the run watched for (radius, degenerate).
    pub horizons: [Vec<(f64, bool)>; 2],
    /// Why it ended.
    pub stop: StopReason,
    /// The side whose horizon was reached (for `StopReason::Horizon`).
    pub stop_side: Option<Which>,
    /// A sentence saying why it ended.
    pub stop_detail: String,
    /// The first and the last point.
    pub first: Sample,
    /// The last point.
    pub last: Sample,
    /// Smallest and largest R reached (at accepted points and turning points).
    pub r_range: (f64, f64),
    /// Largest |R - a0|.
    pub max_excursion: f64,
    /// Largest |Rdot^2 + V| / (1 + Rdot^2) at accepted points (the constraint's drift, relative to the size of
    /// the terms it balances: W_i^2 = Rdot^2 + B_i).
    pub max_constraint: f64,
    /// Accepted steps.
    pub steps_accepted: usize,
    /// Rejected steps (error too large, or a stage that left the domain).
    pub steps_rejected: usize,
}

struct Log {
    samples: Vec<Sample>,
    keep: bool,
    a0: f64,
    r_range: (f64, f64),
    max_excursion: f64,
    max_constraint: f64,
    last: Option<Sample>,
}

impl Log {
    fn push(&mut self, s: Sample) {
        self.see_radius(s.radius);
        self.max_constraint = self.max_constraint.max(s.constraint.abs() / (1.0 + s.rdot * s.rdot));
        if self.keep {
            self.samples.push(s);
        }
        self.last = Some(s);
    }
    fn see_radius(&mut self, r: f64) {
        self.r_range = (self.r_range.0.min(r), self.r_range.1.max(r));
        self.max_excursion = self.max_excursion.max((r - self.a0).abs());
    }
}

fn sample(motion: &Motion, tau: f64, y: &Vec3, p: f64, c: f64) -> Sample {
    let n = motion.normals(y[0], y[2]);
    Sample { tau, radius: y[0], rdot: y[1], sigma: y[2], pressure: p, constraint: c, n_r: n.n_r }
}

/// The horizons of both sides on a wide range about the start ([1e-4 R0, 1e4 R0]; `metric::horizons`, which
/// finds simple and degenerate roots of B).
fn watched_horizons(motion: &Motion, r0: f64) -> [Vec<(f64, bool)>; 2] {
    let opts = crate::roots::RootOptions::default();
    [Which::Minus, Which::Plus].map(|w| {
        let fns = motion.j.side_fns(w);
        let (hs, _) = crate::metric::horizons(&fns, 1e-4 * r0, 1e4 * r0, &opts);
        hs.iter().map(|h| (h.radius, h.degenerate)).collect()
    })
}

fn region_word(b: f64) -> &'static str {
    if b > 0.0 {
        "R-region"
    } else if b < 0.0 {
        "T-region"
    } else {
        "horizon"
    }
}

/// Bisection for the fraction s in (0, 1) where g(s) changes sign, g(0) g(1) < 0.
fn bisect(g: impl Fn(f64) -> f64, g0: f64) -> f64 {
    let (mut lo, mut hi) = (0.0, 1.0);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if g(mid).signum() == g0.signum() {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// The events inside one accepted step from (t, y, dy) over length h to (y1, dy1), as (fraction s, event).
#[allow(clippy::too_many_arguments)]
fn step_events(
    motion: &Motion,
    horizons: &[Vec<(f64, bool)>; 2],
    t: f64,
    y: &Vec3,
    dy: &Vec3,
    y1: &Vec3,
    dy1: &Vec3,
    h: f64,
) -> Vec<(f64, Event)> {
    let mut out = Vec::new();
    let at = |s: f64| -> Vec3 { [0, 1, 2].map(|k| hermite(y[k], dy[k], y1[k], dy1[k], h, s)) };
    let (n0, n1) = (motion.normals(y[0], y[2]), motion.normals(y1[0], y1[2]));
    let dir = if y1[0] < y[0] { "inward" } else { "outward" };
    for (i, w) in [Which::Minus, Which::Plus].into_iter().enumerate() {
        let mut found = Vec::new();
        for &(rh, degenerate) in &horizons[i] {
            let (u0, u1) = (y[0] - rh, y1[0] - rh);
            if u0 * u1 < 0.0 {
                found.push((hermite_root(u0, dy[0], u1, dy1[0], h), rh, degenerate));
            }
        }
        // A sign change of B that no listed horizon explains (outside the watched range).
        if found.is_empty() && n0.b[i] * n1.b[i] < 0.0 {
            let s = bisect(|s| motion.normals(at(s)[0], at(s)[2]).b[i], n0.b[i]);
            found.push((s, at(s)[0], false));
        }
        for (s, rh, degenerate) in found {
            let (b_before, b_after) = if dir == "inward" {
                (motion.j.side_fns(w).b(rh * (1.0 + 1e-6)), motion.j.side_fns(w).b(rh * (1.0 - 1e-6)))
            } else {
                (motion.j.side_fns(w).b(rh * (1.0 - 1e-6)), motion.j.side_fns(w).b(rh * (1.0 + 1e-6)))
            };
            let what = if degenerate { "degenerate (double) horizon" } else { "horizon" };
            out.push((
                s,
                Event {
                    kind: EventKind::HorizonCrossing,
                    tau: t + s * h,
                    radius: rh,
                    side: Some(w.name()),
                    detail: format!(
                        "crossed the {what} r = {rh:.10} of the {w} side {dir}: {} -> {}",
                        region_word(b_before),
                        region_word(b_after)
                    ),
                },
            ));
        }
        if n0.n_r[i] * n1.n_r[i] < 0.0 {
            let s = bisect(|s| motion.normals(at(s)[0], at(s)[2]).n_r[i], n0.n_r[i]);
            let r = at(s)[0];
            let b = motion.j.side_fns(w).b(r);
            let sign = if n1.n_r[i] > 0.0 { "+" } else { "-" };
            out.push((
                s,
                Event {
                    kind: EventKind::NormalFlip,
                    tau: t + s * h,
                    radius: r,
                    side: Some(w.name()),
                    detail: format!(
                        "n^r of the {w} side passed through zero (B = {b:.3e}, {}): now n^r = {sign}sqrt(Rdot^2 + B)",
                        region_word(b)
                    ),
                },
            ));
        }
    }
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out
}

/// Integrate the motion from `y0` = (R, Rdot, sigma) for proper time `duration`, recording turning points,
/// crossings of the reference radius `a0`, horizon crossings and flips of the normal on each side. Never fails:
/// a state where the motion cannot go on ends the run with the reason (if the start itself is such a state, the
/// run has one point). Horizons are crossed unless `opts.stop_at_horizon`, in which case the run ends where B
/// of a side reaches zero (a simple horizon: B would change sign; a degenerate one: R reaches its radius).
pub fn integrate(motion: &Motion, y0: Vec3, a0: f64, duration: f64, opts: &EvolveOptions) -> Trajectory {
    let b0 = motion.normals(y0[0], y0[2]).b;
    let f = |y: &Vec3| {
        if opts.stop_at_horizon && y[0] > 0.0 {
            let b = motion.normals(y[0], y[2]).b;
            for (i, w) in [Which::Minus, Which::Plus].into_iter().enumerate() {
                if b[i] * b0[i] <= 0.0 {
                    return Err(Halt::Horizon(w));
                }
            }
        }
        motion.rhs(y)
    };
    let horizons = watched_horizons(motion, y0[0].abs().max(f64::MIN_POSITIVE));
    let mut log = Log {
        samples: vec![],
        keep: opts.keep_samples,
        a0,
        r_range: (y0[0], y0[0]),
        max_excursion: 0.0,
        max_constraint: 0.0,
        last: None,
    };
    let mut turns: Vec<TurningPoint> = vec![];
    let mut crossings: Vec<Crossing> = vec![];
    let mut events: Vec<Event> = vec![];
    let (mut accepted, mut rejected) = (0usize, 0usize);
    let (mut dy, aux) = match f(&y0) {
        Ok(v) => v,
        Err(h) => {
            let (stop, side) = StopReason::from_halt(h);
            let s = sample(motion, 0.0, &y0, f64::NAN, f64::NAN);
            log.push(s);
            let d = detail(stop, side, 0.0, &y0);
            events.push(Event {
                kind: EventKind::Stop,
                tau: 0.0,
                radius: y0[0],
                side: side.map(|w| w.name()),
                detail: d.clone(),
            });
            return Trajectory {
                samples: log.samples,
                turning_points: turns,
                crossings,
                events,
                horizons,
                stop,
                stop_side: side,
                stop_detail: d,
                first: s,
                last: s,
                r_range: log.r_range,
                max_excursion: log.max_excursion,
                max_constraint: f64::NAN,
                steps_accepted: 0,
                steps_rejected: 0,
            };
        }
    };
    let first = sample(motion, 0.0, &y0, aux.pressure, aux.constraint);
    log.push(first);
    let mut y = y0;
    let mut t = 0.0;
    let hmin = opts.min_step * duration.max(y0[0].abs());
    let mut h = (opts.initial_step * y0[0].abs()).min(duration);
    let mut last_halt: Option<Halt> = None;
    let near_center = |y: &Vec3| y[0] <= opts.center_underflow * y0[0] && y[1] < 0.0;
    let (stop, side) = loop {
        let left = duration - t;
        if left <= 1e-14 * duration {
            break (StopReason::Duration, None);
        }
        if accepted >= opts.max_steps {
            break (StopReason::StepLimit, None);
        }
        let h_try = h.min(left);
        let st = match step(&f, &y, &dy, h_try, &opts.tol) {
            Err(halt) => {
                rejected += 1;
                last_halt = Some(halt);
                h = 0.25 * h_try;
                if h < hmin {
                    if near_center(&y) {
                        break (StopReason::Center, None);
                    }
                    break StopReason::from_halt(halt);
                }
                continue;
            }
            Ok(st) if st.err > 1.0 || st.err.is_nan() => {
                rejected += 1;
                h = next_step(h_try, if st.err.is_finite() { st.err } else { 1e10 }, &opts.tol);
                if h < hmin {
                    break match last_halt {
                        _ if near_center(&y) => (StopReason::Center, None),
                        Some(hl) => StopReason::from_halt(hl),
                        // A law singular at sigma = 0 (p = -c/sigma) drives Rdot without bound as sigma -> 0.
                        None if motion.singular_at_zero && y[2].abs() < 1e-3 * y0[2].abs() => {
                            (StopReason::LawUndefined, None)
                        }
                        None => (StopReason::StepUnderflow, None),
                    };
                }
                continue;
            }
            Ok(st) => st,
        };
        accepted += 1;
        last_halt = None;
        // Events inside the step, located on cubic Hermite interpolants of R, Rdot and sigma.
        let mut s_end: Option<(f64, StopReason, Option<Which>)> = None;
        if y[1] * st.y[1] < 0.0 {
            let s = hermite_root(y[1], dy[1], st.y[1], st.dy[1], h_try);
            let r = hermite(y[0], dy[0], st.y[0], st.dy[0], h_try, s);
            turns.push(TurningPoint { tau: t + s * h_try, radius: r });
            events.push(Event {
                kind: EventKind::TurningPoint,
                tau: t + s * h_try,
                radius: r,
                side: None,
                detail: format!("turning point: dR/dtau = 0 at R = {r:.10}"),
            });
            log.see_radius(r);
            if turns.len() >= opts.max_turns {
                s_end = Some((s, StopReason::MaxTurns, None));
            }
        }
        for (s, ev) in step_events(motion, &horizons, t, &y, &dy, &st.y, &st.dy, h_try) {
            if s_end.is_some_and(|e| s > e.0) {
                break;
            }
            let stop_here = opts.stop_at_horizon && ev.kind == EventKind::HorizonCrossing;
            let w = if ev.side == Some("minus") { Which::Minus } else { Which::Plus };
            events.push(ev);
            if stop_here {
                s_end = Some((s, StopReason::Horizon, Some(w)));
                break;
            }
        }
        let (u0, u1) = (y[0] - a0, st.y[0] - a0);
        if u0 * u1 < 0.0 {
            let s = hermite_root(u0, dy[0], u1, st.dy[0], h_try);
            if s_end.map_or(true, |e| s <= e.0) {
                crossings.push(Crossing { tau: t + s * h_try, outward: u1 > 0.0 });
            }
        }
        if let Some((s, why, side)) = s_end {
            // End exactly at the event: redo the step with the shorter length (accurate, since the local error
            // shrinks with the step).
            let hs = s * h_try;
            match step(&f, &y, &dy, hs, &opts.tol) {
                Ok(s2) => {
                    t += hs;
                    log.push(sample(motion, t, &s2.y, s2.extra.pressure, s2.extra.constraint));
                }
                Err(_) => {
                    t += h_try;
                    log.push(sample(motion, t, &st.y, st.extra.pressure, st.extra.constraint));
                }
            }
            break (why, side);
        }
        t += h_try;
        y = st.y;
        dy = st.dy;
        log.push(sample(motion, t, &y, st.extra.pressure, st.extra.constraint));
        if opts.stop_at_horizon {
            if let Some(w) = motion.near_horizon(y[0], opts.horizon_tol) {
                break (StopReason::Horizon, Some(w));
            }
        }
        if y[0] <= opts.center_tol * y0[0] {
            break (StopReason::Center, None);
        }
        h = next_step(h_try, st.err, &opts.tol);
    };
    let last = log.last.unwrap_or(first);
    let end = [last.radius, last.rdot, last.sigma];
    let stop_detail = detail(stop, side, last.tau, &end);
    if stop == StopReason::Center {
        events.push(Event {
            kind: EventKind::Center,
            tau: last.tau,
            radius: last.radius,
            side: None,
            detail: format!("reached the centre: R = {:.3e} with dR/dtau = {:.3e}", last.radius, last.rdot),
        });
    }
    events.push(Event {
        kind: EventKind::Stop,
        tau: last.tau,
        radius: last.radius,
        side: side.map(|w| w.name()),
        detail: format!("stop = {}: {stop_detail}", stop.name()),
    });
    Trajectory {
        samples: log.samples,
        turning_points: turns,
        crossings,
        events,
        horizons,
        stop,
        stop_side: side,
        stop_detail,
        first,
        last,
        r_range: log.r_range,
        max_excursion: log.max_excursion,
        max_constraint: log.max_constraint,
        steps_accepted: accepted,
        steps_rejected: rejected,
    }
}

fn detail(stop: StopReason, side: Option<Which>, tau: f64, y: &Vec3) -> String {
    let at = format!("at tau = {tau:.6}, R = {:.6}, dR/dtau = {:.6}, sigma = {:.6e}", y[0], y[1], y[2]);
    match stop {
        StopReason::Duration => format!("reached the requested duration ({at})"),
        StopReason::MaxTurns => format!("reached the maximum number of turning points ({at})"),
        StopReason::Horizon => format!(
            "reached a horizon of the {} side (B -> 0) and stopped there as asked (--stop-at-horizon) ({at})",
            side.map(|w| w.name()).unwrap_or("?")
        ),
        StopReason::Center => format!("R reached (numerically) zero ({at})"),
        StopReason::SignatureChange => format!(
            "A and B of the {} side have opposite signs: the metric changes signature there ({at})",
            side.map(|w| w.name()).unwrap_or("?")
        ),
        StopReason::NoShellState => format!("Rdot^2 + B <= 0 on a side: no timelike shell state ({at})"),
        StopReason::LawUndefined => format!("the equation of state is undefined or singular there, e.g. sigma reaching zero under a law singular at sigma = 0 ({at})"),
        StopReason::NonFinite => format!("a value became NaN or infinite ({at})"),
        StopReason::StepUnderflow => format!("the error control needed a step below the minimum: the motion is singular there ({at})"),
        StopReason::StepLimit => format!("reached the step limit ({at})"),
    }
}
