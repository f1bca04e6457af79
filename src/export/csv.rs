//! CSV tables, written by the `csv` crate: `#` comment lines (provenance), a header line with units, one row
//! per point. Numbers are formatted here ([`num`]: shortest round-trip form) and handed to the writer as
//! strings; a field is quoted only where CSV needs it (a comma, a quote or a line break; quotes doubled), except
//! the columns a table quotes in every row. Lines end in `\n`.

use super::{num, Item, Renderer};
use crate::dynamics::EvolveReport;
use crate::geodesic::{ChainRun, CrossingReport};
use crate::junction::EnergyConditions;
use crate::metric::RegionKind;
use crate::report::derive::DeriveReport;
use crate::scan::cell::MAX_ROOTS;
use crate::scan::{Cell, CellClass};
use crate::statics::sweep::SweepReport;
use crate::statics::tune::TuneReport;
use crate::statics::StaticsReport;
use crate::survey::SurveyReport;
use crate::units::MassUnit;
use ::csv::{QuoteStyle, Terminator, WriterBuilder};

/// CSV tables: every command with one table.
pub struct Csv;

impl Renderer for Csv {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        Some(match item {
            Item::Survey(r) => survey(r),
            Item::Derive { report, .. } => derive(report),
            Item::Statics(r) => statics(r),
            Item::Tune(r) => tune(r),
            Item::Sweep(r) => sweep(r),
            Item::Evolve(r) => evolve(r),
            Item::Crossing(r) => crossing(r),
            Item::Chain(r) => chain(&r.run, &r.provenance, r.unit.as_ref()),
            Item::ClosedForms { .. } => return None,
        })
    }
}

/// A CSV table being written: comment lines first, then the header and the rows.
#[derive(Debug, Default)]
pub struct Table {
    out: Vec<u8>,
    quoted: Vec<usize>,
}

impl Table {
    /// An empty table.
    pub fn new() -> Table {
        Table::default()
    }

    /// Quote column `k` (from 0) in every row after the header, whatever it holds.
    pub fn quote_column(mut self, k: usize) -> Table {
        self.quoted.push(k);
        self
    }

    /// A comment line `# text` (`text` must be one line: pass user text through `text::one_line`).
    pub fn comment(&mut self, text: &str) {
        self.out.extend_from_slice(b"# ");
        self.out.extend_from_slice(text.as_bytes());
        self.out.push(b'\n');
    }

    /// The header line (never force-quoted).
    pub fn header<S: AsRef<str>>(&mut self, names: &[S]) {
        self.line(names, &[]);
    }

    /// One data row.
    pub fn row<S: AsRef<str>>(&mut self, fields: &[S]) {
        let quoted = std::mem::take(&mut self.quoted);
        self.line(fields, &quoted);
        self.quoted = quoted;
    }

    /// Write `fields` as one line: each run of fields with the same quoting is one record of a `csv::Writer`
    /// (which quotes and closes the fields), joined by commas.
    fn line<S: AsRef<str>>(&mut self, fields: &[S], quoted: &[usize]) {
        let always = |k: usize| quoted.contains(&k);
        let mut k = 0;
        while k < fields.len() {
            let st = always(k);
            let end = (k..fields.len()).find(|&j| always(j) != st).unwrap_or(fields.len());
            if k > 0 {
                self.out.push(b',');
            }
            let mut w = WriterBuilder::new()
                .quote_style(if st { QuoteStyle::Always } else { QuoteStyle::Necessary })
                .terminator(Terminator::Any(b'\n'))
                .has_headers(false)
                .buffer_capacity(1024)
                .from_writer(&mut self.out);
            let run = &fields[k..end];
            // A record of one empty field is written `""` (so that it is not an empty line); inside our longer
            // rows an empty field stays empty. Writing to a Vec cannot fail.
            if st || run.len() > 1 || !run[0].as_ref().is_empty() {
                let _ = w.write_record(run.iter().map(|f| f.as_ref()));
                let _ = w.flush();
                drop(w);
                // The record's terminator: the row goes on or ends below.
                self.out.pop();
            }
            k = end;
        }
        self.out.push(b'\n');
    }

    /// The table as text.
    pub fn finish(self) -> String {
        // Only UTF-8 strings went in.
        String::from_utf8(self.out).unwrap_or_default()
    }
}

/// An optional number: empty when absent.
fn opt(x: Option<f64>) -> String {
    x.map(num).unwrap_or_default()
}

/// A finite number, else an empty field.
fn finite(x: f64) -> String {
    if x.is_finite() {
        num(x)
    } else {
        String::new()
    }
}

