//! Map files: the CSV header and JSON metadata of a map or of one shard, and reading parts back for `merge`
//! (row count, content hash, grid indices). The data rows are written by `csv::map_rows`.

use super::csv::Table;
use super::num;
use crate::error::{Error, Result};
use crate::scan::cell::MAX_ROOTS;
use crate::scan::grid::Beta2Source;
use crate::scan::{Cell, CellClass, MapSpec, Summary};
use crate::scenario::Scenario;
use serde::{Deserialize, Serialize};

fn unit(kind: crate::scan::AxisKind) -> &'static str {
    match kind {
        crate::scan::AxisKind::Radius => "M",
        crate::scan::AxisKind::Beta2 => "1",
        crate::scan::AxisKind::Param(_) => "param",
    }
}

/// The provenance line of a map: the scenario's, with each parameter that is a map axis given as its axis
/// range instead of the scenario's fixed value.
pub fn map_provenance(s: &Scenario, spec: &MapSpec) -> String {
    let params: Vec<String> = s
        .params
        .names()
        .iter()
        .zip(s.params.values())
        .map(|(n, v)| {
            let axis = [&spec.x, &spec.y].into_iter().find(|a| a.kind != crate::scan::AxisKind::Radius && &a.name == n);
            match axis {
                Some(a) => format!("{n}={}..{} (map axis)", num(a.lo), num(a.hi)),
                None => format!("{n}={v}"),
            }
        })
        .collect();
    s.provenance().replace(&s.params.describe(), &params.join(", "))
}

/// Where beta^2 comes from, in words.
fn beta2_words(spec: &MapSpec) -> String {
    match spec.beta2 {
        Beta2Source::Axis => "the beta2 axis".into(),
        Beta2Source::Fixed(b) => format!("fixed at {}", num(b)),
        Beta2Source::Law => "the law's slope P'(sigma0) at each radius".into(),
        Beta2Source::StaticRadii => format!(
            "the law at each static radius; a cell with several static radii takes the class of {} (root rule {}), every radius is listed in radius_1..radius_{}",
            crate::report::figures::root_rule_text(spec.root_rule),
            spec.root_rule.name(),
            MAX_ROOTS
        ),
    }
}

/// Comment lines (provenance) and the header line of a map CSV (the rows: `csv::map_rows`).
pub fn csv_header(s: &Scenario, spec: &MapSpec) -> String {
    let radius = if spec.x.kind == crate::scan::AxisKind::Radius || spec.y.kind == crate::scan::AxisKind::Radius {
        "static_radius"
    } else {
        "decisive_radius"
    };
    let mut head = vec![
        "ix".to_string(),
        "iy".into(),
        format!("{} [{}]", spec.x.name, unit(spec.x.kind)),
        format!("{} [{}]", spec.y.name, unit(spec.y.kind)),
        format!("{radius} [M]"),
    ];
    for h in [
        "sigma [1/M]",
        "pressure [1/M]",
        "beta2_used [1]",
        "potential_second_derivative [1/M^2]",
        "beta2_critical [1]",
        "class",
        "null",
        "weak",
        "strong",
        "dominant",
        "n_static",
    ] {
        head.push(h.into());
    }
    for k in 1..=MAX_ROOTS {
        head.push(format!("radius_{k} [M]"));
        head.push(format!("class_{k}"));
    }
    let mut t = Table::new();
    t.comment(&map_provenance(s, spec));
    t.comment(&format!(
        "map {} {}..{} ({} points) x {} {}..{} ({} points); beta2 from {}; empty fields: not defined for the cell's class",
        spec.x.name,
        num(spec.x.lo),
        num(spec.x.hi),
        spec.x.n,
        spec.y.name,
        num(spec.y.lo),
        num(spec.y.hi),
        spec.y.n,
        beta2_words(spec),
    ));
    t.header(&head);
    t.finish()
}

