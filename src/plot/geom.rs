//! Plane geometry for figures: splitting curves at gaps (NaN), clipping polylines and polygons to the plot
//! window, cutting paths into dash patterns in device units, and picking axis ranges from the data.
//! Everything here is pure and works in plain `f64` pairs.

/// A rectangle `[x0, x1] x [y0, y1]` with `x0 < x1`, `y0 < y1`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Window {
    pub x0: f64,
    pub x1: f64,
    pub y0: f64,
    pub y1: f64,
}

/// Split a curve into runs of consecutive finite points: a non-finite x or y ends a run, so no segment is
/// ever drawn across a gap. Runs with fewer than two points are kept (a lone point can still be marked).
pub(crate) fn split_finite(points: &[(f64, f64)]) -> Vec<Vec<(f64, f64)>> {
    let mut runs = Vec::new();
    let mut cur: Vec<(f64, f64)> = Vec::new();
    for &(x, y) in points {
        if x.is_finite() && y.is_finite() {
            cur.push((x, y));
        } else if !cur.is_empty() {
            runs.push(std::mem::take(&mut cur));
        }
    }
    if !cur.is_empty() {
        runs.push(cur);
    }
    runs
}

/// Clip the segment p-q to the window (Liang-Barsky parametric clipping, common practice).
/// Returns the visible part or None.
fn clip_segment(p: (f64, f64), q: (f64, f64), w: &Window) -> Option<((f64, f64), (f64, f64))> {
    let (dx, dy) = (q.0 - p.0, q.1 - p.1);
    let mut t0 = 0.0_f64;
    let mut t1 = 1.0_f64;
    for (pk, qk) in [(-dx, p.0 - w.x0), (dx, w.x1 - p.0), (-dy, p.1 - w.y0), (dy, w.y1 - p.1)] {
        if pk == 0.0 {
            if qk < 0.0 {
                return None;
            }
        } else {
            let r = qk / pk;
            if pk < 0.0 {
                t0 = t0.max(r);
            } else {
                t1 = t1.min(r);
            }
            if t0 > t1 {
                return None;
            }
        }
    }
    Some(((p.0 + t0 * dx, p.1 + t0 * dy), (p.0 + t1 * dx, p.1 + t1 * dy)))
}

/// Clip a polyline (all points finite) to the window; the result is the list of visible pieces, each with at
/// least two points.
pub(crate) fn clip_polyline(run: &[(f64, f64)], w: &Window) -> Vec<Vec<(f64, f64)>> {
    let mut out: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut cur: Vec<(f64, f64)> = Vec::new();
    for pair in run.windows(2) {
        match clip_segment(pair[0], pair[1], w) {
            Some((a, b)) => {
                if cur.last() != Some(&a) {
                    if cur.len() >= 2 {
                        out.push(std::mem::take(&mut cur));
                    }
                    cur.clear();
                    cur.push(a);
                }
                cur.push(b);
            }
            None => {
                if cur.len() >= 2 {
                    out.push(std::mem::take(&mut cur));
                }
                cur.clear();
            }
        }
    }
    if cur.len() >= 2 {
        out.push(cur);
    }
    out
}

/// Clip a closed polygon to the window (Sutherland-Hodgman, common practice). The window is convex, so the
/// result is one polygon (possibly empty).
pub(crate) fn clip_polygon(poly: &[(f64, f64)], w: &Window) -> Vec<(f64, f64)> {
    type Inside = fn(&(f64, f64), f64) -> bool;
    let edges: [(Inside, f64, bool); 4] = [
        (|p, v| p.0 >= v, w.x0, true),
        (|p, v| p.0 <= v, w.x1, true),
        (|p, v| p.1 >= v, w.y0, false),
        (|p, v| p.1 <= v, w.y1, false),
    ];
    let mut pts = poly.to_vec();
    for (inside, v, vertical) in edges {
        if pts.is_empty() {
            break;
        }
        let input = std::mem::take(&mut pts);
        let n = input.len();
        for i in 0..n {
            let cur = input[i];
            let prev = input[(i + n - 1) % n];
            let cross = |a: (f64, f64), b: (f64, f64)| {
                if vertical {
                    let t = (v - a.0) / (b.0 - a.0);
                    (v, a.1 + t * (b.1 - a.1))
                } else {
                    let t = (v - a.1) / (b.1 - a.1);
                    (a.0 + t * (b.0 - a.0), v)
                }
            };
            match (inside(&cur, v), inside(&prev, v)) {
                (true, true) => pts.push(cur),
                (true, false) => {
                    pts.push(cross(prev, cur));
                    pts.push(cur);
                }
                (false, true) => pts.push(cross(prev, cur)),
                (false, false) => {}
            }
        }
    }
    pts
}

