//! The command-line program: argument parsing (clap), one file per command, errors mapped to exit codes.

mod check;
mod common;
mod derive;

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
    /// Junction quantities at one shell state: sigma, p (or S^l_l, S^theta_theta), potential, mass,
    /// energy conditions, linear stability; formulas as text or LaTeX.
    Derive(derive::Args),
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
        Command::Derive(a) => derive::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => {
            eprintln!("error: {e}");
            e.kind.exit_code()
        }
    }
}
