//! The library's one error type: a kind (which decides the exit code), a message that already carries the
//! context a user needs (file, line/column, parameter name, what was expected), an optional hint, and the same
//! facts as data ([`Problem`]).
//!
//! The library speaks of request fields ([`RequestField`]: "radius", "the axis x"), never of command-line
//! options: a message that names a field keeps it as a [`Phrase`], so a front end can show its own name for the
//! field ([`Error::render`]; the command-line program shows `--radius`, `--x`).
//!
//! ```
//! use junctura::request::range;
//! use junctura::{Problem, RequestField};
//! let e = range(Some(5.0), Some(3.0), (1.0, 2.0)).unwrap_err();
//! assert_eq!(e.message, "the range from 5 to 3 is empty or not finite");
//! assert_eq!(e.problem, Problem::BadRequest { field: RequestField::From, value: "5".into() });
//! // A front end names the fields its own way (here as keyword arguments).
//! let shown = e.render(&|f| if f == RequestField::From { "from_=" } else { "to=" });
//! assert!(shown.starts_with("the range from_= 5 to= 3 is empty"));
//! ```

use std::fmt;
use std::path::{Path, PathBuf};

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

/// A value of a request (an argument of an analysis) that a message can name. The library's name for it is
/// [`RequestField::name`]; a front end maps it to its own (the command line to an option such as `--radius`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
#[non_exhaustive]
pub enum RequestField {
    /// Lower end of a radius range.
    From,
    /// Upper end of a radius range.
    To,
    /// A shell radius.
    Radius,
    /// dR/dtau of the shell in a shell state.
    Velocity,
    /// d^2R/dtau^2 of the shell in a shell state.
    Acceleration,
    /// Killing energy of a test particle.
    Energy,
    /// dR/dtau of the shell at a crossing.
    ShellVelocity,
    /// Radial direction of a test particle or of a shell.
    Direction,
    /// Displacement from a static radius.
    Kick,
    /// Surface energy density.
    Sigma,
    /// Proper-time duration of a motion.
    Duration,
    /// Half-width of an ensemble of kicks.
    Spread,
    /// Number of members of an ensemble.
    Ensemble,
    /// Number of crossings of a chain.
    Crossings,
    /// Mass unit.
    Mass,
    /// Distance threshold to a horizon, or search bounds of a parameter.
    Within,
    /// Horizontal map axis.
    X,
    /// Vertical map axis.
    Y,
    /// Fixed beta^2 of a map.
    Beta2,
    /// The varied parameter of a sweep.
    Vary,
    /// A family of parameter values.
    Family,
    /// The parameter solved for.
    Solve,
    /// Horizontal axis limits of a figure.
    XLim,
    /// Vertical axis limits of a figure.
    YLim,
    /// Splitting a scan into parts.
    Shard,
    /// The part files of a sharded map, to be merged.
    Parts,
    /// Starting a motion at rest on a static radius.
    FromStatic,
    /// Stopping a motion at a horizon.
    StopAtHorizon,
    /// The shell state of closed forms (static or moving).
    State,
    /// A text width.
    Width,
    /// The output folder.
    Out,
    /// A logarithmic horizontal axis.
    LogX,
    /// A logarithmic vertical axis.
    LogY,
    /// Counts only (a map that stores no cells).
    Summary,
    /// Parameter overrides `NAME=VALUE`.
    Set,
    /// The output format.
    Format,
}

impl RequestField {
    /// The library's name for the field, as messages print it.
    pub fn name(self) -> &'static str {
        use RequestField::*;
        match self {
            From => "from",
            To => "to",
            Radius => "radius",
            Velocity => "velocity",
            Acceleration => "acceleration",
            Energy => "energy",
            ShellVelocity => "shell velocity",
            Direction => "direction",
            Kick => "kick",
            Sigma => "sigma",
            Duration => "duration",
            Spread => "spread",
            Ensemble => "ensemble",
            Crossings => "crossings",
            Mass => "mass",
            Within => "within",
            X => "the axis x",
            Y => "the axis y",
            Beta2 => "beta2",
            Vary => "vary",
            Family => "family",
            Solve => "solve",
            XLim => "xlim",
            YLim => "ylim",
            Shard => "shard",
            Parts => "parts",
            FromStatic => "from static",
            StopAtHorizon => "stop at horizon",
            State => "state",
            Width => "width",
            Out => "the output folder",
            LogX => "log x",
            LogY => "log y",
            Summary => "summary",
            Set => "set",
            Format => "format",
        }
    }
}

