#!/usr/bin/env python3
"""Independent reference derivation of thin-shell junction quantities (golden values for junctura's tests).

Install the two Python packages this needs (SymPy and mpmath), then re-run from the repository root:
    pip install -r tests/reference/requirements.txt
    python3 tests/reference/junction_reference.py
This rewrites tests/reference/junction_golden.json and prints the self-checks. The Rust test suite only reads
the committed JSON; it never runs Python.

What is derived, from first principles and for each side separately (no junction formula is typed in):
  metric g = diag(-A(r), 1/B(r), r^2 dOmega^2_(D-2)) with the actual (D-2)-sphere angles
  -> Christoffel symbols Gamma^l_mv = 1/2 g^ls (d_m g_sv + d_v g_sm - d_s g_mv)
  -> shell r = R(s), t = T(s): tangent vectors e_s = (Tdot, Rdot, 0..), e_theta_k = d/dtheta_k,
     with Tdot fixed by the normalisation h_ss = g(e_s, e_s) = -eps
  -> unit normal n_mu proportional to (-Rdot, Tdot, 0..) (so n.e_s = 0), scaled so that n.n = eps and the
     sign of n^r is the side's normal sign nu (n points from minus into plus)
  -> K_ab = e^mu_a e^nu_b nabla_nu n_mu = e^mu_a (d n_mu / d xi^b - Gamma^l_{mu nu} n_l e^nu_b)
     (the derivative of n along the shell needs n on the shell only)
  -> mixed K^a_b = h^ac K_cb, trace K = K^a_a over all D-1 shell directions
  -> Lanczos S^a_b = -(eps / 8 pi) ([K^a_b] - [K] delta^a_b), [X] = X_plus - X_minus.
eps = +1 for a timelike shell (s = proper time), -1 for a spacelike shell (s = proper length).
The shell potential and its second derivative at a static radius are derived in `potential_second_derivative`.
All numbers are evaluated with mpmath at 50 significant digits (cross-checked at 80) and written with repr.
"""
import json
import os
import sys

import mpmath as mp
import sympy as sp

sys.dont_write_bytecode = True  # keep the source tree clean
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import project_syntax  # noqa: E402

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "junction_golden.json")
GENERATOR = "tests/reference/junction_reference.py"
DPS = 50

r = sp.Symbol("r", positive=True)
s = sp.Symbol("s", real=True)
Rs, Rd, Rdd = sp.symbols("Rs Rd Rdd", real=True)
Y = sp.Symbol("Y", positive=True)  # Rdot^2; evaluated also at Y <= 0 by analytic continuation
# Generic angle values at which the angular components are evaluated (their equality is checked).
ANGLES = [sp.Rational(7, 10), sp.Rational(11, 10), sp.Rational(13, 10)]


# ----------------------------------------------------------------------------------------------------------
# Geometry of one side
# ----------------------------------------------------------------------------------------------------------
def christoffel(D, gdiag, coords):
    """Gamma^l_mv for a diagonal metric gdiag (list of the g_ii), by the textbook definition."""
    n = D
    ginv = [1 / g for g in gdiag]
    gam = [[[sp.S(0)] * n for _ in range(n)] for _ in range(n)]
    for l in range(n):
        for m in range(n):
            for v in range(n):
                val = sp.S(0)
                if l == v:
                    val += sp.diff(gdiag[l], coords[m])
                if l == m:
                    val += sp.diff(gdiag[l], coords[v])
                if m == v:
                    val -= sp.diff(gdiag[m], coords[l])
                gam[l][m][v] = sp.Rational(1, 2) * ginv[l] * val
    return gam


