//! Data series of a chain run against crossing number, for a figure. A pure function: it returns data; the
//! chain's CSV table is `export::csv::chain`, files are written elsewhere (`output::write_atomic`).
//!
//! The figure itself belongs to the plotting module: [`chain_series`] is the one place that decides what is
//! plotted (log-scale y axes for the distances), so wiring it to a plot needs no physics.

use super::iterate::ChainRun;
use crate::plot::{self, Figure, LineStyle, RefLine};
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

/// Figures of a chain run against crossing number: the apex's areal and proper distance to the horizon
/// (log10, with the threshold drawn), and the Killing energy. Built from [`chain_series`].
pub fn chain_figures(series: &[Series], threshold: Option<f64>, provenance: &str) -> Vec<(String, Figure)> {
    let log_pts = |s: &Series| -> Vec<(f64, f64)> {
        s.x.iter().zip(&s.y).map(|(&x, &y)| (x, if y > 0.0 { y.log10() } else { f64::NAN })).collect()
    };
    let mut out = Vec::new();
    let dist: Vec<&Series> = series.iter().filter(|s| s.name.ends_with("distance")).collect();
    if let Some(first) = dist.first() {
        let mut fig = Figure {
            x_label: first.x_label.clone(),
            y_label: format!(
                "log₁₀ distance to horizon [{}]",
                first.y_label.rsplit('[').next().unwrap_or("]").trim_end_matches(']')
            ),
            provenance: provenance.to_string(),
            ..Figure::default()
        };
        for (i, s) in dist.iter().enumerate() {
            let label = if s.name.starts_with("areal") { "areal: r_max − r_h" } else { "proper distance" };
            fig.series.push(plot::Series {
                label: label.into(),
                points: log_pts(s),
                style: LineStyle::cycle(i),
                colour: i * 3,
            });
        }
        if let Some(t) = threshold.filter(|t| *t > 0.0) {
            fig.ref_lines.push(RefLine::horizontal(t.log10(), "threshold"));
        }
        out.push(("chain_distance".to_string(), fig));
    }
    if let Some(e) = series.iter().find(|s| s.name == "energy") {
        out.push((
            "chain_energy".to_string(),
            Figure {
                x_label: e.x_label.clone(),
                y_label: "log₁₀ E (Killing energy per unit mass)".into(),
                series: vec![plot::Series {
                    label: "E after each crossing".into(),
                    points: log_pts(e),
                    style: LineStyle::Solid,
                    colour: 0,
                }],
                provenance: provenance.to_string(),
                ..Figure::default()
            },
        ));
    }
    out
}