/// One piece of a [`Phrase`]: text, or the name of a request field.
#[derive(Debug, Clone, PartialEq)]
pub enum Part {
    /// Text as it is.
    Text(String),
    /// A request field, printed by the front end's name for it.
    Field(RequestField),
}

impl From<RequestField> for Part {
    fn from(f: RequestField) -> Part {
        Part::Field(f)
    }
}

impl From<String> for Part {
    fn from(s: String) -> Part {
        Part::Text(s)
    }
}

impl From<&str> for Part {
    fn from(s: &str) -> Part {
        Part::Text(s.to_string())
    }
}

/// Message text that names request fields ([`phrase!`](crate::phrase) builds one).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Phrase(pub Vec<Part>);

impl Phrase {
    /// The text with each field printed by `name`.
    pub fn render(&self, name: &dyn Fn(RequestField) -> &'static str) -> String {
        self.0
            .iter()
            .map(|p| match p {
                Part::Text(t) => t.as_str(),
                Part::Field(f) => name(*f),
            })
            .collect()
    }

    /// The text in the library's words ([`RequestField::name`]).
    pub fn text(&self) -> String {
        self.render(&RequestField::name)
    }

    /// This phrase followed by `more`.
    pub fn then(mut self, more: Phrase) -> Phrase {
        self.0.extend(more.0);
        self
    }

    /// The request fields it names, in order.
    pub fn fields(&self) -> impl Iterator<Item = RequestField> + '_ {
        self.0.iter().filter_map(|p| match p {
            Part::Field(f) => Some(*f),
            Part::Text(_) => None,
        })
    }
}

/// A [`Phrase`] from pieces: request fields and text, e.g.
/// `phrase![RequestField::Radius, format!(" {r}: must be positive")]`.
#[macro_export]
macro_rules! phrase {
    ($($part:expr),* $(,)?) => {
        $crate::error::Phrase(vec![$($crate::error::Part::from($part)),*])
    };
}

/// What went wrong, as data (the message says the same in words).
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum Problem {
    /// A request value is refused: which field and the value as given.
    BadRequest {
        /// The field.
        field: RequestField,
        /// The value as given (as text: a number, a spec such as `q:0:1:5`, a unit such as `1Msun`).
        value: String,
    },
    /// A parameter name the scenario does not define.
    UnknownParameter {
        /// The name as given.
        name: String,
        /// The closest known name, if one is close.
        suggestion: Option<String>,
    },
    /// A shell cannot sit at this radius (on a horizon, where the metric changes signature, in the wrong kind
    /// of region, against the side's `keep`): the admissibility rule's reason.
    Inadmissible {
        /// The radius.
        radius: f64,
        /// Why ([`crate::model::Inadmissible`]).
        reason: crate::model::Inadmissible,
    },
    /// Text (a scenario or chain file, an expression in it) that does not parse.
    Parse {
        /// The file as messages name it.
        file: String,
        /// Line (from 1).
        line: usize,
        /// Column in characters (from 1).
        column: usize,
    },
    /// Reading or writing a file failed.
    Io {
        /// The file or folder.
        path: PathBuf,
    },
    /// Anything else; the message says what.
    Other,
}

/// The message and hint as phrases, when they name request fields.
#[derive(Debug, Clone, PartialEq)]
struct Phrased {
    message: Phrase,
    hint: Option<Phrase>,
}

/// An error with its kind, a message that names where it happened, an optional hint for the fix, and the
/// problem as data.
#[derive(Debug, Clone, PartialEq)]
pub struct Error {
    /// Broad class of the failure.
    pub kind: ErrorKind,
    /// What went wrong, including location context (request fields in the library's words).
    pub message: String,
    /// How to fix it, when we can tell.
    pub hint: Option<String>,
    /// What went wrong, as data.
    pub problem: Problem,
    /// `message` and `hint` as phrases naming request fields (kept only while they match the strings).
    phrased: Option<Box<Phrased>>,
}

/// Result alias used throughout the library.
pub type Result<T> = std::result::Result<T, Error>;

impl Error {
    fn new(kind: ErrorKind, message: String) -> Self {
        Error { kind, message, hint: None, problem: Problem::Other, phrased: None }
    }

    /// Invalid input.
    pub fn input(message: impl Into<String>) -> Self {
        Error::new(ErrorKind::Input, message.into())
    }

