//! Shell dynamics as text, CSV (the time series) and JSON (the summary).

use super::num;
use crate::dynamics::{EvolveReport, Start};

fn start_text(r: &EvolveReport) -> String {
    let i = &r.initial;
    let how = match r.start {
        Start::Kick(da) => format!("kick DA = {} (at rest at a0 + DA)", num(da)),
        Start::Velocity(v) => format!("velocity V0 = {} at a0", num(v)),
    };
    format!("{how}: R = {}, dR/dτ = {}, sigma = {}", num(i.radius), num(i.rdot), num(i.sigma))
}

fn opt(x: Option<f64>) -> String {
    x.map(num).unwrap_or_else(|| "none".into())
}

/// Readable summary of an `evolve` run.
pub fn evolve_text(r: &EvolveReport) -> String {
    let mut o =
        format!("scenario: {}\n# {}\nequation of state: p = {}\n", r.scenario, r.provenance, r.equation_of_state);
    let verdict = if r.potential_second_derivative > 0.0 {
        "linearly stable"
    } else if r.potential_second_derivative < 0.0 {
        "linearly unstable"
    } else {
        "undecided"
    };
    o.push_str(&format!(
        "static radius a0 = {}  sigma0 = {}  V''(a0) = {} ({verdict})\n",
        num(r.static_radius),
        num(r.static_sigma),
        num(r.potential_second_derivative)
    ));
    o.push_str(&format!("start: {}\n", start_text(r)));
    o.push_str(&format!(
        "integrated to τ = {} of {}: stop = {}\n  {}\n",
        num(r.tau_end),
        num(r.duration),
        r.stop,
        r.stop_detail
    ));
    o.push_str(&format!("fate: {}\n", r.fate.name()));
    o.push_str(&format!(
        "turning points: {}   R range: {} .. {}\n",
        r.turning_points_count,
        num(r.radius_range[0]),
        num(r.radius_range[1])
    ));
    match (r.linear_period, r.linear_growth_time) {
        (Some(t), _) => o.push_str(&format!("linear period 2π/sqrt(V''(a0)/2) = {}\n", num(t))),
        (None, Some(g)) => o.push_str(&format!("linear e-folding time 1/sqrt(-V''(a0)/2) = {}\n", num(g))),
        _ => {}
    }
    match &r.measured_period {
        Some(p) => o.push_str(&format!(
            "measured period = {} (mean of {} cycles, from {})   measured/linear = {}\n",
            num(p.value),
            p.cycles,
            p.method.replace('_', " "),
            opt(r.period_ratio)
        )),
        None => o.push_str("measured period: none (fewer than two same-direction crossings of a0)\n"),
    }
    o.push_str(&format!(
        "energy constraint: max |Rdot² + V| / (1 + Rdot²) = {:.3e}   steps: {} accepted, {} rejected (rtol {:.0e}, atol {:.0e})\n",
        r.max_constraint_drift, r.steps_accepted, r.steps_rejected, r.tolerances[0], r.tolerances[1]
    ));
    if let Some(e) = &r.ensemble {
        o.push_str(&format!(
            "ensemble: {} kicks in [-{s}, {s}], bounded (ended by the duration, |R - a0| <= {}): {} = {:.1} %\n",
            e.members_count,
            num(e.bound),
            e.bounded,
            100.0 * e.bounded_fraction,
            s = num(e.spread)
        ));
        for m in &e.members {
            o.push_str(&format!(
                "  DA = {:>12}  {:<10} stop = {:<14} max |R - a0| = {:.4e}{}\n",
                format!("{:.6}", m.kick),
                m.fate.name(),
                m.stop,
                m.max_excursion,
                if m.bounded { "  bounded" } else { "" }
            ));
        }
    }
    for n in &r.notes {
        o.push_str(&format!("note: {n}\n"));
    }
    o
}

/// The time series as CSV: provenance comment lines, a header with units (lengths in the scenario's length
/// unit M, G = c = 1), one row per accepted step.
pub fn evolve_csv(r: &EvolveReport) -> String {
    let mut o = format!("# {}\n", r.provenance);
    o.push_str(&format!(
        "# evolve: p = {}; a0 = {}; {}; stop = {}; rtol = {:e}, atol = {:e}\n",
        r.equation_of_state,
        num(r.static_radius),
        start_text(r),
        r.stop,
        r.tolerances[0],
        r.tolerances[1]
    ));
    o.push_str("tau [M],R [M],dR/dtau [1],sigma [1/M],p [1/M],Rdot^2+V [1]\n");
    for s in &r.samples {
        o.push_str(&format!(
            "{},{},{},{},{},{}\n",
            num(s.tau),
            num(s.radius),
            num(s.rdot),
            num(s.sigma),
            num(s.pressure),
            num(s.constraint)
        ));
    }
    o
}

/// The summary as pretty JSON (the time series is in the CSV).
pub fn evolve_json(r: &EvolveReport) -> String {
    serde_json::to_string_pretty(r).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"))
}
