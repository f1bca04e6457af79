//! Plane geometry for figures: splitting curves at gaps (NaN), clipping polylines and polygons to the plot
//! window, contours of sampled fields (marching squares), and picking axis ranges from the data.
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
pub(crate) fn clip_segment(p: (f64, f64), q: (f64, f64), w: &Window) -> Option<((f64, f64), (f64, f64))> {
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

/// The level-`level` contour of a field sampled on a grid, as polylines (marching squares with linear
/// interpolation along cell edges; Lorensen & Cline 1987 in two dimensions, common practice). `values` is
/// row-major with y outer (`values[j * xs.len() + i]` at `(xs[i], ys[j])`); squares with a non-finite corner
/// are skipped, so the contour stops where the field is undefined. Saddle squares are resolved by the mean
/// of the four corners. Segments are joined into the longest polylines, so a dash pattern runs on along
/// the whole curve.
pub fn contour_segments(values: &[f64], xs: &[f64], ys: &[f64], level: f64) -> Vec<Vec<(f64, f64)>> {
    let (nx, ny) = (xs.len(), ys.len());
    if nx < 2 || ny < 2 || values.len() != nx * ny {
        return vec![];
    }
    let v = |i: usize, j: usize| values[j * nx + i] - level;
    let mut segs: Vec<((f64, f64), (f64, f64))> = Vec::new();
    for j in 0..ny - 1 {
        for i in 0..nx - 1 {
            // Corners counter-clockwise from bottom left.
            let c = [v(i, j), v(i + 1, j), v(i + 1, j + 1), v(i, j + 1)];
            if c.iter().any(|x| !x.is_finite()) {
                continue;
            }
            let p = [(xs[i], ys[j]), (xs[i + 1], ys[j]), (xs[i + 1], ys[j + 1]), (xs[i], ys[j + 1])];
            // Crossing point on edge k (corner k to corner k+1).
            let cross = |k: usize| {
                // Interpolate from the lower-left end, so the squares on both sides of an edge agree exactly.
                let (mut ka, mut kb) = (k, (k + 1) % 4);
                if p[kb] < p[ka] {
                    std::mem::swap(&mut ka, &mut kb);
                }
                let (a, b) = (c[ka], c[kb]);
                let t = if a == b { 0.5 } else { a / (a - b) };
                let (pa, pb) = (p[ka], p[kb]);
                (pa.0 + t * (pb.0 - pa.0), pa.1 + t * (pb.1 - pa.1))
            };
            let above: Vec<bool> = c.iter().map(|&x| x >= 0.0).collect();
            let edges: Vec<usize> = (0..4).filter(|&k| above[k] != above[(k + 1) % 4]).collect();
            match edges.len() {
                2 => segs.push((cross(edges[0]), cross(edges[1]))),
                4 => {
                    let centre_above = c.iter().sum::<f64>() / 4.0 >= 0.0;
                    // Pair each edge with its neighbour so that the centre's side is connected.
                    if centre_above == above[0] {
                        segs.push((cross(0), cross(1)));
                        segs.push((cross(2), cross(3)));
                    } else {
                        segs.push((cross(3), cross(0)));
                        segs.push((cross(1), cross(2)));
                    }
                }
                _ => {}
            }
        }
    }
    join_segments(segs)
}

/// Join segments sharing end points (to rounding) into polylines.
fn join_segments(segs: Vec<((f64, f64), (f64, f64))>) -> Vec<Vec<(f64, f64)>> {
    use std::collections::HashMap;
    let key = |p: (f64, f64)| ((p.0 * 1e9).round() as i64, (p.1 * 1e9).round() as i64);
    // A contour through a grid point leaves zero-length pieces in the squares around it: drop them.
    let segs: Vec<((f64, f64), (f64, f64))> = segs.into_iter().filter(|s| key(s.0) != key(s.1)).collect();
    let mut ends: HashMap<(i64, i64), Vec<usize>> = HashMap::new();
    for (k, s) in segs.iter().enumerate() {
        ends.entry(key(s.0)).or_default().push(k);
        ends.entry(key(s.1)).or_default().push(k);
    }
    let mut used = vec![false; segs.len()];
    let mut out = Vec::new();
    let next = |p: (f64, f64), used: &[bool]| -> Option<usize> {
        ends.get(&key(p)).and_then(|v| v.iter().copied().find(|&k| !used[k]))
    };
    for start in 0..segs.len() {
        if used[start] {
            continue;
        }
        used[start] = true;
        let mut line = std::collections::VecDeque::from([segs[start].0, segs[start].1]);
        // Extend at the back, then at the front.
        while let Some(k) = next(*line.back().unwrap_or(&segs[start].1), &used) {
            used[k] = true;
            let b = *line.back().unwrap_or(&segs[k].0);
            line.push_back(if key(segs[k].0) == key(b) { segs[k].1 } else { segs[k].0 });
        }
        while let Some(k) = next(*line.front().unwrap_or(&segs[start].0), &used) {
            used[k] = true;
            let f = *line.front().unwrap_or(&segs[k].0);
            line.push_front(if key(segs[k].0) == key(f) { segs[k].1 } else { segs[k].0 });
        }
        out.push(line.into_iter().collect());
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
    fn contour_of_a_plane_is_one_straight_line() {
        // f(x, y) = x + y - 1 on a 6 x 5 grid over [0, 1]^2: the zero contour is the line x + y = 1.
        let xs: Vec<f64> = (0..6).map(|i| i as f64 / 5.0).collect();
        let ys: Vec<f64> = (0..5).map(|j| j as f64 / 4.0).collect();
        let vals: Vec<f64> = ys.iter().flat_map(|&y| xs.iter().map(move |&x| x + y - 1.0)).collect();
        let lines = contour_segments(&vals, &xs, &ys, 0.0);
        assert_eq!(lines.len(), 1, "{lines:?}");
        assert!(lines[0].len() >= 5);
        for &(x, y) in &lines[0] {
            assert!((x + y - 1.0).abs() < 1e-12, "({x}, {y}) off the line");
        }
    }

    #[test]
    fn contour_of_a_circle_closes_and_stops_at_gaps() {
        let xs: Vec<f64> = (0..41).map(|i| -1.0 + i as f64 / 20.0).collect();
        let ys = xs.clone();
        let mut vals: Vec<f64> = ys.iter().flat_map(|&y| xs.iter().map(move |&x| x * x + y * y - 0.5)).collect();
        let lines = contour_segments(&vals, &xs, &ys, 0.0);
        assert_eq!(lines.len(), 1, "{:?}", lines.iter().map(|l| (l.len(), l[0], l[l.len() - 1])).collect::<Vec<_>>());
        let l = &lines[0];
        assert_eq!(l.first(), l.last(), "a circle closes");
        for &(x, y) in l {
            assert!(((x * x + y * y).sqrt() - 0.5f64.sqrt()).abs() < 0.01);
        }
        // Undefined values (NaN) on the left half cut the circle open.
        for j in 0..41 {
            for i in 0..20 {
                vals[j * 41 + i] = f64::NAN;
            }
        }
        let lines = contour_segments(&vals, &xs, &ys, 0.0);
        assert_eq!(lines.len(), 1);
        assert_ne!(lines[0].first(), lines[0].last());
    }

    #[test]
    fn ranges_pad_and_handle_degenerate_spans() {
        assert_eq!(axis_range((0.0, 10.0), 0.1), (-1.0, 11.0));
        assert_eq!(axis_range((0.0, 0.0), 0.1), (-1.0, 1.0));
        assert_eq!(finite_span([f64::NAN, 2.0, -1.0].into_iter()), Some((-1.0, 2.0)));
        assert_eq!(finite_span([f64::NAN].into_iter()), None);
    }
}
