//! Two-parameter maps as results: the map's axes ([`map_spec`]), whole maps as cells ([`map_cells`]), counts
//! only ([`map_summary`]) and the figure of a map written to files ([`map_file_figure`]). The cells come from
//! [`crate::scan::evaluate_lines`]; this module only orders and counts them (`files::map` writes them).

use crate::error::{Error, Result};
use crate::metric::default_range;
use crate::request::{parse_axis, range};
use crate::scan::{evaluate_lines, summarize_lines, Axis, Cell, MapSpec};
use crate::scenario::Scenario;

/// Most cells a map written to files may have (a CSV row is about 100 bytes: 1e9 cells is ~100 GB).
pub const MAX_FILE_CELLS: u128 = 1_000_000_000;
/// Most points on one axis of a map written to files (a line of cells is held in memory, ~100 bytes a cell).
pub const MAX_LINE_CELLS: usize = 10_000_000;
/// Most cells a summary-only map may count (it streams, but 1e12 cells would take days).
pub const MAX_SUMMARY_CELLS: u128 = 1_000_000_000_000;
/// Most cells a map keeps in memory for its figure (and for [`map_cells`]).
pub const MAX_KEPT_CELLS: u64 = 4_000_000;

/// The map over axes written `NAME:LO:HI:N` (`x`, `y`: [`parse_axis`]), beta^2 fixed or from the law, static
/// radii searched in `from..to` (default: the scenario's survey range) when no axis is the radius.
pub fn map_spec(
    s: &Scenario,
    x: &str,
    y: &str,
    beta2: Option<f64>,
    from: Option<f64>,
    to: Option<f64>,
) -> Result<MapSpec> {
    let xs = parse_axis(crate::RequestField::X, x)?;
    let ys = parse_axis(crate::RequestField::Y, y)?;
    let x = Axis::new(s, &xs.name, xs.lo, xs.hi, xs.n)?;
    let y = Axis::new(s, &ys.name, ys.lo, ys.hi, ys.n)?;
    let rr = range(from, to, default_range(s))?;
    if let Some(b) = beta2 {
        if !b.is_finite() {
            let message = crate::phrase![crate::RequestField::Beta2, format!(" {b} is not a finite number")];
            return Err(Error::request(crate::ErrorKind::Input, crate::RequestField::Beta2, b, message));
        }
    }
    MapSpec::new(s, x, y, beta2, rr)
}

/// Refuse maps too large to write (`to_files`) or, for counts only, to finish, before any work starts.
pub fn check_size(spec: &MapSpec, to_files: bool) -> Result<()> {
    let cells = spec.x.n as u128 * spec.y.n as u128;
    use crate::{phrase, ErrorKind::Input, RequestField as F};
    let what = phrase![F::X, format!(" {} points x ", spec.x.n), F::Y, format!(" {} points = {cells} cells", spec.y.n)];
    if to_files && (cells > MAX_FILE_CELLS || spec.x.n.max(spec.y.n) > MAX_LINE_CELLS) {
        let why =
            format!(": too many to write to files (at most {MAX_FILE_CELLS} cells, {MAX_LINE_CELLS} on one axis)");
        return Err(Error::phrased(Input, what.then(phrase![why])).with_hint_phrase(phrase![
            "use fewer points, or ",
            F::Summary,
            " for counts only (it streams and stores no cells)"
        ]));
    }
    if !to_files && cells > MAX_SUMMARY_CELLS {
        let why = format!(": too many to count in reasonable time (at most {MAX_SUMMARY_CELLS})");
        return Err(Error::phrased(Input, what.then(phrase![why]))
            .with_hint("use fewer points; the counts converge long before this resolution"));
    }
    Ok(())
}

/// Counts over `lines` of the map as one JSON object: the [`Summary`](crate::scan::Summary) fields plus `provenance`, `x`, `y`.
pub fn map_summary(s: &Scenario, spec: &MapSpec, lines: std::ops::Range<usize>) -> Result<serde_json::Value> {
    let sum = summarize_lines(s, spec, lines)?;
    let mut v = serde_json::to_value(sum).unwrap_or_default();
    if let Some(o) = v.as_object_mut() {
        o.insert("provenance".into(), s.provenance().into());
        o.insert("x".into(), spec.x.name.clone().into());
        o.insert("y".into(), spec.y.name.clone().into());
    }
    Ok(v)
}

