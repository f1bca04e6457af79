//! Figure descriptions built from reports: the potential around each static radius, sigma0(a) and p0(a) with
//! energy-condition bands, static branches of a sweep, and stability maps. Pure: reports in, `plot::Figure` out.

use crate::junction::potential::Law;
use crate::junction::{EnergyConditions, Junction};
use crate::plot::{Band, CategoryMap, Figure, LineStyle, Marker, RefLine, Series};
use crate::scan::{AxisKind, Cell, CellClass, MapSpec};
use crate::scenario::Scenario;
use crate::statics::sweep::SweepReport;
use crate::statics::{Stability, StaticsReport};

/// Palette slots used consistently across figures.
mod colour {
    pub const STABLE: usize = 2;
    pub const UNSTABLE: usize = 5;
    pub const MARGINAL: usize = 1;
    pub const NO_STATIC: usize = 7;
    pub const HORIZON: usize = 0;
}

/// Axis label for a map axis.
pub fn axis_label(kind: AxisKind, name: &str) -> String {
    match kind {
        AxisKind::Radius => "a/M".to_string(),
        AxisKind::Beta2 => "β²".to_string(),
        AxisKind::Param(_) => greek(name),
    }
}

/// Parameter names that are Greek letters print as the letter.
pub fn greek(name: &str) -> String {
    let table = [
        ("alpha", "α"),
        ("beta", "β"),
        ("gamma", "γ"),
        ("delta", "δ"),
        ("epsilon", "ε"),
        ("lambda", "λ"),
        ("Lambda", "Λ"),
        ("mu", "μ"),
        ("nu", "ν"),
        ("omega", "ω"),
        ("phi", "φ"),
        ("rho", "ρ"),
        ("tau", "τ"),
        ("theta", "θ"),
        ("xi", "ξ"),
        ("kappa", "κ"),
    ];
    table.iter().find(|(k, _)| *k == name).map(|(_, v)| v.to_string()).unwrap_or_else(|| name.to_string())
}

/// What is drawn over maps and sigma/p plots: the law's beta^2 = P'(sigma0(a)) and p = P(sigma0(a)) curves,
/// the static radii of the law, and the horizons and circular photon orbits of each side.
#[derive(Debug, Clone, Default)]
pub struct Overlays {
    /// (a, P'(sigma0(a))) samples, if the scenario has a law.
    pub law_beta2: Vec<(f64, f64)>,
    /// (a, P(sigma0(a))) samples, if the scenario has a law.
    pub law_pressure: Vec<(f64, f64)>,
    /// Static radii of the law and whether each is linearly stable.
    pub static_radii: Vec<(f64, bool)>,
    /// Horizons and photon orbits: (radius, label).
    pub lines: Vec<(f64, String)>,
}

/// The overlays of scenario `s` over radii [lo, hi] (static radii searched in [`crate::metric::default_range`],
/// the range `statics` uses).
pub fn overlays(s: &Scenario, lo: f64, hi: f64) -> Overlays {
    use crate::model::Which;
    let mut ov = Overlays::default();
    let j = Junction::new(s);
    if s.shell.eos.is_some() {
        for a in crate::spacing::linear(lo, hi, 600) {
            let (b2, pl) = match j.static_values(a) {
                Ok(sv) => {
                    let sg = sv.stress.sigma();
                    let (p, b) = j.law_and_slope(sg).unwrap_or((f64::NAN, f64::NAN));
                    (b, p)
                }
                Err(_) => (f64::NAN, f64::NAN),
            };
            ov.law_beta2.push((a, b2));
            ov.law_pressure.push((a, pl));
        }
        let (slo, shi) = crate::metric::default_range(s);
        if let Ok(rep) = crate::statics::find_static_radii(s, slo, shi, &crate::statics::StaticsOptions::default()) {
            ov.static_radii = rep.static_radii.iter().map(|r| (r.radius, r.stability == Stability::Stable)).collect();
        }
    }
    let (slo, shi) = crate::metric::default_range(s);
    let ropts = crate::roots::RootOptions::default();
    let mut found: Vec<(f64, &str, &str)> = Vec::new();
    for (w, mark) in [(Which::Minus, "⁻"), (Which::Plus, "⁺")] {
        let fns = crate::metric::SideFns::of(s.model.side(w), s.params.values());
        let sv = crate::metric::survey(&fns, slo.min(lo), shi.max(hi), &ropts);
        for h in sv.horizons {
            found.push((h.radius, "rₕ", mark));
        }
        for r in sv.photon_orbits {
            found.push((r, "rₚₕ", mark));
        }
    }
    // A radius both sides share (e.g. a wormhole's two copies) gets one line without a side mark.
    let mut done = vec![false; found.len()];
    for i in 0..found.len() {
        if done[i] {
            continue;
        }
        let (r, name, mark) = found[i];
        let twin = (i + 1..found.len())
            .find(|&k| !done[k] && found[k].1 == name && (found[k].0 - r).abs() <= 1e-9 * r.abs().max(1.0));
        let label = match twin {
            Some(k) => {
                done[k] = true;
                name.to_string()
            }
            None => format!("{name}{mark}"),
        };
        done[i] = true;
        ov.lines.push((r, label));
    }
    ov
}

