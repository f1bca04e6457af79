//! From a normal-form rational function to a readable display tree, choosing the shortest of a few
//! equivalent layouts.
//!
//! Layouts tried for `num/den` (the one with the fewest operators wins; ties go to the earlier one):
//! 1. a sum of terms over a monomial denominator, term by term (`1 - 2m/a`), when the denominator is a monomial;
//! 2. one fraction `c m F1^k1 F2^k2 ... / (c' m' G1 ...)`: rational content and monomial content pulled out,
//!    and the polynomial parts split into factors by trial division by the metric's own factors (the
//!    `pool`: numerators and denominators of A and B) and by linear factors `u a - v` in the radius with
//!    monomial u, v (rational-root test on the leading and trailing coefficients).
//!
//! Inside a sum, terms that share the same square-root/function atoms are grouped:
//! `sqrt(B) (a - m) + ...` instead of `a sqrt(B) - m sqrt(B) + ...`.

use super::poly::{gcd, mono_exp, Mono, Poly, Q};
use super::ratfun::{Alg, AtomKind, RatFun, RADIUS};
use crate::expr::Func;
use num_bigint::BigInt;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// A display tree: what the printers render.
#[derive(Clone, Debug, PartialEq)]
pub enum Disp {
    /// A non-negative integer.
    Int(BigInt),
    /// The radius, a parameter, pi or a symbol (atom index).
    Sym(usize),
    /// sqrt(x).
    Sqrt(Box<Disp>),
    /// f(x).
    Func(Func, Box<Disp>),
    /// base^exponent with a general exponent.
    PowGen(Box<Disp>, Box<Disp>),
    /// x^k, k >= 2.
    Pow(Box<Disp>, u32),
    /// An implicit product (at least two factors).
    Prod(Vec<Disp>),
    /// numerator / denominator.
    Frac(Box<Disp>, Box<Disp>),
    /// A sum: (negative?, term) with the first term possibly negative.
    Sum(Vec<(bool, Disp)>),
    /// -x.
    Neg(Box<Disp>),
}

impl Disp {
    /// Number of operators (binary operators, unary minus, function applications, powers).
    pub fn ops(&self) -> usize {
        match self {
            Disp::Int(_) | Disp::Sym(_) => 0,
            Disp::Sqrt(x) | Disp::Func(_, x) | Disp::Neg(x) => 1 + x.ops(),
            Disp::Pow(x, _) => 1 + x.ops(),
            Disp::PowGen(x, y) | Disp::Frac(x, y) => 1 + x.ops() + y.ops(),
            Disp::Prod(v) => v.len() - 1 + v.iter().map(Disp::ops).sum::<usize>(),
            Disp::Sum(v) => {
                v.len() - 1 + usize::from(v.first().is_some_and(|t| t.0)) + v.iter().map(|t| t.1.ops()).sum::<usize>()
            }
        }
    }
}

/// Turns rational functions of one context into display trees.
pub struct Shower<'a> {
    alg: &'a Alg,
    pool: Vec<Poly>,
}

fn prod(mut v: Vec<Disp>) -> Disp {
    v.retain(|d| *d != Disp::Int(BigInt::one()));
    match v.len() {
        0 => Disp::Int(BigInt::one()),
        1 => v.pop().expect("one"),
        _ => Disp::Prod(v),
    }
}

fn neg_if(neg: bool, d: Disp) -> Disp {
    if neg {
        match d {
            Disp::Neg(x) => *x,
            Disp::Sum(mut v) => {
                for t in v.iter_mut() {
                    t.0 = !t.0;
                }
                Disp::Sum(v)
            }
            other => Disp::Neg(Box::new(other)),
        }
    } else {
        d
    }
}

