//! A figure the library draws, rendered on demand to SVG text, PNG bytes or PDF bytes (the same encoders as the
//! files the command-line program writes).

use crate::errors::IntoPyResult;
use pyo3::prelude::*;
use pyo3::types::PyBytes;

/// A figure description; render it with `svg()`, `png()` or `pdf()`.
#[pyclass(module = "junctura._native", frozen)]
pub struct Figure {
    fig: junctura::plot::Figure,
    name: String,
}

impl Figure {
    /// Wrap a library figure under a name (e.g. `potential`).
    pub fn new(name: &str, fig: junctura::plot::Figure) -> Figure {
        Figure { fig, name: name.to_string() }
    }
}

#[pymethods]
impl Figure {
    /// The figure's name (`potential`, `sigma_pressure`, `map`, `sweep`, `evolve_radius`, ...).
    #[getter]
    fn name(&self) -> &str {
        &self.name
    }

    /// The provenance line drawn into the figure's metadata.
    #[getter]
    fn provenance(&self) -> &str {
        &self.fig.provenance
    }

    /// SVG text (8.5 cm wide, embedded font).
    fn svg(&self, py: Python<'_>) -> PyResult<String> {
        py.detach(|| junctura::plot::render_svg(&self.fig)).py(py)
    }

    /// PNG bytes (300 dpi, 8.5 cm wide).
    fn png<'py>(&self, py: Python<'py>) -> PyResult<Bound<'py, PyBytes>> {
        let b = py.detach(|| junctura::plot::render_png(&self.fig)).py(py)?;
        Ok(PyBytes::new(py, &b))
    }

    /// PDF bytes (one page, vector curves).
    fn pdf<'py>(&self, py: Python<'py>) -> PyResult<Bound<'py, PyBytes>> {
        let b = py.detach(|| junctura::plot::render_pdf(&self.fig)).py(py)?;
        Ok(PyBytes::new(py, &b))
    }

    /// Write `<stem>.svg`, `.pdf` and `.png` into `dir` (atomically, as the command-line program does);
    /// returns the paths written.
    fn save(&self, py: Python<'_>, dir: std::path::PathBuf, stem: &str) -> PyResult<Vec<String>> {
        junctura::output::ensure_dir(&dir).py(py)?;
        let paths = py.detach(|| junctura::plot::write_figure(&self.fig, &dir, stem)).py(py)?;
        Ok(paths.into_iter().map(|p| p.display().to_string()).collect())
    }

    fn __repr__(&self) -> String {
        format!("Figure({:?})", self.name)
    }
}
