//! `junctura derive`: junction quantities, potential and stability at one shell state.

use super::common::{formats, print, Format, ScenarioArgs};
use junctura::export::closed::{parse_width, LatexLayout};
use junctura::export::Item;
use junctura::output::warn;
use junctura::report::derive::{derive, State};
use junctura::{Error, Result};

/// The formats of `derive`.
const FORMATS: &[Format] = &[Format::Text, Format::Json, Format::Latex, Format::Csv, Format::Markdown];

/// Arguments of `derive`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Shell radius R (areal radius).
    #[arg(long, allow_negative_numbers = true)]
    radius: f64,
    /// dR/dtau (timelike) or dR/dl (spacelike) for a moving shell; default 0 (static).
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    velocity: f64,
    /// d^2R/dtau^2 (or d^2R/dl^2); default 0.
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    acceleration: f64,
    /// Output format.
    #[arg(long, default_value = "text", value_parser = formats(FORMATS))]
    format: Format,
    /// With --format latex: text width of the closed forms, `column` (8.5 cm), `page` (17 cm) or cm.
    #[arg(long, default_value = "column")]
    width: String,
    /// With --format latex: equation numbers.
    #[arg(long, value_enum, default_value_t = super::closed::Numbering::On)]
    numbering: super::closed::Numbering,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    use junctura::RequestField as F;
    for (field, v) in [(F::Radius, args.radius), (F::Velocity, args.velocity), (F::Acceleration, args.acceleration)] {
        junctura::request::value(field, v)?;
    }
    if args.radius <= 0.0 {
        return Err(Error::input(format!("--radius {}: the areal radius must be positive", args.radius)));
    }
    let state = State { radius: args.radius, velocity: args.velocity, acceleration: args.acceleration };
    let rep = derive(&s, state).map_err(|e| e.context(s.origin.label()))?;
    // The text and Markdown forms show the warnings; the others leave them to stderr.
    if !matches!(args.format, Format::Text | Format::Markdown) {
        for w in &rep.warnings {
            warn(w);
        }
    }
    let layout = if args.format == Format::Latex {
        LatexLayout { width_pt: parse_width(&args.width)?, numbered: args.numbering == super::closed::Numbering::On }
    } else {
        LatexLayout::default()
    };
    print(args.format, &Item::Derive { report: &rep, scenario: &s, layout })
}
