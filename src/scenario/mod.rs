//! Scenario files (TOML) -> a validated [`Scenario`]: parsed expressions, checked parameters, known sides.
//!
//! The schema (see the README for the full description):
//! ```toml
//! name = "Schwarzschild thin-shell wormhole"
//! dimension = 4
//! [parameters]
//! m = 1.0
//! [minus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! [plus]
//! A = "1 - 2*m/r"
//! keep = "outer"
//! [shell]
//! kind = "timelike"
//! pressure = "w*sigma"
//! ```
//! Validation happens once, here; nothing downstream re-checks.

mod raw;
mod symbols;

pub use symbols::{latex_to_unicode, Symbols};

use crate::error::{Error, Result};
use crate::expr::{Expr, Func, ParseError};
use crate::model::{Eos, ExprLaw, ExprSide, Metric, Model, SideModel};
pub use crate::model::{Keep, ShellKind, Which};
use sha2::{Digest, Sha256};

use std::path::{Path, PathBuf};

/// One side: its metric functions, which part is kept, and the resulting sign of dr along the normal.
#[derive(Debug, Clone)]
pub struct Side {
    /// Minus or plus.
    pub which: Which,
    /// g_tt = -A(r).
    pub a: Expr,
    /// g_rr = 1/B(r).
    pub b: Expr,
    /// True if the file gave B explicitly (otherwise B = A).
    pub b_given: bool,
    /// Which part of the spacetime is kept.
    pub keep: Keep,
    /// An explicit sign of n^r given in the file, if any.
    pub explicit_normal_sign: Option<f64>,
}

impl Side {
    /// The sign nu of n^r on this side (n points from minus into plus).
    ///
    /// R-regions (physics notes; Visser 1995 ch. 14 for the wormhole case): plus side n^r = +zeta |W|,
    /// minus side n^r = -zeta |W|, zeta = +1 if the side keeps r > R. T-regions with a spacelike shell
    /// (minus = earlier side): black-hole interior n^r < 0, white-hole interior n^r > 0. An explicit
    /// `normal_sign` wins over all of these.
    pub fn normal_sign(&self) -> f64 {
        if let Some(s) = self.explicit_normal_sign {
            return s;
        }
        let zeta = match self.keep {
            Keep::Outer => 1.0,
            Keep::Inner => -1.0,
            Keep::BlackHole => return -1.0,
            Keep::WhiteHole => return 1.0,
        };
        match self.which {
            Which::Plus => zeta,
            Which::Minus => -zeta,
        }
    }

    /// This side as the physics model sees it.
    pub fn model(&self) -> SideModel {
        SideModel {
            which: self.which,
            metric: Metric::Expr(ExprSide::new(self.a.clone(), self.b_given.then(|| self.b.clone()))),
            keep: self.keep,
            normal_sign: self.normal_sign(),
        }
    }
}

/// The named constants of a scenario, in file order.
#[derive(Debug, Clone, PartialEq)]
pub struct Params {
    names: Vec<String>,
    values: Vec<f64>,
}

impl Params {
    /// Build from names and values (same length).
    pub fn new(names: Vec<String>, values: Vec<f64>) -> Params {
        assert_eq!(names.len(), values.len());
        Params { names, values }
    }

    /// Names in file order.
    pub fn names(&self) -> &[String] {
        &self.names
    }

    /// Values in file order.
    pub fn values(&self) -> &[f64] {
        &self.values
    }

    /// Index of parameter `name`, or an error listing the known names with a suggestion.
    pub fn index(&self, name: &str) -> Result<usize> {
        self.names.iter().position(|n| n == name).ok_or_else(|| {
            let suggestion = crate::expr::parse::closest(name, self.names.iter().map(|s| s.as_str()));
            let hint = match suggestion {
                Some(s) => format!("did you mean '{s}'? known parameters: {}", self.names.join(", ")),
                None if self.names.is_empty() => "the scenario defines no parameters".to_string(),
                None => format!("known parameters: {}", self.names.join(", ")),
            };
            Error::unknown_parameter(name, suggestion).with_hint(hint)
        })
    }

