//! Checked request values shared by the command-line program and the bindings: radius ranges and grid axes
//! written as `NAME:LO:HI:N` or `LO:HI`. Messages name the option (`flag`) they came from.

use crate::Result;

/// Largest magnitude accepted for a physical value given on the command line (radius, velocity, energy, axis
/// end, range end): the square of such a value and its product with another stay finite in f64
/// (1e200 < f64::MAX ~ 1.8e308), so no junction quantity overflows before it is computed.
pub const MAX_MAGNITUDE: f64 = 1e100;

/// A finite value with |v| <= [`MAX_MAGNITUDE`]; `flag` names the option in the message.
pub fn value(flag: &str, v: f64) -> Result<f64> {
    if !v.is_finite() {
        return Err(crate::Error::input(format!("{flag} {v}: not a finite number")).with_hint("give a finite value"));
    }
    if v.abs() > MAX_MAGNITUDE {
        return Err(crate::Error::input(format!("{flag} {v:e}: |value| above {MAX_MAGNITUDE:e} is refused"))
            .with_hint(
                "such values overflow floating point once squared; rescale your units (README \"Cautions and limits\")",
            ));
    }
    Ok(v)
}

/// Check an optional radius range given on the command line.
pub fn range(from: Option<f64>, to: Option<f64>, default: (f64, f64)) -> Result<(f64, f64)> {
    let lo = from.unwrap_or(default.0);
    let hi = to.unwrap_or(default.1);
    value("--from", lo)?;
    value("--to", hi)?;
    if !(lo.is_finite() && hi.is_finite()) || lo >= hi {
        return Err(crate::Error::input(format!("the range --from {lo} --to {hi} is empty or not finite"))
            .with_hint("give --from LO --to HI with LO < HI"));
    }
    if lo <= 0.0 {
        return Err(crate::Error::input(format!("--from {lo}: radii must be positive"))
            .with_hint("the areal radius r is positive; start the range above 0"));
    }
    Ok((lo, hi))
}

/// A grid axis `NAME:LO:HI:N` (N points including both ends, like linspace).
#[derive(Debug, Clone, PartialEq)]
pub struct AxisSpec {
    /// Axis name (a parameter, `radius` or `beta2`).
    pub name: String,
    /// First value.
    pub lo: f64,
    /// Last value.
    pub hi: f64,
    /// Number of points.
    pub n: usize,
}

impl AxisSpec {
    /// The grid values ([`crate::scan::grid_value`]).
    pub fn values(&self) -> Vec<f64> {
        (0..self.n).map(|i| crate::scan::grid_value(self.lo, self.hi, i, self.n)).collect()
    }
}

/// Parse `NAME:LO:HI:N`; `flag` names the option in messages.
pub fn parse_axis(flag: &str, spec: &str) -> Result<AxisSpec> {
    let parts: Vec<&str> = spec.split(':').collect();
    let bad = |why: &str| {
        crate::Error::input(format!("{flag} {spec}: {why}"))
            .with_hint(format!("write {flag} NAME:LO:HI:N, e.g. {flag} q:0:0.9:50"))
    };
    if parts.len() != 4 {
        return Err(bad("expected 4 fields separated by ':'"));
    }
    let num = |s: &str, what: &str| -> Result<f64> {
        let v: f64 = s.trim().parse().map_err(|_| bad(&format!("{what} '{s}' is not a number")))?;
        if !v.is_finite() {
            return Err(bad(&format!("{what} '{s}' is not finite")));
        }
        if v.abs() > MAX_MAGNITUDE {
            return Err(bad(&format!("|{what}| = {:e} is above {MAX_MAGNITUDE:e} (its square overflows)", v.abs())));
        }
        Ok(v)
    };
    let lo = num(parts[1], "LO")?;
    let hi = num(parts[2], "HI")?;
    let n: usize = parts[3].trim().parse().map_err(|_| bad(&format!("N '{}' is not a whole number", parts[3])))?;
    if n == 0 {
        return Err(bad("N must be at least 1"));
    }
    if n > 1 && lo >= hi {
        return Err(bad("LO must be smaller than HI"));
    }
    if n > 100_000_000 {
        return Err(bad("N above 1e8 points on one axis is refused (split the scan with --shard)"));
    }
    Ok(AxisSpec { name: parts[0].trim().to_string(), lo, hi, n })
}

/// Parse `LO:HI`.
pub fn parse_pair(flag: &str, spec: &str) -> Result<(f64, f64)> {
    let bad = || {
        crate::Error::input(format!("{flag} {spec}: expected LO:HI with LO < HI"))
            .with_hint(format!("e.g. {flag} -2:2"))
    };
    let (a, b) = spec.split_once(':').ok_or_else(bad)?;
    let lo: f64 = a.trim().parse().map_err(|_| bad())?;
    let hi: f64 = b.trim().parse().map_err(|_| bad())?;
    if !(lo.is_finite() && hi.is_finite() && lo < hi) {
        return Err(bad());
    }
    Ok((lo, hi))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axis_values_include_both_ends_like_linspace() {
        let a = parse_axis("--vary", "w:0.3:1.2:4").unwrap();
        assert_eq!(a.name, "w");
        let v = a.values();
        assert_eq!(v.len(), 4);
        assert_eq!((v[0], v[3]), (0.3, 1.2));
        assert!((v[1] - 0.6).abs() < 1e-15 && (v[2] - 0.9).abs() < 1e-15);
        assert_eq!(parse_axis("--x", "radius:2:3:1").unwrap().values(), vec![2.0]);
    }

    #[test]
    fn bad_axes_and_ranges_name_the_option() {
        let e = parse_axis("--x", "radius:3:2:5").unwrap_err();
        assert!(e.message.starts_with("--x radius:3:2:5") && e.message.contains("LO must be smaller"));
        assert!(parse_axis("--y", "beta2:-1:1").unwrap_err().message.contains("expected 4 fields"));
        assert!(parse_pair("--within", "2:1").unwrap_err().message.contains("--within 2:1"));
        assert_eq!(parse_pair("--within", "-2:0").unwrap(), (-2.0, 0.0));
        assert!(range(Some(-1.0), Some(2.0), (1.0, 2.0)).unwrap_err().message.contains("positive"));
        assert_eq!(range(None, Some(5.0), (1.0, 2.0)).unwrap(), (1.0, 5.0));
    }
}
