//! Closed forms of the junction quantities in the user's own metric: the same formulas as the numeric path
//! (module docs of `junction`, `lanczos`, `potential`, `stability`), evaluated in exact algebra
//! (`crate::algebra`) with A, B and their radial derivatives substituted and parameters kept symbolic.
//!
//! Conventions (as in the numeric path): n^r_i = nu_i W_i with W_i = sqrt(Rdot^2 + eps B_i); the static
//! timelike shell has W_i = sqrt(B_i(a)), the static spacelike shell W_i = sqrt(-B_i(R)); the Lanczos
//! equation S^s_s = eps (D-2) [K^theta_theta]/(8 pi), S^theta_theta = eps ([K^s_s] + (D-3) [K^theta_theta])/(8 pi)
//! (Israel 1966; Poisson 2004 ch. 3), sigma = -S^tau_tau, p = S^theta_theta.
//!
//! Linear stability (Poisson & Visser 1995; Garcia, Lobo & Visser 2012): the pressure equation
//! p = P(R, Rdot^2, Rddot) is linear in Rddot; along a motion Rddot = -V'(R)/2 and p - p0 = beta^2
//! (sigma - sigma0), so to first order about a static radius
//! ```text
//! V''(a0) = 2 (p0'(a0) - beta^2 sigma0'(a0)) / P_Rddot,   P_Rddot = (nu_+/W_+ - nu_-/W_-) / (8 pi),
//! ```
//! i.e. c0 = 2 p0'/P_Rddot, c1 = -2 sigma0'/P_Rddot. (The numeric path expands V along the motion instead;
//! the independent SymPy reference checks that both routes agree.)

use crate::algebra::{Alg, AtomKind, RatFun, Q};
use crate::error::{Error, Result};
use crate::model::{ShellKind, Which};
use crate::scenario::Scenario;
use num_bigint::BigInt;

/// Which shell state the closed forms describe.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ClosedState {
    /// A static shell at radius a (timelike) or the surface r = R (spacelike): sigma0, p0, V, c0, c1, ...
    Static,
    /// A general state R, Rdot, Rddot (timelike) or R, R', R'' (spacelike).
    Moving,
}

/// One closed-form quantity.
#[derive(Debug, Clone)]
pub struct Quantity {
    /// Identifier (also the SymPy variable name): `sigma0`, `p0`, `beta2_crit`, ...
    pub id: String,
    /// Left-hand side as plain text, e.g. `sigma0(a)`.
    pub text_lhs: String,
    /// Left-hand side in LaTeX, e.g. `\sigma_0(a)`.
    pub latex_lhs: String,
    /// The value.
    pub value: RatFun,
}

/// Every closed form of one scenario and state, with the algebra context they live in.
#[derive(Debug, Clone)]
pub struct ClosedForms {
    /// The atom table.
    pub alg: Alg,
    /// The quantities, in print order.
    pub quantities: Vec<Quantity>,
    /// Static or moving.
    pub state: ClosedState,
    /// Timelike or spacelike.
    pub kind: ShellKind,
    /// Spacetime dimension D.
    pub dimension: u32,
    /// A and B of both sides (trial factors for the display).
    pub pool: Vec<RatFun>,
    /// The radius symbol: `a` (static timelike) or `R`.
    pub radius: &'static str,
    /// Notes printed with the formulas (meaning of symbols, what is not an energy density, ...).
    pub notes: Vec<String>,
}

impl ClosedForms {
    /// The quantity with identifier `id`.
    pub fn get(&self, id: &str) -> Option<&Quantity> {
        self.quantities.iter().find(|q| q.id == id)
    }
}

struct SideForms {
    nu: f64,
    a: RatFun,
    b: RatFun,
    db: RatFun,
    phi: RatFun,
}

/// Omega_n = 2 pi^((n+1)/2) / Gamma((n+1)/2) as a rational times a power of pi (recursion of
/// `junction::unit_sphere_area`).
fn sphere_area(alg: &Alg, n: u32) -> RatFun {
    let (mut k, mut area) =
        if n % 2 == 0 { (0, RatFun::int(2)) } else { (1, alg.scale(&alg.pi(), &Q::from(BigInt::from(2)))) };
    while k < n {
        k += 2;
        let f = alg.scale(&alg.pi(), &Q::new(BigInt::from(2), BigInt::from(k - 1)));
        area = alg.mul(&area, &f);
    }
    area
}

