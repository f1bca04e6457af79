//! The stability class of a map cell (shared by the generic and the fast evaluator).

use crate::junction::admissible;
use serde::Serialize;

/// Stability class of a cell.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
#[repr(u8)]
pub enum CellClass {
    /// V''(a0) > 0.
    Stable = 0,
    /// V''(a0) < 0.
    Unstable = 1,
    /// V''(a0) = 0 within tolerance.
    Marginal = 2,
    /// No static shell (the junction values do not exist there, or the law has no static radius).
    NoStatic = 3,
    /// The radius is inside (or on) a horizon of a side: no static timelike shell.
    InsideHorizon = 4,
}

impl CellClass {
    /// The class of a point the admissibility rule refuses: on a horizon or in a region where no static
    /// timelike shell (or none with the side's `keep`) can sit is `InsideHorizon`; the rest `NoStatic`.
    pub fn refused(why: admissible::Inadmissible) -> CellClass {
        use admissible::Inadmissible as I;
        match why {
            I::OnHorizon { .. } | I::WrongRegion { .. } => CellClass::InsideHorizon,
            I::KeepContradicts { b, .. } if b <= 0.0 => CellClass::InsideHorizon,
            _ => CellClass::NoStatic,
        }
    }

    /// Every class, in index order.
    pub const ALL: [CellClass; 5] =
        [CellClass::Stable, CellClass::Unstable, CellClass::Marginal, CellClass::NoStatic, CellClass::InsideHorizon];

    /// The word used in data files.
    pub fn name(self) -> &'static str {
        match self {
            CellClass::Stable => "stable",
            CellClass::Unstable => "unstable",
            CellClass::Marginal => "marginal",
            CellClass::NoStatic => "no_static_shell",
            CellClass::InsideHorizon => "inside_horizon",
        }
    }
}
