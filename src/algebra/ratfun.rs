//! Rational functions over the atoms of one algebra context, with a normal form.
//!
//! Normal form of `num/den` (what [`Alg::normal`] returns):
//! - every square-root atom appears at most linearly (s^2 is replaced by its radicand);
//! - the denominator is free of square-root atoms (rationalised by the conjugate, one atom at a time);
//! - numerator and denominator have no common factor (polynomial gcd, see [`super::poly::gcd`]);
//! - the denominator has coprime integer coefficients and a positive leading coefficient.
//!
//! With algebraically independent square roots (distinct radicands that are not squares of each other) this
//! form is unique, so a quantity is zero exactly when its numerator is.

use super::poly::{gcd, Poly, Q};
use crate::expr::Func;
use num_bigint::BigInt;
use num_traits::{FromPrimitive, One, Signed, ToPrimitive, Zero};
use twofloat::TwoFloat;

/// A rational function: numerator and denominator polynomials in the atoms.
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct RatFun {
    /// Numerator.
    pub num: Poly,
    /// Denominator.
    pub den: Poly,
}

impl RatFun {
    /// A polynomial as a rational function.
    pub fn poly(p: Poly) -> RatFun {
        RatFun { num: p, den: Poly::one() }
    }

    /// A rational constant.
    pub fn constant(q: Q) -> RatFun {
        RatFun::poly(Poly::constant(q))
    }

    /// An integer constant.
    pub fn int(n: i64) -> RatFun {
        RatFun::poly(Poly::int(n))
    }

    /// n/d as a constant.
    pub fn frac(n: i64, d: i64) -> RatFun {
        RatFun::constant(Q::new(BigInt::from(n), BigInt::from(d)))
    }

    /// True if zero.
    pub fn is_zero(&self) -> bool {
        self.num.is_zero()
    }

    /// The value if constant.
    pub fn as_constant(&self) -> Option<Q> {
        Some(self.num.as_constant()? / self.den.as_constant()?)
    }
}

/// What an atom stands for.
#[derive(Clone, Debug, PartialEq)]
pub enum AtomKind {
    /// The radius (the variable of A and B), printed as the context's radius name.
    Radius,
    /// A scenario parameter, by index.
    Param(usize),
    /// The constant pi.
    Pi,
    /// An independent symbol (Rdot, Rddot, sigma, beta^2, ...): (text name, LaTeX, SymPy name).
    Symbol(String, String, String),
    /// The positive square root of a rational function of earlier atoms.
    Sqrt(RatFun),
    /// A function of a rational function of earlier atoms (exp, log, sin, ...; never sqrt).
    Func(Func, RatFun),
    /// base^exponent for a non-integer, non-half-integer exponent.
    Pow(RatFun, RatFun),
}

/// The algebra context: the atom table (index = variable number of the polynomials).
#[derive(Clone, Debug)]
pub struct Alg {
    atoms: Vec<AtomKind>,
    /// Parameter names, in scenario order.
    pub param_names: Vec<String>,
}

/// Variable number of the radius.
pub const RADIUS: usize = 0;

impl Alg {
    /// A context with the radius, the parameters and pi as its first atoms.
    pub fn new(param_names: &[String]) -> Alg {
        let mut atoms = vec![AtomKind::Radius];
        atoms.extend((0..param_names.len()).map(AtomKind::Param));
        atoms.push(AtomKind::Pi);
        Alg { atoms, param_names: param_names.to_vec() }
    }

    /// The atom table.
    pub fn atoms(&self) -> &[AtomKind] {
        &self.atoms
    }

    /// What atom `v` is.
    pub fn atom(&self, v: usize) -> &AtomKind {
        &self.atoms[v]
    }

    fn intern(&mut self, kind: AtomKind) -> usize {
        if let Some(i) = self.atoms.iter().position(|k| *k == kind) {
            return i;
        }
        self.atoms.push(kind);
        self.atoms.len() - 1
    }

