//! `junctura check`: validate a scenario and survey both sides.

use super::common::{formats, print, Format, RangeArgs, ScenarioArgs};
use junctura::export::Item;
use junctura::survey::check;
use junctura::Result;

/// The formats of `check`.
const FORMATS: &[Format] = &[Format::Text, Format::Json, Format::Latex, Format::Csv];

/// Arguments of `check`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    #[command(flatten)]
    range: RangeArgs,
    /// Output format (latex: the text summary, the survey has no formulas).
    #[arg(long, default_value = "text", value_parser = formats(FORMATS))]
    format: Format,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    let report = check(&s, &args.range.request())?;
    print(args.format, &Item::Survey(&report))
}
