//! Joining the parts of a sharded map (`map.part-K-of-N.json` + `.csv`, written by [`write_map`] with a
//! shard) into the files of the whole map: `map.csv` and `map.json` byte for byte as an unsharded run writes
//! them, and the figure when the map is small enough to hold.
//!
//! Nothing is written before every part is checked: one map (scenario, parameters, axes, shard count, CSV
//! header), every shard present once, and each part's rows against its metadata (row count, content hash,
//! grid indices, finite numbers, counts; [`verify_part`]). A refused part names the file as the refused value
//! of [`RequestField::Parts`].
//!
//! [`write_map`]: super::write_map

use crate::error::{Error, ErrorKind, Problem, RequestField, Result};
use crate::export::json::pretty;
use crate::export::map::{rerun_shard_hint, verify_part, DataDigest, MapMeta};
use crate::output::{ensure_dir, write_atomic, AtomicFile};
use crate::plot::FigureOptions;
use crate::report::map::{map_file_figure, no_figure_note, MAX_FILE_CELLS, MAX_KEPT_CELLS, MAX_LINE_CELLS};
use crate::scan::{shard_lines, MapSpec, Summary};
use crate::scenario::Scenario;
use serde::Serialize;
use std::path::{Path, PathBuf};

/// What [`merge_parts`] joined and wrote.
#[derive(Debug, Clone, Serialize)]
pub struct Merged {
    /// The part metadata files, in shard order.
    pub parts: Vec<PathBuf>,
    /// The whole map's metadata as written to `map.json`: scenario, parameters, axes, the counts summed over
    /// the parts (`summary`), the data rows and their SHA-256, and why there is no figure if there is none
    /// (`figure_note`, for the caller to show).
    pub map: MapMeta,
    /// The files written, in order: `map.csv`, `map.json`, then the figure files (if any).
    pub written: Vec<PathBuf>,
}

/// A part metadata file as read, with the data file beside it.
struct Part {
    meta: MapMeta,
    json: PathBuf,
    csv: PathBuf,
}

/// `e` with the part file `path` as the refused value, unless it already carries other data (an I/O path,
/// a parse location).
fn blame(e: Error, path: &Path) -> Error {
    if e.kind == ErrorKind::Input && e.problem == Problem::Other {
        e.with_problem(Problem::BadRequest { field: RequestField::Parts, value: path.display().to_string() })
    } else {
        e
    }
}

/// An input error about the part file `path`.
fn refused(path: &Path, message: String) -> Error {
    blame(Error::input(message), path)
}

/// Read one part metadata file; a whole map's metadata is refused.
fn read_part(path: &Path) -> Result<Part> {
    let text = crate::input::read_text(path, "map part file", crate::input::MAX_TEXT_FILE)?;
    let meta: MapMeta = serde_json::from_str(&text).map_err(|e| {
        refused(path, format!("{}: not a map part file: {e}", path.display()))
            .with_hint("pass the map.part-K-of-N.json files")
    })?;
    if meta.shard.is_none() {
        return Err(refused(path, format!("{}: this is a whole map, not a part", path.display())));
    }
    Ok(Part { meta, json: path.to_path_buf(), csv: path.with_extension("csv") })
}

/// Sort the parts by shard and check that they are all `n` shards of one map, each once; returns `n`.
fn check_parts(parts: &mut [Part]) -> Result<usize> {
    parts.sort_by_key(|p| p.meta.shard.map(|s| s.0));
    let first = &parts[0].meta;
    let n = first.shard.map(|s| s.1).unwrap_or(1);
    let got: Vec<usize> = parts.iter().filter_map(|p| p.meta.shard.map(|s| s.0)).collect();
    if got != (0..n).collect::<Vec<_>>() {
        let have: Vec<String> = got.iter().map(|k| (k + 1).to_string()).collect();
        let have = have.join(", ");
        return Err(Error::input(format!("merge needs all {n} parts exactly once; got parts {have}"))
            .with_problem(Problem::BadRequest { field: RequestField::Parts, value: have })
            .with_hint_phrase(crate::phrase!["run the missing shards with map ", RequestField::Shard, " K/N"]));
    }
    for p in parts.iter() {
        let m = &p.meta;
        if m.csv_header != first.csv_header
            || m.scenario_sha256 != first.scenario_sha256
            || m.parameters != first.parameters
            || m.spec != first.spec
            || m.shard.map(|s| s.1) != Some(n)
        {
            return Err(refused(
                &p.json,
                format!(
                    "{}: belongs to a different map (scenario, parameters, axes or shard count differ)",
                    p.json.display()
                ),
            ));
        }
    }
    Ok(n)
}

/// The map's axes from its metadata.
fn spec_from_meta(m: &MapMeta, path: &Path) -> Result<MapSpec> {
    serde_json::from_value(m.spec.clone()).map_err(|e| refused(path, format!("map metadata: {e}")))
}

