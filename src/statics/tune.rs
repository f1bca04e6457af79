//! Fine-tuned configurations: the parameter value that puts a static shell at a chosen radius, and the
//! configurations that are static and marginally stable at once (V = V' = V'' = 0).
//!
//! Method. At a fixed radius, f(a; lambda) = p0 - P(sigma0) is scanned over a range of lambda and every sign change
//! refined (see `roots`). For marginal configurations the two equations f = 0 and V''(a0) = 0 in the unknowns
//! (a0, lambda) are solved by Newton's method on the 2x2 system with an exact Jacobian from dual numbers
//! (`newton::solve`, nalgebra's LU for the step), started from sign changes of V'' along the curve of static
//! solutions. A direct Newton step was chosen over a least-squares minimiser because the system is square and its
//! Jacobian exact; Gauss-Newton on J^T J squares the condition number and stalls where J^T J is singular.
//! Sensitivity: da0/dlambda = -f_lambda / f_a (implicit-function theorem), with both partials from dual numbers.

use super::{residual, Stability, StaticsOptions};
use crate::error::{Error, Result};
use crate::junction::potential::Law;
use crate::junction::Junction;
use crate::newton::{self, NewtonOptions, StepTolerance, Termination};
use crate::roots::{find_roots, RootOptions};
use crate::scenario::Scenario;
use num_dual::Dual64;
use serde::Serialize;

/// One tuned configuration.
#[derive(Debug, Clone, Serialize)]
pub struct TuneSolution {
    /// Static radius a0.
    pub radius: f64,
    /// Name of the tuned parameter.
    pub parameter: String,
    /// Its value.
    pub value: f64,
    /// V''(a0) with the scenario's law at this value.
    pub potential_second_derivative: f64,
    /// Verdict.
    pub stability: Stability,
    /// sigma0.
    pub sigma: f64,
    /// p0.
    pub pressure: f64,
    /// |p0 - P(sigma0)|.
    pub residual: f64,
    /// d a0 / d parameter along the family of static solutions (implicit-function theorem); null where f_a = 0.
    pub d_radius_d_parameter: Option<f64>,
}

/// Result of `tune`.
#[derive(Debug, Clone, Serialize)]
pub struct TuneReport {
    /// Scenario name.
    pub scenario: String,
    /// Provenance.
    pub provenance: String,
    /// The tuned parameter.
    pub parameter: String,
    /// The parameter range searched.
    pub searched: [f64; 2],
    /// Solutions.
    pub solutions: Vec<TuneSolution>,
    /// Notes.
    pub notes: Vec<String>,
}

/// f(a, lambda) and its partials (f, f_a, f_lambda), plus V'' and its partials when `with_v2`.
fn eval(s: &Scenario, k: usize, a: f64, lam: f64, with_v2: bool) -> Option<([f64; 3], [f64; 3])> {
    let mut out_f = [0.0; 3];
    let mut out_g = [0.0; 3];
    for (slot, (da, dl)) in [(1usize, (1.0, 0.0)), (2usize, (0.0, 1.0))] {
        let mut p: Vec<Dual64> = s.params.values().iter().map(|&v| Dual64::from(v)).collect();
        p[k] = Dual64::new(lam, dl);
        let j = Junction::with_params(&s.model, p);
        let (f, sv) = residual(&j, Dual64::new(a, da))?;
        out_f[0] = f.re;
        out_f[slot] = f.eps;
        if with_v2 {
            let v = j.potential_taylor(&sv, Law::Scenario)?;
            out_g[0] = v[2].re;
            out_g[slot] = v[2].eps;
        }
    }
    Some((out_f, out_g))
}

