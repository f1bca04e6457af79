//! `junctura report` (one scenario -> one folder) and `junctura demo` (the bundled demo scenarios).

use super::common::{parse_axis, range, ScenarioArgs};
use junctura::report::bundle::{write_report, ReportOptions};
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
    #[arg(long)]
    from: Option<f64>,
    /// Upper end of that range.
    #[arg(long)]
    to: Option<f64>,
}

fn options(vary: Option<&str>, from: Option<f64>, to: Option<f64>) -> Result<ReportOptions> {
    let vary = vary.map(|v| parse_axis("--vary", v)).transpose()?.map(|a| (a.name, a.lo, a.hi, a.n));
    let range = match (from, to) {
        (None, None) => None,
        (lo, hi) => Some(range(lo, hi, (lo.unwrap_or(0.0), hi.unwrap_or(0.0)))?),
    };
    Ok(ReportOptions { vary, range, map_size: (0, 0) })
}

fn print_listing(files: &[(PathBuf, String)]) {
    for (p, what) in files {
        eprintln!("wrote {}  ({what})", p.display());
    }
}

pub fn run_report(a: ReportArgs) -> Result<()> {
    let s = a.scenario.load()?;
    let opts = options(a.vary.as_deref(), a.from, a.to)?;
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
         and the static branches as w varies (a fold near w = 0.497).\n- `wormhole/`: charged thin-shell wormhole, \
         stability map over (a, beta^2) with the critical curve.\n- `transition/`: spacelike transition surface \
         between a black-hole interior and a white-hole interior of different masses (S^l_l, S^theta_theta).\n",
        env!("CARGO_PKG_VERSION")
    );
    junctura::output::write_atomic(&a.out.join("README.md"), index.as_bytes())?;
    println!("demo written to {}", a.out.display());
    if a.out.as_os_str().is_empty() {
        return Err(Error::input("--out must not be empty"));
    }
    Ok(())
}
