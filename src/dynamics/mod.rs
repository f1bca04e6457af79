//! Nonlinear dynamics of a timelike shell: its motion in proper time under the scenario's equation of state
//! p = P(sigma), from a static radius set moving by a kick or a velocity.
//!
//! What is integrated (see [`motion::Motion`] for the formulas and sources): the state (R, Rdot, sigma) with
//! Rddot from the Lanczos theta-theta equation p = S^theta_theta(R, Rdot, Rddot) = P(sigma), which is linear in
//! Rddot and solved for it, and sigma from the conservation law with its flux term. The energy constraint
//! Rdot^2 + V(R, sigma) = 0 is not imposed; it holds at the start by construction and its drift along the run
//! is reported as a check of the integration.
//!
//! Starting states ([`run::Start`]):
//! - a kick DA: the shell starts at rest at a0 + DA with sigma from the angular junction condition at rest there,
//!   sigma = -(D-2)/(8 pi R) (nu_+ sqrt(B_+) - nu_- sqrt(B_-)), i.e. the static-family value at a0 + DA; then
//!   Rdot^2 + V = 0 holds at the start, and the law p = P(sigma) (not the static family) governs what follows;
//! - a velocity V0: the shell starts at a0 with Rdot = V0 and sigma from the angular condition with that
//!   velocity, sigma = -(D-2)/(8 pi R) (nu_+ sqrt(V0^2 + B_+) - nu_- sqrt(V0^2 + B_-)).
//!
//! Integrator: Dormand-Prince 5(4) with error control ([`dopri`]), tolerances in [`EvolveOptions`]. Stop
//! conditions ([`StopReason`]): the duration, the maximum number of turning points, a horizon of either side
//! (B -> 0), R -> 0, Rdot^2 + B <= 0, the law undefined (e.g. sigma reaching zero under p = -c/sigma), a
//! non-finite value, a step underflow, the step limit.
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
pub use integrate::{integrate, EvolveOptions, Sample, StopReason, Trajectory};
pub use motion::{Aux, Halt, Motion};
pub use run::{evolve, EvolveReport, Initial, Start};
