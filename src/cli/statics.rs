//! `junctura statics`, `tune` and `sweep`: static radii with an equation of state.

use super::common::{formats, parse_axis, parse_pair, print, range, Format, RangeArgs, ScenarioArgs};
use junctura::export::Item;
use junctura::output::warn;
use junctura::statics::sweep::sweep_with_progress;
use junctura::statics::tune::{tune_at_radius, tune_marginal};
use junctura::statics::{find_static_radii, StaticsOptions};
use junctura::{Error, Result};

/// The formats of `statics`.
const STATICS_FORMATS: &[Format] = &[Format::Text, Format::Json, Format::Csv, Format::Markdown];

/// The formats of `tune`, `sweep` and `evolve`.
pub const TABLE_FORMATS: &[Format] = &[Format::Text, Format::Json, Format::Csv];

/// Arguments of `statics`.
#[derive(clap::Args, Debug)]
pub struct StaticsArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    #[command(flatten)]
    range: RangeArgs,
    /// Output format (markdown: a table for notes).
    #[arg(long, default_value = "text", value_parser = formats(STATICS_FORMATS))]
    format: Format,
}

pub fn run_statics(a: StaticsArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let (lo, hi) = a.range.resolve(&s)?;
    let rep = find_static_radii(&s, lo, hi, &StaticsOptions::default())?;
    emit(a.format, &Item::Statics(&rep), &rep.notes)
}

/// Print a result in the chosen format; notes go to stderr unless the text or Markdown form shows them.
fn emit(format: Format, item: &Item<'_>, notes: &[String]) -> Result<()> {
    if !matches!(format, Format::Text | Format::Markdown) {
        for n in notes {
            warn(n);
        }
    }
    print(format, item)
}

/// Arguments of `tune`.
#[derive(clap::Args, Debug)]
pub struct TuneArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// The parameter to solve for (of the metric or of the equation of state).
    #[arg(long)]
    solve: String,
    /// Put the static shell at this radius.
    #[arg(long, allow_negative_numbers = true, conflicts_with = "marginal")]
    radius: Option<f64>,
    /// Find static AND marginally stable configurations (V = V' = V'' = 0) with the radius in --from..--to.
    #[arg(long)]
    marginal: bool,
    /// Lower end of the radius range (with --marginal).
    #[arg(long, allow_negative_numbers = true)]
    from: Option<f64>,
    /// Upper end of the radius range (with --marginal).
    #[arg(long, allow_negative_numbers = true)]
    to: Option<f64>,
    /// Range LO:HI of the solved parameter to search (default: current value +- 10 max(|value|, 1)).
    #[arg(long, allow_hyphen_values = true)]
    within: Option<String>,
    /// Output format.
    #[arg(long, default_value = "text", value_parser = formats(TABLE_FORMATS))]
    format: Format,
}

pub fn run_tune(a: TuneArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let within = a.within.as_deref().map(|w| parse_pair(junctura::RequestField::Within, w)).transpose()?;
    let opts = StaticsOptions::default();
    let rep = if a.marginal {
        let (lo, hi) = match (a.from, a.to) {
            (Some(lo), Some(hi)) => range(Some(lo), Some(hi), (lo, hi))?,
            _ => {
                return Err(Error::input("--marginal needs --from LO --to HI (the radius range)")
                    .with_hint("e.g. --marginal --from 2.1 --to 6"))
            }
        };
        tune_marginal(&s, &a.solve, lo, hi, within, &opts).map_err(|e| e.context(s.origin.label()))?
    } else {
        let r = a.radius.ok_or_else(|| {
            Error::input("tune needs --radius R or --marginal").with_hint("e.g. tune SCENARIO --solve w --radius 4")
        })?;
        junctura::request::value(junctura::RequestField::Radius, r)?;
        if !(r.is_finite() && r > 0.0) {
            return Err(Error::input(format!("--radius {r}: the areal radius must be a positive number")));
        }
        tune_at_radius(&s, &a.solve, r, within, &opts).map_err(|e| e.context(s.origin.label()))?
    };
    emit(a.format, &Item::Tune(&rep), &rep.notes)
}

/// Arguments of `sweep`.
#[derive(clap::Args, Debug)]
pub struct SweepArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// NAME:LO:HI:N — the parameter and its N values (both ends included).
    #[arg(long, allow_hyphen_values = true)]
    vary: String,
    #[command(flatten)]
    range: RangeArgs,
    /// Output format.
    #[arg(long, default_value = "text", value_parser = formats(TABLE_FORMATS))]
    format: Format,
}

pub fn run_sweep(a: SweepArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let axis = parse_axis(junctura::RequestField::Vary, &a.vary)?;
    if axis.n > 100_000 {
        return Err(Error::input(format!("--vary {}: N = {} values is more than a sweep needs", a.vary, axis.n))
            .with_hint("use at most 100000 values; for dense 2-D scans use `junctura map`"));
    }
    let (lo, hi) = a.range.resolve(&s)?;
    let bar = if std::io::IsTerminal::is_terminal(&std::io::stderr()) && axis.n > 1 {
        let b = indicatif::ProgressBar::new(axis.n as u64);
        b.set_style(
            indicatif::ProgressStyle::with_template("{spinner} sweep {bar:40} {pos}/{len} values, {eta} left")
                .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
        Some(b)
    } else {
        None
    };
    let rep = sweep_with_progress(&s, &axis.name, &axis.values(), lo, hi, &StaticsOptions::default(), &|done, _| {
        if let Some(b) = &bar {
            b.set_position(done as u64);
        }
    })?;
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    emit(a.format, &Item::Sweep(&rep), &rep.notes)
}
