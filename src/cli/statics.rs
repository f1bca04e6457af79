//! `junctura statics`, `tune` and `sweep`: static radii with an equation of state.

use super::common::{parse_axis, parse_pair, range, to_json, RangeArgs, ScenarioArgs};
use clap::ValueEnum;
use junctura::export::statics as ex;
use junctura::output::{print_stdout, warn};
use junctura::statics::sweep::sweep_with_progress;
use junctura::statics::tune::{tune_at_radius, tune_marginal};
use junctura::statics::{find_static_radii, StaticsOptions};
use junctura::{Error, Result};

/// Output formats of these commands.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Fmt {
    /// Readable summary.
    Text,
    /// One JSON object.
    Json,
    /// CSV table.
    Csv,
}

/// Arguments of `statics`.
#[derive(clap::Args, Debug)]
pub struct StaticsArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    #[command(flatten)]
    range: RangeArgs,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Fmt::Text)]
    format: Fmt,
}

pub fn run_statics(a: StaticsArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let (lo, hi) = a.range.resolve(&s)?;
    let rep = find_static_radii(&s, lo, hi, &StaticsOptions::default())?;
    emit(a.format, &rep, &rep.notes, ex::statics_text, ex::statics_csv)?;
    Ok(())
}

/// Print a report in the chosen format; notes go to stderr unless the text form already shows them.
fn emit<R: serde::Serialize>(
    format: Fmt,
    rep: &R,
    notes: &[String],
    text: fn(&R) -> String,
    csv: fn(&R) -> String,
) -> Result<()> {
    if format != Fmt::Text {
        for n in notes {
            warn(n);
        }
    }
    match format {
        Fmt::Json => print_stdout(&to_json(rep)),
        Fmt::Text => print_stdout(&text(rep)),
        Fmt::Csv => junctura::output::print_csv(&csv(rep))?,
    }
    Ok(())
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
    #[arg(long, value_enum, default_value_t = Fmt::Text)]
    format: Fmt,
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
    if a.format == Fmt::Json {
        for n in &rep.notes {
            warn(n);
        }
    }
    match a.format {
        Fmt::Json => print_stdout(&ex::tune_json(&rep)),
        Fmt::Text => print_stdout(&ex::tune_text(&rep)),
        Fmt::Csv => junctura::output::print_csv(&ex::tune_csv(&rep))?,
    }
    Ok(())
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
    #[arg(long, value_enum, default_value_t = Fmt::Text)]
    format: Fmt,
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
    emit(a.format, &rep, &rep.notes, ex::sweep_text, ex::sweep_csv)?;
    Ok(())
}
