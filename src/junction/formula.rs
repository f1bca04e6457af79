//! The junction formulas as text and LaTeX, specialised to the scenario's orientation signs and dimension and
//! written in the user's own A and B (printed separately as `A_pm(r) = ...`).

use super::Junction;
use crate::expr::Scalar;
use crate::model::ShellKind;
use serde::Serialize;

/// One formula: a name, plain text and LaTeX (amsmath, without surrounding math delimiters).
#[derive(Debug, Clone, Serialize)]
pub struct Formula {
    /// Short identifier, e.g. `sigma`.
    pub name: String,
    /// Plain text.
    pub text: String,
    /// LaTeX.
    pub latex: String,
}

fn f(name: &str, text: String, latex: String) -> Formula {
    Formula { name: name.into(), text, latex }
}

fn gcd(a: u32, b: u32) -> u32 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

/// n/(8 pi X) reduced, as (text, latex); `x` is the symbol after pi (e.g. "R", "a" or "").
fn over_8pi(n: u32, x: &str) -> (String, String) {
    let g = gcd(n, 8);
    let (num, den) = (n / g, 8 / g);
    let den_t = if den == 1 { format!("pi {x}") } else { format!("{den} pi {x}") };
    let den_t = den_t.trim_end().to_string();
    let den_l = if den == 1 { format!("\\pi {x}") } else { format!("{den}\\pi {x}") };
    (format!("({num}/({den_t}))"), format!("\\frac{{{num}}}{{{}}}", den_l.trim_end()))
}

/// kappa = 8 pi R sigma/(D-2), reduced, as (text, latex).
fn kappa_def(n: u32) -> (String, String) {
    let g = gcd(n, 8);
    let (num, den) = (8 / g, n / g);
    let c = if num == 1 { String::new() } else { num.to_string() };
    if den == 1 {
        (format!("{c} pi R sigma").trim().to_string(), format!("{c}\\pi R\\sigma"))
    } else {
        (format!("{c} pi R sigma/{den}").trim().to_string(), format!("\\frac{{{c}\\pi R\\sigma}}{{{den}}}"))
    }
}

/// A coefficient before a term: empty for 1.
fn times(k: u32) -> String {
    if k == 1 {
        String::new()
    } else {
        format!("{k} ")
    }
}

/// `+ X_plus - X_minus` with the orientation signs folded in, for text and LaTeX.
/// `item(side)` gives the per-side term (text, latex) for side "+" or "-".
fn signed_pair(nu_plus: f64, nu_minus: f64, item: &dyn Fn(&str) -> (String, String)) -> (String, String) {
    // Coefficient of the plus term is nu_plus, of the minus term -nu_minus.
    let (tp, lp) = item("+");
    let (tm, lm) = item("-");
    let cp = nu_plus;
    let cm = -nu_minus;
    let mut text = String::new();
    let mut latex = String::new();
    for (k, (c, t, l)) in [(cp, tp, lp), (cm, tm, lm)].into_iter().enumerate() {
        let (ts, ls) = match (k, c < 0.0) {
            (0, false) => ("", ""),
            (0, true) => ("-", "-"),
            (_, false) => (" + ", "+"),
            (_, true) => (" - ", "-"),
        };
        text.push_str(&format!("{ts}{t}"));
        latex.push_str(&format!("{ls}{l}"));
    }
    (text, latex)
}

