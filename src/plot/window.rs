//! The plot window of a figure: its description checked (ranges, category map) and the data ranges fitted.

use super::{geom, Band, Figure};
use crate::error::{Error, Result};

/// Check a figure description and work out the plot window (data ranges). Errors name the offending field.
pub(crate) fn plot_window(fig: &Figure) -> Result<geom::Window> {
    let check_range = |name: &str, r: (f64, f64)| -> Result<()> {
        if r.0.is_finite() && r.1.is_finite() && r.0 < r.1 {
            Ok(())
        } else {
            Err(Error::input(format!("figure {name} ({}, {}) is not an increasing pair of finite numbers", r.0, r.1))
                .with_hint(format!("give {name} as (low, high) with low < high, or leave it out to fit the data")))
        }
    };
    if let Some(r) = fig.x_range {
        check_range("x_range", r)?;
    }
    if let Some(r) = fig.y_range {
        check_range("y_range", r)?;
    }
    if let Some(m) = &fig.categories {
        check_range("category map x extent", (m.x.0, m.x.1))?;
        check_range("category map y extent", (m.y.0, m.y.1))?;
        if m.x.2 == 0 || m.y.2 == 0 || m.cells.len() != m.x.2 * m.y.2 {
            return Err(Error::input(format!(
                "category map has {} cells but its grid is {} x {}",
                m.cells.len(),
                m.x.2,
                m.y.2
            ))
            .with_hint("cells must hold one entry per grid cell, row-major with y outer"));
        }
        if let Some(bad) = m.cells.iter().find(|&&c| c as usize >= m.categories.len()) {
            return Err(Error::input(format!(
                "category map cell value {bad} has no category (only {} named)",
                m.categories.len()
            ))
            .with_hint("add a (name, colour) entry for every value used in cells"));
        }
    }
    let mut xs: Vec<f64> = Vec::new();
    let mut ys: Vec<f64> = Vec::new();
    for s in &fig.series {
        for &(x, y) in &s.points {
            if x.is_finite() && y.is_finite() {
                xs.push(x);
                ys.push(y);
            }
        }
    }
    for b in &fig.bands {
        match b {
            Band::XInterval { from, to, .. } => xs.extend([*from, *to]),
            Band::Between { points, .. } => {
                for &(x, lo, hi) in points {
                    if x.is_finite() && lo.is_finite() && hi.is_finite() {
                        xs.push(x);
                        ys.extend([lo, hi]);
                    }
                }
            }
        }
    }
    for m in &fig.markers {
        if m.x.is_finite() && m.y.is_finite() {
            xs.push(m.x);
            ys.push(m.y);
        }
    }
    if let Some(m) = &fig.categories {
        xs.extend([m.x.0, m.x.1]);
        ys.extend([m.y.0, m.y.1]);
    }
    let no_data = || {
        Error::input("the figure has no finite data to fit its axes to")
            .with_hint("add a curve with finite points, or give x_range and y_range")
    };
    // A category map fixes the default window to its own extent; otherwise fit the data.
    let (x0, x1) = match (fig.x_range, &fig.categories) {
        (Some(r), _) => r,
        (None, Some(m)) => (m.x.0, m.x.1),
        (None, None) => geom::axis_range(geom::finite_span(xs.into_iter()).ok_or_else(no_data)?, 0.0),
    };
    let (y0, y1) = match (fig.y_range, &fig.categories) {
        (Some(r), _) => r,
        (None, Some(m)) => (m.y.0, m.y.1),
        (None, None) => geom::axis_range(geom::finite_span(ys.into_iter()).ok_or_else(no_data)?, 0.05),
    };
    Ok(geom::Window { x0, x1, y0, y1 })
}