    /// The radius as a rational function.
    pub fn radius(&self) -> RatFun {
        RatFun::poly(Poly::var(RADIUS))
    }

    /// Parameter `k`.
    pub fn param(&self, k: usize) -> RatFun {
        RatFun::poly(Poly::var(1 + k))
    }

    /// pi.
    pub fn pi(&self) -> RatFun {
        RatFun::poly(Poly::var(1 + self.param_names.len()))
    }

    /// An independent symbol (created on first use).
    pub fn symbol(&mut self, text: &str, latex: &str, sympy: &str) -> RatFun {
        let v = self.intern(AtomKind::Symbol(text.into(), latex.into(), sympy.into()));
        RatFun::poly(Poly::var(v))
    }

    /// Put a pair into normal form (module docs).
    pub fn normal(&self, num: Poly, den: Poly) -> RatFun {
        assert!(!den.is_zero(), "denominator is zero");
        let (mut num, mut den) = (num, den);
        // Reduce squares of square roots, then rationalise the denominator, until neither applies.
        loop {
            let (n2, d2) = self.reduce_squares(num, den);
            num = n2;
            den = d2;
            let Some(s) = self.sqrt_in(&den) else { break };
            let d0 = den.coeff_of(s, 0);
            let d1 = den.coeff_of(s, 1);
            // den = d0 + d1 s: multiply by s if d0 = 0, else by the conjugate d0 - d1 s.
            let conj = if d0.is_zero() { Poly::var(s) } else { d0.sub(&d1.mul(&Poly::var(s))) };
            num = num.mul(&conj);
            den = den.mul(&conj);
        }
        if num.is_zero() {
            return RatFun { num, den: Poly::one() };
        }
        let g = gcd(&num, &den);
        if g.as_constant().is_none() {
            num = num.div_exact(&g).expect("gcd divides");
            den = den.div_exact(&g).expect("gcd divides");
        }
        let c = den.rational_content();
        let inv = Q::one() / c;
        RatFun { num: num.scale(&inv), den: den.scale(&inv) }
    }

    fn is_sqrt(&self, v: usize) -> bool {
        matches!(self.atoms[v], AtomKind::Sqrt(_))
    }

    /// The largest square-root atom in p, if any.
    fn sqrt_in(&self, p: &Poly) -> Option<usize> {
        p.vars().into_iter().rev().find(|&v| self.is_sqrt(v))
    }

    /// Replace s^k (k >= 2) by radicand^(k div 2) s^(k mod 2) in num and den, clearing the radicand's
    /// denominator into the other polynomial.
    fn reduce_squares(&self, mut num: Poly, mut den: Poly) -> (Poly, Poly) {
        loop {
            let all: std::collections::BTreeSet<usize> = num.vars().union(&den.vars()).copied().collect();
            let target = all.into_iter().rev().find(|&v| self.is_sqrt(v) && (num.degree(v) >= 2 || den.degree(v) >= 2));
            let Some(s) = target else { return (num, den) };
            let AtomKind::Sqrt(rad) = &self.atoms[s] else { unreachable!() };
            let (n1, jn) = reduce_poly(&num, s, rad);
            let (d1, jd) = reduce_poly(&den, s, rad);
            // num/den = (n1 / rd^jn) / (d1 / rd^jd)
            num = n1.mul(&rad.den.pow(jd));
            den = d1.mul(&rad.den.pow(jn));
        }
    }

    /// x + y.
    pub fn add(&self, x: &RatFun, y: &RatFun) -> RatFun {
        if x.is_zero() {
            return y.clone();
        }
        if y.is_zero() {
            return x.clone();
        }
        if x.den == y.den {
            return self.normal(x.num.add(&y.num), x.den.clone());
        }
        let g = gcd(&x.den, &y.den);
        let xd = x.den.div_exact(&g).expect("gcd divides");
        let yd = y.den.div_exact(&g).expect("gcd divides");
        self.normal(x.num.mul(&yd).add(&y.num.mul(&xd)), x.den.mul(&yd))
    }

