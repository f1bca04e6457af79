//! Options and helpers shared by several commands.

use clap::{Args, ValueEnum};
use junctura::scenario::Scenario;
use junctura::Result;
use std::path::PathBuf;

/// Output format of a command.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Format {
    /// Readable summary.
    Text,
    /// One JSON object on stdout.
    Json,
    /// LaTeX (where the command has formulas).
    Latex,
}

/// The scenario file and parameter overrides.
#[derive(Args, Debug, Clone)]
pub struct ScenarioArgs {
    /// Scenario file (TOML).
    pub scenario: PathBuf,
    /// Override a parameter: NAME=VALUE (repeatable).
    #[arg(long = "set", value_name = "NAME=VALUE")]
    pub set: Vec<String>,
}

impl ScenarioArgs {
    /// Load, validate and apply overrides.
    pub fn load(&self) -> Result<Scenario> {
        let mut s = Scenario::load(&self.scenario)?;
        s.apply_overrides(&self.set)?;
        Ok(s)
    }
}

/// Check an optional radius range given on the command line.
pub fn range(from: Option<f64>, to: Option<f64>, default: (f64, f64)) -> Result<(f64, f64)> {
    let lo = from.unwrap_or(default.0);
    let hi = to.unwrap_or(default.1);
    if !(lo.is_finite() && hi.is_finite()) || lo >= hi {
        return Err(junctura::Error::input(format!("the range --from {lo} --to {hi} is empty or not finite"))
            .with_hint("give --from LO --to HI with LO < HI"));
    }
    if lo <= 0.0 {
        return Err(junctura::Error::input(format!("--from {lo}: radii must be positive"))
            .with_hint("the areal radius r is positive; start the range above 0"));
    }
    Ok((lo, hi))
}

/// Serialize to pretty JSON (never fails for our plain structs).
pub fn to_json<T: serde::Serialize>(v: &T) -> String {
    serde_json::to_string_pretty(v).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"))
}
