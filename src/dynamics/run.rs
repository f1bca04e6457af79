//! From a scenario and initial data to a finished report: validate the start (a static radius set moving, or
//! any radius with a velocity or a surface energy density, completed by the energy constraint), integrate,
//! analyse, and optionally run the ensemble.

use super::analysis::{ensemble_kicks, fate, period, Ensemble, Fate, Member, Period};
use super::integrate::{integrate, Event, EvolveOptions, Trajectory};
use super::motion::Motion;
use crate::error::{Error, ErrorKind, RequestField as F, Result};
use crate::junction::potential::Law;
use crate::junction::stability::marginal_scale;
use crate::junction::{admissible, Junction};
use crate::metric::RegionKind;
use crate::model::{ShellKind, Which};
use crate::phrase;
use crate::scenario::Scenario;
use crate::statics::{find_static_radii, law_holds, residual, StaticsOptions};
use crate::tolerances::TOL;
use rayon::prelude::*;
use serde::Serialize;

/// How the shell is set moving. `Kick` and `Velocity` start from a static radius a0 of the law (the radius given
/// is a0); `Moving` and `Sigma` start at the radius given, anywhere (R- or T-regions), from the initial data and
/// the energy constraint Rdot^2 + V(R, sigma) = 0.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Start {
    /// At rest at a0 + DA, sigma from the angular junction condition at rest there.
    Kick(f64),
    /// At a0 with dR/dtau = V0, sigma from the angular junction condition with that velocity.
    Velocity(f64),
    /// At R with dR/dtau = V (the sign is the direction), sigma from the angular junction condition
    /// sigma = -(D-2)\[X\]/(8 pi R), X_i = nu_i sqrt(V^2 + B_i).
    Moving(f64),
    /// At R with surface energy density sigma; |dR/dtau| = sqrt(-V(R, sigma)) from the energy constraint, moving
    /// outward or inward (`None` only at a turning point, V(R, sigma) = 0).
    Sigma {
        /// sigma at the start.
        sigma: f64,
        /// Direction of motion.
        outward: Option<bool>,
    },
}

impl Start {
    /// The start given by the front ends' options, `None` when they do not name exactly one start: `kick`
    /// (about a static radius), `velocity` (at the given radius; about a static radius with `from_static`),
    /// `sigma` with an optional direction (`outward`), or `from_static` alone (at rest on the static radius).
    pub fn from_options(
        kick: Option<f64>,
        velocity: Option<f64>,
        sigma: Option<f64>,
        outward: Option<bool>,
        from_static: bool,
    ) -> Option<Start> {
        match (kick, velocity, sigma, from_static) {
            (Some(k), None, None, false) => Some(Start::Kick(k)),
            (None, Some(v), None, true) => Some(Start::Velocity(v)),
            (None, None, None, true) => Some(Start::Kick(0.0)),
            (None, Some(v), None, false) => Some(Start::Moving(v)),
            (None, None, Some(sigma), false) => Some(Start::Sigma { sigma, outward }),
            _ => None,
        }
    }

    /// True for the starts about a static radius (kick, velocity at a0).
    pub fn is_static(&self) -> bool {
        matches!(self, Start::Kick(_) | Start::Velocity(_))
    }
}

/// One side along the motion: its horizons and where the shell was at the start and at the end.
#[derive(Debug, Clone, Serialize)]
pub struct SideMotion {
    /// "minus" or "plus".
    pub side: &'static str,
    /// Horizons watched (radius, degenerate), on [1e-4 R0, 1e4 R0].
    pub horizons: Vec<(f64, bool)>,
    /// Region of the shell's position at the start (None exactly on a horizon).
    pub region_start: Option<RegionKind>,
    /// Region at the end.
    pub region_end: Option<RegionKind>,
    /// Sign of n^r at the start.
    pub normal_sign_start: f64,
    /// Sign of n^r at the end.
    pub normal_sign_end: f64,
    /// Number of horizon crossings on this side.
    pub horizon_crossings: usize,
    /// Number of flips of the normal on this side.
    pub normal_flips: usize,
}