    /// x - y.
    pub fn sub(&self, x: &RatFun, y: &RatFun) -> RatFun {
        self.add(x, &self.neg(y))
    }

    /// -x.
    pub fn neg(&self, x: &RatFun) -> RatFun {
        RatFun { num: x.num.neg(), den: x.den.clone() }
    }

    /// x * y.
    pub fn mul(&self, x: &RatFun, y: &RatFun) -> RatFun {
        if x.is_zero() || y.is_zero() {
            return RatFun::int(0);
        }
        // Cross-cancel first to keep the products small.
        let g1 = gcd(&x.num, &y.den);
        let g2 = gcd(&y.num, &x.den);
        let xn = x.num.div_exact(&g1).expect("gcd divides");
        let yd = y.den.div_exact(&g1).expect("gcd divides");
        let yn = y.num.div_exact(&g2).expect("gcd divides");
        let xd = x.den.div_exact(&g2).expect("gcd divides");
        self.normal(xn.mul(&yn), xd.mul(&yd))
    }

    /// c * x for a rational c.
    pub fn scale(&self, x: &RatFun, c: &Q) -> RatFun {
        self.mul(x, &RatFun::constant(c.clone()))
    }

    /// x / y (y must be non-zero).
    pub fn div(&self, x: &RatFun, y: &RatFun) -> RatFun {
        assert!(!y.is_zero(), "division by zero");
        self.mul(x, &RatFun { num: y.den.clone(), den: y.num.clone() })
    }

    /// x^k for an integer k (x non-zero when k < 0).
    pub fn powi(&self, x: &RatFun, k: i32) -> RatFun {
        if k < 0 {
            return self.div(&RatFun::int(1), &self.powi(x, -k));
        }
        let mut out = RatFun::int(1);
        for _ in 0..k {
            out = self.mul(&out, x);
        }
        out
    }

    /// The positive square root of x, as an atom (exact for squares of rational constants).
    pub fn sqrt(&mut self, x: &RatFun) -> RatFun {
        if x.is_zero() {
            return RatFun::int(0);
        }
        if let Some(c) = x.as_constant() {
            if let (Some(n), Some(d)) = (isqrt(c.numer()), isqrt(c.denom())) {
                if !c.is_negative() {
                    return RatFun::constant(Q::new(n, d));
                }
            }
        }
        let v = self.intern(AtomKind::Sqrt(x.clone()));
        RatFun::poly(Poly::var(v))
    }

    /// f(x) for a built-in function; sqrt becomes a square-root atom, functions of constants that are exact
    /// (exp(0), log(1), sin(0), ...) are evaluated.
    pub fn func(&mut self, f: Func, x: &RatFun) -> RatFun {
        if f == Func::Sqrt {
            return self.sqrt(x);
        }
        if let Some(c) = x.as_constant() {
            if c.is_zero() {
                match f {
                    Func::Exp | Func::Cos | Func::Cosh => return RatFun::int(1),
                    Func::Sin | Func::Tan | Func::Sinh | Func::Tanh | Func::Abs => return RatFun::int(0),
                    Func::Sign => return RatFun::int(1),
                    _ => {}
                }
            }
            if c.is_one() && f == Func::Log {
                return RatFun::int(0);
            }
            if matches!(f, Func::Abs | Func::Sign) {
                let neg = c.is_negative();
                return match (f, neg) {
                    (Func::Abs, true) => RatFun::constant(-c),
                    (Func::Abs, false) => RatFun::constant(c),
                    (_, true) => RatFun::int(-1),
                    _ => RatFun::int(1),
                };
            }
        }
        let v = self.intern(AtomKind::Func(f, x.clone()));
        RatFun::poly(Poly::var(v))
    }

