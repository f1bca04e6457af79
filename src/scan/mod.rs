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
pub mod grid;

pub use cell::{Cell, CellClass, Summary};
pub use grid::{Axis, AxisKind, MapSpec};

use crate::error::Result;
use crate::scenario::Scenario;
use rayon::prelude::*;

/// Evaluate the lines `lines` of the map (outer-axis indices), in order, in parallel.
pub fn evaluate_lines(s: &Scenario, spec: &MapSpec, lines: std::ops::Range<usize>) -> Result<Vec<Vec<Cell>>> {
    let ev = cell::Evaluator::new(s, spec)?;
    Ok(lines.into_par_iter().map(|i| ev.line(i)).collect())
}

/// Counts over the lines `lines` without storing cells (memory independent of the number of cells).
pub fn summarize_lines(s: &Scenario, spec: &MapSpec, lines: std::ops::Range<usize>) -> Result<Summary> {
    let ev = cell::Evaluator::new(s, spec)?;
    Ok(lines
        .into_par_iter()
        .fold(Summary::default, |mut acc, i| {
            ev.line_summary(i, &mut acc);
            acc
        })
        .reduce(Summary::default, |a, b| a.merge(&b)))
}

/// The lines of shard `k` of `n` (0-based k): a contiguous block, so parts concatenate in order.
pub fn shard_lines(total: usize, k: usize, n: usize) -> std::ops::Range<usize> {
    (total * k / n)..(total * (k + 1) / n)
}
