//! Golden strings for typical metric functions and equations of state, and the text round trip.

use super::*;
use crate::expr::eval::eval_node;
use crate::expr::testgen::{arb_node, names};
use proptest::prelude::*;

fn all_names() -> Vec<String> {
    ["m", "q", "Lambda", "l", "c", "alpha", "k", "n", "w", "r_0", "mu"].iter().map(|s| s.to_string()).collect()
}

/// (source, variable, plain text, LaTeX). The metric names are the usual ones of the trade (common
/// practice); the expected strings are this program's printing conventions.
const GOLDEN: [(&str, &str, &str, &str); 18] = [
    // Schwarzschild
    ("1 - 2*m/r", "r", "1 - 2*m/r", r"1-\frac{2m}{r}"),
    // Reissner-Nordstrom
    ("1 - 2*m/r + q^2/r^2", "r", "1 - 2*m/r + q^2/r^2", r"1-\frac{2m}{r}+\frac{q^{2}}{r^{2}}"),
    // de Sitter-Schwarzschild (Kottler)
    ("1 - 2*m/r - Lambda*r^2/3", "r", "1 - 2*m/r - Lambda*r^2/3", r"1-\frac{2m}{r}-\frac{\Lambda r^{2}}{3}"),
    // Hayward regular black hole
    ("1 - 2*m*r^2/(r^3 + 2*m*l^2)", "r", "1 - 2*m*r^2/(r^3 + 2*m*l^2)", r"1-\frac{2mr^{2}}{r^{3}+2ml^{2}}"),
    // Bardeen regular black hole
    (
        "1 - 2*m*r^2/(r^2 + q^2)^(3/2)",
        "r",
        "1 - 2*m*r^2/(r^2 + q^2)^(3/2)",
        r"1-\frac{2mr^{2}}{\left(r^{2}+q^{2}\right)^{\frac{3}{2}}}",
    ),
    // exponential metric
    ("exp(-2*m/r)", "r", "exp(-2*m/r)", r"e^{-\frac{2m}{r}}"),
    // generalised Chaplygin gas
    ("-c/abs(sigma)^alpha", "sigma", "-c/abs(sigma)^alpha", r"-\frac{c}{\left|\sigma\right|^{\alpha}}"),
    // polytrope
    ("k*abs(sigma)^(1+1/n)", "sigma", "k*abs(sigma)^(1 + 1/n)", r"k\left|\sigma\right|^{1+\frac{1}{n}}"),
    // linear (barotropic) equation of state
    ("w*sigma", "sigma", "w*sigma", r"w\sigma"),
    // anti-de Sitter
    ("1 + r^2/l^2", "r", "1 + r^2/l^2", r"1+\frac{r^{2}}{l^{2}}"),
    // Schwarzschild written with its horizon radius
    ("1 - r_0/r", "r", "1 - r_0/r", r"1-\frac{r_{0}}{r}"),
    // quintessence-surrounded black hole
    ("1 - 2*m/r - c/r^(3*w + 1)", "r", "1 - 2*m/r - c/r^(3*w + 1)", r"1-\frac{2m}{r}-\frac{c}{r^{3w+1}}"),
    // a long exponent switches to \exp
    (
        "exp(-2*m/r + q^2/r^2 - alpha*r)",
        "r",
        "exp(-2*m/r + q^2/r^2 - alpha*r)",
        r"\exp\left(-\frac{2m}{r}+\frac{q^{2}}{r^{2}}-\alpha r\right)",
    ),
    // redshift-type factor
    ("sqrt(1 - 2*m/r)", "r", "sqrt(1 - 2*m/r)", r"\sqrt{1-\frac{2m}{r}}"),
    (
        "2*pi*r*log(r/m) + sin(r)",
        "r",
        "2*pi*r*log(r/m) + sin(r)",
        r"2\pi r\ln\left(\frac{r}{m}\right)+\sin\left(r\right)",
    ),
    ("1e-20*r + 2*3*r + 1.5e30", "r", "1e-20*r + 2*3*r + 1.5e30", r"10^{-20}r+2\cdot 3r+1.5\times10^{30}"),
    ("r^-2 - (m - r)*(-q)", "r", "r^-2 - (m - r)*-q", r"\frac{1}{r^{2}}-\left(m-r\right)\left(-q\right)"),
    ("mu*r + -m", "r", "mu*r - m", r"\mu r-m"),
];

#[test]
fn golden_text_and_latex() {
    for (src, var, text, latex) in GOLDEN {
        let e = Expr::parse(src, var, &all_names()).unwrap();
        assert_eq!(e.to_text(), text, "text of {src}");
        assert_eq!(e.to_latex(), latex, "LaTeX of {src}");
    }
}

#[test]
fn names_in_latex() {
    let cases = [
        ("alpha", r"\alpha"),
        ("Lambda", r"\Lambda"),
        ("Omega", r"\Omega"),
        ("sigma", r"\sigma"),
        ("r_0", r"r_{0}"),
        ("r_plus", r"r_{\mathrm{plus}}"),
        ("m1", r"m_{1}"),
        ("mass", r"\mathrm{mass}"),
        ("q", "q"),
        ("lambda_2", r"\lambda_{2}"),
        ("a_", r"\mathrm{a\_}"),
    ];
    for (name, want) in cases {
        assert_eq!(name_latex(name), want, "{name}");
    }
}

#[test]
fn shell_radius_substituted_for_the_variable() {
    let e = Expr::parse("1 - 2*m/r + q^2/r^2", "r", &all_names()).unwrap();
    let ns = all_names();
    assert_eq!(latex_of(e.node(), "a", &|k| name_latex(&ns[k])), r"1-\frac{2m}{a}+\frac{q^{2}}{a^{2}}");
    assert_eq!(text_of(e.node(), "a", &|k| ns[k].clone()), "1 - 2*m/a + q^2/a^2");
}

#[test]
fn derivative_prints_in_latex() {
    let e = Expr::parse("-c/abs(sigma)^alpha", "sigma", &all_names()).unwrap();
    let d = e.derivative();
    assert_eq!(d.to_text(), "c*alpha*sign(sigma)*abs(sigma)^(alpha - 1)/(abs(sigma)^alpha)^2");
    assert_eq!(
        d.to_latex(),
        r"\frac{c\alpha\operatorname{sgn}\left(\sigma\right)\left|\sigma\right|^{\alpha-1}}{\left(\left|\sigma\right|^{\alpha}\right)^{2}}"
    );
}

fn same(a: f64, b: f64) -> bool {
    a == b || (a.is_nan() && b.is_nan())
}

proptest! {
    /// Property: printing and parsing back gives a tree with exactly the same value, for random trees and
    /// their simplified forms.
    #[test]
    fn text_round_trip(node in arb_node(), r in 0.3f64..3.0, ps in prop::array::uniform4(0.1f64..2.0)) {
        let ns = names();
        for n in [node.clone(), crate::expr::simplify(&node)] {
            let text = text_of(&n, "r", &|k| ns[k].clone());
            let back = crate::expr::parse::Parser::parse(&text, "r", &ns);
            prop_assert!(back.is_ok(), "{} does not parse: {:?}", text, back);
            let back = back.unwrap();
            let (a, b) = (eval_node(&n, r, |k| ps[k]), eval_node(&back, r, |k| ps[k]));
            prop_assert!(same(a, b), "{:?} printed {} reads back {} vs {}", n, text, b, a);
        }
    }
}