/// A starting state of the motion.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Initial {
    /// R.
    pub radius: f64,
    /// dR/dtau.
    pub rdot: f64,
    /// sigma from the angular junction condition sigma = -(D-2)\[X\]/(8 pi R), X_i = nu_i sqrt(Rdot^2 + B_i).
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
    /// The static radius a0 used (equal to the request, or the static radius within 1e-3 of it); None for a
    /// start from arbitrary initial data.
    pub static_radius: Option<f64>,
    /// sigma0 at a0.
    pub static_sigma: Option<f64>,
    /// |p0 - P(sigma0)| at a0.
    pub static_residual: Option<f64>,
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
    /// Events in order: horizon crossings, turning points, normal flips, the centre, the stop.
    pub events: Vec<Event>,
    /// Each side along the motion.
    pub sides: [SideMotion; 2],
    /// Smallest and largest R.
    pub radius_range: [f64; 2],
    /// V''(a0) with the scenario's law (`potential_taylor`).
    pub potential_second_derivative: Option<f64>,
    /// "stable", "unstable" or "marginal" (|V''| below a relative 1e-8, `stability::marginal_scale`).
    pub linear_verdict: Option<&'static str>,
    /// 2 pi / sqrt(V''(a0)/2) when V''(a0) > 0 (not marginal).
    pub linear_period: Option<f64>,
    /// 1 / sqrt(-V''(a0)/2), the e-folding time of small departures, when V''(a0) < 0 (not marginal).
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
    check_evolvable(s)?;
    if !(radius.is_finite() && radius > 0.0) {
        let message = phrase![F::Radius, format!(" {radius}: the areal radius must be a positive number")];
        return Err(Error::request(ErrorKind::Input, F::Radius, radius, message));
    }
    let j = Junction::new(s);
    let hint = phrase![
        format!("run `junctura statics {}` to list the static radii of the law and pass one to ", s.origin.label()),
        F::Radius
    ];
    let static_ok = |a: f64| -> Option<f64> {
        let (f, sv) = residual(&j, a)?;
        law_holds(f, sv.stress.sigma(), sv.stress.pressure()).then_some(f.abs())
    };
    if static_ok(radius).is_some() {
        return Ok(radius);
    }
    j.static_values(radius).map_err(|e| e.context_phrase(phrase![F::Radius, format!(" {radius}")]))?;
    let snap = TOL.motion.snap_to_static;
    let near = find_static_radii(s, radius * (1.0 - snap), radius * (1.0 + snap), &StaticsOptions::default())?;
    match near.static_radii.as_slice() {
        [one] if static_ok(one.radius).is_some() => {
            notes.push(format!("--radius {radius} is not exactly static; using the static radius a0 = {} of the law found within a relative {snap:.0e}", one.radius));
            Ok(one.radius)
        }
        _ => {
            let f = residual(&j, radius).map(|(f, _)| f).unwrap_or(f64::NAN);
            let message = phrase![
                F::Radius,
                format!(
                    " {radius} is not a static radius of the law p = {}: p0 - P(sigma0) = {f:.3e} there",
                    near.equation_of_state
                )
            ];
            Err(Error::request(ErrorKind::Input, F::Radius, radius, message).with_hint_phrase(hint))
        }
    }
}

/// The starting state for `start` about the static radius `a0`.
pub fn initial_state(j: &Junction<f64>, a0: f64, start: Start) -> Result<Initial> {
    let (r, v, field, given) = match start {
        Start::Kick(da) => (a0 + da, 0.0, F::Kick, da),
        Start::Velocity(v) => (a0, v, F::Velocity, v),
        Start::Moving(_) | Start::Sigma { .. } => return needs_static_radius(),
    };
    let what = phrase![field, format!(" {given}")];
    if !(r.is_finite() && v.is_finite() && r > 0.0) {
        let message = what.clone().then(phrase![format!(": the starting radius {r} must be a positive number")]);
        return Err(Error::request(ErrorKind::Input, field, given, message)
            .with_hint("use a kick smaller than the static radius"));
    }
    // The static-shell checks (regions, horizons) apply to the starting radius too.
    j.static_values(r).map_err(|e| {
        e.context_phrase(what.clone().then(phrase![format!(": starting radius {r}")]))
            .with_hint("choose a smaller kick that keeps the shell between the horizons")
    })?;
    let st = j.stress(r, v, 0.0).map_err(|e| e.context_phrase(what))?;
    Ok(Initial { radius: r, rdot: v, sigma: st.sigma() })
}