def derive_side(D, eps, A, B, nu, sgnB):
    """Mixed extrinsic curvature of the shell seen from one side.

    A, B: SymPy expressions in r. nu = sign of n^r on this side; sgnB = sign of B at the shell.
    Returns symbolic K^a_b (a (D-1)x(D-1) matrix in Rs, Rd, Rdd, parameters, angles) and the checks
    n.n, n.e_s and h_ss.
    """
    t = sp.Symbol("t", real=True)
    th = sp.symbols(f"th1:{D - 1}", real=True)
    coords = [t, r, *th]
    gdiag = [-A, 1 / B]
    w = r**2
    for k in range(D - 2):  # r^2 (dth1^2 + sin^2 th1 (dth2^2 + sin^2 th2 (...)))
        gdiag.append(w)
        w = w * sp.sin(th[k]) ** 2
    gam = christoffel(D, gdiag, coords)

    Rf = sp.Function("R")(s)
    dR = sp.diff(Rf, s)

    def on(e):
        return sp.sympify(e).subs(r, Rf)

    As, Bs = on(A), on(B)
    # -A Tdot^2 + Rdot^2 / B = -eps  (u.u = -1 for timelike, +1 for spacelike shells)
    Tdot = sp.sqrt((dR**2 + eps * Bs) / (As * Bs))
    # n_mu = lam (-Rdot, Tdot): n.n = lam^2 (-Rdot^2/A + B Tdot^2) = lam^2 eps B / A  ->  lam^2 = A / B;
    # n^r = B lam Tdot, so sign(lam) = nu sign(B) makes sign(n^r) = nu (Tdot > 0 chosen; t -> -t is an isometry).
    lam = nu * sgnB * sp.sqrt(As / Bs)
    n_low = [-lam * dR, lam * Tdot] + [sp.S(0)] * (D - 2)
    E = [[Tdot, dR] + [sp.S(0)] * (D - 2)]
    for k in range(D - 2):
        v = [sp.S(0)] * D
        v[2 + k] = sp.S(1)
        E.append(v)
    g_on = [on(g) for g in gdiag]
    gam_on = [[[on(gam[l][m][v]) for v in range(D)] for m in range(D)] for l in range(D)]
    dim = D - 1
    K = sp.zeros(dim, dim)
    h = sp.zeros(dim, dim)
    for a in range(dim):
        for b in range(dim):
            h[a, b] = sum(g_on[m] * E[a][m] * E[b][m] for m in range(D))
            total = sp.S(0)
            for mu in range(D):
                if E[a][mu] == 0:
                    continue
                dn = sp.diff(n_low[mu], s) if b == 0 else sp.S(0)  # n depends on the shell point via s only
                conn = sum(gam_on[l][mu][v] * n_low[l] * E[b][v] for l in range(D) for v in range(D))
                total += E[a][mu] * (dn - conn)
            K[a, b] = total
    hinv = sp.diag(*[1 / h[a, a] for a in range(dim)])  # h is diagonal (checked below)
    assert all(h[a, b] == 0 for a in range(dim) for b in range(dim) if a != b)
    Kmix = hinv * K

    def rep(e):
        return sp.sympify(e).subs(sp.diff(Rf, s, 2), Rdd).subs(dR, Rd).subs(Rf, Rs)

    angle_subs = dict(zip(th, ANGLES))
    Kmix = Kmix.applyfunc(lambda e: rep(e).subs(angle_subs))
    nn = rep(sum(n_low[m] ** 2 / g_on[m] for m in range(D)))
    ne = rep(sum(n_low[m] * E[0][m] for m in range(D)))
    return {"K": Kmix, "nn": nn, "ne": ne, "hss": rep(h[0, 0])}


# ----------------------------------------------------------------------------------------------------------
# Cases
# ----------------------------------------------------------------------------------------------------------
R_REGION_SIGN = {("plus", "outer"): 1, ("plus", "inner"): -1, ("minus", "inner"): 1, ("minus", "outer"): -1}
T_REGION_SIGN = {"black-hole": -1, "white-hole": 1}  # spacelike shells: n future-directed


def normal_sign(side, spec, shell):
    """nu = sign of n^r on a side, from the project's physics conventions (n points from minus into plus)."""
    keep = spec["keep"]
    if keep in ("inner", "outer"):
        return R_REGION_SIGN[(side, keep)]
    if shell == "spacelike":
        return T_REGION_SIGN[keep]
    return spec["normal_sign"]  # timelike shell in a T-region: explicit


def side_spec(A, B, keep, **extra):
    d = {"A": A, "B": B, "keep": keep}
    d.update(extra)
    return d


