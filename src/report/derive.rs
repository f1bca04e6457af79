//! Everything `derive` reports for one shell state: junction quantities, potential, stability, energy
//! conditions, formulas, warnings. Plain data, serialised as JSON and rendered as text/LaTeX by `export`.

use crate::error::Result;
use crate::junction::conditions::shell_mass;
use crate::junction::formula::Formula;
use crate::junction::potential::Law;
use crate::junction::{EnergyConditions, Junction, StableWhen};
use crate::model::ShellKind;
use crate::scenario::Scenario;
use serde::Serialize;

/// The shell state asked for.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct State {
    /// Radius R (or a for a static shell).
    pub radius: f64,
    /// dR/ds (proper-time or proper-length derivative); 0 for a static shell.
    pub velocity: f64,
    /// d^2R/ds^2; 0 for a static shell.
    pub acceleration: f64,
}

impl State {
    /// A static shell at radius a.
    pub fn at_rest(radius: f64) -> State {
        State { radius, velocity: 0.0, acceleration: 0.0 }
    }

    /// True when Rdot = Rddot = 0.
    pub fn is_static(&self) -> bool {
        self.velocity == 0.0 && self.acceleration == 0.0
    }
}

/// Per-side values at the radius.
#[derive(Debug, Clone, Serialize)]
pub struct SideValues {
    /// Which part is kept.
    pub keep: String,
    /// Sign of n^r.
    pub normal_sign: f64,
    /// A(R).
    #[serde(rename = "A")]
    pub a: f64,
    /// B(R).
    #[serde(rename = "B")]
    pub b: f64,
    /// A'(R).
    #[serde(rename = "A_prime")]
    pub a_prime: f64,
    /// B'(R).
    #[serde(rename = "B_prime")]
    pub b_prime: f64,
    /// n^r = nu W.
    pub n_r: f64,
    /// K^s_s on this side.
    pub k_ss: f64,
    /// K^theta_theta on this side.
    pub k_thth: f64,
    /// The user's A as typed.
    pub a_expr: String,
    /// The user's B as typed (or A).
    pub b_expr: String,
}

/// Results specific to an equation of state at a static radius.
#[derive(Debug, Clone, Serialize)]
pub struct EosAtRadius {
    /// The law as typed.
    pub law: String,
    /// P(sigma0).
    pub pressure_from_law: f64,
    /// p0 - P(sigma0): zero only if the radius is a static radius of this law.
    pub residual: f64,
    /// beta^2 = P'(sigma0).
    pub beta2: f64,
    /// V''(a0) with this law's beta^2 (meaningful only when the residual vanishes).
    pub potential_second_derivative: f64,
}