    /// Value of parameter `name`.
    pub fn get(&self, name: &str) -> Result<f64> {
        Ok(self.values[self.index(name)?])
    }

    /// Override parameter `name` (must exist and the value must be finite).
    pub fn set(&mut self, name: &str, value: f64) -> Result<()> {
        let k = self.checked(name, value)?;
        self.values[k] = value;
        Ok(())
    }

    /// The index of `name` if `value` may be given to it (finite, inside the supported magnitudes).
    fn checked(&self, name: &str, value: f64) -> Result<usize> {
        let k = self.index(name)?;
        if !value.is_finite() {
            return Err(Error::input(format!("parameter '{name}' = {value} is not a finite number")));
        }
        check_magnitude(name, value)?;
        Ok(k)
    }

    /// The value vector with parameter `name` set to `value` (checked as by [`Params::set`]), for a model
    /// evaluated at other parameter values without copying the scenario.
    pub fn values_with(&self, name: &str, value: f64) -> Result<Vec<f64>> {
        let k = self.checked(name, value)?;
        let mut values = self.values.clone();
        values[k] = value;
        Ok(values)
    }

    /// `name = value` pairs, for provenance lines.
    pub fn describe(&self) -> String {
        self.names.iter().zip(&self.values).map(|(n, v)| format!("{n}={v}")).collect::<Vec<_>>().join(", ")
    }
}

/// The shell's own data.
#[derive(Debug, Clone)]
pub struct Shell {
    /// Timelike or spacelike.
    pub kind: ShellKind,
    /// Equation of state p(sigma), if given.
    pub eos: Option<Expr>,
}

/// Where a scenario came from: its path (if any), its text and the SHA-256 of the text.
#[derive(Debug, Clone)]
pub struct Origin {
    /// File path, if loaded from a file.
    pub path: Option<PathBuf>,
    /// The file's text.
    pub text: String,
    /// Hex SHA-256 of the text.
    pub hash: String,
}

impl Origin {
    /// First 16 hex digits of the hash (enough to tell scenarios apart in file headers).
    pub fn short_hash(&self) -> &str {
        &self.hash[..16]
    }

    /// The file name for messages (`<input>` if none).
    pub fn label(&self) -> String {
        self.path.as_ref().map(|p| p.display().to_string()).unwrap_or_else(|| "<input>".into())
    }
}

/// A validated scenario.
#[derive(Debug, Clone)]
pub struct Scenario {
    /// Free-text name.
    pub name: String,
    /// Spacetime dimension D >= 4.
    pub dimension: u32,
    /// Named parameters.
    pub params: Params,
    /// The side the normal points away from.
    pub minus: Side,
    /// The side the normal points into.
    pub plus: Side,
    /// Shell kind and equation of state.
    pub shell: Shell,
    /// How parameters are written in formulas and figures (`[symbols]`).
    pub symbols: Symbols,
    /// Source text and hash.
    pub origin: Origin,
    /// The physics of the file (sides, shell, law, parameter names), built once at load.
    pub model: Model,
}

/// Largest |parameter| accepted: radii up to 1e3 times it (the default range) and the junction quantities
/// (powers of M/r, 1/M^2 in the stability test) stay inside f64 without overflow or underflow.
pub const MAX_PARAMETER: f64 = 1e50;

/// Smallest non-zero |parameter| accepted (the mirror of [`MAX_PARAMETER`]).
pub const MIN_PARAMETER: f64 = 1e-50;

/// A parameter value inside [`MIN_PARAMETER`] ..= [`MAX_PARAMETER`] in magnitude (or zero); the error names it.
fn check_magnitude(name: &str, x: f64) -> Result<()> {
    if x.abs() > MAX_PARAMETER || (x != 0.0 && x.abs() < MIN_PARAMETER) {
        return Err(Error::input(format!(
            "parameter '{name}' = {x:e} is outside the supported magnitudes {MIN_PARAMETER:e} ..= {MAX_PARAMETER:e}"
        ))
        .with_hint("results scale with the length unit: measure lengths in units of a mass or radius of the problem (e.g. m = 1)"));
    }
    Ok(())
}

/// Names that cannot be parameters.
const RESERVED: [&str; 3] = ["r", "sigma", "pi"];