/// `check`: one row per horizon, photon orbit and region boundary of each side.
pub fn survey(r: &SurveyReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.header(&["side", "feature", "radius [M]", "detail"]);
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        for h in &sd.survey.horizons {
            t.row(&[name, "horizon", &num(h.radius), if h.degenerate { "degenerate" } else { "simple" }]);
        }
        for p in &sd.survey.photon_orbits {
            t.row(&[name, "photon_orbit", &num(*p), ""]);
        }
        for g in &sd.survey.regions {
            let k = match g.kind {
                RegionKind::R => "R",
                RegionKind::T => "T",
            };
            t.row(&[name, "region_start", &num(g.from), k]);
        }
    }
    t.finish()
}

/// `derive`: one row with the main values; fields that do not exist for the shell kind are empty.
pub fn derive(r: &DeriveReport) -> String {
    let ec = r.energy_conditions;
    let b = |f: fn(&EnergyConditions) -> bool| ec.as_ref().map(|e| f(e).to_string()).unwrap_or_default();
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.header(&[
        "shell_kind",
        "radius [M]",
        "velocity [1]",
        "acceleration [1/M]",
        "sigma [1/M]",
        "pressure [1/M]",
        "S_ll [1/M]",
        "S_thth [1/M]",
        "K_ss_jump [1/M]",
        "K_thth_jump [1/M]",
        "shell_mass [M]",
        "potential [1]",
        "beta2_critical [1]",
        "stable_when",
        "null",
        "weak",
        "strong",
        "dominant",
        "flux_term [1/M^2]",
    ]);
    t.row(&[
        r.shell_kind.to_string(),
        num(r.radius),
        num(r.velocity),
        num(r.acceleration),
        opt(r.sigma),
        opt(r.pressure),
        opt(r.s_ll),
        opt(r.s_thth),
        num(r.k_ss_jump),
        num(r.k_thth_jump),
        opt(r.shell_mass),
        num(r.potential),
        opt(r.beta2_critical.flatten()),
        r.stable_when.map(|s| s.name()).unwrap_or("").to_string(),
        b(|e| e.null),
        b(|e| e.weak),
        b(|e| e.strong),
        b(|e| e.dominant),
        opt(r.flux_term),
    ]);
    t.finish()
}

/// `statics`: one row per static radius; neutral intervals as comment lines.
pub fn statics(r: &StaticsReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.comment(&format!("equation of state: p = {}", r.equation_of_state));
    for n in &r.neutral_intervals {
        t.comment(&format!("every radius in [{}, {}] is static (neutral)", num(n.from), num(n.to)));
    }
    t.header(&[
        "radius [M]",
        "sigma [1/M]",
        "pressure [1/M]",
        "potential_second_derivative [1/M^2]",
        "stability",
        "beta2 [1]",
        "beta2_critical [1]",
        "shell_mass [M]",
        "residual [1/M]",
        "double_root",
        "near_horizon",
        "null",
        "weak",
        "strong",
        "dominant",
    ]);
    for s in &r.static_radii {
        let ec = &s.energy_conditions;
        t.row(&[
            num(s.radius),
            num(s.sigma),
            num(s.pressure),
            num(s.potential_second_derivative),
            s.stability.name().to_string(),
            num(s.beta2),
            opt(s.beta2_critical),
            num(s.shell_mass),
            num(s.residual),
            s.double_root.to_string(),
            s.near_horizon.to_string(),
            ec.null.to_string(),
            ec.weak.to_string(),
            ec.strong.to_string(),
            ec.dominant.to_string(),
        ]);
    }
    t.finish()
}

/// `tune`: one row per solution.
pub fn tune(r: &TuneReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.header(&[
        "radius [M]".to_string(),
        format!("{} [param]", r.parameter),
        "potential_second_derivative [1/M^2]".into(),
        "stability".into(),
        "sigma [1/M]".into(),
        "pressure [1/M]".into(),
        "residual [1/M]".into(),
        "d_radius_d_parameter [M/param]".into(),
    ]);
    for s in &r.solutions {
        t.row(&[
            num(s.radius),
            num(s.value),
            num(s.potential_second_derivative),
            s.stability.name().to_string(),
            num(s.sigma),
            num(s.pressure),
            num(s.residual),
            opt(s.d_radius_d_parameter),
        ]);
    }
    t.finish()
}

/// `sweep`: one row per branch point.
pub fn sweep(r: &SweepReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.header(&[
        "branch".to_string(),
        format!("{} [param]", r.parameter),
        "radius [M]".into(),
        "potential_second_derivative [1/M^2]".into(),
        "stability".into(),
    ]);
    for b in &r.branches {
        for p in &b.points {
            t.row(&[
                b.id.to_string(),
                num(p.value),
                num(p.radius),
                num(p.potential_second_derivative),
                p.stability.name().to_string(),
            ]);
        }
    }
    t.finish()
}

