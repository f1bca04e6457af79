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

/// The stability map: classes as a bitmap, the critical curve and energy-condition boundaries on top.
pub fn map_figure(provenance: String, spec: &MapSpec, cells: &[Cell]) -> Figure {
    let (nx, ny) = (spec.x.n, spec.y.n);
    let mut grid = vec![CellClass::NoStatic as u8; nx * ny];
    let mut crit: Vec<(usize, f64)> = Vec::new();
    let mut bits = vec![0u8; nx * ny];
    let mut has = vec![false; nx * ny];
    for c in cells {
        let k = c.iy as usize * nx + c.ix as usize;
        if k < grid.len() {
            grid[k] = c.class as u8;
            bits[k] = c.energy_bits;
            has[k] = matches!(c.class, CellClass::Stable | CellClass::Unstable | CellClass::Marginal);
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
        series.push(Series { label: "β²_c (critical)".into(), points: pts, style: LineStyle::Solid, colour: 4 });
    }
    // Energy-condition boundaries: cell edges across which a condition changes.
    for (bit, label, col, style) in [
        (1u8, "null EC boundary", 0usize, LineStyle::DashDot),
        (2u8, "weak EC boundary", 3usize, LineStyle::Dashed),
        (8u8, "dominant EC boundary", 6usize, LineStyle::Dotted),
    ] {
        let mut pts: Vec<(f64, f64)> = Vec::new();
        for iy in 0..ny {
            for ix in 0..nx {
                let k = iy * nx + ix;
                if !has[k] {
                    continue;
                }
                let (x, y) = (spec.x.value(ix), spec.y.value(iy));
                if ix + 1 < nx && has[k + 1] && (bits[k] & bit) != (bits[k + 1] & bit) {
                    pts.extend([(x + hx, y - hy), (x + hx, y + hy), (f64::NAN, f64::NAN)]);
                }
                if iy + 1 < ny && has[k + nx] && (bits[k] & bit) != (bits[k + nx] & bit) {
                    pts.extend([(x - hx, y + hy), (x + hx, y + hy), (f64::NAN, f64::NAN)]);
                }
            }
        }
        if !pts.is_empty() {
            series.push(Series { label: label.into(), points: pts, style, colour: col });
        }
    }
    Figure {
        x_label: axis_label(spec.x.kind, &spec.x.name),
        y_label: axis_label(spec.y.kind, &spec.y.name),
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
    }
}

/// V(a) around each static radius of the scenario's law (one curve per static radius, 40% either side).
pub fn potential_figure(s: &Scenario, rep: &StaticsReport) -> Option<Figure> {
    if rep.static_radii.is_empty() {
        return None;
    }
    let j = Junction::new(s);
    let lo = rep.static_radii.first()?.radius * 0.6;
    let hi = rep.static_radii.last()?.radius * 1.4;
    let radii: Vec<f64> = (0..400).map(|i| lo + (hi - lo) * i as f64 / 399.0).collect();
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
            label: format!("a₀ = {:.3}", sr.radius),
            filled: stable,
            colour: if stable { colour::STABLE } else { colour::UNSTABLE },
        });
    }
    // Zoom the vertical range on the wells and barriers near the static radii.
    let near: Vec<f64> = series.iter().flat_map(|s| s.points.iter().filter(|p| p.1.is_finite()).map(|p| p.1)).collect();
    let ymax = near.iter().fold(0.0f64, |m, v| m.max(v.abs())).min(1.0);
    Some(Figure {
        x_label: "a/M".into(),
        y_label: "V(a)".into(),
        y_range: Some((-ymax.max(1e-6) * 1.05, ymax.max(1e-6) * 1.05)),
        series,
        markers,
        ref_lines: vec![RefLine::horizontal(0.0, "V = 0")],
        provenance: s.provenance(),
        ..Figure::default()
    })
}

