#!/usr/bin/env python3
"""Independent reference values for the motion of thin shells through horizons (golden values for
tests/shell_motion.rs).

Re-run from the repository root (needs SymPy and mpmath, tests/reference/requirements.txt):
    python3 tests/reference/shell_motion_reference.py
This rewrites tests/reference/shell_motion_golden.json. The Rust tests only read the committed JSON.

Nothing here uses junctura's formulas. Each case starts from a published first integral of the motion, solved
with SymPy for Rdot^2 = F(R); proper times are quadratures tau = int dR / sqrt(F(R)) with mpmath (tanh-sinh,
which handles the inverse-square-root singularity at a turning point), at 40 significant digits.

1. Dust shell, flat inside, Schwarzschild mass M outside (Israel 1966, Nuovo Cimento B 44, 1; Poisson 2004,
   A Relativist's Toolkit, sec. 3.9):  M = m sqrt(1 + Rdot^2) - m^2/(2R), rest mass m constant (m = 4 pi R^2 sigma).
   Released from rest at R0: m from M = m - m^2/(2 R0) (the root m < R0); tau to the horizon R = 2M and to R = 0.
   The exterior normal n^r = sqrt(1 + Rdot^2) - m/R (flat interior: n^r_minus = sqrt(1 + Rdot^2)) passes through
   zero at R = m^2/(2M).
2. Charged dust shell, flat inside, Reissner-Nordstrom (M, Q) outside (the same first integral with the
   electrostatic energy: M = m sqrt(1 + Rdot^2) - m^2/(2R) + Q^2/(2R); e.g. Boulware 1973, Phys. Rev. D 8, 2363,
   from memory). With m < Q < M the shell coming in from R0 bounces at Rdot = 0 inside the inner horizon and
   re-expands; tau to r_+, r_- and the bounce.
3. Domain wall (p = -sigma, sigma constant) between a de Sitter interior B_- = 1 - Lin r^2/3 and a
   Schwarzschild-de Sitter exterior B_+ = 1 - 2M/r - Lout r^2/3 (Blau, Guendelman & Guth 1987, Phys. Rev. D 35,
   1747, sec. II: beta_- - beta_+ = kappa R with beta_i = sqrt(Rdot^2 + B_i) up to sign and kappa = 4 pi sigma), so
   beta_- = (B_- - B_+ + kappa^2 R^2)/(2 kappa R) and Rdot^2 = beta_-^2 - B_-. Started at R0 moving inward it turns
   at the largest root R_min < R0 of Rdot^2 = 0 and expands through the exterior cosmological horizon and the
   interior de Sitter horizon sqrt(3/Lin).
"""
import json
import os
import sys

import mpmath as mp
import sympy as sp

sys.dont_write_bytecode = True
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "shell_motion_golden.json")
mp.mp.dps = 40

R, Rd, m, M, Q = sp.symbols("R Rdot m M Q", positive=True)


def rdot_squared(energy_equation):
    """Solve an energy equation for u = sqrt(1 + Rdot^2) (SymPy), returning (u(R), F(R)) with Rdot^2 = F."""
    u = sp.symbols("u", positive=True)
    sol = sp.solve(energy_equation.subs(sp.sqrt(1 + Rd**2), u), u)
    assert len(sol) == 1, sol
    return sol[0], sp.simplify(sol[0] ** 2 - 1)


def tau_between(f, a, b):
    """Proper time between radii a < b: int_a^b dR / sqrt(F(R)). F >= 0 on [a, b] analytically; |F| guards
    against a rounding-level negative value next to a turning point, where F vanishes."""
    return mp.quad(lambda r: 1 / mp.sqrt(abs(f(r))), [a, b])


def dust():
    energy = sp.Eq(M, m * sp.sqrt(1 + Rd**2) - m**2 / (2 * R))
    _, F = rdot_squared(energy)
    cases = []
    for r0 in ["10", "6"]:
        r0m, mm = mp.mpf(r0), mp.mpf(1)
        # At rest: M = m - m^2/(2 R0), the root with m < R0.
        msym = sp.solve(sp.Eq(M, m - m**2 / (2 * R)).subs({M: 1, R: sp.Rational(r0)}), m)
        mval = min(mp.mpf(sp.N(x, 50)) for x in msym)
        f = sp.lambdify(R, F.subs({M: 1, m: sp.Float(str(mval), 45)}), "mpmath")
        cases.append(
            {
                "mass_M": 1.0,
                "start_radius": float(r0m),
                "rest_mass_m": float(mval),
                "sigma_start": float(mval / (4 * mp.pi * r0m**2)),
                "tau_to_horizon": float(tau_between(f, 2 * mm, r0m)),
                "tau_to_center": float(tau_between(f, 0, r0m)),
                "normal_flip_radius": float(mval**2 / (2 * mm)),
            }
        )
    return cases