/// Cut a device-space polyline into the "on" pieces of a dash pattern (alternating on/off lengths, in
/// device units, starting with "on"). An empty pattern means a solid line: the path comes back whole.
pub(crate) fn dash(path: &[(f64, f64)], pattern: &[f64]) -> Vec<Vec<(f64, f64)>> {
    if pattern.is_empty() || pattern.iter().any(|l| l.is_nan() || *l <= 0.0) || path.len() < 2 {
        return vec![path.to_vec()];
    }
    let mut out = Vec::new();
    let mut idx = 0usize; // position in the pattern
    let mut left = pattern[0]; // length left in the current dash or gap
    let mut cur: Vec<(f64, f64)> = vec![path[0]];
    for pair in path.windows(2) {
        let (a, b) = (pair[0], pair[1]);
        let len = ((b.0 - a.0).powi(2) + (b.1 - a.1).powi(2)).sqrt();
        let mut done = 0.0;
        while len - done > left {
            done += left;
            let t = done / len;
            let p = (a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1));
            if idx % 2 == 0 {
                cur.push(p);
                out.push(std::mem::take(&mut cur));
            } else {
                cur = vec![p];
            }
            idx = (idx + 1) % pattern.len();
            left = pattern[idx];
        }
        left -= len - done;
        if idx % 2 == 0 {
            cur.push(b);
        }
    }
    if idx % 2 == 0 && cur.len() >= 2 {
        out.push(cur);
    }
    out
}

/// Smallest and largest of the finite values, or None when there are none.
pub(crate) fn finite_span(values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    values.filter(|v| v.is_finite()).fold(None, |acc, v| match acc {
        None => Some((v, v)),
        Some((lo, hi)) => Some((lo.min(v), hi.max(v))),
    })
}

/// Widen a data span into an axis range: `pad` is the fraction of the span added on each side; a
/// degenerate span (all values equal) gets a unit-sized (or 10 % of the value) range around it.
pub(crate) fn axis_range((lo, hi): (f64, f64), pad: f64) -> (f64, f64) {
    if hi > lo {
        let d = (hi - lo) * pad;
        (lo - d, hi + d)
    } else {
        let d = if lo == 0.0 { 1.0 } else { 0.1 * lo.abs() };
        (lo - d, hi + d)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const W: Window = Window { x0: 0.0, x1: 1.0, y0: 0.0, y1: 1.0 };

    #[test]
    fn nan_breaks_a_curve_into_runs() {
        let pts = [(0.0, 1.0), (1.0, f64::NAN), (2.0, 3.0), (3.0, 4.0), (4.0, f64::INFINITY), (5.0, 1.0)];
        let runs = split_finite(&pts);
        assert_eq!(runs, vec![vec![(0.0, 1.0)], vec![(2.0, 3.0), (3.0, 4.0)], vec![(5.0, 1.0)]]);
        assert!(split_finite(&[]).is_empty());
        assert!(split_finite(&[(f64::NAN, 0.0)]).is_empty());
    }

    #[test]
    fn polyline_leaving_and_reentering_the_window_splits() {
        let run = [(0.5, 0.5), (0.5, 2.0), (0.6, 0.5)];
        let pieces = clip_polyline(&run, &W);
        assert_eq!(pieces.len(), 2);
        assert_eq!(pieces[0], vec![(0.5, 0.5), (0.5, 1.0)]);
        let last = pieces[1].last().copied().unwrap();
        assert!((last.0 - 0.6).abs() < 1e-12 && (last.1 - 0.5).abs() < 1e-12);
        assert!(clip_polyline(&[(2.0, 2.0), (3.0, 3.0)], &W).is_empty());
    }

    #[test]
    fn polygon_is_cut_to_the_window() {
        let big = [(-1.0, -1.0), (2.0, -1.0), (2.0, 2.0), (-1.0, 2.0)];
        let c = clip_polygon(&big, &W);
        let area: f64 = (0..c.len())
            .map(|i| {
                let (a, b) = (c[i], c[(i + 1) % c.len()]);
                a.0 * b.1 - b.0 * a.1
            })
            .sum::<f64>()
            / 2.0;
        assert!((area.abs() - 1.0).abs() < 1e-12, "area {area}");
        assert!(clip_polygon(&[(2.0, 2.0), (3.0, 2.0), (3.0, 3.0)], &W).is_empty());
    }

    #[test]
    fn dashes_cover_the_on_fraction_of_the_length() {
        let path = [(0.0, 0.0), (10.0, 0.0), (10.0, 10.0)];
        let pieces = dash(&path, &[2.0, 2.0]);
        let on: f64 = pieces
            .iter()
            .map(|p| p.windows(2).map(|s| ((s[1].0 - s[0].0).powi(2) + (s[1].1 - s[0].1).powi(2)).sqrt()).sum::<f64>())
            .sum();
        assert!((on - 10.0).abs() < 1e-9, "on length {on}");
        assert_eq!(pieces.len(), 5);
        assert_eq!(dash(&path, &[]).len(), 1);
    }

    #[test]
    fn ranges_pad_and_handle_degenerate_spans() {
        assert_eq!(axis_range((0.0, 10.0), 0.1), (-1.0, 11.0));
        assert_eq!(axis_range((0.0, 0.0), 0.1), (-1.0, 1.0));
        assert_eq!(finite_span([f64::NAN, 2.0, -1.0].into_iter()), Some((-1.0, 2.0)));
        assert_eq!(finite_span([f64::NAN].into_iter()), None);
    }
}
