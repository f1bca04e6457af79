//! Physical units. junctura computes in geometric units (G = c = 1) with a chosen mass unit M = 1, so every
//! length and time is a multiple of G M / c^2 and G M / c^3. This module converts those to SI, solar masses and
//! Planck units, and parses masses and lengths typed on the command line (`1Msun`, `1e30kg`, `2.5e-8kg`,
//! `1lP`, `3km`).
//!
//! ```
//! use junctura::units::{parse_mass, MassUnit};
//! let m = parse_mass("1Msun").unwrap();
//! let l = MassUnit::new(m).unwrap().length_m();
//! assert!((l - 1476.6).abs() < 0.1); // G M_sun / c^2 (IAU 2015 nominal value)
//! ```

use crate::error::{Error, ErrorKind, RequestField, Result};
use crate::phrase;

/// Newtonian constant of gravitation G in m^3 kg^-1 s^-2 (CODATA 2018: Tiesinga et al., Rev. Mod. Phys. 93,
/// 025010 (2021), table XXXI).
pub const G_SI: f64 = 6.674_30e-11;

/// Speed of light in vacuum c in m s^-1 (exact in the SI; CODATA 2018).
pub const C_SI: f64 = 299_792_458.0;

/// Reduced Planck constant hbar in J s (exact in the 2019 SI, h = 6.626 070 15e-34 J s; CODATA 2018).
pub const HBAR_SI: f64 = 1.054_571_817e-34;

/// Planck length sqrt(hbar G / c^3) in m (CODATA 2018 recommended value).
pub const PLANCK_LENGTH_M: f64 = 1.616_255e-35;

/// Planck mass sqrt(hbar c / G) in kg (CODATA 2018 recommended value).
pub const PLANCK_MASS_KG: f64 = 2.176_434e-8;

/// Planck time sqrt(hbar G / c^5) in s (CODATA 2018 recommended value).
pub const PLANCK_TIME_S: f64 = 5.391_247e-44;

/// Nominal solar mass parameter G M_sun in m^3 s^-2 (IAU 2015 Resolution B3: (GM)_sun^N = 1.327 124 4e20).
pub const GM_SUN_SI: f64 = 1.327_124_4e20;

/// The solar mass in kg implied by the IAU 2015 nominal G M_sun and CODATA 2018 G (about 1.98841e30 kg;
/// the mass itself is only known to the precision of G).
pub const M_SUN_KG: f64 = GM_SUN_SI / G_SI;

/// A mass unit M: lengths in geometric units are multiples of G M / c^2, times of G M / c^3.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MassUnit {
    kg: f64,
}

impl MassUnit {
    /// A mass unit of `kg` kilograms (must be positive and finite).
    pub fn new(kg: f64) -> Result<MassUnit> {
        if !(kg.is_finite() && kg > 0.0) {
            return Err(Error::input(format!("mass {kg} kg is not a positive finite number"))
                .with_hint("give a positive mass such as 1Msun or 1e30kg"));
        }
        Ok(MassUnit { kg })
    }

    /// The mass in kg.
    pub fn kg(&self) -> f64 {
        self.kg
    }

    /// The mass in solar masses (IAU 2015 nominal G M_sun with CODATA 2018 G).
    pub fn solar_masses(&self) -> f64 {
        self.kg / M_SUN_KG
    }

    /// The mass in Planck masses.
    pub fn planck_masses(&self) -> f64 {
        self.kg / PLANCK_MASS_KG
    }

    /// G M / c^2 in metres: one geometric length unit (common practice, e.g. Hartle 2003, sec. 3.1). Since
    /// [`M_SUN_KG`] is G M_sun / G, solar masses recover the IAU 2015 G M_sun without the uncertainty of G.
    pub fn length_m(&self) -> f64 {
        (G_SI * self.kg) / (C_SI * C_SI)
    }

    /// G M / c^3 in seconds: one geometric time unit.
    pub fn time_s(&self) -> f64 {
        self.length_m() / C_SI
    }

    /// One geometric length unit in Planck lengths.
    pub fn length_planck(&self) -> f64 {
        self.length_m() / PLANCK_LENGTH_M
    }

