//! Drawing in a build without the `figures` feature: the functions of `draw.rs` with the same signatures (minus
//! the layout types), each returning an error that says the build has no figure support.

use super::{Figure, Look};
use crate::error::{Error, Result};
use std::path::{Path, PathBuf};

fn no_figures() -> Error {
    Error::input("this build of junctura has no figure support (it was built without the `figures` feature)")
        .with_hint("rebuild junctura with its default features, or ask for the data files only")
}

/// See the `figures` build: renders the figure as SVG text.
pub fn render_svg(_fig: &Figure) -> Result<String> {
    Err(no_figures())
}

/// See the `figures` build: renders the figure as PNG bytes.
pub fn render_png(_fig: &Figure) -> Result<Vec<u8>> {
    Err(no_figures())
}

/// See the `figures` build: renders the figure as PDF bytes.
pub fn render_pdf(_fig: &Figure) -> Result<Vec<u8>> {
    Err(no_figures())
}

/// See the `figures` build: renders panels in a grid as SVG text.
pub fn render_panels(_figs: &[Figure], _cols: usize, _look: &Look, _provenance: &str) -> Result<String> {
    Err(no_figures())
}

/// See the `figures` build: writes `dir/stem.{svg,pdf,png}`.
pub fn write_figure(_fig: &Figure, _dir: &Path, _stem: &str) -> Result<Vec<PathBuf>> {
    Err(no_figures())
}

/// See the `figures` build: writes panels to `dir/stem.{svg,pdf,png}`.
pub fn write_panels(
    _figs: &[Figure],
    _cols: usize,
    _look: &Look,
    _provenance: &str,
    _dir: &Path,
    _stem: &str,
) -> Result<Vec<PathBuf>> {
    Err(no_figures())
}
