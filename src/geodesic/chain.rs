//! Chain files: a sequence of shells that one test particle crosses in turn.
//!
//! A chain file is TOML (paths are relative to the chain file):
//! ```toml
//! name = "Black-hole to white-hole bounce, repeated"
//! crossings = 300               # default number of crossings (the command line can override it)
//!
//! [particle]
//! energy = 0.9                  # Killing energy per unit mass E = -u_t on the first stage's minus side
//!
//! [[stage]]                     # one or more stages, crossed in order
//! scenario = "bounce-stage.toml" # a scenario file ...
//! radius = "m"                  # shell radius at the crossing: a number or an expression in its parameters
//! shell_velocity = 0.0          # dR/dtau of a timelike shell at the crossing (number or expression)
//! set = { m = 1.0 }             # parameter overrides for this stage
//!
//! # [stage.inline]              # ... or the scenario written inline, with the scenario file's keys
//! # name = "..."; [stage.inline.parameters], [stage.inline.minus], [stage.inline.plus], [stage.inline.shell]
//!
//! [cycle]
//! multiply = { m = 0.9 }        # after each pass through all stages, multiply these parameters
//! ```
//! Crossing k (k = 0, 1, ...) uses stage k mod n in pass p = k div n, with every `multiply` parameter scaled by
//! factor^p: one stage plus `multiply` is the rule "each cycle multiplies the mass by lambda". After crossing a
//! stage the particle moves on the stage's plus side; the next stage's minus side must be that same spacetime
//! (junctura checks A at a few radii and warns if not), so its Killing energy carries over unchanged.