/// The full `derive` report.
#[derive(Debug, Clone, Serialize)]
pub struct DeriveReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance line.
    pub provenance: String,
    /// "timelike" or "spacelike".
    pub shell_kind: String,
    /// D.
    pub dimension: u32,
    /// R.
    pub radius: f64,
    /// dR/ds.
    pub velocity: f64,
    /// d^2R/ds^2.
    pub acceleration: f64,
    /// Minus side values.
    pub minus: SideValues,
    /// Plus side values.
    pub plus: SideValues,
    /// [K^s_s] (named K_tautau_jump for timelike shells in text output).
    #[serde(rename = "K_ss_jump")]
    pub k_ss_jump: f64,
    /// Spacelike shells: [K^l_l] under its own name.
    #[serde(rename = "K_ll_jump", skip_serializing_if = "Option::is_none")]
    pub k_ll_jump: Option<f64>,
    /// [K^theta_theta].
    #[serde(rename = "K_thth_jump")]
    pub k_thth_jump: f64,
    /// Timelike: sigma = -S^tau_tau.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub sigma: Option<f64>,
    /// Timelike: p = S^theta_theta.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub pressure: Option<f64>,
    /// Spacelike: S^l_l.
    #[serde(rename = "S_ll", skip_serializing_if = "Option::is_none")]
    pub s_ll: Option<f64>,
    /// Spacelike: S^theta_theta.
    #[serde(rename = "S_thth", skip_serializing_if = "Option::is_none")]
    pub s_thth: Option<f64>,
    /// Timelike: Omega_(D-2) R^(D-2) sigma.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shell_mass: Option<f64>,
    /// V(R) from the angular junction condition (equals -Rdot^2 at this state).
    pub potential: f64,
    /// Static timelike: V'(a0) with the linearised law (zero at a static solution; a check).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub potential_first_derivative: Option<f64>,
    /// Timelike (static or moving state): flux term Xi of the conservation law.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub flux_term: Option<f64>,
    /// Static timelike: critical beta^2 (null when V'' does not depend on beta^2).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub beta2_critical: Option<Option<f64>>,
    /// Static timelike: where the shell is stable.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stable_when: Option<StableWhen>,
    /// Static timelike: V''(a0) at beta^2 = 0.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub v2_at_beta2_zero: Option<f64>,
    /// Static timelike: dV''(a0)/d beta^2.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub v2_slope: Option<f64>,
    /// Timelike: energy conditions at these values.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub energy_conditions: Option<EnergyConditions>,
    /// Static timelike with an equation of state.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub equation_of_state: Option<EosAtRadius>,
    /// Formulas (text and LaTeX).
    pub formulas: Vec<Formula>,
    /// Things the reader must know (near a horizon, spacelike meaning, ...).
    pub warnings: Vec<String>,
}