impl<'a> Shower<'a> {
    /// A shower with a pool of known factors (trial divisors).
    pub fn new(alg: &'a Alg, pool: &[RatFun]) -> Shower<'a> {
        let mut p: Vec<Poly> = Vec::new();
        for r in pool {
            for x in [&r.num, &r.den] {
                let x = x.div_mono(&x.mono_content()).primitive();
                if x.len() > 1 && !p.contains(&x) {
                    p.push(x);
                }
            }
        }
        Shower { alg, pool: p }
    }

    /// Class of an atom for ordering inside a monomial: pi, parameters, radius, symbols, then the rest.
    fn rank(&self, v: usize) -> (u8, usize) {
        match self.alg.atom(v) {
            AtomKind::Pi => (0, v),
            AtomKind::Param(_) => (1, v),
            AtomKind::Radius => (2, v),
            AtomKind::Symbol(..) => (3, v),
            _ => (4, v),
        }
    }

    fn is_plain(&self, v: usize) -> bool {
        matches!(self.alg.atom(v), AtomKind::Radius | AtomKind::Param(_) | AtomKind::Pi | AtomKind::Symbol(..))
    }

    fn atom(&self, v: usize) -> Disp {
        match self.alg.atom(v) {
            AtomKind::Sqrt(r) => Disp::Sqrt(Box::new(self.rat(r))),
            AtomKind::Func(f, u) => Disp::Func(*f, Box::new(self.rat(u))),
            AtomKind::Pow(b, e) => Disp::PowGen(Box::new(self.rat(b)), Box::new(self.rat(e))),
            _ => Disp::Sym(v),
        }
    }

    fn mono(&self, m: &Mono) -> Vec<Disp> {
        let mut vs: Vec<(usize, u32)> = m.clone();
        vs.sort_by_key(|(v, _)| self.rank(*v));
        vs.into_iter().map(|(v, e)| if e == 1 { self.atom(v) } else { Disp::Pow(Box::new(self.atom(v)), e) }).collect()
    }

    fn int(n: &BigInt) -> Disp {
        Disp::Int(n.abs())
    }

    /// Display of a rational function, the shortest layout (module docs).
    pub fn rat(&self, x: &RatFun) -> Disp {
        if x.num.is_zero() {
            return Disp::Int(BigInt::zero());
        }
        let f = self.fraction(x);
        if x.den.len() == 1 {
            let s = self.termwise(x);
            if s.ops() <= f.ops() {
                return s;
            }
        }
        f
    }

    /// Layout 1: every term over the monomial denominator.
    fn termwise(&self, x: &RatFun) -> Disp {
        let (dm, dc) = x.den.terms().next().map(|(m, c)| (m.clone(), c.clone())).expect("monomial");
        let mut terms: Vec<(Mono, Q)> = x.num.terms().map(|(m, c)| (m.clone(), c / &dc)).collect();
        // Order: by |radius exponent| (numerator minus denominator) ascending, positive exponents first, then
        // total degree ascending: 1 - 2m/a + q^2/a^2, 1 - l a^2/3.
        let key = |m: &Mono| {
            let r = i64::from(mono_exp(m, RADIUS)) - i64::from(mono_exp(&dm, RADIUS));
            let tot: i64 = m.iter().filter(|(v, _)| self.is_plain(*v)).map(|(_, e)| i64::from(*e)).sum();
            (r.abs(), r < 0, tot)
        };
        terms.sort_by(|a, b| key(&a.0).cmp(&key(&b.0)).then_with(|| b.0.cmp(&a.0)));
        let mut out = Vec::new();
        for (m, c) in terms {
            // Cancel the monomials of this term against the denominator.
            let mut top: Mono = Vec::new();
            let mut bot: Mono = Vec::new();
            let vars: std::collections::BTreeSet<usize> = m.iter().chain(dm.iter()).map(|(v, _)| *v).collect();
            for v in vars {
                let (a, b) = (mono_exp(&m, v), mono_exp(&dm, v));
                if a > b {
                    top.push((v, a - b));
                } else if b > a {
                    bot.push((v, b - a));
                }
            }
            out.push((c.is_negative(), self.coeff_mono(&c.abs(), &top, &bot)));
        }
        if out.len() == 1 {
            let (n, d) = out.pop().expect("one");
            return neg_if(n, d);
        }
        Disp::Sum(out)
    }

    /// |c| top / bot as a display.
    fn coeff_mono(&self, c: &Q, top: &Mono, bot: &Mono) -> Disp {
        let mut t = vec![Self::int(c.numer())];
        t.extend(self.mono(top));
        let mut b = vec![Self::int(c.denom())];
        b.extend(self.mono(bot));
        let (t, b) = (prod(t), prod(b));
        if b == Disp::Int(BigInt::one()) {
            t
        } else {
            Disp::Frac(Box::new(t), Box::new(b))
        }
    }

    /// Layout 2: one fraction with contents pulled out and factors found.
    fn fraction(&self, x: &RatFun) -> Disp {
        let cn = x.num.rational_content();
        let cd = x.den.rational_content();
        let c = &cn / &cd;
        let n = x.num.scale(&(Q::one() / &cn));
        let d = x.den.scale(&(Q::one() / &cd));
        let mn = n.mono_content();
        let md = d.mono_content();
        let n1 = n.div_mono(&mn);
        let d1 = d.div_mono(&md);
        let mut top = vec![Self::int(c.numer())];
        top.extend(self.mono(&mn));
        let (sn, fnum) = self.factored(&n1);
        top.extend(fnum);
        let mut bot = vec![Self::int(c.denom())];
        bot.extend(self.mono(&md));
        let (sd, fden) = self.factored(&d1);
        bot.extend(fden);
        let (t, b) = (prod(top), prod(bot));
        let body = if b == Disp::Int(BigInt::one()) { t } else { Disp::Frac(Box::new(t), Box::new(b)) };
        neg_if(c.is_negative() ^ sn ^ sd, body)
    }

    /// A primitive polynomial without monomial content as a product of factors, with the sign that the
    /// factors leave over (true = negative).
    fn factored(&self, p: &Poly) -> (bool, Vec<Disp>) {
        if let Some(c) = p.as_constant() {
            return (c.is_negative(), Vec::new());
        }
        let (factors, rest) = self.factor(p);
        let mut out = Vec::new();
        let mut negative = false;
        for (f, k) in factors {
            // Each factor with a positive leading term as printed (highest power of the radius first).
            let f = if self.display_lead_negative(&f) {
                negative ^= k % 2 == 1;
                f.neg()
            } else {
                f
            };
            let d = self.sum(&f);
            out.push(if k == 1 { d } else { Disp::Pow(Box::new(d), k) });
        }
        let rest = if rest.as_constant().is_none() && self.display_lead_negative(&rest) {
            negative = !negative;
            rest.neg()
        } else {
            rest
        };
        match rest.as_constant() {
            None => out.push(self.sum(&rest)),
            Some(c) => {
                negative ^= c.is_negative();
                let c = c.abs();
                if !c.is_one() {
                    out.insert(0, Self::int(c.numer()));
                }
            }
        }
        (negative, out)
    }

    /// Split off pool factors and linear factors in the radius, with multiplicities.
    fn factor(&self, p: &Poly) -> (Vec<(Poly, u32)>, Poly) {
        let mut rest = p.clone();
        let mut found: Vec<(Poly, u32)> = Vec::new();
        let push = |f: Poly, found: &mut Vec<(Poly, u32)>| {
            if let Some(e) = found.iter_mut().find(|e| e.0 == f) {
                e.1 += 1;
            } else {
                found.push((f, 1));
            }
        };
        for f in &self.pool {
            while rest.len() > 1 {
                match rest.div_exact(f) {
                    Some(q) => {
                        push(f.clone(), &mut found);
                        rest = q;
                    }
                    None => break,
                }
            }
        }
        // Linear factors u a - v in the radius.
        let mut guard = 0;
        'outer: while rest.degree(RADIUS) >= 2 && guard < 16 {
            guard += 1;
            let deg = rest.degree(RADIUS);
            let lc = rest.coeff_of(RADIUS, deg);
            let tc = rest.coeff_of(RADIUS, 0);
            if lc.len() != 1 || tc.len() != 1 {
                break;
            }
            for u in divisors_of_term(&lc) {
                for v in divisors_of_term(&tc) {
                    for sign in [1i64, -1] {
                        let cand = Poly::var(RADIUS).mul(&u).sub(&v.scale(&Q::from_integer(BigInt::from(sign))));
                        let cand = cand.primitive();
                        if let Some(q) = rest.div_exact(&cand) {
                            push(cand, &mut found);
                            rest = q;
                            continue 'outer;
                        }
                    }
                }
            }
            break;
        }
        // Keep the cofactor primitive; its content goes in front.
        (found, rest)
    }

