//! Nonlinear dynamics of a timelike shell: its motion in proper time under the scenario's equation of state
//! p = P(sigma), from any initial data, through the horizons of either side.
//!
//! What is integrated (see [`motion::Motion`] for the formulas and sources): the state (R, Rdot, sigma) with
//! sigma from the conservation law with its flux term and Rddot = -(1/2) dV/dR along sigma(R), V the potential of
//! the energy constraint Rdot^2 + V(R, sigma) = 0. The normals n^r_i are algebraic in sigma, so nothing divides by
//! B or by W_i = sqrt(Rdot^2 + B_i): horizons (B_i = 0) and flips of the normal (n^r_i = 0, inside T-regions) are
//! regular points of the motion, reported as events ([`integrate::Event`]). The constraint is a first integral;
//! its drift along the run is reported as a check of the integration.
//!
//! Starting states ([`run::Start`]):
//! - `Moving(V)` / `Sigma { sigma, outward }`: at any radius R with dR/dtau = V (sigma from the angular junction
//!   condition) or with sigma given (|dR/dtau| from the energy constraint), refused when no shell state exists;
//! - a kick DA about a static radius a0: at rest at a0 + DA with sigma from the angular junction condition at rest
//!   there, sigma = -(D-2)/(8 pi R) (nu_+ sqrt(B_+) - nu_- sqrt(B_-)); the law p = P(sigma) governs what follows;
//! - a velocity V0 at a static radius a0, sigma from the angular condition with that velocity,
//!   sigma = -(D-2)/(8 pi R) (nu_+ sqrt(V0^2 + B_+) - nu_- sqrt(V0^2 + B_-)).
//!
//! Integrator: Dormand-Prince 5(4) with error control ([`dopri`]), tolerances in [`EvolveOptions`]. Stop
//! conditions ([`StopReason`]): the duration, the maximum number of turning points, a horizon of either side only
//! when asked (`stop_at_horizon`), R -> 0, the law undefined (e.g. sigma reaching zero under p = -c/sigma), a
//! signature change, a non-finite value, a step underflow, the step limit.
//!
//! ```
//! use junctura::dynamics::{evolve, EvolveOptions, Start};
//! use junctura::scenario::Scenario;
//! let s = Scenario::parse(r#"
//! name = "gravastar"
//! [parameters]
//! m = 1.0
//! l = 0.05
//! w = 0.6
//! [minus]
//! A = "1 - l*r^2/3"
//! keep = "inner"
//! [plus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! [shell]
//! pressure = "w*sigma"
//! "#, None).unwrap();
//! // 3.0638 is within 1e-3 of the stable static radius; it is moved there (with a note).
//! let rep = evolve(&s, 3.0638, Start::Kick(0.01), 40.0, None, &EvolveOptions::default()).unwrap();
//! assert_eq!(rep.fate.name(), "oscillates");
//! assert!((rep.period_ratio.unwrap() - 1.0).abs() < 0.01);
//! ```

pub mod analysis;
pub mod dopri;
pub mod integrate;
pub mod motion;
pub mod run;

pub use analysis::{Ensemble, Fate, Member, Period};
pub use integrate::{integrate, Event, EventKind, EvolveOptions, Sample, StopReason, Trajectory};
pub use motion::{Aux, Halt, Motion};
pub use run::{evolve, initial_from_data, EvolveReport, Initial, SideMotion, Start};