SCHW1, SCHW2 = "1 - 2*m1/r", "1 - 2*m2/r"
CASES = [
    dict(id="flat-schw-standard", note="D=4 standard shell: Minkowski inside, Schwarzschild outside",
         dimension=4, shell="timelike", parameters={"m": 1.0},
         minus=side_spec("1", "1", "inner"), plus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"),
         R=3.0, Rdot=0.4, Rddot=-0.05, a=3.0),
    dict(id="schw-wormhole-a2.5", note="D=4 Schwarzschild thin-shell wormhole, static radius inside the photon sphere",
         dimension=4, shell="timelike", parameters={"m": 1.0},
         minus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"), plus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"),
         R=2.5, Rdot=0.3, Rddot=0.02, a=2.5),
    dict(id="schw-wormhole-moving", note="D=4 Schwarzschild thin-shell wormhole at the photon-sphere radius",
         dimension=4, shell="timelike", parameters={"m": 1.0},
         minus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"), plus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"),
         R=3.0, Rdot=0.4, Rddot=-0.05, a=3.0),
    dict(id="schw-wormhole-a4", note="D=4 Schwarzschild thin-shell wormhole, static radius outside the photon sphere",
         dimension=4, shell="timelike", parameters={"m": 1.0},
         minus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"), plus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"),
         R=4.0, Rdot=-0.25, Rddot=0.1, a=4.0),
    dict(id="rn-wormhole-asymmetric", note="D=4 Reissner-Nordstrom wormhole with different mass and charge per side",
         dimension=4, shell="timelike", parameters={"m1": 1.0, "q1": 0.5, "m2": 1.5, "q2": 0.8},
         minus=side_spec("1 - 2*m1/r + q1^2/r^2", "1 - 2*m1/r + q1^2/r^2", "outer"),
         plus=side_spec("1 - 2*m2/r + q2^2/r^2", "1 - 2*m2/r + q2^2/r^2", "outer"),
         R=4.0, Rdot=0.3, Rddot=-0.1, a=4.5),
    dict(id="desitter-caps-closed", note="D=4 closed universe: two de Sitter caps (inner|inner), different Lambda",
         dimension=4, shell="timelike", parameters={"l1": 0.1, "l2": 0.05},
         minus=side_spec("1 - l1*r^2/3", "1 - l1*r^2/3", "inner"),
         plus=side_spec("1 - l2*r^2/3", "1 - l2*r^2/3", "inner"),
         R=2.0, Rdot=0.2, Rddot=0.05, a=2.5),
    dict(id="schw-outer-desitter-inner", note="D=4 outer|inner: Schwarzschild exterior joined to a de Sitter cap",
         dimension=4, shell="timelike", parameters={"m": 1.0, "l": 0.1},
         minus=side_spec("1 - 2*m/r", "1 - 2*m/r", "outer"), plus=side_spec("1 - l*r^2/3", "1 - l*r^2/3", "inner"),
         R=3.0, Rdot=-0.2, Rddot=0.03, a=3.5),
    dict(id="redshift-standard", note="D=4 A != B on both sides, standard orientation (inner|outer)",
         dimension=4, shell="timelike", parameters={"m1": 0.5, "b1": 0.3, "q1": 0.4, "m2": 1.0, "q2": 0.6, "L": 10.0},
         minus=side_spec("(1 - 2*m1/r)*exp(-2*b1/r)", "1 - 2*m1/r + q1^2/r^2", "inner"),
         plus=side_spec("(1 - 2*m2/r)*(1 + q2^2/r^2)^2", "1 - 2*m2/r + r^2/L^2", "outer"),
         R=3.0, Rdot=0.35, Rddot=-0.07, a=3.0),
    dict(id="redshift-wormhole", note="D=4 A != B on both sides, wormhole orientation (outer|outer)",
         dimension=4, shell="timelike", parameters={"m1": 0.5, "b1": 0.3, "q1": 0.4, "m2": 1.0, "q2": 0.6, "L": 10.0},
         minus=side_spec("(1 - 2*m1/r)*exp(-2*b1/r)", "1 - 2*m1/r + q1^2/r^2", "outer"),
         plus=side_spec("(1 - 2*m2/r)*(1 + q2^2/r^2)^2", "1 - 2*m2/r + r^2/L^2", "outer"),
         R=3.0, Rdot=0.35, Rddot=-0.07, a=3.5),
    dict(id="tangherlini-flat-5d", note="D=5 standard shell: flat inside, Tangherlini outside (3-sphere angles)",
         dimension=5, shell="timelike", parameters={"mu": 1.0},
         minus=side_spec("1", "1", "inner"), plus=side_spec("1 - mu/r^2", "1 - mu/r^2", "outer"),
         R=2.0, Rdot=0.3, Rddot=-0.04, a=2.0),
    dict(id="redshift-wormhole-5d", note="D=5 wormhole with A != B on both sides",
         dimension=5, shell="timelike", parameters={"mu1": 1.0, "b1": 0.2, "q1": 0.5, "mu2": 1.5, "e": 0.3},
         minus=side_spec("(1 - mu1/r^2)*exp(-2*b1/r)", "1 - mu1/r^2 + q1^2/r^4", "outer"),
         plus=side_spec("1 - mu2/r^2 + e*r^-1", "(1 - mu2/r^2)*(1 + e/r)", "outer"),
         R=2.0, Rdot=0.25, Rddot=0.06, a=2.2),
    dict(id="spacelike-bh-wh-schw", note="D=4 spacelike shell inside horizons: black-hole interior (m1) before, "
         "white-hole interior (m2) after", dimension=4, shell="spacelike", parameters={"m1": 1.0, "m2": 1.5},
         minus=side_spec(SCHW1, SCHW1, "black-hole"), plus=side_spec(SCHW2, SCHW2, "white-hole"),
         R=1.2, Rdot=0.4, Rddot=0.1, a=1.1),  # (at a = 1.2 the static [S^th_th] vanishes by coincidence)
    dict(id="spacelike-bh-wh-redshift", note="D=4 spacelike shell inside horizons with A != B on both sides",
         dimension=4, shell="spacelike", parameters={"m1": 1.0, "q1": 0.3, "b1": 0.2, "m2": 1.5, "q2": 0.5},
         minus=side_spec("(1 - 2*m1/r)*exp(-2*b1/r)", "1 - 2*m1/r + q1^2/r^2", "black-hole"),
         plus=side_spec("(1 - 2*m2/r)*(1 + q2^2/r^2)", SCHW2, "white-hole"),
         R=1.2, Rdot=-0.3, Rddot=0.2, a=1.5),
    dict(id="spacelike-bh-wh-5d", note="D=5 spacelike shell: Tangherlini black-hole interior before, "
         "white-hole interior after", dimension=5, shell="spacelike", parameters={"mu1": 1.0, "mu2": 2.0},
         minus=side_spec("1 - mu1/r^2", "1 - mu1/r^2", "black-hole"),
         plus=side_spec("1 - mu2/r^2", "1 - mu2/r^2", "white-hole"),
         R=0.8, Rdot=0.5, Rddot=-0.2, a=0.8),
    dict(id="timelike-t-region-explicit", note="D=4 timelike shell inside two black-hole interiors, normal signs "
         "given explicitly", dimension=4, shell="timelike", parameters={"m1": 1.0, "m2": 1.5},
         minus=side_spec(SCHW1, SCHW1, "black-hole", normal_sign=1),
         plus=side_spec(SCHW2, SCHW2, "black-hole", normal_sign=-1),
         R=1.2, Rdot=-1.6, Rddot=0.2),
]


