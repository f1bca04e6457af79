//! Sparse multivariate polynomials with exact rational coefficients, and their greatest common divisor.
//!
//! A polynomial is a map from monomials (sorted `(variable, exponent)` lists) to non-zero `BigRational`
//! coefficients, so equal polynomials have equal representations and iteration order is deterministic.
//! The gcd is the classical recursive one (Knuth, TAOCP vol. 2, 4.6.1; Geddes, Czapor & Labahn 1992, ch. 7):
//! a polynomial in its largest variable x with coefficients in the other variables, content and primitive
//! part taken recursively, and Euclid's algorithm on primitive parts with pseudo-remainders (the primitive
//! polynomial remainder sequence).

use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};
use std::collections::{BTreeMap, BTreeSet};

/// An exact rational number.
pub type Q = BigRational;

/// A monomial: `(variable, exponent)` pairs, sorted by variable, exponents > 0.
pub type Mono = Vec<(usize, u32)>;

/// A polynomial: monomial -> non-zero coefficient.
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, Default)]
pub struct Poly {
    terms: BTreeMap<Mono, Q>,
}

fn mono_mul(a: &Mono, b: &Mono) -> Mono {
    let mut out = Vec::with_capacity(a.len() + b.len());
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        if j == b.len() || (i < a.len() && a[i].0 < b[j].0) {
            out.push(a[i]);
            i += 1;
        } else if i == a.len() || b[j].0 < a[i].0 {
            out.push(b[j]);
            j += 1;
        } else {
            out.push((a[i].0, a[i].1 + b[j].1));
            i += 1;
            j += 1;
        }
    }
    out
}

/// a / b if b divides a.
fn mono_div(a: &Mono, b: &Mono) -> Option<Mono> {
    let mut out = Vec::with_capacity(a.len());
    let mut j = 0;
    for &(v, e) in a {
        if j < b.len() && b[j].0 < v {
            return None;
        }
        if j < b.len() && b[j].0 == v {
            if b[j].1 > e {
                return None;
            }
            if e > b[j].1 {
                out.push((v, e - b[j].1));
            }
            j += 1;
        } else {
            out.push((v, e));
        }
    }
    (j == b.len()).then_some(out)
}

/// The exponent of `v` in a monomial.
pub fn mono_exp(m: &Mono, v: usize) -> u32 {
    m.iter().find(|(w, _)| *w == v).map(|(_, e)| *e).unwrap_or(0)
}

fn mono_without(m: &Mono, v: usize) -> Mono {
    m.iter().copied().filter(|(w, _)| *w != v).collect()
}

impl Poly {
    /// The zero polynomial.
    pub fn zero() -> Poly {
        Poly::default()
    }

    /// A constant.
    pub fn constant(c: Q) -> Poly {
        let mut p = Poly::zero();
        if !c.is_zero() {
            p.terms.insert(Vec::new(), c);
        }
        p
    }

    /// The constant 1.
    pub fn one() -> Poly {
        Poly::constant(Q::one())
    }

    /// An integer constant.
    pub fn int(n: i64) -> Poly {
        Poly::constant(Q::from_integer(BigInt::from(n)))
    }

    /// The monomial `c * m`.
    pub fn term(m: Mono, c: Q) -> Poly {
        let mut p = Poly::zero();
        if !c.is_zero() {
            p.terms.insert(m, c);
        }
        p
    }

    /// The variable `v`.
    pub fn var(v: usize) -> Poly {
        Poly::term(vec![(v, 1)], Q::one())
    }

    /// True for the zero polynomial.
    pub fn is_zero(&self) -> bool {
        self.terms.is_empty()
    }

    /// The value if the polynomial is a constant.
    pub fn as_constant(&self) -> Option<Q> {
        match self.terms.len() {
            0 => Some(Q::zero()),
            1 => self.terms.get(&Vec::new()).cloned(),
            _ => None,
        }
    }

