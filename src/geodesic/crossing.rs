//! A free radial test particle (or light ray) crossing the thin shell from the minus side into the plus side.
//!
//! Rule (physics notes; Israel 1966; the induced metric is continuous and the shell's delta-function
//! connection acts only along the normal): the components of the 4-velocity tangent to the shell are kept,
//! the normal component follows from normalisation, and its sign is kept (crossing from minus to plus means
//! u.n > 0 for a timelike shell, n pointing from minus into plus; for a spacelike shell n is future-directed
//! and every future-directed particle crosses from the earlier (minus) to the later (plus) side).
//!
//! Method: on each side at the shell radius R we use the local orthonormal frame of the static observer.
//! In an R-region (A, B > 0): e_0 = A^(-1/2) d_t, e_1 = B^(1/2) d_r. There the particle has frame components
//! (gamma_p, gamma_p v_p) with gamma_p = E/sqrt(A); the shell with dR/dtau = Rdot has
//! U = (W, Rdot)/sqrt(B), W = sqrt(B + Rdot^2), and its unit normal is n = nu (Rdot, W)/sqrt(B), with
//! nu = `Side::normal_sign()` (so n^r = nu W as in the physics notes). Kept: Gamma = -u.U (the relative
//! Lorentz factor); the far side has u = Gamma U + sqrt(Gamma^2 - 1) n (null: omega U + omega n), and
//! E_plus = sqrt(A_plus) u^0. For a static shell this is E_plus = E_minus sqrt(A_plus(R)/A_minus(R)).
//! In a T-region with a spacelike shell (A, B < 0): n = e_0 = nu sqrt(-B) d_r (future-directed), the tangent
//! e_1 = d_t/sqrt(-A); the kept component u.e_1 = -E/sqrt(-A), so E_plus = E_minus sqrt(A_plus/A_minus), and the
//! Lorentz factor relative to the normal observer is -u.n = sqrt(1 + E^2/|A|).

use super::radial::Particle;
use crate::error::{Error, ErrorKind, RequestField, Result};
use crate::metric::SideFns;
use crate::model::{ShellKind, SideModel};
use crate::phrase;
use crate::scenario::Scenario;
use serde::Serialize;

/// The particle's radial direction on the minus side.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Direction {
    /// dr/dtau < 0.
    Inward,
    /// dr/dtau > 0.
    Outward,
}

/// What to cross: where the shell is, how it moves, and the particle on the minus side.
#[derive(Debug, Clone, Copy)]
pub struct CrossingRequest {
    /// Shell radius R at the crossing.
    pub radius: f64,
    /// dR/dtau of a timelike shell at the crossing (0 for a static shell; must be 0 for a spacelike one).
    pub shell_velocity: f64,
    /// Killing energy E = -u_t on the minus side.
    pub energy_minus: f64,
    /// Timelike particle or light ray.
    pub particle: Particle,
    /// Radial direction on the minus side (timelike shell); default: along the normal, i.e. toward the plus side.
    pub direction: Option<Direction>,
}

/// The particle's state at the shell on one side.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SideState {
    /// Killing energy E = -u_t.
    pub energy: f64,
    /// A(R).
    #[serde(rename = "A")]
    pub a: f64,
    /// B(R).
    #[serde(rename = "B")]
    pub b: f64,
    /// Sign of n^r on this side.
    pub normal_sign: f64,
    /// u^r = dr/dtau (or dr/dlambda for light).
    pub radial_velocity: f64,
    /// u.n (positive for a timelike shell, negative for a spacelike one, where n is future-directed).
    pub u_dot_n: f64,
}

/// The outcome of a crossing.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Crossing {
    /// Timelike or spacelike shell.
    pub shell_kind: &'static str,
    /// E on the minus side (as given).
    pub energy_minus: f64,
    /// E on the plus side, if the particle crosses.
    pub energy_plus: Option<f64>,
    /// Relative Lorentz factor: -u.U for a timelike shell, -u.n for a spacelike one (the normal observer),
    /// from the kept tangential component. None for light.
    pub relative_lorentz_factor: Option<f64>,
    /// The same quantity recomputed as -g(u, U) from the plus side's coordinate components (a consistency check).
    pub relative_lorentz_factor_check: Option<f64>,
    /// Energy (per unit mass) or frequency measured by the shell's observer (U, or n for a spacelike shell),
    /// if the particle crosses.
    pub shell_frame_energy: Option<f64>,
    /// True if the particle reaches the shell from the minus side and passes into the plus side.
    pub can_cross: bool,
    /// Why not, when it cannot.
    pub reason: Option<String>,
    /// State on the minus side.
    pub minus: SideState,
    /// State on the plus side (if it crosses).
    pub plus: Option<SideState>,
}