# ----------------------------------------------------------------------------------------------------------
# Evaluation helpers
# ----------------------------------------------------------------------------------------------------------
def mpf_exact(x):
    """The exact value of a double as an mpmath number (binary floats convert exactly)."""
    return mp.mpf(float(x))


def lam(expr, args):
    """An mpmath callable of `args` for a SymPy expression."""
    return sp.lambdify(args, expr, modules="mpmath")


def real(z, what, tol_digits=25):
    """Real part of an mpmath number, insisting that any imaginary part is rounding noise."""
    z = mp.mpmathify(z)
    if isinstance(z, mp.mpc):
        if abs(z.imag) > mp.mpf(10) ** (-tol_digits) * max(1, abs(z.real)):
            raise ValueError(f"{what}: unexpected imaginary part {z}")
        return z.real
    return z


def check(label, ok, detail=""):
    print(f"  [{'ok' if ok else 'FAIL'}] {label} {detail}")
    if not ok:
        check.failures += 1


check.failures = 0


def build_case(case):
    """Symbolic S^a_b, K^a_b per side for a case, with the parameter values substituted exactly."""
    D, shell = case["dimension"], case["shell"]
    eps = 1 if shell == "timelike" else -1
    psyms = {k: sp.Symbol(k, real=True) for k in case["parameters"]}
    pvals = {psyms[k]: sp.Rational(float(v)) for k, v in case["parameters"].items()}
    names = dict(psyms, r=r)
    sides = {}
    for side in ("minus", "plus"):
        spec = case[side]
        A = project_syntax.parse(spec["A"], names).subs(pvals)
        B = project_syntax.parse(spec["B"], names).subs(pvals)
        radii = [case["R"]] + ([case["a"]] if "a" in case else [])
        signs = set()
        for x in radii:
            Av, Bv = A.subs(r, sp.Rational(x)), B.subs(r, sp.Rational(x))
            signs.add(1 if Bv > 0 else -1)
            assert Av / Bv > 0, f"{case['id']} {side}: A/B must be positive at r = {x}"
        assert len(signs) == 1, f"{case['id']} {side}: R and a lie in different regions"
        sgnB = signs.pop()
        expected = 1 if spec["keep"] in ("inner", "outer") else -1
        assert sgnB == expected, f"{case['id']} {side}: keep={spec['keep']} but sign(B) = {sgnB}"
        nu = normal_sign(side, spec, shell)
        d = derive_side(D, eps, A, B, nu, sgnB)
        d.update(nu=nu, A=A, B=B)
        sides[side] = d
    Km, Kp = sides["minus"]["K"], sides["plus"]["K"]
    jump = Kp - Km
    trace_jump = sum(jump[i, i] for i in range(D - 1))
    S = (-sp.Integer(eps) / (8 * sp.pi)) * (jump - trace_jump * sp.eye(D - 1))
    return dict(D=D, eps=eps, sides=sides, S=S)


