//! `junctura evolve`: the nonlinear motion of a shell set moving from a static radius.

use super::common::ScenarioArgs;
use super::statics::Fmt;
use junctura::dynamics::{evolve, EvolveOptions, Start};
use junctura::export::evolve as ex;
use junctura::junction::Junction;
use junctura::output::{ensure_dir, print_stdout, warn, write_atomic};
use junctura::plot::write_figure;
use junctura::report::evolve::{phase_figure, radius_figure};
use junctura::{Error, Result};
use std::path::PathBuf;

/// Arguments of `evolve`.
#[derive(clap::Args, Debug)]
pub struct EvolveArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// A static radius a0 of the scenario's law (see `junctura statics`); within 1e-3 of one is moved onto it.
    #[arg(long)]
    radius: f64,
    /// Start at rest at a0 + DA.
    #[arg(
        long,
        allow_hyphen_values = true,
        value_name = "DA",
        required_unless_present = "velocity",
        conflicts_with = "velocity"
    )]
    kick: Option<f64>,
    /// Start at a0 with dR/dτ = V0.
    #[arg(long, allow_hyphen_values = true, value_name = "V0")]
    velocity: Option<f64>,
    /// Proper-time duration T (in the scenario's length unit).
    #[arg(long, value_name = "T")]
    duration: f64,
    /// Stop after this many turning points.
    #[arg(long, default_value_t = 20)]
    max_turns: usize,
    /// Also integrate N kicks spread evenly over [-S, S] (needs --spread) and report the bounded fraction.
    #[arg(long, value_name = "N", requires = "spread")]
    ensemble: Option<usize>,
    /// The kick spread S of the ensemble.
    #[arg(long, value_name = "S", requires = "ensemble")]
    spread: Option<f64>,
    /// Output format on stdout.
    #[arg(long, value_enum, default_value_t = Fmt::Text)]
    format: Fmt,
    /// Write evolve.csv, evolve.json and the figures evolve_radius and evolve_phase (SVG, PDF, PNG) here.
    #[arg(long, value_name = "DIR")]
    out: Option<PathBuf>,
}

pub fn run(a: EvolveArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let start = match (a.kick, a.velocity) {
        (Some(k), None) => Start::Kick(k),
        (None, Some(v)) => Start::Velocity(v),
        _ => return Err(Error::input("give exactly one of --kick DA or --velocity V0").with_hint("e.g. --kick 0.01")),
    };
    if a.max_turns == 0 {
        return Err(
            Error::input("--max-turns 0: at least one turning point is needed").with_hint("e.g. --max-turns 20")
        );
    }
    let opts = EvolveOptions { max_turns: a.max_turns, ..EvolveOptions::default() };
    let ens = a.ensemble.zip(a.spread);
    let rep = evolve(&s, a.radius, start, a.duration, ens, &opts)?;
    for n in &rep.notes {
        warn(n);
    }
    if let Some(dir) = &a.out {
        ensure_dir(dir)?;
        write_atomic(&dir.join("evolve.csv"), ex::evolve_csv(&rep).as_bytes())?;
        write_atomic(&dir.join("evolve.json"), ex::evolve_json(&rep).as_bytes())?;
        let j = Junction::new(&s);
        write_figure(&radius_figure(&rep), dir, "evolve_radius")?;
        write_figure(&phase_figure(&j, &rep), dir, "evolve_phase")?;
    }
    match a.format {
        Fmt::Json => print_stdout(&ex::evolve_json(&rep)),
        Fmt::Text => print_stdout(&ex::evolve_text(&rep)),
        Fmt::Csv => print_stdout(&ex::evolve_csv(&rep)),
    }
    Ok(())
}
