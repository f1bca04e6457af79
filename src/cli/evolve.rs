//! `junctura evolve`: the nonlinear motion of a shell from any initial data or from a static radius.

use super::common::{formats, print, Format, ScenarioArgs};
use super::statics::TABLE_FORMATS;
use junctura::dynamics::{evolve, EvolveOptions, Start};
use junctura::export::{self, Item};
use junctura::junction::Junction;
use junctura::output::{ensure_dir, warn, write_atomic};
use junctura::plot::write_figure;
use junctura::report::evolve::{phase_figure, radius_figure};
use junctura::{Error, Result};
use std::path::PathBuf;

/// Arguments of `evolve`.
#[derive(clap::Args, Debug)]
pub struct EvolveArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Starting radius R; with --kick or --from-static a static radius a0 of the law (see `junctura statics`),
    /// within 1e-3 of one is moved onto it.
    #[arg(long, allow_negative_numbers = true)]
    radius: f64,
    /// Start at rest at a0 + DA (a0 = --radius, a static radius).
    #[arg(long, allow_hyphen_values = true, value_name = "DA", conflicts_with_all = ["velocity", "sigma", "from_static"])]
    kick: Option<f64>,
    /// Start at R with dR/dτ = V (the sign is the direction); σ follows from the junction condition. With
    /// --from-static: start at the static radius a0 with dR/dτ = V.
    #[arg(long, allow_hyphen_values = true, value_name = "V", conflicts_with = "sigma")]
    velocity: Option<f64>,
    /// Start at R with surface energy density S; |dR/dτ| follows from the energy constraint Rdot² + V(R) = 0.
    #[arg(long, allow_hyphen_values = true, value_name = "S")]
    sigma: Option<f64>,
    /// Direction of motion for --sigma (not needed at a turning point).
    #[arg(long, value_enum, requires = "sigma")]
    direction: Option<Direction>,
    /// --radius is a static radius a0 of the law: start there (at rest, or with --velocity) and compare with the
    /// linearised theory.
    #[arg(long, conflicts_with = "sigma")]
    from_static: bool,
    /// Stop where the shell reaches a horizon of either side instead of crossing it.
    #[arg(long)]
    stop_at_horizon: bool,
    /// Proper-time duration T (in the scenario's length unit).
    #[arg(long, allow_negative_numbers = true, value_name = "T")]
    duration: f64,
    /// Stop after this many turning points.
    #[arg(long, default_value_t = 20)]
    max_turns: usize,
    /// Also integrate N kicks spread evenly over [-S, S] (needs --spread) and report the bounded fraction.
    #[arg(long, value_name = "N", requires = "spread")]
    ensemble: Option<usize>,
    /// The kick spread S of the ensemble.
    #[arg(long, allow_negative_numbers = true, value_name = "S", requires = "ensemble")]
    spread: Option<f64>,
    /// Output format on stdout.
    #[arg(long, default_value = "text", value_parser = formats(TABLE_FORMATS))]
    format: Format,
    /// Write evolve.csv, evolve.json and the figures evolve_radius and evolve_phase (SVG, PDF, PNG) here.
    #[arg(long, value_name = "DIR")]
    out: Option<PathBuf>,
    #[command(flatten)]
    figure: super::common::FigureArgs,
}

/// Direction of motion at the start.
#[derive(clap::ValueEnum, Clone, Copy, Debug, PartialEq, Eq)]
pub enum Direction {
    /// dR/dτ > 0.
    Outward,
    /// dR/dτ < 0.
    Inward,
}

pub fn run(a: EvolveArgs) -> Result<()> {
    let s = a.scenario.load()?;
    use junctura::RequestField as F;
    for (field, v) in [
        (F::Radius, Some(a.radius)),
        (F::Duration, Some(a.duration)),
        (F::Kick, a.kick),
        (F::Velocity, a.velocity),
        (F::Sigma, a.sigma),
        (F::Spread, a.spread),
    ] {
        if let Some(v) = v {
            junctura::request::value(field, v)?;
        }
    }
    let outward = a.direction.map(|d| d == Direction::Outward);
    let Some(start) = Start::from_options(a.kick, a.velocity, a.sigma, outward, a.from_static) else {
        return Err(Error::input("give one of --kick DA, --velocity V or --sigma S (or --from-static)")
            .with_hint("e.g. --velocity 0 (at rest at --radius), --sigma 0.01 --direction inward, or --kick 0.01 about a static radius"));
    };
    if a.max_turns == 0 {
        return Err(
            Error::input("--max-turns 0: at least one turning point is needed").with_hint("e.g. --max-turns 20")
        );
    }
    let opts = EvolveOptions { max_turns: a.max_turns, stop_at_horizon: a.stop_at_horizon, ..EvolveOptions::default() };
    let fig_opts = a.figure.options()?;
    let ens = a.ensemble.zip(a.spread);
    let rep = evolve(&s, a.radius, start, a.duration, ens, &opts)?;
    for n in &rep.notes {
        warn(n);
    }
    if let Some(dir) = &a.out {
        ensure_dir(dir)?;
        write_atomic(&dir.join("evolve.csv"), export::csv::evolve(&rep).as_bytes())?;
        write_atomic(&dir.join("evolve.json"), export::json::pretty(&rep).as_bytes())?;
        let j = Junction::new(&s);
        for (stem, mut fig) in [("evolve_radius", radius_figure(&rep)), ("evolve_phase", phase_figure(&j, &rep))] {
            fig_opts.apply(&mut fig, junctura::plot::StyleName::Classic);
            write_figure(&fig, dir, stem)?;
        }
    }
    print(a.format, &Item::Evolve(&rep))
}