    /// The terms, in monomial order.
    pub fn terms(&self) -> impl Iterator<Item = (&Mono, &Q)> {
        self.terms.iter()
    }

    /// Number of terms.
    pub fn len(&self) -> usize {
        self.terms.len()
    }

    /// True if there are no terms.
    pub fn is_empty(&self) -> bool {
        self.terms.is_empty()
    }

    fn add_term(&mut self, m: Mono, c: Q) {
        if c.is_zero() {
            return;
        }
        match self.terms.get_mut(&m) {
            Some(x) => {
                *x += c;
                if x.is_zero() {
                    self.terms.remove(&m);
                }
            }
            None => {
                self.terms.insert(m, c);
            }
        }
    }

    /// self + other.
    pub fn add(&self, other: &Poly) -> Poly {
        let mut out = self.clone();
        for (m, c) in &other.terms {
            out.add_term(m.clone(), c.clone());
        }
        out
    }

    /// self - other.
    pub fn sub(&self, other: &Poly) -> Poly {
        let mut out = self.clone();
        for (m, c) in &other.terms {
            out.add_term(m.clone(), -c.clone());
        }
        out
    }

    /// -self.
    pub fn neg(&self) -> Poly {
        Poly { terms: self.terms.iter().map(|(m, c)| (m.clone(), -c.clone())).collect() }
    }

    /// self * other.
    pub fn mul(&self, other: &Poly) -> Poly {
        let mut out = Poly::zero();
        for (ma, ca) in &self.terms {
            for (mb, cb) in &other.terms {
                out.add_term(mono_mul(ma, mb), ca * cb);
            }
        }
        out
    }

    /// c * self.
    pub fn scale(&self, c: &Q) -> Poly {
        if c.is_zero() {
            return Poly::zero();
        }
        Poly { terms: self.terms.iter().map(|(m, x)| (m.clone(), x * c)).collect() }
    }

    /// self * m.
    pub fn mul_mono(&self, m: &Mono) -> Poly {
        Poly { terms: self.terms.iter().map(|(k, c)| (mono_mul(k, m), c.clone())).collect() }
    }

    /// self^k.
    pub fn pow(&self, k: u32) -> Poly {
        let mut out = Poly::one();
        let mut base = self.clone();
        let mut k = k;
        while k > 0 {
            if k & 1 == 1 {
                out = out.mul(&base);
            }
            k >>= 1;
            if k > 0 {
                base = base.mul(&base);
            }
        }
        out
    }

    /// Every variable that occurs.
    pub fn vars(&self) -> BTreeSet<usize> {
        self.terms.keys().flat_map(|m| m.iter().map(|(v, _)| *v)).collect()
    }

    /// True if variable `v` occurs.
    pub fn has(&self, v: usize) -> bool {
        self.terms.keys().any(|m| m.iter().any(|(w, _)| *w == v))
    }

    /// The degree in `v`.
    pub fn degree(&self, v: usize) -> u32 {
        self.terms.keys().map(|m| mono_exp(m, v)).max().unwrap_or(0)
    }

    /// The coefficients of the powers of `v` (index = exponent), each free of `v`.
    pub fn coeffs_in(&self, v: usize) -> Vec<Poly> {
        let mut out = vec![Poly::zero(); self.degree(v) as usize + 1];
        for (m, c) in &self.terms {
            out[mono_exp(m, v) as usize].add_term(mono_without(m, v), c.clone());
        }
        out
    }

    /// The coefficient of v^k (free of v).
    pub fn coeff_of(&self, v: usize, k: u32) -> Poly {
        let mut out = Poly::zero();
        for (m, c) in &self.terms {
            if mono_exp(m, v) == k {
                out.add_term(mono_without(m, v), c.clone());
            }
        }
        out
    }

