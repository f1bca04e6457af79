//! The native part of the `junctura` Python package: a thin layer over the library. Results are the library's
//! `Serialize` structs converted with `pythonize` (the same fields and numbers as the command-line program's
//! JSON); maps come as 2-D NumPy arrays; figures as objects that render SVG, PNG or PDF bytes. Long work runs
//! with the GIL released. The Python side (`python/junctura/`) wraps these dicts in result objects.

mod errors;
mod figure;
mod model;

use pyo3::prelude::*;

/// The native module `junctura._native`.
#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_class::<model::Model>()?;
    m.add_class::<figure::Figure>()?;
    m.add_function(wrap_pyfunction!(model::chain, m)?)?;
    m.add_function(wrap_pyfunction!(model::merge, m)?)?;
    // Kept equal to the library version (python/tests check it against the provenance line).
    m.add("VERSION", env!("CARGO_PKG_VERSION"))?;
    Ok(())
}
