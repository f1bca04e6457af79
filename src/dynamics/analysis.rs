//! What a trajectory says: the measured period, the fate of the shell, and the ensemble's bounded fraction.

use super::integrate::{StopReason, Trajectory};
use serde::Serialize;

/// What became of the shell.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Fate {
    /// At least two turning points, and the run ended only by the duration or the turn limit.
    Oscillates,
    /// Moving inward at the end, and either stopped at a horizon or the centre, or (ended by the duration with
    /// fewer than two turning points) below both the start and a0.
    Collapses,
    /// Moving outward at the end, and either stopped at a horizon, or (ended by the duration with fewer than two
    /// turning points) above both the start and a0.
    Expands,
    /// Anything else: the law became undefined, a non-finite value, a step underflow, or too short a run to say.
    Stopped,
}

impl Fate {
    /// The JSON word.
    pub fn name(self) -> &'static str {
        match self {
            Fate::Oscillates => "oscillates",
            Fate::Collapses => "collapses",
            Fate::Expands => "expands",
            Fate::Stopped => "stopped",
        }
    }
}

/// Classify a trajectory (definitions on [`Fate`]); `a0` is the static radius.
pub fn fate(tr: &Trajectory, a0: f64) -> Fate {
    let ended_freely = matches!(tr.stop, StopReason::Duration | StopReason::MaxTurns);
    if ended_freely && tr.turning_points.len() >= 2 {
        return Fate::Oscillates;
    }
    let (r, rdot) = (tr.last.radius, tr.last.rdot);
    let r_start = tr.first.radius;
    match tr.stop {
        StopReason::Horizon | StopReason::Center if rdot < 0.0 => Fate::Collapses,
        StopReason::Horizon if rdot > 0.0 => Fate::Expands,
        StopReason::Duration if rdot < 0.0 && r < r_start.min(a0) => Fate::Collapses,
        StopReason::Duration if rdot > 0.0 && r > r_start.max(a0) => Fate::Expands,
        _ => Fate::Stopped,
    }
}

/// The measured period and how many full periods it averages over.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Period {
    /// Mean time between successive same-direction crossings of a0 (or between alternate turning points).
    pub value: f64,
    /// Number of full periods averaged.
    pub cycles: usize,
    /// "a0_crossings" or "turning_points".
    pub method: &'static str,
}

/// The period from the crossings of a0: for each direction with at least two crossings, (last - first) /
/// (count - 1); the two directions are averaged, weighted by their cycle counts. Without two same-direction
/// crossings, alternate turning points are used the same way.
pub fn period(tr: &Trajectory) -> Option<Period> {
    let mean = |ts: &[f64]| -> Option<(f64, usize)> {
        (ts.len() >= 2).then(|| ((ts[ts.len() - 1] - ts[0]) / (ts.len() - 1) as f64, ts.len() - 1))
    };
    let mut parts = Vec::new();
    for dir in [true, false] {
        let ts: Vec<f64> = tr.crossings.iter().filter(|c| c.outward == dir).map(|c| c.tau).collect();
        parts.extend(mean(&ts));
    }
    let mut method = "a0_crossings";
    if parts.is_empty() {
        method = "turning_points";
        for parity in [0, 1] {
            let ts: Vec<f64> = tr.turning_points.iter().skip(parity).step_by(2).map(|t| t.tau).collect();
            parts.extend(mean(&ts));
        }
    }
    let cycles: usize = parts.iter().map(|p| p.1).sum();
    if cycles == 0 {
        return None;
    }
    let value = parts.iter().map(|p| p.0 * p.1 as f64).sum::<f64>() / cycles as f64;
    Some(Period { value, cycles, method })
}

/// One member of an ensemble of kicked shells.
#[derive(Debug, Clone, Serialize)]
pub struct Member {
    /// The kick DA (start at rest at a0 + DA).
    pub kick: f64,
    /// Fate of the motion.
    pub fate: Fate,
    /// Why it ended ("invalid_start" if a0 + DA is not a possible start).
    pub stop: String,
    /// Largest |R - a0|.
    pub max_excursion: f64,
    /// Largest |Rdot^2 + V| / (1 + Rdot^2).
    pub max_constraint: f64,
    /// Bounded by the definition on [`Ensemble`].
    pub bounded: bool,
}

/// A nonlinear basin-of-stability estimate: N kicks spread uniformly over [-S, S] (both ends included), each
/// integrated for the whole duration (no turn limit). A member is bounded if the run ended by the duration
/// (no horizon, centre, undefined law or numerical stop) and |R - a0| never exceeded `bound` = factor * S.
#[derive(Debug, Clone, Serialize)]
pub struct Ensemble {
    /// N.
    pub members_count: usize,
    /// S.
    pub spread: f64,
    /// The excursion bound factor * S.
    pub bound: f64,
    /// Number of bounded members.
    pub bounded: usize,
    /// bounded / N.
    pub bounded_fraction: f64,
    /// Every member, in order of kick.
    pub members: Vec<Member>,
}

/// The N kicks of an ensemble: N points spread evenly over [-S, S] with both ends included (N >= 2).
pub fn ensemble_kicks(n: usize, spread: f64) -> Vec<f64> {
    crate::spacing::linear(-spread, spread, n)
}
