//! The `report` folder: everything a paper draft needs for one scenario, each file carrying its provenance.

use crate::error::{Error, Result};
use crate::export;
use crate::model::{ShellKind, Which};
use crate::output::{ensure_dir, write_atomic};
use crate::plot::{write_figure, write_panels, FigureOptions, StyleName};
use crate::report::bundle::plot_range;
use crate::report::derive::{derive, State};
use crate::report::figures;
use crate::scan::{evaluate_lines, Axis, MapSpec};
use crate::scenario::Scenario;
use crate::statics::sweep::sweep;
use crate::statics::{find_static_radii, StaticsOptions};
use std::path::{Path, PathBuf};

/// What to include beyond the defaults.
#[derive(Debug, Clone, Default)]
pub struct ReportOptions {
    /// A sweep: (parameter, lo, hi, n).
    pub vary: Option<(String, f64, f64, usize)>,
    /// Radius range override.
    pub range: Option<(f64, f64)>,
    /// Map resolution (radius points, beta^2 points).
    pub map_size: (usize, usize),
    /// A family of values of one parameter: figures of beta^2_crit(a0), sigma0(a), p0(a) with one curve per
    /// value, and a multi-panel stability map, one panel per value.
    pub family: Option<(String, Vec<f64>)>,
    /// Figure control (style, size, limits, labels, legend); the journal style unless set.
    pub figure: FigureOptions,
}

struct Listing {
    dir: PathBuf,
    files: Vec<(PathBuf, String)>,
    figure: FigureOptions,
    notes: Vec<String>,
}

impl Listing {
    fn put(&mut self, name: &str, bytes: &[u8], what: &str) -> Result<()> {
        let p = self.dir.join(name);
        write_atomic(&p, bytes)?;
        self.files.push((p, what.to_string()));
        Ok(())
    }
    fn figure(&mut self, fig: &crate::plot::Figure, stem: &str, what: &str) -> Result<()> {
        let mut fig = fig.clone();
        self.figure.apply(&mut fig, StyleName::Journal);
        let paths = match write_figure(&fig, &self.dir, stem) {
            // A log axis asked for every figure cannot show one with values <= 0: draw that one linear.
            Err(e) if e.kind == crate::error::ErrorKind::Input && (fig.look.log_x || fig.look.log_y) => {
                self.notes.push(format!("{stem}: {}; drawn with linear axes instead.", e.message));
                fig.look.log_x = false;
                fig.look.log_y = false;
                write_figure(&fig, &self.dir, stem)?
            }
            r => r?,
        };
        for p in paths {
            self.files.push((p, what.to_string()));
        }
        Ok(())
    }
}

/// Check every option against the scenario before the first file is written, so a bad request leaves no
/// partial report behind.
pub fn check_options(s: &Scenario, opts: &ReportOptions) -> Result<()> {
    use crate::error::ErrorKind::Input;
    use crate::phrase;
    use crate::RequestField::{Family, Vary};
    let spacelike = |opt: crate::RequestField, name: &str| {
        let message = phrase![opt, format!(" {name}: reports of spacelike shells have no families or sweeps")];
        Error::request(Input, opt, name, message).with_hint_phrase(phrase!["leave out ", opt])
    };
    if let Some((name, _)) = &opts.family {
        s.params.index(name).map_err(|e| e.context_phrase(phrase![Family, format!(" {name}")]))?;
        if s.shell.kind == ShellKind::Spacelike {
            return Err(spacelike(Family, name));
        }
    }
    if let Some((name, _, _, n)) = &opts.vary {
        s.params.index(name).map_err(|e| e.context_phrase(phrase![Vary, format!(" {name}")]))?;
        if s.shell.kind == ShellKind::Spacelike {
            return Err(spacelike(Vary, name));
        }
        if s.shell.eos.is_none() {
            let message = phrase![
                Vary,
                format!(" {name}: the sweep of static radii needs an equation of state, and the scenario has none")
            ];
            return Err(Error::request(Input, Vary, name, message)
                .with_hint_phrase(phrase!["add [shell] pressure = \"...\" to the scenario, or leave out ", Vary]));
        }
        if *n > 100_000 {
            let message = phrase![Vary, format!(" {name}: N = {n} values is more than a sweep needs")];
            return Err(Error::request(Input, Vary, name, message).with_hint("use at most 100000 values"));
        }
    }
    Ok(())
}