/// Parse the data rows of a map CSV (comment and header lines skipped) back into cells.
pub fn parse_rows(text: &str, file: &str) -> Result<Vec<Cell>> {
    let mut cells = Vec::new();
    for (ln, line) in text.lines().enumerate() {
        if line.starts_with('#') || line.starts_with("ix,") || line.is_empty() {
            continue;
        }
        let f: Vec<&str> = line.split(',').collect();
        let bad = || {
            Error::input(format!("{file}:{}: not a map data row", ln + 1)).with_hint_phrase(crate::phrase![
                "merge takes the part files written by map ",
                crate::RequestField::Shard
            ])
        };
        if f.len() != 16 + 2 * MAX_ROOTS {
            return Err(bad());
        }
        let num = |s: &str| -> Result<f64> {
            if s.is_empty() {
                Ok(f64::NAN)
            } else {
                // The writer never writes a non-finite number (README "Outputs"): NaN or inf means tampering.
                s.parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(bad)
            }
        };
        let class = CellClass::ALL.iter().copied().find(|c| c.name() == f[10]).ok_or_else(bad)?;
        let bit = |s: &str, v: u8| if s == "true" { v } else { 0 };
        cells.push(Cell {
            ix: f[0].parse().map_err(|_| bad())?,
            iy: f[1].parse().map_err(|_| bad())?,
            x: num(f[2])?,
            y: num(f[3])?,
            radius: num(f[4])?,
            sigma: num(f[5])?,
            pressure: num(f[6])?,
            beta2: num(f[7])?,
            v2: num(f[8])?,
            beta2_critical: num(f[9])?,
            class,
            energy_bits: bit(f[11], 1) | bit(f[12], 2) | bit(f[13], 4) | bit(f[14], 8),
            n_static: f[15].parse().map_err(|_| bad())?,
            roots: {
                let mut r = [f64::NAN; MAX_ROOTS];
                for (k, v) in r.iter_mut().enumerate() {
                    *v = num(f[16 + 2 * k])?;
                }
                r
            },
            root_classes: {
                let mut r = [CellClass::NoStatic as u8; MAX_ROOTS];
                for (k, v) in r.iter_mut().enumerate() {
                    let name = f[17 + 2 * k];
                    if !name.is_empty() {
                        *v = CellClass::ALL.iter().copied().find(|c| c.name() == name).ok_or_else(bad)? as u8;
                    }
                }
                r
            },
        });
    }
    Ok(cells)
}

/// The metadata written beside the data (map.json) and in each part file.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct MapMeta {
    /// Tool version.
    pub version: String,
    /// Scenario name.
    pub scenario: String,
    /// SHA-256 of the scenario text.
    pub scenario_sha256: String,
    /// Provenance line.
    pub provenance: String,
    /// Parameter names and values.
    pub parameters: Vec<(String, f64)>,
    /// The map's axes and beta^2 source, as JSON.
    pub spec: serde_json::Value,
    /// Total number of lines of the full map.
    pub lines: usize,
    /// Shard index and count (absent in a full map).
    #[serde(skip_serializing_if = "Option::is_none", default)]
    pub shard: Option<(usize, usize)>,
    /// Counts.
    pub summary: Summary,
    /// The exact CSV header, so merged files match unsharded ones byte for byte.
    pub csv_header: String,
    /// Number of data rows after the header (one per cell of the file's lines).
    #[serde(default)]
    pub data_rows: u64,
    /// Hex SHA-256 of the CSV data rows (the bytes after the header), checked by `merge`.
    #[serde(default)]
    pub data_sha256: String,
    /// The scenario file's text (its SHA-256 is `scenario_sha256`), so `merge` draws the figure of the whole run.
    #[serde(default)]
    pub scenario_text: String,
    /// Why a whole map has no figure (too many cells), if it has none.
    #[serde(skip_serializing_if = "Option::is_none", default)]
    pub figure_note: Option<String>,
}

/// Row count and SHA-256 of CSV data rows, accumulated as they are written.
#[derive(Debug, Clone, Default)]
pub struct DataDigest {
    rows: u64,
    hash: sha2::Sha256,
}

impl DataDigest {
    /// Add data rows (whole lines).
    pub fn add(&mut self, rows: &str) {
        use sha2::Digest;
        self.rows += rows.bytes().filter(|&b| b == b'\n').count() as u64;
        self.hash.update(rows.as_bytes());
    }

