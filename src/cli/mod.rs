//! The command-line program: argument parsing (clap), one file per command, errors mapped to exit codes.

mod chain;
mod check;
mod common;
mod geodesic;

use clap::{Parser, Subcommand};

/// Thin-shell junctions between static spherically symmetric spacetimes.
#[derive(Parser, Debug)]
#[command(name = "junctura", version, about, long_about = None)]
pub struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Validate a scenario and survey each side: horizons, R-/T-regions, circular photon orbits.
    Check(check::Args),
    /// A radial test particle or light ray crossing the shell: energies, Lorentz factor, orbits on each side.
    Geodesic(geodesic::Args),
    /// Iterate shell crossings over a chain file and track the orbit's approach to the horizon.
    Chain(chain::Args),
}

/// Run the program; returns the process exit code.
pub fn run() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return code;
        }
    };
    let result = match cli.command {
        Command::Check(a) => check::run(a),
        Command::Geodesic(a) => geodesic::run(a),
        Command::Chain(a) => chain::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => {
            eprintln!("error: {e}");
            e.kind.exit_code()
        }
    }
}
