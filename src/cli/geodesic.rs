//! `junctura geodesic`: a radial test particle (or light ray) crossing the shell at R, with its orbit on each side.

use super::common::{to_json, ScenarioArgs};
use clap::ValueEnum;
use junctura::geodesic::{
    cross, max_radius, Apex, Crossing, CrossingRequest, Direction, Particle, QuadOptions, Radial, SideState,
};
use junctura::metric::{default_range, SideFns};
use junctura::output::print_stdout;
use junctura::roots::RootOptions;
use junctura::scenario::{Keep, Scenario, Which};
use junctura::Result;
use serde::Serialize;

/// Output format of `geodesic`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum GeoFormat {
    /// Readable summary.
    Text,
    /// One JSON object on stdout.
    Json,
    /// One CSV row (provenance comment, header with units).
    Csv,
}

/// Radial direction on the minus side.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum DirectionArg {
    /// Toward smaller r.
    Inward,
    /// Toward larger r.
    Outward,
}

/// Arguments of `geodesic`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Shell radius R at the crossing (geometric units).
    #[arg(long, allow_negative_numbers = true)]
    radius: f64,
    /// Killing energy E = -u_t on the minus side (per unit mass for a particle).
    #[arg(long, allow_negative_numbers = true)]
    energy: f64,
    /// A light ray instead of a massive particle.
    #[arg(long)]
    null: bool,
    /// dR/dtau of a timelike shell at the crossing (default 0: a static shell).
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    shell_velocity: f64,
    /// Radial direction on the minus side (default: along the normal, toward the plus side).
    #[arg(long, value_enum)]
    direction: Option<DirectionArg>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = GeoFormat::Text)]
    format: GeoFormat,
}

#[derive(Serialize)]
struct SideReport {
    #[serde(flatten)]
    state: SideState,
    turning_points: Vec<f64>,
    max_radius: Option<Apex>,
    proper_time_to_max_radius: Option<f64>,
    coordinate_time_to_max_radius: Option<f64>,
    notes: Vec<String>,
}

#[derive(Serialize)]
struct Report {
    scenario: String,
    provenance: String,
    particle: Particle,
    radius: f64,
    shell_velocity: f64,
    energy_minus: f64,
    energy_plus: Option<f64>,
    relative_lorentz_factor: Option<f64>,
    relative_lorentz_factor_check: Option<f64>,
    shell_frame_energy: Option<f64>,
    can_cross: bool,
    reason: Option<String>,
    shell_kind: &'static str,
    minus: SideReport,
    plus: Option<SideReport>,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    let particle = if args.null { Particle::Null } else { Particle::Timelike };
    let direction = args.direction.map(|d| match d {
        DirectionArg::Inward => Direction::Inward,
        DirectionArg::Outward => Direction::Outward,
    });
    let req = CrossingRequest {
        radius: args.radius,
        shell_velocity: args.shell_velocity,
        energy_minus: args.energy,
        particle,
        direction,
    };
    let c = cross(&s, s.params.values(), &req)?;
    let report = build(&s, &req, c);
    match args.format {
        GeoFormat::Json => print_stdout(&to_json(&report)),
        GeoFormat::Text => print_stdout(&text(&report)),
        GeoFormat::Csv => print_stdout(&csv(&report)),
    }
    Ok(())
}

