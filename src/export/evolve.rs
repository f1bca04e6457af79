//! Shell dynamics as text, CSV (the time series) and JSON (the summary).

use super::num;
use crate::dynamics::{EvolveReport, Start};
use crate::metric::RegionKind;

fn start_text(r: &EvolveReport) -> String {
    let i = &r.initial;
    let how = match r.start {
        Start::Kick(da) => format!("kick DA = {} (at rest at a0 + DA)", num(da)),
        Start::Velocity(v) => format!("velocity V0 = {} at a0", num(v)),
        Start::Moving(v) => format!("at R with dR/dτ = {} (sigma from the junction condition)", num(v)),
        Start::Sigma { sigma, .. } => {
            format!("at R with sigma = {} (|dR/dτ| from the energy constraint)", num(sigma))
        }
    };
    format!("{how}: R = {}, dR/dτ = {}, sigma = {}", num(i.radius), num(i.rdot), num(i.sigma))
}

fn opt(x: Option<f64>) -> String {
    x.map(num).unwrap_or_else(|| "none".into())
}

/// Readable summary of an `evolve` run.
pub fn evolve_text(r: &EvolveReport) -> String {
    let mut o = format!(
        "scenario: {}\n# {}\nequation of state: p = {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.equation_of_state
    );
    if let (Some(a0), Some(s0), Some(v2)) = (r.static_radius, r.static_sigma, r.potential_second_derivative) {
        let verdict = match r.linear_verdict {
            Some("stable") => "linearly stable",
            Some("unstable") => "linearly unstable",
            _ => "marginal: the linear test does not decide",
        };
        o.push_str(&format!(
            "static radius a0 = {}  sigma0 = {}  V''(a0) = {} ({verdict})\n",
            num(a0),
            num(s0),
            num(v2)
        ));
    }
    o.push_str(&format!("start: {}\n", start_text(r)));
    o.push_str(&format!(
        "integrated to τ = {} of {}: stop = {}\n  {}\n",
        num(r.tau_end),
        num(r.duration),
        r.stop,
        r.stop_detail
    ));
    o.push_str(&format!("fate: {}\n", r.fate.name()));
    for sd in &r.sides {
        let hs: Vec<String> =
            sd.horizons.iter().map(|(x, d)| if *d { format!("{} (double)", num(*x)) } else { num(*x) }).collect();
        o.push_str(&format!(
            "{} side: horizons {}; start {} n^r {}, end {} n^r {}; {} horizon crossing(s), {} normal flip(s)\n",
            sd.side,
            if hs.is_empty() { "none".to_string() } else { hs.join(", ") },
            region_name(sd.region_start),
            sign_name(sd.normal_sign_start),
            region_name(sd.region_end),
            sign_name(sd.normal_sign_end),
            sd.horizon_crossings,
            sd.normal_flips
        ));
    }
    o.push_str("events:\n");
    for e in &r.events {
        o.push_str(&format!("  τ = {:<14} R = {:<14} {:<16} {}\n", num(e.tau), num(e.radius), e.kind.name(), e.detail));
    }
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
        None if r.static_radius.is_some() => {
            o.push_str("measured period: none (fewer than two same-direction crossings of a0)\n")
        }
        None => o.push_str("measured period: none (fewer than two same-direction crossings of the starting radius)\n"),
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

fn region_name(k: Option<RegionKind>) -> &'static str {
    match k {
        Some(RegionKind::R) => "R-region",
        Some(RegionKind::T) => "T-region",
        None => "on a horizon",
    }
}

fn sign_name(x: f64) -> &'static str {
    if x > 0.0 {
        "> 0"
    } else if x < 0.0 {
        "< 0"
    } else {
        "= 0"
    }
}

/// The time series as CSV: provenance comment lines, a header with units (lengths in the scenario's length
/// unit M, G = c = 1), one row per accepted step. The events come first, one comment line each
/// (`# event: kind, tau, R, side, detail`); the last two columns are n^r on the minus and plus side.
pub fn evolve_csv(r: &EvolveReport) -> String {
    let mut o = format!("# {}\n", crate::text::one_line(&r.provenance));
    o.push_str(&format!(
        "# evolve: p = {}; a0 = {}; {}; stop = {}; rtol = {:e}, atol = {:e}\n",
        r.equation_of_state,
        r.static_radius.map(num).unwrap_or_else(|| "none".into()),
        start_text(r),
        r.stop,
        r.tolerances[0],
        r.tolerances[1]
    ));
    for e in &r.events {
        o.push_str(&format!(
            "# event: {}, {}, {}, {}, {}\n",
            e.kind.name(),
            num(e.tau),
            num(e.radius),
            e.side.unwrap_or(""),
            e.detail.replace(',', ";")
        ));
    }
    o.push_str("tau [M],R [M],dR/dtau [1],sigma [1/M],p [1/M],Rdot^2+V [1],n^r_minus [1],n^r_plus [1]\n");
    for s in &r.samples {
        o.push_str(&format!(
            "{},{},{},{},{},{},{},{}\n",
            num(s.tau),
            num(s.radius),
            num(s.rdot),
            num(s.sigma),
            num(s.pressure),
            num(s.constraint),
            num(s.n_r[0]),
            num(s.n_r[1])
        ));
    }
    o
}

/// The summary as pretty JSON (the time series is in the CSV).
pub fn evolve_json(r: &EvolveReport) -> String {
    serde_json::to_string_pretty(r).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"))
}
