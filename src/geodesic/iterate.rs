//! Iterating the crossing map along a [`Chain`]: after each crossing, the energy, the maximal radius of the
//! bounded orbit on the far side, its areal and proper distance to the horizon, and the first crossing after
//! which that distance falls below a threshold (e.g. one Planck length).
//!
//! Precision: the small quantities are carried directly, never formed as differences of O(1) numbers. E (hence
//! E^2) is multiplied from crossing to crossing, so energies down to 1e-150 keep full relative precision, and
//! apex distances r_max - r_h come from the near-horizon series of [`super::apex`]. Everything is plain f64: no
//! arbitrary precision is needed; the tests check the result against an exact big-rational iteration.
//! (1 - E^2 is reported as computed from E: it is not small in the chains that approach a horizon.)

use super::apex::{max_radius, Apex};
use super::chain::Chain;
use super::crossing::{cross, CrossingRequest};
use super::quad::QuadOptions;
use super::radial::Particle;
use crate::error::Result;
use crate::metric::{length_scale, SideFns};
use crate::roots::RootOptions;
use serde::Serialize;

/// One crossing of the chain.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ChainRow {
    /// Crossing number, from 1.
    pub crossing: usize,
    /// Stage number, from 1.
    pub stage: usize,
    /// Pass through the stages, from 0 (the `multiply` factors are raised to this power).
    pub pass: usize,
    /// Shell radius at the crossing (geometric units).
    pub radius: f64,
    /// E before the crossing.
    pub energy_minus: f64,
    /// E after the crossing (None if it cannot cross).
    pub energy_plus: Option<f64>,
    /// 1 - E_plus^2 (None if it cannot cross).
    pub one_minus_energy_sq: Option<f64>,
    /// Relative Lorentz factor with the shell (or its normal observer).
    pub relative_lorentz_factor: Option<f64>,
    /// Maximal radius of the orbit on the plus side (None: unbounded or cannot cross).
    pub apex: Option<Apex>,
    /// `bounded`, `unbounded`, or why the chain stopped.
    pub status: String,
}

/// A whole run.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ChainRun {
    /// One row per crossing (the run stops at the first crossing that fails).
    pub rows: Vec<ChainRow>,
    /// The distance threshold (geometric units), if one was given.
    pub threshold: Option<f64>,
    /// First crossing after which the apex is within `threshold` of the horizon in areal radius.
    pub first_within_areal: Option<usize>,
    /// First crossing after which the apex is within `threshold` of the horizon in proper distance.
    pub first_within_proper: Option<usize>,
    /// Notes for the user (e.g. consecutive stages whose sides do not match).
    pub warnings: Vec<String>,
}

/// Most crossings one run may ask for (each keeps a row of ~200 bytes; 1e7 is about 2 GB).
pub const MAX_CROSSINGS: usize = 10_000_000;