/// `x` rounded to `d` decimals, printed shortest.
fn round_to(x: f64, d: i32) -> f64 {
    let k = 10f64.powi(d);
    (x * k).round() / k
}

fn add_vertical_overlays(fig: &mut Figure, ov: &Overlays) {
    for &(r, stable) in &ov.static_radii {
        fig.ref_lines.push(
            RefLine::vertical(r, "a₀").drawn(if stable { colour::STABLE } else { colour::UNSTABLE }, LineStyle::Dashed),
        );
    }
    for (r, label) in &ov.lines {
        fig.ref_lines.push(RefLine::vertical(*r, label.clone()));
    }
}

/// Which root a map cell's class refers to, in words.
pub fn root_rule_text(rule: crate::scan::RootRule) -> &'static str {
    match rule {
        crate::scan::RootRule::AnyStable => "the stable one if any, else a marginal one, else the smallest",
        crate::scan::RootRule::Smallest => "the smallest",
        crate::scan::RootRule::Largest => "the largest",
    }
}

/// The stability map: classes as a bitmap, the critical curve and energy-condition boundaries on top.
pub fn map_figure(provenance: String, spec: &MapSpec, cells: &[Cell]) -> Figure {
    map_figure_with(provenance, spec, cells, None, &crate::scenario::Symbols::default())
}

