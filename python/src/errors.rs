//! Library errors as Python exceptions: `junctura.errors.InputError`, `NumericalError` or `IoError` (all
//! subclasses of `JuncturaError`), carrying the message (with file:line:column or the parameter) and the hint,
//! and the library's [`Problem`] as attributes: `field` and `value` of a refused request value, `parameter`
//! and `suggestion` of an unknown parameter, `radius` and `reason` of a radius where no shell can sit,
//! `file`, `line` and `column` of text that does not parse, `path` of an I/O failure (None where they do not
//! apply).

use junctura::{Error, ErrorKind, Problem};
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
        let obj = c.call1((e.message.clone(), hint))?;
        match &e.problem {
            Problem::BadRequest { field, value } => {
                obj.setattr("field", field.name())?;
                obj.setattr("value", value)?;
            }
            Problem::UnknownParameter { name, suggestion } => {
                obj.setattr("parameter", name)?;
                obj.setattr("suggestion", suggestion.clone())?;
            }
            Problem::Inadmissible { radius, reason } => {
                obj.setattr("radius", *radius)?;
                obj.setattr("reason", reason.to_string())?;
            }
            Problem::Parse { file, line, column } => {
                obj.setattr("file", file)?;
                obj.setattr("line", *line)?;
                obj.setattr("column", *column)?;
            }
            Problem::Io { path } => obj.setattr("path", path.display().to_string())?,
            _ => {}
        }
        Ok(obj)
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