/// Run `crossings` crossings of `chain` (threshold in geometric units, optional).
pub fn run_chain(chain: &Chain, crossings: usize, threshold: Option<f64>) -> Result<ChainRun> {
    if crossings > MAX_CROSSINGS {
        return Err(crate::Error::input(format!(
            "{crossings} crossings: more than the {MAX_CROSSINGS} one run can keep"
        ))
        .with_hint_phrase(crate::phrase![
            "ask for fewer crossings (",
            crate::RequestField::Crossings,
            " N or crossings = N in the chain file)"
        ]));
    }
    let roots = RootOptions { samples: 600, ..Default::default() };
    let quad = QuadOptions::default();
    let n = chain.stages.len();
    let mut rows = Vec::with_capacity(crossings.min(4096));
    let mut warnings = Vec::new();
    let mut energy = chain.energy;
    let (mut first_areal, mut first_proper) = (None, None);
    for k in 0..crossings {
        let (s, pass) = (k % n, k / n);
        let stage = &chain.stages[s];
        let params = stage.params_for_pass(&chain.multiply, pass)?;
        let radius: f64 = stage.radius.eval_at(0.0, &params);
        let velocity: f64 = stage.shell_velocity.eval_at(0.0, &params);
        if k + 1 < crossings {
            if let Some(w) = continuity_warning(chain, k, &params, radius) {
                if !warnings.contains(&w) {
                    warnings.push(w);
                }
            }
        }
        let req = CrossingRequest {
            radius,
            shell_velocity: velocity,
            energy_minus: energy,
            particle: Particle::Timelike,
            direction: None,
        };
        let c = cross(&stage.scenario, &params, &req)
            .map_err(|e| e.context(format!("crossing {} (stage {})", k + 1, s + 1)))?;
        let mut row = ChainRow {
            crossing: k + 1,
            stage: s + 1,
            pass,
            radius,
            energy_minus: energy,
            energy_plus: c.energy_plus,
            one_minus_energy_sq: None,
            relative_lorentz_factor: c.relative_lorentz_factor,
            apex: None,
            status: String::new(),
        };
        let Some(e_plus) = c.energy_plus.filter(|_| c.can_cross) else {
            row.status = format!("cannot cross: {}", c.reason.unwrap_or_default());
            rows.push(row);
            break;
        };
        energy = e_plus;
        let one_minus = 1.0 - energy * energy;
        row.one_minus_energy_sq = Some(one_minus);
        let fns = SideFns::of(&stage.scenario.model.plus, &params);
        let hi = 1e8 * radius.max(length_scale(&stage.scenario));
        match max_radius(&fns, energy * energy, radius, hi, &roots, &quad) {
            Ok(Some(apex)) => {
                row.status = "bounded".into();
                if let Some(t) = threshold {
                    if first_areal.is_none() && apex.areal_distance.is_some_and(|d| d <= t) {
                        first_areal = Some(k + 1);
                    }
                    if first_proper.is_none() && apex.proper_distance.is_some_and(|d| d <= t) {
                        first_proper = Some(k + 1);
                    }
                }
                row.apex = Some(apex);
            }
            Ok(None) if one_minus > 0.0 => {
                row.status = format!("bounded (1 - E^2 = {one_minus:e}) but the apex lies beyond r = {hi:e}");
            }
            Ok(None) => row.status = "unbounded".into(),
            Err(e) => {
                row.status = format!("stopped: {}", e.message);
                rows.push(row);
                break;
            }
        }
        rows.push(row);
    }
    Ok(ChainRun { rows, threshold, first_within_areal: first_areal, first_within_proper: first_proper, warnings })
}