    /// The partial derivative with respect to `v`.
    pub fn partial(&self, v: usize) -> Poly {
        let mut out = Poly::zero();
        for (m, c) in &self.terms {
            let e = mono_exp(m, v);
            if e == 0 {
                continue;
            }
            let mut nm = mono_without(m, v);
            if e > 1 {
                nm.push((v, e - 1));
                nm.sort_unstable();
            }
            out.add_term(nm, c * Q::from_integer(BigInt::from(e)));
        }
        out
    }

    /// The largest monomial dividing every term (the monomial content).
    pub fn mono_content(&self) -> Mono {
        let mut it = self.terms.keys();
        let Some(first) = it.next() else { return Vec::new() };
        let mut g: Mono = first.clone();
        for m in it {
            g = g
                .iter()
                .filter_map(|&(v, e)| {
                    let f = mono_exp(m, v).min(e);
                    (f > 0).then_some((v, f))
                })
                .collect();
            if g.is_empty() {
                break;
            }
        }
        g
    }

    /// Divide every term by the monomial `m` (which must divide them all).
    pub fn div_mono(&self, m: &Mono) -> Poly {
        Poly {
            terms: self
                .terms
                .iter()
                .map(|(k, c)| (mono_div(k, m).expect("monomial divides every term"), c.clone()))
                .collect(),
        }
    }

    /// The leading coefficient in the storage order (the coefficient of the largest monomial).
    pub fn lead(&self) -> Option<&Q> {
        self.terms.values().next_back()
    }

    /// The rational content: the positive-or-negative rational c with self / c having coprime integer
    /// coefficients and a positive leading coefficient. Zero for the zero polynomial.
    pub fn rational_content(&self) -> Q {
        if self.is_zero() {
            return Q::zero();
        }
        let mut num_gcd = BigInt::zero();
        let mut den_lcm = BigInt::one();
        for c in self.terms.values() {
            num_gcd = num_gcd.gcd(c.numer());
            den_lcm = den_lcm.lcm(c.denom());
        }
        let c = Q::new(num_gcd, den_lcm);
        if self.lead().is_some_and(|l| l.is_negative()) {
            -c
        } else {
            c
        }
    }

    /// self with its rational content divided out (coprime integers, positive leading coefficient).
    pub fn primitive(&self) -> Poly {
        if self.is_zero() {
            return Poly::zero();
        }
        let c = self.rational_content();
        self.scale(&(Q::one() / c))
    }

    /// Substitute a polynomial for a variable.
    pub fn substitute(&self, v: usize, value: &Poly) -> Poly {
        let coeffs = self.coeffs_in(v);
        let mut out = Poly::zero();
        let mut pw = Poly::one();
        for (k, c) in coeffs.iter().enumerate() {
            if k > 0 {
                pw = pw.mul(value);
            }
            if !c.is_zero() {
                out = out.add(&c.mul(&pw));
            }
        }
        out
    }

    /// self / q if q divides self exactly, else None.
    pub fn div_exact(&self, q: &Poly) -> Option<Poly> {
        if q.is_zero() {
            return None;
        }
        if self.is_zero() {
            return Some(Poly::zero());
        }
        if let Some(c) = q.as_constant() {
            return Some(self.scale(&(Q::one() / c)));
        }
        if q.terms.len() == 1 {
            let (m, c) = q.terms.iter().next().expect("one term");
            let inv = Q::one() / c;
            let mut out = Poly::zero();
            for (k, x) in &self.terms {
                out.terms.insert(mono_div(k, m)?, x * &inv);
            }
            return Some(out);
        }
        let x = *q.vars().iter().next_back().expect("non-constant");
        let n = q.degree(x);
        let lq = q.coeff_of(x, n);
        let mut r = self.clone();
        let mut quo = Poly::zero();
        while !r.is_zero() {
            let d = r.degree(x);
            if d < n {
                return None;
            }
            let t = r.coeff_of(x, d).div_exact(&lq)?;
            let t = if d > n { t.mul_mono(&vec![(x, d - n)]) } else { t };
            r = r.sub(&t.mul(q));
            quo = quo.add(&t);
        }
        Some(quo)
    }