/// Every cell of the map, row-major in (iy, ix): cell `iy * x.n + ix`. Refused above [`MAX_KEPT_CELLS`].
/// `progress(done, total)` is called after each block of lines.
pub fn map_cells(s: &Scenario, spec: &MapSpec, progress: &dyn Fn(usize, usize)) -> Result<Vec<Cell>> {
    let n = spec.x.n as u64 * spec.y.n as u64;
    if n > MAX_KEPT_CELLS {
        return Err(Error::input(format!(
            "{} x {} = {n} cells: more than {MAX_KEPT_CELLS} cells to hold in memory",
            spec.x.n, spec.y.n
        ))
        .with_hint("use fewer points, or write the map to files (it streams) or count it (summary)"));
    }
    let mut out = vec![None; n as usize];
    let total = spec.n_lines();
    let chunk = 64.max(total / 100);
    let mut start = 0;
    while start < total {
        let end = (start + chunk).min(total);
        for line in evaluate_lines(s, spec, start..end)? {
            for c in line {
                out[c.iy as usize * spec.x.n + c.ix as usize] = Some(c);
            }
        }
        progress(end, total);
        start = end;
    }
    out.into_iter()
        .collect::<Option<Vec<Cell>>>()
        .ok_or_else(|| Error::numerical("map: a cell was not evaluated (internal ordering error)"))
}

/// The note written (stderr and `figure_note` in map.json) when a map is too large for its figure.
pub fn no_figure_note(spec: &MapSpec) -> String {
    format!(
        "{} x {} = {} cells: more than {MAX_KEPT_CELLS}, so no figure was drawn (map.csv and map.json are complete)",
        spec.x.n,
        spec.y.n,
        spec.x.n as u64 * spec.y.n as u64
    )
}

/// The figure of a map written to files (`map` and `merge` draw the same one): classes, the horizon and
/// photon-orbit overlays of the radius range, the scenario's symbols, the figure options.
pub fn map_file_figure(
    s: &Scenario,
    spec: &MapSpec,
    cells: &[Cell],
    provenance: String,
    fig_opts: &crate::plot::FigureOptions,
) -> crate::plot::Figure {
    let (lo, hi) = match (spec.x.kind, spec.y.kind) {
        (crate::scan::AxisKind::Radius, _) => (spec.x.lo, spec.x.hi),
        _ => spec.radius_range,
    };
    let ov = super::figures::overlays(s, lo, hi);
    let mut fig = super::figures::map_figure_with(provenance, spec, cells, Some(&ov), &s.symbols);
    fig_opts.apply(&mut fig, crate::plot::StyleName::Classic);
    fig
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scan::CellClass;

    fn wormhole() -> Scenario {
        Scenario::parse(
            "name = \"w\"\n[parameters]\nm = 1.0\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n",
            None,
        )
        .unwrap()
    }

    #[test]
    fn map_cells_are_row_major_in_y_then_x() {
        let s = wormhole();
        let spec = map_spec(&s, "radius:2.5:5.5:7", "beta2:-2:1:5", None, None, None).unwrap();
        let cells = map_cells(&s, &spec, &|_, _| {}).unwrap();
        assert_eq!(cells.len(), 35);
        for (k, c) in cells.iter().enumerate() {
            assert_eq!((c.iy as usize, c.ix as usize), (k / 7, k % 7));
            assert_eq!((c.x, c.y), (spec.x.value(c.ix as usize), spec.y.value(c.iy as usize)));
        }
        // Poisson & Visser 1995: beta^2_crit(a = 4M) = -1.75, and above a = 3M the shell is stable below it: at
        // a = 4M (ix = 3) the cell at beta^2 = -2 (iy = 0) is stable, the one at beta^2 = 1 (iy = 4) is not.
        let at = |ix: usize, iy: usize| cells[iy * 7 + ix].class;
        assert_eq!(at(3, 0), CellClass::Stable);
        assert_eq!(at(3, 4), CellClass::Unstable);
        assert!((cells[3].beta2_critical + 1.75).abs() < 1e-12);
    }

    #[test]
    fn oversized_maps_are_refused_before_any_work() {
        let s = wormhole();
        let spec = map_spec(&s, "radius:2.5:6:3000", "beta2:-2:1:3000", None, None, None).unwrap();
        assert!(map_cells(&s, &spec, &|_, _| {}).unwrap_err().message.contains("more than 4000000 cells"));
        assert!(check_size(&spec, true).is_ok());
        assert!(map_spec(&s, "radius:2.5:6:3", "radius:2:3:3", None, None, None).is_err());
    }
}
