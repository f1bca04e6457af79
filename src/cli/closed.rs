//! `junctura closed-form`: exact, simplified closed forms of the junction quantities in the scenario's metric.

use super::common::ScenarioArgs;
use clap::ValueEnum;
use junctura::export::closed::{self, parse_width, LatexLayout};
use junctura::junction::closed::{closed_forms, ClosedState};
use junctura::output::print_stdout;
use junctura::Result;

/// Output format of `closed-form`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ClosedFormat {
    /// One `lhs = rhs` line per quantity, in junctura's expression syntax.
    Text,
    /// An amsmath `align` block laid out for `--width`.
    Latex,
    /// A Python/SymPy snippet: symbols declared, one assignment per quantity.
    Sympy,
    /// Every quantity in every form.
    Json,
}

/// Shell state of `closed-form`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum StateArg {
    /// Static shell: sigma0(a), p0(a), V(a), c0, c1, beta^2_crit, mass, energy-condition combinations, Xi.
    Static,
    /// General state R, Rdot, Rddot (timelike) or R, R', R'' (spacelike).
    Moving,
}

/// Numbering of the LaTeX equations.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Numbering {
    /// `align`: one number per quantity (`\nonumber` on continuation lines).
    On,
    /// `align*`: no numbers.
    Off,
}

/// Arguments of `closed-form`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Output format.
    #[arg(long, value_enum, default_value_t = ClosedFormat::Text)]
    format: ClosedFormat,
    /// LaTeX text width: `column` (8.5 cm), `page` (17 cm) or a width in centimetres (e.g. `12.5`).
    #[arg(long, default_value = "column")]
    width: String,
    /// LaTeX equation numbers.
    #[arg(long, value_enum, default_value_t = Numbering::On)]
    numbering: Numbering,
    /// Static shell or general moving state.
    #[arg(long, value_enum, default_value_t = StateArg::Static)]
    state: StateArg,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    let width_pt = parse_width(&args.width)?;
    let state = match args.state {
        StateArg::Static => ClosedState::Static,
        StateArg::Moving => ClosedState::Moving,
    };
    let cf = closed_forms(&s, state).map_err(|e| e.context(s.origin.label()))?;
    let prov = s.provenance();
    let out = match args.format {
        ClosedFormat::Text => closed::text(&cf, &s.symbols, &prov),
        ClosedFormat::Sympy => closed::sympy(&cf, &s.symbols, &prov),
        ClosedFormat::Json => {
            serde_json::to_string_pretty(&closed::json(&cf, &s.symbols, &prov)).unwrap_or_default() + "\n"
        }
        ClosedFormat::Latex => {
            let layout = LatexLayout { width_pt, numbered: args.numbering == Numbering::On };
            closed::latex(&cf, &s.symbols, &layout, &prov)
        }
    };
    print_stdout(&out);
    Ok(())
}