impl Scenario {
    /// Read and validate a scenario file.
    pub fn load(path: &Path) -> Result<Scenario> {
        let text = crate::input::read_text(path, "scenario file", crate::input::MAX_TEXT_FILE)?;
        Scenario::parse(&text, Some(path.to_path_buf()))
    }

    /// Validate scenario text; `path` is used in messages and provenance.
    pub fn parse(text: &str, path: Option<PathBuf>) -> Result<Scenario> {
        let hash = format!("{:x}", Sha256::digest(text.as_bytes()));
        let origin = Origin { path, text: text.to_string(), hash };
        let file = origin.label();
        let raw: raw::RawScenario = toml::from_str(text).map_err(|e| {
            let mut msg = file.clone();
            let mut problem = crate::Problem::Other;
            if let Some(span) = e.span() {
                let (l, c) = line_col(text, span.start);
                msg.push_str(&format!(":{l}:{c}"));
                problem = crate::Problem::Parse { file: file.clone(), line: l, column: c };
            }
            msg.push_str(&format!(": {}", e.message()));
            Error::input(msg).with_problem(problem).with_hint(
                "see the scenario format in the README (keys: name, dimension, [parameters], [minus], [plus], [shell], [symbols])",
            )
        })?;
        let at = |offset: usize| {
            let (l, c) = line_col(text, offset);
            format!("{file}:{l}:{c}")
        };

        let dimension = match &raw.dimension {
            None => 4,
            Some(d) => {
                let v = *d.get_ref();
                if !(4..=64).contains(&v) {
                    return Err(Error::input(format!("{}: dimension = {v} is not supported", at(d.span().start)))
                        .with_hint("the spacetime dimension D must be an integer with 4 <= D <= 64"));
                }
                v as u32
            }
        };

        // Parameters: keep file order, check names and values.
        let mut names = Vec::new();
        let mut values = Vec::new();
        for (k, v) in &raw.parameters {
            let loc = find_key(text, k).map(&at).unwrap_or_else(|| file.clone());
            if !is_identifier(k) {
                return Err(Error::input(format!("{loc}: parameter name '{k}' is not a plain name"))
                    .with_hint("use letters, digits and '_', starting with a letter"));
            }
            if RESERVED.contains(&k.as_str()) || Func::from_name(k).is_some() {
                return Err(Error::input(format!("{loc}: '{k}' is reserved and cannot be a parameter name"))
                    .with_hint(
                        "r is the radius, sigma the surface energy density, pi the constant; rename the parameter",
                    ));
            }
            let x = match v {
                toml::Value::Integer(i) => *i as f64,
                toml::Value::Float(f) => *f,
                other => {
                    return Err(Error::input(format!(
                        "{loc}: parameter '{k}' must be a number, found {} {}",
                        other.type_str(),
                        other
                    ))
                    .with_hint(format!("write e.g. {k} = 1.0 (expressions belong in A, B or pressure)")))
                }
            };
            if !x.is_finite() {
                return Err(Error::input(format!("{loc}: parameter '{k}' = {x} is not a finite number")));
            }
            check_magnitude(k, x).map_err(|e| e.context(&loc))?;
            names.push(k.clone());
            values.push(x);
        }
        let params = Params::new(names, values);

        let shell_kind = match raw.shell.as_ref().and_then(|s| s.kind.as_ref()) {
            None => ShellKind::Timelike,
            Some(k) => match k.get_ref().as_str() {
                "timelike" => ShellKind::Timelike,
                "spacelike" => ShellKind::Spacelike,
                other => {
                    return Err(Error::input(format!("{}: unknown shell kind '{other}'", at(k.span().start)))
                        .with_hint("kind is \"timelike\" or \"spacelike\""))
                }
            },
        };

        let side = |which: Which, raw_side: &Option<toml::Spanned<raw::RawSide>>| -> Result<Side> {
            let rs = raw_side.as_ref().ok_or_else(|| {
                Error::input(format!("{file}: the [{which}] side is missing"))
                    .with_hint(format!("add a [{which}] table with A = \"...\" and keep = \"inner\"|\"outer\"|\"black-hole\"|\"white-hole\""))
            })?;
            let rs = rs.get_ref();
            let parse_expr = |s: &toml::Spanned<String>, key: &str| -> Result<Expr> {
                Expr::parse(s.get_ref(), "r", params.names())
                    .map_err(|e| expr_error(text, &file, s.span().start, &format!("[{which}] {key}"), e))
            };
            let a = parse_expr(&rs.a, "A")?;
            let (b, b_given) = match &rs.b {
                Some(b) => (parse_expr(b, "B")?, true),
                None => (a.clone(), false),
            };
            let keep =
                match rs.keep.get_ref().as_str() {
                    "inner" => Keep::Inner,
                    "outer" => Keep::Outer,
                    "black-hole" => Keep::BlackHole,
                    "white-hole" => Keep::WhiteHole,
                    other => return Err(Error::input(format!(
                        "{}: [{which}] keep = \"{other}\" is not known",
                        at(rs.keep.span().start)
                    ))
                    .with_hint(
                        "keep is \"inner\" (r < R), \"outer\" (r > R), \"black-hole\" or \"white-hole\" (T-regions)",
                    )),
                };
            let explicit_normal_sign = match &rs.normal_sign {
                None => None,
                Some(s) => match *s.get_ref() {
                    1 => Some(1.0),
                    -1 => Some(-1.0),
                    v => {
                        return Err(Error::input(format!(
                            "{}: [{which}] normal_sign = {v} must be 1 or -1",
                            at(s.span().start)
                        )))
                    }
                },
            };
            if shell_kind == ShellKind::Timelike && !keep.is_r_region() && explicit_normal_sign.is_none() {
                return Err(Error::input(format!(
                    "{}: [{which}] keep = \"{}\" with a timelike shell: the sign of dr along the normal is not fixed by the region",
                    at(rs.keep.span().start),
                    keep.name()
                ))
                .with_hint(format!("state it with normal_sign = 1 or -1 in [{which}]; junctura does not guess")));
            }
            if shell_kind == ShellKind::Spacelike && keep.is_r_region() && explicit_normal_sign.is_none() {
                return Err(Error::input(format!(
                    "{}: [{which}] keep = \"{}\" with a spacelike shell: the future-directed normal's dr sign is not fixed by inner/outer",
                    at(rs.keep.span().start),
                    keep.name()
                ))
                .with_hint("use keep = \"black-hole\" or \"white-hole\" (T-regions), or give normal_sign = 1 or -1"));
            }
            let fixed_by_keep = (shell_kind == ShellKind::Timelike) == keep.is_r_region();
            if let (Some(given), Some(span), true) = (explicit_normal_sign, rs.normal_sign.as_ref(), fixed_by_keep) {
                let implied =
                    Side { which, a: a.clone(), b: b.clone(), b_given, keep, explicit_normal_sign: None }.normal_sign();
                if given != implied {
                    return Err(Error::input(format!(
                        "{}: [{which}] normal_sign = {given:+} contradicts keep = \"{}\", which fixes the sign of n^r on the {which} side of a {} shell to {implied:+}",
                        at(span.span().start),
                        keep.name(),
                        shell_kind.name()
                    ))
                    .with_hint(format!(
                        "remove normal_sign (keep fixes it), or change keep; the normal points from [minus] into [plus]{}",
                        if shell_kind == ShellKind::Timelike { ", so a side kept as \"outer\" has n^r > 0 on [plus] and n^r < 0 on [minus]" } else { "" }
                    )));
                }
            }
            Ok(Side { which, a, b, b_given, keep, explicit_normal_sign })
        };
        let minus = side(Which::Minus, &raw.minus)?;
        let plus = side(Which::Plus, &raw.plus)?;

        let eos = match raw.shell.as_ref().and_then(|s| s.pressure.as_ref()) {
            None => None,
            Some(p) => {
                if shell_kind == ShellKind::Spacelike {
                    return Err(Error::input(format!(
                        "{}: an equation of state needs a timelike shell",
                        at(p.span().start)
                    ))
                    .with_hint("a spacelike shell has no energy density and pressure; remove 'pressure'"));
                }
                Some(
                    Expr::parse(p.get_ref(), "sigma", params.names())
                        .map_err(|e| expr_error(text, &file, p.span().start, "[shell] pressure", e))?,
                )
            }
        };
        let mut symbols = Vec::new();
        let symbols_at = text.find("[symbols]").unwrap_or(0);
        for (k, v) in &raw.symbols {
            let loc = find_key(&text[symbols_at..], k).map(|o| at(symbols_at + o)).unwrap_or_else(|| file.clone());
            if !params.names().iter().any(|n| n == k) {
                let hint = match crate::expr::parse::closest(k, params.names().iter().map(|s| s.as_str())) {
                    Some(s) => format!("did you mean '{s}'? [symbols] names the parameters of [parameters]"),
                    None => {
                        "[symbols] gives a symbol to a parameter of [parameters], e.g. lam = '\\lambda'".to_string()
                    }
                };
                return Err(
                    Error::input(format!("{loc}: [symbols] names '{k}', which is not a parameter")).with_hint(hint)
                );
            }
            match v {
                toml::Value::String(s) if !s.trim().is_empty() => {
                    if let Some(why) = crate::text::tex_symbol_problem(s) {
                        return Err(Error::input(format!("{loc}: [symbols] {k} {why}")).with_hint(format!(
                            "a symbol is LaTeX math, e.g. {k} = '\\lambda' or '\\mathcal{{Q}}_{{2}}'"
                        )));
                    }
                    symbols.push((k.clone(), s.trim().to_string()))
                }
                other => {
                    return Err(Error::input(format!(
                        "{loc}: [symbols] {k} must be a non-empty string (a LaTeX symbol), found {}",
                        other.type_str()
                    ))
                    .with_hint(format!("write e.g. {k} = '\\lambda' (single quotes keep the backslash)")))
                }
            }
        }
        let symbols = Symbols::new(symbols);
        let name_start = raw.name.span().start;
        let name = raw.name.into_inner();
        if let Some((_, c)) = crate::text::unsafe_char(&name) {
            return Err(Error::input(format!(
                "{}: name contains the control character {} (a line break, tab or terminal code)",
                at(name_start),
                crate::text::one_line(&c.to_string())
            ))
            .with_hint("write the name on one line of plain text; it is copied into every output file"));
        }
        let model = Model {
            dimension,
            kind: shell_kind,
            minus: minus.model(),
            plus: plus.model(),
            law: eos.clone().map(|e| Eos::Expr(ExprLaw(e))),
            names: params.names().to_vec(),
        };
        Ok(Scenario {
            name,
            dimension,
            params,
            minus,
            plus,
            shell: Shell { kind: shell_kind, eos },
            symbols,
            origin,
            model,
        })
    }

