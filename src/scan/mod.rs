//! Two-parameter maps of a static shell's properties, evaluated in parallel and streamed line by line.
//!
//! A map has two axes, each `radius`, `beta2` or a parameter name, with grid points including both ends. Cells are
//! evaluated per *line* (one value of the outer axis): when one axis is beta^2 the junction work is done once per
//! point of the other axis and reused for every beta^2, since V''(a0) = c0 + c1 beta^2 exactly (Poisson & Visser
//! 1995). Lines are independent, so they run in parallel (rayon) and can be split into shards.
//!
//! Meaning of a cell:
//! - with a `radius` axis: a static shell at that radius (sigma0, p0 from the junction conditions); beta^2 from the
//!   `beta2` axis, else from `--beta2`, else from the scenario's law as P'(sigma0);
//! - without a `radius` axis: the scenario's law decides; the cell is classified by the static radii it has in
//!   the radius range (stable if any is stable, else unstable/marginal if any, else no static shell).

pub mod cell;
pub mod class;
pub mod fast;
pub mod grid;

pub use cell::{Cell, CellClass, Method, Summary};
pub use grid::{grid_value, Axis, AxisKind, MapSpec, RootRule};

use crate::error::Result;
use crate::scenario::Scenario;
use rayon::prelude::*;

/// Evaluate the lines `lines` of the map (outer-axis indices), in order, in parallel.
pub fn evaluate_lines(s: &Scenario, spec: &MapSpec, lines: std::ops::Range<usize>) -> Result<Vec<Vec<Cell>>> {
    evaluate_lines_with(s, spec, lines, Method::Fast)
}

/// As [`evaluate_lines`] with a chosen method (the generic one is the reference).
pub fn evaluate_lines_with(
    s: &Scenario,
    spec: &MapSpec,
    lines: std::ops::Range<usize>,
    method: Method,
) -> Result<Vec<Vec<Cell>>> {
    let ev = cell::Evaluator::with_method(s, spec, method)?;
    Ok(lines.into_par_iter().map_init(fast::LineScratch::default, |sc, i| ev.line_with(i, sc)).collect())
}

/// Counts over the lines `lines` without storing cells: memory is O(threads x line length), independent of
/// the number of lines. Counts are integers summed per line, so they do not depend on the thread count.
pub fn summarize_lines(s: &Scenario, spec: &MapSpec, lines: std::ops::Range<usize>) -> Result<Summary> {
    summarize_lines_with(s, spec, lines, Method::Fast)
}

/// As [`summarize_lines`] with a chosen method.
pub fn summarize_lines_with(
    s: &Scenario,
    spec: &MapSpec,
    lines: std::ops::Range<usize>,
    method: Method,
) -> Result<Summary> {
    let ev = cell::Evaluator::with_method(s, spec, method)?;
    Ok(lines
        .into_par_iter()
        .fold(
            || (Summary::default(), fast::LineScratch::default()),
            |(mut acc, mut sc), i| {
                ev.line_summary_with(i, &mut acc, &mut sc);
                (acc, sc)
            },
        )
        .map(|(acc, _)| acc)
        .reduce(Summary::default, |a, b| a.merge(&b)))
}

/// The lines of shard `k` of `n` (0-based k): a contiguous block, so parts concatenate in order.
pub fn shard_lines(total: usize, k: usize, n: usize) -> std::ops::Range<usize> {
    (total * k / n)..(total * (k + 1) / n)
}