/// Write the report for `s` into `dir`; returns the files written with a one-line description each.
pub fn write_report(s: &Scenario, dir: &Path, opts: &ReportOptions) -> Result<Vec<(PathBuf, String)>> {
    check_options(s, opts)?;
    ensure_dir(dir)?;
    let mut out = Listing { dir: dir.to_path_buf(), files: Vec::new(), figure: opts.figure.clone(), notes: Vec::new() };
    let prov = s.provenance();
    // Side survey.
    let (slo, shi) = crate::metric::default_range(s);
    let ropts = crate::roots::RootOptions { samples: 4000, ..Default::default() };
    let survey: Vec<(String, crate::metric::SideSurvey)> = [Which::Minus, Which::Plus]
        .iter()
        .map(|&w| {
            (
                w.name().to_string(),
                crate::metric::survey(
                    &crate::metric::SideFns::of(s.model.side(w), s.params.values()),
                    slo,
                    shi,
                    &ropts,
                ),
            )
        })
        .collect();
    let survey_json = serde_json::json!({ "provenance": prov, "from": slo, "to": shi, "sides": survey.iter().map(|(n, sv)| serde_json::json!({"side": n, "survey": sv})).collect::<Vec<_>>() });
    out.put(
        "sides.json",
        export::json::pretty(&survey_json).as_bytes(),
        "horizons, R-/T-regions and photon orbits of each side",
    )?;

    match s.shell.kind {
        ShellKind::Spacelike => spacelike_part(s, &survey, &mut out)?,
        ShellKind::Timelike => timelike_part(s, opts, &mut out)?,
    }
    // summary.md names every file.
    let mut md = format!("# junctura report: {}\n\n`{}`\n\n", crate::text::one_line(&s.name), prov.replace('`', "'"));
    for n in &out.notes {
        md.push_str(&format!("**Note:** {n}\n\n"));
    }
    md.push_str("| file | contents |\n| --- | --- |\n");
    for (p, what) in &out.files {
        let name = p.file_name().map(|n| n.to_string_lossy().to_string()).unwrap_or_default();
        md.push_str(&format!("| `{name}` | {what} |\n"));
    }
    md.push_str("\nEvery file carries the provenance line above (a comment in .csv/.tex, a key in .json, metadata in the figures).\n");
    out.put("summary.md", md.as_bytes(), "this list")?;
    Ok(out.files)
}

/// Family figures (one curve per value) and a multi-panel map (one panel per value, shared axes).
fn family_part(
    s: &Scenario,
    name: &str,
    values: &[f64],
    (lo, hi): (f64, f64),
    (nx, ny): (usize, usize),
    out: &mut Listing,
) -> Result<()> {
    // The radius range covering every value's R-region.
    let (mut flo, mut fhi) = (lo, hi);
    for &v in values {
        let mut sc = s.clone();
        sc.params
            .set(name, v)
            .map_err(|e| e.context_phrase(crate::phrase![crate::RequestField::Family, format!(" {name}")]))?;
        if let Some((a, b)) = plot_range(&sc) {
            flo = flo.min(a);
            fhi = fhi.max(b);
        }
    }
    let sym = s.symbols.unicode(name);
    for (stem, fig) in figures::family_figures(s, name, values, flo, fhi)? {
        let what = if stem.ends_with("beta2_critical") {
            format!("critical beta^2 against a0 for {name} = each value, stable side shaded")
        } else if stem.ends_with("sigma") {
            format!("sigma0(a) for each value of {name}")
        } else {
            format!("p0(a) for each value of {name}")
        };
        out.figure(&fig, &stem, &what)?;
    }
    let mut panels = Vec::new();
    for &v in values {
        let mut sc = s.clone();
        sc.params
            .set(name, v)
            .map_err(|e| e.context_phrase(crate::phrase![crate::RequestField::Family, format!(" {name}")]))?;
        let x = Axis::new(&sc, "radius", flo, fhi, (nx / 2).max(20))?;
        let y = Axis::new(&sc, "beta2", -3.0, 3.0, (ny / 2).max(20))?;
        let spec = MapSpec::new(&sc, x, y, None, (flo, fhi))?;
        let cells: Vec<crate::scan::Cell> = evaluate_lines(&sc, &spec, 0..spec.n_lines())?.concat();
        let mut fig = figures::map_figure_with(sc.provenance(), &spec, &cells, None, &sc.symbols);
        fig.title = Some(format!("{sym} = {v}"));
        panels.push(fig);
    }
    let cols = if panels.len() <= 1 { 1 } else { 2 };
    let mut look = out.figure.look(StyleName::Journal);
    look.log_x = false;
    look.log_y = false;
    if out.figure.width_cm.is_none() {
        look.width_cm = 17.8;
    }
    if out.figure.aspect.is_none() {
        look.aspect = 0.8;
    }
    let stem = format!("family_{name}_maps");
    let prov = format!(
        "{} | panels {name} = {}",
        s.provenance(),
        values.iter().map(|v| crate::export::num(*v)).collect::<Vec<_>>().join(", ")
    );
    for p in write_panels(&panels, cols, &look, &prov, &out.dir, &stem)? {
        out.files.push((p, format!("stability maps over (a, beta^2), one panel per value of {name}, shared axes")));
    }
    Ok(())
}

