//! `junctura geodesic`: a radial test particle (or light ray) crossing the shell at R, with its orbit on each side.

use super::common::{to_json, ScenarioArgs};
use clap::ValueEnum;
use junctura::geodesic::{CrossingReport, CrossingRequest, Direction, Particle};
use junctura::output::print_stdout;
use junctura::Result;

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
    let report = junctura::geodesic::report(&s, &req)?;
    match args.format {
        GeoFormat::Json => print_stdout(&to_json(&report)),
        GeoFormat::Text => print_stdout(&text(&report)),
        GeoFormat::Csv => junctura::output::print_csv(&csv(&report))?,
    }
    Ok(())
}

fn fmt_opt(v: Option<f64>) -> String {
    v.map(|x| format!("{x:.12}")).unwrap_or_else(|| "-".into())
}

fn text(r: &CrossingReport) -> String {
    let what = match r.particle {
        Particle::Timelike => "particle",
        Particle::Null => "light ray",
    };
    let mut o = format!(
        "scenario: {}\n{}\n{} shell at R = {}, dR/dtau = {}; radial {what} with E = {} on the minus side\n",
        junctura::text::one_line(&r.scenario),
        junctura::text::one_line(&r.provenance),
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

/// One row: the crossing's main numbers; empty fields where the particle cannot cross (`reason` says why).
fn csv(r: &CrossingReport) -> String {
    let o = |x: Option<f64>| x.map(|v| format!("{v:?}")).unwrap_or_default();
    let reason = r.reason.clone().unwrap_or_default().replace(',', ";");
    format!(
        "# {}\nradius [M],shell_velocity [1],energy_minus [1],energy_plus [1],relative_lorentz_factor [1],can_cross,reason\n{:?},{:?},{:?},{},{},{},{}\n",
        junctura::text::one_line(&r.provenance), r.radius, r.shell_velocity, r.energy_minus, o(r.energy_plus), o(r.relative_lorentz_factor), r.can_cross, reason
    )
}