impl<'a, T: Scalar> Junction<'a, T> {
    /// The formulas for this junction's shell kind, orientation and dimension.
    pub fn formulas(&self, a_equals_b: bool) -> Vec<Formula> {
        let n = self.dimension - 2;
        let (np, nm) = (self.shape.nu[1], self.shape.nu[0]);
        let eps = self.shape.eps;
        let (s, sdot, w) = match self.shape.kind {
            ShellKind::Timelike => ("tau", "\\dot{R}", "Rdot^2 + B"),
            ShellKind::Spacelike => ("l", "R'", "R'^2 - B"),
        };
        let sdot_t = if self.shape.kind == ShellKind::Timelike { "Rdot" } else { "R'" };
        let sddot_t = if self.shape.kind == ShellKind::Timelike { "Rddot" } else { "R''" };
        let sddot_l = if self.shape.kind == ShellKind::Timelike { "\\ddot{R}" } else { "R''" };
        let eb = if eps > 0.0 { "+" } else { "-" };
        let mut out = Vec::new();
        out.push(f(
            "W",
            format!("W_pm = sqrt({w}_pm(R)),  Phi'_pm = A'_pm/(2 A_pm) - B'_pm/(2 B_pm)"),
            format!("W_\\pm=\\sqrt{{{sdot}^{{2}}{eb}B_\\pm(R)}},\\qquad \\Phi_\\pm'=\\frac{{A_\\pm'}}{{2A_\\pm}}-\\frac{{B_\\pm'}}{{2B_\\pm}}"),
        ));
        let (ytext, ylatex) = signed_pair(np, nm, &|sd| (format!("W_{sd}"), format!("W_{{{sd}}}")));
        out.push(f(
            "K_thth_jump",
            format!("[K^theta_theta] = ({ytext})/R"),
            format!("\\left[K^{{\\theta}}{{}}_{{\\theta}}\\right]=\\frac{{1}}{{R}}\\left({ylatex}\\right)"),
        ));
        let (ktext, klatex) = signed_pair(np, nm, &|sd| {
            (
                format!("(({sddot_t} {eb} B'_{sd}/2)/W_{sd} + W_{sd} Phi'_{sd})"),
                format!("\\left(\\frac{{{sddot_l}{eb}B_{{{sd}}}'/2}}{{W_{{{sd}}}}}+W_{{{sd}}}\\Phi_{{{sd}}}'\\right)"),
            )
        });
        out.push(f(
            "K_ss_jump",
            format!("[K^{s}_{s}] = {ktext}"),
            format!("\\left[K^{{{s}}}{{}}_{{{s}}}\\right]={klatex}", s = if s == "tau" { "\\tau" } else { "l" }),
        ));
        match self.shape.kind {
            ShellKind::Timelike => {
                out.push(f(
                    "sigma",
                    format!("sigma = -{} ({ytext})", over_8pi(n, "R").0),
                    format!("\\sigma=-{}\\left({ylatex}\\right)", over_8pi(n, "R").1),
                ));
                out.push(f(
                    "pressure",
                    format!("p = (1/(8 pi)) ( [K^tau_tau] + {}({ytext})/R )", times(n - 1)),
                    format!(
                        "p=\\frac{{1}}{{8\\pi}}\\left(\\left[K^{{\\tau}}{{}}_{{\\tau}}\\right]+\\frac{{{}}}{{R}}\\left({ylatex}\\right)\\right)",
                        n - 1
                    ),
                ));
                let (st, sl) =
                    signed_pair(np, nm, &|sd| (format!("sqrt(B_{sd}(a))"), format!("\\sqrt{{B_{{{sd}}}(a)}}")));
                out.push(f(
                    "sigma0",
                    format!("sigma0 = -{} ({st})", over_8pi(n, "a").0),
                    format!("\\sigma_0=-{}\\left({sl}\\right)", over_8pi(n, "a").1),
                ));
                let (pt, pl) = signed_pair(np, nm, &|sd| {
                    (
                        format!("sqrt(B_{sd}) (A'_{sd}/(2 A_{sd}) + {}/a)", n - 1),
                        format!(
                            "\\sqrt{{B_{{{sd}}}}}\\left(\\frac{{A_{{{sd}}}'}}{{2A_{{{sd}}}}}+\\frac{{{}}}{{a}}\\right)",
                            n - 1
                        ),
                    )
                });
                out.push(f(
                    "pressure0",
                    format!("p0 = (1/(8 pi)) ({pt})"),
                    format!("p_0=\\frac{{1}}{{8\\pi}}\\left({pl}\\right)"),
                ));
                out.push(f(
                    "potential",
                    format!("Rdot^2 + V(R) = 0,  V(R) = (B_+ + B_-)/2 - ((B_+ - B_-)/(2 kappa))^2 - kappa^2/4,  kappa = {}", kappa_def(n).0),
                    format!("\\dot{{R}}^{{2}}+V(R)=0,\\quad V(R)=\\frac{{B_{{+}}+B_{{-}}}}{{2}}-\\left(\\frac{{B_{{+}}-B_{{-}}}}{{2\\kappa}}\\right)^{{2}}-\\frac{{\\kappa^{{2}}}}{{4}},\\quad \\kappa={}", kappa_def(n).1),
                ));
                let omega = super::unit_sphere_area(n);
                let om_l = match n {
                    2 => "4\\pi".to_string(),
                    3 => "2\\pi^{2}".to_string(),
                    _ => format!("\\Omega_{{{n}}}"),
                };
                out.push(f(
                    "shell_mass",
                    format!("M_s = Omega_{n} R^{n} sigma,  Omega_{n} = {omega:.12}"),
                    format!("M_{{s}}={om_l}\\,R^{{{n}}}\\sigma"),
                ));
                let (xt, xl) =
                    signed_pair(np, nm, &|sd| (format!("W_{sd} Phi'_{sd}"), format!("W_{{{sd}}}\\Phi_{{{sd}}}'")));
                let flux_t = if a_equals_b {
                    "Xi = 0 (A = B on both sides)".to_string()
                } else {
                    format!("Xi = ({n}/(8 pi R)) ({xt})")
                };
                let flux_l = if a_equals_b {
                    "\\Xi=0".to_string()
                } else {
                    format!("\\Xi=\\frac{{{n}}}{{8\\pi R}}\\left({xl}\\right)")
                };
                out.push(f(
                    "conservation",
                    format!("d sigma/dR = -({n}/R)(sigma + p) + Xi,  {flux_t}"),
                    format!(
                        "\\frac{{d\\sigma}}{{dR}}=-\\frac{{{n}}}{{R}}\\left(\\sigma+p\\right)+\\Xi,\\qquad {flux_l}"
                    ),
                ));
                out.push(f(
                    "stability",
                    "beta^2 = dp/dsigma at a0;  V''(a0) = c0 + c1 beta^2;  stable iff V''(a0) > 0".to_string(),
                    "\\beta^{2}=\\left.\\frac{dp}{d\\sigma}\\right|_{a_0},\\qquad V''(a_0)=c_0+c_1\\beta^{2}>0"
                        .to_string(),
                ));
            }
            ShellKind::Spacelike => {
                out.push(f(
                    "S_ll",
                    format!("S^l_l = -{} [K^theta_theta]  (not an energy density)", over_8pi(n, "").0),
                    format!("S^{{l}}{{}}_{{l}}=-\\frac{{{n}}}{{8\\pi}}\\left[K^{{\\theta}}{{}}_{{\\theta}}\\right]"),
                ));
                out.push(f(
                    "S_thth",
                    format!("S^theta_theta = -(1/(8 pi)) ([K^l_l] + {}[K^theta_theta])  (not a pressure)", times(n - 1)),
                    format!(
                        "S^{{\\theta}}{{}}_{{\\theta}}=-\\frac{{1}}{{8\\pi}}\\left(\\left[K^{{l}}{{}}_{{l}}\\right]+{}\\left[K^{{\\theta}}{{}}_{{\\theta}}\\right]\\right)",
                        n - 1
                    ),
                ));
                out.push(f(
                    "potential",
                    format!("(dR/dl)^2 + V(R) = 0,  V(R) = -(B_+ + B_-)/2 - ((B_+ - B_-)/(2 Y))^2 - Y^2/4,  Y = -8 pi R S^l_l/{n}"),
                    format!("\\left(\\frac{{dR}}{{dl}}\\right)^{{2}}+V(R)=0,\\quad V(R)=-\\frac{{B_{{+}}+B_{{-}}}}{{2}}-\\left(\\frac{{B_{{+}}-B_{{-}}}}{{2Y}}\\right)^{{2}}-\\frac{{Y^{{2}}}}{{4}},\\quad Y=-\\frac{{8\\pi R S^{{l}}{{}}_{{l}}}}{{{n}}}"),
                ));
            }
        }
        let _ = (sdot_t, s);
        out
    }
}
