"""A published value through the Python module."""

import pytest

import junctura


def test_poisson_visser_critical_beta2_at_four_m():
    # Poisson & Visser 1995, Phys. Rev. D 52, 7318: Schwarzschild thin-shell wormhole, the critical
    # beta^2 = -(1 - 3M/a + 3M^2/a^2) / (2 (1 - 2M/a) (1 - 3M/a)); at a = 4M it is -1.75, and the shell is
    # stable for beta^2 below it (a > 3M).
    m, a = 1.0, 4.0
    formula = -(1 - 3 * m / a + 3 * m**2 / a**2) / (2 * (1 - 2 * m / a) * (1 - 3 * m / a))
    assert formula == pytest.approx(-1.75, abs=1e-15)
    d = junctura.Scenario.load("scenarios/schwarzschild-wormhole-linear.toml").set(m=m).derive(a)
    assert d.beta2_critical == pytest.approx(formula, abs=1e-12)
    assert d.stable_when == "beta2_below"


def test_schwarzschild_wormhole_sigma0_closed_form_is_the_published_one():
    """sigma0 = -sqrt(1 - 2M/a) / (2 pi a) for the Schwarzschild thin-shell wormhole (Poisson & Visser 1995,
    eq. 9 with the shell at rest); the SymPy snippet of `closed_forms` is executed and compared exactly."""
    sympy = pytest.importorskip("sympy")
    cf = junctura.Scenario.load("scenarios/schwarzschild-wormhole-linear.toml").closed_forms()
    ns = {}
    exec(cf.sympy, ns)
    a, m = ns["a"], ns["m"]
    assert sympy.simplify(ns["sigma0"] + sympy.sqrt(1 - 2 * m / a) / (2 * sympy.pi * a)) == 0
    # and beta^2_crit, the form quoted in the test above
    published = -(1 - 3 * m / a + 3 * m**2 / a**2) / (2 * (1 - 2 * m / a) * (1 - 3 * m / a))
    assert sympy.simplify(ns["beta2_crit"] - published) == 0


def test_dust_shell_collapse_from_rest_reaches_the_horizon_and_the_centre():
    """A dust shell (flat inside, Schwarzschild M = 1 outside) released from rest at R = 10M: proper times to
    R = 2M and R = 0 from the conserved M = m sqrt(1 + Rdot^2) - m^2/(2R) (Israel 1966; Poisson 2004, sec. 3.9),
    integrated by quadrature at 40 digits in tests/reference/shell_motion_reference.py."""
    import json

    from conftest import ROOT

    ref = json.loads((ROOT / "tests/reference/shell_motion_golden.json").read_text())["dust"][0]
    assert ref["start_radius"] == 10.0 and ref["mass_M"] == 1.0
    ev = junctura.Scenario.load("scenarios/dust-collapse.toml").evolve(10.0, 100.0, velocity=0.0)
    kinds = [e.kind for e in ev.events]
    assert "horizon_crossing" in kinds and "center" in kinds
    crossing = ev.events[kinds.index("horizon_crossing")]
    assert crossing.radius == pytest.approx(2.0, rel=1e-9)
    assert crossing.tau == pytest.approx(ref["tau_to_horizon"], rel=1e-7)
    assert ev.events[kinds.index("center")].tau == pytest.approx(ref["tau_to_center"], rel=1e-7)
    # stopping at the horizon instead
    st = junctura.Scenario.load("scenarios/dust-collapse.toml").evolve(10.0, 100.0, velocity=0.0, stop_at_horizon=True)
    assert st.stop == "horizon" and st.tau_end == pytest.approx(ref["tau_to_horizon"], rel=1e-7)


def test_evolve_start_needs_exactly_one_option():
    sc = junctura.Scenario.load("scenarios/dust-collapse.toml")
    with pytest.raises(junctura.InputError, match="one of kick"):
        sc.evolve(10.0, 10.0, velocity=0.0, sigma=0.001)
    with pytest.raises(junctura.InputError, match="direction"):
        sc.evolve(10.0, 10.0, sigma=0.001, direction="up")
