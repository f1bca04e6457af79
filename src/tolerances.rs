//! Every decision threshold of junctura, named, in one tree. [`Tolerances::DEFAULT`] (also [`TOL`]) is what every
//! command uses: the options structs (`statics::StaticsOptions`, `roots::RootOptions`) take their defaults from
//! it, and code that decides without an options struct (the admissibility rule, the marginal rule of maps and
//! evolve, the motion's turning points) reads the same named field. A threshold is written here and nowhere
//! else, so `statics`, `derive`, `map` and `evolve` cannot drift apart on the same point.
//!
//! All values are relative and dimensionless; each field says what it is compared with. They are choices of
//! this project (`common practice` for floating-point work in double precision: thresholds a few orders of
//! magnitude above the rounding of the quantities they test), not physical constants.

use serde::Serialize;

/// The whole tree.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Tolerances {
    /// Horizons: when a radius is on one, near one, and when two roots are one.
    pub horizon: HorizonTolerances,
    /// Linear stability: when V''(a0) is zero, when it does not depend on beta^2.
    pub stability: StabilityTolerances,
    /// Static radii: search intervals, identically satisfied laws, poles.
    pub statics: StaticsTolerances,
    /// Root finding (the defaults of `roots::RootOptions`).
    pub roots: RootTolerances,
    /// Shell motion (`evolve`).
    pub motion: MotionTolerances,
}

/// Horizon thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HorizonTolerances {
    /// |B| <= on_horizon (1 + r |B'|): the radius is numerically on a horizon; no static shell sits there
    /// (`junction::admissible::near_horizon`, the one horizon-distance test).
    pub on_horizon: f64,
    /// |B| <= near_warning (1 + r |B'|): results are flagged as ill-conditioned (they grow like 1/sqrt(B)).
    pub near_warning: f64,
    /// Companion-matrix eigenvalues closer than this, relative to their size, are one root of higher
    /// multiplicity; an imaginary part or a Newton correction above it means no real root (`rational`).
    pub root_cluster: f64,
}

/// Stability thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StabilityTolerances {
    /// |V''(a0)| <= marginal (|c0| + |c1 beta^2| + 1/a0^2): marginal, the linear test does not decide
    /// (`junction::stability::marginal_scale`; statics, tuning, sweeps, maps, evolve).
    pub marginal: f64,
    /// |c1| <= beta2_slope max(|c0|, |c1|): V'' does not depend on beta^2 (no critical beta^2).
    pub beta2_slope: f64,
}

/// Static-radius search thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StaticsTolerances {
    /// Horizons are cut out of the search interval by this relative margin.
    pub horizon_margin: f64,
    /// |p0 - P(sigma0)| below this, relative to the size of the terms it is made of, counts as zero (a law whose
    /// static condition holds identically).
    pub identically_static: f64,
    /// Relative width to which a pole predicted from a neighbouring map cell is bracketed.
    pub pole_width: f64,
    /// |p0 - P(sigma0)| <= law_residual (|p0| + |sigma0|): the law holds at the radius, which is a static radius
    /// of it (`statics::law_holds`; evolve's static starts, derive's warning).
    pub law_residual: f64,
}

/// Root-finding thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RootTolerances {
    /// Relative tolerance on a root's position.
    pub x_rel: f64,
    /// A converged point with |f| larger than this times the typical |f| is a pole, not a root.
    pub pole_ratio: f64,
    /// Relative |f| below which a tangent point counts as a double root.
    pub double_root: f64,
}

/// Shell-motion thresholds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MotionTolerances {
    /// Relative distance within which a requested radius that is not static moves to the nearby static radius.
    pub snap_to_static: f64,
    /// |V(R, sigma)| below this, relative to 1 + |B_minus| + |B_plus|: a turning point.
    pub turning_point: f64,
}

impl Tolerances {
    /// The values every command uses.
    pub const DEFAULT: Tolerances = Tolerances {
        horizon: HorizonTolerances { on_horizon: 1e-9, near_warning: 1e-6, root_cluster: 1e-5 },
        stability: StabilityTolerances { marginal: 1e-8, beta2_slope: 1e-12 },
        statics: StaticsTolerances {
            horizon_margin: 1e-10,
            identically_static: 1e-10,
            pole_width: 1e-7,
            law_residual: 1e-9,
        },
        roots: RootTolerances { x_rel: 1e-14, pole_ratio: 1e3, double_root: 1e-9 },
        motion: MotionTolerances { snap_to_static: 1e-3, turning_point: 1e-12 },
    };
}

impl Default for Tolerances {
    fn default() -> Self {
        Tolerances::DEFAULT
    }
}

/// [`Tolerances::DEFAULT`], short.
pub const TOL: Tolerances = Tolerances::DEFAULT;
