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
