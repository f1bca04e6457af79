//! Options and helpers shared by several commands.

use clap::{Args, ValueEnum};
use junctura::scenario::Scenario;
use junctura::Result;
use std::path::PathBuf;

pub use junctura::request::{parse_axis, parse_pair, range};

/// Output format of a command.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Format {
    /// Readable summary.
    Text,
    /// One JSON object on stdout.
    Json,
    /// LaTeX (where the command has formulas).
    Latex,
    /// CSV: a provenance comment line, a header line with units, one row per point.
    Csv,
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

/// The radius range options shared by the commands that search or survey radii.
#[derive(Args, Debug, Clone)]
pub struct RangeArgs {
    /// Lower end of the radius range (default: 1e-3 L, L the largest |parameter|, at least 1).
    #[arg(long)]
    pub from: Option<f64>,
    /// Upper end of the radius range (default: 1e3 L).
    #[arg(long)]
    pub to: Option<f64>,
}

impl RangeArgs {
    /// The checked range, with the scenario's default range for missing ends.
    pub fn resolve(&self, s: &Scenario) -> Result<(f64, f64)> {
        range(self.from, self.to, junctura::metric::default_range(s))
    }
}

/// Serialize to pretty JSON (never fails for our plain structs).
pub fn to_json<T: serde::Serialize>(v: &T) -> String {
    serde_json::to_string_pretty(v).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"))
}
