//! The words every layer shares about a junction: which side, which part of it is kept, the kind of shell, and
//! why a shell cannot sit at a radius (the outcome of the admissibility rule in `junction::admissible`). Plain
//! data with names and messages; nothing here depends on the rest of the crate but the tolerances it quotes.

use crate::tolerances::TOL;
use std::fmt;

/// Which side of the shell.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Which {
    /// The side the normal points away from.
    Minus,
    /// The side the normal points into.
    Plus,
}

impl Which {
    /// `minus` or `plus`.
    pub fn name(self) -> &'static str {
        match self {
            Which::Minus => "minus",
            Which::Plus => "plus",
        }
    }
}

impl fmt::Display for Which {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Which part of a side's spacetime is kept.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Keep {
    /// Keeps r < R (R-region).
    Inner,
    /// Keeps r > R (R-region).
    Outer,
    /// A T-region in which r decreases toward the future.
    BlackHole,
    /// A T-region in which r increases toward the future.
    WhiteHole,
}

impl Keep {
    /// The word used in scenario files.
    pub fn name(self) -> &'static str {
        match self {
            Keep::Inner => "inner",
            Keep::Outer => "outer",
            Keep::BlackHole => "black-hole",
            Keep::WhiteHole => "white-hole",
        }
    }

    /// True for `inner`/`outer` (the shell sits where B > 0).
    pub fn is_r_region(self) -> bool {
        matches!(self, Keep::Inner | Keep::Outer)
    }
}

/// Timelike (a moving or static membrane) or spacelike (a transition surface) shell.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ShellKind {
    /// Unit normal spacelike, n.n = +1.
    Timelike,
    /// Unit normal timelike, n.n = -1.
    Spacelike,
}

impl ShellKind {
    /// eps = n.n.
    pub fn eps(self) -> f64 {
        match self {
            ShellKind::Timelike => 1.0,
            ShellKind::Spacelike => -1.0,
        }
    }

    /// The word used in scenario files.
    pub fn name(self) -> &'static str {
        match self {
            ShellKind::Timelike => "timelike",
            ShellKind::Spacelike => "spacelike",
        }
    }
}

/// Why a shell cannot sit at a radius.
#[derive(Debug, Clone, Copy, PartialEq)]
#[non_exhaustive]
pub enum Inadmissible {
    /// A, B or B' of a side is not finite there.
    NotFinite {
        /// The side.
        side: Which,
    },
    /// The radius is within the horizon tolerance of a zero of B.
    OnHorizon {
        /// The side.
        side: Which,
        /// B there.
        b: f64,
    },
    /// A and B have opposite signs (or A = 0 where B is not): the metric changes signature.
    Signature {
        /// The side.
        side: Which,
        /// A there.
        a: f64,
        /// B there.
        b: f64,
    },
    /// B has the wrong sign for the shell kind (a timelike shell in a T-region, a spacelike one in an R-region).
    WrongRegion {
        /// The side.
        side: Which,
        /// B there.
        b: f64,
        /// The shell kind.
        kind: ShellKind,
    },
    /// B has the sign the kind needs, but not the one the side's `keep` names.
    KeepContradicts {
        /// The side.
        side: Which,
        /// B there.
        b: f64,
        /// What the side keeps.
        keep: Keep,
    },
}

impl Inadmissible {
    /// The side the reason refers to.
    pub fn side(&self) -> Which {
        match *self {
            Inadmissible::NotFinite { side }
            | Inadmissible::OnHorizon { side, .. }
            | Inadmissible::Signature { side, .. }
            | Inadmissible::WrongRegion { side, .. }
            | Inadmissible::KeepContradicts { side, .. } => side,
        }
    }

    /// A hint for the reader.
    pub fn hint(&self) -> &'static str {
        match self {
            Inadmissible::NotFinite { .. } => {
                "A or B is singular or undefined there (a division by zero, or log/sqrt of a negative number); choose another radius"
            }
            Inadmissible::OnHorizon { .. } => {
                "the junction formulas divide by sqrt(B) and fail on a horizon (a shell there is a null shell, outside this tool's scope); move the radius off the horizon"
            }
            Inadmissible::Signature { .. } => "check A and B: their zeros should coincide",
            Inadmissible::WrongRegion { kind: ShellKind::Timelike, .. } => {
                "choose a radius outside the horizons (see `junctura check`), or make the shell spacelike with [shell] kind = \"spacelike\""
            }
            Inadmissible::WrongRegion { .. } => {
                "a static spacelike shell sits inside a horizon (T-region); choose a radius where B < 0"
            }
            Inadmissible::KeepContradicts { keep, .. } if keep.is_r_region() => {
                "inside a horizon use keep = \"black-hole\" or \"white-hole\""
            }
            Inadmissible::KeepContradicts { .. } => {
                "use keep = \"inner\" or \"outer\" for a side whose shell radius is outside its horizons"
            }
        }
    }
}

impl fmt::Display for Inadmissible {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Inadmissible::NotFinite { side } => write!(f, "A, B or B' of the {side} side is not finite there"),
            Inadmissible::OnHorizon { side, b } => write!(
                f,
                "it is on (or numerically within {:.0e} of) a horizon of the {side} side: B = {b:e}",
                TOL.horizon.on_horizon
            ),
            Inadmissible::Signature { side, a, b } => write!(
                f,
                "on the {side} side A = {a:.6e} and B = {b:.6e} have opposite signs; the metric changes signature there"
            ),
            Inadmissible::WrongRegion { side, b, kind: ShellKind::Timelike } => write!(
                f,
                "the {side} side has B = {b:.6e} < 0 here (a T-region), so r = const is spacelike: no static timelike shell can sit here"
            ),
            Inadmissible::WrongRegion { side, b, .. } => write!(
                f,
                "the {side} side has B = {b:.6e} > 0 here (an R-region), so r = const is timelike: no static spacelike shell can sit here"
            ),
            Inadmissible::KeepContradicts { side, b, keep } if keep.is_r_region() => write!(
                f,
                "the {side} side keeps \"{}\" (an R-region) but B = {b:.6e} < 0 there (a T-region)",
                keep.name()
            ),
            Inadmissible::KeepContradicts { side, b, keep } => write!(
                f,
                "the {side} side keeps \"{}\" (a T-region) but B = {b:.6e} > 0 there (an R-region)",
                keep.name()
            ),
        }
    }
}