def charged():
    energy = sp.Eq(M, m * sp.sqrt(1 + Rd**2) - m**2 / (2 * R) + Q**2 / (2 * R))
    u, F = rdot_squared(energy)
    vals = {M: 1, Q: sp.Rational(9, 10), m: sp.Rational(3, 10)}
    r0 = mp.mpf(5)
    f = sp.lambdify(R, F.subs(vals), "mpmath")
    # Rdot = 0 where u = sqrt(1 + Rdot^2) = 1 (u = -1 solves F = 0 too but is not a square root).
    bounce = [x for x in sp.solve(sp.Eq(F.subs(vals), 0), R) if u.subs(vals).subs(R, x) > 0]
    assert len(bounce) == 1, bounce
    rb = mp.mpf(sp.N(bounce[0], 50))
    # Horizons: roots of r^2 B = r^2 - 2 M r + Q^2.
    rp, rm = [mp.mpf(sp.N(x, 50)) for x in sorted(sp.solve((R**2 - 2 * M * R + Q**2).subs(vals), R), reverse=True)]
    assert rb < rm
    t_plus = tau_between(f, rp, r0)
    t_minus = tau_between(f, rm, r0)
    t_b = tau_between(f, rb, r0)
    return {
        "mass_M": 1.0,
        "charge_Q": 0.9,
        "rest_mass_m": 0.3,
        "start_radius": 5.0,
        "sigma_start": float(mp.mpf("0.3") / (4 * mp.pi * r0**2)),
        "start_speed": float(mp.sqrt(f(r0))),
        "horizon_outer": float(rp),
        "horizon_inner": float(rm),
        "bounce_radius": float(rb),
        "tau_outer_inward": float(t_plus),
        "tau_inner_inward": float(t_minus),
        "tau_bounce": float(t_b),
        "tau_inner_outward": float(2 * t_b - t_minus),
        "tau_outer_outward": float(2 * t_b - t_plus),
    }


def wall():
    lin, lout, sig = sp.Rational(3, 1000), sp.Rational(3, 100), sp.Rational(7, 1000)
    kappa = 4 * sp.pi * sig
    bm = 1 - lin * R**2 / 3
    bp = 1 - 2 * M / R - lout * R**2 / 3
    beta_minus = (bm - bp + kappa**2 * R**2) / (2 * kappa * R)
    F = sp.simplify((beta_minus**2 - bm).subs(M, 1))
    f = sp.lambdify(R, F, "mpmath")
    r0 = mp.mpf("8.6")
    # Largest root of F below R0 (F > 0 on (R_min, R0]), by bracketing then mpmath's findroot.
    xs = [r0 - mp.mpf(k) / 100 for k in range(0, 700)]
    lo = next(x for x in xs if f(x) < 0)
    rmin = mp.findroot(f, (lo, lo + mp.mpf(1) / 100), solver="anderson")
    beta_plus = sp.lambdify(R, (beta_minus - kappa * R).subs(M, 1), "mpmath")
    # Exterior horizons: real roots of the cubic r B_+ = r - 2M - Lout r^3/3; the cosmological one is the largest.
    rc = max(mp.mpf(sp.N(x, 50)) for x in sp.real_roots(sp.Poly(sp.expand(bp.subs(M, 1) * R), R)))
    rin = mp.sqrt(3 / mp.mpf(lin))
    t_turn = tau_between(f, rmin, r0)
    return {
        "mass_M": 1.0,
        "lambda_in": 0.003,
        "lambda_out": 0.03,
        "sigma": 0.007,
        "start_radius": float(r0),
        "start_speed": float(mp.sqrt(f(r0))),
        "turning_radius": float(rmin),
        "beta_plus_at_turn": float(beta_plus(rmin)),
        "cosmological_horizon_out": float(rc),
        "horizon_in": float(rin),
        "tau_turn": float(t_turn),
        "tau_cosmological_out": float(t_turn + tau_between(f, rmin, rc)),
        "tau_horizon_in": float(t_turn + tau_between(f, rmin, rin)),
    }


def main():
    out = {
        "generator": "tests/reference/shell_motion_reference.py",
        "precision_digits": mp.mp.dps,
        "dust": dust(),
        "charged_dust": charged(),
        "de_sitter_wall": wall(),
    }
    with open(OUT, "w") as fh:
        json.dump(out, fh, indent=2)
        fh.write("\n")
    print(json.dumps(out, indent=2))


if __name__ == "__main__":
    main()
