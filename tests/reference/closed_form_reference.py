#!/usr/bin/env python3
"""Independent check of junctura's closed forms (the SymPy strings it prints) against a first-principles derivation.

Run from the repository root after regenerating our closed forms:
    JUNCTURA_WRITE_CLOSED_FORMS=1 cargo test --test closed_reference
    pip install -r tests/reference/requirements.txt
    python3 tests/reference/closed_form_reference.py
It reads tests/reference/closed_forms.json (our closed forms as SymPy source, per case and state) and writes
tests/reference/closed_forms_check.json, which tests/closed_reference.rs reads (CI does not need Python).

For each case the extrinsic curvature of each side comes from junction_reference.derive_side (Christoffel
symbols -> embedding -> unit normal -> K_ab, no junction formula typed in) and the Lanczos equation
S^a_b = -(eps/8 pi)([K^a_b] - [K] delta^a_b). From it:
  timelike, static: sigma0 = -S^tau_tau, p0 = S^theta_theta at Rdot = Rddot = 0, the energy-condition
    combinations, M_s = Omega_(D-2) a^(D-2) sigma0 with Omega_n = 2 pi^((n+1)/2) / Gamma((n+1)/2), and
    V''(a0) = c0 + c1 beta^2 by linearising the pressure equation p = P(R, Rdot^2, Rddot) with Rddot = -V'/2
    and p - p0 = beta^2 (sigma - sigma0): c0 = 2 P_R / P_Rddot, c1 = -2 Sigma_R / P_Rddot (the potential route
    is cross-checked against this in junction_reference.py), beta^2_crit = -c0/c1;
  timelike, moving: sigma, p and the combinations at (R, Rdot, Rddot);
  spacelike: S^l_l, S^theta_theta, static and at (R, R', R'').
Each of ours is compared in value at the case's point (30 digits) and, when A and B are rational functions of r,
by simplify(ours - theirs) == 0 (decided by cancel, simplify as fallback) after writing each side's eps B as w^2 with w > 0 (solving for one of that side's
parameters), so that SymPy can take the square roots.
"""
import json
import os
import sys

import sympy as sp

sys.dont_write_bytecode = True  # keep the source tree clean
HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
import junction_reference as jr  # noqa: E402
import project_syntax  # noqa: E402

IN = os.path.join(HERE, "closed_forms.json")
OUT = os.path.join(HERE, "closed_forms_check.json")
DPS = 30
REL = sp.Float("1e-20", DPS)


def first_principles(case):
    """S^a_b (symbolic in Rs, Rd, Rdd and the parameter symbols) and the side data of a case."""
    D, eps = case["dimension"], 1 if case["shell"] == "timelike" else -1
    psym = {k: sp.Symbol(k, positive=True) for k in case["parameters"]}
    names = dict(psym, r=jr.r)
    sides, rational = {}, True
    for side in ("minus", "plus"):
        spec = case[side]
        A = project_syntax.parse(spec["A"], names)
        B = project_syntax.parse(spec["B"], names)
        rational = rational and A.is_rational_function(jr.r) and B.is_rational_function(jr.r)
        sgnB = 1 if spec["keep"] in ("inner", "outer") else -1
        d = jr.derive_side(D, eps, A, B, int(spec["normal_sign"]), sgnB)
        sides[side] = dict(K=d["K"], B=B)
    jump = sides["plus"]["K"] - sides["minus"]["K"]
    trace = sum(jump[i, i] for i in range(D - 1))
    S = (-sp.Integer(eps) / (8 * sp.pi)) * (jump - trace * sp.eye(D - 1))
    return D, eps, psym, sides, S, rational


def theirs_for(case, state, D, S, syms):
    """Our quantity ids -> first-principles expressions."""
    Rs, Rd, Rdd = jr.Rs, jr.Rd, jr.Rdd
    n = D - 2
    out = {}
    if case["shell"] == "timelike":
        if state == "static":
            a = syms["a"]
            s00 = S[0, 0].subs({Rd: 0, Rdd: 0})
            s11 = S[1, 1].subs({Rd: 0, Rdd: 0})
            sig, p = -s00.subs(Rs, a), s11.subs(Rs, a)
            p_r = sp.diff(s11, Rs).subs(Rs, a)
            sig_r = sp.diff(-s00, Rs).subs(Rs, a)
            p_rdd = sp.diff(S[1, 1], Rdd).subs({Rd: 0, Rdd: 0}).subs(Rs, a)
            c0, c1 = 2 * p_r / p_rdd, -2 * sig_r / p_rdd
            omega = 2 * sp.pi ** sp.Rational(n + 1, 2) / sp.gamma(sp.Rational(n + 1, 2))
            out.update({"sigma0": sig, "p0": p, "sigma0_plus_p0": sig + p, f"sigma0_plus_{'' if n == 1 else n}p0":
                        sig + n * p, "sigma0_minus_p0": sig - p, "shell_mass": omega * a**n * sig, "c0": c0,
                        "c1": c1, "beta2_crit": -c0 / c1})
        else:
            sub = {Rs: syms["R"], Rd: syms["Rdot"], Rdd: syms["Rddot"]}
            sig, p = (-S[0, 0]).subs(sub), S[1, 1].subs(sub)
            omega = 2 * sp.pi ** sp.Rational(n + 1, 2) / sp.gamma(sp.Rational(n + 1, 2))
            out.update({"sigma": sig, "p": p, "sigma_plus_p": sig + p, f"sigma_plus_{'' if n == 1 else n}p":
                        sig + n * p, "sigma_minus_p": sig - p, "shell_mass": omega * syms["R"] ** n * sig})
    else:
        if state == "static":
            sub = {Rd: 0, Rdd: 0, Rs: syms["R"]}
        else:
            sub = {Rs: syms["R"], Rd: syms["Rp"], Rdd: syms["Rpp"]}
        out.update({"S_ll": S[0, 0].subs(sub), "S_thth": S[1, 1].subs(sub)})
    return out


