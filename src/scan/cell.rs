//! One map cell: its values, its class, and the per-line evaluator.

pub use super::class::CellClass;
use super::fast::{static_coefficients, FastJunction, LineScratch, StaticCoefficients};
use super::grid::{AxisKind, Beta2Source, MapSpec};
use crate::error::Result;
use crate::junction::{EnergyConditions, Junction};
use crate::model::{Model, Which};
use crate::scenario::Scenario;
use crate::statics::continuation::continue_search;
use crate::statics::{search, Stability, StaticSearch, StaticsOptions};
use crate::tolerances::TOL;
use serde::Serialize;

/// One evaluated cell. Numbers that do not exist for the class are NaN (written as empty fields with the
/// class as the reason).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Cell {
    /// x index.
    pub ix: u32,
    /// y index.
    pub iy: u32,
    /// x value.
    pub x: f64,
    /// y value.
    pub y: f64,
    /// sigma0 (NaN if none; for maps without a radius axis: at the static radius that decided the class).
    pub sigma: f64,
    /// p0.
    pub pressure: f64,
    /// The static radius (the radius axis value, or the deciding static radius).
    pub radius: f64,
    /// beta^2 used.
    pub beta2: f64,
    /// V''(a0).
    pub v2: f64,
    /// beta^2 critical (NaN if V'' does not depend on beta^2 or no static shell).
    pub beta2_critical: f64,
    /// Class.
    pub class: CellClass,
    /// Energy conditions as bits: 1 null, 2 weak, 4 strong, 8 dominant.
    pub energy_bits: u8,
    /// Number of static radii (maps without a radius axis), else 1 or 0.
    pub n_static: u8,
    /// Maps without a radius axis: every static radius found, ascending (NaN after the last; at most
    /// [`MAX_ROOTS`] are kept, `n_static` counts all).
    pub roots: [f64; MAX_ROOTS],
    /// The class of each of `roots` (as `CellClass as u8`; unused entries `NoStatic`).
    pub root_classes: [u8; MAX_ROOTS],
}

/// Static radii kept per cell of a map without a radius axis.
pub const MAX_ROOTS: usize = 4;

impl Cell {
    fn empty(ix: usize, iy: usize, x: f64, y: f64, class: CellClass) -> Cell {
        Cell {
            ix: ix as u32,
            iy: iy as u32,
            x,
            y,
            sigma: f64::NAN,
            pressure: f64::NAN,
            radius: f64::NAN,
            beta2: f64::NAN,
            v2: f64::NAN,
            beta2_critical: f64::NAN,
            class,
            energy_bits: 0,
            n_static: 0,
            roots: [f64::NAN; MAX_ROOTS],
            root_classes: [CellClass::NoStatic as u8; MAX_ROOTS],
        }
    }
}

/// Counts per class (and per energy condition among cells with a static shell).
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize, serde::Deserialize)]
pub struct Summary {
    /// All cells.
    pub cells: u64,
    /// Stable.
    pub stable_cells: u64,
    /// Unstable.
    pub unstable_cells: u64,
    /// Marginal.
    pub marginal_cells: u64,
    /// No static shell.
    pub no_static_cells: u64,
    /// Inside a horizon.
    pub inside_horizon_cells: u64,
    /// Cells where the null energy condition holds.
    pub null_energy_cells: u64,
    /// Cells where the weak energy condition holds.
    pub weak_energy_cells: u64,
    /// Cells where the strong energy condition holds.
    pub strong_energy_cells: u64,
    /// Cells where the dominant energy condition holds.
    pub dominant_energy_cells: u64,
}

impl Summary {
    /// Count one cell.
    #[inline]
    pub fn add(&mut self, class: CellClass, bits: u8) {
        self.cells += 1;
        match class {
            CellClass::Stable => self.stable_cells += 1,
            CellClass::Unstable => self.unstable_cells += 1,
            CellClass::Marginal => self.marginal_cells += 1,
            CellClass::NoStatic => self.no_static_cells += 1,
            CellClass::InsideHorizon => self.inside_horizon_cells += 1,
        }
        self.null_energy_cells += u64::from(bits & 1);
        self.weak_energy_cells += u64::from((bits >> 1) & 1);
        self.strong_energy_cells += u64::from((bits >> 2) & 1);
        self.dominant_energy_cells += u64::from((bits >> 3) & 1);
    }