fn spacelike_part(s: &Scenario, survey: &[(String, crate::metric::SideSurvey)], out: &mut Listing) -> Result<()> {
    // A radius inside both T-regions: the middle of the first common T interval.
    let t = |i: usize| {
        survey[i]
            .1
            .regions
            .iter()
            .filter(|r| r.kind == crate::metric::RegionKind::T)
            .map(|r| (r.from, r.to))
            .collect::<Vec<_>>()
    };
    let (tm, tp) = (t(0), t(1));
    let r = tm
        .iter()
        .flat_map(|a| tp.iter().map(move |b| (a.0.max(b.0), a.1.min(b.1))))
        .find(|(lo, hi)| hi > lo)
        .map(|(lo, hi)| 0.5 * (lo + hi))
        .ok_or_else(|| {
            Error::numerical("no radius lies inside the T-regions of both sides: no static spacelike shell")
        })?;
    put_derive(s, out, r, "R")
}

/// formulas.tex, derive.json and derive.txt for a static shell at radius `r`.
fn put_derive(s: &Scenario, out: &mut Listing, r: f64, symbol: &str) -> Result<()> {
    let rep = derive(s, State::at_rest(r))?;
    out.put(
        "formulas.tex",
        export::latex::derive(&rep, s, &export::closed::LatexLayout::default()).as_bytes(),
        &format!("junction formulas (LaTeX, amsmath) and values at {symbol} = {r}"),
    )?;
    out.put("derive.json", export::json::pretty(&rep).as_bytes(), "all junction quantities at that radius")?;
    out.put("derive.txt", export::text::derive(&rep).as_bytes(), "readable summary")
}

