//! The survey of a scenario's two sides over a radius range: horizons, R-/T-regions, circular photon orbits and
//! poles of B on each side, with what the sides are (kept part, normal sign, A and B as written).
//!
//! A horizon of `-A dt^2 + dr^2/B` is where B changes sign through zero (not through a pole); R-regions have
//! B > 0, T-regions B < 0. The root finding and its tolerances are those of [`crate::metric::survey`].

use crate::metric::{survey as survey_side, SideFns, SideSurvey};
use crate::model::Which;
use crate::request::RangeRequest;
use crate::roots::RootOptions;
use crate::scenario::Scenario;
use serde::Serialize;

/// Root-finder samples across the range: fine enough to separate nearby horizons of the shipped scenarios.
pub const SURVEY_SAMPLES: usize = 4000;

/// One side as written in the scenario and its survey.
#[derive(Debug, Clone, Serialize)]
pub struct SideReport {
    /// The kept part (`inner`, `outer`, `black_hole`, `white_hole`).
    pub keep: String,
    /// Sign of the radial component of the normal n^r on this side (+1 or -1).
    pub normal_sign: f64,
    /// A(r) as written.
    #[serde(rename = "A")]
    pub a: String,
    /// B(r) as written.
    #[serde(rename = "B")]
    pub b: String,
    /// Horizons, regions, photon orbits and poles.
    #[serde(flatten)]
    pub survey: SideSurvey,
}

/// The survey of both sides over `[from, to]`.
#[derive(Debug, Clone, Serialize)]
pub struct SurveyReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance line (scenario, hash, parameters, tool version).
    pub provenance: String,
    /// Spacetime dimension D.
    pub dimension: u32,
    /// `timelike` or `spacelike`.
    pub shell_kind: String,
    /// Lower end of the surveyed radius range.
    pub from: f64,
    /// Upper end of the surveyed radius range.
    pub to: f64,
    /// The side the normal points away from.
    pub minus: SideReport,
    /// The side the normal points into.
    pub plus: SideReport,
}

/// `check`: survey both sides of `s` over the radius range `req` asks for (missing ends from the scenario's
/// default range; the range is checked by [`RangeRequest::resolve`]).
pub fn check(s: &Scenario, req: &RangeRequest) -> crate::Result<SurveyReport> {
    let (lo, hi) = req.resolve(s)?;
    Ok(survey(s, lo, hi))
}

/// Survey both sides of `s` over `[lo, hi]` (a range already checked, e.g. by [`crate::request::range`]).
pub fn survey(s: &Scenario, lo: f64, hi: f64) -> SurveyReport {
    let opts = RootOptions { samples: SURVEY_SAMPLES, ..Default::default() };
    let side = |w: Which| {
        let sd = s.side(w);
        let fns = SideFns::of(s.model.side(w), s.params.values());
        SideReport {
            keep: sd.keep.name().to_string(),
            normal_sign: sd.normal_sign(),
            a: sd.a.source().to_string(),
            b: sd.b.source().to_string(),
            survey: survey_side(&fns, lo, hi, &opts),
        }
    };
    SurveyReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        dimension: s.dimension,
        shell_kind: s.shell.kind.name().to_string(),
        from: lo,
        to: hi,
        minus: side(Which::Minus),
        plus: side(Which::Plus),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn schwarzschild_side_has_its_horizon_at_two_m() {
        // Schwarzschild 1916: B = 1 - 2m/r vanishes at r = 2m; photon sphere at r = 3m (common practice).
        let s = Scenario::parse(
            "name = \"w\"\n[parameters]\nm = 1.0\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n",
            None,
        )
        .unwrap();
        let r = survey(&s, 0.5, 20.0);
        assert_eq!(r.minus.survey.horizons.len(), 1);
        assert!((r.minus.survey.horizons[0].radius - 2.0).abs() < 1e-12);
        assert!((r.plus.survey.photon_orbits[0] - 3.0).abs() < 1e-9);
        assert_eq!(r.shell_kind, "timelike");
    }
}
