//! Exact roots of rational metric functions: when B(r) is a ratio of polynomials in r (at fixed parameter
//! values), its zeros are the real roots of the numerator, found as the eigenvalues of the numerator's companion
//! matrix (Golub & Van Loan, Matrix Computations, 4th ed., 2013, sec. 7.4.6; the method of MATLAB's `roots`,
//! common practice), grouped into clusters for multiplicity and polished by Newton's method on the derivative
//! that has a simple root there. A double root (extremal Reissner-Nordstrom, B = (1 - M/r)^2) then comes out to
//! rounding, which a sign-change search cannot see and a minimum search locates only to the square root of the
//! rounding error.

use crate::expr::ast::{BinOp, Node};
use crate::expr::Expr;
use nalgebra::DMatrix;

/// Largest polynomial degree handled (beyond it the companion matrix is too ill-conditioned to trust).
pub const MAX_DEGREE: usize = 24;

/// A polynomial, coefficients in ascending powers.
pub type Poly = Vec<f64>;

fn trim(mut p: Poly) -> Poly {
    let big = p.iter().fold(0.0f64, |m, c| m.max(c.abs()));
    while p.len() > 1 && p.last().is_some_and(|c| c.abs() <= 1e-15 * big) {
        p.pop();
    }
    p
}

fn mul(a: &[f64], b: &[f64]) -> Poly {
    let mut out = vec![0.0; a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    trim(out)
}

fn add(a: &[f64], b: &[f64], sign: f64) -> Poly {
    let mut out = vec![0.0; a.len().max(b.len())];
    for (i, x) in a.iter().enumerate() {
        out[i] += x;
    }
    for (i, y) in b.iter().enumerate() {
        out[i] += sign * y;
    }
    trim(out)
}

/// A rational function num/den.
type Ratio = (Poly, Poly);

fn degree_ok(r: &Ratio) -> Option<Ratio> {
    (r.0.len() <= MAX_DEGREE + 1 && r.1.len() <= MAX_DEGREE + 1).then(|| r.clone())
}

/// B(r) = num(r)/den(r) at the given parameter values, if the expression is rational in r (built from numbers,
/// parameters, r, + - * /, integer powers and functions of constants only); `None` otherwise or when the degree
/// exceeds [`MAX_DEGREE`].
pub fn rational(e: &Expr, params: &[f64]) -> Option<(Poly, Poly)> {
    ratio(e.node(), e, params)
}

fn constant(node: &Node, e: &Expr, params: &[f64]) -> Option<f64> {
    let v = Expr::from_node(node.clone(), e.var(), e.param_names()).value(0.0, params);
    v.is_finite().then_some(v)
}

fn ratio(node: &Node, e: &Expr, params: &[f64]) -> Option<Ratio> {
    if !node.depends_on_var() {
        return Some((vec![constant(node, e, params)?], vec![1.0]));
    }
    let r = match node {
        Node::Var => (vec![0.0, 1.0], vec![1.0]),
        Node::Neg(a) => {
            let (n, d) = ratio(a, e, params)?;
            (n.iter().map(|c| -c).collect(), d)
        }
        Node::Bin(op, a, b) => {
            if *op == BinOp::Pow {
                let k = constant(b, e, params)?;
                if k.fract() != 0.0 || k.abs() > MAX_DEGREE as f64 {
                    return None;
                }
                let (n, d) = ratio(a, e, params)?;
                let (mut pn, mut pd) = (vec![1.0], vec![1.0]);
                for _ in 0..(k.abs() as usize) {
                    pn = mul(&pn, &n);
                    pd = mul(&pd, &d);
                    if pn.len() > MAX_DEGREE + 1 || pd.len() > MAX_DEGREE + 1 {
                        return None;
                    }
                }
                return degree_ok(&if k < 0.0 { (pd, pn) } else { (pn, pd) });
            }
            let (an, ad) = ratio(a, e, params)?;
            let (bn, bd) = ratio(b, e, params)?;
            match op {
                BinOp::Add | BinOp::Sub => {
                    let s = if *op == BinOp::Add { 1.0 } else { -1.0 };
                    if ad == bd {
                        (add(&an, &bn, s), ad)
                    } else {
                        (add(&mul(&an, &bd), &mul(&bn, &ad), s), mul(&ad, &bd))
                    }
                }
                BinOp::Mul => (mul(&an, &bn), mul(&ad, &bd)),
                BinOp::Div => (mul(&an, &bd), mul(&ad, &bn)),
                BinOp::Pow => unreachable!("handled above"),
            }
        }
        Node::Call(..) | Node::Num(_) | Node::Pi | Node::Param(_) => return None,
    };
    degree_ok(&r)
}

/// p(x) and its derivatives up to order k, by Horner's scheme on the derivative polynomials.
fn eval_deriv(p: &[f64], x: f64, k: usize) -> f64 {
    let mut q: Vec<f64> = p.to_vec();
    for _ in 0..k {
        if q.len() <= 1 {
            return 0.0;
        }
        q = q.iter().enumerate().skip(1).map(|(i, c)| c * i as f64).collect();
    }
    q.iter().rev().fold(0.0, |acc, c| acc * x + c)
}

/// The real roots of a polynomial in [lo, hi] with their multiplicities, sorted: eigenvalues of the companion
/// matrix, clustered within `Tolerances::horizon.root_cluster` (a root of multiplicity k splits into k eigenvalues about
/// eps^(1/k) apart), kept when the cluster's mean is real to within the same tolerance, and polished by Newton's
/// method on the (k-1)-th derivative, for which the root is simple.
pub fn real_roots(p: &[f64], lo: f64, hi: f64) -> Vec<(f64, usize)> {
    let cluster = crate::tolerances::TOL.horizon.root_cluster;
    let p = trim(p.to_vec());
    let n = p.len() - 1;
    if n == 0 || p.iter().any(|c| !c.is_finite()) {
        return vec![];
    }
    // Roots at zero come out of the lowest coefficients directly.
    let zeros = p.iter().take_while(|c| **c == 0.0).count();
    let q: Vec<f64> = p[zeros..].to_vec();
    let m = q.len() - 1;
    let mut eig: Vec<(f64, f64)> = vec![];
    if m > 0 {
        let lead = q[m];
        let c = DMatrix::from_fn(m, m, |i, j| {
            if i == 0 {
                -q[m - 1 - j] / lead
            } else if i == j + 1 {
                1.0
            } else {
                0.0
            }
        });
        eig = c.complex_eigenvalues().iter().map(|z| (z.re, z.im)).collect();
    }
    eig.extend(std::iter::repeat((0.0, 0.0)).take(zeros));
    eig.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut used = vec![false; eig.len()];
    let mut out = vec![];
    for i in 0..eig.len() {
        if used[i] {
            continue;
        }
        let size = (eig[i].0.hypot(eig[i].1)).max(1e-300);
        let members: Vec<usize> = (i..eig.len())
            .filter(|&j| !used[j] && (eig[j].0 - eig[i].0).hypot(eig[j].1 - eig[i].1) <= cluster * size.max(1e-12))
            .collect();
        for &j in &members {
            used[j] = true;
        }
        let k = members.len();
        let re = members.iter().map(|&j| eig[j].0).sum::<f64>() / k as f64;
        let im = members.iter().map(|&j| eig[j].1).sum::<f64>() / k as f64;
        if im.abs() > cluster * re.abs().max(1e-300) {
            continue;
        }
        let mut x = re;
        for _ in 0..8 {
            let f = eval_deriv(&p, x, k - 1);
            let d = eval_deriv(&p, x, k);
            if d == 0.0 || !f.is_finite() || !d.is_finite() {
                break;
            }
            let dx = f / d;
            if !dx.is_finite() || dx.abs() > cluster * x.abs().max(1e-300) {
                break;
            }
            x -= dx;
            if dx.abs() <= 4.0 * f64::EPSILON * x.abs() {
                break;
            }
        }
        if x >= lo && x <= hi {
            out.push((x, k));
        }
    }
    out.sort_by(|a, b| a.0.total_cmp(&b.0));
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parse(src: &str, names: &[&str]) -> Expr {
        let names: Vec<String> = names.iter().map(|s| s.to_string()).collect();
        Expr::parse(src, "r", &names).unwrap()
    }

    #[test]
    fn extremal_reissner_nordstrom_has_an_exact_double_root() {
        // B = (1 - m/r)^2 = (r - m)^2 / r^2: a double root at r = m (common practice).
        let e = parse("(1 - m/r)^2", &["m"]);
        let (num, den) = rational(&e, &[1.3]).unwrap();
        assert_eq!(den.len(), 3);
        let roots = real_roots(&num, 1e-3, 1e3);
        assert_eq!(roots.len(), 1, "{roots:?}");
        assert_eq!(roots[0].1, 2);
        assert!((roots[0].0 - 1.3).abs() < 1e-14, "{}", roots[0].0);
    }

    #[test]
    fn reissner_nordstrom_and_schwarzschild_de_sitter_horizons() {
        // r_pm = m +- sqrt(m^2 - q^2) (textbook).
        let e = parse("1 - 2*m/r + q^2/r^2", &["m", "q"]);
        let (num, _) = rational(&e, &[1.0, 0.8]).unwrap();
        let roots = real_roots(&num, 1e-3, 1e3);
        assert_eq!(roots.len(), 2);
        assert!((roots[0].0 - 0.4).abs() < 1e-14 && (roots[1].0 - 1.6).abs() < 1e-14, "{roots:?}");
        // Schwarzschild-de Sitter, m = 1, L = 0.03: the cosmological horizon 8.788850662499728 from
        // tests/reference/shell_motion_reference.py (SymPy real_roots of r - 2m - L r^3/3).
        let e = parse("1 - 2*m/r - l*r^2/3", &["m", "l"]);
        let (num, _) = rational(&e, &[1.0, 0.03]).unwrap();
        let roots = real_roots(&num, 1e-3, 1e3);
        assert_eq!(roots.len(), 2, "{roots:?}");
        assert!((roots[1].0 - 8.788850662499728).abs() < 1e-12, "{roots:?}");
    }

    #[test]
    fn non_rational_functions_are_refused() {
        assert!(rational(&parse("1 - 2*m/r + exp(-r)", &["m"]), &[1.0]).is_none());
        assert!(rational(&parse("sqrt(1 - 2*m/r)", &["m"]), &[1.0]).is_none());
        assert!(rational(&parse("r^m", &["m"]), &[0.5]).is_none());
        // Functions of constants are fine.
        assert!(rational(&parse("1 - 2*exp(m)/r", &["m"]), &[0.0]).is_some());
    }
}