    /// A polynomial as a sum, terms grouped by their square-root/function atoms.
    fn sum(&self, p: &Poly) -> Disp {
        // Group key: the non-plain part of each monomial.
        let mut groups: Vec<(Mono, Poly)> = Vec::new();
        for (m, c) in p.terms() {
            let key: Mono = m.iter().copied().filter(|(v, _)| !self.is_plain(*v)).collect();
            let rest: Mono = m.iter().copied().filter(|(v, _)| self.is_plain(*v)).collect();
            let t = Poly::term(rest, c.clone());
            match groups.iter_mut().find(|g| g.0 == key) {
                Some(g) => g.1 = g.1.add(&t),
                None => groups.push((key, t)),
            }
        }
        let flat = self.flat_sum(p);
        if groups.len() == 1 && groups[0].0.is_empty() {
            return flat;
        }
        let mut out: Vec<(bool, Disp)> = Vec::new();
        groups.sort_by(|a, b| a.0.cmp(&b.0));
        for (key, q) in groups {
            let mut c = q.rational_content();
            let qm = q.mono_content();
            let mut inner = q.scale(&(Q::one() / &c)).div_mono(&qm);
            if self.display_lead_negative(&inner) {
                inner = inner.neg();
                c = -c;
            }
            // A plain group with unit content joins the outer sum term by term.
            if key.is_empty() && qm.is_empty() && c.abs().is_one() && inner.len() > 1 {
                if let Disp::Sum(ts) = self.flat_sum(&inner) {
                    for (ng, t) in ts {
                        out.push((ng ^ c.is_negative(), t));
                    }
                    continue;
                }
            }
            let mut f = vec![Self::int(c.numer())];
            f.extend(self.mono(&qm));
            f.extend(self.mono(&key));
            if inner.as_constant().is_none() {
                f.push(self.flat_sum(&inner));
            }
            let num = prod(f);
            let d = if c.denom().is_one() { num } else { Disp::Frac(Box::new(num), Box::new(Self::int(c.denom()))) };
            out.push((c.is_negative(), d));
        }
        let grouped = if out.len() == 1 {
            let (n, d) = out.pop().expect("one");
            neg_if(n, d)
        } else {
            Disp::Sum(out)
        };
        if grouped.ops() <= flat.ops() {
            grouped
        } else {
            flat
        }
    }