fn side_values(side: &SideModel, params: &[f64], r: f64) -> Result<(f64, f64)> {
    let fns = SideFns::of(side, params);
    let (a, b): (f64, f64) = (fns.a(r), fns.b(r));
    if !(a.is_finite() && b.is_finite()) {
        return Err(Error::numerical(format!("[{}] A or B is not finite at R = {r} (A = {a}, B = {b})", side.which))
            .with_hint("choose a shell radius where both metric functions are defined"));
    }
    if a.abs() < 1e-12 || b.abs() < 1e-12 {
        return Err(Error::numerical(format!(
            "[{}] the shell radius R = {r} is on a horizon (A = {a}, B = {b})",
            side.which
        ))
        .with_hint(
            "a shell on a horizon needs the null-shell formalism (Barrabes & Israel 1991), which is out of scope",
        ));
    }
    Ok((a, b))
}

/// Cross the shell of `scenario` (parameters `params`) as described by `req` (module doc for the method).
/// Input errors: non-finite values, a spacelike shell given a velocity, sides in the wrong kind of region.
/// A particle that cannot cross is not an error: `can_cross = false` with the reason.
pub fn cross(scenario: &Scenario, params: &[f64], req: &CrossingRequest) -> Result<Crossing> {
    let r = req.radius;
    if !(r.is_finite() && r > 0.0) {
        let message = phrase![RequestField::Radius, format!(" {r}: the shell radius must be positive")];
        return Err(Error::request(ErrorKind::Input, RequestField::Radius, r, message));
    }
    if !req.energy_minus.is_finite() || !req.shell_velocity.is_finite() {
        return Err(Error::input("the energy and the shell velocity must be finite numbers"));
    }
    let (am, bm) = side_values(&scenario.model.minus, params, r)?;
    let (ap, bp) = side_values(&scenario.model.plus, params, r)?;
    let (num, nup) = (scenario.minus.normal_sign(), scenario.plus.normal_sign());
    match scenario.shell.kind {
        ShellKind::Timelike => {
            for (w, a, b) in [("minus", am, bm), ("plus", ap, bp)] {
                if a < 0.0 || b < 0.0 {
                    return Err(Error::input(format!(
                        "[{w}] R = {r} lies in a T-region (A = {a}, B = {b}) but the shell is timelike"
                    ))
                    .with_hint("crossings of timelike shells are computed in R-regions; a shell inside a horizon is spacelike (kind = \"spacelike\")"));
                }
            }
            Ok(cross_timelike(req, (am, bm, num), (ap, bp, nup)))
        }
        ShellKind::Spacelike => {
            if req.shell_velocity != 0.0 {
                let (field, v) = (RequestField::ShellVelocity, req.shell_velocity);
                let message = phrase![field, format!(" {v}: a spacelike shell r = R has no radial velocity")];
                return Err(Error::request(ErrorKind::Input, field, v, message).with_hint_phrase(phrase![
                    "drop ",
                    field,
                    " for a spacelike shell"
                ]));
            }
            for (w, a, b) in [("minus", am, bm), ("plus", ap, bp)] {
                if a > 0.0 || b > 0.0 {
                    return Err(Error::input(format!(
                        "[{w}] R = {r} lies in an R-region (A = {a}, B = {b}) but the shell r = R is spacelike"
                    ))
                    .with_hint("a spacelike shell r = R needs a T-region (inside a horizon) on both sides"));
                }
            }
            if req.direction.is_some() {
                return Err(Error::input("a direction was given for a spacelike shell").with_hint_phrase(phrase![
                    "inside a horizon the direction of r is fixed by the future (keep = black-hole/white-hole); drop ",
                    RequestField::Direction
                ]));
            }
            if req.particle == Particle::Null && req.energy_minus == 0.0 {
                return Err(Error::input("a radial light ray inside a horizon needs E != 0 (E = 0 gives k = 0)")
                    .with_hint_phrase(phrase!["give a nonzero ", RequestField::Energy]));
            }
            Ok(cross_spacelike(req, (am, bm, num), (ap, bp, nup)))
        }
    }
}