/// The stability map with overlays (the law's beta^2 = P'(sigma0(a)) line, static radii, horizons and photon
/// orbits) and parameter symbols for the axis labels. Energy-condition boundaries are contours of
/// sigma + p (null), min(sigma, sigma + p) (weak) and sigma - |p| (dominant) interpolated between cell centres.
pub fn map_figure_with(
    provenance: String,
    spec: &MapSpec,
    cells: &[Cell],
    ov: Option<&Overlays>,
    symbols: &crate::scenario::Symbols,
) -> Figure {
    let (nx, ny) = (spec.x.n, spec.y.n);
    let mut grid = vec![CellClass::NoStatic as u8; nx * ny];
    let mut crit: Vec<(usize, f64)> = Vec::new();
    let mut fields = [vec![f64::NAN; nx * ny], vec![f64::NAN; nx * ny], vec![f64::NAN; nx * ny]];
    let mut several = false;
    for c in cells {
        let k = c.iy as usize * nx + c.ix as usize;
        if k < grid.len() {
            grid[k] = c.class as u8;
            several |= c.n_static > 1;
            if matches!(c.class, CellClass::Stable | CellClass::Unstable | CellClass::Marginal) {
                let (sg, p) = (c.sigma, c.pressure);
                fields[0][k] = sg + p;
                fields[1][k] = sg.min(sg + p);
                fields[2][k] = sg - p.abs();
            }
        }
        if spec.y.kind == AxisKind::Beta2 && c.iy == 0 {
            crit.push((c.ix as usize, c.beta2_critical));
        }
    }
    let half =
        |lo: f64, hi: f64, n: usize| if n > 1 { 0.5 * (hi - lo) / (n - 1) as f64 } else { 0.5 * lo.abs().max(1e-3) };
    let (hx, hy) = (half(spec.x.lo, spec.x.hi, nx), half(spec.y.lo, spec.y.hi, ny));
    let categories = vec![
        ("stable".to_string(), colour::STABLE),
        ("unstable".to_string(), colour::UNSTABLE),
        ("marginal".to_string(), colour::MARGINAL),
        ("no static shell".to_string(), colour::NO_STATIC),
        ("inside a horizon".to_string(), colour::HORIZON),
    ];
    let mut series = Vec::new();
    if spec.y.kind == AxisKind::Beta2 {
        crit.sort_by_key(|c| c.0);
        let pts: Vec<(f64, f64)> = crit
            .iter()
            .map(|&(ix, b)| {
                (
                    spec.x.value(ix),
                    if b.is_finite() && b >= spec.y.lo - 10.0 * hy && b <= spec.y.hi + 10.0 * hy {
                        b
                    } else {
                        f64::NAN
                    },
                )
            })
            .collect();
        series.push(Series { label: "critical β²".into(), points: pts, style: LineStyle::Solid, colour: 4 });
        if let Some(ov) = ov.filter(|o| o.law_beta2.iter().any(|p| p.1.is_finite())) {
            series.push(Series {
                label: "β² = P′(σ₀(a)) of the law".into(),
                points: ov.law_beta2.clone(),
                style: LineStyle::Solid,
                colour: 6,
            });
        }
    }
    let xs: Vec<f64> = (0..nx).map(|i| spec.x.value(i)).collect();
    let ys: Vec<f64> = (0..ny).map(|j| spec.y.value(j)).collect();
    for (field, label, col, style) in [
        (&fields[0], "null EC boundary", 0usize, LineStyle::DashDot),
        (&fields[1], "weak EC boundary", 3usize, LineStyle::Dashed),
        (&fields[2], "dominant EC boundary", 6usize, LineStyle::Dotted),
    ] {
        let mut pts: Vec<(f64, f64)> = Vec::new();
        for line in crate::plot::contour_segments(field, &xs, &ys, 0.0) {
            pts.extend(line);
            pts.push((f64::NAN, f64::NAN));
        }
        if !pts.is_empty() {
            series.push(Series { label: label.into(), points: pts, style, colour: col });
        }
    }
    let mut fig = Figure {
        x_label: axis_label_sym(spec.x.kind, &spec.x.name, symbols),
        y_label: axis_label_sym(spec.y.kind, &spec.y.name, symbols),
        x_range: Some((spec.x.lo - hx, spec.x.hi + hx)),
        y_range: Some((spec.y.lo - hy, spec.y.hi + hy)),
        series,
        categories: Some(CategoryMap {
            x: (spec.x.lo - hx, spec.x.hi + hx, nx),
            y: (spec.y.lo - hy, spec.y.hi + hy, ny),
            cells: grid,
            categories,
        }),
        provenance,
        ..Figure::default()
    };
    if several {
        fig.notes.push(format!(
            "Cells with several static radii take the class of {}; map.csv lists every radius.",
            root_rule_text(spec.root_rule)
        ));
    }
    if let Some(ov) = ov {
        if spec.x.kind == AxisKind::Radius {
            add_vertical_overlays(&mut fig, ov);
        }
    }
    fig
}

/// Axis label for a map axis, with the scenario's symbol for a parameter.
pub fn axis_label_sym(kind: AxisKind, name: &str, symbols: &crate::scenario::Symbols) -> String {
    match kind {
        AxisKind::Param(_) => symbols.unicode(name),
        k => axis_label(k, name),
    }
}

