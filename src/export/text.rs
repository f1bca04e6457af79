//! The readable text form of every result.

use super::{num, Item, Renderer};
use crate::dynamics::{EvolveReport, Start};
use crate::geodesic::{ChainReport, CrossingReport, Particle};
use crate::junction::closed::ClosedForms;
use crate::metric::RegionKind;
use crate::report::derive::DeriveReport;
use crate::scenario::Symbols;
use crate::statics::sweep::SweepReport;
use crate::statics::tune::TuneReport;
use crate::statics::StaticsReport;
use crate::survey::SurveyReport;

/// Readable text: every command offers it (the default `--format`).
pub struct Text;

impl Renderer for Text {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        Some(match item {
            Item::Survey(r) => survey(r),
            Item::Derive { report, .. } => derive(report),
            Item::ClosedForms { forms, symbols, provenance, .. } => closed(forms, symbols, provenance),
            Item::Statics(r) => statics(r),
            Item::Tune(r) => tune(r),
            Item::Sweep(r) => sweep(r),
            Item::Evolve(r) => evolve(r),
            Item::Crossing(r) => crossing(r),
            Item::Chain(r) => chain(r),
        })
    }
}

/// `check`: each side's horizons, poles, regions and photon orbits.
pub fn survey(r: &SurveyReport) -> String {
    let mut o = format!(
        "scenario: {}\n{}\nshell: {}, D = {}, radii {} .. {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.shell_kind,
        r.dimension,
        r.from,
        r.to
    );
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "\n[{name}] keep = {}, sign of n^r = {:+}\n  A(r) = {}\n  B(r) = {}\n",
            sd.keep, sd.normal_sign, sd.a, sd.b
        ));
        if sd.survey.horizons.is_empty() {
            o.push_str("  horizons: none in range\n");
        }
        for h in &sd.survey.horizons {
            let deg = if h.degenerate { " (degenerate: double root, numerically ill-conditioned)" } else { "" };
            o.push_str(&format!("  horizon at r = {:.15}  B'(r) = {:.6e}{deg}\n", h.radius, h.b_slope));
        }
        for p in &sd.survey.poles {
            o.push_str(&format!("  B changes sign through a pole near r = {p:.6} (not a horizon)\n"));
        }
        for g in &sd.survey.regions {
            let k = match g.kind {
                RegionKind::R => "R-region (B > 0, static shells possible)",
                RegionKind::T => "T-region (B < 0, r is timelike)",
            };
            o.push_str(&format!("  {:.6} < r < {:.6}: {k}\n", g.from, g.to));
        }
        if sd.survey.photon_orbits.is_empty() {
            o.push_str("  circular photon orbits: none in range\n");
        }
        for p in &sd.survey.photon_orbits {
            o.push_str(&format!("  circular photon orbit at r = {p:.15}\n"));
        }
    }
    o
}