def evaluate_state(built, R, Rdot, Rddot, dps, checks=False):
    """K^s_s, K^theta_theta per side and S^s_s, S^theta_theta at one shell state, at `dps` digits."""
    D = built["D"]
    args = (Rs, Rd, Rdd)
    with mp.workdps(dps):
        vals = [mpf_exact(R), mpf_exact(Rdot), mpf_exact(Rddot)]

        def ev(e, what):
            return real(lam(e, args)(*vals), what)

        out = {}
        for side in ("minus", "plus"):
            K = built["sides"][side]["K"]
            out[f"K_ss_{side}"] = ev(K[0, 0], "K_ss")
            out[f"K_thth_{side}"] = ev(K[1, 1], "K_thth")
            if checks:
                sd = built["sides"][side]
                tol = mp.mpf(10) ** (-(dps - 10))
                check(f"{side}: n.n = eps", abs(ev(sd["nn"], "nn") - built["eps"]) < tol)
                check(f"{side}: n.e_s = 0", abs(ev(sd["ne"], "ne")) < tol)
                check(f"{side}: h_ss = -eps", abs(ev(sd["hss"], "hss") + built["eps"]) < tol)
                off = max(abs(ev(K[i, j], "K")) for i in range(D - 1) for j in range(D - 1) if i != j)
                ang = max(abs(ev(K[i, i], "K") - out[f"K_thth_{side}"]) for i in range(2, D - 1)) if D > 3 else 0
                check(f"{side}: K^a_b diagonal, all angular components equal", off < tol and ang < tol)
                nr = sd["nu"] * mp.sqrt(mpf_exact(Rdot) ** 2 + built["eps"] * ev(sd["B"].subs(r, Rs), "B"))
                check(f"{side}: K^th_th = n^r / R with (n^r)^2 = Rdot^2 + eps B",
                      abs(out[f"K_thth_{side}"] - nr / mpf_exact(R)) < tol)
                flipped = real(lam(K[0, 0], args)(vals[0], -vals[1], vals[2]), "K")
                check(f"{side}: K^s_s even in Rdot", abs(flipped - out[f"K_ss_{side}"]) < tol)
        S = built["S"]
        out["S_ss"] = ev(S[0, 0], "S_ss")
        out["S_thth"] = ev(S[1, 1], "S_thth")
        if checks:
            tol = mp.mpf(10) ** (-(dps - 10))
            off = max(abs(ev(S[i, j], "S")) for i in range(D - 1) for j in range(D - 1) if i != j)
            ang = max(abs(ev(S[i, i], "S") - out["S_thth"]) for i in range(2, D - 1)) if D > 3 else 0
            check("S^a_b diagonal, all angular components equal", off < tol and ang < tol)
    return out


