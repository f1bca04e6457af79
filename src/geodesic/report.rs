//! Result structs of a crossing with the orbit on each side ([`report`]) and of a chain of crossings with
//! optional SI lengths ([`chain`]), as the command-line program and the bindings print or return them. Both
//! take a plain request ([`CrossingRequest`], [`ChainRequest`]) that the front ends fill, and check it here.

use super::apex::{max_radius, Apex};
use super::chain::Chain;
use super::crossing::{cross, CrossingRequest, SideState};
use super::iterate::{run_chain, ChainRow, ChainRun};
use super::quad::QuadOptions;
use super::radial::{Particle, Radial};
use super::series::{chain_series, Series};
use crate::error::{Error, ErrorKind, RequestField, Result};
use crate::metric::{default_range, SideFns};
use crate::model::{Keep, Which};
use crate::phrase;
use crate::roots::RootOptions;
use crate::scenario::Scenario;
use crate::units::{parse_length, parse_mass, Length, MassUnit, PLANCK_LENGTH_M};
use serde::Serialize;

/// The particle's orbit on one side after (minus: before) the crossing.
#[derive(Debug, Clone, Serialize)]
pub struct OrbitReport {
    /// Energy, metric functions, velocities at R on this side.
    #[serde(flatten)]
    pub state: SideState,
    /// Turning points (A = E^2) on the kept part of the side.
    pub turning_points: Vec<f64>,
    /// The maximal radius above R (timelike orbits on an outer or T-region side), with its horizon distances.
    pub max_radius: Option<Apex>,
    /// Proper time from R to the maximal radius.
    pub proper_time_to_max_radius: Option<f64>,
    /// Coordinate time t from R to the maximal radius.
    pub coordinate_time_to_max_radius: Option<f64>,
    /// Why a quantity is missing (inner side, unbounded orbit, light ray, quadrature failure).
    pub notes: Vec<String>,
}

/// A radial test particle or light ray crossing the shell, with its orbit on each side.
#[derive(Debug, Clone, Serialize)]
pub struct CrossingReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance line.
    pub provenance: String,
    /// Timelike particle or light ray.
    pub particle: Particle,
    /// Shell radius R at the crossing.
    pub radius: f64,
    /// dR/dtau of the shell.
    pub shell_velocity: f64,
    /// Killing energy on the minus side.
    pub energy_minus: f64,
    /// Killing energy on the plus side (if it crosses).
    pub energy_plus: Option<f64>,
    /// Lorentz factor relative to the shell, from the minus side.
    pub relative_lorentz_factor: Option<f64>,
    /// The same from the plus side (a consistency check).
    pub relative_lorentz_factor_check: Option<f64>,
    /// Energy measured by the shell's normal observer (spacelike shells).
    pub shell_frame_energy: Option<f64>,
    /// Whether the particle reaches the plus side.
    pub can_cross: bool,
    /// Why it cannot cross.
    pub reason: Option<String>,
    /// `timelike` or `spacelike`.
    pub shell_kind: &'static str,
    /// The orbit on the minus side.
    pub minus: OrbitReport,
    /// The orbit on the plus side (if it crosses).
    pub plus: Option<OrbitReport>,
}

/// Cross the shell with `req` (see [`cross`] for the crossing map and its conventions) and follow the orbit on
/// each side: turning points, the maximal radius above R ([`max_radius`]) and the proper and coordinate times
/// to reach it ([`Radial`]). Radius, energy and shell velocity are checked first ([`crate::request::value`]).
pub fn report(s: &Scenario, req: &CrossingRequest) -> Result<CrossingReport> {
    for (field, v) in [
        (RequestField::Radius, req.radius),
        (RequestField::Energy, req.energy_minus),
        (RequestField::ShellVelocity, req.shell_velocity),
    ] {
        crate::request::value(field, v)?;
    }
    let c = cross(s, s.params.values(), req)?;
    let minus = orbit_report(s, Which::Minus, c.minus, req);
    let plus = c.plus.map(|p| orbit_report(s, Which::Plus, p, req));
    Ok(CrossingReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        particle: req.particle,
        radius: req.radius,
        shell_velocity: req.shell_velocity,
        energy_minus: c.energy_minus,
        energy_plus: c.energy_plus,
        relative_lorentz_factor: c.relative_lorentz_factor,
        relative_lorentz_factor_check: c.relative_lorentz_factor_check,
        shell_frame_energy: c.shell_frame_energy,
        can_cross: c.can_cross,
        reason: c.reason,
        shell_kind: c.shell_kind,
        minus,
        plus,
    })
}

