//! Tests of the symbolic derivative and the simplifier.

use super::*;
use crate::expr::eval::eval_node;
use crate::expr::testgen::{arb_node, close, names, METRICS};
use crate::expr::Expr;
use num_dual::{Dual2_64, Dual64};
use proptest::prelude::*;

fn parse(src: &str) -> Expr {
    Expr::parse(src, "r", &names()).unwrap()
}

fn simp(src: &str) -> String {
    parse(src).simplified().to_text()
}

fn deriv(src: &str) -> String {
    parse(src).derivative().to_text()
}

#[test]
fn removes_neutral_elements() {
    let cases = [
        ("r*1", "r"),
        ("1*r", "r"),
        ("r + 0", "r"),
        ("0 + r", "r"),
        ("r - 0", "r"),
        ("0*r", "0"),
        ("r*0 + m", "m"),
        ("r/1", "r"),
        ("r^1", "r"),
        ("r^0", "1"),
        ("--r", "r"),
        ("-(0)", "0"),
        ("0 - r", "-r"),
    ];
    for (src, want) in cases {
        assert_eq!(simp(src), want, "{src}");
    }
}

#[test]
fn folds_constants_and_gathers_products() {
    let cases = [
        ("2*m*3", "6*m"),
        ("2*3 + 4", "10"),
        ("2.0*r", "2*r"),
        ("1/2 + 1/3", "5/6"),
        ("r/2/3", "r/6"),
        ("4*m/6", "2*m/3"),
        ("2^3*r", "8*r"),
        ("2^-1*r", "r/2"),
        ("2*pi*r", "2*pi*r"),
        ("sqrt(4) + sqrt(2)", "2 + sqrt(2)"),
        ("exp(0)*r + log(1)", "r"),
        ("m*(r/q)", "m*r/q"),
        ("(m/r)/q", "m/(q*r)"),
        ("-(m)*r", "-m*r"),
        ("r*(-m)", "-m*r"),
        ("r + (-m)", "r - m"),
        ("r - (-m)", "r + m"),
        ("(r^2)^2", "r^4"),
        ("r*r^-3", "1/r^2"),
        ("(-r)^2", "r^2"),
        ("m/r + m/r", "2*m/r"),
        ("r*m - m*r", "0"),
        ("sqrt(r)*r^(3/2)/r^3", "1/r"),
        ("sign(r)^2*m + sign(r)^3", "m + sign(r)"),
    ];
    for (src, want) in cases {
        assert_eq!(simp(src), want, "{src}");
    }
}

#[test]
fn keeps_value_changing_rewrites_out() {
    // (x^2)^(1/2) = |x|, not x; sqrt(a*b) is not sqrt(a)*sqrt(b) for negative a, b (common practice).
    assert_eq!(simp("(r^2)^0.5"), "(r^2)^0.5");
    assert_eq!(simp("sqrt(m*r)"), "sqrt(m*r)");
    assert_eq!(simp("(-r)^1.5"), "(-r)^1.5");
}

/// Derivatives of textbook metric functions (differentiation rules, common practice).
#[test]
fn derivatives_of_typical_metrics() {
    let cases = [
        ("1 - 2*m/r", "2*m/r^2"),
        ("1 - 2*m/r + q^2/r^2", "2*m/r^2 - 2*q^2/r^3"),
        ("1 - 2*m/r - l*r^2/3", "2*m/r^2 - 2*l*r/3"),
        ("1 - 2*m*r^2/(r^3 + 2*m*l^2)", "-4*m*r/(r^3 + 2*m*l^2) + 6*m*r^4/(r^3 + 2*m*l^2)^2"),
        ("1 - 2*m*r^2/(r^2 + q^2)^(3/2)", "-4*m*r/(r^2 + q^2)^(3/2) + 6*m*r^3/(r^2 + q^2)^(5/2)"),
        ("exp(-2*m/r)", "2*m*exp(-2*m/r)/r^2"),
        ("r^r", "r^r*(log(r) + 1)"),
        ("abs(r)", "sign(r)"),
        ("sin(r)*cos(r)", "cos(r)^2 - sin(r)^2"),
        ("log(r) + sqrt(r)", "1/r + 1/(2*sqrt(r))"),
        ("m^r", "m^r*log(m)"),
        ("r^alpha", "alpha*r^(alpha - 1)"),
        ("m*q + pi", "0"),
    ];
    for (src, want) in cases {
        assert_eq!(deriv(src), want, "{src}");
    }
}

#[test]
fn derivative_sources_print_the_result() {
    let d = parse("1 - 2*m/r").derivative();
    assert_eq!(d.source(), "2*m/r^2");
    assert_eq!(d.var(), "r");
    assert_eq!(d.param_names(), &names()[..]);
}

proptest! {
    /// Property: the simplified symbolic derivative equals the automatic derivative, for the typical metrics
    /// (first and second derivatives) at random points.
    #[test]
    fn symbolic_derivatives_match_automatic_ones(r in 0.3f64..4.0, m in 0.1f64..1.0, q in 0.1f64..0.9, l in 0.01f64..0.5, a in -0.5f64..0.5) {
        let ps = [m, q, l, a];
        for src in METRICS {
            let e = parse(src);
            let ad: Dual2_64 = e.eval_at(Dual2_64::new(r, 1.0, 0.0), &ps);
            let d1 = e.derivative();
            let d2 = d1.derivative();
            prop_assume!(ad.re.is_finite() && ad.v1.is_finite() && ad.v2.is_finite());
            prop_assert!(close(d1.value(r, &ps), ad.v1, 1e-10, 0.0), "{} d1: {} vs {}", src, d1.to_text(), ad.v1);
            prop_assert!(close(d2.value(r, &ps), ad.v2, 1e-9, 0.0), "{} d2: {} vs {}", src, d2.to_text(), ad.v2);
            prop_assert!(close(e.simplified().value(r, &ps), ad.re, 1e-12, 0.0), "{} simplified", src);
        }
    }

    /// Property: on random trees, simplification keeps the value and the simplified derivative equals the
    /// automatic derivative wherever the automatic one is finite.
    #[test]
    fn random_trees_keep_their_values(node in arb_node(), r in 0.3f64..3.0, ps in prop::array::uniform4(0.1f64..2.0)) {
        let ad: Dual64 = eval_node(&node, Dual64::new(r, 1.0), |k| Dual64::from(ps[k]));
        prop_assume!(ad.re.is_finite() && ad.eps.is_finite() && ad.re.abs() < 1e8 && ad.eps.abs() < 1e8);
        let s = simplify(&node);
        let d = simplify(&derivative(&node));
        let sv = eval_node(&s, r, |k| ps[k]);
        let dv = eval_node(&d, r, |k| ps[k]);
        prop_assert!(close(sv, ad.re, 1e-8, 0.0), "simplify: {:?} -> {:?}: {} vs {}", node, s, sv, ad.re);
        prop_assert!(close(dv, ad.eps, 1e-7, 0.0), "derivative: {:?} -> {:?}: {} vs {}", node, d, dv, ad.eps);
        prop_assert_eq!(simplify(&s), s.clone(), "simplify is idempotent");
    }
}
