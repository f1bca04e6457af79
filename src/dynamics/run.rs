//! From a scenario and a static radius to a finished report: validate the static radius, build the starting
//! state, integrate, analyse, and optionally run the ensemble.

use super::analysis::{ensemble_kicks, fate, period, Ensemble, Fate, Member, Period};
use super::integrate::{integrate, EvolveOptions, Trajectory};
use super::motion::Motion;
use crate::error::{Error, Result};
use crate::junction::potential::Law;
use crate::junction::{Junction, StaticValues};
use crate::scenario::{Scenario, ShellKind};
use crate::statics::{find_static_radii, residual, StaticsOptions};
use rayon::prelude::*;
use serde::Serialize;

/// How the shell is set moving.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Start {
    /// At rest at a0 + DA, sigma from the angular junction condition at rest there.
    Kick(f64),
    /// At a0 with dR/dtau = V0, sigma from the angular junction condition with that velocity.
    Velocity(f64),
}

/// Relative residual |p0 - P(sigma0)| / (|p0| + |sigma0|) below which a radius counts as static.
pub const STATIC_TOL: f64 = 1e-9;

/// Relative distance within which a requested radius that is not static is moved to the nearby static radius.
pub const SNAP_TOL: f64 = 1e-3;

/// A starting state of the motion.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Initial {
    /// R.
    pub radius: f64,
    /// dR/dtau.
    pub rdot: f64,
    /// sigma from the angular junction condition sigma = -(D-2)[X]/(8 pi R), X_i = nu_i sqrt(Rdot^2 + B_i).
    pub sigma: f64,
}

/// Everything `evolve` reports.
#[derive(Debug, Clone, Serialize)]
pub struct EvolveReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance line.
    pub provenance: String,
    /// The law p(sigma) as typed.
    pub equation_of_state: String,
    /// The radius given on the command line.
    pub radius_requested: f64,
    /// The static radius a0 used (equal to the request, or the static radius within 1e-3 of it).
    pub static_radius: f64,
    /// sigma0 at a0.
    pub static_sigma: f64,
    /// |p0 - P(sigma0)| at a0.
    pub static_residual: f64,
    /// How the shell was set moving.
    pub start: Start,
    /// The starting state.
    pub initial: Initial,
    /// Requested proper-time duration.
    pub duration: f64,
    /// Proper time reached.
    pub tau_end: f64,
    /// Why it ended (a word).
    pub stop: String,
    /// Why it ended (a sentence).
    pub stop_detail: String,
    /// What became of the shell.
    pub fate: Fate,
    /// Number of turning points.
    pub turning_points_count: usize,
    /// Turning points (tau, R).
    pub turning_points: Vec<super::integrate::TurningPoint>,
    /// Smallest and largest R.
    pub radius_range: [f64; 2],
    /// V''(a0) with the scenario's law (`potential_taylor`).
    pub potential_second_derivative: f64,
    /// 2 pi / sqrt(V''(a0)/2) when V''(a0) > 0.
    pub linear_period: Option<f64>,
    /// 1 / sqrt(-V''(a0)/2), the e-folding time of small departures, when V''(a0) < 0.
    pub linear_growth_time: Option<f64>,
    /// The measured period.
    pub measured_period: Option<Period>,
    /// measured / linear period.
    pub period_ratio: Option<f64>,
    /// Largest |Rdot^2 + V(R, sigma)| / (1 + Rdot^2) along the motion (the energy constraint's drift).
    pub max_constraint_drift: f64,
    /// Accepted steps.
    pub steps_accepted: usize,
    /// Rejected steps.
    pub steps_rejected: usize,
    /// Relative and absolute tolerances of the integrator.
    pub tolerances: [f64; 2],
    /// The ensemble, if one was asked for.
    pub ensemble: Option<Ensemble>,
    /// Notes for the reader.
    pub notes: Vec<String>,
    /// The time series (CSV only).
    #[serde(skip)]
    pub samples: Vec<super::integrate::Sample>,
}