    /// Numerical failure or a request outside the validity of the formulas.
    pub fn numerical(message: impl Into<String>) -> Self {
        Error::new(ErrorKind::Numerical, message.into())
    }

    /// I/O failure on `path`.
    pub fn io(path: &Path, err: &std::io::Error) -> Self {
        let mut e = Error::new(ErrorKind::Io, format!("{}: {}", path.display(), err));
        e.problem = Problem::Io { path: path.to_path_buf() };
        e
    }

    /// I/O failure described by a message that already names the path.
    pub fn io_msg(message: impl Into<String>) -> Self {
        Error::new(ErrorKind::Io, message.into())
    }

    /// A refused request value: `field` = `value`, with a message that names request fields.
    pub fn request(kind: ErrorKind, field: RequestField, value: impl fmt::Display, message: Phrase) -> Self {
        let mut e = Error::new(kind, message.text());
        e.problem = Problem::BadRequest { field, value: value.to_string() };
        e.phrased = Some(Box::new(Phrased { message, hint: None }));
        e
    }

    /// An error whose message names request fields (no single refused value: [`Problem::Other`]).
    pub fn phrased(kind: ErrorKind, message: Phrase) -> Self {
        let mut e = Error::new(kind, message.text());
        e.phrased = Some(Box::new(Phrased { message, hint: None }));
        e
    }

    /// A parameter name the scenario does not define, with the closest known name.
    pub fn unknown_parameter(name: &str, suggestion: Option<&str>) -> Self {
        let mut e = Error::input(format!("unknown parameter '{name}'"));
        e.problem = Problem::UnknownParameter { name: name.to_string(), suggestion: suggestion.map(String::from) };
        e
    }

    /// Set the problem as data (the message says the same in words).
    pub fn with_problem(mut self, problem: Problem) -> Self {
        self.problem = problem;
        self
    }

    /// Attach a hint.
    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        if let Some(p) = &mut self.phrased {
            p.hint = None;
        }
        self
    }

    /// Attach a hint that names request fields.
    pub fn with_hint_phrase(mut self, hint: Phrase) -> Self {
        self.hint = Some(hint.text());
        let message = self.message_phrase();
        self.phrased = Some(Box::new(Phrased { message, hint: Some(hint) }));
        self
    }

    /// Prefix the message with more context (e.g. the file or the command that failed).
    pub fn context(self, ctx: impl fmt::Display) -> Self {
        self.context_phrase(phrase![ctx.to_string()])
    }

    /// Prefix the message with context that names request fields (e.g. `phrase![RequestField::Mass, " '2x'"]`).
    pub fn context_phrase(mut self, ctx: Phrase) -> Self {
        let mut message = self.message_phrase();
        let hint = self.phrased.take().and_then(|p| p.hint);
        self.message = format!("{}: {}", ctx.text(), self.message);
        let mut parts = ctx.0;
        parts.push(Part::Text(": ".into()));
        parts.append(&mut message.0);
        let message = Phrase(parts);
        if message.fields().next().is_some() || hint.is_some() {
            self.phrased = Some(Box::new(Phrased { message, hint }));
        }
        self
    }

    /// The message as a phrase (the plain message when it names no fields).
    fn message_phrase(&self) -> Phrase {
        match &self.phrased {
            Some(p) if p.message.text() == self.message => p.message.clone(),
            _ => phrase![self.message.clone()],
        }
    }

    /// The request fields the message and hint name.
    pub fn fields(&self) -> Vec<RequestField> {
        let Some(p) = &self.phrased else { return Vec::new() };
        p.message.fields().chain(p.hint.iter().flat_map(|h| h.fields())).collect()
    }

    /// Message and hint as [`Display`](fmt::Display) shows them, but with each request field printed by `name`
    /// (the command line passes its option names). Text changed after the phrase was built is shown as it is.
    pub fn render(&self, name: &dyn Fn(RequestField) -> &'static str) -> String {
        let (mut message, mut hint) = (self.message.clone(), self.hint.clone());
        if let Some(p) = &self.phrased {
            if p.message.text() == self.message {
                message = p.message.render(name);
            }
            if let (Some(h), Some(text)) = (&p.hint, &self.hint) {
                if h.text() == *text {
                    hint = Some(h.render(name));
                }
            }
        }
        match hint {
            Some(h) => format!("{message}\n  hint: {h}"),
            None => message,
        }
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
