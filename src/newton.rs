//! Newton's method on two equations in two unknowns, F(x) = 0, for the marginal configurations (`statics::tune`)
//! and the corrector of the branch continuation (`statics::sweep`).
//!
//! Method (common practice; Press et al., Numerical Recipes, 3rd ed., 2007, sec. 9.6 and 9.7): at x solve
//! J(x) d = -F(x) with nalgebra's LU decomposition (partial pivoting), then take x + t d with t = 1, 1/2, 1/4, ...
//! the first step length whose point the caller accepts (for example, one that stays where F is defined).
//! The caller supplies F and its exact Jacobian (from dual numbers). Failure is data: the outcome says whether
//! the iteration converged, stalled, met a non-finite value or ran out of iterations.

use nalgebra::{Matrix2, Vector2};

/// When a Newton step is small enough to stop.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum StepTolerance {
    /// Every component of the step taken is at most this times max(|x_i|, 1), x the new point.
    Relative(f64),
    /// The sum of the absolute components of the step taken is below this.
    AbsoluteSum(f64),
}

/// Tolerances and limits of [`solve`], in one place.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NewtonOptions {
    /// Newton steps at most.
    pub max_iterations: usize,
    /// Step lengths tried per step (1, 1/2, 1/4, ...); 1 means the full step only.
    pub damping_tries: usize,
    /// When to stop.
    pub tolerance: StepTolerance,
}

/// How the iteration ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Termination {
    /// The last step met the tolerance after this many steps.
    Converged {
        /// Steps taken.
        iterations: usize,
    },
    /// The Jacobian was singular, or the caller accepted no point along the step.
    Stalled,
    /// F could not be evaluated or was not finite, or the step was not finite.
    NotFinite,
    /// The step limit was reached before the tolerance was met.
    MaxIterations,
}

/// The last point reached and how the iteration ended there.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Outcome {
    /// The last accepted point (the start if no step was accepted).
    pub x: [f64; 2],
    /// Why the iteration stopped.
    pub termination: Termination,
}

/// Newton's method from `x0`: `system(x)` returns F(x) and its Jacobian J\[i\]\[j\] = dF_i/dx_j (None where F is not
/// defined); `accept(x)` says whether a trial point may be taken.
pub fn solve<F, A>(mut system: F, mut accept: A, x0: [f64; 2], opts: &NewtonOptions) -> Outcome
where
    F: FnMut([f64; 2]) -> Option<([f64; 2], [[f64; 2]; 2])>,
    A: FnMut([f64; 2]) -> bool,
{
    let mut x = x0;
    let end = |x, termination| Outcome { x, termination };
    for it in 0..opts.max_iterations {
        let Some((f, j)) = system(x) else { return end(x, Termination::NotFinite) };
        if !f.iter().chain(j.iter().flatten()).all(|v| v.is_finite()) {
            return end(x, Termination::NotFinite);
        }
        let jac = Matrix2::new(j[0][0], j[0][1], j[1][0], j[1][1]);
        let Some(step) = jac.lu().solve(&Vector2::new(-f[0], -f[1])) else { return end(x, Termination::Stalled) };
        if !step.iter().all(|v| v.is_finite()) {
            return end(x, Termination::NotFinite);
        }
        let mut t = 1.0;
        let mut taken = None;
        for _ in 0..opts.damping_tries {
            let trial = [x[0] + t * step[0], x[1] + t * step[1]];
            if accept(trial) {
                taken = Some([t * step[0], t * step[1]]);
                x = trial;
                break;
            }
            t *= 0.5;
        }
        let Some(d) = taken else { return end(x, Termination::Stalled) };
        let small = match opts.tolerance {
            StepTolerance::Relative(tol) => (0..2).all(|i| d[i].abs() <= tol * x[i].abs().max(1.0)),
            StepTolerance::AbsoluteSum(tol) => d[0].abs() + d[1].abs() < tol,
        };
        if small {
            return end(x, Termination::Converged { iterations: it + 1 });
        }
    }
    end(x, Termination::MaxIterations)
}

#[cfg(test)]
mod tests {
    use super::*;

    const OPTS: NewtonOptions =
        NewtonOptions { max_iterations: 50, damping_tries: 30, tolerance: StepTolerance::Relative(1e-14) };

    /// x^2 + y^2 = 4 and x = y: the root (sqrt 2, sqrt 2) (common practice: the circle meets the diagonal).
    fn circle(x: [f64; 2]) -> Option<([f64; 2], [[f64; 2]; 2])> {
        Some(([x[0] * x[0] + x[1] * x[1] - 4.0, x[0] - x[1]], [[2.0 * x[0], 2.0 * x[1]], [1.0, -1.0]]))
    }

    #[test]
    fn converges_to_the_root_of_a_regular_system() {
        let out = solve(circle, |_| true, [1.0, 0.5], &OPTS);
        assert!(matches!(out.termination, Termination::Converged { iterations } if iterations < 10), "{out:?}");
        assert!((out.x[0] - 2f64.sqrt()).abs() < 1e-15 && (out.x[1] - 2f64.sqrt()).abs() < 1e-15);
    }

    #[test]
    fn damping_keeps_the_iterate_where_the_caller_accepts_it() {
        // From (3, 0.2) the full step lands at x = 1.9..; refusing x < 2.5 forces halved steps, then a stall once
        // no acceptable point along the step is left.
        let mut seen = Vec::new();
        let out = solve(
            circle,
            |x| {
                seen.push(x[0]);
                x[0] >= 2.5
            },
            [3.0, 0.2],
            &OPTS,
        );
        assert_eq!(out.termination, Termination::Stalled);
        assert!(out.x[0] >= 2.5 && seen.iter().any(|&x| x < 2.5));
    }

    #[test]
    fn singular_jacobian_stalls_and_undefined_system_is_not_finite() {
        let singular = |_: [f64; 2]| Some(([1.0, 1.0], [[1.0, 2.0], [2.0, 4.0]]));
        assert_eq!(solve(singular, |_| true, [0.0, 0.0], &OPTS).termination, Termination::Stalled);
        let undefined = |x: [f64; 2]| if x[0] > 1.2 { None } else { circle(x) };
        assert_eq!(solve(undefined, |_| true, [3.0, 0.2], &OPTS).termination, Termination::NotFinite);
        let nan = |_: [f64; 2]| Some(([f64::NAN, 0.0], [[1.0, 0.0], [0.0, 1.0]]));
        assert_eq!(solve(nan, |_| true, [0.0, 0.0], &OPTS).termination, Termination::NotFinite);
    }

    #[test]
    fn step_limit_is_reported() {
        let two = NewtonOptions { max_iterations: 2, ..OPTS };
        assert_eq!(solve(circle, |_| true, [100.0, -50.0], &two).termination, Termination::MaxIterations);
        let sum = NewtonOptions { tolerance: StepTolerance::AbsoluteSum(1e-13), ..OPTS };
        assert!(matches!(solve(circle, |_| true, [1.0, 0.5], &sum).termination, Termination::Converged { .. }));
    }
}