/// Check that the scenario can be evolved (timelike shell with a law) and that `radius` is a static radius of
/// its law; a radius within a relative 1e-3 of exactly one static radius is moved there (with a note).
pub fn static_start(s: &Scenario, radius: f64, notes: &mut Vec<String>) -> Result<f64> {
    if s.shell.kind != ShellKind::Timelike {
        return Err(Error::input(format!(
            "{}: evolve needs a timelike shell (this one is {})",
            s.origin.label(),
            s.shell.kind.name()
        ))
        .with_hint("a spacelike shell is a transition surface, not a moving membrane"));
    }
    if s.shell.eos.is_none() {
        return Err(Error::input(format!("{}: the scenario has no equation of state", s.origin.label()))
            .with_hint("add [shell] pressure = \"...\" (e.g. \"w*sigma\"): the motion needs p(sigma)"));
    }
    if !(radius.is_finite() && radius > 0.0) {
        return Err(Error::input(format!("--radius {radius}: the areal radius must be a positive number")));
    }
    let j = Junction::new(s);
    let hint = format!(
        "run `junctura statics {}` to list the static radii of the law and pass one to --radius",
        s.origin.label()
    );
    let static_ok = |a: f64| -> Option<f64> {
        let (f, sv) = residual(&j, a)?;
        let scale = sv.stress.pressure().abs() + sv.stress.sigma().abs();
        (f.abs() <= STATIC_TOL * scale.max(f64::MIN_POSITIVE)).then_some(f.abs())
    };
    if static_ok(radius).is_some() {
        return Ok(radius);
    }
    j.static_values(radius).map_err(|e| e.context(format!("--radius {radius}")))?;
    let near = find_static_radii(s, radius * (1.0 - SNAP_TOL), radius * (1.0 + SNAP_TOL), &StaticsOptions::default())?;
    match near.static_radii.as_slice() {
        [one] if static_ok(one.radius).is_some() => {
            notes.push(format!("--radius {radius} is not exactly static; using the static radius a0 = {} of the law found within a relative {SNAP_TOL:.0e}", one.radius));
            Ok(one.radius)
        }
        _ => {
            let f = residual(&j, radius).map(|(f, _)| f).unwrap_or(f64::NAN);
            Err(Error::input(format!(
                "--radius {radius} is not a static radius of the law p = {}: p0 - P(sigma0) = {f:.3e} there",
                near.equation_of_state
            ))
            .with_hint(hint))
        }
    }
}

/// The starting state for `start` about the static radius `a0`.
pub fn initial_state(j: &Junction<f64>, a0: f64, start: Start) -> Result<Initial> {
    let (r, v) = match start {
        Start::Kick(da) => (a0 + da, 0.0),
        Start::Velocity(v) => (a0, v),
    };
    let what = match start {
        Start::Kick(da) => format!("--kick {da}"),
        Start::Velocity(v) => format!("--velocity {v}"),
    };
    if !(r.is_finite() && v.is_finite() && r > 0.0) {
        return Err(Error::input(format!("{what}: the starting radius {r} must be a positive number"))
            .with_hint("use a kick smaller than the static radius"));
    }
    // The static-shell checks (regions, horizons) apply to the starting radius too.
    j.static_values(r).map_err(|e| {
        e.context(format!("{what}: starting radius {r}"))
            .with_hint("choose a smaller kick that keeps the shell between the horizons")
    })?;
    let st = j.stress(r, v, 0.0).map_err(|e| e.context(what))?;
    Ok(Initial { radius: r, rdot: v, sigma: st.sigma() })
}

/// The potential V(R) of the motion that starts at `init`, on the given radii (NaN where undefined): the static
/// law's own curve from `Junction::potential_curve`, started from the initial state instead of a static one.
pub fn orbit_potential(j: &Junction<f64>, init: &Initial, radii: &[f64]) -> Result<Vec<f64>> {
    let sv = j.static_values(init.radius)?;
    let stress = j.stress(init.radius, init.rdot, 0.0)?;
    let sv = StaticValues { stress, ..sv };
    Ok(j.potential_curve(&sv, Law::Scenario, radii))
}

/// Integrate one start and summarise it.
fn run_one(j: &Junction<f64>, a0: f64, init: &Initial, duration: f64, opts: &EvolveOptions) -> Trajectory {
    let motion = Motion::new(j, init.sigma);
    integrate(&motion, [init.radius, init.rdot, init.sigma], a0, duration, opts)
}

