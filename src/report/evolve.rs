//! Figures of a shell's motion: R(tau), and the orbit in the (R, dR/dtau) plane over the potential.
//! Pure: a report (and the junction, for the potential curve) in, `plot::Figure` out.

use crate::dynamics::run::orbit_potential;
use crate::dynamics::EvolveReport;
use crate::junction::Junction;
use crate::plot::{Figure, LineStyle, Marker, RefLine, Series};

/// R(tau) with the static radius a0 as a reference line and the turning points marked.
pub fn radius_figure(r: &EvolveReport) -> Figure {
    let pts: Vec<(f64, f64)> = r.samples.iter().map(|s| (s.tau, s.radius)).collect();
    Figure {
        x_label: "τ/M".into(),
        y_label: "R/M".into(),
        series: vec![Series { label: "R(τ)".into(), points: pts, style: LineStyle::Solid, colour: 0 }],
        ref_lines: vec![RefLine::horizontal(r.static_radius, "a₀")],
        provenance: r.provenance.clone(),
        ..Figure::default()
    }
}

/// The orbit (R, dR/dtau) drawn over the curves dR/dtau = ±sqrt(-V(R)) of the potential of this motion (the
/// scenario's law followed from the starting state; `Junction::potential_curve`). On an exact solution the
/// orbit lies on these curves. The static radius a0 is marked on the axis.
pub fn phase_figure(j: &Junction<f64>, r: &EvolveReport) -> Figure {
    let orbit: Vec<(f64, f64)> = r.samples.iter().map(|s| (s.radius, s.rdot)).collect();
    let (lo, hi) = (r.radius_range[0], r.radius_range[1]);
    let pad = 0.15 * (hi - lo).max(1e-6 * r.static_radius);
    let n = 400;
    let radii: Vec<f64> =
        (0..n).map(|i| (lo - pad) + (hi - lo + 2.0 * pad) * i as f64 / (n - 1) as f64).filter(|x| *x > 0.0).collect();
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
        markers: vec![Marker {
            x: r.static_radius,
            y: 0.0,
            label: "a₀".into(),
            filled: r.potential_second_derivative > 0.0,
            colour: 2,
        }],
        ref_lines: vec![RefLine::horizontal(0.0, "")],
        provenance: r.provenance.clone(),
        ..Figure::default()
    }
}