    /// Convert a length in geometric units (multiples of G M / c^2) to metres.
    pub fn to_m(&self, geometric: f64) -> f64 {
        geometric * self.length_m()
    }

    /// Convert a time in geometric units (multiples of G M / c^3) to seconds.
    pub fn to_s(&self, geometric: f64) -> f64 {
        geometric * self.time_s()
    }

    /// Convert a length in metres to geometric units.
    pub fn from_m(&self, metres: f64) -> f64 {
        metres / self.length_m()
    }
}

/// Split `12.5e-3kg` into (12.5e-3, "kg"): the longest prefix that parses as a number, and the rest.
fn split_number_unit(text: &str) -> Option<(f64, &str)> {
    let t = text.trim();
    let mut best = None;
    for (i, _) in t.char_indices().chain(std::iter::once((t.len(), ' '))) {
        if i == 0 {
            continue;
        }
        if let Ok(v) = t[..i].parse::<f64>() {
            best = Some((v, t[i..].trim()));
        }
    }
    best
}

/// The mass `text` (field `mass`) refused because of `why`.
fn bad_mass(text: &str, why: &str) -> Error {
    let message = phrase![RequestField::Mass, format!(" '{text}': {why}")];
    Error::request(ErrorKind::Input, RequestField::Mass, text, message)
}

/// Parse a mass with its unit: `Msun` (solar masses, IAU 2015 nominal), `kg`, `g`, or `mP` (Planck masses).
/// `1Msun`, `1e30kg`, `2.5e-8kg`, `3 Msun` are all accepted. Returns kilograms.
pub fn parse_mass(text: &str) -> Result<f64> {
    let hint =
        "write a number followed by a unit: Msun (solar masses), kg, g or mP (Planck masses), e.g. 1Msun or 1e30kg";
    let (v, unit) = split_number_unit(text).ok_or_else(|| bad_mass(text, "no number found").with_hint(hint))?;
    let kg = match unit {
        "Msun" | "Msol" | "M_sun" => v * M_SUN_KG,
        "kg" => v,
        "g" => v * 1e-3,
        "mP" => v * PLANCK_MASS_KG,
        "" => return Err(bad_mass(text, "the unit is missing").with_hint(hint)),
        other => return Err(bad_mass(text, &format!("unknown mass unit '{other}'")).with_hint(hint)),
    };
    MassUnit::new(kg).map_err(|e| e.context_phrase(phrase![RequestField::Mass, format!(" '{text}'")]))?;
    Ok(kg)
}

/// A length typed by the user: either in metres (SI, Planck lengths) or in geometric units.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Length {
    /// A physical length in metres (needs a mass unit to compare with geometric lengths).
    Metres(f64),
    /// A length in geometric units (multiples of G M / c^2).
    Geometric(f64),
}

impl Length {
    /// In geometric units, given the mass unit (required for physical lengths).
    pub fn geometric(&self, unit: Option<&MassUnit>) -> Result<f64> {
        match (self, unit) {
            (Length::Geometric(g), _) => Ok(*g),
            (Length::Metres(m), Some(u)) => Ok(u.from_m(*m)),
            (Length::Metres(m), None) => Err(Error::input(format!("a length of {m:e} m needs a mass unit"))
                .with_hint_phrase(phrase![
                    "give ",
                    RequestField::Mass,
                    " (e.g. ",
                    RequestField::Mass,
                    " 1Msun) or a length in geometric units, e.g. 1e-3M"
                ])),
        }
    }
}

