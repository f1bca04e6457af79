//! The tape against the tree evaluator.

use super::*;
use crate::expr::testgen::{arb_node, close, names, METRICS};
use crate::expr::Expr;
use num_dual::{Dual2_64, Dual3_64, Dual64};
use proptest::prelude::*;

fn parse(src: &str) -> Expr {
    Expr::parse(src, "r", &names()).unwrap()
}

#[test]
fn shares_repeated_subtrees_and_folds_constants() {
    // Var, Square(Var), Add: the second r^2 is the first one.
    assert_eq!(parse("r^2 + r^2").tape().len(), 3);
    // 2*pi*3 folds to one constant.
    assert_eq!(parse("2*pi*3*r").tape().len(), 3);
    assert_eq!(parse("2*pi*3").tape().len(), 1);
}

#[test]
fn constant_expression_has_zero_derivatives() {
    let t = parse("m*q + 2").tape();
    let xs = [1.0, 2.0, 3.0];
    let (mut f, mut d1, mut d2, mut d3) = ([0.0; 3], [9.0; 3], [9.0; 3], [9.0; 3]);
    t.eval_batch_d3(&xs, &[2.0, 3.0, 0.0, 0.0], &mut f, &mut d1, &mut d2, &mut d3);
    assert_eq!(f, [8.0; 3]);
    assert_eq!((d1, d2, d3), ([0.0; 3], [0.0; 3], [0.0; 3]));
}

#[test]
fn missing_parameter_reads_as_nan_in_batches() {
    let t = parse("r*alpha").tape();
    let mut f = [0.0; 2];
    t.eval_batch(&[1.0, 2.0], &[1.0], &mut f);
    assert!(f.iter().all(|v| v.is_nan()));
}

#[test]
fn parameter_derivatives_through_the_tape() {
    let e = parse("1 - 2*m*r^2/(r^3 + 2*m*l^2)");
    let ps = [0.7, 0.2, 0.4, 0.0];
    let t = e.tape();
    for k in 0..4 {
        let d = t.eval(Dual64::from(1.3), |j| Dual64::new(ps[j], if j == k { 1.0 } else { 0.0 }));
        assert!(close(d.eps, e.param_derivative(1.3, &ps, k), 1e-14, 0.0), "parameter {k}");
    }
}

fn check_point(e: &Expr, t: &Tape, r: f64, ps: &[f64]) -> Result<(), TestCaseError> {
    let src = e.to_text();
    let f: f64 = t.eval(r, |k| ps[k]);
    prop_assert!(close(f, e.value(r, ps), 1e-13, 0.0), "{} f64", src);
    let d2: Dual2_64 = t.eval(Dual2_64::new(r, 1.0, 0.0), |k| Dual2_64::from(ps[k]));
    let w2: Dual2_64 = e.eval_at(Dual2_64::new(r, 1.0, 0.0), ps);
    for (a, b) in [(d2.re, w2.re), (d2.v1, w2.v1), (d2.v2, w2.v2)] {
        prop_assert!(close(a, b, 1e-12, 0.0), "{} Dual2 {} vs {}", src, a, b);
    }
    let d3: Dual3_64 = t.eval(Dual3_64::new(r, 1.0, 0.0, 0.0), |k| Dual3_64::from(ps[k]));
    let w3 = e.derivatives(r, ps);
    for (a, b) in [d3.re, d3.v1, d3.v2, d3.v3].into_iter().zip(w3) {
        prop_assert!(close(a, b, 1e-12, 0.0), "{} Dual3 {} vs {}", src, a, b);
    }
    Ok(())
}

/// Batch derivatives against the tree's Dual3 derivatives at `xs`. With `jet_scale` the tolerance is
/// relative to the largest derivative at that point: the tree's dual numbers compute `tanh` as
/// `sinh/cosh`, whose higher derivatives lose all digits once `tanh` saturates, where the batch formulas
/// (sech^2 from cosh) stay accurate.
fn check_batch(e: &Expr, t: &Tape, xs: &[f64], ps: &[f64], jet_scale: bool) -> Result<(), TestCaseError> {
    let n = xs.len();
    let mut o = vec![vec![0.0; n]; 7];
    let [f, d1, d2, g, g1, g2, g3] = &mut o[..] else { unreachable!("seven rows") };
    t.eval_batch_d2(xs, ps, f, d1, d2);
    t.eval_batch_d3(xs, ps, g, g1, g2, g3);
    let mut v = vec![0.0; n];
    t.eval_batch(xs, ps, &mut v);
    for (i, &x) in xs.iter().enumerate() {
        let w = e.derivatives(x, ps);
        let (rel, scale) = if jet_scale { (1e-9, w.iter().map(|v| v.abs()).sum()) } else { (1e-11, 0.0) };
        let got = [[f[i], d1[i], d2[i], f64::NAN], [g[i], g1[i], g2[i], g3[i]]];
        for (k, want) in w.iter().enumerate() {
            prop_assert!(
                close(got[1][k], *want, rel, scale),
                "{} d3 batch order {} at {}: {} vs {}",
                e.to_text(),
                k,
                x,
                got[1][k],
                want
            );
            if k < 3 {
                prop_assert!(close(got[0][k], *want, rel, scale), "{} d2 batch order {} at {}", e.to_text(), k, x);
            }
        }
        prop_assert!(close(v[i], w[0], 1e-13, 0.0), "{} value batch", e.to_text());
    }
    Ok(())
}

proptest! {
    /// Property: the tape reproduces the tree walk (f64, Dual2, Dual3) and the batch evaluators reproduce the
    /// tree's derivatives, for the typical metrics over blocks that do not fill the last chunk.
    #[test]
    fn tape_matches_tree_on_typical_metrics(r0 in 0.3f64..3.0, m in 0.1f64..1.0, q in 0.1f64..0.9, l in 0.01f64..0.5, a in -0.5f64..0.5) {
        let ps = [m, q, l, a];
        let xs: Vec<f64> = (0..150).map(|i| r0 + 0.01 * i as f64).collect();
        for src in METRICS {
            let e = parse(src);
            let t = e.tape();
            check_point(&e, &t, r0, &ps)?;
            check_batch(&e, &t, &xs, &ps, false)?;
        }
    }

    /// Property: the same on random trees, wherever the tree's derivatives are finite.
    #[test]
    fn tape_matches_tree_on_random_trees(node in arb_node(), r in 0.3f64..3.0, ps in prop::array::uniform4(0.1f64..2.0)) {
        let e = Expr::from_node(node, "r", &names());
        let w = e.derivatives(r, &ps);
        prop_assume!(w.iter().all(|v| v.is_finite() && v.abs() < 1e8));
        let t = e.tape();
        check_point(&e, &t, r, &ps)?;
        check_batch(&e, &t, &[r, r, r], &ps, true)?;
    }
}

#[test]
fn evaluator_matches_per_point_evaluation() {
    let ps = [0.9, 0.3, 0.5, 0.1];
    for src in METRICS {
        let e = parse(src);
        let t = e.tape();
        let mut ev = t.evaluator::<Dual3_64>(&ps);
        for x in [0.7, 1.9, 3.3] {
            let got = ev.eval(Dual3_64::new(x, 1.0, 0.0, 0.0));
            let want = e.derivatives(x, &ps);
            for (a, b) in [got.re, got.v1, got.v2, got.v3].into_iter().zip(want) {
                assert!(close(a, b, 1e-12, 0.0), "{src} at {x}: {a} vs {b}");
            }
        }
    }
}