fn q(n: i64) -> Q {
    Q::from(BigInt::from(n))
}

/// The closed forms of scenario `s` in state `state`.
///
/// Errors: a metric function that the algebra cannot represent (a division by an identically zero
/// expression), or a static shell the orientation does not allow (a static timelike shell on a side kept as a
/// T-region, a static spacelike surface on a side kept as an R-region).
pub fn closed_forms(s: &Scenario, state: ClosedState) -> Result<ClosedForms> {
    let mut alg = Alg::new(s.params.names());
    let mut sides = Vec::new();
    for which in [Which::Minus, Which::Plus] {
        let side = s.side(which);
        let conv = |alg: &mut Alg, e: &crate::expr::Expr, what: &str| {
            alg.from_node(e.node()).map_err(|m| {
                Error::input(format!("{what} of the {which} side (\"{}\"): {m}", e.source()))
                    .with_hint("write the metric function so that it is defined for some radius")
            })
        };
        let a = conv(&mut alg, &side.a, "A")?;
        let b = if side.b_given { conv(&mut alg, &side.b, "B")? } else { a.clone() };
        if a.is_zero() || b.is_zero() {
            return Err(Error::input(format!("the {which} side has A or B identically zero"))
                .with_hint("A and B must be non-zero functions of r"));
        }
        let da = alg.derivative(&a);
        let db = alg.derivative(&b);
        let half = RatFun::frac(1, 2);
        let phi = alg.sub(&alg.mul(&half, &alg.div(&da, &a)), &alg.mul(&half, &alg.div(&db, &b)));
        let static_ok = match s.shell.kind {
            ShellKind::Timelike => side.keep.is_r_region(),
            ShellKind::Spacelike => !side.keep.is_r_region(),
        };
        if state == ClosedState::Static && !static_ok {
            return Err(Error::input(format!(
                "the {which} side keeps \"{}\": a static {} shell cannot sit in that region",
                side.keep.name(),
                s.shell.kind.name()
            ))
            .with_hint_phrase(crate::phrase![
                "use ",
                crate::RequestField::State,
                " moving for the general shell state"
            ]));
        }
        sides.push(SideForms { nu: side.normal_sign(), a, b, db, phi });
    }
    let pool: Vec<RatFun> = sides.iter().flat_map(|sd| [sd.a.clone(), sd.b.clone()]).collect();
    let n = i64::from(s.dimension - 2);
    let eps = s.shell.kind.eps();
    let timelike = s.shell.kind == ShellKind::Timelike;
    let radius = if timelike && state == ClosedState::Static { "a" } else { "R" };
    let r = alg.radius();
    let pi8 = alg.scale(&alg.pi(), &q(8));
    let mut notes = Vec::new();
    // Shell velocity and acceleration symbols.
    let (vel, acc) = match (state, timelike) {
        (ClosedState::Static, _) => (RatFun::int(0), RatFun::int(0)),
        (ClosedState::Moving, true) => {
            notes.push("Rdot = dR/dtau, Rddot = d^2R/dtau^2 (tau: the shell's proper time)".into());
            (alg.symbol("Rdot", "\\dot{R}", "Rdot"), alg.symbol("Rddot", "\\ddot{R}", "Rddot"))
        }
        (ClosedState::Moving, false) => {
            notes.push("Rp = dR/dl, Rpp = d^2R/dl^2 (l: proper length along the shell)".into());
            (alg.symbol("Rp", "R'", "Rp"), alg.symbol("Rpp", "R''", "Rpp"))
        }
    };
    // Per side: X = n^r, K^theta_theta, K^s_s.
    let mut x = Vec::new();
    let mut kth = Vec::new();
    let mut kss = Vec::new();
    for sd in &sides {
        let rad = alg.add(&alg.mul(&vel, &vel), &alg.scale(&sd.b, &Q::from_float(eps).expect("finite")));
        let w = alg.sqrt(&rad);
        let xi = alg.scale(&w, &Q::from_float(sd.nu).expect("finite"));
        let half_eps = Q::from_float(0.5 * eps).expect("finite");
        let top = alg.add(&acc, &alg.scale(&sd.db, &half_eps));
        let k_ss =
            alg.add(&alg.scale(&alg.div(&top, &w), &Q::from_float(sd.nu).expect("finite")), &alg.mul(&xi, &sd.phi));
        kth.push(alg.div(&xi, &r));
        kss.push(k_ss);
        x.push(xi);
    }
    let jth = alg.sub(&kth[1], &kth[0]);
    let jss = alg.sub(&kss[1], &kss[0]);
    let eps_q = Q::from_float(eps).expect("finite");
    let s_ss = alg.div(&alg.scale(&jth, &(&eps_q * q(n))), &pi8);
    let s_thth = alg.div(&alg.scale(&alg.add(&jss, &alg.scale(&jth, &q(n - 1))), &eps_q), &pi8);
    let flux_sum = alg.sub(&alg.mul(&x[1], &sides[1].phi), &alg.mul(&x[0], &sides[0].phi));
    let flux = alg.div(&alg.scale(&flux_sum, &q(n)), &alg.mul(&pi8, &r));
    let mut out = Vec::new();
    let mut put = |id: &str, tl: String, ll: String, v: RatFun| {
        out.push(Quantity { id: id.into(), text_lhs: tl, latex_lhs: ll, value: v });
    };
    let nd = s.dimension - 2;
    let ec_p = |k: u32| if k == 1 { String::new() } else { k.to_string() };
    match (timelike, state) {
        (true, st) => {
            let sigma = alg.neg(&s_ss);
            let p = s_thth.clone();
            let (sg, pp, arg, argl) =
                if st == ClosedState::Static { ("sigma0", "p0", "(a)", "(a)") } else { ("sigma", "p", "", "") };
            let (sgl, ppl) = if st == ClosedState::Static { ("\\sigma_{0}", "p_{0}") } else { ("\\sigma", "p") };
            put(sg, format!("{sg}{arg}"), format!("{sgl}{argl}"), sigma.clone());
            put(pp, format!("{pp}{arg}"), format!("{ppl}{argl}"), p.clone());
            put(&format!("{sg}_plus_{pp}"), format!("{sg} + {pp}"), format!("{sgl}+{ppl}"), alg.add(&sigma, &p));
            put(
                &format!("{sg}_plus_{}{pp}", ec_p(nd)),
                format!("{sg} + {}{pp}", if nd == 1 { String::new() } else { format!("{nd}*") }),
                format!("{sgl}+{}{ppl}", ec_p(nd)),
                alg.add(&sigma, &alg.scale(&p, &q(i64::from(nd)))),
            );
            put(&format!("{sg}_minus_{pp}"), format!("{sg} - {pp}"), format!("{sgl}-{ppl}"), alg.sub(&sigma, &p));
            let area = sphere_area(&alg, nd);
            let mass = alg.mul(&alg.mul(&area, &alg.powi(&r, nd as i32)), &sigma);
            put("shell_mass", format!("M_s{arg}"), format!("M_{{s}}{argl}"), mass);
            put("flux", format!("Xi{arg}"), format!("\\Xi{argl}"), flux.clone());
            // Potential as a function of the radius and the surface energy density there.
            let sym = alg.symbol("sigma", "\\sigma", "sigma");
            let y = alg.neg(&alg.div(&alg.mul(&alg.scale(&sym, &q(8)), &alg.mul(&alg.pi(), &r)), &RatFun::int(n)));
            let dbv = alg.sub(&sides[1].b, &sides[0].b);
            let t = alg.div(&dbv, &alg.scale(&y, &q(2)));
            let v = alg.sub(
                &alg.sub(&alg.scale(&alg.add(&sides[1].b, &sides[0].b), &Q::new(1.into(), 2.into())), &alg.mul(&t, &t)),
                &alg.scale(&alg.mul(&y, &y), &Q::new(1.into(), 4.into())),
            );
            let rl = if st == ClosedState::Static { "a" } else { "R" };
            put("potential", format!("V({rl})"), format!("V({rl})"), v);
            notes.push(format!(
                "V({rl}): the potential of (dR/dtau)^2 + V(R) = 0 at R = {rl}, sigma being the surface energy density there{}",
                if st == ClosedState::Static { "; on the static branch sigma = sigma0(a) it vanishes" } else { "" }
            ));
            if st == ClosedState::Static && alg.sub(&x[1], &x[0]).is_zero() {
                notes.push("[K^theta_theta] vanishes identically (the two sides are the same spacetime with the same orientation): no shell, no stability coefficients".into());
            } else if st == ClosedState::Static {
                let (c0, c1) = v2_coefficients(&mut alg, &sides, &sigma, &p);
                put("c0", "c0(a)".into(), "c_{0}(a)".into(), c0.clone());
                put("c1", "c1(a)".into(), "c_{1}(a)".into(), c1.clone());
                if c1.is_zero() {
                    notes.push("V''(a0) does not depend on beta^2 here (c1 = 0): no critical beta^2".into());
                } else {
                    // With two different square roots in c1 the rationalised quotient grows far longer than
                    // the quotient itself: then it is printed as -c0/c1.
                    let roots = c1.num.vars().into_iter().filter(|&v| matches!(alg.atom(v), AtomKind::Sqrt(_))).count();
                    let crit = if roots >= 2 {
                        let s0 = alg.symbol("c0", "c_{0}(a)", "c0");
                        let s1 = alg.symbol("c1", "c_{1}(a)", "c1");
                        alg.neg(&alg.div(&s0, &s1))
                    } else {
                        alg.neg(&alg.div(&c0, &c1))
                    };
                    put("beta2_crit", "beta2_crit(a)".into(), "\\beta^{2}_{\\mathrm{crit}}(a)".into(), crit);
                }
                notes.push("V''(a0) = c0 + c1 beta^2 at a static radius a0 (beta^2 = dp/dsigma there); stable where V''(a0) > 0, beta2_crit = -c0/c1".into());
            }
        }
        (false, st) => {
            let arg = if st == ClosedState::Static { "(R)" } else { "" };
            put("S_ll", format!("S^l_l{arg}"), format!("S^{{l}}{{}}_{{l}}{arg}"), s_ss.clone());
            put("S_thth", format!("S^theta_theta{arg}"), format!("S^{{\\theta}}{{}}_{{\\theta}}{arg}"), s_thth.clone());
            notes.push("spacelike shell: S^l_l and S^theta_theta are the mixed components of the surface stress tensor along the shell (l: proper length, the Killing t direction inside the horizon); they are not an energy density and a pressure".into());
        }
    }
    Ok(ClosedForms { alg, quantities: out, state, kind: s.shell.kind, dimension: s.dimension, pool, radius, notes })
}