    /// Apply `NAME=VALUE` overrides from the command line.
    pub fn apply_overrides(&mut self, sets: &[String]) -> Result<()> {
        for s in sets {
            use crate::{error::ErrorKind::Input, phrase, RequestField::Set};
            let (k, v) = s.split_once('=').ok_or_else(|| {
                Error::request(Input, Set, s, phrase![Set, format!(" {s}: expected NAME=VALUE")])
                    .with_hint_phrase(phrase!["e.g. ", Set, " m=2"])
            })?;
            let v: f64 = v.trim().parse().map_err(|_| {
                Error::request(Input, Set, s, phrase![Set, format!(" {s}: '{}' is not a number", v.trim())])
                    .with_hint_phrase(phrase!["e.g. ", Set, " q=0.5"])
            })?;
            self.params.set(k.trim(), v).map_err(|e| e.context_phrase(phrase![Set, format!(" {s}")]))?;
        }
        Ok(())
    }

    /// The side `which`.
    pub fn side(&self, which: Which) -> &Side {
        match which {
            Which::Minus => &self.minus,
            Which::Plus => &self.plus,
        }
    }

    /// One line describing where results came from (scenario, hash, parameters, tool version).
    pub fn provenance(&self) -> String {
        format!(
            "junctura {} | scenario \"{}\" ({}) sha256:{} | D={} | {}",
            env!("CARGO_PKG_VERSION"),
            crate::text::one_line(&self.name),
            crate::text::one_line(&self.origin.label()),
            self.origin.short_hash(),
            self.dimension,
            self.params.describe()
        )
    }
}