def point(case, state, psym, syms):
    """Exact values of every symbol at the case's point."""
    vals = {psym[k]: sp.Rational(float(v)) for k, v in case["parameters"].items()}
    R = sp.Rational(float(case["R"]))
    vals.update({syms["a"]: R, syms["R"]: R, syms["sigma"]: sp.Rational(1, 20)})
    if state == "moving":
        v, acc = sp.Rational(float(case["Rdot"])), sp.Rational(float(case["Rddot"]))
        vals.update({syms["Rdot"]: v, syms["Rddot"]: acc, syms["Rp"]: v, syms["Rpp"]: acc})
    else:
        vals.update({syms["Rdot"]: 0, syms["Rddot"]: 0, syms["Rp"]: 0, syms["Rpp"]: 0})
    return vals


def root_substitution(case, state, eps, psym, sides, syms):
    """Write eps B_i as w_i^2 (w_i > 0) by solving for one parameter per side (the root of the case's sign)."""
    radius = syms["a"] if (case["shell"] == "timelike" and state == "static") else syms["R"]
    vals = point(case, state, psym, syms)
    subs, used, wvals = {}, set(), {}
    # The side with fewer parameters first, so a shared parameter is solved where it enters most simply.
    order = sorted(enumerate(("minus", "plus")), key=lambda kv: len([p for p in psym.values() if sides[kv[1]]["B"].has(p)]))
    for k, side in order:
        B = sides[side]["B"].subs(jr.r, radius).subs(subs)
        free = [p for p in psym.values() if B.has(p) and p not in used]
        if not free:
            continue
        w = sp.Symbol(f"w{k}", positive=True)
        sol = sp.solve(sp.Eq(eps * B, w**2), free[0])
        # Several roots: keep the one that gives the parameter its value at the case's point.
        wvals[w] = sp.sqrt(eps * sides[side]["B"].subs(jr.r, radius).subs(vals))
        target = vals[free[0]]
        sol = [x for x in sol if abs(sp.N(x.subs(wvals).subs(vals), 30) - target) < 1e-20]
        if len(sol) != 1:
            continue
        subs = {q: e.subs(free[0], sol[0]) for q, e in subs.items()}
        subs[free[0]] = sol[0]
        used.add(free[0])
    return subs


def main():
    doc = json.load(open(IN))
    out_cases, failures = [], 0
    syms = {"a": sp.Symbol("a", positive=True), "R": sp.Symbol("R", positive=True)}
    syms.update({k: sp.Symbol(k, real=True) for k in ("Rdot", "Rddot", "Rp", "Rpp", "sigma")})
    for case in doc["cases"]:
        D, eps, psym, sides, S, rational = first_principles(case)
        local = dict(syms)
        for k, s in psym.items():
            local[k] = s
            local[k + "_"] = s
        entry = {"id": case["id"], "rational": rational, "quantities": []}
        print(f"{case['id']} (rational: {rational}):")
        for state in ("static", "moving"):
            ours_all = case["closed_forms"][state]["quantities"]
            theirs = theirs_for(case, state, D, S, syms)
            vals = point(case, state, psym, syms)
            roots = root_substitution(case, state, eps, psym, sides, syms) if rational else {}
            parsed = {k: sp.parse_expr(v, local_dict=local) for k, v in ours_all.items()}
            for qid, t in theirs.items():
                if qid not in parsed:
                    continue
                ours = parsed[qid]
                if ours.has(sp.Symbol("c0")) or ours.has(sp.Symbol("c1")):
                    ours = ours.subs({sp.Symbol("c0"): parsed["c0"], sp.Symbol("c1"): parsed["c1"]})
                ov = sp.N(ours.subs(vals), DPS)
                tv = sp.N(t.subs(vals), DPS)
                ok = abs(ov - tv) <= REL * max(abs(tv), sp.Float("1e-5"))
                zero = None
                if rational:
                    # With the roots written as w_i the difference is a rational function: cancel decides it
                    # (and implies simplify(...) == 0); simplify is the fallback.
                    diff = (ours - t).subs(roots)
                    # Bring each radicand to lowest terms so that equal square roots are seen as equal.
                    diff = diff.replace(lambda e: e.is_Pow and e.exp.is_Rational and e.exp.q == 2,
                                        lambda e: sp.Pow(sp.factor(sp.cancel(e.base)), e.exp))
                    diff = sp.powdenest(diff, force=True)
                    d = sp.cancel(sp.together(diff))
                    zero = bool(d == 0 or sp.simplify(d) == 0)
                good = ok and zero is not False
                failures += 0 if good else 1
                print(f"  [{'ok' if good else 'FAIL'}] {state} {qid}: value {'agrees' if ok else 'DIFFERS'}"
                      + ("" if zero is None else f", simplify(ours - theirs) == 0: {zero}"))
                entry["quantities"].append({"state": state, "id": qid, "ours": str(ov), "theirs": str(tv),
                                            "values_agree": bool(ok), "simplify_zero": zero})
        out_cases.append(entry)
    with open(OUT, "w") as f:
        json.dump({"generator": "tests/reference/closed_form_reference.py", "sympy": sp.__version__, "input": doc,
                   "cases": out_cases}, f, indent=1)
        f.write("\n")
    print(f"wrote {OUT}; {failures} failed checks")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
