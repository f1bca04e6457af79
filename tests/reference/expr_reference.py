#!/usr/bin/env python3
"""Reference values for junctura's expression language: value and derivatives by SymPy differentiation.

Install SymPy and mpmath (`pip install -r tests/reference/requirements.txt`), then from the repository root:
    python3 tests/reference/expr_reference.py
This rewrites tests/reference/expr_golden.json, read by tests/expr_reference.rs.

For each expression (project syntax, converted by project_syntax.py) and each point: f, f', f'', f''' with
respect to the variable and df/dparam for one parameter, by symbolic differentiation, evaluated at 50 digits
with the exact double values of the inputs, written with repr.
"""
import json
import os
import sys

sys.dont_write_bytecode = True  # keep the source tree clean
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import mpmath as mp  # noqa: E402
import sympy as sp  # noqa: E402

import project_syntax  # noqa: E402

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "expr_golden.json")
DPS = 50

# (expression, variable, parameters, points, parameter to differentiate by)
CASES = [
    ("-r^2 + 3*r", "r", {"m": 1.0}, [0.5, 2.5, -1.25], "m"),
    ("r^-2 - 2^-1*r", "r", {}, [0.75, 2.0, -3.0], None),
    ("1 - 2*m/r + q^2/r^2", "r", {"m": 1.0, "q": 0.5}, [2.5, 4.0, 0.9], "q"),
    ("e*exp(-e/r) + e^2", "r", {"e": 0.7}, [1.5, 3.0], "e"),
    ("1 - 2*m*r^2/(r^3 + 2*m*e^2)", "r", {"m": 1.0, "e": 0.6}, [0.8, 2.5, 5.0], "e"),
    ("sqrt(1 + l*r^2)*log(r)", "r", {"l": 0.3}, [0.4, 1.7, 6.0], "l"),
    ("sin(m*r)*cos(r)/(2 + tan(r/5))", "r", {"m": 1.3}, [0.3, 2.2, 4.1], "m"),
    ("sinh(r/3) - cosh(q*r)/2 + tanh(r - m)", "r", {"m": 1.0, "q": 0.4}, [0.5, 1.0, 3.5], "m"),
    ("abs(r - 3)^1.5 + abs(m - r)", "r", {"m": 2.0}, [1.5, 2.5, 4.2], "m"),
    ("r^2.5 - r^(1/3) + r^0.5", "r", {}, [0.6, 2.0, 9.0], None),
    ("m*r^q", "r", {"m": 1.5, "q": 0.7}, [0.5, 3.0], "q"),
    ("exp(sin(sqrt(r))) - log(cosh(1/r))", "r", {}, [0.3, 1.1, 7.5], None),
    ("(1 - 2*m/r)*exp(-2*b/r)", "r", {"m": 1.0, "b": 0.25}, [2.2, 3.0, 10.0], "b"),
    ("-2^2 + r^2^-1 - -r/pi", "r", {}, [0.2, 4.0], None),
    ("1.5e-1*r^3 - 2.5E+0*r + .5", "r", {}, [-1.0, 0.1, 2.0], None),
    ("log(abs(tan(r)))*e", "r", {"e": 2.0}, [0.4, 2.0], "e"),
    ("p0 + beta2*(sigma - s0) - sigma^3/(1 + sigma^2)", "sigma", {"p0": 0.01, "beta2": 0.5, "s0": -0.05},
     [-0.05, 0.2], "beta2"),
]


def main():
    mp.mp.dps = DPS
    cases = []
    for src, var, params, points, dname in CASES:
        x = sp.Symbol(var, real=True)
        psyms = {k: sp.Symbol(k, real=True) for k in params}
        f = project_syntax.parse(src, dict(psyms, **{var: x}))
        derivs = [f]
        for _ in range(3):
            derivs.append(sp.diff(derivs[-1], x))
        fp = sp.diff(f, psyms[dname]) if dname else None
        exact = {psyms[k]: project_syntax.exact(v) for k, v in params.items()}
        for pt in points:
            at = dict(exact)
            at[x] = project_syntax.exact(pt)
            vals = [sp.N(d.subs(at), DPS) for d in derivs]
            for v in vals:
                assert v.is_real, f"{src} at {pt}: {v}"
            case = {"expr": src, "var": var, "params": params, "x": pt}
            case.update({f"d{k}": float(v) for k, v in enumerate(vals)})
            if dname:
                case["dparam"] = {"name": dname, "value": float(sp.N(fp.subs(at), DPS))}
            cases.append(case)
            print(f"{src!r:55} {var}={pt:<6} f={float(vals[0]):.12g} f'={float(vals[1]):.12g}")
    doc = {"generator": "tests/reference/expr_reference.py", "sympy": sp.__version__, "cases": cases}
    with open(OUT, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")
    print(f"wrote {OUT} ({len(cases)} cases)")


if __name__ == "__main__":
    main()
