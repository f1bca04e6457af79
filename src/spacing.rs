//! Sample points on a closed interval, evenly spaced on a linear or a logarithmic scale, both ends exact.
//!
//! Point k of n (k = 0 .. n-1) is `lo + (hi - lo) k / (n - 1)` on the linear scale and
//! `exp(ln lo + (ln hi - ln lo) k / (n - 1))` on the logarithmic one; the first point is `lo` and the last `hi`,
//! exactly, whatever the rounding of the formula. [`linear_by_step`] is the linear scale written as `lo + k h` with
//! `h = (hi - lo) / (n - 1)`: the same points up to the last bit, kept where a figure's output depends on that bit.
//! The maps' axes (`scan::grid`) evaluate the linear formula in double-double arithmetic instead, so that printed
//! grid values are the decimals of the exact grid.

/// n points from `lo` to `hi` on a linear scale: `lo + (hi - lo) k / (n - 1)`, the last point exactly `hi`.
/// One point is `[lo]`, none is empty.
pub fn linear(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    let last = n.saturating_sub(1);
    (0..n)
        .map(|k| match k {
            0 => lo,
            k if k == last => hi,
            k => lo + (hi - lo) * k as f64 / last as f64,
        })
        .collect()
}

/// n points from `lo` to `hi` on a linear scale written as `lo + k h`, `h = (hi - lo) / (n - 1)`, the last point
/// exactly `hi`. One point is `[lo]`, none is empty.
pub fn linear_by_step(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    let last = n.saturating_sub(1);
    let h = (hi - lo) / last as f64;
    (0..n)
        .map(|k| match k {
            0 => lo,
            k if k == last => hi,
            k => lo + h * k as f64,
        })
        .collect()
}

/// n points from `lo` to `hi` (both > 0) on a logarithmic scale: `exp(ln lo + (ln hi - ln lo) k / (n - 1))`,
/// the first point exactly `lo` and the last exactly `hi`. One point is `[lo]`, none is empty.
pub fn log(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    let last = n.saturating_sub(1);
    let (a, b) = (lo.ln(), hi.ln());
    (0..n)
        .map(|k| match k {
            0 => lo,
            k if k == last => hi,
            k => (a + (b - a) * k as f64 / last as f64).exp(),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn both_ends_are_exact() {
        // In f64, -0.3 + (0.1 - -0.3) is 0.10000000000000003 and exp(ln 1e-3) is 0.0010000000000000002, and
        // exp(ln 1e-3 + (ln 1e3 - ln 1e-3)) is 999.9999999999998 (common practice: checked in Python floats).
        assert_ne!(-0.3 + (0.1 - -0.3) * 1.0 / 1.0, 0.1);
        let v = linear(-0.3, 0.1, 2);
        assert_eq!(v, vec![-0.3, 0.1]);
        let v = log(1e-3, 1e3, 13);
        assert_eq!((v[0], v[12]), (1e-3, 1e3));
        assert_eq!(linear(2.0, 5.0, 1), vec![2.0]);
        assert_eq!(linear_by_step(2.0, 5.0, 1), vec![2.0]);
        assert_eq!(linear_by_step(-0.3, 0.1, 2), vec![-0.3, 0.1]);
        assert!(log(2.0, 5.0, 0).is_empty());
    }

    #[test]
    fn interior_points_follow_the_formulas() {
        let v = linear(-1.0, 3.0, 5);
        assert_eq!(v, vec![-1.0, 0.0, 1.0, 2.0, 3.0]);
        assert_eq!(linear_by_step(-1.0, 3.0, 5), v);
        // The two linear formulas differ in the last bit: on 0.1 .. 0.7 in 10 points, point 3 is 0.3 by
        // lo + (hi - lo) k / (n - 1) and 0.30000000000000004 by lo + k h (common practice: checked in Python floats).
        assert_eq!(linear(0.1, 0.7, 10)[3], 0.3);
        assert_eq!(linear_by_step(0.1, 0.7, 10)[3], 0.30000000000000004);
        let v = log(1.0, 1e4, 5);
        for (k, x) in v.iter().enumerate() {
            assert!((x / 10f64.powi(k as i32) - 1.0).abs() < 1e-14, "{k}: {x}");
        }
        assert!(v.windows(2).all(|w| w[0] < w[1]));
    }
}
