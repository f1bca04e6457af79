//! Options and helpers shared by several commands.

use clap::Args;
use junctura::scenario::Scenario;
use junctura::Result;
use std::path::PathBuf;

use junctura::request::RangeRequest;
pub use junctura::request::{parse_axis, parse_pair, range};
use junctura::{Error, RequestField};

pub use junctura::export::Format;

/// The `--format` values a command offers (in this order in `--help`), as a clap value parser.
pub fn formats(offered: &'static [Format]) -> impl clap::builder::TypedValueParser<Value = Format> {
    use clap::builder::{PossibleValue, PossibleValuesParser, TypedValueParser};
    PossibleValuesParser::new(offered.iter().map(|f| PossibleValue::new(f.name()).help(f.help())))
        .map(move |name| Format::parse(&name).unwrap_or(offered[0]))
}

/// Render `item` in `format` and print it on stdout: CSV through the last check (no non-finite number).
pub fn print(format: Format, item: &junctura::export::Item<'_>) -> Result<()> {
    let out = junctura::export::render(format, item)?;
    if format == Format::Csv {
        junctura::output::print_csv(&out)
    } else {
        junctura::output::print_stdout(&out);
        Ok(())
    }
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
    #[arg(long, allow_negative_numbers = true)]
    pub from: Option<f64>,
    /// Upper end of the radius range (default: 1e3 L).
    #[arg(long, allow_negative_numbers = true)]
    pub to: Option<f64>,
}

impl RangeArgs {
    /// The range as a library request.
    pub fn request(&self) -> RangeRequest {
        RangeRequest { from: self.from, to: self.to }
    }

    /// The checked range, with the scenario's default range for missing ends.
    pub fn resolve(&self, s: &Scenario) -> Result<(f64, f64)> {
        self.request().resolve(s)
    }
}

/// The option that sets each request field: the one table from the library's field names to the command line.
pub fn flag(field: RequestField) -> &'static str {
    use RequestField::*;
    match field {
        From => "--from",
        To => "--to",
        Radius => "--radius",
        Velocity => "--velocity",
        Acceleration => "--acceleration",
        Energy => "--energy",
        ShellVelocity => "--shell-velocity",
        Direction => "--direction",
        Kick => "--kick",
        Sigma => "--sigma",
        Duration => "--duration",
        Spread => "--spread",
        Ensemble => "--ensemble",
        Crossings => "--crossings",
        Mass => "--mass",
        Within => "--within",
        X => "--x",
        Y => "--y",
        Beta2 => "--beta2",
        Vary => "--vary",
        Family => "--family",
        Solve => "--solve",
        XLim => "--xlim",
        YLim => "--ylim",
        Shard => "--shard",
        // Positional: the part files of `merge`, as its usage line names them.
        Parts => "PARTS",
        FromStatic => "--from-static",
        StopAtHorizon => "--stop-at-horizon",
        State => "--state",
        Width => "--width",
        Out => "--out",
        LogX => "--log-x",
        LogY => "--log-y",
        Summary => "--summary",
        Set => "--set",
        Format => "--format",
        // The enum is non-exhaustive: a field added later prints by its library name until it gets a row here.
        other => other.name(),
    }
}

/// An error as the command line prints it: request fields named by their options ([`flag`]).
pub fn error_text(e: &Error) -> String {
    e.render(&flag)
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
    #[arg(long, allow_negative_numbers = true)]
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
        for (opt, v) in [("--xlabel", &self.xlabel), ("--ylabel", &self.ylabel)] {
            if let Some((_, c)) = v.as_deref().and_then(junctura::text::unsafe_char) {
                return Err(junctura::Error::input(format!(
                    "{opt}: the label contains the control character {}",
                    junctura::text::one_line(&c.to_string())
                ))
                .with_hint("give the label as one line of plain text"));
            }
        }
        Ok(FigureOptions {
            style,
            width_cm,
            aspect: self.aspect,
            x_limits: self.xlim.as_deref().map(|s| parse_pair(RequestField::XLim, s)).transpose()?,
            y_limits: self.ylim.as_deref().map(|s| parse_pair(RequestField::YLim, s)).transpose()?,
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
