//! `junctura report` (one scenario -> one folder) and `junctura demo` (the bundled demo scenarios).

use super::common::{parse_axis, parse_family, range, FigureArgs, ScenarioArgs};
use junctura::files::{write_report, ReportOptions};
use junctura::scenario::Scenario;
use junctura::{Error, Result};
use std::path::{Path, PathBuf};

/// Arguments of `report`.
#[derive(clap::Args, Debug)]
pub struct ReportArgs {
    #[command(flatten)]
    scenario: ScenarioArgs,
    /// Output folder.
    #[arg(long)]
    out: PathBuf,
    /// Also follow the static branches as a parameter varies: NAME:LO:HI:N.
    #[arg(long, allow_hyphen_values = true)]
    vary: Option<String>,
    /// Lower end of the radius range for plots and maps (default: the R-region where the shell can sit).
    #[arg(long, allow_negative_numbers = true)]
    from: Option<f64>,
    /// Upper end of that range.
    #[arg(long, allow_negative_numbers = true)]
    to: Option<f64>,
    /// Figures for several values of one parameter: NAME=v1,v2,... (critical beta^2, sigma0, p0, and a
    /// multi-panel map with one panel per value).
    #[arg(long)]
    family: Option<String>,
    #[command(flatten)]
    figure: FigureArgs,
}

fn options(vary: Option<&str>, from: Option<f64>, to: Option<f64>) -> Result<ReportOptions> {
    options_with(vary, from, to, None, &FigureArgs::default())
}

fn options_with(
    vary: Option<&str>,
    from: Option<f64>,
    to: Option<f64>,
    family: Option<&str>,
    figure: &FigureArgs,
) -> Result<ReportOptions> {
    let vary =
        vary.map(|v| parse_axis(junctura::RequestField::Vary, v)).transpose()?.map(|a| (a.name, a.lo, a.hi, a.n));
    let range = match (from, to) {
        (None, None) => None,
        (lo, hi) => Some(range(lo, hi, (lo.unwrap_or(0.0), hi.unwrap_or(0.0)))?),
    };
    let family = family.map(parse_family).transpose()?;
    Ok(ReportOptions { vary, range, map_size: (0, 0), family, figure: figure.options()? })
}

fn print_listing(files: &[(PathBuf, String)]) {
    for (p, what) in files {
        eprintln!("wrote {}  ({what})", p.display());
    }
}

pub fn run_report(a: ReportArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let opts = options_with(a.vary.as_deref(), a.from, a.to, a.family.as_deref(), &a.figure)?;
    let files = write_report(&s, &a.out, &opts)?;
    print_listing(&files);
    Ok(())
}

/// Arguments of `demo`.
#[derive(clap::Args, Debug)]
pub struct DemoArgs {
    /// Output folder.
    #[arg(long, default_value = "junctura-demo")]
    out: PathBuf,
}

/// The bundled demo scenarios (our own invented values): a thin-shell gravastar with a linear law (two static
/// radii, one stable; a fold as w varies), a charged thin-shell wormhole (beta^2 stability map), and a spacelike
/// black-hole-to-white-hole transition surface.
const DEMOS: [(&str, &str, Option<&str>); 3] = [
    ("gravastar", include_str!("../../scenarios/gravastar-linear.toml"), Some("w:0.3:1.2:46")),
    ("wormhole", include_str!("../../scenarios/reissner-nordstrom-wormhole.toml"), None),
    ("transition", include_str!("../../scenarios/black-to-white-transition.toml"), None),
];

pub fn run_demo(a: DemoArgs) -> Result<()> {
    junctura::output::ensure_dir(&a.out)?;
    for (name, text, vary) in DEMOS {
        let dir = a.out.join(name);
        let s = Scenario::parse(text, Some(Path::new("scenarios").join(format!("{name}.toml"))))
            .map_err(|e| e.context(format!("bundled demo scenario {name}")))?;
        junctura::output::ensure_dir(&dir)?;
        junctura::output::write_atomic(&dir.join("scenario.toml"), text.as_bytes())?;
        let opts = options(vary, None, None)?;
        let files = write_report(&s, &dir, &opts).map_err(|e| e.context(format!("demo {name}")))?;
        eprintln!("demo {name}: {} files in {}", files.len() + 1, dir.display());
    }
    let index = format!(
        "# junctura demo\n\nProduced by junctura {}. Each folder holds one scenario (`scenario.toml`) and its report \
         (`summary.md` lists the files):\n\n- `gravastar/`: thin-shell gravastar (de Sitter core, Schwarzschild exterior), \
         linear law p = w sigma: two static radii (unstable inner, stable outer), potential, sigma0/p0, stability map, \
         and the static branches as w varies (a fold near w = 0.497), and the nonlinear motion after a kick from the \
         stable radius.\n- `wormhole/`: charged thin-shell wormhole, \
         stability map over (a, beta^2) with the critical curve.\n- `transition/`: spacelike transition surface \
         between a black-hole interior and a white-hole interior of different masses (S^l_l, S^theta_theta).\n\
         - `particles/`: a radial test particle crossing a moving shell (`crossing.json`), and a chain of \
         black-to-white bounces for a solar-mass hole: the bounded orbit's distance to the horizon after each \
         crossing (`chain.csv`, `chain_distance`, `chain_energy`).\n",
        env!("CARGO_PKG_VERSION")
    );
    // Test particles: a radial particle through a moving shell of our own demo star, and a chain of bounces.
    let particles = a.out.join("particles");
    junctura::output::ensure_dir(&particles)?;
    let star = Scenario::parse(
        include_str!("../../scenarios/star-shell.toml"),
        Some(PathBuf::from("scenarios/star-shell.toml")),
    )?;
    let req = junctura::geodesic::crossing::CrossingRequest {
        radius: 4.0,
        shell_velocity: -0.3,
        energy_minus: 1.1,
        particle: junctura::geodesic::radial::Particle::Timelike,
        direction: None,
    };
    let cross = junctura::geodesic::crossing::cross(&star, star.params.values(), &req)?;
    let cross_json = serde_json::json!({"provenance": star.provenance(), "radius": 4.0, "shell_velocity": -0.3, "energy_minus": 1.1, "crossing": cross});
    junctura::output::write_atomic(
        &particles.join("crossing.json"),
        junctura::export::json::pretty(&cross_json).as_bytes(),
    )?;
    let chain_dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("scenarios/chains/bounce-chain.toml");
    if chain_dir.exists() {
        let chain = junctura::geodesic::chain::Chain::load(&chain_dir)?;
        let unit = junctura::units::MassUnit::new(junctura::units::parse_mass("1Msun")?)?;
        let thr = junctura::units::PLANCK_LENGTH_M / unit.length_m();
        let run = junctura::geodesic::iterate::run_chain(&chain, chain.crossings, Some(thr))?;
        let prov = format!("{} | mass 1Msun", chain.provenance());
        let csv = junctura::export::csv::chain(&run, &prov, Some(&unit));
        junctura::output::write_atomic(&particles.join("chain.csv"), csv.as_bytes())?;
        let series = junctura::geodesic::series::chain_series(&run, Some(&unit));
        for (name, fig) in
            junctura::geodesic::series::chain_figures(&series, Some(junctura::units::PLANCK_LENGTH_M), &prov)
        {
            junctura::plot::write_figure(&fig, &particles, &name)?;
        }
    }
    junctura::output::write_atomic(&a.out.join("README.md"), index.as_bytes())?;
    println!("demo written to {}", a.out.display());
    if a.out.as_os_str().is_empty() {
        return Err(Error::input("--out must not be empty"));
    }
    Ok(())
}