/// `evolve`: the time series, one row per accepted step (lengths in the scenario's length unit M, G = c = 1).
/// The events come first, one comment line each (`# event: kind, tau, R, side, detail`); the last two columns
/// are n^r on the minus and plus side.
pub fn evolve(r: &EvolveReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.comment(&format!(
        "evolve: p = {}; a0 = {}; {}; stop = {}; rtol = {:e}, atol = {:e}",
        r.equation_of_state,
        r.static_radius.map(num).unwrap_or_else(|| "none".into()),
        super::text::evolve_start(r),
        r.stop,
        r.tolerances[0],
        r.tolerances[1]
    ));
    for e in &r.events {
        t.comment(&format!(
            "event: {}, {}, {}, {}, {}",
            e.kind.name(),
            num(e.tau),
            num(e.radius),
            e.side.unwrap_or(""),
            e.detail.replace(',', ";")
        ));
    }
    t.header(&[
        "tau [M]",
        "R [M]",
        "dR/dtau [1]",
        "sigma [1/M]",
        "p [1/M]",
        "Rdot^2+V [1]",
        "n^r_minus [1]",
        "n^r_plus [1]",
    ]);
    for s in &r.samples {
        t.row(&[
            num(s.tau),
            num(s.radius),
            num(s.rdot),
            num(s.sigma),
            num(s.pressure),
            num(s.constraint),
            num(s.n_r[0]),
            num(s.n_r[1]),
        ]);
    }
    t.finish()
}

/// `geodesic`: one row with the crossing's main numbers; empty fields where the particle cannot cross
/// (`reason` says why, its commas written as semicolons).
pub fn crossing(r: &CrossingReport) -> String {
    let mut t = Table::new();
    t.comment(&crate::text::one_line(&r.provenance));
    t.header(&[
        "radius [M]",
        "shell_velocity [1]",
        "energy_minus [1]",
        "energy_plus [1]",
        "relative_lorentz_factor [1]",
        "can_cross",
        "reason",
    ]);
    t.row(&[
        num(r.radius),
        num(r.shell_velocity),
        num(r.energy_minus),
        opt(r.energy_plus),
        opt(r.relative_lorentz_factor),
        r.can_cross.to_string(),
        r.reason.clone().unwrap_or_default().replace(',', ";"),
    ]);
    t.finish()
}

/// A number in the chain table: scientific with 17 digits after the point.
fn sci(x: f64) -> String {
    format!("{x:.17e}")
}

/// `chain`: a provenance comment line, a header line with units, one row per crossing. Lengths in geometric
/// units (G M/c^2, "M"); with a mass unit, also in metres. The status is quoted in every row (its quotes
/// written as `'`).
pub fn chain(run: &ChainRun, provenance: &str, unit: Option<&MassUnit>) -> String {
    let mut head: Vec<&str> = vec![
        "crossing",
        "stage",
        "pass",
        "radius [M]",
        "energy_minus [1]",
        "energy_plus [1]",
        "one_minus_energy_sq [1]",
        "relative_lorentz_factor [1]",
        "apex_radius [M]",
        "horizon_radius [M]",
        "areal_distance [M]",
        "proper_distance [M]",
    ];
    if unit.is_some() {
        head.extend(["areal_distance [m]", "proper_distance [m]"]);
    }
    head.push("status");
    let mut t = Table::new().quote_column(head.len() - 1);
    t.comment(provenance);
    t.header(&head);
    let o = |v: Option<f64>| v.map(sci).unwrap_or_default();
    for r in &run.rows {
        let a = r.apex.as_ref();
        let mut cells = vec![
            r.crossing.to_string(),
            r.stage.to_string(),
            r.pass.to_string(),
            sci(r.radius),
            sci(r.energy_minus),
            o(r.energy_plus),
            o(r.one_minus_energy_sq),
            o(r.relative_lorentz_factor),
            o(a.map(|a| a.radius)),
            o(a.and_then(|a| a.horizon)),
            o(a.and_then(|a| a.areal_distance)),
            o(a.and_then(|a| a.proper_distance)),
        ];
        if let Some(u) = unit {
            cells.push(o(a.and_then(|a| a.areal_distance).map(|d| u.to_m(d))));
            cells.push(o(a.and_then(|a| a.proper_distance).map(|d| u.to_m(d))));
        }
        cells.push(r.status.replace('"', "'"));
        t.row(&cells);
    }
    t.finish()
}

