//! `junctura map` (two-parameter maps, sharded or whole) and `junctura merge` (join shards).

use junctura::export::json::pretty;
use junctura::export::map::{verify_part, DataDigest, MapMeta};
use junctura::files::write_map;
use junctura::output::{ensure_dir, print_stdout, write_atomic, AtomicFile};
use junctura::report::map::{check_size, map_spec, map_summary};
use junctura::scan::{shard_lines, MapSpec, Summary};
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
            for p in written {
                eprintln!("wrote {}", p.display());
            }
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
    let mut metas: Vec<(MapMeta, PathBuf)> = Vec::new();
    for p in &a.parts {
        let text = junctura::input::read_text(p, "map part file", junctura::input::MAX_TEXT_FILE)?;
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
            || m.parameters != first.parameters
            || m.spec != first.spec
            || m.shard.map(|s| s.1) != Some(n)
        {
            return Err(Error::input(format!(
                "{}: belongs to a different map (scenario, parameters, axes or shard count differ)",
                p.display()
            )));
        }
    }
    // Verify every part (row count, content hash, grid indices, finite numbers, counts) before writing anything.
    let spec: MapSpec = spec_from_meta(&first)?;
    if spec.n_lines() != first.lines {
        return Err(Error::input(format!("{}: its axes do not give its {} lines", metas[0].1.display(), first.lines)));
    }
    let keep = (spec.x.n as u64) * (spec.y.n as u64) <= junctura::report::map::MAX_KEPT_CELLS;
    let fig_opts = a.figure.options()?;
    let scenario = part_scenario(&first, &metas[0].1)?;
    let mut total = Summary::default();
    let mut cells = Vec::new();
    let mut digests = Vec::new();
    for (m, p) in &metas {
        let (k, _) = m.shard.unwrap_or((0, 1));
        let label = p.display().to_string();
        let body = read_part_body(p, &first.csv_header)?;
        let part = verify_part(m, &spec, shard_lines(spec.n_lines(), k, n), &body, &label)?;
        let mut counted = Summary::default();
        for c in &part {
            counted.add(c.class, c.energy_bits);
        }
        if counted != m.summary {
            return Err(Error::input(format!("{label}: the counts in the part metadata do not match its rows"))
                .with_hint("run this shard again with map --shard K/N; part files must not be edited"));
        }
        total = total.merge(&counted);
        if keep {
            cells.extend(part);
        }
        digests.push(m.data_sha256.clone());
    }
    ensure_dir(&a.out)?;
    let csv_path = a.out.join("map.csv");
    let mut csv = AtomicFile::create(&csv_path)?;
    csv.write(first.csv_header.as_bytes())?;
    let mut whole = DataDigest::default();
    for ((_, p), sha) in metas.iter().zip(&digests) {
        // Read again to write; a file changed since it was verified is refused (the temporary file is removed).
        let body = read_part_body(p, &first.csv_header)?;
        let mut d = DataDigest::default();
        d.add(&body);
        if &d.finish().1 != sha {
            return Err(Error::input(format!("{}: changed while merging", p.display())));
        }
        whole.add(&body);
        csv.write(body.as_bytes())?;
    }
    csv.finish()?;
    let mut m = first.clone();
    m.shard = None;
    m.summary = total;
    (m.data_rows, m.data_sha256) = whole.finish();
    if !keep {
        let note = junctura::report::map::no_figure_note(&spec);
        junctura::output::warn(&note);
        m.figure_note = Some(note);
    }
    write_atomic(&a.out.join("map.json"), pretty(&m).as_bytes())?;
    eprintln!("wrote {}", csv_path.display());
    eprintln!("wrote {}", a.out.join("map.json").display());
    if keep {
        let fig = junctura::report::map::map_file_figure(&scenario, &spec, &cells, m.provenance.clone(), &fig_opts);
        for p in junctura::plot::write_figure(&fig, &a.out, "map")? {
            eprintln!("wrote {}", p.display());
        }
    }
    Ok(())
}

/// The scenario a part was computed from (its text is in the part metadata, checked against its SHA-256), with
/// the part's parameter values.
fn part_scenario(m: &MapMeta, p: &std::path::Path) -> Result<Scenario> {
    use sha2::Digest;
    let hint = "run the shards again with this version of junctura (map --shard K/N)";
    if m.scenario_text.is_empty() {
        return Err(Error::input(format!(
            "{}: the part metadata has no scenario text (an older junctura wrote it)",
            p.display()
        ))
        .with_hint(hint));
    }
    if format!("{:x}", sha2::Sha256::digest(m.scenario_text.as_bytes())) != m.scenario_sha256 {
        return Err(
            Error::input(format!("{}: the scenario text does not match its SHA-256", p.display())).with_hint(hint)
        );
    }
    let mut s = Scenario::parse(&m.scenario_text, None).map_err(|e| e.context(p.display()))?;
    for (name, v) in &m.parameters {
        s.params.set(name, *v).map_err(|e| e.context(p.display()))?;
    }
    Ok(s)
}

/// The data rows of a part CSV (the text after its header, which must be the map's header).
fn read_part_body(p: &std::path::Path, header: &str) -> Result<String> {
    // Part data can be large (one row per cell): no size limit beyond memory, but only a regular UTF-8 file.
    let text = junctura::input::read_text(p, "map part data file", u64::MAX >> 1)?;
    text.strip_prefix(header)
        .map(str::to_string)
        .ok_or_else(|| Error::input(format!("{}: its header differs from the part metadata", p.display())))
}

fn spec_from_meta(m: &MapMeta) -> Result<MapSpec> {
    serde_json::from_value(m.spec.clone()).map_err(|e| Error::input(format!("map metadata: {e}")))
}