fn is_identifier(s: &str) -> bool {
    let mut c = s.chars();
    matches!(c.next(), Some(ch) if ch.is_ascii_alphabetic()) && c.all(|ch| ch.is_ascii_alphanumeric() || ch == '_')
}

/// 1-based line and column of byte `offset` in `text`.
pub fn line_col(text: &str, offset: usize) -> (usize, usize) {
    let before = &text[..offset.min(text.len())];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().map(|l| l.chars().count()).unwrap_or(0) + 1;
    (line, col)
}

fn find_key(text: &str, key: &str) -> Option<usize> {
    let mut offset = 0;
    for line in text.split_inclusive('\n') {
        let t = line.trim_start();
        if t.starts_with(key) && t[key.len()..].trim_start().starts_with('=') {
            return Some(offset + (line.len() - t.len()));
        }
        offset += line.len();
    }
    None
}

/// Turn an expression parse error into a file-located error; `value_start` is the byte offset of the TOML
/// string (its opening quote).
fn expr_error(text: &str, file: &str, value_start: usize, what: &str, e: ParseError) -> Error {
    let (line, col) = line_col(text, value_start);
    let col = col + 1 + e.column - 1; // skip the opening quote
    let msg = format!(
        "{file}:{line}:{col}: {what}: {}\n    {}\n    {}^",
        e.message,
        e.source,
        " ".repeat(e.column.saturating_sub(1))
    );
    let mut err = Error::input(msg).with_problem(crate::Problem::Parse { file: file.to_string(), line, column: col });
    if let Some(h) = e.hint {
        err = err.with_hint(h);
    }
    err
}

