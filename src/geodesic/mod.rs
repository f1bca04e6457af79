//! Radial test particles and light rays: motion on each side, crossing a thin shell, and chains of shells.
//!
//! - [`radial`]: conserved Killing energy E = -u_t, turning points (A(r) = E^2), proper and coordinate time
//!   between radii by adaptive Gauss-Kronrod quadrature ([`quad`]).
//! - [`apex`]: the maximal radius of a bounded orbit and its areal and proper distance to the horizon, carried
//!   to full relative precision right next to the horizon.
//! - [`crossing`]: the crossing map minus -> plus for static, moving (timelike) and spacelike shells.
//! - [`chain`](mod@chain) / [`iterate`]: chain files and the iterated crossing map; [`series`]: data for a figure.
//! - [`report()`] and [`chain()`]: a crossing with the orbit on each side, and a chain of crossings, from plain
//!   requests ([`CrossingRequest`], [`ChainRequest`]) as the command line and the bindings fill them; their
//!   result structs live in [`report`](mod@report).
//!
//! Precision method: plain f64 with the small quantities (E^2, r_max - r_h) carried directly and near-horizon
//! Taylor series from dual numbers; no arbitrary-precision arithmetic. Tests compare with an exact big-rational
//! iteration.
//!
//! ```
//! use junctura::scenario::Scenario;
//! use junctura::geodesic::{cross, CrossingRequest, Particle};
//! let s = Scenario::parse(r#"
//! name = "flat interior, Schwarzschild exterior"
//! [parameters]
//! m = 1.0
//! [minus]
//! A = "1"
//! keep = "inner"
//! [plus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! "#, None).unwrap();
//! let req = CrossingRequest { radius: 4.0, shell_velocity: 0.0, energy_minus: 1.1,
//!                             particle: Particle::Timelike, direction: None };
//! let c = cross(&s, s.params.values(), &req).unwrap();
//! // Static shell: E_plus = E_minus sqrt(A_plus(R)/A_minus(R)).
//! assert!((c.energy_plus.unwrap() - 1.1 * 0.5f64.sqrt()).abs() < 1e-14);
//! ```

pub mod apex;
pub mod chain;
pub mod crossing;
pub mod iterate;
pub mod quad;
pub mod radial;
pub mod report;
pub mod series;

pub use apex::{max_radius, Apex, ApexMethod};
pub use chain::{Chain, Stage};
pub use crossing::{cross, Crossing, CrossingRequest, Direction, SideState};
pub use iterate::{run_chain, ChainRow, ChainRun};
pub use quad::{Quad, QuadOptions};
pub use radial::{Particle, Radial};
pub use report::{chain, report, ChainReport, ChainRequest, ChainRowReport, CrossingReport, OrbitReport};
pub use series::{chain_series, Series};
