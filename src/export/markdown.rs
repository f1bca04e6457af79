//! Markdown tables for notes: the static solutions of `statics` and the values of `derive`, each under its
//! provenance line (in backticks) with 6 significant digits, as the LaTeX tables have. User text is escaped
//! for a table cell (`|`, backslash, emphasis and code marks) and kept to one line.

use super::{Item, Renderer};
use crate::junction::EnergyConditions;
use crate::report::derive::DeriveReport;
use crate::statics::StaticsReport;

/// Markdown: `statics` and `derive`.
pub struct Markdown;

impl Renderer for Markdown {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        match item {
            Item::Statics(r) => Some(statics(r)),
            Item::Derive { report, .. } => Some(derive(report)),
            _ => None,
        }
    }
}

/// A number with 6 significant digits: fixed notation for 1e-3 <= |x| < 1e5, else `1.5e-7`; `–` if not finite.
pub fn md_num(x: f64) -> String {
    match super::short(x) {
        super::Short::NotFinite => "–".into(),
        super::Short::Fixed(s) => s,
        super::Short::Scientific(_) => {
            let s = format!("{x:.5e}");
            match s.split_once('e') {
                Some((m, k)) => format!("{}e{k}", super::trim_zeros(m)),
                None => s,
            }
        }
    }
}

/// User text as the content of a table cell or a line of prose: one line, Markdown's special characters
/// escaped.
pub fn escape(s: &str) -> String {
    let mut o = String::new();
    for c in crate::text::one_line(s).chars() {
        if matches!(c, '\\' | '|' | '*' | '_' | '`' | '<' | '>' | '[' | ']' | '#') {
            o.push('\\');
        }
        o.push(c);
    }
    o
}

/// The provenance as an inline code span (its backticks written as `'`).
fn provenance(p: &str) -> String {
    format!("`{}`\n\n", crate::text::one_line(p).replace('`', "'"))
}

fn energy(ec: &EnergyConditions) -> String {
    let held: Vec<&str> = [("null", ec.null), ("weak", ec.weak), ("strong", ec.strong), ("dominant", ec.dominant)]
        .iter()
        .filter(|(_, h)| *h)
        .map(|(n, _)| *n)
        .collect();
    if held.is_empty() {
        "none".into()
    } else {
        held.join(", ")
    }
}

/// `statics`: one row per static radius (a0, sigma0, p0, beta^2, V''(a0), stability, beta^2_crit, shell mass,
/// the energy conditions that hold), ill-conditioned roots marked with `*` and explained below the table.
pub fn statics(r: &StaticsReport) -> String {
    let mut o = format!("### Static radii: {}\n\n", escape(&r.scenario));
    o.push_str(&provenance(&r.provenance));
    o.push_str(&format!(
        "Equation of state p = {}; radii searched in {} .. {} [M].\n\n",
        escape(&r.equation_of_state),
        md_num(r.from),
        md_num(r.to)
    ));
    for n in &r.neutral_intervals {
        o.push_str(&format!("Every radius in [{}, {}] is static (neutral).\n\n", md_num(n.from), md_num(n.to)));
    }
    if r.static_radii.is_empty() {
        o.push_str("No static radius in the range.\n");
    } else {
        o.push_str(
            "| # | a0 [M] | sigma0 [1/M] | p0 [1/M] | beta^2 [1] | V''(a0) [1/M^2] | stability | beta^2_crit [1] \
             | shell mass [M] | energy conditions held |\n\
             | ---: | ---: | ---: | ---: | ---: | ---: | :--- | ---: | ---: | :--- |\n",
        );
        for (i, s) in r.static_radii.iter().enumerate() {
            let mark = if s.double_root || s.near_horizon { " \\*" } else { "" };
            o.push_str(&format!(
                "| {} | {} | {} | {} | {} | {} | {}{mark} | {} | {} | {} |\n",
                i + 1,
                md_num(s.radius),
                md_num(s.sigma),
                md_num(s.pressure),
                md_num(s.beta2),
                md_num(s.potential_second_derivative),
                s.stability.name(),
                s.beta2_critical.map(md_num).unwrap_or_else(|| "none".into()),
                md_num(s.shell_mass),
                energy(&s.energy_conditions)
            ));
        }
        if r.static_radii.iter().any(|s| s.double_root || s.near_horizon) {
            o.push_str("\n\\* ill-conditioned: a double root or within 1e-6 of a horizon.\n");
        }
    }
    for n in &r.notes {
        o.push_str(&format!("\n> note: {}\n", escape(n)));
    }
    o
}

