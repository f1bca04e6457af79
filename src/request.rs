//! Checked request values shared by the command-line program and the bindings: radius ranges and grid axes
//! written as `NAME:LO:HI:N` or `LO:HI`. Messages name the request field ([`RequestField`]) a value came
//! from; the command-line program prints its option for it.

use crate::error::{ErrorKind, RequestField};
use crate::scenario::Scenario;
use crate::{phrase, Error, Result};

/// Largest magnitude accepted for a physical value given on the command line (radius, velocity, energy, axis
/// end, range end): the square of such a value and its product with another stay finite in f64
/// (1e200 < f64::MAX ~ 1.8e308), so no junction quantity overflows before it is computed.
pub const MAX_MAGNITUDE: f64 = 1e100;

/// A finite value with |v| <= [`MAX_MAGNITUDE`]; `field` names it in the message.
pub fn value(field: RequestField, v: f64) -> Result<f64> {
    if !v.is_finite() {
        return Err(Error::request(ErrorKind::Input, field, v, phrase![field, format!(" {v}: not a finite number")])
            .with_hint("give a finite value"));
    }
    if v.abs() > MAX_MAGNITUDE {
        let message = phrase![field, format!(" {v:e}: |value| above {MAX_MAGNITUDE:e} is refused")];
        return Err(Error::request(ErrorKind::Input, field, v, message).with_hint(
            "such values overflow floating point once squared; rescale your units (README \"Cautions and limits\")",
        ));
    }
    Ok(v)
}

/// Check an optional radius range (fields `from` and `to`), with `default` for missing ends.
pub fn range(from: Option<f64>, to: Option<f64>, default: (f64, f64)) -> Result<(f64, f64)> {
    use RequestField::{From, To};
    let lo = from.unwrap_or(default.0);
    let hi = to.unwrap_or(default.1);
    value(From, lo)?;
    value(To, hi)?;
    if !(lo.is_finite() && hi.is_finite()) || lo >= hi {
        let message = phrase!["the range ", From, format!(" {lo} "), To, format!(" {hi} is empty or not finite")];
        return Err(Error::request(ErrorKind::Input, From, lo, message).with_hint_phrase(phrase![
            "give ",
            From,
            " LO ",
            To,
            " HI with LO < HI"
        ]));
    }
    if lo <= 0.0 {
        return Err(Error::request(
            ErrorKind::Input,
            From,
            lo,
            phrase![From, format!(" {lo}: radii must be positive")],
        )
        .with_hint("the areal radius r is positive; start the range above 0"));
    }
    Ok((lo, hi))
}

/// A radius range as asked: either end may be left to the scenario's default range
/// ([`crate::metric::default_range`]).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct RangeRequest {
    /// Lower end (field `from`).
    pub from: Option<f64>,
    /// Upper end (field `to`).
    pub to: Option<f64>,
}

impl RangeRequest {
    /// The checked range ([`range`]), the scenario's default range for missing ends.
    pub fn resolve(&self, s: &Scenario) -> Result<(f64, f64)> {
        range(self.from, self.to, crate::metric::default_range(s))
    }
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

/// Parse `NAME:LO:HI:N`; `field` names the axis in messages.
pub fn parse_axis(field: RequestField, spec: &str) -> Result<AxisSpec> {
    let parts: Vec<&str> = spec.split(':').collect();
    let bad_phrase = |why: crate::error::Phrase| {
        let mut message = phrase![field, format!(" {spec}: ")];
        message.0.extend(why.0);
        Error::request(ErrorKind::Input, field, spec, message).with_hint_phrase(phrase![
            "write ",
            field,
            " NAME:LO:HI:N, e.g. ",
            field,
            " q:0:0.9:50"
        ])
    };
    let bad = |why: &str| bad_phrase(phrase![why]);
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
        return Err(bad_phrase(phrase![
            "N above 1e8 points on one axis is refused (split the scan with ",
            RequestField::Shard,
            ")"
        ]));
    }
    Ok(AxisSpec { name: parts[0].trim().to_string(), lo, hi, n })
}

/// Parse `LO:HI`; `field` names it in messages.
pub fn parse_pair(field: RequestField, spec: &str) -> Result<(f64, f64)> {
    let bad = || {
        Error::request(ErrorKind::Input, field, spec, phrase![field, format!(" {spec}: expected LO:HI with LO < HI")])
            .with_hint_phrase(phrase!["e.g. ", field, " -2:2"])
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
        let a = parse_axis(RequestField::Vary, "w:0.3:1.2:4").unwrap();
        assert_eq!(a.name, "w");
        let v = a.values();
        assert_eq!(v.len(), 4);
        assert_eq!((v[0], v[3]), (0.3, 1.2));
        assert!((v[1] - 0.6).abs() < 1e-15 && (v[2] - 0.9).abs() < 1e-15);
        assert_eq!(parse_axis(RequestField::X, "radius:2:3:1").unwrap().values(), vec![2.0]);
    }

    #[test]
    fn bad_axes_and_ranges_name_the_field() {
        let e = parse_axis(RequestField::X, "radius:3:2:5").unwrap_err();
        assert!(e.message.starts_with("the axis x radius:3:2:5") && e.message.contains("LO must be smaller"));
        assert_eq!(e.problem, crate::Problem::BadRequest { field: RequestField::X, value: "radius:3:2:5".into() });
        assert!(parse_axis(RequestField::Y, "beta2:-1:1").unwrap_err().message.contains("expected 4 fields"));
        assert!(parse_pair(RequestField::Within, "2:1").unwrap_err().message.contains("within 2:1"));
        assert_eq!(parse_pair(RequestField::Within, "-2:0").unwrap(), (-2.0, 0.0));
        assert!(range(Some(-1.0), Some(2.0), (1.0, 2.0)).unwrap_err().message.contains("positive"));
        assert_eq!(range(None, Some(5.0), (1.0, 2.0)).unwrap(), (1.0, 5.0));
    }

    #[test]
    fn a_front_end_prints_its_own_names_for_the_fields() {
        let flag = |f: RequestField| match f {
            RequestField::From => "--lo",
            RequestField::To => "--hi",
            _ => "?",
        };
        let e = range(Some(5.0), Some(3.0), (1.0, 2.0)).unwrap_err();
        assert_eq!(
            e.to_string(),
            "the range from 5 to 3 is empty or not finite\n  hint: give from LO to HI with LO < HI"
        );
        assert_eq!(
            e.render(&flag),
            "the range --lo 5 --hi 3 is empty or not finite\n  hint: give --lo LO --hi HI with LO < HI"
        );
        assert_eq!(e.fields(), vec![RequestField::From, RequestField::To, RequestField::From, RequestField::To]);
        // Context keeps the fields; a hint replaced by plain text is shown as it is.
        let e = e.context("statics").with_hint("plain");
        assert_eq!(e.render(&flag), "statics: the range --lo 5 --hi 3 is empty or not finite\n  hint: plain");
    }
}
