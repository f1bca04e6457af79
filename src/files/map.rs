//! The files of a map or of one shard: the CSV streamed in blocks of lines, the JSON metadata beside it and,
//! for whole maps small enough to hold, the figure.

use crate::error::Result;
use crate::export::csv::map_rows;
use crate::export::map::{csv_header, map_provenance, meta_with_data, DataDigest, MapMeta};
use crate::output::{write_atomic, AtomicFile};
use crate::report::map::{map_file_figure, no_figure_note, MAX_KEPT_CELLS};
use crate::scan::{evaluate_lines, Cell, MapSpec, Summary};
use crate::scenario::Scenario;
use serde::Serialize;
use std::path::{Path, PathBuf};

/// What [`write_map`] wrote.
#[derive(Debug, Clone, Serialize)]
pub struct MapFiles {
    /// The metadata as written to the JSON file: scenario, parameters, axes, counts, the data rows and their
    /// SHA-256, and why there is no figure if a whole map has none (`figure_note`, for the caller to show).
    pub map: MapMeta,
    /// The files written, in order: the CSV, the JSON, then the figure files (if any).
    pub written: Vec<PathBuf>,
}

/// Evaluate `lines` in chunks, streaming the CSV (`map.csv`, or `map.part-K-of-N.csv` for a shard), then write
/// the JSON metadata and (whole maps up to [`MAX_KEPT_CELLS`]) the figure.
/// `progress(done, total)` is called after each chunk with the number of lines done.
pub fn write_map(
    s: &Scenario,
    spec: &MapSpec,
    lines: std::ops::Range<usize>,
    shard: Option<(usize, usize)>,
    dir: &Path,
    fig_opts: &crate::plot::FigureOptions,
    progress: &dyn Fn(usize, usize),
) -> Result<MapFiles> {
    let stem = match shard {
        Some((k, n)) => format!("map.part-{}-of-{}", k + 1, n),
        None => "map".to_string(),
    };
    let csv_path = dir.join(format!("{stem}.csv"));
    let mut csv = AtomicFile::create(&csv_path)?;
    csv.write(csv_header(s, spec).as_bytes())?;
    let total = lines.len();
    let mut summary = Summary::default();
    let mut digest = DataDigest::default();
    let mut classes: Vec<Cell> = Vec::new();
    let keep_cells = shard.is_none() && (spec.x.n as u64) * (spec.y.n as u64) <= MAX_KEPT_CELLS;
    // Lines per block: about 1% of the map, but never more than ~1e6 cells held at once.
    let chunk = 64.max(total / 100).min((1usize << 20) / spec.line_len().max(1)).max(1);
    let mut start = lines.start;
    while start < lines.end {
        let end = (start + chunk).min(lines.end);
        let block = evaluate_lines(s, spec, start..end)?;
        let mut text = String::new();
        for line in &block {
            map_rows(line, &mut text);
            for c in line {
                summary.add(c.class, c.energy_bits);
            }
            if keep_cells {
                classes.extend_from_slice(line);
            }
        }
        csv.write(text.as_bytes())?;
        digest.add(&text);
        progress(end - lines.start, total);
        start = end;
    }
    csv.finish()?;
    let mut m = meta_with_data(s, spec, summary, shard, digest);
    if shard.is_none() && !keep_cells {
        m.figure_note = Some(no_figure_note(spec));
    }
    let json_path = dir.join(format!("{stem}.json"));
    let json = serde_json::to_string_pretty(&m).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    write_atomic(&json_path, json.as_bytes())?;
    let mut written = vec![csv_path, json_path];
    if keep_cells {
        let fig = map_file_figure(s, spec, &classes, map_provenance(s, spec), fig_opts);
        written.extend(crate::plot::write_figure(&fig, dir, "map")?);
    }
    Ok(MapFiles { map: m, written })
}
