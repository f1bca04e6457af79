"""Critical beta^2 of thin-shell wormholes built from two copies of A = B = f(r), derived from first principles.

Equation of motion (Poisson & Visser 1995, Phys. Rev. D 52, 7318): a'^2 + V(a) = 0 with
V(a) = f(a) - (2 pi a sigma(a))^2, sigma from the angular junction condition sigma = -sqrt(f + a'^2)/(2 pi a),
and the conservation law sigma' = -(2/a)(sigma + p), p = p(sigma), beta^2 = dp/dsigma at the static radius.
Linear stability: V''(a0) > 0. V''(a0) is linear in beta^2; its zero is beta^2_crit.

Checks: for f = 1 - 2M/a this reproduces Poisson & Visser (1995), eq. for beta_0^2 (their eq. 4.x):
  beta^2_crit = -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a)(1 - 3M/a)).
For f = 1 - 2M/a + Q^2/a^2 it gives the charged case of Eiroa & Romero (2004), Gen. Rel. Grav. 36, 651.
Run: python3 tests/reference/wormhole_critical.py (prints the simplified closed forms used in
tests/families.rs).
"""
import sympy as sp

a, M, Q, b2 = sp.symbols("a M Q beta2", real=True)
s, p = sp.symbols("sigma p", real=True)


def beta2_crit(f):
    fp, fpp = sp.diff(f, a), sp.diff(f, a, 2)
    sigma0 = -sp.sqrt(f) / (2 * sp.pi * a)
    # p0 from V'(a0) = 0: V = f - (2 pi a sigma)^2, (a sigma)' = sigma + a sigma' = -sigma - 2p.
    # V' = f' - 8 pi^2 (a sigma)(a sigma)' = f' + 8 pi^2 a sigma (sigma + 2 p) = 0.
    p0 = sp.solve(sp.Eq(fp + 8 * sp.pi**2 * a * sigma0 * (sigma0 + 2 * p), 0), p)[0]
    # (a sigma)'' = -(sigma' + 2 p') = -(1 + 2 beta^2) sigma' = (1 + 2 beta^2)(2/a)(sigma + p).
    g, g1 = a * sigma0, -sigma0 - 2 * p0
    g2 = (1 + 2 * b2) * (2 / a) * (sigma0 + p0)
    v2 = fpp - 8 * sp.pi**2 * (g1**2 + g * g2)
    sol = sp.solve(sp.Eq(v2, 0), b2)[0]
    return sp.simplify(sol), sp.simplify(p0)


schw, p_s = beta2_crit(1 - 2 * M / a)
pv = -(1 - 3 * M / a + 3 * M**2 / a**2) / (2 * (1 - 2 * M / a) * (1 - 3 * M / a))
assert sp.simplify(schw - pv) == 0, (schw, pv)
print("Schwarzschild: beta2_crit =", sp.factor(schw), " (equals Poisson & Visser 1995)")
print("  p0 =", sp.simplify(p_s))

rn, p_rn = beta2_crit(1 - 2 * M / a + Q**2 / a**2)
print("Reissner-Nordstrom: beta2_crit =", sp.factor(rn))
print("  p0 =", sp.simplify(p_rn))
# Reduces to the uncharged result at Q = 0.
assert sp.simplify(rn.subs(Q, 0) - pv) == 0
# Sample values used in tests/families.rs (M = 1).
for q in [0.0, 0.5, 0.9]:
    for av in [4.0, 6.0]:
        print(f"  q={q} a={av}: {float(rn.subs({M: 1, Q: q, a: av})):.15g}")