/// The orbit of the particle on one side: turning points, apex above R, and the times to reach it.
fn orbit_report(s: &Scenario, which: Which, state: SideState, req: &CrossingRequest) -> OrbitReport {
    let roots = RootOptions { samples: 2000, ..Default::default() };
    let quad = QuadOptions::default();
    let fns = SideFns::of(s.model.side(which), s.params.values());
    let rad = Radial::new(fns, state.energy, req.particle);
    let (lo, hi) = default_range(s);
    let (lo, hi) = (lo.min(0.5 * req.radius), hi.max(10.0 * req.radius));
    let mut notes = Vec::new();
    // Only the kept part of the side matters: r <= R (inner), r >= R (outer), all of it for a T-region.
    let keep = s.side(which).keep;
    let kept = |r: f64| match keep {
        Keep::Inner => r <= req.radius,
        Keep::Outer => r >= req.radius,
        Keep::BlackHole | Keep::WhiteHole => true,
    };
    let turning_points: Vec<f64> = rad.turning_points(lo, hi, &roots).into_iter().filter(|r| kept(*r)).collect();
    let mut apex = None;
    let (mut tau, mut t) = (None, None);
    if keep == Keep::Inner {
        notes.push("this side keeps r < R: the orbit leaves it at the shell, so no maximal radius is reported".into());
    } else if req.particle == Particle::Timelike {
        match max_radius(&fns, state.energy * state.energy, req.radius, hi, &roots, &quad) {
            Ok(Some(a)) => apex = Some(a),
            Ok(None) => notes.push(format!("unbounded: no turning point above R up to r = {hi}")),
            Err(e) => notes.push(format!("maximal radius: {}", e.message)),
        }
    } else {
        notes.push("a radial light ray has no turning point".into());
    }
    if let Some(a) = &apex {
        match rad.proper_time(req.radius, a.radius, &roots, &quad) {
            Ok(q) => tau = Some(q.value),
            Err(e) => notes.push(format!("proper time: {}", e.message)),
        }
        match rad.coordinate_time(req.radius, a.radius, &roots, &quad) {
            Ok(q) => t = Some(q.value),
            Err(e) => notes.push(format!("coordinate time: {}", e.message)),
        }
    }
    OrbitReport {
        state,
        turning_points,
        max_radius: apex,
        proper_time_to_max_radius: tau,
        coordinate_time_to_max_radius: t,
        notes,
    }
}

/// One chain row with its distances to the horizon also in metres (when a mass unit is given).
#[derive(Debug, Clone, Serialize)]
pub struct ChainRowReport {
    /// The crossing, its energies and the orbit's apex (geometric units).
    #[serde(flatten)]
    pub row: ChainRow,
    /// Areal distance r_max - r_h in metres.
    pub areal_distance_m: Option<f64>,
    /// Proper distance from the horizon to r_max in metres.
    pub proper_distance_m: Option<f64>,
}

/// A chain of crossings with its threshold and optional SI lengths.
#[derive(Debug, Clone, Serialize)]
pub struct ChainReport {
    /// Chain name.
    pub chain: String,
    /// Provenance line (chain, hash, crossings, mass unit).
    pub provenance: String,
    /// Number of crossings iterated.
    pub crossings: usize,
    /// The mass unit M in kg.
    pub mass_kg: Option<f64>,
    /// The mass unit in solar masses.
    pub mass_solar: Option<f64>,
    /// G M / c^2 in metres.
    pub length_unit_m: Option<f64>,
    /// The distance threshold (geometric units).
    pub threshold: Option<f64>,
    /// The distance threshold in metres.
    pub threshold_m: Option<f64>,
    /// First crossing whose areal distance is within the threshold.
    pub first_within_areal: Option<usize>,
    /// First crossing whose proper distance is within the threshold.
    pub first_within_proper: Option<usize>,
    /// Precision and validity warnings of the run.
    pub warnings: Vec<String>,
    /// One row per crossing.
    pub rows: Vec<ChainRowReport>,
    /// Figure series (distance, energy) per crossing.
    pub series: Vec<Series>,
    /// The run itself (for CSV output).
    #[serde(skip)]
    pub run: ChainRun,
    /// The mass unit, if given.
    #[serde(skip)]
    pub unit: Option<MassUnit>,
}