/// `derive`: formulas first, then the values.
pub fn derive(r: &DeriveReport) -> String {
    let timelike = r.shell_kind == "timelike";
    let mut o = String::new();
    o.push_str(&format!(
        "scenario: {}\n# {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance)
    ));
    o.push_str(&format!(
        "{} shell, D = {}, R = {}{}\n",
        r.shell_kind,
        r.dimension,
        num(r.radius),
        if r.velocity != 0.0 || r.acceleration != 0.0 {
            format!(", dR/ds = {}, d2R/ds2 = {}", num(r.velocity), num(r.acceleration))
        } else {
            " (static)".into()
        }
    ));
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "  [{name}] keep = {}, n^r sign {:+}:  A(r) = {},  B(r) = {}\n",
            sd.keep, sd.normal_sign, sd.a_expr, sd.b_expr
        ));
    }
    o.push_str("\nformulas (sides: + plus, - minus):\n");
    for f in &r.formulas {
        o.push_str(&format!("  {}\n", f.text));
    }
    o.push_str("\nvalues:\n");
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "  {name}: A = {}  B = {}  A' = {}  B' = {}  n^r = {}  K^s_s = {}  K^theta_theta = {}\n",
            num(sd.a),
            num(sd.b),
            num(sd.a_prime),
            num(sd.b_prime),
            num(sd.n_r),
            num(sd.k_ss),
            num(sd.k_thth)
        ));
    }
    o.push_str(&format!("  [K^s_s] = {}   [K^theta_theta] = {}\n", num(r.k_ss_jump), num(r.k_thth_jump)));
    if timelike {
        let sigma = r.sigma.unwrap_or(f64::NAN);
        let p = r.pressure.unwrap_or(f64::NAN);
        o.push_str(&format!("  surface energy density sigma = {}\n", num(sigma)));
        o.push_str(&format!("  surface pressure p = {}\n", num(p)));
        if let Some(m) = r.shell_mass {
            o.push_str(&format!("  shell mass M_s = {}\n", num(m)));
        }
    } else {
        o.push_str(&format!("  S^l_l = {}   (not an energy density)\n", num(r.s_ll.unwrap_or(f64::NAN))));
        o.push_str(&format!("  S^theta_theta = {}   (not a pressure)\n", num(r.s_thth.unwrap_or(f64::NAN))));
    }
    o.push_str(&format!("  V(R) = {}\n", num(r.potential)));
    if let Some(v1) = r.potential_first_derivative {
        o.push_str(&format!("  V'(a) = {}  (zero at a static solution: a check)\n", num(v1)));
    }
    if let Some(x) = r.flux_term {
        o.push_str(&format!("  flux term Xi = {}\n", num(x)));
    }
    if let (Some(c0), Some(c1), Some(sw)) = (r.v2_at_beta2_zero, r.v2_slope, r.stable_when) {
        o.push_str(&format!("  V''(a) = {} + ({}) beta^2\n", num(c0), num(c1)));
        let crit = r.beta2_critical.flatten();
        let verdict = match (sw.name(), crit) {
            ("beta2_above", Some(b)) => format!("stable for beta^2 > {}", num(b)),
            ("beta2_below", Some(b)) => format!("stable for beta^2 < {}", num(b)),
            ("always", _) => "stable for every beta^2".to_string(),
            _ => "unstable for every beta^2".to_string(),
        };
        o.push_str(&format!("  linear stability: {verdict}\n"));
    }
    if let Some(e) = &r.equation_of_state {
        o.push_str(&format!(
            "  equation of state p = {}: P(sigma0) = {}, residual p0 - P = {}, beta^2 = {}, V''(a) = {}\n",
            e.law,
            num(e.pressure_from_law),
            num(e.residual),
            num(e.beta2),
            num(e.potential_second_derivative)
        ));
    }
    if let Some(ec) = &r.energy_conditions {
        let yn = |b: bool| if b { "holds" } else { "violated" };
        o.push_str(&format!(
            "  energy conditions: null {}, weak {}, strong {}, dominant {}\n",
            yn(ec.null),
            yn(ec.weak),
            yn(ec.strong),
            yn(ec.dominant)
        ));
    }
    for w in &r.warnings {
        o.push_str(&format!("\nwarning: {w}\n"));
    }
    o
}

