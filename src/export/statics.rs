//! Static radii, tuned configurations and sweeps as text, CSV and JSON.

use super::num;
use crate::statics::sweep::SweepReport;
use crate::statics::tune::TuneReport;
use crate::statics::StaticsReport;

/// Readable list of static radii.
pub fn statics_text(r: &StaticsReport) -> String {
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

/// CSV of static radii (provenance comment, header with units, one row per radius).
pub fn statics_csv(r: &StaticsReport) -> String {
    let mut o =
        format!("# {}\n# equation of state: p = {}\n", crate::text::one_line(&r.provenance), r.equation_of_state);
    for n in &r.neutral_intervals {
        o.push_str(&format!("# every radius in [{}, {}] is static (neutral)\n", num(n.from), num(n.to)));
    }
    o.push_str("radius [M],sigma [1/M],pressure [1/M],potential_second_derivative [1/M^2],stability,beta2 [1],beta2_critical [1],shell_mass [M],residual [1/M],double_root,near_horizon,null,weak,strong,dominant\n");
    for s in &r.static_radii {
        let ec = &s.energy_conditions;
        o.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
            num(s.radius),
            num(s.sigma),
            num(s.pressure),
            num(s.potential_second_derivative),
            s.stability.name(),
            num(s.beta2),
            s.beta2_critical.map(num).unwrap_or_default(),
            num(s.shell_mass),
            num(s.residual),
            s.double_root,
            s.near_horizon,
            ec.null,
            ec.weak,
            ec.strong,
            ec.dominant
        ));
    }
    o
}

/// JSON for `tune`: each solution carries the parameter under its own name.
pub fn tune_json(r: &TuneReport) -> String {
    let sols: Vec<serde_json::Value> = r
        .solutions
        .iter()
        .map(|s| {
            let mut m = serde_json::Map::new();
            m.insert("radius".into(), s.radius.into());
            m.insert(s.parameter.clone(), s.value.into());
            m.insert("potential_second_derivative".into(), s.potential_second_derivative.into());
            m.insert("stability".into(), s.stability.name().into());
            m.insert("sigma".into(), s.sigma.into());
            m.insert("pressure".into(), s.pressure.into());
            m.insert("residual".into(), s.residual.into());
            m.insert(
                "d_radius_d_parameter".into(),
                s.d_radius_d_parameter.map(serde_json::Value::from).unwrap_or(serde_json::Value::Null),
            );
            serde_json::Value::Object(m)
        })
        .collect();
    let v = serde_json::json!({
        "scenario": crate::text::one_line(&r.scenario),
        "provenance": r.provenance,
        "parameter": r.parameter,
        "searched": r.searched,
        "solutions": sols,
        "notes": r.notes,
    });
    serde_json::to_string_pretty(&v).unwrap_or_default()
}

/// Readable `tune` result.
pub fn tune_text(r: &TuneReport) -> String {
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
pub fn sweep_text(r: &SweepReport) -> String {
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

/// CSV of a sweep: one row per branch point.
pub fn sweep_csv(r: &SweepReport) -> String {
    let mut o = format!("# {}\n", crate::text::one_line(&r.provenance));
    o.push_str(&format!("branch,{} [param],radius [M],potential_second_derivative [1/M^2],stability\n", r.parameter));
    for b in &r.branches {
        for p in &b.points {
            o.push_str(&format!(
                "{},{},{},{},{}\n",
                b.id,
                num(p.value),
                num(p.radius),
                num(p.potential_second_derivative),
                p.stability.name()
            ));
        }
    }
    o
}

/// A booktabs table of static solutions, ready to `\input`.
pub fn statics_latex(r: &StaticsReport) -> String {
    use super::latex_num;
    let mut o = format!(
        "% {}\n% equation of state: p = {}\n% requires \\usepackage{{booktabs}}\n",
        crate::text::one_line(&r.provenance),
        r.equation_of_state
    );
    o.push_str("\\begin{tabular}{rrrrrl}\n\\toprule\n$a_0/M$ & $\\sigma_0 M$ & $p_0 M$ & $\\beta^{2}$ & $V''(a_0) M^{2}$ & stability \\\\\n\\midrule\n");
    for s in &r.static_radii {
        let mut st = s.stability.name().to_string();
        if s.double_root || s.near_horizon {
            st.push_str("$^{*}$");
        }
        o.push_str(&format!(
            "${}$ & ${}$ & ${}$ & ${}$ & ${}$ & {} \\\\\n",
            latex_num(s.radius),
            latex_num(s.sigma),
            latex_num(s.pressure),
            latex_num(s.beta2),
            latex_num(s.potential_second_derivative),
            st
        ));
    }
    if r.static_radii.is_empty() {
        o.push_str("\\multicolumn{6}{c}{no static radius in the range} \\\\\n");
    }
    o.push_str("\\bottomrule\n\\end{tabular}\n");
    if r.static_radii.iter().any(|s| s.double_root || s.near_horizon) {
        o.push_str("% $^{*}$ ill-conditioned: a double root or within 1e-6 of a horizon\n");
    }
    o
}

/// CSV of tuned configurations (one row per solution).
pub fn tune_csv(r: &TuneReport) -> String {
    let mut o = format!("# {}\nradius [M],{} [param],potential_second_derivative [1/M^2],stability,sigma [1/M],pressure [1/M],residual [1/M],d_radius_d_parameter [M/param]\n", crate::text::one_line(&r.provenance), r.parameter);
    for s in &r.solutions {
        o.push_str(&format!(
            "{},{},{},{},{},{},{},{}\n",
            num(s.radius),
            num(s.value),
            num(s.potential_second_derivative),
            s.stability.name(),
            num(s.sigma),
            num(s.pressure),
            num(s.residual),
            s.d_radius_d_parameter.map(num).unwrap_or_default()
        ));
    }
    o
}