/// A warning if the plus side of crossing k and the minus side of crossing k + 1 differ (the particle's
/// energy only carries over between identical static spacetimes).
fn continuity_warning(chain: &Chain, k: usize, params: &[f64], radius: f64) -> Option<String> {
    let n = chain.stages.len();
    let next = &chain.stages[(k + 1) % n];
    let next_params = next.params_for_pass(&chain.multiply, (k + 1) / n).ok()?;
    let this = SideFns::of(&chain.stages[k % n].scenario.model.plus, params);
    let that = SideFns::of(&next.scenario.model.minus, &next_params);
    for f in [0.5, 1.0, 3.0, 17.0] {
        let r = f * radius;
        let (a, b): (f64, f64) = (this.a(r), that.a(r));
        if (a - b).abs() > 1e-10 * (1.0 + a.abs()) {
            return Some(format!(
                "stage {} plus side and stage {} minus side differ (A({r}) = {a} vs {b}): the energy is carried over anyway",
                k % n + 1,
                (k + 1) % n + 1
            ));
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use num_bigint::BigInt;
    use num_rational::BigRational;

    fn bounce(energy: f64, lambda: f64, alpha: f64, crossings: usize) -> Chain {
        let text = format!(
            r#"
name = "bounce"
crossings = {crossings}
[particle]
energy = {energy}
[[stage]]
radius = "alpha*m"
[stage.inline]
name = "bounce"
[stage.inline.parameters]
m = 1.0
lambda = {lambda}
alpha = {alpha}
[stage.inline.minus]
A = "1 - 2*m/r"
keep = "black-hole"
[stage.inline.plus]
A = "1 - 2*lambda*m/r"
keep = "white-hole"
[stage.inline.shell]
kind = "spacelike"
[cycle]
multiply = {{ m = {lambda} }}
"#
        );
        Chain::parse(&text, None).unwrap()
    }

    fn ratio(n: i64, d: i64) -> BigRational {
        BigRational::new(BigInt::from(n), BigInt::from(d))
    }

    /// log10 of a positive big rational, good to ~1e-15 relative at any magnitude.
    fn log10(x: &BigRational) -> f64 {
        let (n, d) = (x.numer().to_string(), x.denom().to_string());
        let lg = |s: &str| {
            let head: f64 = format!("0.{}", &s[..s.len().min(17)]).parse().unwrap_or(1.0);
            head.log10() + s.len() as f64
        };
        lg(&n) - lg(&d)
    }

    #[test]
    fn bounce_chain_matches_exact_rational_iteration() {
        // Exact check (independent of the f64 pipeline): Schwarzschild bounce at R = alpha m_k with
        // m_(k+1) = lambda m_k. The kept t-component gives E_(k+1)^2 = E_k^2 (2 lambda - alpha)/(2 - alpha)
        // and the apex satisfies R_max - 2 m_(k+1) = 2 m_(k+1) E^2/(1 - E^2) (R_max = 2M/(1 - E^2), textbook),
        // all rational for rational inputs; iterate exactly with big rationals and compare magnitudes.
        let (e0sq, lambda, alpha) = (ratio(81, 100), ratio(9, 10), ratio(1, 1));
        let n = 300;
        let chain = bounce(0.9, 0.9, 1.0, n);
        let run = run_chain(&chain, n, Some(1e-38)).unwrap();
        assert_eq!(run.rows.len(), n);
        let two = ratio(2, 1);
        let q = (&two * &lambda - &alpha) / (&two - &alpha);
        let (mut e2, mut m) = (e0sq, ratio(1, 1));
        for row in &run.rows {
            e2 = &e2 * &q;
            m = &m * &lambda;
            let one = ratio(1, 1);
            let delta = &two * &m * &e2 / (&one - &e2);
            let got = row.apex.unwrap().areal_distance.unwrap();
            assert!(
                (got.log10() - log10(&delta)).abs() < 1e-12 * log10(&delta).abs().max(1.0),
                "crossing {}: {got} vs 10^{}",
                row.crossing,
                log10(&delta)
            );
            // Proper distance from the horizon: sqrt(d (2M + d)) + 2M asinh(sqrt(d/2M)), the elementary
            // antiderivative of (1 - 2M/r)^(-1/2) (common practice), evaluated at the exact d.
            let (mk, d) = (2.0 * 0.9f64.powi(row.crossing as i32) / 2.0, 10f64.powf(log10(&delta)));
            let s = (d * (2.0 * mk + d)).sqrt() + 2.0 * mk * (d / (2.0 * mk)).sqrt().asinh();
            let ps = row.apex.unwrap().proper_distance.unwrap();
            assert!((ps - s).abs() < 1e-9 * s, "crossing {}: {ps} vs {s}", row.crossing);
        }
        // The last apex sits ~1e-29 horizon radii above the horizon: far below what f64 radii resolve.
        let last = run.rows.last().unwrap().apex.unwrap();
        assert!(last.areal_distance.unwrap() < 1e-28 * last.horizon.unwrap());
        assert_eq!(
            last.radius,
            last.horizon.unwrap(),
            "r_max rounds to r_h in f64; the distance is carried separately"
        );
        let first = run.first_within_areal.unwrap();
        assert!(run.rows[first - 1].apex.unwrap().areal_distance.unwrap() <= 1e-38);
        assert!(run.rows[first - 2].apex.unwrap().areal_distance.unwrap() > 1e-38);
    }

    #[test]
    fn mismatched_consecutive_stages_are_warned_about() {
        // Without [cycle] multiply the plus side (mass 0.9) of one pass differs from the next minus side (mass 1).
        let mut chain = bounce(0.9, 0.9, 1.0, 3);
        chain.multiply.clear();
        let run = run_chain(&chain, 3, None).unwrap();
        assert_eq!(run.warnings.len(), 1, "{:?}", run.warnings);
        assert!(run.warnings[0].contains("differ"));
        let ok = run_chain(&bounce(0.9, 0.9, 1.0, 3), 3, None).unwrap();
        assert!(ok.warnings.is_empty(), "{:?}", ok.warnings);
    }
}