/// What to iterate over a chain: as the front ends fill it.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ChainRequest {
    /// Number of crossings (default: the chain file's `crossings`).
    pub crossings: Option<usize>,
    /// A mass unit such as `1Msun` or `2e30kg` ([`parse_mass`]); adds lengths in metres.
    pub mass: Option<String>,
    /// A distance to the horizon such as `1lP`, `1e-30m`, `1e-3M` ([`parse_length`]; default with a mass: one
    /// Planck length): the report names the first crossing whose orbit comes that close.
    pub within: Option<String>,
}

/// Iterate the crossings of `chain` that `req` asks for ([`run_chain`]), with the threshold and lengths in
/// metres when a mass unit is given. Errors name the request fields (`crossings`, `mass`, `within`).
pub fn chain(chain: &Chain, req: &ChainRequest) -> Result<ChainReport> {
    let crossings = req.crossings.unwrap_or(chain.crossings);
    let (mass, within) = (req.mass.as_deref(), req.within.as_deref());
    if crossings == 0 {
        let message = phrase![RequestField::Crossings, " 0: nothing to do"];
        return Err(Error::request(ErrorKind::Input, RequestField::Crossings, 0, message).with_hint_phrase(phrase![
            "give ",
            RequestField::Crossings,
            " N with N >= 1"
        ]));
    }
    let unit = match mass {
        Some(m) => Some(MassUnit::new(parse_mass(m)?)?),
        None => None,
    };
    let within = match (within, &unit) {
        (Some(w), _) => Some(parse_length(w)?),
        (None, Some(_)) => Some(Length::Metres(PLANCK_LENGTH_M)),
        (None, None) => None,
    };
    let threshold = within
        .map(|w| w.geometric(unit.as_ref()))
        .transpose()
        .map_err(|e| e.context_phrase(phrase![RequestField::Within]))?;
    let run = run_chain(chain, crossings, threshold)?;
    let mut provenance = format!("{} | crossings {crossings}", chain.provenance());
    if let (Some(m), Some(u)) = (mass, &unit) {
        provenance.push_str(&format!(" | mass {m} = {:.6e} kg, G M/c^2 = {:.9e} m", u.kg(), u.length_m()));
    }
    let to_m = |v: Option<f64>| unit.and_then(|u| v.map(|d| u.to_m(d)));
    let rows = run
        .rows
        .iter()
        .map(|row| ChainRowReport {
            row: row.clone(),
            areal_distance_m: to_m(row.apex.and_then(|a| a.areal_distance)),
            proper_distance_m: to_m(row.apex.and_then(|a| a.proper_distance)),
        })
        .collect();
    Ok(ChainReport {
        chain: chain.name.clone(),
        provenance,
        crossings,
        mass_kg: unit.map(|u| u.kg()),
        mass_solar: unit.map(|u| u.solar_masses()),
        length_unit_m: unit.map(|u| u.length_m()),
        threshold: run.threshold,
        threshold_m: to_m(run.threshold),
        first_within_areal: run.first_within_areal,
        first_within_proper: run.first_within_proper,
        warnings: run.warnings.clone(),
        rows,
        series: chain_series(&run, unit.as_ref()),
        run,
        unit,
    })
}

impl ChainReport {
    /// The figures of the run that have data ([`chain_figures`](super::series::chain_figures); the threshold in
    /// metres when a mass unit is given, like the distances).
    pub fn figures(&self) -> Vec<(String, crate::plot::Figure)> {
        let threshold = match (self.run.threshold, self.unit.as_ref()) {
            (Some(t), Some(u)) => Some(u.to_m(t)),
            (t, _) => t,
        };
        super::series::chain_figures(&self.series, threshold, &self.provenance)
            .into_iter()
            .filter(|(_, fig)| fig.series.iter().any(|s| s.points.iter().any(|p| p.1.is_finite())))
            .collect()
    }
}
