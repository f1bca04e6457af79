//! `junctura geodesic`: a radial test particle (or light ray) crossing the shell at R, with its orbit on each side.

use super::common::{formats, print, Format, ScenarioArgs};
use clap::ValueEnum;
use junctura::export::Item;
use junctura::geodesic::{CrossingRequest, Direction, Particle};
use junctura::Result;

/// Radial direction on the minus side.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum DirectionArg {
    /// Toward smaller r.
    Inward,
    /// Toward larger r.
    Outward,
}

/// Arguments of `geodesic`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Shell radius R at the crossing (geometric units).
    #[arg(long, allow_negative_numbers = true)]
    radius: f64,
    /// Killing energy E = -u_t on the minus side (per unit mass for a particle).
    #[arg(long, allow_negative_numbers = true)]
    energy: f64,
    /// A light ray instead of a massive particle.
    #[arg(long)]
    null: bool,
    /// dR/dtau of a timelike shell at the crossing (default 0: a static shell).
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    shell_velocity: f64,
    /// Radial direction on the minus side (default: along the normal, toward the plus side).
    #[arg(long, value_enum)]
    direction: Option<DirectionArg>,
    /// Output format.
    #[arg(long, default_value = "text", value_parser = formats(&[Format::Text, Format::Json, Format::Csv]))]
    format: Format,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    let particle = if args.null { Particle::Null } else { Particle::Timelike };
    let direction = args.direction.map(|d| match d {
        DirectionArg::Inward => Direction::Inward,
        DirectionArg::Outward => Direction::Outward,
    });
    let req = CrossingRequest {
        radius: args.radius,
        shell_velocity: args.shell_velocity,
        energy_minus: args.energy,
        particle,
        direction,
    };
    let report = junctura::geodesic::report(&s, &req)?;
    print(args.format, &Item::Crossing(&report))
}