fn solution(s: &Scenario, k: usize, a: f64, lam: f64, opts: &StaticsOptions) -> Option<TuneSolution> {
    let (f, g) = eval(s, k, a, lam, true)?;
    let j = Junction::with_params(&s.model, s.params.values_with(&s.params.names()[k], lam).ok()?);
    let (_, sv) = residual(&j, a)?;
    let ls = j.linear_stability(&sv);
    // The one marginal rule (`stability::marginal_scale`), with the slope at its full size.
    let scale = crate::junction::stability::marginal_scale(&ls, 1.0, a);
    Some(TuneSolution {
        radius: a,
        parameter: s.params.names()[k].clone(),
        value: lam,
        potential_second_derivative: g[0],
        stability: Stability::classify(g[0], scale, opts.marginal_tol),
        sigma: sv.stress.sigma(),
        pressure: sv.stress.pressure(),
        residual: f[0].abs(),
        d_radius_d_parameter: if f[1] != 0.0 { Some(-f[2] / f[1]) } else { None },
    })
}

fn check_eos(s: &Scenario) -> Result<()> {
    if s.shell.eos.is_none() {
        return Err(Error::input(format!("{}: tuning needs an equation of state", s.origin.label()))
            .with_hint("add [shell] pressure = \"...\"; without a law every radius is static for suitable sigma, p"));
    }
    Ok(())
}

/// Default parameter range around the current value: lambda0 +- 10 max(|lambda0|, 1).
pub fn default_param_range(v: f64) -> (f64, f64) {
    let d = 10.0 * v.abs().max(1.0);
    (v - d, v + d)
}

/// The index of the parameter `name` solved for and its search bounds (`range`, else the default range around
/// its value); the scenario must have a law.
fn solved_parameter(s: &Scenario, name: &str, range: Option<(f64, f64)>) -> Result<(usize, (f64, f64))> {
    check_eos(s)?;
    let k = s.params.index(name).map_err(|e| e.context_phrase(crate::phrase![crate::RequestField::Solve]))?;
    Ok((k, range.unwrap_or_else(|| default_param_range(s.params.values()[k]))))
}

/// Every value of parameter `name` in `range` for which a static shell sits at radius `a`.
pub fn tune_at_radius(
    s: &Scenario,
    name: &str,
    a: f64,
    range: Option<(f64, f64)>,
    opts: &StaticsOptions,
) -> Result<TuneReport> {
    let (k, (lo, hi)) = solved_parameter(s, name, range)?;
    // Validate the radius once with the current parameters (horizon, region) for a clear message.
    Junction::new(s).static_values(a)?;
    let f = |lam: f64| eval(s, k, a, lam, false).map(|(f, _)| (f[0], f[2]));
    let ropts = RootOptions { samples: 800, ..opts.roots };
    let scan = find_roots(&f, None::<&fn(f64) -> Option<(f64, f64)>>, lo, hi, &ropts);
    let mut notes = Vec::new();
    let solutions: Vec<TuneSolution> = scan.roots.iter().filter_map(|r| solution(s, k, a, r.x, opts)).collect();
    if solutions.is_empty() {
        notes.push(format!(
            "no value of {name} in [{lo}, {hi}] puts a static shell at a = {a}; widen the search with --within LO:HI"
        ));
    }
    for p in scan.poles {
        notes.push(format!("p0 - P(sigma0) changes sign through a pole near {name} = {:.8}: not a solution", p.x));
    }
    Ok(TuneReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        parameter: name.to_string(),
        searched: [lo, hi],
        solutions,
        notes,
    })
}

