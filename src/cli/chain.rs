//! `junctura chain`: iterate the crossing map over a chain of shells and report the orbit after each crossing.

use super::common::{formats, print, Format};
use junctura::export::{self, Item};
use junctura::geodesic::{chain, Chain, ChainRequest};
use junctura::output::{ensure_dir, warn, write_atomic};
use junctura::Result;
use std::path::PathBuf;

/// Arguments of `chain`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// Chain file (TOML).
    file: PathBuf,
    /// Number of crossings (default: the file's `crossings`).
    #[arg(long)]
    crossings: Option<usize>,
    /// Mass unit M of the geometric units, e.g. 1Msun, 1e30kg, 2.5e-8kg (adds lengths in metres).
    #[arg(long)]
    mass: Option<String>,
    /// Report the first crossing whose orbit comes within this distance of the horizon, e.g. 1lP, 1e-30m,
    /// 1e-3M (default with --mass: one Planck length).
    #[arg(long)]
    within: Option<String>,
    /// Output format on stdout.
    #[arg(long, default_value = "text", value_parser = formats(&[Format::Text, Format::Json, Format::Csv]))]
    format: Format,
    /// Also write <name>.csv, <name>.json and the figures into this folder.
    #[arg(long)]
    out: Option<PathBuf>,
    #[command(flatten)]
    figure: super::common::FigureArgs,
}

pub fn run(args: Args) -> Result<()> {
    let fig_opts = args.figure.options()?;
    let file = Chain::load(&args.file)?;
    let req = ChainRequest { crossings: args.crossings, mass: args.mass.clone(), within: args.within.clone() };
    let report = chain(&file, &req)?;
    for w in &report.warnings {
        warn(w);
    }
    let csv = export::csv::chain(&report.run, &report.provenance, report.unit.as_ref());
    let json = export::json::pretty(&report);
    if let Some(dir) = &args.out {
        ensure_dir(dir)?;
        let stem = args.file.file_stem().map(|s| s.to_string_lossy().to_string()).unwrap_or_else(|| "chain".into());
        for (ext, body) in [("csv", &csv), ("json", &json)] {
            let p = dir.join(format!("{stem}.{ext}"));
            write_atomic(&p, body.as_bytes())?;
            eprintln!("wrote {}", p.display());
        }
        for (name, mut fig) in report.figures() {
            fig_opts.apply(&mut fig, junctura::plot::StyleName::Classic);
            for p in junctura::plot::write_figure(&fig, dir, &format!("{stem}_{name}"))? {
                eprintln!("wrote {}", p.display());
            }
        }
    }
    print(args.format, &Item::Chain(&report))
}
