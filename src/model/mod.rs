//! The physics model of a junction, free of the file format: both sides (metric functions, which part is kept,
//! the sign of n^r), the shell kind, the spacetime dimension and the equation of state, with the parameters as
//! names only. Values travel separately as a plain `&[f64]` (or a vector of dual numbers), so that a map or a
//! sweep over a parameter builds the model once and changes only the vector.
//!
//! A `Scenario` (the validated file, with its source text, symbols and provenance) owns one `Model`; every
//! physics function takes `(model, parameter values, options)`.
//!
//! Extension points: a metric side is a [`MetricSide`] (today [`ExprSide`]: A and B typed as expressions), an
//! equation of state an [`EquationOfState`] (today [`ExprLaw`]). A tabulated or numerical metric is one new
//! `MetricSide` impl and one variant of [`Metric`]; the same for a law and [`Eos`].

mod law;
mod side;
mod terms;

pub use law::{Eos, EquationOfState, ExprLaw};
pub use side::{ExprSide, Metric, MetricSide};
pub use terms::{Inadmissible, Keep, ShellKind, Which};

/// One side of the shell as the physics sees it.
#[derive(Debug, Clone)]
pub struct SideModel {
    /// Minus (the normal points away from it) or plus (the normal points into it).
    pub which: Which,
    /// A(r) and B(r).
    pub metric: Metric,
    /// Which part of the spacetime is kept.
    pub keep: Keep,
    /// The sign nu of n^r on this side (`scenario::Side::normal_sign`).
    pub normal_sign: f64,
}

/// A junction model: two sides, the shell, the dimension and the parameter names.
#[derive(Debug, Clone)]
pub struct Model {
    /// Spacetime dimension D >= 4.
    pub dimension: u32,
    /// Timelike or spacelike shell.
    pub kind: ShellKind,
    /// The side the normal points away from.
    pub minus: SideModel,
    /// The side the normal points into.
    pub plus: SideModel,
    /// The equation of state p(sigma), if any.
    pub law: Option<Eos>,
    /// Parameter names, in the order of the value vectors.
    pub names: Vec<String>,
}

/// The part of a junction's geometry that depends on neither the radius nor the parameters: what the formulas
/// of `junction` need besides the two sides' A and B (so that they can run on jets from any evaluator).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Shape {
    /// Timelike or spacelike shell.
    pub kind: ShellKind,
    /// eps = n.n (+1 timelike, -1 spacelike).
    pub eps: f64,
    /// D - 2, the number of angular directions on the shell.
    pub n_ang: f64,
    /// The signs of n^r on [minus, plus].
    pub nu: [f64; 2],
    /// What [minus, plus] keep.
    pub keep: [Keep; 2],
}

impl Model {
    /// The geometry of the junction (kind, eps, D - 2, normal signs, kept parts).
    pub fn shape(&self) -> Shape {
        Shape {
            kind: self.kind,
            eps: self.kind.eps(),
            n_ang: f64::from(self.dimension - 2),
            nu: [self.minus.normal_sign, self.plus.normal_sign],
            keep: [self.minus.keep, self.plus.keep],
        }
    }

    /// The side `which`.
    pub fn side(&self, which: Which) -> &SideModel {
        match which {
            Which::Minus => &self.minus,
            Which::Plus => &self.plus,
        }
    }
}