    /// base^exponent for a general exponent: integer exponents exactly, half-integers through a square-root
    /// atom, anything else as a power atom.
    pub fn pow(&mut self, base: &RatFun, exponent: &RatFun) -> RatFun {
        if let Some(e) = exponent.as_constant() {
            if e.is_integer() {
                if let Some(k) = e.to_integer().to_i32() {
                    return self.powi(base, k);
                }
            }
            let twice = &e * Q::from_integer(BigInt::from(2));
            if twice.is_integer() {
                if let Some(k) = twice.to_integer().to_i32() {
                    let s = self.sqrt(base);
                    return self.powi(&s, k);
                }
            }
        }
        let v = self.intern(AtomKind::Pow(base.clone(), exponent.clone()));
        RatFun::poly(Poly::var(v))
    }

    /// The derivative of atom `v` with respect to the radius (zero for parameters, pi and symbols).
    fn atom_derivative(&mut self, v: usize) -> RatFun {
        match self.atoms[v].clone() {
            AtomKind::Radius => RatFun::int(1),
            AtomKind::Param(_) | AtomKind::Pi | AtomKind::Symbol(..) => RatFun::int(0),
            AtomKind::Sqrt(rad) => {
                // (sqrt u)' = u' / (2 sqrt u)
                let du = self.derivative(&rad);
                let s = RatFun::poly(Poly::var(v));
                let den = self.scale(&s, &Q::from_integer(BigInt::from(2)));
                self.div(&du, &den)
            }
            AtomKind::Func(f, u) => {
                let du = self.derivative(&u);
                if du.is_zero() {
                    return du;
                }
                let me = RatFun::poly(Poly::var(v));
                let outer = match f {
                    Func::Exp => me,
                    Func::Log => self.div(&RatFun::int(1), &u),
                    Func::Sin => self.func(Func::Cos, &u),
                    Func::Cos => {
                        let s = self.func(Func::Sin, &u);
                        self.neg(&s)
                    }
                    Func::Tan => self.add(&RatFun::int(1), &self.mul(&me, &me)),
                    Func::Sinh => self.func(Func::Cosh, &u),
                    Func::Cosh => self.func(Func::Sinh, &u),
                    Func::Tanh => self.sub(&RatFun::int(1), &self.mul(&me, &me)),
                    Func::Abs => self.func(Func::Sign, &u),
                    Func::Sign => RatFun::int(0),
                    Func::Sqrt => unreachable!("sqrt is a Sqrt atom"),
                };
                self.mul(&outer, &du)
            }
            AtomKind::Pow(b, e) => {
                // (b^e)' = b^e (e' log b + e b'/b)
                let me = RatFun::poly(Poly::var(v));
                let db = self.derivative(&b);
                let de = self.derivative(&e);
                let lb = if de.is_zero() { RatFun::int(0) } else { self.func(Func::Log, &b) };
                let t1 = self.mul(&de, &lb);
                let t2 = self.div(&self.mul(&e, &db), &b);
                self.mul(&me, &self.add(&t1, &t2))
            }
        }
    }

    fn poly_derivative(&mut self, p: &Poly) -> RatFun {
        let mut out = RatFun::int(0);
        for v in p.vars() {
            let dv = self.atom_derivative(v);
            if dv.is_zero() {
                continue;
            }
            let part = RatFun::poly(p.partial(v));
            out = self.add(&out, &self.mul(&part, &dv));
        }
        out
    }

    /// d/d(radius) of x (quotient rule, chain rule through every atom).
    pub fn derivative(&mut self, x: &RatFun) -> RatFun {
        let dn = self.poly_derivative(&x.num);
        if x.den.as_constant().is_some() {
            return self.div(&dn, &RatFun::poly(x.den.clone()));
        }
        let dd = self.poly_derivative(&x.den);
        let n = RatFun::poly(x.num.clone());
        let d = RatFun::poly(x.den.clone());
        let top = self.sub(&self.mul(&dn, &d), &self.mul(&n, &dd));
        self.div(&top, &self.mul(&d, &d))
    }