/// V(a) around each static radius of the scenario's law (one curve per static radius, 40% either side).
/// The static radii are marked on V = 0 (filled: stable, open: unstable) and named in the legend only; the
/// vertical range fits the curves (robust to a divergence at the ends) and always shows V = 0.
pub fn potential_figure(s: &Scenario, rep: &StaticsReport) -> Option<Figure> {
    if rep.static_radii.is_empty() {
        return None;
    }
    let j = Junction::new(s);
    let lo = rep.static_radii.first()?.radius * 0.6;
    let hi = rep.static_radii.last()?.radius * 1.4;
    let radii = crate::spacing::linear(lo, hi, 400);
    let mut series = Vec::new();
    let mut markers = Vec::new();
    for (i, sr) in rep.static_radii.iter().enumerate() {
        let sv = j.static_values(sr.radius).ok()?;
        let v = j.potential_curve(&sv, Law::Scenario, &radii);
        let pts = radii.iter().zip(&v).map(|(&r, &v)| (r, v)).collect();
        let stable = sr.stability == Stability::Stable;
        series.push(Series {
            label: format!("V(a), a₀ = {:.4} ({})", sr.radius, sr.stability.name()),
            points: pts,
            style: if stable { LineStyle::Solid } else { LineStyle::cycle(i + 1) },
            colour: if stable { colour::STABLE } else { colour::UNSTABLE + i },
        });
        markers.push(Marker {
            x: sr.radius,
            y: 0.0,
            label: String::new(),
            filled: stable,
            colour: if stable { colour::STABLE } else { colour::UNSTABLE },
        });
    }
    let mut vals: Vec<f64> =
        series.iter().flat_map(|s| s.points.iter().map(|p| p.1)).filter(|v| v.is_finite()).collect();
    vals.sort_by(|a, b| a.total_cmp(b));
    let (mut y0, mut y1) =
        if vals.len() > 10 { (vals[vals.len() / 50], vals[vals.len() - 1 - vals.len() / 50]) } else { (-1.0, 1.0) };
    y0 = y0.min(0.0);
    y1 = y1.max(0.0);
    let pad = 0.08 * (y1 - y0).max(1e-9);
    // Horizontally, where V is defined.
    let xs = series.iter().flat_map(|s| s.points.iter().filter(|p| p.1.is_finite()).map(|p| p.0));
    let (x0, x1) = xs.fold((hi, lo), |(a, b), x| (a.min(x), b.max(x)));
    Some(Figure {
        x_label: "a/M".into(),
        y_label: "V(a)".into(),
        x_range: Some(if x0 < x1 { (x0, x1) } else { (lo, hi) }),
        y_range: Some((y0 - pad, y1 + pad)),
        series,
        markers,
        ref_lines: vec![RefLine::horizontal(0.0, "")],
        provenance: s.provenance(),
        ..Figure::default()
    })
}

/// Where a curve leaves the vertical range: for each excursion beyond it, the abscissa of its largest |y|
/// (at most three), for a note.
fn clipped_at(points: &[(f64, f64)], (y0, y1): (f64, f64)) -> Vec<f64> {
    let mut out = Vec::new();
    let mut best: Option<(f64, f64)> = None;
    for p in points {
        if p.1.is_finite() && (p.1 < y0 || p.1 > y1) {
            if best.map_or(true, |b| p.1.abs() > b.1) {
                best = Some((p.0, p.1.abs()));
            }
        } else if let Some(b) = best.take() {
            out.push(b.0);
        }
    }
    out.extend(best.map(|b| b.0));
    out.truncate(3);
    out
}

/// sigma0(a) and p0(a) of static shells over [lo, hi], with the radii where the weak and dominant energy
/// conditions hold shaded (disjoint bands, so each legend swatch shows exactly the colour of its band).
pub fn sigma_pressure_figure(s: &Scenario, lo: f64, hi: f64) -> Figure {
    sigma_pressure_figure_with(s, lo, hi, None)
}