/// Map data: one CSV row per cell (no header; see `map::csv_header`), appended to `out`. Fields not defined
/// for the cell's class are empty.
pub fn map_rows(cells: &[Cell], out: &mut String) {
    let mut t = Table::new();
    let mut fields: Vec<String> = Vec::with_capacity(16 + 2 * MAX_ROOTS);
    for c in cells {
        let b = c.energy_bits;
        let has = c.class != CellClass::NoStatic && c.class != CellClass::InsideHorizon;
        let ec = |bit: u8| match (has, b & bit != 0) {
            (false, _) => "",
            (true, true) => "true",
            (true, false) => "false",
        };
        fields.clear();
        fields.extend([
            c.ix.to_string(),
            c.iy.to_string(),
            num(c.x),
            num(c.y),
            finite(c.radius),
            finite(c.sigma),
            finite(c.pressure),
            finite(c.beta2),
            finite(c.v2),
            finite(c.beta2_critical),
            c.class.name().to_string(),
            ec(1).to_string(),
            ec(2).to_string(),
            ec(4).to_string(),
            ec(8).to_string(),
            c.n_static.to_string(),
        ]);
        for k in 0..MAX_ROOTS {
            if c.roots[k].is_finite() {
                let cls = CellClass::ALL.get(c.root_classes[k] as usize).map(|c| c.name()).unwrap_or("");
                fields.push(num(c.roots[k]));
                fields.push(cls.to_string());
            } else {
                fields.extend([String::new(), String::new()]);
            }
        }
        t.row(&fields);
    }
    out.push_str(&t.finish());
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The hand-built writer this module replaced (`format!` with commas, `"..."` around forced-quoted
    /// fields), kept here to show that the bytes did not change.
    fn old_writer(comment: &str, header: &str, rows: &[Vec<String>], quoted_last: bool) -> String {
        let mut o = format!("# {comment}\n{header}\n");
        for r in rows {
            let mut cells = r.clone();
            if quoted_last {
                let last = cells.pop().unwrap_or_default();
                cells.push(format!("\"{}\"", last.replace('"', "'")));
            }
            o.push_str(&cells.join(","));
            o.push('\n');
        }
        o
    }

    #[test]
    fn rows_without_special_characters_are_the_old_bytes() {
        let rows: Vec<Vec<String>> = vec![
            vec!["1".into(), num(0.1 + 0.2), String::new(), "stable".into(), num(-1e-300)],
            vec!["2".into(), num(3.0), num(f64::MAX), "unstable".into(), String::new()],
        ];
        let mut t = Table::new();
        t.comment("junctura 0.1.0 | scenario w (sha256 ab12) | m=1");
        t.header(&["branch", "w [param]", "radius [M]", "stability", "V'' [1/M^2]"]);
        for r in &rows {
            t.row(r);
        }
        let want = old_writer(
            "junctura 0.1.0 | scenario w (sha256 ab12) | m=1",
            "branch,w [param],radius [M],stability,V'' [1/M^2]",
            &rows,
            false,
        );
        assert_eq!(t.finish(), want);
    }

    #[test]
    fn a_forced_quoted_column_is_the_old_bytes() {
        let rows: Vec<Vec<String>> = vec![
            vec!["0".into(), String::new(), "bounded".into()],
            vec!["1".into(), sci(2.5), "stopped: no root, near r = 2".into()],
        ];
        let mut t = Table::new().quote_column(2);
        t.comment("p");
        t.header(&["crossing", "energy_plus [1]", "status"]);
        for r in &rows {
            let mut r = r.clone();
            r[2] = r[2].replace('"', "'");
            t.row(&r);
        }
        assert_eq!(t.finish(), old_writer("p", "crossing,energy_plus [1],status", &rows, true));
    }

    #[test]
    fn a_user_label_with_a_comma_or_a_quote_is_quoted_and_its_quotes_doubled() {
        // RFC 4180 (common practice): a field with a comma, a quote or a line break is quoted, quotes doubled.
        let mut t = Table::new();
        t.header(&["label", "x"]);
        t.row(&["shell \"A\", outer", "1.5"]);
        t.row(&["plain", ""]);
        t.row(&["two\nlines", "2"]);
        assert_eq!(t.finish(), "label,x\n\"shell \"\"A\"\", outer\",1.5\nplain,\n\"two\nlines\",2\n");
        // Read back by the csv crate's reader: the label survives whole.
        let text = "label,x\n\"shell \"\"A\"\", outer\",1.5\n";
        let mut rd = ::csv::Reader::from_reader(text.as_bytes());
        let rec = rd.records().next().unwrap().unwrap();
        assert_eq!((&rec[0], &rec[1]), ("shell \"A\", outer", "1.5"));
    }

    #[test]
    fn empty_fields_stay_empty_even_alone_on_a_row() {
        let mut t = Table::new();
        t.row(&[""]);
        t.row(&["", ""]);
        assert_eq!(t.finish(), "\n,\n");
    }
}