/// Timelike shell, both sides R-regions at R (module doc: static-observer frames, Gamma = -u.U kept).
fn cross_timelike(req: &CrossingRequest, minus: (f64, f64, f64), plus: (f64, f64, f64)) -> Crossing {
    let (am, bm, num) = minus;
    let (ap, bp, nup) = plus;
    let e = req.energy_minus;
    let rdot = req.shell_velocity;
    let null = req.particle == Particle::Null;
    // Shell 4-velocity and normal in a side's static frame: U = (s0, s1), n = nu (s1, s0).
    let shell = |b: f64| ((b + rdot * rdot).sqrt() / b.sqrt(), rdot / b.sqrt());
    let (s0m, s1m) = shell(bm);
    let state = |energy, a: f64, b: f64, nu, p0: f64, p1: f64, s0: f64, s1: f64| SideState {
        energy,
        a,
        b,
        normal_sign: nu,
        radial_velocity: b.sqrt() * p1,
        u_dot_n: nu * (-p0 * s1 + p1 * s0),
    };
    let fail = |reason: String, st: SideState| Crossing {
        shell_kind: "timelike",
        energy_minus: e,
        energy_plus: None,
        relative_lorentz_factor: None,
        relative_lorentz_factor_check: None,
        shell_frame_energy: None,
        can_cross: false,
        reason: Some(reason),
        minus: st,
        plus: None,
    };
    let blank = SideState { energy: e, a: am, b: bm, normal_sign: num, radial_velocity: 0.0, u_dot_n: 0.0 };
    if e <= 0.0 {
        return fail(
            format!("E = {e} <= 0 in an R-region: the particle would have to move backward in time (u^t = E/A < 0)"),
            blank,
        );
    }
    let p0 = e / am.sqrt();
    let p1_mag = if null { p0 } else { ((e * e - am) / am).max(0.0).sqrt() };
    if !null && e * e < am {
        return fail(format!("E^2 = {} < A_minus(R) = {am}: the particle turns before it reaches R", e * e), blank);
    }
    // Radial direction: requested, else along n^r (toward the plus side), else the other one if only it meets
    // the shell.
    let un = |p1: f64| num * (-p0 * s1m + p1 * s0m);
    let along = if num > 0.0 { p1_mag } else { -p1_mag };
    let p1 = match req.direction {
        Some(Direction::Outward) => p1_mag,
        Some(Direction::Inward) => -p1_mag,
        None if un(along) > 0.0 => along,
        None => -along,
    };
    let st_m = state(e, am, bm, num, p0, p1, s0m, s1m);
    if st_m.u_dot_n <= 0.0 {
        let dir = if p1 >= 0.0 { "outward" } else { "inward" };
        return fail(
            format!("moving {dir}, the particle does not meet the shell from the minus side (u.n = {} <= 0): the shell moves away faster", st_m.u_dot_n),
            st_m,
        );
    }
    // Kept tangential component (Gamma = -u.U) and the normal component from normalisation.
    let gamma = p0 * s0m - p1 * s1m;
    let normal = if null { gamma } else { (gamma * gamma - 1.0).max(0.0).sqrt() };
    let (s0p, s1p) = shell(bp);
    let q0 = gamma * s0p + normal * nup * s1p;
    let q1 = gamma * s1p + normal * nup * s0p;
    let e_plus = ap.sqrt() * q0;
    let st_p = state(e_plus, ap, bp, nup, q0, q1, s0p, s1p);
    // Check: -g(u, U) on the plus side from coordinate components u^t = E/A, u^r, U^t = W/sqrt(AB), U^r = Rdot.
    let w = (bp + rdot * rdot).sqrt();
    let check = ap * (e_plus / ap) * (w / (ap * bp).sqrt()) - st_p.radial_velocity * rdot / bp;
    Crossing {
        shell_kind: "timelike",
        energy_minus: e,
        energy_plus: Some(e_plus),
        relative_lorentz_factor: if null { None } else { Some(gamma) },
        relative_lorentz_factor_check: if null { None } else { Some(check) },
        shell_frame_energy: Some(gamma),
        can_cross: true,
        reason: None,
        minus: st_m,
        plus: Some(st_p),
    }
}

