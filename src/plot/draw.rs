//! Drawing a figure (needs the `figures` feature): the layout in points, and the three files SVG, PDF and PNG.

use super::{encode, geom, scene, Band, Figure, Look};
use crate::error::{Error, Result};
use std::path::{Path, PathBuf};

pub use super::encode::{render_panels, render_pdf, render_png, render_svg};
pub use super::scene::{BBox, Layout, TextBox, TextKind};

/// The layout of a figure as it will be drawn: canvas, plot area, every text box and data line (points, y
/// down). Errors as for [`render_svg`].
pub fn layout(fig: &Figure) -> Result<Layout> {
    Ok(scene::scene(fig)?.layout)
}

/// The layout of a multi-panel figure (see [`render_panels`]).
pub fn layout_panels(figs: &[Figure], cols: usize, look: &Look) -> Result<Layout> {
    Ok(scene::scene_grid(figs, cols, look, None)?.layout)
}

/// Render `fig` to `dir/stem.svg`, `dir/stem.pdf` and `dir/stem.png` and return the three paths. All three
/// are rendered before any is written, so a rendering failure leaves no partial set of files.
pub fn write_figure(fig: &Figure, dir: &Path, stem: &str) -> Result<Vec<PathBuf>> {
    if stem.is_empty() || stem.contains(['/', '\\']) {
        return Err(Error::input(format!("figure file stem {stem:?} is not a plain file name"))
            .with_hint("give a name without folders, e.g. \"potential\""));
    }
    let sc = scene::scene(fig)?;
    write_scene(&sc, &fig.provenance, fig.title.as_deref(), dir, stem)
}

/// Render panels in a grid of `cols` columns (shared axes, one legend above; see [`render_panels`]) to
/// `dir/stem.{svg,pdf,png}`.
pub fn write_panels(
    figs: &[Figure],
    cols: usize,
    look: &Look,
    provenance: &str,
    dir: &Path,
    stem: &str,
) -> Result<Vec<PathBuf>> {
    if stem.is_empty() || stem.contains(['/', '\\']) {
        return Err(Error::input(format!("figure file stem {stem:?} is not a plain file name")));
    }
    let sc = scene::scene_grid(figs, cols, look, None)?;
    write_scene(&sc, provenance, None, dir, stem)
}

fn write_scene(
    sc: &scene::Scene,
    provenance: &str,
    title: Option<&str>,
    dir: &Path,
    stem: &str,
) -> Result<Vec<PathBuf>> {
    let svg = encode::svg(sc, provenance, title)?;
    let pdf = encode::pdf_from_svg(&svg, provenance, title)?;
    let png = encode::png(&svg, sc, provenance, title)?;
    crate::output::ensure_dir(dir)?;
    let mut paths = Vec::new();
    for (ext, bytes) in [("svg", svg.as_bytes()), ("pdf", pdf.as_slice()), ("png", png.as_slice())] {
        let p = dir.join(format!("{stem}.{ext}"));
        crate::output::write_atomic(&p, bytes)?;
        paths.push(p);
    }
    Ok(paths)
}

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