# ----------------------------------------------------------------------------------------------------------
# Shell potential and its second derivative at a static radius
# ----------------------------------------------------------------------------------------------------------
def potential_second_derivative(built, a, beta2s, dps=DPS):
    """V''(a) for p = p0 + beta^2 (sigma - sigma0), derived from the two junction equations.

    sigma = Sig(R, Y) = -S^tau_tau with Rdot^2 = Y: it contains only the angular curvatures K^theta_theta.
    p = Pi(R, Y, Rddot) = S^theta_theta: it contains K^tau_tau and is linear in Rddot. Along a trajectory
    d sigma/d tau = Sig_R Rdot + Sig_Y 2 Rdot Rddot, so with Rddot from the pressure equation
        d sigma/dR = F(R, sigma) = Sig_R(R, Y) + 2 Sig_Y(R, Y) Rddot(R, Y, p),   Y = Y(R, sigma) from Sig(R, Y) = sigma,
    the conservation law (its difference from -(D-2)(sigma + p)/R is the flux term Xi, printed). The angular
    equation read as Rdot^2 + V = 0 gives V(R) = -Y(R, sigma(R)); sigma(R) is expanded to second order
    about (a, sigma0) from F and V is differentiated twice. Cross-check: linearising both equations about the
    static state gives V''(a) = 2 (Pi_R - beta^2 Sig_R) / Pi_Rddot at Y = Rddot = 0.
    """
    D = built["D"]
    S = built["S"]
    sig_e = (-S[0, 0]).subs(Rd, sp.sqrt(Y))
    pi_e = S[1, 1].subs(Rd, sp.sqrt(Y))
    assert not sig_e.has(Rdd), "sigma must not depend on Rddot"
    assert not sig_e.has(sp.sqrt(Y)), "sigma must depend on Rdot^2 analytically"
    pi1_e = sp.diff(pi_e, Rdd)
    assert not sp.diff(pi1_e, Rdd).has(Rdd) and sp.diff(pi_e, Rdd, 2) == 0, "p must be linear in Rddot"
    sig = lam(sig_e, (Rs, Y))
    sigR = lam(sp.diff(sig_e, Rs), (Rs, Y))
    sigY = lam(sp.diff(sig_e, Y), (Rs, Y))
    pi0 = lam(pi_e.subs(Rdd, 0), (Rs, Y))
    pi1 = lam(pi1_e, (Rs, Y))
    results = {}
    with mp.workdps(dps):
        a = mpf_exact(a)
        sigma0 = real(sig(a, 0), "sigma0")
        p0 = real(pi0(a, 0), "p0")

        def y_of(R, sigma):
            return mp.findroot(lambda y: sig(R, y) - sigma, (mp.mpf(0), mp.mpf("1e-3")), solver="secant")

        def rddot(R, y, p):
            return (p - pi0(R, y)) / pi1(R, y)

        def flux(R, sigma, p):
            y = y_of(R, sigma)
            return mp.re(sigR(R, y) + 2 * sigY(R, y) * rddot(R, y, p)) + (D - 2) * (sigma + p) / R

        results["flux_static"] = flux(a, sigma0, p0)
        r_off = a * mp.mpf("1.05")  # a moving state away from the static one: Rdot^2 = 0.01
        results["flux_off"] = flux(r_off, real(sig(r_off, mp.mpf("0.01")), "sigma"), p0 + mp.mpf("0.003"))
        for b2 in beta2s:
            b2 = mp.mpf(b2)

            def F(R, sigma):
                y = y_of(R, sigma)
                return mp.re(sigR(R, y) + 2 * sigY(R, y) * rddot(R, y, p0 + b2 * (sigma - sigma0)))

            s1 = F(a, sigma0)
            s2 = mp.diff(F, (a, sigma0), (1, 0)) + mp.diff(F, (a, sigma0), (0, 1)) * s1

            def V(R):
                return -y_of(R, sigma0 + s1 * (R - a) + s2 * (R - a) ** 2 / 2)

            v2 = mp.diff(V, a, 2)
            lin = 2 * (mp.diff(lambda R: pi0(R, 0), a) - b2 * sigR(a, 0)) / pi1(a, 0)
            results[float(b2)] = dict(V0=V(a), V1=mp.diff(V, a, 1), V2=v2, V2_lin=real(lin, "V2_lin"))
    results.update(sigma0=sigma0, p0=p0)
    return results


