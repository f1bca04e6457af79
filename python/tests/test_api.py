"""Shapes and dtypes of the array fields, scenario construction and parameters, figures, and the version."""

import numpy as np
import pytest

import junctura

GRAVASTAR = "scenarios/gravastar-linear.toml"


def _is_svg(text):
    """An SVG document: optional XML declaration, then the svg root element."""
    head = text.lstrip()
    if head.startswith("<?xml"):
        head = head[head.index("?>") + 2 :].lstrip()
    return head.startswith("<svg")


def test_map_arrays_are_2d_with_axis_vectors():
    m = junctura.Scenario.load(GRAVASTAR).map(("radius", 2.1, 6.0, 31), ("beta2", -1.0, 1.5, 12))
    assert m.x.shape == (31,) and m.y.shape == (12,)
    assert m.x.dtype == np.float64 and m.y.dtype == np.float64
    assert m.x[0] == 2.1 and m.x[-1] == 6.0 and m.y[0] == -1.0 and m.y[-1] == 1.5
    for name in ["sigma", "pressure", "radius", "beta2", "potential_second_derivative", "beta2_critical"]:
        a = getattr(m, name)
        assert a.shape == (12, 31) and a.dtype == np.float64, name
    for name in ["classes", "energy_bits", "n_static"]:
        a = getattr(m, name)
        assert a.shape == (12, 31) and a.dtype == np.uint8, name
    assert m.class_names == ["stable", "unstable", "marginal", "no_static_shell", "inside_horizon"]
    assert m.x_name == "radius" and m.y_name == "beta2"
    # On a (radius, beta2) map the radius of a cell is its x value and beta2 its y value.
    assert np.array_equal(m.radius, np.broadcast_to(m.x, (12, 31)))
    assert np.array_equal(m.beta2, np.broadcast_to(m.y[:, None], (12, 31)))
    # Stable cells are those with V'' > 0 (the class is the sign of V'').
    assert np.array_equal(m.class_mask("stable"), m.potential_second_derivative > 0)
    assert m.energy_condition("null").dtype == bool
    assert m.summary.cells == 31 * 12
    assert "MapResult(radius x beta2: 31 x 12 cells" in repr(m)


def test_record_and_table_fields_are_arrays():
    st = junctura.Scenario.load(GRAVASTAR).statics()
    radii = st.static_radii
    assert len(radii) == 2
    assert radii.radius.dtype == np.float64 and radii.radius.shape == (2,)
    assert radii.double_root.dtype == bool
    assert radii.potential.shape == (2, 2)  # V and V' at each static radius
    assert radii.stability == ["unstable", "stable"]
    assert radii[1].stability == "stable" and radii[1].radius == radii.radius[1]
    assert radii.energy_conditions.weak.dtype == bool
    assert len(st.poles_rejected) == 0 and np.asarray(st.poles_rejected).shape == (0,)
    d = st.to_dict()
    assert isinstance(d["static_radii"][0]["potential"], list)
    assert "StaticsResult(" in repr(st) and "static_radii=" in repr(st)
    with pytest.raises(AttributeError, match="no field 'radii'"):
        st.radii  # noqa: B018


def test_sweep_evolve_chain_arrays():
    sc = junctura.Scenario.load(GRAVASTAR)
    sw = sc.sweep(("w", 0.3, 1.2, 10))
    assert sw.values.shape == (10,) and sw.values.dtype == np.float64
    pts = sw.branches[0].points
    assert pts.radius.dtype == np.float64 and len(pts.radius) == len(pts)
    a0 = float(sc.statics().static_radii.radius[1])
    ev = sc.evolve(a0, 60.0, kick=0.01)
    assert ev.turning_points.tau.dtype == np.float64
    assert np.all(np.diff(ev.turning_points.tau) > 0)
    ch = junctura.chain("scenarios/chains/bounce-chain.toml", crossings=12)
    assert ch.rows.crossing.dtype == np.int64 and ch.rows.crossing.shape == (12,)
    assert ch.rows.energy_plus.dtype == np.float64