    /// Values of every atom, given the radius, the parameters and the symbols (by text name); computed in
    /// double-double arithmetic. None if a symbol has no value.
    pub fn atom_values(&self, radius: f64, params: &[f64], symbols: &[(&str, f64)]) -> Option<Vec<TwoFloat>> {
        let mut vals: Vec<TwoFloat> = Vec::with_capacity(self.atoms.len());
        for k in &self.atoms {
            let x = match k {
                AtomKind::Radius => TwoFloat::from(radius),
                AtomKind::Param(i) => TwoFloat::from(params[*i]),
                AtomKind::Pi => twofloat::consts::PI,
                AtomKind::Symbol(name, ..) => TwoFloat::from(symbols.iter().find(|(n, _)| n == name)?.1),
                AtomKind::Sqrt(r) => eval_with(r, &vals).sqrt(),
                AtomKind::Func(f, u) => {
                    let x = eval_with(u, &vals);
                    match f {
                        Func::Exp => x.exp(),
                        Func::Log => x.ln(),
                        Func::Sin => x.sin(),
                        Func::Cos => x.cos(),
                        Func::Tan => x.tan(),
                        Func::Sinh => x.sinh(),
                        Func::Cosh => x.cosh(),
                        Func::Tanh => x.tanh(),
                        Func::Abs => x.abs(),
                        Func::Sign => TwoFloat::from(if x.hi() < 0.0 { -1.0 } else { 1.0 }),
                        Func::Sqrt => x.sqrt(),
                    }
                }
                AtomKind::Pow(b, e) => {
                    let b = eval_with(b, &vals);
                    let e = eval_with(e, &vals);
                    (e * b.ln()).exp()
                }
            };
            vals.push(x);
        }
        Some(vals)
    }

    /// Value of x at the given atom values.
    pub fn eval(&self, x: &RatFun, vals: &[TwoFloat]) -> f64 {
        eval_with(x, vals).hi()
    }
}

fn eval_poly(p: &Poly, vals: &[TwoFloat]) -> TwoFloat {
    let mut sum = TwoFloat::from(0.0);
    for (m, c) in p.terms() {
        let mut t = q_to_two(c);
        for &(v, e) in m {
            for _ in 0..e {
                t *= vals[v];
            }
        }
        sum += t;
    }
    sum
}

fn eval_with(x: &RatFun, vals: &[TwoFloat]) -> TwoFloat {
    eval_poly(&x.num, vals) / eval_poly(&x.den, vals)
}

fn q_to_two(c: &Q) -> TwoFloat {
    let n = big_to_two(c.numer());
    let d = big_to_two(c.denom());
    n / d
}

fn big_to_two(b: &BigInt) -> TwoFloat {
    let hi = b.to_f64().unwrap_or(f64::NAN);
    let rest = b - BigInt::from_f64(hi).unwrap_or_default();
    TwoFloat::new_add(hi, rest.to_f64().unwrap_or(0.0))
}

/// Exact integer square root if n is a perfect square.
fn isqrt(n: &BigInt) -> Option<BigInt> {
    if n.is_negative() {
        return None;
    }
    let r = n.sqrt();
    (&r * &r == *n).then_some(r)
}

/// Reduce the powers of s (>= 2) in p with s^2 = rad.num / rad.den: returns (p', j) with p = p' / rad.den^j.
fn reduce_poly(p: &Poly, s: usize, rad: &RatFun) -> (Poly, u32) {
    let coeffs = p.coeffs_in(s);
    let j = (coeffs.len().saturating_sub(1) / 2) as u32;
    let mut out = Poly::zero();
    for (k, c) in coeffs.iter().enumerate() {
        if c.is_zero() {
            continue;
        }
        let half = (k / 2) as u32;
        let odd = k % 2 == 1;
        let mut t = c.mul(&rad.num.pow(half)).mul(&rad.den.pow(j - half));
        if odd {
            t = t.mul_mono(&vec![(s, 1)]);
        }
        out = out.add(&t);
    }
    (out, j)
}