# ----------------------------------------------------------------------------------------------------------
# Independent checks that are not golden values
# ----------------------------------------------------------------------------------------------------------
def check_flat_sphere():
    """A round sphere r = R in flat space with outward normal has K^theta_theta = +1/R > 0."""
    for D in (4, 5):
        d = derive_side(D, 1, sp.S(1), sp.S(1), 1, 1)
        k = d["K"][1, 1].subs({Rs: 3, Rd: 0, Rdd: 0})
        check(f"D={D} flat sphere, outward normal: K^th_th = {k} > 0", k > 0 and sp.simplify(k - sp.Rational(1, 3)) == 0)


def check_dust_shell(case, moving):
    """Israel 1966 / Poisson 2004 ch. 3: flat inside, Schwarzschild M outside, M = m sqrt(1 + Rdot^2) - m^2/(2R)
    with m = 4 pi R^2 sigma (from memory; holds for any surface pressure since it is the angular equation)."""
    R, Rdot = mpf_exact(case["R"]), mpf_exact(case["Rdot"])
    m_s = 4 * mp.pi * R**2 * (-moving["S_ss"])
    M = m_s * mp.sqrt(1 + Rdot**2) - m_s**2 / (2 * R)
    check("dust-shell mass relation (Israel 1966)", abs(M - case["parameters"]["m"]) < mp.mpf(10) ** -40, f"M = {mp.nstr(M, 20)}")


def check_textbook_static(built, case, static):
    """Static 4D shell, textbook form recalled in the physics notes: sigma0 = -(1/4 pi a) sum zeta sqrt(B),
    p0 = (1/8 pi a) sum zeta sqrt(B) (1 + a A'/(2A)) (zeta = +1 keeps r > a, -1 keeps r < a)."""
    a = mpf_exact(case["a"])
    sig, p = mp.mpf(0), mp.mpf(0)
    for side in ("minus", "plus"):
        zeta = 1 if case[side]["keep"] == "outer" else -1
        A, B = built["sides"][side]["A"], built["sides"][side]["B"]
        Bv = mp.mpf(sp.N(B.subs(r, sp.Rational(case["a"])), 60))
        Av = mp.mpf(sp.N(A.subs(r, sp.Rational(case["a"])), 60))
        dAv = mp.mpf(sp.N(sp.diff(A, r).subs(r, sp.Rational(case["a"])), 60))
        sig += -zeta * mp.sqrt(Bv) / (4 * mp.pi * a)
        p += zeta * mp.sqrt(Bv) * (1 + a * dAv / (2 * Av)) / (8 * mp.pi * a)
    ok = abs(sig + static["S_ss"]) < 1e-40 and abs(p - static["S_thth"]) < 1e-40
    check("static sigma0, p0 agree with the textbook 4D form in the notes", ok)


def check_poisson_visser(case, pot):
    """Poisson & Visser 1995 (Phys. Rev. D 52, 7318), as recalled in the physics notes: for the Schwarzschild
    thin-shell wormhole beta^2_crit = -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a)(1 - 3M/a))."""
    a, M = mpf_exact(case["a"]), mpf_exact(case["parameters"]["m"])
    v0, v1 = pot[0.0]["V2"], pot[1.0]["V2"]
    slope = v1 - v0
    denom = 2 * (1 - 2 * M / a) * (1 - 3 * M / a)
    if abs(denom) < 1e-30:
        check(f"a = {case['a']}: V'' independent of beta^2 (photon sphere, no critical beta^2)", abs(slope) < 1e-35,
              f"dV''/dbeta^2 = {mp.nstr(slope, 5)}, V'' = {mp.nstr(v0, 20)}")
        return
    crit = -v0 / slope
    recalled = -(1 - 3 * M / a + 3 * M**2 / a**2) / denom
    check(f"a = {case['a']}: Poisson-Visser critical beta^2", abs(crit - recalled) < 1e-35,
          f"derived {mp.nstr(crit, 25)}, recalled {mp.nstr(recalled, 25)}; stable for beta^2 "
          f"{'>' if slope > 0 else '<'} beta^2_crit")