/// [`sigma_pressure_figure`] with overlays: the law's p = P(sigma0(a)) (static radii sit where it meets
/// p0(a)), the static radii, horizons and photon orbits as labelled vertical lines. A curve clipped by the
/// vertical range is named in a note under the plot.
pub fn sigma_pressure_figure_with(s: &Scenario, lo: f64, hi: f64, ov: Option<&Overlays>) -> Figure {
    let j = Junction::new(s);
    let n = 400;
    let mut sig = Vec::with_capacity(n);
    let mut pre = Vec::with_capacity(n);
    let mut wec = Vec::new();
    let mut dec = Vec::new();
    let step = (hi - lo) / (n - 1) as f64;
    for a in crate::spacing::linear_by_step(lo, hi, n) {
        match j.static_values(a) {
            Ok(sv) => {
                let (sg, p) = (sv.stress.sigma(), sv.stress.pressure());
                sig.push((a, sg));
                pre.push((a, p));
                let ec = EnergyConditions::evaluate(sg, p, s.dimension);
                wec.push((a, ec.weak && !ec.dominant));
                dec.push((a, ec.dominant));
            }
            Err(_) => {
                sig.push((a, f64::NAN));
                pre.push((a, f64::NAN));
                wec.push((a, false));
                dec.push((a, false));
            }
        }
    }
    let intervals = |flags: &[(f64, bool)], label: &str, colour: usize| -> Vec<Band> {
        let mut out = Vec::new();
        let mut start: Option<f64> = None;
        for (k, &(a, f)) in flags.iter().enumerate() {
            match (f, start) {
                (true, None) => start = Some(a - 0.5 * step),
                (false, Some(st)) => {
                    out.push(Band::XInterval {
                        label: if out.is_empty() { label.to_string() } else { String::new() },
                        from: st,
                        to: a - 0.5 * step,
                        colour,
                    });
                    start = None;
                }
                _ => {}
            }
            if k + 1 == flags.len() {
                if let Some(st) = start {
                    out.push(Band::XInterval {
                        label: if out.is_empty() { label.to_string() } else { String::new() },
                        from: st,
                        to: a,
                        colour,
                    });
                }
            }
        }
        out
    };
    // A robust vertical range: sigma0 and p0 diverge at horizons, so use the 3rd to 97th percentiles.
    let mut vals: Vec<f64> = sig.iter().chain(pre.iter()).map(|p| p.1).filter(|v| v.is_finite()).collect();
    vals.sort_by(|a, b| a.total_cmp(b));
    let y_range = if vals.len() > 10 {
        let (a, b) = (vals[vals.len() * 3 / 100], vals[vals.len() * 97 / 100]);
        let pad = 0.15 * (b - a).max(1e-12);
        Some(((a - pad).min(-pad * 0.1), (b + pad).max(pad * 0.1)))
    } else {
        None
    };
    let mut bands = intervals(&wec, "weak EC only", 3);
    bands.extend(intervals(&dec, "dominant (and weak) EC", 6));
    let mut notes = Vec::new();
    if let Some((y0, y1)) = y_range {
        for (name, pts) in [("σ₀", &sig), ("p₀", &pre)] {
            let at = clipped_at(pts, (y0, y1));
            if !at.is_empty() {
                let list: Vec<String> = at.iter().map(|a| crate::text::num(round_to(*a, 3))).collect();
                notes.push(format!("{name} leaves the plotted range (clipped) near a = {}.", list.join(", ")));
            }
        }
    }
    let mut series = vec![
        Series { label: "σ₀(a)".into(), points: sig, style: LineStyle::Solid, colour: 0 },
        Series { label: "p₀(a)".into(), points: pre, style: LineStyle::Dashed, colour: 5 },
    ];
    if let Some(ov) = ov.filter(|o| o.law_pressure.iter().any(|p| p.1.is_finite())) {
        series.push(Series {
            label: "p = P(σ₀(a)) of the law".into(),
            points: ov.law_pressure.clone(),
            style: LineStyle::DashDot,
            colour: 6,
        });
    }
    let mut fig = Figure {
        x_label: "a/M".into(),
        y_label: "σ₀, p₀ (units of 1/M)".into(),
        x_range: Some((lo, hi)),
        y_range,
        series,
        bands,
        ref_lines: vec![RefLine::horizontal(0.0, "")],
        provenance: s.provenance(),
        notes,
        ..Figure::default()
    };
    if let Some(ov) = ov {
        add_vertical_overlays(&mut fig, ov);
    }
    fig
}

