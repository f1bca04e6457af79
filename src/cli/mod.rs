//! The command-line program: argument parsing (clap), one file per command, errors mapped to exit codes.

mod chain;
mod check;
mod closed;
mod common;
mod derive;
mod evolve;
mod geodesic;
mod map;
mod report;
mod statics;

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
    /// Exact, simplified closed forms of the junction quantities in the scenario's own metric (text, LaTeX,
    /// SymPy): sigma0(a), p0(a), V(a), c0, c1, beta^2_crit, shell mass, energy-condition combinations.
    ClosedForm(closed::Args),
    /// Every static radius of the scenario's equation of state in a range, each with its linear stability.
    Statics(statics::StaticsArgs),
    /// Solve for a parameter that puts a static shell at a radius, or for static marginally stable shells.
    Tune(statics::TuneArgs),
    /// Follow every branch of static radii as one parameter varies (through folds).
    Sweep(statics::SweepArgs),
    /// Two-parameter map of a static shell's stability and energy conditions (data, figure, or --summary).
    Map(map::MapArgs),
    /// Integrate the nonlinear motion of a shell set moving from a static radius (kick or velocity).
    Evolve(evolve::EvolveArgs),
    /// Join the part files of a sharded map into exactly what the unsharded run writes.
    Merge(map::MergeArgs),
    /// Everything a paper draft needs for one scenario in one folder: formulas, tables, figures, data.
    Report(report::ReportArgs),
    /// Run the whole pipeline on the bundled demo scenarios.
    Demo(report::DemoArgs),
    /// A radial test particle or light ray crossing the shell: energies, Lorentz factor, orbits on each side.
    Geodesic(geodesic::Args),
    /// Iterate shell crossings over a chain file and track the orbit's approach to the horizon.
    Chain(chain::Args),
}

/// On SIGINT or SIGTERM remove every temporary output file (see `junctura::output::register_temp`) and exit
/// with 128 + the signal number (130 for SIGINT, 143 for SIGTERM), so an interrupted run never leaves a
/// partial file behind.
#[cfg(unix)]
fn install_signal_handler() {
    use signal_hook::consts::{SIGINT, SIGTERM};
    let Ok(mut signals) = signal_hook::iterator::Signals::new([SIGINT, SIGTERM]) else {
        junctura::output::warn("could not install the interrupt handler; an interrupted run may leave .tmp- files");
        return;
    };
    std::thread::spawn(move || {
        if let Some(sig) = signals.forever().next() {
            junctura::output::remove_temps();
            eprintln!("interrupted (signal {sig}): removed temporary files");
            std::process::exit(128 + sig);
        }
    });
}

#[cfg(not(unix))]
fn install_signal_handler() {}

/// Run the program; returns the process exit code.
pub fn run() -> i32 {
    install_signal_handler();
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
        Command::ClosedForm(a) => closed::run(a),
        Command::Statics(a) => statics::run_statics(a),
        Command::Tune(a) => statics::run_tune(a),
        Command::Sweep(a) => statics::run_sweep(a),
        Command::Map(a) => map::run(a),
        Command::Merge(a) => map::run_merge(a),
        Command::Report(a) => report::run_report(a),
        Command::Demo(a) => report::run_demo(a),
        Command::Geodesic(a) => geodesic::run(a),
        Command::Chain(a) => chain::run(a),
        Command::Evolve(a) => evolve::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => {
            eprintln!("error: {}", junctura::text::terminal(&common::error_text(&e)));
            e.kind.exit_code()
        }
    }
}