/// Newton's method on (f, V'') = 0 in (a, lambda) (`newton::solve`, steps damped to stay in the static domain);
/// returns the point reached if both residuals are then negligible.
fn newton_marginal(s: &Scenario, k: usize, a: f64, lam: f64) -> Option<(f64, f64)> {
    let opts = NewtonOptions { max_iterations: 60, damping_tries: 30, tolerance: StepTolerance::Relative(1e-14) };
    let system = |x: [f64; 2]| eval(s, k, x[0], x[1], true).map(|(f, g)| ([f[0], g[0]], [[f[1], f[2]], [g[1], g[2]]]));
    let accept = |x: [f64; 2]| x[0] > 0.0 && eval(s, k, x[0], x[1], false).is_some();
    let out = newton::solve(system, accept, [a, lam], &opts);
    if !matches!(out.termination, Termination::Converged { .. } | Termination::MaxIterations) {
        return None;
    }
    let [a, lam] = out.x;
    let (f, g) = eval(s, k, a, lam, true)?;
    let fs = f[1].abs() * a.abs() + f[2].abs() * lam.abs().max(1.0);
    let gs = g[1].abs() * a.abs() + g[2].abs() * lam.abs().max(1.0);
    (f[0].abs() <= 1e-9 * fs.max(1e-300) && g[0].abs() <= 1e-9 * gs.max(1e-300)).then_some((a, lam))
}

/// Static and marginally stable configurations with the radius in [lo, hi] and parameter `name` free.
pub fn tune_marginal(
    s: &Scenario,
    name: &str,
    lo: f64,
    hi: f64,
    range: Option<(f64, f64)>,
    opts: &StaticsOptions,
) -> Result<TuneReport> {
    let (k, (plo, phi)) = solved_parameter(s, name, range)?;
    let ropts = RootOptions { samples: 300, ..opts.roots };
    let radii = crate::roots::sample_points(lo, hi, 150);
    // Static solutions (a_i, lambda_ij) and V'' there.
    let mut rows: Vec<Vec<(f64, f64)>> = Vec::new();
    for &a in &radii {
        let f = |lam: f64| eval(s, k, a, lam, false).map(|(f, _)| (f[0], f[2]));
        let scan = find_roots(&f, None::<&fn(f64) -> Option<(f64, f64)>>, plo, phi, &ropts);
        let row = scan.roots.iter().filter_map(|r| eval(s, k, a, r.x, true).map(|(_, g)| (r.x, g[0]))).collect();
        rows.push(row);
    }
    let mut found: Vec<(f64, f64)> = Vec::new();
    for i in 0..radii.len() - 1 {
        for &(lam0, g0) in &rows[i] {
            // The continuation of this static solution at the next radius: the nearest lambda.
            let Some(&(lam1, g1)) = rows[i + 1].iter().min_by(|x, y| (x.0 - lam0).abs().total_cmp(&(y.0 - lam0).abs()))
            else {
                continue;
            };
            if g0.signum() != g1.signum() {
                let w = g0.abs() / (g0.abs() + g1.abs());
                let (a_s, l_s) = (radii[i] + w * (radii[i + 1] - radii[i]), lam0 + w * (lam1 - lam0));
                if let Some((a, l)) = newton_marginal(s, k, a_s, l_s) {
                    if !found
                        .iter()
                        .any(|(fa, fl)| (fa - a).abs() < 1e-8 * a && (fl - l).abs() < 1e-8 * l.abs().max(1.0))
                    {
                        found.push((a, l));
                    }
                }
            }
        }
    }
    found.sort_by(|x, y| x.0.total_cmp(&y.0));
    let mut notes = vec![format!(
        "searched radii {lo} .. {hi} and {name} in [{plo}, {phi}]; marginal solutions are ill-conditioned by nature (V'' changes sign there)"
    )];
    let solutions: Vec<TuneSolution> = found
        .iter()
        .filter_map(|&(a, l)| solution(s, k, a, l, opts))
        .map(|mut sol| {
            sol.stability = Stability::Marginal;
            // At a static, marginally stable point the static branch folds: f_a = 0 and da0/dlambda diverges.
            sol.d_radius_d_parameter = None;
            sol
        })
        .collect();
    if solutions.is_empty() {
        notes.push("no static, marginally stable configuration found in the search box".to_string());
    }
    Ok(TuneReport {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        parameter: name.to_string(),
        searched: [plo, phi],
        solutions,
        notes,
    })
}
