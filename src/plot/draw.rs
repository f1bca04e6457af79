//! Drawing a figure (needs the `figures` feature): the layout in points, and the three files SVG, PDF and PNG.

use super::{encode, scene, Figure, Look};
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