    /// The terms of a polynomial in print order: radius degree descending, then total degree descending.
    fn ordered<'p>(&self, p: &'p Poly) -> Vec<(&'p Mono, &'p Q)> {
        let mut terms: Vec<(&Mono, &Q)> = p.terms().collect();
        let key = |m: &Mono| {
            let tot: u32 = m.iter().filter(|(v, _)| self.is_plain(*v)).map(|(_, e)| *e).sum();
            (std::cmp::Reverse(mono_exp(m, RADIUS)), std::cmp::Reverse(tot))
        };
        terms.sort_by(|a, b| key(a.0).cmp(&key(b.0)).then_with(|| b.0.cmp(a.0)));
        terms
    }

    /// True if the first printed term of p is negative.
    fn display_lead_negative(&self, p: &Poly) -> bool {
        self.ordered(p).first().is_some_and(|(_, c)| c.is_negative())
    }

    /// A polynomial as a flat sum, terms by radius degree descending.
    fn flat_sum(&self, p: &Poly) -> Disp {
        let terms = self.ordered(p);
        let out: Vec<(bool, Disp)> =
            terms.into_iter().map(|(m, c)| (c.is_negative(), self.coeff_mono(&c.abs(), m, &Vec::new()))).collect();
        if out.len() == 1 {
            let (n, d) = out.into_iter().next().expect("one");
            return neg_if(n, d);
        }
        Disp::Sum(out)
    }
}

/// Monomial divisors (with positive integer factors) of a single-term polynomial, smallest first.
fn divisors_of_term(p: &Poly) -> Vec<Poly> {
    let (m, c) = p.terms().next().map(|(m, c)| (m.clone(), c.clone())).expect("one term");
    let n = c.numer().abs().to_u64().unwrap_or(1).min(10_000);
    let ints: Vec<u64> = (1..=n).filter(|k| n % k == 0).collect();
    let mut monos: Vec<Mono> = vec![Vec::new()];
    for &(v, e) in &m {
        let mut next = Vec::new();
        for base in &monos {
            for k in 0..=e {
                let mut b = base.clone();
                if k > 0 {
                    b.push((v, k));
                }
                next.push(b);
            }
        }
        monos = next;
    }
    let mut out = Vec::new();
    for mono in &monos {
        for &k in &ints {
            out.push(Poly::term(mono.clone(), Q::from_integer(BigInt::from(k))));
        }
    }
    out.sort_by_key(|p| p.terms().next().map(|(m, _)| m.iter().map(|(_, e)| *e).sum::<u32>()).unwrap_or(0));
    out
}

/// True when the gcd of two polynomials is a constant (used by tests).
pub fn coprime(a: &Poly, b: &Poly) -> bool {
    gcd(a, b).as_constant().is_some()
}
