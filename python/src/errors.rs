//! Library errors as Python exceptions: `junctura.errors.InputError`, `NumericalError` or `IoError` (all
//! subclasses of `JuncturaError`), carrying the message (with file:line:column or the parameter) and the hint.

use junctura::{Error, ErrorKind};
use pyo3::prelude::*;

/// Convert a library error into the matching Python exception.
pub fn to_py(py: Python<'_>, e: Error) -> PyErr {
    let class = match e.kind {
        ErrorKind::Input => "InputError",
        ErrorKind::Numerical => "NumericalError",
        ErrorKind::Io => "IoError",
    };
    let raised = py.import("junctura.errors").and_then(|m| m.getattr(class)).and_then(|c| {
        let hint = e.hint.clone();
        c.call1((e.message.clone(), hint))
    });
    match raised {
        Ok(obj) => PyErr::from_value(obj),
        // The native module imported on its own (without the package): a plain RuntimeError with the same text.
        Err(_) => pyo3::exceptions::PyRuntimeError::new_err(e.to_string()),
    }
}

/// `Result<T, junctura::Error>` -> `PyResult<T>`.
pub trait IntoPyResult<T> {
    /// Map the error into a Python exception.
    fn py(self, py: Python<'_>) -> PyResult<T>;
}

impl<T> IntoPyResult<T> for junctura::Result<T> {
    fn py(self, py: Python<'_>) -> PyResult<T> {
        self.map_err(|e| to_py(py, e))
    }
}