/// `derive`: the values at one shell state as a `quantity | value | unit` table.
pub fn derive(r: &DeriveReport) -> String {
    let mut o = format!("### Junction at R = {}: {}\n\n", md_num(r.radius), escape(&r.scenario));
    o.push_str(&provenance(&r.provenance));
    o.push_str(&format!(
        "{} shell, D = {}; minus side A = {}, B = {} (keep {}); plus side A = {}, B = {} (keep {}).\n\n",
        r.shell_kind,
        r.dimension,
        escape(&r.minus.a_expr),
        escape(&r.minus.b_expr),
        r.minus.keep,
        escape(&r.plus.a_expr),
        escape(&r.plus.b_expr),
        r.plus.keep
    ));
    o.push_str("| quantity | value | unit |\n| :--- | ---: | :--- |\n");
    let mut row = |q: &str, v: String, u: &str| o.push_str(&format!("| {q} | {v} | {u} |\n"));
    row("R", md_num(r.radius), "M");
    if r.velocity != 0.0 || r.acceleration != 0.0 {
        row("dR/ds", md_num(r.velocity), "1");
        row("d2R/ds2", md_num(r.acceleration), "1/M");
    }
    let timelike = r.shell_kind == "timelike";
    if timelike {
        row("surface energy density sigma", r.sigma.map(md_num).unwrap_or_else(|| "–".into()), "1/M");
        row("surface pressure p", r.pressure.map(md_num).unwrap_or_else(|| "–".into()), "1/M");
    } else {
        row("S^l_l (not an energy density)", r.s_ll.map(md_num).unwrap_or_else(|| "–".into()), "1/M");
        row("S^theta_theta (not a pressure)", r.s_thth.map(md_num).unwrap_or_else(|| "–".into()), "1/M");
    }
    row("[K^s_s]", md_num(r.k_ss_jump), "1/M");
    row("[K^theta_theta]", md_num(r.k_thth_jump), "1/M");
    if let Some(m) = r.shell_mass {
        row("shell mass M_s", md_num(m), "M");
    }
    row("V(R)", md_num(r.potential), "1");
    if let Some(v1) = r.potential_first_derivative {
        row("V'(a) (zero when static)", md_num(v1), "1/M");
    }
    if let Some(x) = r.flux_term {
        row("flux term Xi", md_num(x), "1/M^2");
    }
    if let (Some(c0), Some(c1)) = (r.v2_at_beta2_zero, r.v2_slope) {
        row("V''(a) at beta^2 = 0", md_num(c0), "1/M^2");
        row("dV''(a)/d(beta^2)", md_num(c1), "1/M^2");
    }
    if let Some(Some(b)) = r.beta2_critical {
        row("beta^2_crit", md_num(b), "1");
    }
    if let Some(sw) = r.stable_when {
        let w = match sw.name() {
            "beta2_above" => "beta^2 > beta^2_crit",
            "beta2_below" => "beta^2 < beta^2_crit",
            "always" => "every beta^2",
            _ => "no beta^2",
        };
        row("linearly stable for", w.into(), "");
    }
    if let Some(e) = &r.equation_of_state {
        row(&format!("P(sigma0) of p = {}", escape(&e.law)), md_num(e.pressure_from_law), "1/M");
        row("residual p0 - P(sigma0)", md_num(e.residual), "1/M");
        row("beta^2 = P'(sigma0)", md_num(e.beta2), "1");
        row("V''(a) with the law", md_num(e.potential_second_derivative), "1/M^2");
    }
    if let Some(ec) = &r.energy_conditions {
        row("energy conditions held", energy(ec), "");
    }
    for w in &r.warnings {
        o.push_str(&format!("\n> warning: {}\n", escape(w)));
    }
    o
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::Scenario;

    /// Schwarzschild thin-shell wormhole with p = w sigma, w = -0.75 (our scenario
    /// schwarzschild-wormhole-linear.toml), with a name that needs escaping.
    fn wormhole() -> Scenario {
        Scenario::parse(
            "name = \"w|h *test*\"\n[parameters]\nm = 1.0\nw = -0.75\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n\
             [plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[shell]\npressure = \"w*sigma\"\n",
            None,
        )
        .unwrap()
    }

    /// The cells of the table rows (lines starting with `|`), split at unescaped `|`.
    fn rows(md: &str) -> Vec<Vec<String>> {
        md.lines()
            .filter(|l| l.starts_with('|'))
            .map(|l| {
                let mut cells = Vec::new();
                let mut cur = String::new();
                let mut esc = false;
                for c in l.trim().trim_matches('|').chars() {
                    if c == '|' && !esc {
                        cells.push(cur.trim().to_string());
                        cur.clear();
                    } else {
                        cur.push(c);
                    }
                    esc = c == '\\' && !esc;
                }
                cells.push(cur.trim().to_string());
                cells
            })
            .collect()
    }

    #[test]
    fn statics_table_has_one_row_per_static_radius_with_the_report_values() {
        let s = wormhole();
        let st = crate::statics::find_static_radii(&s, 2.1, 20.0, &Default::default()).unwrap();
        assert!(!st.static_radii.is_empty());
        let md = statics(&st);
        let t = rows(&md);
        // Header, delimiter row, one row per radius; every row has the header's 10 cells.
        assert_eq!(t.len(), 2 + st.static_radii.len());
        assert!(t.iter().all(|r| r.len() == 10), "{md}");
        assert_eq!(t[0][1], "a0 [M]");
        for (row, sr) in t[2..].iter().zip(&st.static_radii) {
            let a0: f64 = row[1].parse().unwrap();
            assert!((a0 - sr.radius).abs() <= 1e-5 * sr.radius, "{} vs {}", row[1], sr.radius);
            assert_eq!(row[6].trim_end_matches(" \\*"), sr.stability.name());
        }
        // The scenario name's `|` and `*` are escaped, so they neither split a cell nor start emphasis.
        assert!(md.starts_with("### Static radii: w\\|h \\*test\\*\n"), "{md}");
    }

    #[test]
    fn derive_table_lists_sigma_and_pressure_of_a_timelike_shell() {
        let s = wormhole();
        let rep = crate::report::derive::derive(&s, crate::report::derive::State::at_rest(4.0)).unwrap();
        let md = derive(&rep);
        let t = rows(&md);
        assert!(t.iter().all(|r| r.len() == 3), "{md}");
        let value = |q: &str| t.iter().find(|r| r[0] == q).map(|r| r[1].clone()).unwrap();
        // Poisson & Visser 1995 (Schwarzschild thin-shell wormhole): sigma = -(1/(2 pi a)) sqrt(1 - 2m/a); at a = 4m
        // sigma = -sqrt(1/2)/(8 pi) = -0.0281349 (from memory; the same value the README quotes for derive).
        assert_eq!(value("surface energy density sigma"), "-0.0281349");
        assert_eq!(value("R"), "4");
        assert!(!md.contains("S^l_l"));
    }

    #[test]
    fn numbers_have_six_significant_digits() {
        // Common practice: 6 significant digits, fixed notation in a readable range.
        assert_eq!(md_num(3.0638123456), "3.06381");
        assert_eq!(md_num(-0.000123456789), "-1.23457e-4");
        assert_eq!(md_num(123456.0), "1.23456e5");
        assert_eq!(md_num(2.0), "2");
        assert_eq!(md_num(f64::NAN), "–");
    }
}