/// c0 and c1 of V''(a0) = c0 + c1 beta^2 for a static timelike shell (module docs): linearising the
/// pressure equation p = P(R, Rdot^2, Rddot) about the static state with Rddot = -V'(R)/2 and
/// p - p0 = beta^2 (sigma - sigma0) gives V''(a0) = 2 (p0'(a) - beta^2 sigma0'(a)) / P_Rddot, with
/// P_Rddot = (nu_+/W_+ - nu_-/W_-)/(8 pi) the coefficient of Rddot in p.
fn v2_coefficients(alg: &mut Alg, sides: &[SideForms], sigma0: &RatFun, p0: &RatFun) -> (RatFun, RatFun) {
    let pi8 = alg.scale(&alg.pi(), &q(8));
    let mut coef = RatFun::int(0);
    for (k, sd) in sides.iter().enumerate() {
        let w = alg.sqrt(&sd.b);
        let t = alg.div(&RatFun::int(sd.nu as i64), &w);
        coef = if k == 1 { alg.add(&coef, &t) } else { alg.sub(&coef, &t) };
    }
    let p_rddot = alg.div(&coef, &pi8);
    let dp = alg.derivative(p0);
    let ds = alg.derivative(sigma0);
    let two_over = alg.div(&RatFun::int(2), &p_rddot);
    (alg.mul(&two_over, &dp), alg.neg(&alg.mul(&two_over, &ds)))
}