/// Compute the `derive` report for a scenario at a shell state.
pub fn derive(s: &Scenario, state: State) -> Result<DeriveReport> {
    let j = Junction::new(s);
    let r = state.radius;
    let mut warnings = Vec::new();
    let (stress, jets) = if state.is_static() {
        let sv = j.static_values(r)?;
        (sv.stress, sv.jets)
    } else {
        let jm = j.jet(crate::model::Which::Minus, r);
        let jp = j.jet(crate::model::Which::Plus, r);
        j.check_finite_jet(crate::model::Which::Minus, r, &jm, 1)?;
        j.check_finite_jet(crate::model::Which::Plus, r, &jp, 1)?;
        (j.stress_with_jets(&jm, &jp, r, state.velocity, state.acceleration)?, [jm, jp])
    };
    // Results near a horizon are still computed, and flagged as ill-conditioned.
    let near = crate::tolerances::TOL.horizon.near_warning;
    for (i, name) in [(0, "minus"), (1, "plus")] {
        let b = jets[i].b[0];
        if crate::junction::admissible::near_horizon(r, b, jets[i].b[1], near) {
            warnings.push(format!(
                "the radius is within a relative {near:.0e} of a horizon of the {name} side (B = {b:.3e}): the junction quantities grow like 1/sqrt(B) and are ill-conditioned here"
            ));
        }
    }
    let side_values = |i: usize, side: &crate::scenario::Side| SideValues {
        keep: side.keep.name().to_string(),
        normal_sign: side.normal_sign(),
        a: jets[i].a[0],
        b: jets[i].b[0],
        a_prime: jets[i].a[1],
        b_prime: jets[i].b[1],
        n_r: stress.n_r[i],
        k_ss: stress.k_ss[i],
        k_thth: stress.k_thth[i],
        a_expr: side.a.source().to_string(),
        b_expr: side.b.source().to_string(),
    };
    let y = stress.n_r[1] - stress.n_r[0];
    let potential = crate::junction::potential::potential_from_y(j.shape.eps, jets[0].b[0], jets[1].b[0], y);
    let a_equals_b = !s.minus.b_given && !s.plus.b_given;
    let mut rep = DeriveReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        shell_kind: s.shell.kind.name().to_string(),
        dimension: s.dimension,
        radius: r,
        velocity: state.velocity,
        acceleration: state.acceleration,
        minus: side_values(0, &s.minus),
        plus: side_values(1, &s.plus),
        k_ss_jump: stress.k_ss_jump(),
        k_ll_jump: (s.shell.kind == ShellKind::Spacelike).then(|| stress.k_ss_jump()),
        k_thth_jump: stress.k_thth_jump(),
        sigma: None,
        pressure: None,
        s_ll: None,
        s_thth: None,
        shell_mass: None,
        potential,
        potential_first_derivative: None,
        flux_term: None,
        beta2_critical: None,
        stable_when: None,
        v2_at_beta2_zero: None,
        v2_slope: None,
        energy_conditions: None,
        equation_of_state: None,
        formulas: {
            let mut f = side_formulas(s);
            f.extend(j.formulas(a_equals_b));
            f
        },
        warnings: Vec::new(),
    };
    match s.shell.kind {
        ShellKind::Spacelike => {
            rep.s_ll = Some(stress.s_ss);
            rep.s_thth = Some(stress.s_thth);
            warnings.push(
                "spacelike shell: S^l_l and S^theta_theta are the mixed components of the surface stress tensor along a spacelike surface; they are not an energy density and a pressure, and the 'potential' is only the formal analogue (dR/dl)^2 + V(R) = 0".to_string(),
            );
        }
        ShellKind::Timelike => {
            let sigma = stress.sigma();
            let p = stress.pressure();
            rep.sigma = Some(sigma);
            rep.pressure = Some(p);
            rep.shell_mass = Some(shell_mass(r, sigma, s.dimension));
            rep.energy_conditions = Some(EnergyConditions::evaluate(sigma, p, s.dimension));
            if !state.is_static() {
                // The flux term of the conservation law at this moving state (normals n^r_i = nu_i W_i).
                rep.flux_term = Some(j.flux_term(&crate::junction::StaticValues { a: r, stress, jets }));
            }
            if state.is_static() {
                let sv = j.static_values(r)?;
                let ls = j.linear_stability(&sv);
                rep.beta2_critical = Some(ls.beta2_critical);
                rep.stable_when = Some(ls.stable_when);
                rep.v2_at_beta2_zero = Some(ls.v2_at_beta2_zero);
                rep.v2_slope = Some(ls.v2_slope);
                rep.flux_term = Some(j.flux_term(&sv));
                rep.potential_first_derivative = j.potential_taylor(&sv, Law::Linear { beta2: 0.0 }).map(|v| v[1]);
                if let (Some(eos), Some((p_law, beta2))) = (&s.shell.eos, j.law_and_slope(sigma)) {
                    let v2 = j.potential_taylor(&sv, Law::Scenario).map(|v| v[2]).unwrap_or(f64::NAN);
                    if !(p_law.is_finite() && beta2.is_finite()) {
                        return Err(crate::Error::numerical(format!(
                            "radius {r}: the equation of state [shell] pressure = \"{}\" is not finite at sigma0 = {sigma:.6e} (P = {}, dP/dsigma = {})",
                            eos.source(),
                            p_law,
                            beta2
                        ))
                        .with_hint("the law is singular or undefined at this surface energy density (a division by zero, or log/sqrt of a negative number)"));
                    }
                    let residual = p - p_law;
                    if !crate::statics::law_holds(residual, sigma, p) {
                        warnings.push(format!(
                            "the equation of state p = {} gives P(sigma0) = {:.6e} but the junction needs p0 = {p:.6e} at this radius: this is not a static radius of that law (use `junctura statics` to find them)",
                            eos.source(),
                            p_law
                        ));
                    }
                    rep.equation_of_state = Some(EosAtRadius {
                        law: eos.source().to_string(),
                        pressure_from_law: p_law,
                        residual,
                        beta2,
                        potential_second_derivative: v2,
                    });
                }
                if ls.beta2_critical.is_some_and(|b| b.abs() > 1e8) {
                    warnings.push("the critical beta^2 is huge: V''(a0) barely depends on beta^2 here (e.g. at a circular photon orbit of a symmetric wormhole, where the critical curve diverges)".to_string());
                }
            }
        }
    }
    rep.warnings = warnings;
    if let Some(name) = first_non_finite(&rep) {
        return Err(crate::Error::numerical(format!(
            "radius {r}: {name} is not finite at this shell state (the formulas break down here)"
        ))
        .with_hint(
            "A or B or their derivatives make this quantity overflow or divide by zero; choose another radius or state",
        ));
    }
    Ok(rep)
}