    /// (rows, hex SHA-256).
    pub fn finish(self) -> (u64, String) {
        use sha2::Digest;
        (self.rows, format!("{:x}", self.hash.finalize()))
    }
}

/// The hint for a part whose rows or counts do not match its metadata: compute the shard again.
pub fn rerun_shard_hint() -> crate::error::Phrase {
    crate::phrase!["run this shard again with map ", crate::RequestField::Shard, " K/N; part files must not be edited"]
}

/// Check the data rows `body` of a map part against its metadata and the map: the row count and SHA-256
/// written with the part, and the grid indices (ix, iy) of every row, which must be exactly the cells of the
/// part's lines in order (`lines`); every number must be finite. Returns the parsed cells.
pub fn verify_part(
    m: &MapMeta,
    spec: &MapSpec,
    lines: std::ops::Range<usize>,
    body: &str,
    file: &str,
) -> Result<Vec<Cell>> {
    let hint = rerun_shard_hint();
    if m.data_sha256.is_empty() {
        return Err(Error::input(format!(
            "{file}: the part metadata has no content hash (an older junctura wrote it)"
        ))
        .with_hint_phrase(hint.clone()));
    }
    let mut d = DataDigest::default();
    d.add(body);
    let (rows, sha) = d.finish();
    let expected = (lines.len() * spec.line_len()) as u64;
    if rows != m.data_rows || rows != expected || !(body.is_empty() || body.ends_with('\n')) {
        return Err(Error::input(format!(
            "{file}: {rows} data rows, but the part metadata says {} and its lines {}..{} hold {expected} cells \
             (truncated, extended or from another map)",
            m.data_rows, lines.start, lines.end
        ))
        .with_hint_phrase(hint.clone()));
    }
    if sha != m.data_sha256 {
        return Err(Error::input(format!(
            "{file}: the data rows do not match the SHA-256 in the part metadata (the file was changed or swapped)"
        ))
        .with_hint_phrase(hint.clone()));
    }
    let cells = parse_rows(body, file)?;
    if cells.len() as u64 != expected {
        return Err(Error::input(format!("{file}: {} map rows, expected {expected}", cells.len()))
            .with_hint_phrase(hint.clone()));
    }
    let mut k = 0;
    for line in lines.clone() {
        for j in 0..spec.line_len() {
            let (ix, iy) = spec.cell_index(line, j);
            let c = &cells[k];
            if (c.ix as usize, c.iy as usize) != (ix, iy) {
                return Err(Error::input(format!(
                    "{file}: data row {} is cell ({}, {}), expected ({ix}, {iy}) (rows reordered or from another part)",
                    k + 1,
                    c.ix,
                    c.iy
                ))
                .with_hint_phrase(hint.clone()));
            }
            k += 1;
        }
    }
    Ok(cells)
}

/// Build the metadata.
pub fn meta(s: &Scenario, spec: &MapSpec, summary: Summary, shard: Option<(usize, usize)>) -> MapMeta {
    meta_with_data(s, spec, summary, shard, DataDigest::default())
}

/// The metadata of a map whose CSV data rows went through `data` (row count and SHA-256, checked by `merge`).
pub fn meta_with_data(
    s: &Scenario,
    spec: &MapSpec,
    summary: Summary,
    shard: Option<(usize, usize)>,
    data: DataDigest,
) -> MapMeta {
    let (data_rows, data_sha256) = data.finish();
    MapMeta {
        version: env!("CARGO_PKG_VERSION").to_string(),
        scenario: s.name.clone(),
        scenario_sha256: s.origin.hash.clone(),
        provenance: map_provenance(s, spec),
        parameters: s.params.names().iter().cloned().zip(s.params.values().iter().copied()).collect(),
        spec: serde_json::to_value(spec).unwrap_or(serde_json::Value::Null),
        lines: spec.n_lines(),
        shard,
        summary,
        csv_header: csv_header(s, spec),
        data_rows,
        data_sha256,
        scenario_text: s.origin.text.clone(),
        figure_note: None,
    }
}