use crate::error::{Error, Result};
use crate::expr::Expr;
use crate::scenario::{line_col, Scenario};
use serde::Deserialize;
use sha2::{Digest, Sha256};
use std::path::{Path, PathBuf};

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawChain {
    name: String,
    crossings: Option<usize>,
    particle: RawParticle,
    stage: Vec<RawStage>,
    cycle: Option<RawCycle>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawParticle {
    energy: f64,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawStage {
    scenario: Option<String>,
    inline: Option<toml::Table>,
    radius: toml::Value,
    shell_velocity: Option<toml::Value>,
    #[serde(default)]
    set: toml::Table,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCycle {
    #[serde(default)]
    multiply: toml::Table,
}

/// One stage: a scenario and where/how its shell is crossed.
#[derive(Debug, Clone)]
pub struct Stage {
    /// The glued spacetime (with this stage's overrides applied).
    pub scenario: Scenario,
    /// Shell radius at the crossing, as an expression in the scenario's parameters.
    pub radius: Expr,
    /// dR/dtau at the crossing, as an expression in the scenario's parameters.
    pub shell_velocity: Expr,
}

/// A validated chain.
#[derive(Debug, Clone)]
pub struct Chain {
    /// Free-text name.
    pub name: String,
    /// E on the first stage's minus side.
    pub energy: f64,
    /// Default number of crossings.
    pub crossings: usize,
    /// The stages, crossed in order and then repeated.
    pub stages: Vec<Stage>,
    /// Parameters multiplied by a factor after each pass through the stages.
    pub multiply: Vec<(String, f64)>,
    /// The chain file's path, if any.
    pub path: Option<PathBuf>,
    /// Hex SHA-256 of the chain file's text.
    pub hash: String,
}

impl Stage {
    /// Parameter values for pass `pass` (every `multiply` factor raised to the pass number).
    pub fn params_for_pass(&self, multiply: &[(String, f64)], pass: usize) -> Result<Vec<f64>> {
        let mut p = self.scenario.params.clone();
        for (name, f) in multiply {
            let v = p.get(name)? * f.powi(pass as i32);
            p.set(name, v)?;
        }
        Ok(p.values().to_vec())
    }
}

impl Chain {
    /// Read and validate a chain file (scenario paths are relative to its folder).
    pub fn load(path: &Path) -> Result<Chain> {
        let text = crate::input::read_text(path, "chain file", crate::input::MAX_TEXT_FILE)?;
        Chain::parse(&text, Some(path))
    }

    /// Validate chain text; `path` locates scenario files and names the file in messages.
    pub fn parse(text: &str, path: Option<&Path>) -> Result<Chain> {
        let file = path.map(|p| p.display().to_string()).unwrap_or_else(|| "<chain>".into());
        let hint =
            "see the chain file format in the README (name, crossings, [particle] energy, [[stage]], [cycle] multiply)";
        let raw: RawChain = toml::from_str(text).map_err(|e| {
            let lc = e.span().map(|s| line_col(text, s.start));
            let at = lc.map(|(l, c)| format!(":{l}:{c}")).unwrap_or_default();
            let problem = match lc {
                Some((line, column)) => crate::Problem::Parse { file: file.clone(), line, column },
                None => crate::Problem::Other,
            };
            Error::input(format!("{file}{at}: {}", e.message().trim())).with_hint(hint).with_problem(problem)
        })?;
        if !(raw.particle.energy.is_finite() && raw.particle.energy > 0.0) {
            return Err(Error::input(format!("{file}: [particle] energy = {} must be positive", raw.particle.energy))
                .with_hint("E = -u_t per unit mass; E < 1 gives bounded orbits in an asymptotically flat exterior"));
        }
        if let Some((_, c)) = crate::text::unsafe_char(&raw.name) {
            let at = text.find("name").map(|o| line_col(text, o)).map(|(l, c)| format!(":{l}:{c}")).unwrap_or_default();
            return Err(Error::input(format!(
                "{file}{at}: name contains the control character {} (a line break, tab or terminal code)",
                crate::text::one_line(&c.to_string())
            ))
            .with_hint("write the name on one line of plain text; it is copied into every output file"));
        }
        if raw.stage.is_empty() {
            return Err(Error::input(format!("{file}: no [[stage]] given")).with_hint(hint));
        }
        let dir = path.and_then(|p| p.parent()).map(Path::to_path_buf).unwrap_or_default();
        let mut stages = Vec::new();
        for (k, rs) in raw.stage.iter().enumerate() {
            let label = format!("{file}: stage {}", k + 1);
            let mut scenario = match (&rs.scenario, &rs.inline) {
                (Some(p), None) => Scenario::load(&dir.join(p)).map_err(|e| e.context(&label))?,
                (None, Some(t)) => {
                    let inline_text =
                        toml::to_string(t).map_err(|e| Error::input(format!("{label}: inline scenario: {e}")))?;
                    Scenario::parse(&inline_text, Some(PathBuf::from(format!("{file} (stage {} inline)", k + 1))))?
                }
                _ => {
                    return Err(Error::input(format!(
                        "{label}: give exactly one of 'scenario' (a file) or [stage.inline]"
                    ))
                    .with_hint("e.g. scenario = \"bounce-stage.toml\""))
                }
            };
            for (name, v) in &rs.set {
                let x = number(v).ok_or_else(|| {
                    Error::input(format!("{label}: set.{name} = {v} is not a number"))
                        .with_hint("write e.g. set = { m = 1.0 }")
                })?;
                scenario.params.set(name, x).map_err(|e| e.context(format!("{label}: set")))?;
            }
            let expr = |v: &toml::Value, key: &str| -> Result<Expr> {
                let src = match v {
                    toml::Value::String(s) => s.clone(),
                    other => match number(other) {
                        Some(x) => format!("{x:e}"),
                        None => {
                            return Err(Error::input(format!(
                                "{label}: {key} = {other} must be a number or an expression"
                            )))
                        }
                    },
                };
                let e = Expr::parse(&src, "r", scenario.params.names()).map_err(|e| {
                    let mut err = Error::input(format!("{label}: {key} = \"{src}\": {}", e.message));
                    if let Some(h) = e.hint {
                        err = err.with_hint(h);
                    }
                    err
                })?;
                if e.depends_on_var() {
                    return Err(Error::input(format!("{label}: {key} = \"{src}\" must not depend on r"))
                        .with_hint("use the scenario's parameters, e.g. radius = \"m\""));
                }
                Ok(e)
            };
            let radius = expr(&rs.radius, "radius")?;
            let shell_velocity =
                expr(rs.shell_velocity.as_ref().unwrap_or(&toml::Value::Float(0.0)), "shell_velocity")?;
            stages.push(Stage { scenario, radius, shell_velocity });
        }
        let mut multiply = Vec::new();
        for (name, v) in raw.cycle.map(|c| c.multiply).unwrap_or_default() {
            let f = number(&v).filter(|f| f.is_finite() && *f > 0.0).ok_or_else(|| {
                Error::input(format!("{file}: [cycle] multiply.{name} = {v} must be a positive number"))
                    .with_hint("e.g. multiply = { m = 0.9 } scales m by 0.9 per pass")
            })?;
            for (k, st) in stages.iter().enumerate() {
                st.scenario
                    .params
                    .index(&name)
                    .map_err(|e| e.context(format!("{file}: [cycle] multiply, stage {}", k + 1)))?;
            }
            multiply.push((name, f));
        }
        Ok(Chain {
            name: raw.name,
            energy: raw.particle.energy,
            crossings: raw.crossings.unwrap_or(stages.len()).max(1),
            stages,
            multiply,
            path: path.map(Path::to_path_buf),
            hash: format!("{:x}", Sha256::digest(text.as_bytes())),
        })
    }

    /// One line naming the chain file, its hash and the tool version (for output headers).
    pub fn provenance(&self) -> String {
        let label = self.path.as_ref().map(|p| p.display().to_string()).unwrap_or_else(|| "<chain>".into());
        let mult = self.multiply.iter().map(|(n, f)| format!("{n}*={f}")).collect::<Vec<_>>().join(", ");
        format!(
            "junctura {} | chain \"{}\" ({}) sha256:{} | E0={} | per pass: {}",
            env!("CARGO_PKG_VERSION"),
            crate::text::one_line(&self.name),
            crate::text::one_line(&label),
            &self.hash[..16],
            self.energy,
            if mult.is_empty() { "none".into() } else { mult }
        )
    }
}

fn number(v: &toml::Value) -> Option<f64> {
    match v {
        toml::Value::Integer(i) => Some(*i as f64),
        toml::Value::Float(f) => Some(*f),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::ErrorKind;

    const INLINE: &str = r#"
name = "inline bounce"
crossings = 5
[particle]
energy = 0.9
[[stage]]
radius = "m"
[stage.inline]
name = "bounce"
[stage.inline.parameters]
m = 1.0
lambda = 0.9
[stage.inline.minus]
A = "1 - 2*m/r"
keep = "black-hole"
[stage.inline.plus]
A = "1 - 2*lambda*m/r"
keep = "white-hole"
[stage.inline.shell]
kind = "spacelike"
[cycle]
multiply = { m = 0.9 }
"#;

    #[test]
    fn inline_stage_and_multiply() {
        let c = Chain::parse(INLINE, None).unwrap();
        assert_eq!(c.crossings, 5);
        assert_eq!(c.stages.len(), 1);
        let p = c.stages[0].params_for_pass(&c.multiply, 2).unwrap();
        assert!((p[0] - 0.81).abs() < 1e-15);
        assert!(c.provenance().contains("m*=0.9"));
    }

    #[test]
    fn unknown_multiply_parameter_is_an_input_error() {
        let t = INLINE.replace("multiply = { m = 0.9 }", "multiply = { mass = 0.9 }");
        let e = Chain::parse(&t, None).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Input);
        assert!(e.message.contains("[cycle] multiply"), "{e}");
        assert!(e.hint.unwrap().contains("'m'"));
    }

    #[test]
    fn unknown_key_is_located() {
        let t = INLINE.replace("crossings = 5", "crossings = 5\nfoo = 1");
        let e = Chain::parse(&t, None).unwrap_err();
        assert!(e.message.starts_with("<chain>:4:"), "{e}");
    }

    #[test]
    fn radius_must_not_depend_on_r() {
        let t = INLINE.replace("radius = \"m\"", "radius = \"2*r\"");
        let e = Chain::parse(&t, None).unwrap_err();
        assert!(e.message.contains("must not depend on r"), "{e}");
    }
}
