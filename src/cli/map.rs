//! `junctura map` (two-parameter maps, sharded or whole) and `junctura merge` (join shards).

use junctura::export::json::pretty;
use junctura::files::{merge_parts, write_map};
use junctura::output::{ensure_dir, print_stdout};
use junctura::report::map::{check_size, map_spec, map_summary};
use junctura::scan::{shard_lines, MapSpec};
use junctura::scenario::Scenario;
use junctura::{Error, Result};
use std::io::IsTerminal;
use std::path::PathBuf;

/// Arguments of `map`.
#[derive(clap::Args, Debug)]
pub struct MapArgs {
    #[command(flatten)]
    scenario: super::common::ScenarioArgs,
    /// Horizontal axis AXIS:LO:HI:N (AXIS = radius, beta2 or a parameter name).
    #[arg(long, allow_hyphen_values = true)]
    x: String,
    /// Vertical axis AXIS:LO:HI:N.
    #[arg(long, allow_hyphen_values = true)]
    y: String,
    /// A fixed beta^2 when it is not an axis (default: the law's slope P'(sigma0) if the scenario has a law).
    #[arg(long, allow_hyphen_values = true)]
    beta2: Option<f64>,
    /// Radius range searched for static radii when no axis is the radius.
    #[command(flatten)]
    range: super::common::RangeArgs,
    /// Write the data and figure to this folder.
    #[arg(long)]
    out: Option<PathBuf>,
    /// Print only counts as one JSON object; write no files.
    #[arg(long, conflicts_with = "out")]
    summary: bool,
    /// Compute only shard K of N (K = 1..N) and write a part file (needs --out); join parts with `merge`.
    #[arg(long)]
    shard: Option<String>,
    /// Maps over two parameters: which static radius gives a cell its class when there are several:
    /// any-stable (the stable one if any; default), smallest or largest. map.csv lists every radius.
    #[arg(long, default_value = "any-stable")]
    root_rule: String,
    #[command(flatten)]
    figure: super::common::FigureArgs,
}

fn parse_shard(s: &str) -> Result<(usize, usize)> {
    let bad = || Error::input(format!("--shard {s}: expected K/N with 1 <= K <= N")).with_hint("e.g. --shard 3/16");
    let (k, n) = s.split_once('/').ok_or_else(bad)?;
    let k: usize = k.trim().parse().map_err(|_| bad())?;
    let n: usize = n.trim().parse().map_err(|_| bad())?;
    if k == 0 || n == 0 || k > n {
        return Err(bad());
    }
    Ok((k - 1, n))
}

fn build_spec(s: &Scenario, a: &MapArgs) -> Result<MapSpec> {
    let mut spec = map_spec(s, &a.x, &a.y, a.beta2, a.range.from, a.range.to)?;
    spec.root_rule = junctura::scan::RootRule::parse(&a.root_rule).ok_or_else(|| {
        Error::input(format!("--root-rule {}: unknown rule", a.root_rule))
            .with_hint("use any-stable, smallest or largest")
    })?;
    Ok(spec)
}

pub fn run(a: MapArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let spec = build_spec(&s, &a)?;
    let shard = a.shard.as_deref().map(parse_shard).transpose()?;
    check_size(&spec, a.out.is_some())?;
    let lines = match shard {
        Some((k, n)) => shard_lines(spec.n_lines(), k, n),
        None => 0..spec.n_lines(),
    };
    match (&a.out, a.summary) {
        (None, _) => {
            if shard.is_some() && !a.summary {
                return Err(Error::input("--shard needs --out DIR (the part file is written there) or --summary"));
            }
            let v = map_summary(&s, &spec, lines)?;
            print_stdout(&pretty(&v));
            Ok(())
        }
        (Some(dir), _) => {
            ensure_dir(dir)?;
            let fig_opts = a.figure.options()?;
            let bar = progress(lines.len() as u64);
            let written = write_map(&s, &spec, lines, shard, dir, &fig_opts, &|done, _| {
                if let Some(b) = &bar {
                    b.set_position(done as u64);
                }
            })?;
            if let Some(b) = bar {
                b.finish_and_clear();
            }
            report_written(&written.map, &written.written);
            Ok(())
        }
    }
}

fn progress(total: u64) -> Option<indicatif::ProgressBar> {
    if !std::io::stderr().is_terminal() || total < 2 {
        return None;
    }
    let b = indicatif::ProgressBar::new(total);
    b.set_style(
        indicatif::ProgressStyle::with_template("{spinner} map {bar:40} {pos}/{len} lines, {eta} left")
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
    );
    Some(b)
}

/// Arguments of `merge`.
#[derive(clap::Args, Debug)]
pub struct MergeArgs {
    /// Part metadata files written by `map --shard` (map.part-K-of-N.json; the .csv beside each is read too).
    #[arg(required = true)]
    parts: Vec<PathBuf>,
    /// Folder for the merged map.csv / map.json / figure.
    #[arg(long)]
    out: PathBuf,
    /// Figure options: give the ones the shards were run with, to get the unsharded run's figure.
    #[command(flatten)]
    figure: super::common::FigureArgs,
}

pub fn run_merge(a: MergeArgs) -> Result<()> {
    let fig_opts = a.figure.options()?;
    let merged = merge_parts(&a.parts, &a.out, &fig_opts)?;
    report_written(&merged.map, &merged.written);
    Ok(())
}

/// The note of a map without a figure, then the files written (stderr).
fn report_written(map: &junctura::export::map::MapMeta, written: &[std::path::PathBuf]) {
    if let Some(note) = &map.figure_note {
        junctura::output::warn(note);
    }
    for p in written {
        eprintln!("wrote {}", p.display());
    }
}
