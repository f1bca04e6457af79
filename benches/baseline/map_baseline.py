"""Notebook-style baseline: the stability map of the charged thin-shell wormhole with SymPy + NumPy.

SymPy derives V''(a0) from the metric (static sigma0 and p0 from the Lanczos equation, the potential
V = f - (2 pi a sigma(a))^2 with sigma(a) following the conservation law and the linearised law
p' = beta^2 sigma'), lambdify turns it into a NumPy function, and NumPy evaluates the whole
(radius, beta2) grid and counts stable and unstable cells.

Usage: python3 map_baseline.py [--n 3000] [--q 0.5] [--check SUMMARY.json]
With --check, the counts are compared with a junctura `map --summary` output of the same grid.
"""
import argparse
import json
import sys
import time

t_start = time.perf_counter()

import numpy as np
import sympy as sp

ap = argparse.ArgumentParser()
ap.add_argument("--n", type=int, default=3000)
ap.add_argument("--q", type=float, default=0.5)
ap.add_argument("--check", default=None)
args = ap.parse_args()

# --- derivation -------------------------------------------------------------------------------
R, a, m, q, beta2 = sp.symbols("R a m q beta2", positive=True)
f = 1 - 2 * m / R + q**2 / R**2                      # A = B = f on both sides (Reissner-Nordstrom)

# Static shell, both sides keep R > a (Visser 1995): sigma0 = -sqrt(f)/(2 pi a),
# p0 = (1/(8 pi a)) * 2 sqrt(f) (1 + a f'/(2 f)).
sigma0 = (-sp.sqrt(f) / (2 * sp.pi * R)).subs(R, a)
p0 = (sp.sqrt(f) / (4 * sp.pi * R) * (1 + R * sp.diff(f, R) / (2 * f))).subs(R, a)

# Equation of motion Rdot^2 + V = 0 with V = f - (2 pi R sigma)^2 (from [K^theta_theta]).
sigma = sp.Function("sigma")(R)
V = f - (2 * sp.pi * R * sigma) ** 2
V2 = sp.diff(V, R, 2)

# Conservation sigma' = -(2/R)(sigma + p) and the linearised law p' = beta^2 sigma'.
s1 = -(2 / a) * (sigma0 + p0)
s2 = (2 / a**2) * (sigma0 + p0) - (2 / a) * (s1 + beta2 * s1)
V2_a0 = V2.subs(sp.Derivative(sigma, (R, 2)), s2).subs(sp.Derivative(sigma, R), s1).subs(sigma, sigma0).subs(R, a)
V2_a0 = sp.simplify(V2_a0)
v2 = sp.lambdify((a, beta2, m, q), V2_a0, "numpy")
t_derived = time.perf_counter()

# --- the grid ---------------------------------------------------------------------------------
def axis(lo, hi, n):
    x = lo + (hi - lo) * np.arange(n) / (n - 1)
    x[-1] = hi
    return x

n = args.n
m_val, q_val = 1.0, args.q
r_plus = m_val + np.sqrt(m_val**2 - q_val**2)
radii = axis(1.05 * r_plus, 10.0, n)
betas = axis(-3.0, 3.0, n)
A, B2 = np.meshgrid(radii, betas, indexing="ij")
values = v2(A, B2, m_val, q_val)
stable = int(np.count_nonzero(values > 0))
unstable = int(np.count_nonzero(values < 0))
t_end = time.perf_counter()

print(json.dumps({"cells": n * n, "stable_cells": stable, "unstable_cells": unstable,
                  "derive_s": round(t_derived - t_start, 3), "evaluate_s": round(t_end - t_derived, 3),
                  "total_s": round(t_end - t_start, 3)}))
if args.check:
    with open(args.check) as fh:
        ref = json.load(fh)
    same = ref["stable_cells"] == stable and ref["unstable_cells"] == unstable and ref["cells"] == n * n
    print(f"counts equal junctura's: {same} (junctura stable {ref['stable_cells']}, unstable {ref['unstable_cells']})")
    sys.exit(0 if same else 1)
