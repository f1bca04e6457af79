//! `junctura map` (two-parameter maps, sharded or whole) and `junctura merge` (join shards).

use super::common::{parse_axis, to_json};
use junctura::export::map::{csv_header, csv_rows, meta, parse_rows, MapMeta};
use junctura::output::{ensure_dir, print_stdout, write_atomic, AtomicFile};
use junctura::scan::{evaluate_lines, shard_lines, summarize_lines, Axis, Cell, MapSpec, Summary};
use junctura::scenario::Scenario;
use junctura::{Error, Result};
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

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
    let xs = parse_axis("--x", &a.x)?;
    let ys = parse_axis("--y", &a.y)?;
    let x = Axis::new(s, &xs.name, xs.lo, xs.hi, xs.n)?;
    let y = Axis::new(s, &ys.name, ys.lo, ys.hi, ys.n)?;
    let rr = a.range.resolve(s)?;
    if let Some(b) = a.beta2 {
        if !b.is_finite() {
            return Err(Error::input(format!("--beta2 {b} is not a finite number")));
        }
    }
    let mut spec = MapSpec::new(s, x, y, a.beta2, rr)?;
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
            let sum = summarize_lines(&s, &spec, lines)?;
            let mut v = serde_json::to_value(sum).unwrap_or_default();
            if let Some(o) = v.as_object_mut() {
                o.insert("provenance".into(), s.provenance().into());
                o.insert("x".into(), spec.x.name.clone().into());
                o.insert("y".into(), spec.y.name.clone().into());
            }
            print_stdout(&to_json(&v));
            Ok(())
        }
        (Some(dir), _) => {
            ensure_dir(dir)?;
            let fig_opts = a.figure.options()?;
            let written = write_map(&s, &spec, lines, shard, dir, &fig_opts)?;
            for p in written {
                eprintln!("wrote {}", p.display());
            }
            Ok(())
        }
    }
}

/// Most cells a map written to files may have (a CSV row is about 100 bytes: 1e9 cells is ~100 GB).
const MAX_FILE_CELLS: u128 = 1_000_000_000;
/// Most points on one axis of a map written to files (a line of cells is held in memory, ~100 bytes a cell).
const MAX_LINE_CELLS: usize = 10_000_000;
/// Most cells a `--summary` map may count (it streams, but 1e12 cells would take days).
const MAX_SUMMARY_CELLS: u128 = 1_000_000_000_000;

/// Refuse maps too large to write (or, for `--summary`, to finish), before any work starts.
fn check_size(spec: &MapSpec, to_files: bool) -> Result<()> {
    let cells = spec.x.n as u128 * spec.y.n as u128;
    let what = format!("--x {} points x --y {} points = {cells} cells", spec.x.n, spec.y.n);
    if to_files && (cells > MAX_FILE_CELLS || spec.x.n.max(spec.y.n) > MAX_LINE_CELLS) {
        return Err(Error::input(format!(
            "{what}: too many to write to files (at most {MAX_FILE_CELLS} cells, {MAX_LINE_CELLS} on one axis)"
        ))
        .with_hint("use fewer points, or --summary for counts only (it streams and stores no cells)"));
    }
    if !to_files && cells > MAX_SUMMARY_CELLS {
        return Err(Error::input(format!(
            "{what}: too many to count in reasonable time (at most {MAX_SUMMARY_CELLS})"
        ))
        .with_hint("use fewer points; the counts converge long before this resolution"));
    }
    Ok(())
}

