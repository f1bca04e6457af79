//! `junctura chain`: iterate the crossing map over a chain of shells and report the orbit after each crossing.

use super::common::to_json;
use clap::ValueEnum;
use junctura::geodesic::{chain, Chain, ChainReport, ChainRequest};
use junctura::output::{ensure_dir, print_stdout, warn, write_atomic};
use junctura::Result;
use std::path::PathBuf;

/// Output format of `chain`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ChainFormat {
    /// Readable table.
    Text,
    /// One JSON object.
    Json,
    /// CSV table (provenance comment, header with units).
    Csv,
}

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
    #[arg(long, value_enum, default_value_t = ChainFormat::Text)]
    format: ChainFormat,
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
    let csv = report.csv();
    let json = to_json(&report);
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
    match args.format {
        ChainFormat::Json => print_stdout(&json),
        ChainFormat::Csv => junctura::output::print_csv(&csv)?,
        ChainFormat::Text => print_stdout(&text(&report, report.unit.is_some())),
    }
    Ok(())
}

fn e(v: Option<f64>) -> String {
    v.map(|x| format!("{x:.6e}")).unwrap_or_else(|| "-".into())
}

fn text(r: &ChainReport, si: bool) -> String {
    let mut o = format!("chain: {}\n{}\n", junctura::text::one_line(&r.chain), junctura::text::one_line(&r.provenance));
    if let Some(l) = r.length_unit_m {
        o.push_str(&format!("lengths in units of G M/c^2 = {l:.9e} m (and in m)\n"));
    }
    o.push_str(&format!(
        "\n{:>6} {:>5} {:>13} {:>13} {:>13} {:>13}",
        "cross", "stage", "E_plus", "r_max-r_h", "proper", "Lorentz"
    ));
    if si {
        o.push_str(&format!(" {:>13} {:>13}", "r_max-r_h[m]", "proper[m]"));
    }
    o.push('\n');
    for row in &r.rows {
        let a = row.row.apex;
        o.push_str(&format!(
            "{:>6} {:>5} {:>13} {:>13} {:>13} {:>13}",
            row.row.crossing,
            row.row.stage,
            e(row.row.energy_plus),
            e(a.and_then(|a| a.areal_distance)),
            e(a.and_then(|a| a.proper_distance)),
            e(row.row.relative_lorentz_factor)
        ));
        if si {
            o.push_str(&format!(" {:>13} {:>13}", e(row.areal_distance_m), e(row.proper_distance_m)));
        }
        if row.row.status != "bounded" {
            o.push_str(&format!("  {}", row.row.status));
        }
        o.push('\n');
    }
    if let Some(t) = r.threshold {
        let tm = r.threshold_m.map(|m| format!(" = {m:.6e} m")).unwrap_or_default();
        let say = |v: Option<usize>| {
            v.map(|k| format!("after crossing {k}")).unwrap_or_else(|| "not within these crossings".into())
        };
        o.push_str(&format!(
            "\nwithin {t:.6e} M{tm} of the horizon: areal {}, proper {}\n",
            say(r.first_within_areal),
            say(r.first_within_proper)
        ));
    }
    o
}
