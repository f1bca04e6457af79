//! The library's one error type: a kind (which decides the exit code) and a message that already carries the
//! context a user needs (file, line/column, parameter name, what was expected) plus an optional hint.

use std::fmt;
use std::path::Path;

/// What went wrong, broadly; the command-line program maps each kind to its own exit code.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ErrorKind {
    /// The user's input (scenario file, expression, command-line value) is invalid.
    Input,
    /// A numerical procedure failed or the request lies where the formulas do not hold (e.g. on a horizon).
    Numerical,
    /// Reading or writing a file failed.
    Io,
}

impl ErrorKind {
    /// Process exit code for this kind (documented in the README).
    pub fn exit_code(self) -> i32 {
        match self {
            ErrorKind::Input => 2,
            ErrorKind::Numerical => 3,
            ErrorKind::Io => 4,
        }
    }
}

/// An error with its kind, a message that names where it happened, and an optional hint for the fix.
#[derive(Debug, Clone, PartialEq)]
pub struct Error {
    /// Broad class of the failure.
    pub kind: ErrorKind,
    /// What went wrong, including location context.
    pub message: String,
    /// How to fix it, when we can tell.
    pub hint: Option<String>,
}

/// Result alias used throughout the library.
pub type Result<T> = std::result::Result<T, Error>;

impl Error {
    /// Invalid input.
    pub fn input(message: impl Into<String>) -> Self {
        Error { kind: ErrorKind::Input, message: message.into(), hint: None }
    }

    /// Numerical failure or a request outside the validity of the formulas.
    pub fn numerical(message: impl Into<String>) -> Self {
        Error { kind: ErrorKind::Numerical, message: message.into(), hint: None }
    }

    /// I/O failure on `path`.
    pub fn io(path: &Path, err: &std::io::Error) -> Self {
        Error { kind: ErrorKind::Io, message: format!("{}: {}", path.display(), err), hint: None }
    }

    /// I/O failure described by a message that already names the path.
    pub fn io_msg(message: impl Into<String>) -> Self {
        Error { kind: ErrorKind::Io, message: message.into(), hint: None }
    }

    /// Attach a hint.
    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }

    /// Prefix the message with more context (e.g. the file or the command that failed).
    pub fn context(mut self, ctx: impl fmt::Display) -> Self {
        self.message = format!("{ctx}: {}", self.message);
        self
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.message)?;
        if let Some(h) = &self.hint {
            write!(f, "\n  hint: {h}")?;
        }
        Ok(())
    }
}

impl std::error::Error for Error {}
