//! Data series of a chain run against crossing number, for a figure. A pure function: it returns data; the
//! chain's CSV table is `export::csv::chain`, files are written elsewhere (`output::write_atomic`).
//!
//! The figure itself belongs to the plotting module: [`chain_series`] is the one place that decides what is
//! plotted (log-scale y axes for the distances), so wiring it to a plot needs no physics.

use super::iterate::ChainRun;
use crate::units::MassUnit;
use serde::Serialize;

/// One named series y(x) with its axis labels and units.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Series {
    /// Short machine name.
    pub name: String,
    /// Axis label of y, with its unit.
    pub y_label: String,
    /// Axis label of x.
    pub x_label: String,
    /// True where y spans many decades and should be drawn on a log axis.
    pub log_y: bool,
    /// x values (crossing numbers).
    pub x: Vec<f64>,
    /// y values.
    pub y: Vec<f64>,
}

/// The series to plot for a chain run: energy after each crossing, and the apex's areal and proper distance
/// to the horizon (in metres if a mass unit is given, else in units of G M/c^2). Rows without a bounded apex
/// are left out of the distance series.
pub fn chain_series(run: &ChainRun, unit: Option<&MassUnit>) -> Vec<Series> {
    let (scale, u) = match unit {
        Some(m) => (m.length_m(), "m"),
        None => (1.0, "G M/c^2"),
    };
    let x_label = "crossing number".to_string();
    let energy: Vec<(f64, f64)> =
        run.rows.iter().filter_map(|r| r.energy_plus.map(|e| (r.crossing as f64, e))).collect();
    let pick = |f: &dyn Fn(&super::apex::Apex) -> Option<f64>| -> Vec<(f64, f64)> {
        run.rows.iter().filter_map(|r| r.apex.as_ref().and_then(f).map(|d| (r.crossing as f64, d * scale))).collect()
    };
    let areal = pick(&|a| a.areal_distance);
    let proper = pick(&|a| a.proper_distance);
    let mk = |name: &str, y_label: String, log_y: bool, pts: Vec<(f64, f64)>| Series {
        name: name.into(),
        y_label,
        x_label: x_label.clone(),
        log_y,
        x: pts.iter().map(|p| p.0).collect(),
        y: pts.iter().map(|p| p.1).collect(),
    };
    vec![
        mk("energy", "Killing energy per unit mass E".into(), true, energy),
        mk("areal_distance", format!("r_max - r_h [{u}]"), true, areal),
        mk("proper_distance", format!("proper distance from horizon [{u}]"), true, proper),
    ]
}
