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

/// A grid axis `NAME:LO:HI:N` (N points including both ends, like linspace).
#[derive(Debug, Clone, PartialEq)]
pub struct AxisSpec {
    /// Axis name (a parameter, `radius` or `beta2`).
    pub name: String,
    /// First value.
    pub lo: f64,
    /// Last value.
    pub hi: f64,
    /// Number of points.
    pub n: usize,
}

impl AxisSpec {
    /// The grid values ([`junctura::scan::grid_value`]).
    pub fn values(&self) -> Vec<f64> {
        (0..self.n).map(|i| junctura::scan::grid_value(self.lo, self.hi, i, self.n)).collect()
    }
}

/// Parse `NAME:LO:HI:N`; `flag` names the option in messages.
pub fn parse_axis(flag: &str, spec: &str) -> Result<AxisSpec> {
    let parts: Vec<&str> = spec.split(':').collect();
    let bad = |why: &str| {
        junctura::Error::input(format!("{flag} {spec}: {why}"))
            .with_hint(format!("write {flag} NAME:LO:HI:N, e.g. {flag} q:0:0.9:50"))
    };
    if parts.len() != 4 {
        return Err(bad("expected 4 fields separated by ':'"));
    }
    let num = |s: &str, what: &str| -> Result<f64> {
        let v: f64 = s.trim().parse().map_err(|_| bad(&format!("{what} '{s}' is not a number")))?;
        if !v.is_finite() {
            return Err(bad(&format!("{what} '{s}' is not finite")));
        }
        Ok(v)
    };
    let lo = num(parts[1], "LO")?;
    let hi = num(parts[2], "HI")?;
    let n: usize = parts[3].trim().parse().map_err(|_| bad(&format!("N '{}' is not a whole number", parts[3])))?;
    if n == 0 {
        return Err(bad("N must be at least 1"));
    }
    if n > 1 && lo >= hi {
        return Err(bad("LO must be smaller than HI"));
    }
    if n > 100_000_000 {
        return Err(bad("N above 1e8 points on one axis is refused (split the scan with --shard)"));
    }
    Ok(AxisSpec { name: parts[0].trim().to_string(), lo, hi, n })
}

/// Parse `LO:HI`.
pub fn parse_pair(flag: &str, spec: &str) -> Result<(f64, f64)> {
    let bad = || {
        junctura::Error::input(format!("{flag} {spec}: expected LO:HI with LO < HI"))
            .with_hint(format!("e.g. {flag} -2:2"))
    };
    let (a, b) = spec.split_once(':').ok_or_else(bad)?;
    let lo: f64 = a.trim().parse().map_err(|_| bad())?;
    let hi: f64 = b.trim().parse().map_err(|_| bad())?;
    if !(lo.is_finite() && hi.is_finite() && lo < hi) {
        return Err(bad());
    }
    Ok((lo, hi))
}

/// Figure control shared by the commands that write figures.
#[derive(Args, Debug, Clone, Default)]
pub struct FigureArgs {
    /// Look of the figures: journal (serif STIX text, ticks inside on all sides) or classic (sans-serif).
    #[arg(long)]
    pub style: Option<String>,
    /// Figure width: column (8.5 cm), page (17.8 cm) or a number of cm.
    #[arg(long)]
    pub width: Option<String>,
    /// Height / width of the figure (default 0.75).
    #[arg(long)]
    pub aspect: Option<f64>,
    /// Horizontal axis limits LO:HI.
    #[arg(long, allow_hyphen_values = true)]
    pub xlim: Option<String>,
    /// Vertical axis limits LO:HI.
    #[arg(long, allow_hyphen_values = true)]
    pub ylim: Option<String>,
    /// Logarithmic horizontal axis (curves only; maps stay linear).
    #[arg(long)]
    pub log_x: bool,
    /// Logarithmic vertical axis (curves only).
    #[arg(long)]
    pub log_y: bool,
    /// Horizontal axis label (replaces the default).
    #[arg(long)]
    pub xlabel: Option<String>,
    /// Vertical axis label.
    #[arg(long)]
    pub ylabel: Option<String>,
    /// Legend position: auto, upper-right, upper-left, lower-right, lower-left, above or none.
    #[arg(long)]
    pub legend: Option<String>,
}

impl FigureArgs {
    /// The checked options.
    pub fn options(&self) -> Result<junctura::plot::FigureOptions> {
        use junctura::plot::{FigureOptions, LegendPos, StyleName};
        let style = match &self.style {
            None => None,
            Some(s) => Some(StyleName::parse(s).ok_or_else(|| {
                junctura::Error::input(format!("--style {s}: unknown style")).with_hint("use journal or classic")
            })?),
        };
        let width_cm = match self.width.as_deref() {
            None => None,
            Some("column") => Some(8.5),
            Some("page") => Some(17.8),
            Some(w) => {
                let v: f64 = w.trim_end_matches("cm").parse().map_err(|_| {
                    junctura::Error::input(format!("--width {w}: not column, page or a number of cm"))
                        .with_hint("e.g. --width column, --width page or --width 12")
                })?;
                if !(3.0..=60.0).contains(&v) {
                    return Err(junctura::Error::input(format!("--width {w}: outside 3..60 cm")));
                }
                Some(v)
            }
        };
        if let Some(a) = self.aspect {
            if !(0.2..=3.0).contains(&a) {
                return Err(junctura::Error::input(format!("--aspect {a}: outside 0.2..3 (height / width)")));
            }
        }
        let legend = match &self.legend {
            None => None,
            Some(s) => Some(LegendPos::parse(s).ok_or_else(|| {
                junctura::Error::input(format!("--legend {s}: unknown position"))
                    .with_hint("auto, upper-right, upper-left, lower-right, lower-left, above or none")
            })?),
        };
        Ok(FigureOptions {
            style,
            width_cm,
            aspect: self.aspect,
            x_limits: self.xlim.as_deref().map(|s| parse_pair("--xlim", s)).transpose()?,
            y_limits: self.ylim.as_deref().map(|s| parse_pair("--ylim", s)).transpose()?,
            log_x: self.log_x,
            log_y: self.log_y,
            x_label: self.xlabel.clone(),
            y_label: self.ylabel.clone(),
            legend,
        })
    }
}

/// Parse `NAME=v1,v2,...` (a family of parameter values).
pub fn parse_family(spec: &str) -> Result<(String, Vec<f64>)> {
    let bad = |why: &str| {
        junctura::Error::input(format!("--family {spec}: {why}"))
            .with_hint("write --family NAME=v1,v2,..., e.g. --family q=0,0.3,0.6,0.9")
    };
    let (name, vals) = spec.split_once('=').ok_or_else(|| bad("expected NAME=v1,v2,..."))?;
    let mut out = Vec::new();
    for v in vals.split(',') {
        let x: f64 = v.trim().parse().map_err(|_| bad(&format!("'{v}' is not a number")))?;
        if !x.is_finite() {
            return Err(bad(&format!("'{v}' is not finite")));
        }
        out.push(x);
    }
    if out.is_empty() || out.len() > 8 {
        return Err(bad("give 1 to 8 values"));
    }
    Ok((name.trim().to_string(), out))
}