/// The potential V(R) of the motion that starts at `init`, on the given radii (NaN where undefined): V(R, sigma(R))
/// with sigma(R) following the scenario's law from the initial state (`Junction::potential_curve_from`), through
/// horizons as the motion goes.
pub fn orbit_potential(j: &Junction<f64>, init: &Initial, radii: &[f64]) -> Result<Vec<f64>> {
    let y0 = -j.kappa(init.radius, init.sigma);
    let p0 = j.eos_at(init.sigma, |t| t).unwrap_or(f64::NAN);
    Ok(j.potential_curve_from((init.radius, y0, init.sigma, p0), Law::Scenario, radii, true))
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

/// Check that the scenario can be evolved at all: a timelike shell with an equation of state.
fn check_evolvable(s: &Scenario) -> Result<()> {
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
    Ok(())
}

/// The starting state from arbitrary initial data at radius `r` (`Start::Moving` or `Start::Sigma`), completed
/// by the energy constraint Rdot^2 + V(R, sigma) = 0 (V from `potential_from_y`, Poisson 2004 ch. 3):
/// - `Moving(V)`: sigma = -(D-2)\[X\]/(8 pi R) with X_i = nu_i sqrt(V^2 + B_i); needs V^2 + B_i > 0 on both sides,
///   and on a side in a T-region an explicit `normal_sign` (there `keep` does not fix the sign of n^r);
/// - `Sigma { sigma, outward }`: Rdot^2 = -V(R, sigma), which must be >= 0; the normals X_i then follow from the
///   junction condition (X_plus = (Y + \[B\]/Y)/2, X_minus = (\[B\]/Y - Y)/2, Y = -8 pi R sigma/(D-2)) and must agree
///   with the sign that `keep` (or `normal_sign`) gives on each side in an R-region.
///
/// Errors (input, exit 2) name the option and value and say why no shell state exists there.
pub fn initial_from_data(s: &Scenario, j: &Junction<f64>, r: f64, start: Start) -> Result<Initial> {
    check_evolvable(s)?;
    if !(r.is_finite() && r > 0.0) {
        let message = phrase![F::Radius, format!(" {r}: the areal radius must be a positive number")];
        return Err(Error::request(ErrorKind::Input, F::Radius, r, message).with_hint_phrase(phrase![
            "e.g. ",
            F::Radius,
            " 10"
        ]));
    }
    // A refused start `what` (field and value) at this radius: "<what> at <radius> r<rest>".
    let at_radius = |what: (F, f64), rest: String| {
        let message = phrase![what.0, format!(" {} at ", what.1), F::Radius, format!(" {r}{rest}")];
        Error::request(ErrorKind::Input, what.0, what.1, message)
    };
    let jets = [j.jet(Which::Minus, r), j.jet(Which::Plus, r)];
    for (w, jet) in [Which::Minus, Which::Plus].into_iter().zip(&jets) {
        j.check_finite_jet(w, r, jet, 1).map_err(|e| e.context_phrase(phrase![F::Radius, format!(" {r}")]))?;
        if admissible::near_horizon(r, jet.b[0], jet.b[1], TOL.horizon.on_horizon) {
            let message = phrase![
                F::Radius,
                format!(
                    " {r} is on (or numerically within {:.0e} of) a horizon of the {w} side: B = {:e}",
                    TOL.horizon.on_horizon, jet.b[0]
                )
            ];
            return Err(Error::request(ErrorKind::Input, F::Radius, r, message)
                .with_hint("start slightly off the horizon; the motion itself crosses horizons"));
        }
        if let Err(why) = admissible::signature(w, jet.a[0], jet.b[0], jet.b[1]) {
            let message = phrase![F::Radius, format!(" {r}: {why}")];
            return Err(Error::request(ErrorKind::Input, F::Radius, r, message).with_hint(why.hint()));
        }
    }
    let side = |w: Which| s.side(w);
    let (rdot, sigma, what) = match start {
        Start::Moving(v) => {
            let what = (F::Velocity, v);
            if !v.is_finite() {
                let message = phrase![F::Velocity, format!(" {v}: the velocity must be a finite number")];
                return Err(Error::request(ErrorKind::Input, F::Velocity, v, message));
            }
            for (w, jet) in [Which::Minus, Which::Plus].into_iter().zip(&jets) {
                let w2 = v * v + jet.b[0];
                if w2 <= 0.0 {
                    return Err(at_radius(what, format!(
                        ": Rdot^2 + B = {w2:.6e} <= 0 on the {w} side (a T-region, B = {:.6e}): no timelike shell state exists there",
                        jet.b[0]
                    ))
                    .with_hint(format!("inside a horizon a timelike shell must move with |dR/dtau| > sqrt(-B) = {:.6}", (-jet.b[0]).sqrt())));
                }
                if jet.b[0] < 0.0 && side(w).explicit_normal_sign.is_none() {
                    return Err(at_radius(what, format!(
                        ": the {w} side is a T-region there (B = {:.6e}), where keep does not fix the sign of n^r",
                        jet.b[0]
                    ))
                    .with_hint_phrase(phrase!["give ", F::Sigma, format!(" S instead (the junction condition then fixes the normals), or set normal_sign = +1 or -1 on [{w}]")]));
                }
            }
            let st = j
                .stress_with_jets(&jets[0], &jets[1], r, v, 0.0)
                .map_err(|e| e.context_phrase(phrase![F::Velocity, format!(" {v}")]))?;
            (v, st.sigma(), what)
        }
        Start::Sigma { sigma, outward } => {
            let what = (F::Sigma, sigma);
            if !(sigma.is_finite() && sigma != 0.0) {
                let message = phrase![
                    F::Sigma,
                    format!(" {sigma}: the surface energy density must be a finite, non-zero number")
                ];
                return Err(Error::request(ErrorKind::Input, F::Sigma, sigma, message)
                    .with_hint("sigma = 0 leaves the junction condition without a solution unless both sides agree"));
            }
            let v = j.potential_sigma(r, sigma);
            let scale = 1.0 + jets[0].b[0].abs() + jets[1].b[0].abs();
            if v > TOL.motion.turning_point * scale {
                return Err(at_radius(what, format!(
                    ": V(R, sigma) = {v:.6e} > 0, so Rdot^2 = -V < 0: no shell state exists there (the energy constraint Rdot^2 + V = 0 cannot hold)"
                ))
                .with_hint_phrase(phrase!["choose a radius inside the allowed region of this sigma, or give ", F::Velocity, " instead (sigma then follows from the junction condition)"]));
            }
            let speed = if v.abs() <= TOL.motion.turning_point * scale { 0.0 } else { (-v).sqrt() };
            let rdot = match (speed > 0.0, outward) {
                (false, _) => 0.0,
                (true, Some(true)) => speed,
                (true, Some(false)) => -speed,
                (true, None) => {
                    return Err(at_radius(
                        what,
                        format!(": the energy constraint gives |dR/dtau| = {speed:.6}, but not the direction"),
                    )
                    .with_hint_phrase(phrase![
                        "add ",
                        F::Direction,
                        " inward or ",
                        F::Direction,
                        " outward"
                    ]))
                }
            };
            (rdot, sigma, what)
        }
        _ => needs_static_radius()?,
    };
    // The normals the junction condition gives must agree with the sides' orientation where it is fixed.
    let motion = Motion::new(j, sigma);
    let n = motion.normals(r, sigma);
    for (i, w) in [Which::Minus, Which::Plus].into_iter().enumerate() {
        let fixed = jets[i].b[0] > 0.0 || side(w).explicit_normal_sign.is_some();
        let nu = side(w).normal_sign();
        if fixed && n.n_r[i] * nu < 0.0 {
            let why = match side(w).explicit_normal_sign {
                Some(_) => format!("normal_sign = {nu:+}"),
                None => format!("keep = \"{}\" needs n^r {} 0", side(w).keep.name(), if nu > 0.0 { ">" } else { "<" }),
            };
            return Err(at_radius(what, format!(
                ": the junction condition puts n^r = {:.6e} on the {w} side, but {why}: this state belongs to the other branch of the junction condition",
                n.n_r[i]
            ))
            .with_hint_phrase(phrase!["change the sign of sigma, or the side's keep/normal_sign; with ", F::Velocity, " the branch is chosen from keep"]));
        }
    }
    if !j.eos_at(sigma, |t| t).is_some_and(f64::is_finite) {
        return Err(at_radius(
            what,
            format!(": the equation of state is undefined at the starting sigma = {sigma:.6e}"),
        )
        .with_hint("the law p(sigma) must be finite at the start"));
    }
    Ok(Initial { radius: r, rdot, sigma })
}

fn needs_static_radius<T>() -> Result<T> {
    Err(Error::phrased(
        ErrorKind::Input,
        phrase!["a static-radius start (", F::Kick, ", ", F::FromStatic, ") needs a static radius"],
    )
    .with_hint_phrase(phrase!["use ", F::Kick, " DA or ", F::FromStatic]))
}

fn region_of(b: f64) -> Option<RegionKind> {
    if b > 0.0 {
        Some(RegionKind::R)
    } else if b < 0.0 {
        Some(RegionKind::T)
    } else {
        None
    }
}

fn side_motions(motion: &Motion, tr: &Trajectory) -> [SideMotion; 2] {
    let (n0, n1) = (motion.normals(tr.first.radius, tr.first.sigma), motion.normals(tr.last.radius, tr.last.sigma));
    [Which::Minus, Which::Plus].map(|w| {
        let i = usize::from(w == Which::Plus);
        let mine = |k: super::integrate::EventKind| {
            tr.events.iter().filter(|e| e.kind == k && e.side == Some(w.name())).count()
        };
        SideMotion {
            side: w.name(),
            horizons: tr.horizons[i].clone(),
            region_start: region_of(n0.b[i]),
            region_end: region_of(n1.b[i]),
            normal_sign_start: n0.n_r[i].signum(),
            normal_sign_end: n1.n_r[i].signum(),
            horizon_crossings: mine(super::integrate::EventKind::HorizonCrossing),
            normal_flips: mine(super::integrate::EventKind::NormalFlip),
        }
    })
}

/// Evolve a shell of scenario `s` for proper time `duration`. With `Start::Kick` / `Start::Velocity`, `radius`
/// is a static radius a0 of the law (see [`static_start`]) and the run is compared with the linearised theory;
/// with `Start::Moving` / `Start::Sigma` it starts at `radius` from those initial data ([`initial_from_data`]).
/// With `ens = Some((N, S))` (static-radius starts only) also the ensemble of N kicks in [-S, S].
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
        let message = phrase![F::Duration, format!(" {duration}: the proper-time duration must be a positive number")];
        return Err(Error::request(ErrorKind::Input, F::Duration, duration, message).with_hint_phrase(phrase![
            "e.g. ",
            F::Duration,
            " 200"
        ]));
    }
    if let Some((n, spread)) = ens {
        if !start.is_static() {
            let message = phrase![F::Ensemble, ": an ensemble of kicks needs a static-radius start"];
            return Err(Error::request(ErrorKind::Input, F::Ensemble, n, message).with_hint_phrase(phrase![
                "use ",
                F::Kick,
                " DA (or ",
                F::FromStatic,
                ") with ",
                F::Ensemble
            ]));
        }
        if !(2..=100_000).contains(&n) {
            let message = phrase![F::Ensemble, format!(" {n}: give between 2 and 100000 members")];
            return Err(Error::request(ErrorKind::Input, F::Ensemble, n, message).with_hint_phrase(phrase![
                "e.g. ",
                F::Ensemble,
                " 64 ",
                F::Spread,
                " 0.2"
            ]));
        }
        if !(spread.is_finite() && spread > 0.0) {
            let message = phrase![F::Spread, format!(" {spread}: the kick spread must be a positive number")];
            return Err(Error::request(ErrorKind::Input, F::Spread, spread, message).with_hint_phrase(phrase![
                "e.g. ",
                F::Spread,
                " 0.2"
            ]));
        }
    }
    let j = Junction::new(s);
    struct StaticPart {
        a0: f64,
        sigma: f64,
        residual: f64,
        v2: f64,
        marginal: bool,
    }
    let (stat, init) = if start.is_static() {
        let a0 = static_start(s, radius, &mut notes)?;
        let sv = j.static_values(a0)?;
        let (res, _) = residual(&j, a0)
            .ok_or_else(|| Error::numerical(format!("the law is undefined at the static radius {a0}")))?;
        let v2 = j.potential_taylor(&sv, Law::Scenario).map(|v| v[2]).unwrap_or(f64::NAN);
        let beta2 = j.law_and_slope(sv.stress.sigma()).map(|(_, b)| b);
        let scale = match beta2 {
            Some(b) => marginal_scale(&j.linear_stability(&sv), b, a0),
            None => 1.0 / (a0 * a0),
        };
        let marginal = v2.abs() <= TOL.stability.marginal * scale;
        let init = initial_state(&j, a0, start)?;
        (Some(StaticPart { a0, sigma: sv.stress.sigma(), residual: res.abs(), v2, marginal }), init)
    } else {
        (None, initial_from_data(s, &j, radius, start)?)
    };
    let a_ref = stat.as_ref().map_or(init.radius, |st| st.a0);
    let motion = Motion::new(&j, init.sigma);
    let tr = integrate(&motion, [init.radius, init.rdot, init.sigma], a_ref, duration, opts);
    let decided = |st: &StaticPart| !st.marginal && st.v2.is_finite();
    let linear_period = stat
        .as_ref()
        .filter(|st| decided(st) && st.v2 > 0.0)
        .map(|st| 2.0 * std::f64::consts::PI / (st.v2 / 2.0).sqrt());
    let linear_growth_time =
        stat.as_ref().filter(|st| decided(st) && st.v2 < 0.0).map(|st| 1.0 / (-st.v2 / 2.0).sqrt());
    let linear_verdict = stat.as_ref().map(|st| match () {
        _ if !decided(st) => "marginal",
        _ if st.v2 > 0.0 => "stable",
        _ => "unstable",
    });
    if stat.as_ref().is_some_and(|st| st.marginal) {
        notes.push("V''(a0) vanishes to within a relative 1e-8: the linear test does not decide (marginal), so no linear period or growth time is given".into());
    }
    let measured = period(&tr);
    let period_ratio = match (measured, linear_period) {
        (Some(m), Some(l)) => Some(m.value / l),
        _ => None,
    };
    let ensemble = match (&stat, ens) {
        (Some(st), Some((n, spread))) => Some(ensemble(&j, st.a0, n, spread, duration, opts)),
        _ => None,
    };
    if tr.max_constraint > 1e3 * opts.tol.rtol.max(opts.tol.atol) {
        notes.push(format!(
            "the energy constraint drifted to {:.2e}: tighten the tolerances or shorten the run",
            tr.max_constraint
        ));
    }
    let sides = side_motions(&motion, &tr);
    for sd in &sides {
        if sd.region_end == Some(RegionKind::T) {
            notes.push(format!(
                "the run ends inside a horizon of the {} side (a T-region): there r is a time coordinate and the shell cannot stop",
                sd.side
            ));
        }
        if sd.normal_flips > 0 {
            notes.push(format!(
                "n^r changed sign on the {} side ({} time(s), inside a T-region): should the shell re-enter an R-region of that side, it does so in the other asymptotic region (across the Einstein-Rosen bridge), where its 'keep' is reversed",
                sd.side, sd.normal_flips
            ));
        }
    }
    Ok(EvolveReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        equation_of_state: s.shell.eos.as_ref().map(|e| e.source().to_string()).unwrap_or_default(),
        radius_requested: radius,
        static_radius: stat.as_ref().map(|st| st.a0),
        static_sigma: stat.as_ref().map(|st| st.sigma),
        static_residual: stat.as_ref().map(|st| st.residual),
        start,
        initial: init,
        duration,
        tau_end: tr.last.tau,
        stop: tr.stop.name().into(),
        stop_detail: tr.stop_detail.clone(),
        fate: fate(&tr, a_ref),
        turning_points_count: tr.turning_points.len(),
        turning_points: tr.turning_points.clone(),
        events: tr.events.clone(),
        sides,
        radius_range: [tr.r_range.0, tr.r_range.1],
        potential_second_derivative: stat.as_ref().map(|st| st.v2),
        linear_verdict,
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
