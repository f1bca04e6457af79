//! Serde structs that mirror the scenario file exactly; unknown keys are errors.

use serde::Deserialize;
use toml::Spanned;

/// The whole file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawScenario {
    pub name: Spanned<String>,
    pub dimension: Option<Spanned<i64>>,
    #[serde(default)]
    pub parameters: toml::Table,
    pub minus: Option<Spanned<RawSide>>,
    pub plus: Option<Spanned<RawSide>>,
    pub shell: Option<RawShell>,
    /// `[symbols]`: parameter name -> LaTeX symbol.
    #[serde(default)]
    pub symbols: toml::Table,
}

/// One side of the shell.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSide {
    #[serde(rename = "A")]
    pub a: Spanned<String>,
    #[serde(rename = "B")]
    pub b: Option<Spanned<String>>,
    pub keep: Spanned<String>,
    pub normal_sign: Option<Spanned<i64>>,
}

/// The `[shell]` table.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawShell {
    pub kind: Option<Spanned<String>>,
    pub pressure: Option<Spanned<String>>,
}