    /// Sum of two summaries.
    pub fn merge(&self, o: &Summary) -> Summary {
        Summary {
            cells: self.cells + o.cells,
            stable_cells: self.stable_cells + o.stable_cells,
            unstable_cells: self.unstable_cells + o.unstable_cells,
            marginal_cells: self.marginal_cells + o.marginal_cells,
            no_static_cells: self.no_static_cells + o.no_static_cells,
            inside_horizon_cells: self.inside_horizon_cells + o.inside_horizon_cells,
            null_energy_cells: self.null_energy_cells + o.null_energy_cells,
            weak_energy_cells: self.weak_energy_cells + o.weak_energy_cells,
            strong_energy_cells: self.strong_energy_cells + o.strong_energy_cells,
            dominant_energy_cells: self.dominant_energy_cells + o.dominant_energy_cells,
        }
    }
}

/// Energy-condition bits.
pub fn energy_bits(ec: EnergyConditions) -> u8 {
    u8::from(ec.null) | u8::from(ec.weak) << 1 | u8::from(ec.strong) << 2 | u8::from(ec.dominant) << 3
}

/// Static values at one radius with one parameter set: (sigma0, p0, c0, c1), or the class that says why not.
/// The generic evaluator: third-order dual-number jets of the sides, then the same
/// [`crate::junction::point::static_coefficients`] as the batched path.
pub(crate) fn static_point(j: &Junction<f64>, a: f64) -> std::result::Result<(f64, f64, f64, f64), CellClass> {
    let jets = [j.jet(Which::Minus, a), j.jet(Which::Plus, a)];
    static_coefficients(&j.shape, a, &jets).map(|c| (c.sigma, c.pressure, c.c0, c.c1))
}

/// Classify V'' = c0 + c1 beta^2 at a static radius a0 with the one marginal rule of statics
/// ([`crate::junction::stability::marginal_scale_of`]: |V''| <= 1e-8 (|c0| + |c1 beta^2| + 1/a0^2) is marginal).
#[inline]
pub fn classify_v2(c0: f64, c1: f64, beta2: f64, a0: f64) -> (f64, CellClass) {
    let v2 = c0 + c1 * beta2;
    let scale = crate::junction::stability::marginal_scale_of(c0, c1 * beta2, a0);
    let class = if v2.abs() <= TOL.stability.marginal * scale {
        CellClass::Marginal
    } else if v2 > 0.0 {
        CellClass::Stable
    } else {
        CellClass::Unstable
    };
    (v2, class)
}

/// Which computation evaluates cells with a radius axis.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Method {
    /// Plain f64: compiled tapes (batched along radius lines) feeding the one static-shell computation
    /// ([`super::fast`], [`crate::junction::point`]; a model whose sides are not expressions takes the generic
    /// jets); on maps over two parameters, static radii continued from the previous cell of the line
    /// ([`crate::statics::continuation`]). The default.
    Fast,
    /// The generic reference: a `Junction` per cell, jets from dual-number evaluation of the sides, then the same
    /// computation; on maps over two parameters, the full static-radius search in every cell.
    Generic,
}

/// Evaluates lines of a map.
pub struct Evaluator<'a> {
    /// The physics of the junction.
    model: &'a Model,
    /// The scenario's parameter values (the axes replace some of them per cell).
    base: &'a [f64],
    spec: &'a MapSpec,
    statics: StaticsOptions,
    /// The batched path's compiled functions (`Method::Fast` on a model given by expressions).
    fast: Option<FastJunction>,
    /// Continue static radii from cell to cell on maps over two parameters (`Method::Fast`).
    continued: bool,
    /// The grid values of the x and y axes, computed once (`grid_value` rounds each to its shortest decimal
    /// form, which costs far more than evaluating a cell on a beta^2 line).
    values: [Vec<f64>; 2],
}

