//! Map axes and the map specification, validated against a scenario.

use crate::error::{Error, ErrorKind, Result};
use crate::phrase;
use crate::scenario::Scenario;
use crate::RequestField as F;
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

    /// Value at index i: [`grid_value`].
    #[inline]
    pub fn value(&self, i: usize) -> f64 {
        grid_value(self.lo, self.hi, i, self.n)
    }
}

/// The k-th of n grid values from lo to hi inclusive, lo + (hi - lo) k / (n - 1), evaluated in double-double
/// arithmetic (about 106 bits) and returned as the double with the shortest decimal form within half a unit
/// in the last place of the exact value. So 0..1.2 in 5 points gives 0.9 (printed "0.9"), not the
/// 0.8999999999999999 that plain double arithmetic gives; both ends are returned exactly.
pub fn grid_value(lo: f64, hi: f64, k: usize, n: usize) -> f64 {
    if n <= 1 || k == 0 {
        return lo;
    }
    if k + 1 >= n {
        return hi;
    }
    // Error-free transformations (Knuth's two-sum, fused multiply-add products; common practice).
    let two_sum = |a: f64, b: f64| {
        let s = a + b;
        let bb = s - a;
        (s, (a - (s - bb)) + (b - bb))
    };
    let (kf, m) = (k as f64, (n - 1) as f64);
    let (d, de) = two_sum(hi, -lo);
    let p = d * kf;
    let pe = d.mul_add(kf, -p) + de * kf;
    let q = p / m;
    let r = (-q).mul_add(m, p);
    let q_lo = (r + pe) / m;
    let (x, xe) = two_sum(lo, q);
    let tail = xe + q_lo;
    let (x, tail) = two_sum(x, tail);
    if !x.is_finite() {
        return x;
    }
    let ulp = (f64::from_bits(x.abs().to_bits() + 1) - x.abs()).abs();
    // The shortest decimal (1 to 17 significant digits) within half an ulp of the exact value x + tail.
    for digits in 1..=17 {
        if let Ok(d) = format!("{:.*e}", digits - 1, x).parse::<f64>() {
            if ((d - x) - tail).abs() <= 0.5 * ulp {
                return d;
            }
        }
    }
    x
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

/// Which static radius decides a cell's class when a map without a radius axis finds several.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum RootRule {
    /// The first stable radius, else the first marginal one, else the smallest.
    #[default]
    AnyStable,
    /// The smallest radius.
    Smallest,
    /// The largest radius.
    Largest,
}

impl RootRule {
    /// Parse `any-stable`, `smallest` or `largest`.
    pub fn parse(s: &str) -> Option<RootRule> {
        match s {
            "any-stable" => Some(RootRule::AnyStable),
            "smallest" => Some(RootRule::Smallest),
            "largest" => Some(RootRule::Largest),
            _ => None,
        }
    }
    /// The option's spelling.
    pub fn name(self) -> &'static str {
        match self {
            RootRule::AnyStable => "any-stable",
            RootRule::Smallest => "smallest",
            RootRule::Largest => "largest",
        }
    }
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
    /// Which static radius decides the class of a cell with several (maps without a radius axis).
    #[serde(default)]
    pub root_rule: RootRule,
}

impl MapSpec {
    /// Validate a pair of axes against the scenario.
    pub fn new(s: &Scenario, x: Axis, y: Axis, beta2: Option<f64>, radius_range: (f64, f64)) -> Result<MapSpec> {
        if x.kind == y.kind {
            return Err(
                Error::input(format!("the two map axes are both '{}'", x.name)).with_hint("choose two different axes")
            );
        }
        if s.shell.kind != crate::model::ShellKind::Timelike {
            return Err(Error::input("maps of static shells need a timelike shell")
                .with_hint("set [shell] kind = \"timelike\""));
        }
        let has_radius = x.kind == AxisKind::Radius || y.kind == AxisKind::Radius;
        let has_beta = x.kind == AxisKind::Beta2 || y.kind == AxisKind::Beta2;
        let source = match (has_radius, has_beta, beta2, s.shell.eos.is_some()) {
            (_, true, Some(_), _) => {
                return Err(Error::phrased(ErrorKind::Input, phrase![F::Beta2, " given while beta2 is an axis"])
                    .with_hint_phrase(phrase!["drop ", F::Beta2]))
            }
            (true, true, None, _) => Beta2Source::Axis,
            (true, false, Some(b), _) => Beta2Source::Fixed(b),
            (true, false, None, true) => Beta2Source::Law,
            (true, false, None, false) => {
                return Err(Error::phrased(
                    ErrorKind::Input,
                    phrase![
                        "the map needs beta^2: make 'beta2' an axis, give ",
                        F::Beta2,
                        " VALUE, or add [shell] pressure = \"...\""
                    ],
                )
                .with_hint_phrase(phrase!["e.g. ", F::Y, " beta2:-3:3:200"]))
            }
            (false, true, _, _) => {
                return Err(Error::input(
                    "a beta2 axis needs a radius axis (beta^2 is a property of a static shell at a given radius)",
                )
                .with_hint_phrase(phrase![
                    "e.g. ",
                    F::X,
                    " radius:2.1:10:300 ",
                    F::Y,
                    " beta2:-3:3:200"
                ]))
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
                .with_hint_phrase(phrase!["split the map with ", F::Shard, " K/N"]));
        }
        Ok(MapSpec { x, y, beta2: source, radius_range, root_rule: RootRule::AnyStable })
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

#[cfg(test)]
mod grid_tests {
    use super::grid_value;

    #[test]
    fn grid_values_print_as_the_decimals_of_the_linspace_formula() {
        // 0, 0.3, 0.6, 0.9, 1.2: plain f64 gives 1.2 * 3 / 4 = 0.8999999999999999 (common practice example).
        let v: Vec<String> = (0..5).map(|k| format!("{}", grid_value(0.0, 1.2, k, 5))).collect();
        assert_eq!(v, ["0", "0.3", "0.6", "0.9", "1.2"]);
        let v: Vec<String> = (0..11).map(|k| format!("{}", grid_value(-0.5, 0.5, k, 11))).collect();
        assert_eq!(v, ["-0.5", "-0.4", "-0.3", "-0.2", "-0.1", "0", "0.1", "0.2", "0.3", "0.4", "0.5"]);
        // Values with no short decimal keep full precision.
        let third = grid_value(0.0, 1.0, 1, 4);
        assert!((third - 1.0 / 3.0).abs() <= f64::EPSILON);
        assert_eq!(grid_value(2.1, 10.0, 0, 300), 2.1);
        assert_eq!(grid_value(2.1, 10.0, 299, 300), 10.0);
    }
}