/// The user's A and B of each side and their first derivatives, as text and LaTeX (simplified), so the
/// junction formulas can be read in the user's own functions.
fn side_formulas(s: &Scenario) -> Vec<Formula> {
    let mut out = Vec::new();
    for (sign, side) in [("+", &s.plus), ("-", &s.minus)] {
        let mut items = vec![("A", &side.a)];
        if side.b_given {
            items.push(("B", &side.b));
        }
        for (name, e) in items {
            let d = e.derivative().simplified();
            let who = if side.b_given || name == "B" { name.to_string() } else { "A".to_string() };
            let same = if side.b_given { String::new() } else { format!(" = B_{sign}(r)") };
            let same_l = if side.b_given { String::new() } else { format!("=B_{{{sign}}}(r)") };
            out.push(Formula {
                name: format!("{who}_{}", if sign == "+" { "plus" } else { "minus" }),
                text: format!("{who}_{sign}(r){same} = {},  {who}'_{sign}(r) = {}", e.to_text(), d.to_text()),
                latex: format!(
                    "{who}_{{{sign}}}(r){same_l}={},\\qquad {who}_{{{sign}}}'(r)={}",
                    e.to_latex(),
                    d.to_latex()
                ),
            });
        }
    }
    out
}

/// The name of the first reported number that is NaN or infinite, if any (no report leaves with one).
fn first_non_finite(rep: &DeriveReport) -> Option<&'static str> {
    let mut all: Vec<(&'static str, Option<f64>)> = Vec::new();
    for (side, v) in [("minus", &rep.minus), ("plus", &rep.plus)] {
        let named: [(&'static str, f64); 7] = if side == "minus" {
            [
                ("A (minus)", v.a),
                ("B (minus)", v.b),
                ("A' (minus)", v.a_prime),
                ("B' (minus)", v.b_prime),
                ("n^r (minus)", v.n_r),
                ("K^s_s (minus)", v.k_ss),
                ("K^theta_theta (minus)", v.k_thth),
            ]
        } else {
            [
                ("A (plus)", v.a),
                ("B (plus)", v.b),
                ("A' (plus)", v.a_prime),
                ("B' (plus)", v.b_prime),
                ("n^r (plus)", v.n_r),
                ("K^s_s (plus)", v.k_ss),
                ("K^theta_theta (plus)", v.k_thth),
            ]
        };
        all.extend(named.iter().map(|&(n, x)| (n, Some(x))));
    }
    all.extend([
        ("[K^s_s]", Some(rep.k_ss_jump)),
        ("[K^theta_theta]", Some(rep.k_thth_jump)),
        ("sigma", rep.sigma),
        ("p", rep.pressure),
        ("S^l_l", rep.s_ll),
        ("S^theta_theta", rep.s_thth),
        ("the shell mass", rep.shell_mass),
        ("the potential V(R)", Some(rep.potential)),
        ("V'(a)", rep.potential_first_derivative),
        ("the flux term Xi", rep.flux_term),
        ("V''(a) at beta^2 = 0", rep.v2_at_beta2_zero),
        ("dV''(a)/d beta^2", rep.v2_slope),
        ("the critical beta^2", rep.beta2_critical.flatten()),
    ]);
    if let Some(e) = &rep.equation_of_state {
        all.extend([
            ("P(sigma0)", Some(e.pressure_from_law)),
            ("the residual p0 - P(sigma0)", Some(e.residual)),
            ("beta^2 = P'(sigma0)", Some(e.beta2)),
            ("V''(a) with the law", Some(e.potential_second_derivative)),
        ]);
    }
    all.into_iter().find(|(_, v)| v.is_some_and(|x| !x.is_finite())).map(|(n, _)| n)
}
