//! Where the report's figures look: the radius range of a static timelike shell (`files::report` writes the
//! report folder).

use crate::scenario::Scenario;
use crate::statics::{r_region_intervals, StaticsOptions};

/// A radius range where a static timelike shell can sit, for plots: the outermost interval where both sides
/// are R-regions within the default survey range, its upper end clipped to a few times the length scale.
pub fn plot_range(s: &Scenario) -> Option<(f64, f64)> {
    let (lo, hi) = crate::metric::default_range(s);
    let (ivs, _) = r_region_intervals(&s.model, s.params.values(), lo, hi, &StaticsOptions::default());
    let l = crate::metric::length_scale(s);
    // Prefer the interval that contains most of [L, 12 L]; fall back to the last one.
    let iv =
        ivs.iter().max_by(|a, b| overlap(a.from, a.to, l, 12.0 * l).total_cmp(&overlap(b.from, b.to, l, 12.0 * l)))?;
    let from = iv.from * (1.0 + 1e-3);
    let to = (iv.to * (1.0 - 1e-3)).min((from * 6.0).max(12.0 * l));
    (to > from).then_some((from, to))
}

fn overlap(a0: f64, a1: f64, b0: f64, b1: f64) -> f64 {
    (a1.min(b1) - a0.max(b0)).max(0.0) + if a1 > b0 { 1e-9 } else { 0.0 }
}
