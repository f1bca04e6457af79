//! Figures of a shell's motion: R(tau), and the orbit in the (R, dR/dtau) plane over the potential.
//! Pure: a report (and the junction, for the potential curve) in, `plot::Figure` out.

use crate::dynamics::integrate::EventKind;
use crate::dynamics::run::orbit_potential;
use crate::dynamics::EvolveReport;
use crate::junction::Junction;
use crate::plot::{Figure, LineStyle, Marker, RefLine, Series};

/// R(tau) with the static radius a0 (if any) and the horizons the shell crossed as reference lines.
pub fn radius_figure(r: &EvolveReport) -> Figure {
    let pts: Vec<(f64, f64)> = r.samples.iter().map(|s| (s.tau, s.radius)).collect();
    let mut ref_lines: Vec<RefLine> = r.static_radius.map(|a0| RefLine::horizontal(a0, "a₀")).into_iter().collect();
    let mut crossed: Vec<f64> = vec![];
    for e in r.events.iter().filter(|e| e.kind == EventKind::HorizonCrossing) {
        if !crossed.iter().any(|c| (c - e.radius).abs() <= 1e-9 * e.radius) {
            crossed.push(e.radius);
            let label = if e.side == Some("minus") { "r_h−" } else { "r_h+" };
            ref_lines.push(RefLine::horizontal(e.radius, label));
        }
    }
    Figure {
        x_label: "τ/M".into(),
        y_label: "R/M".into(),
        series: vec![Series { label: "R(τ)".into(), points: pts, style: LineStyle::Solid, colour: 0 }],
        ref_lines,
        provenance: r.provenance.clone(),
        ..Figure::default()
    }
}

/// The orbit (R, dR/dtau) drawn over the curves dR/dtau = ±sqrt(-V(R)) of the potential of this motion (the
/// scenario's law followed from the starting state; `Junction::potential_curve`). On an exact solution the
/// orbit lies on these curves. The static radius a0 (if any) is marked on the axis.
pub fn phase_figure(j: &Junction<f64>, r: &EvolveReport) -> Figure {
    let orbit: Vec<(f64, f64)> = r.samples.iter().map(|s| (s.radius, s.rdot)).collect();
    let (lo, hi) = (r.radius_range[0], r.radius_range[1]);
    let a_ref = r.static_radius.unwrap_or(r.initial.radius);
    let pad = 0.15 * (hi - lo).max(1e-6 * a_ref);
    let n = 400;
    // Below the orbit by at most a quarter of its smallest radius: the squared constraint also has the other sign
    // branch of the junction condition, allowed again at small R, which is not this motion.
    let x0 = (lo - pad).max(0.75 * lo);
    let radii: Vec<f64> = crate::spacing::linear(x0, hi + pad, n).into_iter().filter(|x| *x > 0.0).collect();
    let v = orbit_potential(j, &r.initial, &radii).unwrap_or_else(|_| vec![f64::NAN; radii.len()]);
    let root = |sign: f64| -> Vec<(f64, f64)> {
        radii.iter().zip(&v).map(|(&x, &vv)| (x, if vv <= 0.0 { sign * (-vv).sqrt() } else { f64::NAN })).collect()
    };
    Figure {
        x_label: "R/M".into(),
        y_label: "dR/dτ".into(),
        // The orbit first and the potential's curves on top, dashed in a contrasting colour: on an exact
        // solution the two coincide, and the dashes let both show.
        series: vec![
            Series { label: "orbit".into(), points: orbit, style: LineStyle::Solid, colour: 5 },
            Series { label: "±√(−V(R))".into(), points: root(1.0), style: LineStyle::Dashed, colour: 1 },
            Series { label: String::new(), points: root(-1.0), style: LineStyle::Dashed, colour: 1 },
        ],
        markers: r
            .static_radius
            .map(|a0| Marker {
                x: a0,
                y: 0.0,
                label: "a₀".into(),
                filled: r.linear_verdict == Some("stable"),
                colour: 2,
            })
            .into_iter()
            .collect(),
        ref_lines: vec![RefLine::horizontal(0.0, "")],
        provenance: r.provenance.clone(),
        ..Figure::default()
    }
}
