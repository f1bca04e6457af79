//! Map axes and the map specification, validated against a scenario.

use crate::error::{Error, Result};
use crate::scenario::Scenario;
use serde::{Deserialize, Serialize};

/// What an axis varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum AxisKind {
    /// The shell radius a.
    Radius,
    /// beta^2 = dp/dsigma.
    Beta2,
    /// Parameter index k.
    Param(usize),
}

/// One axis: N values from lo to hi inclusive (like linspace).
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct Axis {
    /// What varies.
    pub kind: AxisKind,
    /// Name as given.
    pub name: String,
    /// First value.
    pub lo: f64,
    /// Last value.
    pub hi: f64,
    /// Number of points.
    pub n: usize,
}

impl Axis {
    /// Build and validate an axis named `name` for scenario `s`.
    pub fn new(s: &Scenario, name: &str, lo: f64, hi: f64, n: usize) -> Result<Axis> {
        let kind = match name {
            "radius" => AxisKind::Radius,
            "beta2" => AxisKind::Beta2,
            p => AxisKind::Param(s.params.index(p).map_err(|e| {
                e.context(format!("map axis '{p}'"))
                    .with_hint(format!("an axis is 'radius', 'beta2' or a parameter ({})", s.params.names().join(", ")))
            })?),
        };
        if n == 0 {
            return Err(Error::input(format!("axis {name}: N must be at least 1")));
        }
        if !(lo.is_finite() && hi.is_finite()) || (n > 1 && lo >= hi) {
            return Err(Error::input(format!("axis {name}: the range {lo}..{hi} is empty or not finite"))
                .with_hint("give LO < HI"));
        }
        if kind == AxisKind::Radius && lo <= 0.0 {
            return Err(Error::input(format!("axis radius: {lo} is not a positive radius")));
        }
        Ok(Axis { kind, name: name.to_string(), lo, hi, n })
    }

    /// Value at index i.
    #[inline]
    pub fn value(&self, i: usize) -> f64 {
        if self.n == 1 {
            self.lo
        } else if i + 1 == self.n {
            self.hi
        } else {
            self.lo + (self.hi - self.lo) * i as f64 / (self.n - 1) as f64
        }
    }
}

/// Where beta^2 comes from when it is not an axis.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Beta2Source {
    /// One of the axes.
    Axis,
    /// A fixed value.
    Fixed(f64),
    /// The slope P'(sigma0) of the scenario's law.
    Law,
    /// Not needed: no radius axis, the law decides static radii and their stability.
    StaticRadii,
}

/// A validated map.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct MapSpec {
    /// Horizontal axis.
    pub x: Axis,
    /// Vertical axis.
    pub y: Axis,
    /// beta^2 source.
    pub beta2: Beta2Source,
    /// Radius range for maps without a radius axis.
    pub radius_range: (f64, f64),
}

impl MapSpec {
    /// Validate a pair of axes against the scenario.
    pub fn new(s: &Scenario, x: Axis, y: Axis, beta2: Option<f64>, radius_range: (f64, f64)) -> Result<MapSpec> {
        if x.kind == y.kind {
            return Err(
                Error::input(format!("the two map axes are both '{}'", x.name)).with_hint("choose two different axes")
            );
        }
        if s.shell.kind != crate::scenario::ShellKind::Timelike {
            return Err(Error::input("maps of static shells need a timelike shell")
                .with_hint("set [shell] kind = \"timelike\""));
        }
        let has_radius = x.kind == AxisKind::Radius || y.kind == AxisKind::Radius;
        let has_beta = x.kind == AxisKind::Beta2 || y.kind == AxisKind::Beta2;
        let source =
            match (has_radius, has_beta, beta2, s.shell.eos.is_some()) {
                (_, true, Some(_), _) => {
                    return Err(Error::input("--beta2 given while beta2 is an axis").with_hint("drop --beta2"))
                }
                (true, true, None, _) => Beta2Source::Axis,
                (true, false, Some(b), _) => Beta2Source::Fixed(b),
                (true, false, None, true) => Beta2Source::Law,
                (true, false, None, false) => return Err(Error::input(
                    "the map needs beta^2: make 'beta2' an axis, give --beta2 VALUE, or add [shell] pressure = \"...\"",
                )
                .with_hint("e.g. --y beta2:-3:3:200")),
                (false, true, _, _) => {
                    return Err(Error::input(
                        "a beta2 axis needs a radius axis (beta^2 is a property of a static shell at a given radius)",
                    )
                    .with_hint("e.g. --x radius:2.1:10:300 --y beta2:-3:3:200"))
                }
                (false, false, _, false) => {
                    return Err(Error::input(
                        "a map over two parameters needs an equation of state to decide the static radii",
                    )
                    .with_hint("add [shell] pressure = \"...\" or make one axis 'radius'"))
                }
                (false, false, _, true) => Beta2Source::StaticRadii,
            };
        let cells = (x.n as u128) * (y.n as u128);
        if cells > 1u128 << 40 {
            return Err(Error::input(format!("{} x {} = {cells} cells is beyond what one run can address", x.n, y.n))
                .with_hint("split the map with --shard K/N"));
        }
        Ok(MapSpec { x, y, beta2: source, radius_range })
    }

    /// True when the lines run along the x axis index (because y is beta^2, cells of one x share the junction work).
    pub fn lines_are_columns(&self) -> bool {
        self.y.kind == AxisKind::Beta2
    }

    /// Number of lines.
    pub fn n_lines(&self) -> usize {
        if self.lines_are_columns() {
            self.x.n
        } else {
            self.y.n
        }
    }

    /// Cells per line.
    pub fn line_len(&self) -> usize {
        if self.lines_are_columns() {
            self.y.n
        } else {
            self.x.n
        }
    }

    /// (ix, iy) of position j in line i.
    #[inline]
    pub fn cell_index(&self, line: usize, j: usize) -> (usize, usize) {
        if self.lines_are_columns() {
            (line, j)
        } else {
            (j, line)
        }
    }
}