def test_set_with_params_and_dict():
    sc = junctura.Scenario.load(GRAVASTAR)
    other = sc.with_params(w=0.45)
    assert sc.params["w"] == 0.6 and other.params["w"] == 0.45
    assert sc.set(w=0.5) is sc and sc.params["w"] == 0.5
    d = {
        "name": "Thin-shell gravastar, linear law",
        "parameters": {"m": 1.0, "l": 0.05, "w": 0.6},
        "minus": {"A": "1 - l*r^2/3", "keep": "inner"},
        "plus": {"A": "1 - 2*m/r", "keep": "outer"},
        "shell": {"pressure": "w*sigma"},
    }
    from_dict = junctura.Scenario.from_dict(d)
    assert list(from_dict.params) == ["m", "l", "w"]
    a = from_dict.statics().static_radii.radius
    b = junctura.Scenario.load(GRAVASTAR).statics().static_radii.radius
    assert np.array_equal(a, b)
    text = open(GRAVASTAR).read()
    assert np.array_equal(junctura.Scenario.from_toml(text).statics().static_radii.radius, b)


def test_derive_carries_formula_strings():
    d = junctura.Scenario.load(GRAVASTAR).derive(3.0)
    f = d.formulas  # one row per formula: name, text, LaTeX
    assert len(f) > 0 and all(isinstance(t, str) and t for t in f.text + f.latex)
    sigma = f[f.name.index("sigma")]
    assert "\\sigma" in sigma.latex and "sigma" in sigma.text


def test_figures_render_svg_png_pdf(tmp_path):
    sc = junctura.Scenario.load(GRAVASTAR)
    fig = sc.statics().figure("potential")
    svg = fig._repr_svg_()
    assert _is_svg(svg) and "Thin-shell gravastar" in fig.provenance
    assert fig._repr_png_()[:8] == b"\x89PNG\r\n\x1a\n"
    assert fig.pdf()[:5] == b"%PDF-"
    assert _is_svg(sc.sigma_pressure_figure().svg())
    for name, kw in [("map", {"x": "radius:2.1:6:20", "y": "beta2:-1:1:10"}), ("sweep", {"vary": "w:0.3:1.2:8"}),
                     ("evolve", {"radius": 3.063772328317274, "duration": 40.0, "kick": 0.01}),
                     ("evolve_phase", {"radius": 3.063772328317274, "duration": 40.0, "kick": 0.01})]:
        assert _is_svg(sc.figure(name, **kw).svg()), name
    written = fig.save(tmp_path)
    assert sorted(p.rsplit(".", 1)[1] for p in written) == ["pdf", "png", "svg"]


def test_progress_callback_is_called():
    calls = []
    junctura.Scenario.load(GRAVASTAR).sweep("w:0.3:1.2:6", progress=lambda d, t: calls.append((d, t)))
    assert calls and calls[-1][0] == calls[-1][1]
    calls.clear()
    junctura.Scenario.load(GRAVASTAR).map("radius:2.1:6:200", "beta2:-1:1:3", progress=lambda d, t: calls.append(d))
    assert len(calls) > 1 and calls == sorted(calls) and calls[-1] == 200


def test_version_is_the_library_version():
    sc = junctura.Scenario.load(GRAVASTAR)
    assert sc.provenance.startswith(f"junctura {junctura.__version__} |")


def test_chain_figures_and_nested_columns():
    ch = junctura.chain("scenarios/chains/bounce-chain.toml", crossings=20, mass="1Msun")
    assert sorted(ch.figures) == ["chain_distance", "chain_energy"]
    assert _is_svg(ch.figure("chain_distance").svg())
    apex = ch.rows.apex  # a column of records is a table again
    assert apex.areal_distance.shape == (20,) and apex.areal_distance.dtype == np.float64
    assert ch.csv.startswith("# junctura ")