fn timelike_part(s: &Scenario, opts: &ReportOptions, out: &mut Listing) -> Result<()> {
    // Static radii are searched over the same range as `statics` (the scenario's default survey range, or
    // the user's --from/--to); the plots cover the R-region where the shell can sit, widened to show every
    // static radius found.
    let search = opts.range.unwrap_or_else(|| crate::metric::default_range(s));
    let statics = if s.shell.eos.is_some() {
        Some(find_static_radii(s, search.0, search.1, &StaticsOptions::default())?)
    } else {
        out.notes.push(
            "the scenario has no equation of state ([shell] pressure), so there are no static radii, potential or \
             motion files; the maps are over (a, beta^2)."
                .to_string(),
        );
        None
    };
    let (mut lo, mut hi) = opts.range.or_else(|| plot_range(s)).ok_or_else(|| {
        Error::numerical("no radius where both sides are R-regions: no static timelike shell")
            .with_hint("check the scenario with `junctura check`")
    })?;
    if let (Some(st), None) = (&statics, opts.range) {
        for r in &st.static_radii {
            lo = lo.min(r.radius / 1.15);
            hi = hi.max(r.radius * 1.15);
        }
    }
    if let Some(st) = &statics {
        if st.static_radii.is_empty() {
            out.notes.push(format!(
                "no static radius was found for the equation of state in a = {} .. {} (the range `statics` \
                 searches); statics.csv and the table are empty and there is no potential figure.",
                crate::export::num(search.0),
                crate::export::num(search.1)
            ));
        }
    }
    let r_ref = statics.as_ref().and_then(|st| st.static_radii.first().map(|r| r.radius)).unwrap_or((lo * hi).sqrt());
    put_derive(s, out, r_ref, "a")?;
    if let Some(st) = &statics {
        out.put("statics.csv", export::csv::statics(st).as_bytes(), "static radii of the equation of state (CSV)")?;
        out.put("statics.json", export::json::pretty(st).as_bytes(), "static radii (JSON)")?;
        out.put(
            "static_solutions.tex",
            export::latex::statics(st).as_bytes(),
            "table of static solutions (LaTeX, booktabs)",
        )?;
        if let Some(fig) = figures::potential_figure(s, st) {
            out.figure(&fig, "potential", "potential V(a) around each static radius")?;
        }
        // Nonlinear check of the first linearly stable static radius: a 1% kick, about five linear periods.
        if let Some(sr) = st.static_radii.iter().find(|r| r.stability == crate::statics::Stability::Stable) {
            let period = 2.0 * std::f64::consts::PI / (sr.potential_second_derivative / 2.0).sqrt();
            let opts = crate::dynamics::EvolveOptions::default();
            let kick = crate::dynamics::Start::Kick(0.01 * sr.radius);
            if let Ok(ev) = crate::dynamics::evolve(s, sr.radius, kick, 5.0 * period, None, &opts) {
                out.put(
                    "evolve.csv",
                    export::csv::evolve(&ev).as_bytes(),
                    &format!("nonlinear motion after a 1% kick from the stable a0 = {:.6}", sr.radius),
                )?;
                out.put(
                    "evolve.json",
                    export::json::pretty(&ev).as_bytes(),
                    "its summary: measured vs linear period, constraint drift, fate",
                )?;
                out.figure(&crate::report::evolve::radius_figure(&ev), "evolve_radius", "R(tau) of that motion")?;
                let j = crate::junction::Junction::new(s);
                out.figure(
                    &crate::report::evolve::phase_figure(&j, &ev),
                    "evolve_phase",
                    "the orbit in the (R, dR/dtau) plane over its potential",
                )?;
            }
        }
    }
    let ov = figures::overlays(s, lo, hi);
    out.figure(
        &figures::sigma_pressure_figure_with(s, lo, hi, Some(&ov)),
        "sigma_pressure",
        "sigma0(a), p0(a) with energy-condition bands",
    )?;
    // Stability map over (radius, beta^2).
    let (nx, ny) = if opts.map_size.0 > 0 { opts.map_size } else { (240, 180) };
    let x = Axis::new(s, "radius", lo, hi, nx)?;
    let y = Axis::new(s, "beta2", -3.0, 3.0, ny)?;
    let spec = MapSpec::new(s, x, y, None, (lo, hi))?;
    let lines = evaluate_lines(s, &spec, 0..spec.n_lines())?;
    let mut csv = export::map::csv_header(s, &spec);
    let mut cells = Vec::with_capacity(nx * ny);
    for l in &lines {
        export::csv::map_rows(l, &mut csv);
        cells.extend_from_slice(l);
    }
    out.put("map_radius_beta2.csv", csv.as_bytes(), "stability map over (a, beta^2): one row per cell")?;
    out.figure(
        &figures::map_figure_with(s.provenance(), &spec, &cells, Some(&ov), &s.symbols),
        "map_radius_beta2",
        "stability regions over (a, beta^2) with the critical curve, the law's beta^2 line, energy-condition \
         boundaries, static radii, horizons and photon orbits",
    )?;
    if let Some((name, values)) = &opts.family {
        family_part(s, name, values, (lo, hi), (nx, ny), out)?;
    }
    if let Some((name, vlo, vhi, n)) = &opts.vary {
        if s.shell.eos.is_some() {
            let values: Vec<f64> = (0..*n).map(|i| crate::scan::grid_value(*vlo, *vhi, i, *n)).collect();
            let sw = sweep(s, name, &values, lo, hi, &StaticsOptions::default())?;
            out.put(
                "sweep.csv",
                export::csv::sweep(&sw).as_bytes(),
                &format!("branches of static radii as {name} varies"),
            )?;
            out.put("sweep.json", export::json::pretty(&sw).as_bytes(), "branches (JSON)")?;
            let mut fig = figures::sweep_figure(&sw);
            fig.x_label = s.symbols.unicode(name);
            out.figure(&fig, "sweep", "static branches: stable solid, unstable dashed, folds marked")?;
        }
    }
    Ok(())
}