    /// Pseudo-remainder of self by q in the variable x (q must contain x).
    fn prem(&self, q: &Poly, x: usize) -> Poly {
        let n = q.degree(x);
        let lq = q.coeff_of(x, n);
        let mut r = self.clone();
        while !r.is_zero() && r.degree(x) >= n {
            let d = r.degree(x);
            let lr = r.coeff_of(x, d);
            let shifted = if d > n { q.mul_mono(&vec![(x, d - n)]) } else { q.clone() };
            r = r.mul(&lq).sub(&lr.mul(&shifted));
        }
        r
    }

    /// The content in x: the gcd of the coefficients of the powers of x.
    fn content_in(&self, x: usize) -> Poly {
        let mut g = Poly::zero();
        for c in self.coeffs_in(x) {
            if c.is_zero() {
                continue;
            }
            g = gcd(&g, &c);
            if g.as_constant().is_some() {
                return Poly::one();
            }
        }
        g
    }
}

/// The greatest common divisor, normalised to coprime integer coefficients and a positive leading
/// coefficient (gcd(0, 0) = 0; a non-zero constant gcd is 1).
pub fn gcd(p: &Poly, q: &Poly) -> Poly {
    if p.is_zero() {
        return q.primitive();
    }
    if q.is_zero() {
        return p.primitive();
    }
    if p.as_constant().is_some() || q.as_constant().is_some() {
        return Poly::one();
    }
    // Monomials: their gcd is the common monomial content.
    if p.len() == 1 || q.len() == 1 {
        let mp = p.mono_content();
        let mq = q.mono_content();
        let g: Mono = mp
            .iter()
            .filter_map(|&(v, e)| {
                let f = mono_exp(&mq, v).min(e);
                (f > 0).then_some((v, f))
            })
            .collect();
        return Poly::term(g, Q::one());
    }
    let vars: BTreeSet<usize> = p.vars().union(&q.vars()).copied().collect();
    let x = *vars.iter().next_back().expect("non-constant");
    if !p.has(x) {
        return gcd(p, &q.content_in(x));
    }
    if !q.has(x) {
        return gcd(&p.content_in(x), q);
    }
    let cp = p.content_in(x);
    let cq = q.content_in(x);
    let c = gcd(&cp, &cq);
    if coprime_in_image(p, q, x) {
        return c;
    }
    let mut a = p.div_exact(&cp).expect("content divides");
    let mut b = q.div_exact(&cq).expect("content divides");
    if a.degree(x) < b.degree(x) {
        std::mem::swap(&mut a, &mut b);
    }
    while !b.is_zero() && b.has(x) {
        let r = a.prem(&b, x);
        a = b;
        b = if r.is_zero() { r } else { primitive_in(&r, x) };
    }
    // b is zero (a is the gcd) or free of x (the primitive parts are coprime in x).
    let g = if b.is_zero() { primitive_in(&a, x) } else { Poly::one() };
    c.mul(&g).primitive()
}

/// The Mersenne prime 2^61 - 1 of the modular images.
const P61: u64 = (1 << 61) - 1;

fn mulmod(a: u64, b: u64) -> u64 {
    ((a as u128 * b as u128) % P61 as u128) as u64
}

fn powmod(mut b: u64, mut e: u64) -> u64 {
    let mut r = 1u64;
    while e > 0 {
        if e & 1 == 1 {
            r = mulmod(r, b);
        }
        b = mulmod(b, b);
        e >>= 1;
    }
    r
}

fn q_mod(c: &Q) -> Option<u64> {
    let m = BigInt::from(P61);
    let n = (c.numer() % &m + &m) % &m;
    let d = (c.denom() % &m + &m) % &m;
    let (n, d) = (n.to_u64_digits().1.first().copied().unwrap_or(0), d.to_u64_digits().1.first().copied().unwrap_or(0));
    (d != 0).then(|| mulmod(n, powmod(d, P61 - 2)))
}