/// Spacelike shell r = R in T-regions (module doc: the kept component is u.e_t = -E/sqrt(-A)).
fn cross_spacelike(req: &CrossingRequest, minus: (f64, f64, f64), plus: (f64, f64, f64)) -> Crossing {
    let (am, bm, num) = minus;
    let (ap, bp, nup) = plus;
    let e = req.energy_minus;
    let null = req.particle == Particle::Null;
    let tangential = -e / (-am).sqrt();
    let normal = if null { tangential.abs() } else { (1.0 + tangential * tangential).sqrt() };
    // u^r = nu sqrt((B/A)(E^2 - A)): future-directed means dr has the sign of n^r inside a T-region.
    let ur = |energy: f64, a: f64, b: f64, nu: f64| {
        let extra = if null { 0.0 } else { -a };
        nu * ((b / a) * (energy * energy + extra)).sqrt()
    };
    let e_plus = -tangential * (-ap).sqrt();
    let urm = ur(e, am, bm, num);
    let urp = ur(e_plus, ap, bp, nup);
    // -u.n with n_r = -nu/sqrt(-B): -u.n = nu u^r / sqrt(-B).
    let check = nup * urp / (-bp).sqrt();
    let side = |energy, a, b, nu, radial_velocity| SideState {
        energy,
        a,
        b,
        normal_sign: nu,
        radial_velocity,
        u_dot_n: -normal,
    };
    Crossing {
        shell_kind: "spacelike",
        energy_minus: e,
        energy_plus: Some(e_plus),
        relative_lorentz_factor: if null { None } else { Some(normal) },
        relative_lorentz_factor_check: if null { None } else { Some(check) },
        shell_frame_energy: Some(normal),
        can_cross: true,
        reason: None,
        minus: side(e, am, bm, num, urm),
        plus: Some(side(e_plus, ap, bp, nup, urp)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scenario(minus_a: &str, minus_keep: &str, plus_a: &str, plus_keep: &str, kind: &str) -> Scenario {
        let text = format!(
            "name = \"t\"\n[parameters]\nm = 1.0\nlambda = 0.9\n[minus]\nA = \"{minus_a}\"\nkeep = \"{minus_keep}\"\n[plus]\nA = \"{plus_a}\"\nkeep = \"{plus_keep}\"\n[shell]\nkind = \"{kind}\"\n"
        );
        Scenario::parse(&text, None).unwrap()
    }

    fn req(radius: f64, v: f64, e: f64, particle: Particle) -> CrossingRequest {
        CrossingRequest { radius, shell_velocity: v, energy_minus: e, particle, direction: None }
    }

    #[test]
    fn same_metric_on_both_sides_keeps_the_energy() {
        // Common practice: with no jump in the metric the shell is invisible to the particle.
        let s = scenario("1 - 2*m/r", "inner", "1 - 2*m/r", "outer", "timelike");
        let p = s.params.values().to_vec();
        for (v, e, part) in [
            (0.0, 0.95, Particle::Timelike),
            (0.3, 0.95, Particle::Timelike),
            (-0.4, 1.3, Particle::Timelike),
            (0.2, 0.7, Particle::Null),
        ] {
            let c = cross(&s, &p, &req(4.0, v, e, part)).unwrap();
            assert!(c.can_cross, "{c:?}");
            assert!((c.energy_plus.unwrap() - e).abs() < 1e-14, "{c:?}");
            let (m, pl) = (c.minus, c.plus.unwrap());
            assert!((m.radial_velocity - pl.radial_velocity).abs() < 1e-14);
        }
    }

    #[test]
    fn static_shell_energy_ratio_is_sqrt_of_a_ratio() {
        // Physics notes / common practice: E_plus = E_minus sqrt(A_plus(R)/A_minus(R)) for a static shell,
        // for particles and (gravitational redshift) for light.
        let s = scenario("1", "inner", "1 - 2*m/r", "outer", "timelike");
        let p = s.params.values().to_vec();
        for part in [Particle::Timelike, Particle::Null] {
            let c = cross(&s, &p, &req(5.0, 0.0, 1.2, part)).unwrap();
            let expect = 1.2 * (1.0f64 - 2.0 / 5.0).sqrt();
            assert!((c.energy_plus.unwrap() - expect).abs() < 1e-14, "{c:?}");
            assert!(c.minus.radial_velocity > 0.0, "flat interior keeps r < R: the particle moves outward");
        }
    }

    #[test]
    fn relative_lorentz_factor_two_ways_and_velocity_composition() {
        // Kept -u.U (tangential) vs -g(u, U) rebuilt from the plus side's coordinate components; and the special
        // relativistic composition gamma = gamma_p gamma_s (1 - v_p v_s) in the static frame (common practice).
        let s = scenario("1 - 2*m/r", "inner", "1 - 2*m*lambda/r", "outer", "timelike");
        let p = s.params.values().to_vec();
        for (r, v, e) in [(5.0, 0.3, 0.9), (3.0, -0.7, 1.1), (8.0, 0.5, 1.3)] {
            let c = cross(&s, &p, &req(r, v, e, Particle::Timelike)).unwrap();
            assert!(c.can_cross, "{c:?}");
            let g = c.relative_lorentz_factor.unwrap();
            assert!((g - c.relative_lorentz_factor_check.unwrap()).abs() < 1e-12 * g, "{c:?}");
            let am = 1.0 - 2.0 / r;
            let gp = e / am.sqrt();
            let vp = c.minus.radial_velocity / am.sqrt() / gp;
            let w = (am + v * v).sqrt();
            let (gs, vs) = (w / am.sqrt(), v / w);
            assert!((g - gp * gs * (1.0 - vp * vs)).abs() < 1e-12 * g, "{g} vs composition");
        }
    }

    #[test]
    fn refusals_say_why() {
        let s = scenario("1", "inner", "1 - 2*m/r", "outer", "timelike");
        let p = s.params.values().to_vec();
        let c = cross(&s, &p, &req(5.0, 0.0, -0.5, Particle::Timelike)).unwrap();
        assert!(!c.can_cross && c.reason.unwrap().contains("backward in time"));
        let c = cross(&s, &p, &req(5.0, 0.0, 0.9, Particle::Timelike)).unwrap();
        assert!(!c.can_cross && c.reason.unwrap().contains("turns before"));
        // The shell recedes outward at Rdot = 5 (v = 0.98 locally) from a slow outgoing particle.
        let mut rq = req(5.0, 5.0, 1.01, Particle::Timelike);
        rq.direction = Some(Direction::Outward);
        let c = cross(&s, &p, &rq).unwrap();
        assert!(!c.can_cross && c.reason.clone().unwrap().contains("moves away"), "{c:?}");
    }

    #[test]
    fn horizon_and_wrong_region_are_errors() {
        let s = scenario("1 - 2*m/r", "inner", "1 - 2*m/r", "outer", "timelike");
        let p = s.params.values().to_vec();
        let e = cross(&s, &p, &req(2.0, 0.0, 0.9, Particle::Timelike)).unwrap_err();
        assert!(e.message.contains("horizon"), "{e}");
        let e = cross(&s, &p, &req(1.0, 0.0, 0.9, Particle::Timelike)).unwrap_err();
        assert!(e.message.contains("T-region"), "{e}");
    }

    #[test]
    fn spacelike_bounce_keeps_the_t_component() {
        // Black-hole interior of mass m into a white-hole interior of mass lambda m at r = R: the kept component
        // u.e_t = -E/sqrt(-A) gives E_plus^2 = E_minus^2 (2 lambda m/R - 1)/(2m/R - 1) (module doc).
        let s = scenario("1 - 2*m/r", "black-hole", "1 - 2*m*lambda/r", "white-hole", "spacelike");
        let p = s.params.values().to_vec();
        let c = cross(&s, &p, &req(1.0, 0.0, 0.9, Particle::Timelike)).unwrap();
        let expect = 0.9 * ((1.8f64 - 1.0) / (2.0 - 1.0)).sqrt();
        assert!((c.energy_plus.unwrap() - expect).abs() < 1e-14, "{c:?}");
        let g = c.relative_lorentz_factor.unwrap();
        assert!((g - c.relative_lorentz_factor_check.unwrap()).abs() < 1e-13 * g);
        assert!(c.minus.radial_velocity < 0.0 && c.plus.unwrap().radial_velocity > 0.0);
        let e = cross(&s, &p, &req(1.0, 0.2, 0.9, Particle::Timelike)).unwrap_err();
        assert!(e.message.contains("no radial velocity"));
    }
}