/// Parse a length: `lP` (Planck lengths), `m`, `km`, `cm`, or `M` (geometric units G M / c^2).
/// `1lP`, `3km`, `1e-3M`.
pub fn parse_length(text: &str) -> Result<Length> {
    let hint = "write a number followed by a unit: lP (Planck lengths), m, km, cm or M (geometric units), e.g. 1lP";
    let (v, unit) = split_number_unit(text)
        .ok_or_else(|| Error::input(format!("length '{text}': no number found")).with_hint(hint))?;
    if !(v.is_finite() && v > 0.0) {
        return Err(Error::input(format!("length '{text}' must be positive")).with_hint(hint));
    }
    match unit {
        "lP" => Ok(Length::Metres(v * PLANCK_LENGTH_M)),
        "m" => Ok(Length::Metres(v)),
        "km" => Ok(Length::Metres(v * 1e3)),
        "cm" => Ok(Length::Metres(v * 1e-2)),
        "M" => Ok(Length::Geometric(v)),
        "" => Err(Error::input(format!("length '{text}': the unit is missing")).with_hint(hint)),
        other => Err(Error::input(format!("length '{text}': unknown length unit '{other}'")).with_hint(hint)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::ErrorKind;

    #[test]
    fn solar_gravitational_radius() {
        // G M_sun / c^2 = 1476.6 m (IAU 2015 nominal solar mass parameter / c^2; Prsa et al. 2016, AJ 152, 41).
        let u = MassUnit::new(parse_mass("1Msun").unwrap()).unwrap();
        assert!((u.length_m() - 1476.625).abs() < 0.01, "{}", u.length_m());
        // Schwarzschild radius of the Sun about 2.953 km (common practice).
        assert!((2.0 * u.length_m() - 2953.25).abs() < 0.05);
        // Solar mass 1.98841e30 kg from IAU 2015 GM_sun and CODATA 2018 G (the ratio of the two).
        assert!((u.kg() / 1.988_41e30 - 1.0).abs() < 1e-5);
    }

    #[test]
    fn planck_units_are_consistent() {
        // l_P = sqrt(hbar G / c^3) and m_P = sqrt(hbar c / G) (CODATA 2018 values, checked against the
        // definitions to their quoted 6-7 digits).
        let lp = (HBAR_SI * G_SI / C_SI.powi(3)).sqrt();
        assert!((lp / PLANCK_LENGTH_M - 1.0).abs() < 2e-6);
        let mp = (HBAR_SI * C_SI / G_SI).sqrt();
        assert!((mp / PLANCK_MASS_KG - 1.0).abs() < 2e-6);
        // A Planck mass has G m_P / c^2 = l_P (definition).
        let u = MassUnit::new(PLANCK_MASS_KG).unwrap();
        assert!((u.length_planck() - 1.0).abs() < 2e-6);
        assert!((u.time_s() / PLANCK_TIME_S - 1.0).abs() < 2e-6);
    }

    #[test]
    fn parses_masses() {
        assert_eq!(parse_mass("1e30kg").unwrap(), 1e30);
        assert_eq!(parse_mass("2.5e-8kg").unwrap(), 2.5e-8);
        assert_eq!(parse_mass(" 3 g ").unwrap(), 3e-3);
        assert!((parse_mass("2Msun").unwrap() / M_SUN_KG - 2.0).abs() < 1e-15);
        assert!((parse_mass("1mP").unwrap() - PLANCK_MASS_KG).abs() < 1e-20);
    }

    #[test]
    fn bad_mass_units_are_input_errors_with_hints() {
        for bad in ["1Mearth", "kg", "1", "-1kg", "0Msun", "1e400kg", ""] {
            let e = parse_mass(bad).unwrap_err();
            assert_eq!(e.kind, ErrorKind::Input, "{bad}");
            assert!(e.message.contains(&format!("'{bad}'")), "{bad}: {e}");
            assert!(e.hint.is_some(), "{bad}");
        }
    }

    #[test]
    fn parses_lengths() {
        assert_eq!(parse_length("1lP").unwrap(), Length::Metres(PLANCK_LENGTH_M));
        assert_eq!(parse_length("3km").unwrap(), Length::Metres(3000.0));
        assert_eq!(parse_length("1e-3M").unwrap(), Length::Geometric(1e-3));
        let u = MassUnit::new(M_SUN_KG).unwrap();
        let g = parse_length("1476.625m").unwrap().geometric(Some(&u)).unwrap();
        assert!((g - 1.0).abs() < 1e-5);
        assert_eq!(parse_length("2parsec").unwrap_err().kind, ErrorKind::Input);
        assert!(parse_length("1m").unwrap().geometric(None).is_err());
    }
}