/// The orbit of the particle on one side: turning points, apex above R, and the times to reach it.
fn side_report(s: &Scenario, which: Which, state: SideState, req: &CrossingRequest) -> SideReport {
    let roots = RootOptions { samples: 2000, ..Default::default() };
    let quad = QuadOptions::default();
    let fns = SideFns::new(s.side(which), s.params.values());
    let rad = Radial::new(fns, state.energy, req.particle);
    let (lo, hi) = default_range(s);
    let (lo, hi) = (lo.min(0.5 * req.radius), hi.max(10.0 * req.radius));
    let mut notes = Vec::new();
    // Only the kept part of the side matters: r <= R (inner), r >= R (outer), all of it for a T-region.
    let keep = s.side(which).keep;
    let kept = |r: f64| match keep {
        Keep::Inner => r <= req.radius,
        Keep::Outer => r >= req.radius,
        Keep::BlackHole | Keep::WhiteHole => true,
    };
    let turning_points: Vec<f64> = rad.turning_points(lo, hi, &roots).into_iter().filter(|r| kept(*r)).collect();
    let mut apex = None;
    let (mut tau, mut t) = (None, None);
    if keep == Keep::Inner {
        notes.push("this side keeps r < R: the orbit leaves it at the shell, so no maximal radius is reported".into());
    } else if req.particle == Particle::Timelike {
        match max_radius(&fns, state.energy * state.energy, req.radius, hi, &roots, &quad) {
            Ok(Some(a)) => apex = Some(a),
            Ok(None) => notes.push(format!("unbounded: no turning point above R up to r = {hi}")),
            Err(e) => notes.push(format!("maximal radius: {}", e.message)),
        }
    } else {
        notes.push("a radial light ray has no turning point".into());
    }
    if let Some(a) = &apex {
        match rad.proper_time(req.radius, a.radius, &roots, &quad) {
            Ok(q) => tau = Some(q.value),
            Err(e) => notes.push(format!("proper time: {}", e.message)),
        }
        match rad.coordinate_time(req.radius, a.radius, &roots, &quad) {
            Ok(q) => t = Some(q.value),
            Err(e) => notes.push(format!("coordinate time: {}", e.message)),
        }
    }
    SideReport {
        state,
        turning_points,
        max_radius: apex,
        proper_time_to_max_radius: tau,
        coordinate_time_to_max_radius: t,
        notes,
    }
}

fn build(s: &Scenario, req: &CrossingRequest, c: Crossing) -> Report {
    let minus = side_report(s, Which::Minus, c.minus, req);
    let plus = c.plus.map(|p| side_report(s, Which::Plus, p, req));
    Report {
        scenario: s.name.clone(),
        provenance: s.provenance(),
        particle: req.particle,
        radius: req.radius,
        shell_velocity: req.shell_velocity,
        energy_minus: c.energy_minus,
        energy_plus: c.energy_plus,
        relative_lorentz_factor: c.relative_lorentz_factor,
        relative_lorentz_factor_check: c.relative_lorentz_factor_check,
        shell_frame_energy: c.shell_frame_energy,
        can_cross: c.can_cross,
        reason: c.reason,
        shell_kind: c.shell_kind,
        minus,
        plus,
    }
}

fn fmt_opt(v: Option<f64>) -> String {
    v.map(|x| format!("{x:.12}")).unwrap_or_else(|| "-".into())
}

fn text(r: &Report) -> String {
    let what = match r.particle {
        Particle::Timelike => "particle",
        Particle::Null => "light ray",
    };
    let mut o = format!(
        "scenario: {}\n{}\n{} shell at R = {}, dR/dtau = {}; radial {what} with E = {} on the minus side\n",
        r.scenario, r.provenance, r.shell_kind, r.radius, r.shell_velocity, r.energy_minus
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

/// One row: the crossing's main numbers; empty fields where the particle cannot cross (`reason` says why).
fn csv(r: &Report) -> String {
    let o = |x: Option<f64>| x.map(|v| format!("{v:?}")).unwrap_or_default();
    let reason = r.reason.clone().unwrap_or_default().replace(',', ";");
    format!(
        "# {}\nradius [M],shell_velocity [1],energy_minus [1],energy_plus [1],relative_lorentz_factor [1],can_cross,reason\n{:?},{:?},{:?},{},{},{},{}\n",
        r.provenance, r.radius, r.shell_velocity, r.energy_minus, o(r.energy_plus), o(r.relative_lorentz_factor), r.can_cross, reason
    )
}
