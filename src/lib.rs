//! # junctura
//!
//! Thin shells between two static spherically symmetric spacetimes
//! `ds^2 = -A(r) dt^2 + dr^2/B(r) + r^2 dOmega^2_(D-2)`: Israel junction conditions, the shell's equation of
//! motion and potential, static radii and their linear stability, test particles through the shell, and
//! paper-ready outputs.
//!
//! The data flow follows the module layout:
//! `scenario` (file -> validated model) -> `expr` (typed text -> values and exact derivatives)
//! -> `metric` (one side: horizons, regions) -> `junction` (Lanczos equation, potential, stability)
//! -> `statics` (static radii, tuning, sweeps) -> `scan` (maps) -> `report`/`export`/`plot` (outputs).
//!
//! ```
//! use junctura::scenario::Scenario;
//! let s = Scenario::parse(r#"
//! name = "Schwarzschild thin-shell wormhole"
//! [parameters]
//! m = 1.0
//! [minus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! [plus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! "#, None).unwrap();
//! assert_eq!(s.params.get("m").unwrap(), 1.0);
//! ```
#![warn(missing_docs)]

pub mod algebra;
pub mod dynamics;
pub mod error;
pub mod export;
pub mod expr;
pub mod files;
pub mod geodesic;
pub mod input;
pub mod junction;
pub mod metric;
pub mod model;
pub mod newton;
pub mod output;
pub mod plot;
pub mod rational;
pub mod report;
pub mod request;
pub mod roots;
pub mod scan;
pub mod scenario;
pub mod spacing;
pub mod statics;
pub mod survey;
pub mod text;
pub mod tolerances;
pub mod units;

pub use error::{Error, ErrorKind, Problem, RequestField, Result};
