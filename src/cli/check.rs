//! `junctura check`: validate a scenario and survey both sides.

use super::common::{to_json, Format, RangeArgs, ScenarioArgs};
use junctura::metric::RegionKind;
use junctura::output::print_stdout;
use junctura::survey::{check, SurveyReport};
use junctura::Result;

/// Arguments of `check`.
#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    scenario: ScenarioArgs,
    #[command(flatten)]
    range: RangeArgs,
    /// Output format.
    #[arg(long, value_enum, default_value_t = Format::Text)]
    format: Format,
}

pub fn run(args: Args) -> Result<()> {
    let s = args.scenario.load()?;
    let report = check(&s, &args.range.request())?;
    match args.format {
        Format::Json => print_stdout(&to_json(&report)),
        Format::Text | Format::Latex => print_stdout(&text(&report)),
        Format::Csv => junctura::output::print_csv(&csv(&report))?,
    }
    Ok(())
}

fn text(r: &SurveyReport) -> String {
    let mut o = format!(
        "scenario: {}\n{}\nshell: {}, D = {}, radii {} .. {}\n",
        junctura::text::one_line(&r.scenario),
        junctura::text::one_line(&r.provenance),
        r.shell_kind,
        r.dimension,
        r.from,
        r.to
    );
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        o.push_str(&format!(
            "\n[{name}] keep = {}, sign of n^r = {:+}\n  A(r) = {}\n  B(r) = {}\n",
            sd.keep, sd.normal_sign, sd.a, sd.b
        ));
        if sd.survey.horizons.is_empty() {
            o.push_str("  horizons: none in range\n");
        }
        for h in &sd.survey.horizons {
            let deg = if h.degenerate { " (degenerate: double root, numerically ill-conditioned)" } else { "" };
            o.push_str(&format!("  horizon at r = {:.15}  B'(r) = {:.6e}{deg}\n", h.radius, h.b_slope));
        }
        for p in &sd.survey.poles {
            o.push_str(&format!("  B changes sign through a pole near r = {p:.6} (not a horizon)\n"));
        }
        for g in &sd.survey.regions {
            let k = match g.kind {
                RegionKind::R => "R-region (B > 0, static shells possible)",
                RegionKind::T => "T-region (B < 0, r is timelike)",
            };
            o.push_str(&format!("  {:.6} < r < {:.6}: {k}\n", g.from, g.to));
        }
        if sd.survey.photon_orbits.is_empty() {
            o.push_str("  circular photon orbits: none in range\n");
        }
        for p in &sd.survey.photon_orbits {
            o.push_str(&format!("  circular photon orbit at r = {p:.15}\n"));
        }
    }
    o
}

/// One row per horizon, photon orbit and region boundary of each side.
fn csv(r: &SurveyReport) -> String {
    let mut o = format!("# {}\nside,feature,radius [M],detail\n", junctura::text::one_line(&r.provenance));
    for (name, sd) in [("minus", &r.minus), ("plus", &r.plus)] {
        for h in &sd.survey.horizons {
            o.push_str(&format!(
                "{name},horizon,{:?},{}\n",
                h.radius,
                if h.degenerate { "degenerate" } else { "simple" }
            ));
        }
        for p in &sd.survey.photon_orbits {
            o.push_str(&format!("{name},photon_orbit,{p:?},\n"));
        }
        for g in &sd.survey.regions {
            let k = match g.kind {
                RegionKind::R => "R",
                RegionKind::T => "T",
            };
            o.push_str(&format!("{name},region_start,{:?},{k}\n", g.from));
        }
    }
    o
}