# ----------------------------------------------------------------------------------------------------------
# Main
# ----------------------------------------------------------------------------------------------------------
def to_float(x):
    return float(mp.mpf(x))


def rel_diff(x, y):
    return abs(x - y) / max(abs(y), mp.mpf(10) ** -30)


def main():
    mp.mp.dps = DPS
    print("Flat-space sign convention:")
    check_flat_sphere()
    out_cases = []
    worst = mp.mpf(0)
    for case in CASES:
        print(f"{case['id']}:")
        built = build_case(case)
        moving = evaluate_state(built, case["R"], case["Rdot"], case["Rddot"], DPS, checks=True)
        moving80 = evaluate_state(built, case["R"], case["Rdot"], case["Rddot"], 80)
        worst = max([worst] + [rel_diff(moving[k], moving80[k]) for k in moving])
        entry = {k: case[k] for k in ("id", "note", "dimension", "shell", "parameters")}
        for side in ("minus", "plus"):
            spec = {k: case[side][k] for k in ("A", "B", "keep")}
            spec["normal_sign"] = built["sides"][side]["nu"]
            entry[side] = spec
        entry.update(R=case["R"], Rdot=case["Rdot"], Rddot=case["Rddot"])
        entry.update({k: to_float(v) for k, v in moving.items()})
        if case["id"] == "flat-schw-standard":
            check_dust_shell(case, moving)
        if "a" in case:
            static = evaluate_state(built, case["a"], 0.0, 0.0, DPS)
            static80 = evaluate_state(built, case["a"], 0.0, 0.0, 80)
            worst = max([worst] + [rel_diff(static[k], static80[k]) for k in ("S_ss", "S_thth")])
            st = {"a": case["a"], "S_ss": to_float(static["S_ss"]), "S_thth": to_float(static["S_thth"])}
            if built["D"] == 4 and case["shell"] == "timelike":
                check_textbook_static(built, case, static)
            if case["shell"] == "timelike":
                pot = potential_second_derivative(built, case["a"], [0, 1])
                pot80 = potential_second_derivative(built, case["a"], [0, 1], dps=80)
                same_ab = all(sp.simplify(sd["A"] - sd["B"]) == 0 for sd in built["sides"].values())
                fs, fo = pot["flux_static"], pot["flux_off"]
                tol = mp.mpf(10) ** -35
                if same_ab:
                    check("A = B: flux term vanishes (static and off-static points)", abs(fs) < tol and abs(fo) < tol)
                else:
                    check("A != B: flux term present", abs(fo) > 1e-6, f"Xi(off-static) = {mp.nstr(fo, 10)}")
                check("sigma0, p0 match the static S values",
                      abs(pot["sigma0"] + static["S_ss"]) < tol and abs(pot["p0"] - static["S_thth"]) < tol)
                for b2 in (0.0, 1.0):
                    q = pot[b2]
                    check(f"beta^2={b2:g}: V(a) = 0, V'(a) = 0", abs(q["V0"]) < tol and abs(q["V1"]) < 1e-30,
                          f"(V' = {mp.nstr(q['V1'], 3)})")
                    check(f"beta^2={b2:g}: V'' by potential route = linearised route",
                          rel_diff(q["V2"], q["V2_lin"]) < 1e-30, f"V'' = {mp.nstr(q['V2'], 25)}")
                    worst = max(worst, rel_diff(q["V2"], pot80[b2]["V2"]))
                    st[f"V2_beta2_{int(b2)}"] = to_float(q["V2"])
                if case["id"].startswith("schw-wormhole"):
                    check_poisson_visser(case, pot)
            entry["static"] = st
        out_cases.append(entry)
    print(f"largest relative difference between 50- and 80-digit evaluations: {mp.nstr(worst, 3)}")
    check("golden values stable to at least 30 significant digits", worst < 1e-30)
    doc = {"generator": GENERATOR, "sympy": sp.__version__, "cases": out_cases}
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")
    print(f"wrote {OUT} ({len(out_cases)} cases); {check.failures} failed checks")
    return 1 if check.failures else 0


if __name__ == "__main__":
    sys.exit(main())
