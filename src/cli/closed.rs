//! `junctura closed-form`: exact, simplified closed forms of the junction quantities in the scenario's metric.

use super::common::{formats, print, Format, ScenarioArgs};
use clap::ValueEnum;
use junctura::export::closed::{parse_width, LatexLayout};
use junctura::export::Item;
use junctura::junction::closed::{closed_forms, ClosedState};
use junctura::Result;

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

/// The formats of `closed-form`.
const FORMATS: &[Format] = &[Format::Text, Format::Latex, Format::Sympy, Format::Json];

/// Arguments of `closed-form`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Output format: text (one `lhs = rhs` line per quantity), latex (an amsmath `align` block laid out for
    /// `--width`), sympy, or json (every quantity in every form).
    #[arg(long, default_value = "text", value_parser = formats(FORMATS))]
    format: Format,
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
    let layout = LatexLayout { width_pt, numbered: args.numbering == Numbering::On };
    print(args.format, &Item::ClosedForms { forms: &cf, symbols: &s.symbols, provenance: &prov, layout })
}