/// The univariate image mod 2^61 - 1 of p in x, the other variables replaced by fixed pseudo-random values.
fn image(p: &Poly, x: usize) -> Option<Vec<u64>> {
    let mut out = vec![0u64; p.degree(x) as usize + 1];
    for (m, c) in &p.terms {
        let mut t = q_mod(c)?;
        let mut k = 0;
        for &(v, e) in m {
            if v == x {
                k = e as usize;
            } else {
                let val = (0x9e37_79b9_7f4a_7c15u64.wrapping_mul(v as u64 + 1) >> 5) % P61;
                t = mulmod(t, powmod(val, u64::from(e)));
            }
        }
        out[k] = (out[k] + t) % P61;
    }
    Some(out)
}

fn trim(v: &mut Vec<u64>) {
    while v.len() > 1 && *v.last().unwrap() == 0 {
        v.pop();
    }
}

/// True if the images of p and q (both containing x) keep their degrees in x and have a constant gcd mod
/// the prime: then gcd(p, q) has degree 0 in x (the image of the true gcd divides the gcd of the images).
fn coprime_in_image(p: &Poly, q: &Poly, x: usize) -> bool {
    let (Some(mut a), Some(mut b)) = (image(p, x), image(q, x)) else { return false };
    if *a.last().unwrap() == 0 || *b.last().unwrap() == 0 {
        return false;
    }
    // Euclid mod the prime.
    loop {
        trim(&mut a);
        trim(&mut b);
        if b.len() == 1 {
            return b[0] != 0;
        }
        if a.len() < b.len() {
            std::mem::swap(&mut a, &mut b);
            continue;
        }
        let inv = powmod(*b.last().unwrap(), P61 - 2);
        while a.len() >= b.len() && !(a.len() == 1 && a[0] == 0) {
            let f = mulmod(*a.last().unwrap(), inv);
            let shift = a.len() - b.len();
            for (i, bi) in b.iter().enumerate() {
                a[i + shift] = (a[i + shift] + P61 - mulmod(f, *bi)) % P61;
            }
            a.pop();
            trim(&mut a);
            if a.len() == 1 && a[0] == 0 {
                break;
            }
        }
        if a.len() == 1 && a[0] == 0 {
            return false;
        }
        std::mem::swap(&mut a, &mut b);
    }
}

fn primitive_in(p: &Poly, x: usize) -> Poly {
    let c = p.content_in(x);
    p.div_exact(&c).expect("content divides").primitive()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn v(i: usize) -> Poly {
        Poly::var(i)
    }

    #[test]
    fn gcd_of_products_recovers_the_common_factor() {
        // (x - 2y)(x + y^2 z) and (x - 2y)(3x - z): gcd x - 2y (common practice: by construction).
        let f = v(0).sub(&v(1).scale(&Q::from_integer(2.into())));
        let g1 = v(0).add(&v(1).pow(2).mul(&v(2)));
        let g2 = v(0).scale(&Q::from_integer(3.into())).sub(&v(2));
        let g = gcd(&f.mul(&g1), &f.mul(&g2));
        assert_eq!(g, f.primitive());
        let q = f.mul(&g1).div_exact(&g).unwrap();
        assert_eq!(q.primitive(), g1.primitive());
        assert!(g1.div_exact(&g2).is_none());
    }

    #[test]
    fn gcd_with_multiplicity_and_content() {
        let f = v(0).add(&Poly::one());
        let a = f.pow(3).mul(&v(1)).scale(&Q::new(6.into(), 5.into()));
        let b = f.pow(2).mul(&v(1).pow(2)).scale(&Q::from_integer(4.into()));
        assert_eq!(gcd(&a, &b), f.pow(2).mul(&v(1)));
    }
}