/// Evaluate `lines` in chunks, streaming the CSV; returns the files written.
fn write_map(
    s: &Scenario,
    spec: &MapSpec,
    lines: std::ops::Range<usize>,
    shard: Option<(usize, usize)>,
    dir: &Path,
    fig_opts: &junctura::plot::FigureOptions,
) -> Result<Vec<PathBuf>> {
    let stem = match shard {
        Some((k, n)) => format!("map.part-{}-of-{}", k + 1, n),
        None => "map".to_string(),
    };
    let csv_path = dir.join(format!("{stem}.csv"));
    let mut csv = AtomicFile::create(&csv_path)?;
    csv.write(csv_header(s, spec).as_bytes())?;
    let total = lines.len();
    let bar = progress(total as u64);
    let mut summary = Summary::default();
    let mut classes: Vec<Cell> = Vec::new();
    let keep_cells = shard.is_none() && (spec.x.n as u64) * (spec.y.n as u64) <= 4_000_000;
    // Lines per block: about 1% of the map, but never more than ~1e6 cells held at once.
    let chunk = 64.max(total / 100).min((1usize << 20) / spec.line_len().max(1)).max(1);
    let mut start = lines.start;
    while start < lines.end {
        let end = (start + chunk).min(lines.end);
        let block = evaluate_lines(s, spec, start..end)?;
        let mut text = String::new();
        for line in &block {
            csv_rows(line, &mut text);
            for c in line {
                summary.add(c.class, c.energy_bits);
            }
            if keep_cells {
                classes.extend_from_slice(line);
            }
        }
        csv.write(text.as_bytes())?;
        if let Some(b) = &bar {
            b.inc((end - start) as u64);
        }
        start = end;
    }
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    csv.finish()?;
    let m = meta(s, spec, summary, shard);
    let json_path = dir.join(format!("{stem}.json"));
    write_atomic(&json_path, to_json(&m).as_bytes())?;
    let mut written = vec![csv_path, json_path];
    if keep_cells {
        let (lo, hi) = match (spec.x.kind, spec.y.kind) {
            (junctura::scan::AxisKind::Radius, _) => (spec.x.lo, spec.x.hi),
            _ => spec.radius_range,
        };
        let ov = junctura::report::figures::overlays(s, lo, hi);
        let mut fig = junctura::report::figures::map_figure_with(
            junctura::export::map::map_provenance(s, spec),
            spec,
            &classes,
            Some(&ov),
            &s.symbols,
        );
        fig_opts.apply(&mut fig, junctura::plot::StyleName::Classic);
        written.extend(junctura::plot::write_figure(&fig, dir, "map")?);
    }
    Ok(written)
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
}

pub fn run_merge(a: MergeArgs) -> Result<()> {
    let mut metas: Vec<(MapMeta, PathBuf)> = Vec::new();
    for p in &a.parts {
        let text = std::fs::read_to_string(p).map_err(|e| Error::io(p, &e))?;
        let m: MapMeta = serde_json::from_str(&text).map_err(|e| {
            Error::input(format!("{}: not a map part file: {e}", p.display()))
                .with_hint("pass the map.part-K-of-N.json files")
        })?;
        if m.shard.is_none() {
            return Err(Error::input(format!("{}: this is a whole map, not a part", p.display())));
        }
        metas.push((m, p.with_extension("csv")));
    }
    metas.sort_by_key(|(m, _)| m.shard.map(|s| s.0));
    let first = metas[0].0.clone();
    let n = first.shard.map(|s| s.1).unwrap_or(1);
    let got: Vec<usize> = metas.iter().filter_map(|(m, _)| m.shard.map(|s| s.0)).collect();
    if got != (0..n).collect::<Vec<_>>() {
        let have: Vec<String> = got.iter().map(|k| (k + 1).to_string()).collect();
        return Err(Error::input(format!("merge needs all {n} parts exactly once; got parts {}", have.join(", ")))
            .with_hint("run the missing shards with map --shard K/N"));
    }
    for (m, p) in &metas {
        if m.csv_header != first.csv_header
            || m.scenario_sha256 != first.scenario_sha256
            || m.shard.map(|s| s.1) != Some(n)
        {
            return Err(Error::input(format!(
                "{}: belongs to a different map (scenario, parameters, axes or shard count differ)",
                p.display()
            )));
        }
    }
    ensure_dir(&a.out)?;
    let csv_path = a.out.join("map.csv");
    let mut csv = AtomicFile::create(&csv_path)?;
    csv.write(first.csv_header.as_bytes())?;
    let mut total = Summary::default();
    let mut cells = Vec::new();
    for (m, p) in &metas {
        let text = std::fs::read_to_string(p).map_err(|e| Error::io(p, &e))?;
        let body = text
            .strip_prefix(first.csv_header.as_str())
            .ok_or_else(|| Error::input(format!("{}: its header differs from the part metadata", p.display())))?;
        csv.write(body.as_bytes())?;
        total = total.merge(&m.summary);
        if cells.len() < 4_000_000 {
            cells.extend(parse_rows(body, &p.display().to_string())?);
        }
    }
    csv.finish()?;
    let mut m = first.clone();
    m.shard = None;
    m.summary = total;
    write_atomic(&a.out.join("map.json"), to_json(&m).as_bytes())?;
    eprintln!("wrote {}", csv_path.display());
    eprintln!("wrote {}", a.out.join("map.json").display());
    let spec: MapSpec = spec_from_meta(&m)?;
    if (spec.x.n as u64) * (spec.y.n as u64) <= 4_000_000 {
        for p in junctura::plot::write_figure(
            &junctura::report::figures::map_figure(m.provenance.clone(), &spec, &cells),
            &a.out,
            "map",
        )? {
            eprintln!("wrote {}", p.display());
        }
    }
    Ok(())
}

fn spec_from_meta(m: &MapMeta) -> Result<MapSpec> {
    serde_json::from_value(m.spec.clone()).map_err(|e| Error::input(format!("map metadata: {e}")))
}