impl<'a> Evaluator<'a> {
    /// Prepare (fast path).
    pub fn new(s: &'a Scenario, spec: &'a MapSpec) -> Result<Evaluator<'a>> {
        Evaluator::with_method(s, spec, Method::Fast)
    }

    /// Prepare with a chosen method (the generic one is the reference the fast one is tested against).
    pub fn with_method(s: &'a Scenario, spec: &'a MapSpec, method: Method) -> Result<Evaluator<'a>> {
        let statics = StaticsOptions {
            roots: crate::roots::RootOptions { samples: 600, ..Default::default() },
            ..Default::default()
        };
        let fast = (method == Method::Fast).then(|| FastJunction::new(&s.model)).flatten();
        let values =
            [(0..spec.x.n).map(|i| spec.x.value(i)).collect(), (0..spec.y.n).map(|i| spec.y.value(i)).collect()];
        Ok(Evaluator {
            model: &s.model,
            base: s.params.values(),
            spec,
            statics,
            fast,
            continued: method == Method::Fast,
            values,
        })
    }

    /// Parameters and radius (NaN if no radius axis) for a point with axis values (x, y).
    fn point(&self, x: f64, y: f64, params: &mut [f64]) -> (f64, f64) {
        let mut radius = f64::NAN;
        let mut beta2 = f64::NAN;
        for (axis, v) in [(&self.spec.x, x), (&self.spec.y, y)] {
            match axis.kind {
                AxisKind::Radius => radius = v,
                AxisKind::Beta2 => beta2 = v,
                AxisKind::Param(k) => params[k] = v,
            }
        }
        (radius, beta2)
    }

    /// All cells of line `i`, in order along the line.
    pub fn line(&self, i: usize) -> Vec<Cell> {
        self.line_with(i, &mut LineScratch::default())
    }

    /// All cells of line `i`, reusing the buffers in `scratch`.
    pub fn line_with(&self, i: usize, scratch: &mut LineScratch) -> Vec<Cell> {
        let mut out = Vec::with_capacity(self.spec.line_len());
        self.for_each_cell(i, scratch, |c| out.push(c));
        out
    }

    /// Count line `i` into `acc`.
    pub fn line_summary(&self, i: usize, acc: &mut Summary) {
        self.line_summary_with(i, acc, &mut LineScratch::default());
    }

    /// Count line `i` into `acc`, reusing the buffers in `scratch` (no per-cell allocation).
    pub fn line_summary_with(&self, i: usize, acc: &mut Summary, scratch: &mut LineScratch) {
        self.for_each_cell(i, scratch, |c| acc.add(c.class, c.energy_bits));
    }

    #[inline]
    fn for_each_cell<F: FnMut(Cell)>(&self, i: usize, scratch: &mut LineScratch, mut emit: F) {
        let spec = self.spec;
        let mut params = std::mem::take(&mut scratch.params);
        params.clear();
        params.extend_from_slice(self.base);
        let n = spec.line_len();
        let xy = |j: usize| {
            let (ix, iy) = spec.cell_index(i, j);
            (ix, iy, self.values[0][ix], self.values[1][iy])
        };
        let beta_axis = spec.x.kind == AxisKind::Beta2 || spec.y.kind == AxisKind::Beta2;
        let along = if spec.lines_are_columns() { spec.y.kind } else { spec.x.kind };
        if beta_axis {
            // One junction evaluation for the whole line; V'' is linear in beta^2.
            let (_, _, x0, y0) = xy(0);
            let (radius, _) = self.point(x0, y0, &mut params);
            let res = match &self.fast {
                Some(f) => static_coefficients(&f.shape, radius, &f.point_jets(radius, &params))
                    .map(|c| (c.sigma, c.pressure, c.c0, c.c1)),
                None => static_point(&Junction::with_params(self.model, params.clone()), radius),
            };
            let bits =
                res.map(|(sigma, p, _, _)| energy_bits(EnergyConditions::evaluate(sigma, p, self.model.dimension)));
            let (axis, other) = if spec.lines_are_columns() { (&self.values[1], x0) } else { (&self.values[0], y0) };
            for (jj, &beta2) in axis.iter().enumerate().take(n) {
                let (ix, iy) = spec.cell_index(i, jj);
                let (x, y) = if spec.lines_are_columns() { (other, beta2) } else { (beta2, other) };
                emit(match (res, bits) {
                    (Ok(v), Ok(b)) => self.radius_cell(ix, iy, x, y, radius, beta2, v, b),
                    (Err(class), _) | (_, Err(class)) => Cell::empty(ix, iy, x, y, class),
                });
            }
        } else if let (Some(f), AxisKind::Radius) = (&self.fast, along) {
            // Parameters fixed along the line: batch the metric functions over all its radii.
            let (_, _, x0, y0) = xy(0);
            self.point(x0, y0, &mut params);
            let (axis, other) = if spec.lines_are_columns() { (&self.values[1], x0) } else { (&self.values[0], y0) };
            scratch.xs.clear();
            scratch.xs.extend_from_slice(&axis[..n]);
            f.eval_line_coefficients(&params, scratch);
            for jj in 0..n {
                let (ix, iy) = spec.cell_index(i, jj);
                let radius = scratch.xs[jj];
                let (x, y) = if spec.lines_are_columns() { (other, radius) } else { (radius, other) };
                emit(self.fast_cell(f, ix, iy, x, y, radius, f.line_result(scratch, jj), &params));
            }
        } else if let Some(f) =
            &self.fast.as_ref().filter(|_| spec.x.kind == AxisKind::Radius || spec.y.kind == AxisKind::Radius)
        {
            // The line runs along a parameter: per point.
            for jj in 0..n {
                let (ix, iy, x, y) = xy(jj);
                let (radius, _) = self.point(x, y, &mut params);
                emit(self.fast_cell(
                    f,
                    ix,
                    iy,
                    x,
                    y,
                    radius,
                    static_coefficients(&f.shape, radius, &f.point_jets(radius, &params)),
                    &params,
                ));
            }
        } else {
            let mut prev = None;
            for jj in 0..n {
                let (ix, iy, x, y) = xy(jj);
                let (radius, _) = self.point(x, y, &mut params);
                if radius.is_nan() {
                    emit(self.statics_cell(ix, iy, (x, y), &params, &mut prev));
                    continue;
                }
                let j = Junction::with_params(self.model, params.clone());
                emit(match static_point(&j, radius) {
                    Ok((sigma, p, c0, c1)) => {
                        let beta2 = match spec.beta2 {
                            Beta2Source::Fixed(b) => b,
                            _ => j.law_and_slope(sigma).map_or(f64::NAN, |(_, b)| b),
                        };
                        let bits = energy_bits(EnergyConditions::evaluate(sigma, p, self.model.dimension));
                        if beta2.is_finite() {
                            self.radius_cell(ix, iy, x, y, radius, beta2, (sigma, p, c0, c1), bits)
                        } else {
                            Cell::empty(ix, iy, x, y, CellClass::NoStatic)
                        }
                    }
                    Err(class) => Cell::empty(ix, iy, x, y, class),
                });
            }
        }
        scratch.params = params;
    }

    /// A cell on the fast path from the jets at its radius.
    #[allow(clippy::too_many_arguments)]
    #[inline]
    fn fast_cell(
        &self,
        f: &FastJunction,
        ix: usize,
        iy: usize,
        x: f64,
        y: f64,
        radius: f64,
        res: std::result::Result<StaticCoefficients, CellClass>,
        params: &[f64],
    ) -> Cell {
        match res {
            Ok(c) => {
                let beta2 = match self.spec.beta2 {
                    Beta2Source::Fixed(b) => b,
                    _ => f.law_slope(c.sigma, params),
                };
                if beta2.is_finite() {
                    let bits = energy_bits(EnergyConditions::evaluate(c.sigma, c.pressure, self.model.dimension));
                    self.radius_cell(ix, iy, x, y, radius, beta2, (c.sigma, c.pressure, c.c0, c.c1), bits)
                } else {
                    Cell::empty(ix, iy, x, y, CellClass::NoStatic)
                }
            }
            Err(class) => Cell::empty(ix, iy, x, y, class),
        }
    }

    /// A cell with a static shell: (sigma, p, c0, c1) at `radius`, classified at `beta2`.
    #[allow(clippy::too_many_arguments)]
    #[inline]
    fn radius_cell(
        &self,
        ix: usize,
        iy: usize,
        x: f64,
        y: f64,
        radius: f64,
        beta2: f64,
        v: (f64, f64, f64, f64),
        bits: u8,
    ) -> Cell {
        let (sigma, p, c0, c1) = v;
        let (v2, class) = classify_v2(c0, c1, beta2, radius);
        let crit = if c1.abs() > TOL.stability.beta2_slope * c0.abs().max(c1.abs()) { -c0 / c1 } else { f64::NAN };
        Cell {
            ix: ix as u32,
            iy: iy as u32,
            x,
            y,
            sigma,
            pressure: p,
            radius,
            beta2,
            v2,
            beta2_critical: crit,
            class,
            energy_bits: bits,
            n_static: 1,
            roots: [f64::NAN; MAX_ROOTS],
            root_classes: [CellClass::NoStatic as u8; MAX_ROOTS],
        }
    }

    /// A cell of a map over two parameters: every static radius in the map's radius range, one picked by the
    /// root rule. `prev` holds the search at the previous cell of the line: on the fast path the search
    /// continues from it (`statics::continuation`), falling back to the full search where the structure changed.
    fn statics_cell(
        &self,
        ix: usize,
        iy: usize,
        (x, y): (f64, f64),
        params: &[f64],
        prev: &mut Option<StaticSearch>,
    ) -> Cell {
        let (lo, hi) = self.spec.radius_range;
        let model = self.model;
        let continued = match (prev.as_ref(), self.continued) {
            (Some(p), true) => continue_search(model, params, p, lo, hi, &self.statics),
            _ => None,
        };
        *prev = continued.or_else(|| search(model, params, lo, hi, &self.statics).ok());
        let Some(rep) = prev.as_ref() else {
            return Cell::empty(ix, iy, x, y, CellClass::NoStatic);
        };
        let pick = match self.spec.root_rule {
            super::RootRule::AnyStable => rep
                .static_radii
                .iter()
                .find(|r| r.stability == Stability::Stable)
                .or_else(|| rep.static_radii.iter().find(|r| r.stability == Stability::Marginal))
                .or_else(|| rep.static_radii.first()),
            super::RootRule::Smallest => rep.static_radii.first(),
            super::RootRule::Largest => rep.static_radii.last(),
        };
        let Some(r) = pick else { return Cell::empty(ix, iy, x, y, CellClass::NoStatic) };
        let class_of = |st: Stability| match st {
            Stability::Stable => CellClass::Stable,
            Stability::Unstable => CellClass::Unstable,
            Stability::Marginal => CellClass::Marginal,
        };
        let class = class_of(r.stability);
        let mut roots = [f64::NAN; MAX_ROOTS];
        let mut root_classes = [CellClass::NoStatic as u8; MAX_ROOTS];
        for (k, sr) in rep.static_radii.iter().take(MAX_ROOTS).enumerate() {
            roots[k] = sr.radius;
            root_classes[k] = class_of(sr.stability) as u8;
        }
        Cell {
            ix: ix as u32,
            iy: iy as u32,
            x,
            y,
            sigma: r.sigma,
            pressure: r.pressure,
            radius: r.radius,
            beta2: r.beta2,
            v2: r.potential_second_derivative,
            beta2_critical: r.beta2_critical.unwrap_or(f64::NAN),
            class,
            energy_bits: energy_bits(r.energy_conditions),
            n_static: rep.static_radii.len().min(255) as u8,
            roots,
            root_classes,
        }
    }
}