/// sigma0(a) and p0(a) of static shells over [lo, hi], with the radii where the weak and dominant energy
/// conditions hold shaded.
pub fn sigma_pressure_figure(s: &Scenario, lo: f64, hi: f64) -> Figure {
    let j = Junction::new(s);
    let n = 400;
    let mut sig = Vec::with_capacity(n);
    let mut pre = Vec::with_capacity(n);
    let mut wec = Vec::new();
    let mut dec = Vec::new();
    let step = (hi - lo) / (n - 1) as f64;
    for i in 0..n {
        let a = lo + step * i as f64;
        match j.static_values(a) {
            Ok(sv) => {
                let (sg, p) = (sv.stress.sigma(), sv.stress.pressure());
                sig.push((a, sg));
                pre.push((a, p));
                let ec = EnergyConditions::evaluate(sg, p, s.dimension);
                wec.push((a, ec.weak));
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
    let mut bands = intervals(&wec, "weak EC holds", 3);
    bands.extend(intervals(&dec, "dominant EC holds", 6));
    Figure {
        x_label: "a/M".into(),
        y_label: "σ₀, p₀ (units of 1/M)".into(),
        x_range: Some((lo, hi)),
        y_range,
        series: vec![
            Series { label: "σ₀(a)".into(), points: sig, style: LineStyle::Solid, colour: 0 },
            Series { label: "p₀(a)".into(), points: pre, style: LineStyle::Dashed, colour: 5 },
        ],
        bands,
        ref_lines: vec![RefLine::horizontal(0.0, "")],
        provenance: s.provenance(),
        ..Figure::default()
    }
}

/// Static branches of a sweep: radius against the parameter, stable parts solid, unstable dashed, folds marked.
pub fn sweep_figure(rep: &SweepReport) -> Figure {
    let mut series = Vec::new();
    let mut markers = Vec::new();
    for b in &rep.branches {
        // Split each branch into runs of equal stability; consecutive runs share their end point.
        let mut run: Vec<(f64, f64)> = Vec::new();
        let mut cur: Option<Stability> = None;
        let flush = |run: &mut Vec<(f64, f64)>, st: Option<Stability>, series: &mut Vec<Series>| {
            if run.len() > 1 {
                let stable = st == Some(Stability::Stable);
                series.push(Series {
                    label: String::new(),
                    points: std::mem::take(run),
                    style: if stable { LineStyle::Solid } else { LineStyle::Dashed },
                    colour: if stable { colour::STABLE } else { colour::UNSTABLE },
                });
            } else {
                run.clear();
            }
        };
        for p in &b.points {
            if cur.is_some() && cur != Some(p.stability) {
                let last = run.last().copied();
                flush(&mut run, cur, &mut series);
                if let Some(l) = last {
                    run.push(l);
                }
            }
            cur = Some(p.stability);
            run.push((p.value, p.radius));
        }
        flush(&mut run, cur, &mut series);
        for f in &b.folds {
            markers.push(Marker {
                x: f.value,
                y: f.radius,
                label: "fold".into(),
                filled: true,
                colour: colour::MARGINAL,
            });
        }
    }
    // Legend entries for the encoding.
    series.push(Series { label: "stable".into(), points: vec![], style: LineStyle::Solid, colour: colour::STABLE });
    series.push(Series {
        label: "unstable".into(),
        points: vec![],
        style: LineStyle::Dashed,
        colour: colour::UNSTABLE,
    });
    Figure {
        x_label: greek(&rep.parameter),
        y_label: "a₀/M".into(),
        series,
        markers,
        provenance: rep.provenance.clone(),
        ..Figure::default()
    }
}

/// Figures of a chain run against crossing number: the apex's areal and proper distance to the horizon
/// (log10, with the threshold drawn), and the Killing energy. Built from `geodesic::series::chain_series`.
pub fn chain_figures(
    series: &[crate::geodesic::series::Series],
    threshold: Option<f64>,
    provenance: &str,
) -> Vec<(String, Figure)> {
    let log_pts = |s: &crate::geodesic::series::Series| -> Vec<(f64, f64)> {
        s.x.iter().zip(&s.y).map(|(&x, &y)| (x, if y > 0.0 { y.log10() } else { f64::NAN })).collect()
    };
    let mut out = Vec::new();
    let dist: Vec<&crate::geodesic::series::Series> = series.iter().filter(|s| s.name.ends_with("distance")).collect();
    if let Some(first) = dist.first() {
        let mut fig = Figure {
            x_label: first.x_label.clone(),
            y_label: format!(
                "log₁₀ distance to horizon [{}]",
                first.y_label.rsplit('[').next().unwrap_or("]").trim_end_matches(']')
            ),
            provenance: provenance.to_string(),
            ..Figure::default()
        };
        for (i, s) in dist.iter().enumerate() {
            let label = if s.name.starts_with("areal") { "areal: r_max − r_h" } else { "proper distance" };
            fig.series.push(Series {
                label: label.into(),
                points: log_pts(s),
                style: LineStyle::cycle(i),
                colour: i * 3,
            });
        }
        if let Some(t) = threshold.filter(|t| *t > 0.0) {
            fig.ref_lines.push(RefLine::horizontal(t.log10(), "threshold"));
        }
        out.push(("chain_distance".to_string(), fig));
    }
    if let Some(e) = series.iter().find(|s| s.name == "energy") {
        out.push((
            "chain_energy".to_string(),
            Figure {
                x_label: e.x_label.clone(),
                y_label: "log₁₀ E (Killing energy per unit mass)".into(),
                series: vec![Series {
                    label: "E after each crossing".into(),
                    points: log_pts(e),
                    style: LineStyle::Solid,
                    colour: 0,
                }],
                provenance: provenance.to_string(),
                ..Figure::default()
            },
        ));
    }
    out
}