/// `closed-form`: one `lhs = rhs` line per quantity (the right-hand sides parse as junctura expressions).
pub fn closed(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> String {
    let mut o = format!("# {provenance}\n");
    for h in super::closed::header_lines(cf) {
        o.push_str(&format!("# {h}\n"));
    }
    for r in super::closed::render_all(cf, symbols) {
        o.push_str(&format!("{} = {}\n", r.lhs, r.text));
    }
    o
}

/// Readable list of static radii.
pub fn statics(r: &StaticsReport) -> String {
    let mut o = format!(
        "scenario: {}\n# {}\nequation of state: p = {}\nradius range {} .. {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.equation_of_state,
        num(r.from),
        num(r.to)
    );
    for iv in &r.intervals {
        o.push_str(&format!("  searched {} .. {} (both sides R-regions)\n", num(iv.from), num(iv.to)));
    }
    for n in &r.neutral_intervals {
        o.push_str(&format!("every radius in [{}, {}] is static (neutral)\n", num(n.from), num(n.to)));
    }
    if r.static_radii.is_empty() && r.neutral_intervals.is_empty() {
        o.push_str("no static radius in the range\n");
    }
    for (i, s) in r.static_radii.iter().enumerate() {
        let mut flags = Vec::new();
        if s.double_root {
            flags.push("double root: ill-conditioned");
        }
        if s.near_horizon {
            flags.push("near a horizon: ill-conditioned");
        }
        o.push_str(&format!(
            "{}. a0 = {}  sigma0 = {}  p0 = {}  V''(a0) = {}  -> {}{}\n     beta^2 = {}  beta^2_crit = {}  shell mass = {}  residual = {:.1e}  V(a0) = {:.1e}  V'(a0) = {:.1e}\n",
            i + 1,
            num(s.radius),
            num(s.sigma),
            num(s.pressure),
            num(s.potential_second_derivative),
            s.stability.name(),
            if flags.is_empty() { String::new() } else { format!(" ({})", flags.join("; ")) },
            num(s.beta2),
            s.beta2_critical.map(num).unwrap_or_else(|| "none".into()),
            num(s.shell_mass),
            s.residual,
            s.potential[0],
            s.potential[1]
        ));
    }
    for n in &r.notes {
        o.push_str(&format!("note: {n}\n"));
    }
    o
}

/// Readable `tune` result.
pub fn tune(r: &TuneReport) -> String {
    let mut o = format!(
        "scenario: {}\n# {}\nsolving for {} in [{}, {}]\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.parameter,
        num(r.searched[0]),
        num(r.searched[1])
    );
    for s in &r.solutions {
        o.push_str(&format!(
            "  {} = {}  a0 = {}  sigma0 = {}  p0 = {}  V''(a0) = {} -> {}  da0/d{} = {}\n",
            s.parameter,
            num(s.value),
            num(s.radius),
            num(s.sigma),
            num(s.pressure),
            num(s.potential_second_derivative),
            s.stability.name(),
            s.parameter,
            s.d_radius_d_parameter.map(num).unwrap_or_else(|| "undefined (fold)".into())
        ));
    }
    for n in &r.notes {
        o.push_str(&format!("note: {n}\n"));
    }
    o
}

/// Readable sweep: one block per branch.
pub fn sweep(r: &SweepReport) -> String {
    let mut o = format!(
        "scenario: {}\n# {}\nvarying {} over {} values; radius range {} .. {}\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.parameter,
        r.values.len(),
        num(r.radius_range[0]),
        num(r.radius_range[1])
    );
    if r.branches.is_empty() {
        o.push_str("no static radius for any value\n");
    }
    for b in &r.branches {
        o.push_str(&format!("branch {} ({} points, {} folds)\n", b.id, b.points.len(), b.folds.len()));
        for p in &b.points {
            o.push_str(&format!(
                "  {} = {:<24} a0 = {:<24} V'' = {:<24} {}\n",
                r.parameter,
                num(p.value),
                num(p.radius),
                num(p.potential_second_derivative),
                p.stability.name()
            ));
        }
        for f in &b.folds {
            o.push_str(&format!("  fold near {} = {}, a0 = {}\n", r.parameter, num(f.value), num(f.radius)));
        }
    }
    for n in &r.notes {
        o.push_str(&format!("note: {n}\n"));
    }
    o
}

/// How an `evolve` run started, in words (also a CSV comment line).
pub(super) fn evolve_start(r: &EvolveReport) -> String {
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

fn opt_none(x: Option<f64>) -> String {
    x.map(num).unwrap_or_else(|| "none".into())
}

/// Readable summary of an `evolve` run.
pub fn evolve(r: &EvolveReport) -> String {
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
    o.push_str(&format!("start: {}\n", evolve_start(r)));
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
            opt_none(r.period_ratio)
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

fn fmt_opt(v: Option<f64>) -> String {
    v.map(|x| format!("{x:.12}")).unwrap_or_else(|| "-".into())
}

/// `geodesic`: the crossing and the orbit on each side.
pub fn crossing(r: &CrossingReport) -> String {
    let what = match r.particle {
        Particle::Timelike => "particle",
        Particle::Null => "light ray",
    };
    let mut o = format!(
        "scenario: {}\n{}\n{} shell at R = {}, dR/dtau = {}; radial {what} with E = {} on the minus side\n",
        crate::text::one_line(&r.scenario),
        crate::text::one_line(&r.provenance),
        r.shell_kind,
        r.radius,
        r.shell_velocity,
        r.energy_minus
    );
    if !r.can_cross {
        o.push_str(&format!("cannot cross: {}\n", r.reason.as_deref().unwrap_or("")));
    } else {
        o.push_str(&format!("crosses: E_plus = {}\n", fmt_opt(r.energy_plus)));
        let obs = if r.shell_kind == "spacelike" { "the shell's normal observer" } else { "the shell" };
        match r.relative_lorentz_factor {
            Some(g) => o.push_str(&format!(
                "relative Lorentz factor with {obs}: {g:.12} (check from the plus side: {})\n",
                fmt_opt(r.relative_lorentz_factor_check)
            )),
            None => o.push_str(&format!("energy measured by {obs}: {}\n", fmt_opt(r.shell_frame_energy))),
        }
    }
    for (name, sd) in [("minus", Some(&r.minus)), ("plus", r.plus.as_ref())] {
        let Some(sd) = sd else { continue };
        let st = &sd.state;
        o.push_str(&format!(
            "\n[{name}] E = {:.12}, A(R) = {:.6}, B(R) = {:.6}, dr/dtau = {:.9}, u.n = {:.9}\n",
            st.energy, st.a, st.b, st.radial_velocity, st.u_dot_n
        ));
        if !sd.turning_points.is_empty() {
            let tp: Vec<String> = sd.turning_points.iter().map(|x| format!("{x:.12}")).collect();
            o.push_str(&format!("  turning points (A = E^2): {}\n", tp.join(", ")));
        }
        if let Some(a) = &sd.max_radius {
            o.push_str(&format!("  maximal radius of the radial geodesic through R: {:.15}\n", a.radius));
            if let (Some(h), Some(d), Some(p)) = (a.horizon, a.areal_distance, a.proper_distance) {
                o.push_str(&format!("  above the horizon r = {h:.12}: areal {d:.6e}, proper {p:.6e}\n"));
            }
            o.push_str(&format!(
                "  from R to the maximal radius: proper time {}, coordinate time {}\n",
                fmt_opt(sd.proper_time_to_max_radius),
                fmt_opt(sd.coordinate_time_to_max_radius)
            ));
        }
        for n in &sd.notes {
            o.push_str(&format!("  note: {n}\n"));
        }
    }
    o
}

fn sci(v: Option<f64>) -> String {
    v.map(|x| format!("{x:.6e}")).unwrap_or_else(|| "-".into())
}

/// `chain`: one line per crossing (with lengths in metres when the run has a mass unit).
pub fn chain(r: &ChainReport) -> String {
    let si = r.unit.is_some();
    let mut o = format!("chain: {}\n{}\n", crate::text::one_line(&r.chain), crate::text::one_line(&r.provenance));
    if let Some(l) = r.length_unit_m {
        o.push_str(&format!("lengths in units of G M/c^2 = {l:.9e} m (and in m)\n"));
    }
    o.push_str(&format!(
        "\n{:>6} {:>5} {:>13} {:>13} {:>13} {:>13}",
        "cross", "stage", "E_plus", "r_max-r_h", "proper", "Lorentz"
    ));
    if si {
        o.push_str(&format!(" {:>13} {:>13}", "r_max-r_h[m]", "proper[m]"));
    }
    o.push('\n');
    for row in &r.rows {
        let a = row.row.apex;
        o.push_str(&format!(
            "{:>6} {:>5} {:>13} {:>13} {:>13} {:>13}",
            row.row.crossing,
            row.row.stage,
            sci(row.row.energy_plus),
            sci(a.and_then(|a| a.areal_distance)),
            sci(a.and_then(|a| a.proper_distance)),
            sci(row.row.relative_lorentz_factor)
        ));
        if si {
            o.push_str(&format!(" {:>13} {:>13}", sci(row.areal_distance_m), sci(row.proper_distance_m)));
        }
        if row.row.status != "bounded" {
            o.push_str(&format!("  {}", row.row.status));
        }
        o.push('\n');
    }
    if let Some(t) = r.threshold {
        let tm = r.threshold_m.map(|m| format!(" = {m:.6e} m")).unwrap_or_default();
        let say = |v: Option<usize>| {
            v.map(|k| format!("after crossing {k}")).unwrap_or_else(|| "not within these crossings".into())
        };
        o.push_str(&format!(
            "\nwithin {t:.6e} M{tm} of the horizon: areal {}, proper {}\n",
            say(r.first_within_areal),
            say(r.first_within_proper)
        ));
    }
    o
}