#[cfg(test)]
mod tests {
    use super::*;

    const OK: &str = r#"
name = "test"
[parameters]
m = 1
q = 0.5
[minus]
A = "1 - 2*m/r + q^2/r^2"
keep = "outer"
[plus]
A = "1 - 2*m/r + q^2/r^2"
keep = "outer"
"#;

    #[test]
    fn loads_and_orders_parameters() {
        let s = Scenario::parse(OK, None).unwrap();
        assert_eq!(s.params.names(), &["m".to_string(), "q".to_string()]);
        assert_eq!(s.dimension, 4);
        assert_eq!(s.minus.normal_sign(), -1.0);
        assert_eq!(s.plus.normal_sign(), 1.0);
        assert!(!s.plus.b_given);
    }

    #[test]
    fn unknown_key_is_located() {
        let t = OK.replace("keep = \"outer\"\n[plus]", "keep = \"outer\"\nfoo = 1\n[plus]");
        let e = Scenario::parse(&t, None).unwrap_err();
        assert!(e.message.contains("<input>:9:1"), "{e}");
        assert!(e.message.contains("foo"), "{e}");
    }

    #[test]
    fn expression_error_is_located_in_file() {
        let t = OK.replace(
            "A = \"1 - 2*m/r + q^2/r^2\"\nkeep = \"outer\"\n[plus]",
            "A = \"1 - 2*m/ * q\"\nkeep = \"outer\"\n[plus]",
        );
        let e = Scenario::parse(&t, None).unwrap_err();
        assert!(e.message.starts_with("<input>:7:"), "{e}");
        assert!(e.message.contains("[minus] A"), "{e}");
    }

    #[test]
    fn set_unknown_parameter_suggests() {
        let mut s = Scenario::parse(OK, None).unwrap();
        let e = s.apply_overrides(&["mm=2".into()]).unwrap_err();
        assert!(e.hint.unwrap().contains("'m'"));
        s.apply_overrides(&["q=0.25".into()]).unwrap();
        assert_eq!(s.params.get("q").unwrap(), 0.25);
    }

    #[test]
    fn timelike_in_t_region_needs_sign() {
        let t = OK.replacen("keep = \"outer\"", "keep = \"black-hole\"", 1);
        let e = Scenario::parse(&t, None).unwrap_err();
        assert!(e.hint.unwrap().contains("normal_sign"));
    }
}