/// The scenario a part was computed from (its text is in the part metadata, checked against its SHA-256), with
/// the part's parameter values.
fn part_scenario(part: &Part) -> Result<Scenario> {
    use sha2::Digest;
    let (m, p) = (&part.meta, part.csv.as_path());
    let hint =
        || crate::phrase!["run the shards again with this version of junctura (map ", RequestField::Shard, " K/N)"];
    if m.scenario_text.is_empty() {
        return Err(refused(
            &part.json,
            format!("{}: the part metadata has no scenario text (an older junctura wrote it)", p.display()),
        )
        .with_hint_phrase(hint()));
    }
    if format!("{:x}", sha2::Sha256::digest(m.scenario_text.as_bytes())) != m.scenario_sha256 {
        return Err(refused(&part.json, format!("{}: the scenario text does not match its SHA-256", p.display()))
            .with_hint_phrase(hint()));
    }
    let mut s = Scenario::parse(&m.scenario_text, None).map_err(|e| blame(e.context(p.display()), &part.json))?;
    for (name, v) in &m.parameters {
        s.params.set(name, *v).map_err(|e| e.context(p.display()))?;
    }
    Ok(s)
}

/// The data rows of a part CSV (the text after its header, which must be the map's header).
fn read_part_body(part: &Part, header: &str) -> Result<String> {
    let p = part.csv.as_path();
    // Part data can be large (one row per cell): no size limit beyond memory, but only a regular UTF-8 file.
    let text = crate::input::read_text(p, "map part data file", u64::MAX >> 1)?;
    text.strip_prefix(header)
        .map(str::to_string)
        .ok_or_else(|| refused(&part.json, format!("{}: its header differs from the part metadata", p.display())))
}

/// Join the map parts whose metadata files are `parts` (in any order; the `.csv` beside each is read too)
/// into `out`: `map.csv`, `map.json` and, for maps up to [`MAX_KEPT_CELLS`] cells, the figure drawn with
/// `figure` (the options the shards were run with give the unsharded run's figure). Every part is checked
/// before anything is written; a part file changed while merging is refused and its temporary output removed.
pub fn merge_parts(parts: &[PathBuf], out: &Path, figure: &FigureOptions) -> Result<Merged> {
    if parts.is_empty() {
        return Err(Error::request(
            ErrorKind::Input,
            RequestField::Parts,
            "",
            crate::phrase!["no map ", RequestField::Parts, " to merge"],
        ));
    }
    let mut read = parts.iter().map(|p| read_part(p)).collect::<Result<Vec<Part>>>()?;
    let n = check_parts(&mut read)?;
    let first = read[0].meta.clone();
    // Verify every part (row count, content hash, grid indices, finite numbers, counts) before writing anything.
    let spec = spec_from_meta(&first, &read[0].json)?;
    if spec.n_lines() != first.lines {
        return Err(refused(
            &read[0].json,
            format!("{}: its axes do not give its {} lines", read[0].csv.display(), first.lines),
        ));
    }
    // No map writes more to files (`report::map::check_size`): larger axes are tampered, and would overflow
    // the counts of rows below.
    let cells = spec.x.n as u128 * spec.y.n as u128;
    if cells > MAX_FILE_CELLS || spec.x.n.max(spec.y.n) > MAX_LINE_CELLS {
        return Err(refused(
            &read[0].json,
            format!(
                "{}: its axes give {cells} cells, more than a map writes to files (at most {MAX_FILE_CELLS} \
                 cells, {MAX_LINE_CELLS} on one axis)",
                read[0].csv.display()
            ),
        )
        .with_hint_phrase(rerun_shard_hint()));
    }
    let keep = cells <= MAX_KEPT_CELLS as u128;
    let scenario = part_scenario(&read[0])?;
    let mut total = Summary::default();
    let mut cells = Vec::new();
    for p in &read {
        let (k, _) = p.meta.shard.unwrap_or((0, 1));
        let label = p.csv.display().to_string();
        let body = read_part_body(p, &first.csv_header)?;
        let part = verify_part(&p.meta, &spec, shard_lines(spec.n_lines(), k, n), &body, &label)
            .map_err(|e| blame(e, &p.json))?;
        let mut counted = Summary::default();
        for c in &part {
            counted.add(c.class, c.energy_bits);
        }
        if counted != p.meta.summary {
            return Err(refused(&p.json, format!("{label}: the counts in the part metadata do not match its rows"))
                .with_hint_phrase(rerun_shard_hint()));
        }
        total = total.merge(&counted);
        if keep {
            cells.extend(part);
        }
    }
    ensure_dir(out)?;
    let csv_path = out.join("map.csv");
    let mut csv = AtomicFile::create(&csv_path)?;
    csv.write(first.csv_header.as_bytes())?;
    let mut whole = DataDigest::default();
    for p in &read {
        // Read again to write; a file changed since it was verified is refused (the temporary file is removed).
        let body = read_part_body(p, &first.csv_header)?;
        let mut d = DataDigest::default();
        d.add(&body);
        if d.finish().1 != p.meta.data_sha256 {
            return Err(refused(&p.json, format!("{}: changed while merging", p.csv.display())));
        }
        whole.add(&body);
        csv.write(body.as_bytes())?;
    }
    csv.finish()?;
    let mut m = first;
    m.shard = None;
    m.summary = total;
    (m.data_rows, m.data_sha256) = whole.finish();
    if !keep {
        m.figure_note = Some(no_figure_note(&spec));
    }
    let json_path = out.join("map.json");
    write_atomic(&json_path, pretty(&m).as_bytes())?;
    let mut written = vec![csv_path, json_path];
    if keep {
        let fig = map_file_figure(&scenario, &spec, &cells, m.provenance.clone(), figure);
        written.extend(crate::plot::write_figure(&fig, out, "map")?);
    }
    Ok(Merged { parts: read.into_iter().map(|p| p.json).collect(), map: m, written })
}