/// The ensemble of kicks spread over [-spread, spread] (see [`Ensemble`]), integrated in parallel.
pub fn ensemble(j: &Junction<f64>, a0: f64, n: usize, spread: f64, duration: f64, opts: &EvolveOptions) -> Ensemble {
    let o = EvolveOptions { keep_samples: false, max_turns: usize::MAX, ..*opts };
    let bound = opts.bound_factor * spread;
    let members: Vec<Member> = ensemble_kicks(n, spread)
        .into_par_iter()
        .map(|kick| match initial_state(j, a0, Start::Kick(kick)) {
            Ok(init) => {
                let tr = run_one(j, a0, &init, duration, &o);
                let bounded = tr.stop == super::integrate::StopReason::Duration && tr.max_excursion <= bound;
                Member {
                    kick,
                    fate: fate(&tr, a0),
                    stop: tr.stop.name().into(),
                    max_excursion: tr.max_excursion,
                    max_constraint: tr.max_constraint,
                    bounded,
                }
            }
            Err(_) => Member {
                kick,
                fate: Fate::Stopped,
                stop: "invalid_start".into(),
                max_excursion: kick.abs(),
                max_constraint: f64::NAN,
                bounded: false,
            },
        })
        .collect();
    let bounded = members.iter().filter(|m| m.bounded).count();
    Ensemble { members_count: n, spread, bound, bounded, bounded_fraction: bounded as f64 / n as f64, members }
}

/// Evolve a shell of scenario `s` set moving from its static radius `radius` by `start`, for proper time
/// `duration`; with `ens = Some((N, S))` also the ensemble of N kicks in [-S, S].
pub fn evolve(
    s: &Scenario,
    radius: f64,
    start: Start,
    duration: f64,
    ens: Option<(usize, f64)>,
    opts: &EvolveOptions,
) -> Result<EvolveReport> {
    let mut notes = Vec::new();
    if !(duration.is_finite() && duration > 0.0) {
        return Err(Error::input(format!("--duration {duration}: the proper-time duration must be a positive number"))
            .with_hint("e.g. --duration 200"));
    }
    if let Some((n, spread)) = ens {
        if !(2..=100_000).contains(&n) {
            return Err(Error::input(format!("--ensemble {n}: give between 2 and 100000 members"))
                .with_hint("e.g. --ensemble 64 --spread 0.2"));
        }
        if !(spread.is_finite() && spread > 0.0) {
            return Err(Error::input(format!("--spread {spread}: the kick spread must be a positive number"))
                .with_hint("e.g. --spread 0.2"));
        }
    }
    let a0 = static_start(s, radius, &mut notes)?;
    let j = Junction::new(s);
    let sv = j.static_values(a0)?;
    let (res, _) =
        residual(&j, a0).ok_or_else(|| Error::numerical(format!("the law is undefined at the static radius {a0}")))?;
    let v2 = j.potential_taylor(&sv, Law::Scenario).map(|v| v[2]).unwrap_or(f64::NAN);
    let init = initial_state(&j, a0, start)?;
    let tr = run_one(&j, a0, &init, duration, opts);
    let linear_period = (v2 > 0.0).then(|| 2.0 * std::f64::consts::PI / (v2 / 2.0).sqrt());
    let linear_growth_time = (v2 < 0.0).then(|| 1.0 / (-v2 / 2.0).sqrt());
    let measured = period(&tr);
    let period_ratio = match (measured, linear_period) {
        (Some(m), Some(l)) => Some(m.value / l),
        _ => None,
    };
    let ensemble = ens.map(|(n, spread)| ensemble(&j, a0, n, spread, duration, opts));
    if tr.max_constraint > 1e3 * opts.tol.rtol.max(opts.tol.atol) {
        notes.push(format!(
            "the energy constraint drifted to {:.2e}: tighten the tolerances or shorten the run",
            tr.max_constraint
        ));
    }
    Ok(EvolveReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        equation_of_state: s.shell.eos.as_ref().map(|e| e.source().to_string()).unwrap_or_default(),
        radius_requested: radius,
        static_radius: a0,
        static_sigma: sv.stress.sigma(),
        static_residual: res.abs(),
        start,
        initial: init,
        duration,
        tau_end: tr.last.tau,
        stop: tr.stop.name().into(),
        stop_detail: tr.stop_detail.clone(),
        fate: fate(&tr, a0),
        turning_points_count: tr.turning_points.len(),
        turning_points: tr.turning_points.clone(),
        radius_range: [tr.r_range.0, tr.r_range.1],
        potential_second_derivative: v2,
        linear_period,
        linear_growth_time,
        measured_period: measured,
        period_ratio,
        max_constraint_drift: tr.max_constraint,
        steps_accepted: tr.steps_accepted,
        steps_rejected: tr.steps_rejected,
        tolerances: [opts.tol.rtol, opts.tol.atol],
        ensemble,
        notes,
        samples: tr.samples,
    })
}