/// Static branches of a sweep: radius against the parameter, stable parts solid, unstable dashed, folds
/// marked. The curve is the continuation's own polyline (steps in pseudo-arclength, so it is dense where the
/// branch turns), cut at its turning points in the parameter; each piece takes the stability of the branch
/// points nearest to its inner half, so a fold tip is never drawn in one class across the turn. The window
/// is padded so that no marker sits on the frame; the legend names only the classes drawn.
pub fn sweep_figure(rep: &SweepReport) -> Figure {
    let mut series = Vec::new();
    let mut markers = Vec::new();
    let mut present = [false; 2];
    let push = |pts: Vec<(f64, f64)>, st: Option<Stability>, series: &mut Vec<Series>, present: &mut [bool; 2]| {
        if pts.len() > 1 {
            let stable = st == Some(Stability::Stable);
            present[usize::from(!stable)] = true;
            series.push(Series {
                label: String::new(),
                points: pts,
                style: if stable { LineStyle::Solid } else { LineStyle::Dashed },
                colour: if stable { colour::STABLE } else { colour::UNSTABLE },
            });
        }
    };
    for b in &rep.branches {
        for f in &b.folds {
            markers.push(Marker {
                x: f.value,
                y: f.radius,
                label: String::new(),
                filled: true,
                colour: colour::MARGINAL,
            });
        }
        if b.curve.len() < 2 || b.points.is_empty() {
            continue;
        }
        // Pieces of the traced curve between its turning points in the parameter (the folds); each piece has
        // one stability, that of the reported branch points nearest to its inner part.
        let c = &b.curve;
        let mut cuts = vec![0usize];
        for k in 1..c.len() - 1 {
            if (c[k].0 - c[k - 1].0) * (c[k + 1].0 - c[k].0) < 0.0 {
                cuts.push(k);
            }
        }
        cuts.push(c.len() - 1);
        let (vs, rs) = (
            (rep.values.last().copied().unwrap_or(1.0) - rep.values.first().copied().unwrap_or(0.0)).abs().max(1e-300),
            b.points.iter().map(|p| p.radius).fold(0.0f64, f64::max).max(1e-300),
        );
        let nearest = |q: (f64, f64)| {
            b.points
                .iter()
                .min_by(|x, y| {
                    let d = |p: &crate::statics::sweep::BranchPoint| {
                        ((p.value - q.0) / vs).powi(2) + ((p.radius - q.1) / rs).powi(2)
                    };
                    d(x).total_cmp(&d(y))
                })
                .map(|p| p.stability)
        };
        // At each turn the pieces meet at the fold the sweep located (refined beyond the polyline's steps).
        let fold_at = |k: usize| -> (f64, f64) {
            b.folds
                .iter()
                .map(|f| (f.value, f.radius))
                .min_by(|p, q| {
                    let d = |x: &(f64, f64)| ((x.0 - c[k].0) / vs).powi(2) + ((x.1 - c[k].1) / rs).powi(2);
                    d(p).total_cmp(&d(q))
                })
                .filter(|f| ((f.0 - c[k].0) / vs).abs() < 0.05 && ((f.1 - c[k].1) / rs).abs() < 0.05)
                .unwrap_or(c[k])
        };
        let last = cuts.len() - 1;
        for (i, w) in cuts.windows(2).enumerate() {
            let mut piece: Vec<(f64, f64)> = c[w[0]..=w[1]].to_vec();
            if i > 0 {
                piece[0] = fold_at(w[0]);
            }
            if i + 1 < last {
                let n = piece.len();
                piece[n - 1] = fold_at(w[1]);
            }
            let inner = &piece[piece.len() / 4..(3 * piece.len() / 4).max(piece.len() / 4 + 1)];
            let stable = inner.iter().filter(|&&q| nearest(q) == Some(Stability::Stable)).count();
            let st = if 2 * stable > inner.len() { Stability::Stable } else { Stability::Unstable };
            push(piece, Some(st), &mut series, &mut present);
        }
    }
    if present[0] {
        series.push(Series { label: "stable".into(), points: vec![], style: LineStyle::Solid, colour: colour::STABLE });
    }
    if present[1] {
        series.push(Series {
            label: "unstable".into(),
            points: vec![],
            style: LineStyle::Dashed,
            colour: colour::UNSTABLE,
        });
    }
    let xs = rep.branches.iter().flat_map(|b| b.points.iter().map(|p| p.value).chain(b.curve.iter().map(|p| p.0)));
    let ys = rep.branches.iter().flat_map(|b| b.points.iter().map(|p| p.radius).chain(b.curve.iter().map(|p| p.1)));
    let span = |it: &mut dyn Iterator<Item = f64>, pad: f64| {
        let (lo, hi) =
            it.filter(|v| v.is_finite()).fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
        if lo < hi {
            let d = (hi - lo) * pad;
            Some((lo - d, hi + d))
        } else {
            None
        }
    };
    let notes = if markers.is_empty() {
        vec![]
    } else {
        vec!["Filled dots: folds (turning points of a branch, where its stability changes).".to_string()]
    };
    Figure {
        x_label: greek(&rep.parameter),
        y_label: "a₀/M".into(),
        x_range: span(&mut xs.into_iter(), 0.04),
        y_range: span(&mut ys.into_iter(), 0.08),
        series,
        markers,
        notes,
        provenance: rep.provenance.clone(),
        ..Figure::default()
    }
}

/// Figures of one quantity for several values of a parameter (one curve per value, legend by value):
/// beta^2_crit(a0) with the stable side of each curve shaded in its colour, sigma0(a) and p0(a). Returns
/// (file stem, figure) pairs. Each value's curve is drawn where both sides are R-regions outside horizons;
/// beta^2_crit is cut where it diverges (|beta^2_crit| beyond the plotted range).
pub fn family_figures(
    s: &Scenario,
    param: &str,
    values: &[f64],
    lo: f64,
    hi: f64,
) -> crate::error::Result<Vec<(String, Figure)>> {
    let sym = s.symbols.unicode(param);
    let n = 800;
    let mut crit_series = Vec::new();
    let mut crit_side: Vec<Vec<(f64, f64, bool)>> = Vec::new();
    let mut sig = Vec::new();
    let mut pre = Vec::new();
    for (i, &v) in values.iter().enumerate() {
        let mut sc = s.clone();
        sc.params
            .set(param, v)
            .map_err(|e| e.context_phrase(crate::phrase![crate::RequestField::Family, format!(" {param}")]))?;
        let j = Junction::new(&sc);
        let mut c = Vec::with_capacity(n);
        let mut side = Vec::with_capacity(n);
        let (mut sg, mut pr) = (Vec::with_capacity(n), Vec::with_capacity(n));
        for a in crate::spacing::linear(lo, hi, n) {
            match crate::scan::cell::static_point(&j, a) {
                Ok((sigma, p, c0, c1)) => {
                    let b = if c1 != 0.0 { -c0 / c1 } else { f64::NAN };
                    c.push((a, b));
                    side.push((a, b, c1 > 0.0));
                    sg.push((a, sigma));
                    pr.push((a, p));
                }
                Err(_) => {
                    c.push((a, f64::NAN));
                    side.push((a, f64::NAN, true));
                    sg.push((a, f64::NAN));
                    pr.push((a, f64::NAN));
                }
            }
        }
        let label = format!("{sym} = {v}");
        let style = LineStyle::cycle(i);
        crit_series.push(Series { label: label.clone(), points: c, style, colour: i });
        crit_side.push(side);
        sig.push(Series { label: label.clone(), points: sg, style, colour: i });
        pre.push(Series { label, points: pr, style, colour: i });
    }
    // Vertical range of beta^2_crit: the 5th to 95th percentiles of all curves, so poles do not flatten it.
    let robust = |series: &[Series], lo_q: usize, hi_q: usize| -> Option<(f64, f64)> {
        let mut v: Vec<f64> =
            series.iter().flat_map(|s| s.points.iter().map(|p| p.1)).filter(|y| y.is_finite()).collect();
        if v.len() < 10 {
            return None;
        }
        v.sort_by(|a, b| a.total_cmp(b));
        let (a, b) = (v[v.len() * lo_q / 100], v[(v.len() * hi_q / 100).min(v.len() - 1)]);
        let pad = 0.1 * (b - a).max(1e-9);
        Some((a - pad, b + pad))
    };
    let (y0, y1) = robust(&crit_series, 5, 95).unwrap_or((-3.0, 3.0));
    // Cut each curve where it leaves the range by far (a pole), so no near-vertical segment joins the branches.
    for s in &mut crit_series {
        for p in &mut s.points {
            if p.1 < y0 - (y1 - y0) || p.1 > y1 + (y1 - y0) {
                p.1 = f64::NAN;
            }
        }
    }
    let mut bands = Vec::new();
    for (i, side) in crit_side.iter().enumerate() {
        let pts: Vec<(f64, f64, f64)> = side
            .iter()
            .zip(&crit_series[i].points)
            .map(|(&(a, _, above), &(_, b))| if above { (a, b, y1) } else { (a, y0, b) })
            .map(|(a, l, h)| if l.is_finite() && h.is_finite() { (a, l, h) } else { (a, f64::NAN, f64::NAN) })
            .collect();
        bands.push(Band::Between { label: String::new(), points: pts, colour: i });
    }
    let prov = format!(
        "{} | family {param} = {}",
        s.provenance(),
        values.iter().map(|v| crate::text::num(*v)).collect::<Vec<_>>().join(", ")
    );
    let crit = Figure {
        look: crate::plot::Look { band_opacity: (0.4 / values.len() as f64).clamp(0.08, 0.25), ..Default::default() },
        x_label: "a₀/M".into(),
        y_label: "β²".into(),
        x_range: Some((lo, hi)),
        y_range: Some((y0, y1)),
        series: crit_series,
        bands,
        notes: vec![format!(
            "Critical β² against the static radius a₀ for each value of {sym}; the shaded side of each curve is linearly stable."
        )],
        provenance: prov.clone(),
        ..Figure::default()
    };
    // sigma0 stays finite (it goes to zero at a horizon): show all of it; p0 diverges there: cut and say so.
    let sig_range = robust(&sig, 0, 100);
    let pre_range = robust(&pre, 3, 97);
    let mut pre_notes = Vec::new();
    if let Some(r) = pre_range {
        let mut at: Vec<f64> = pre.iter().flat_map(|s| clipped_at(&s.points, r)).collect();
        at.sort_by(|a, b| a.total_cmp(b));
        at.dedup_by(|a, b| (*a - *b).abs() < 0.05 * (hi - lo));
        if !at.is_empty() {
            let list: Vec<String> = at.iter().take(4).map(|a| crate::text::num(round_to(*a, 3))).collect();
            pre_notes.push(format!("p₀ diverges towards the horizons and is clipped near a = {}.", list.join(", ")));
        }
    }
    let sigma = Figure {
        x_label: "a/M".into(),
        y_label: "σ₀ (units of 1/M)".into(),
        x_range: Some((lo, hi)),
        y_range: sig_range,
        series: sig,
        provenance: prov.clone(),
        ..Figure::default()
    };
    let pressure = Figure {
        x_label: "a/M".into(),
        y_label: "p₀ (units of 1/M)".into(),
        x_range: Some((lo, hi)),
        y_range: pre_range,
        series: pre,
        notes: pre_notes,
        provenance: prov,
        ..Figure::default()
    };
    Ok(vec![
        (format!("family_{param}_beta2_critical"), crit),
        (format!("family_{param}_sigma"), sigma),
        (format!("family_{param}_pressure"), pressure),
    ])
}
