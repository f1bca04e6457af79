"""Bad input raises a junctura exception whose message names the file and line:column (or the parameter)
and carries the hint."""

import pytest

import junctura

GRAVASTAR = "scenarios/gravastar-linear.toml"


def test_toml_syntax_error_names_file_line_and_column(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text('name = "x"\n[parameters]\nm = \n')
    with pytest.raises(junctura.InputError) as e:
        junctura.Scenario.load(bad)
    assert f"{bad}:3:5" in str(e.value)
    assert e.value.hint and "scenario format" in e.value.hint
    assert isinstance(e.value, ValueError) and isinstance(e.value, junctura.JuncturaError)


def test_expression_error_points_into_the_file():
    text = open(GRAVASTAR).read().replace('A = "1 - 2*m/r"', 'A = "1 - 2*m/"')
    with pytest.raises(junctura.InputError) as e:
        junctura.Scenario.from_toml(text, path="edited.toml")
    line = next(i for i, ln in enumerate(text.splitlines(), 1) if "2*m/" in ln)
    assert f"edited.toml:{line}:" in e.value.message


def test_unknown_parameter_is_named_with_a_suggestion():
    sc = junctura.Scenario.load(GRAVASTAR)
    with pytest.raises(junctura.InputError, match="unknown parameter 'ww'") as e:
        sc.set(ww=0.5)
    assert "'w'" in str(e.value)


def test_missing_file_is_an_io_error():
    with pytest.raises(junctura.IoError) as e:
        junctura.Scenario.load("/nonexistent/scenario.toml")
    assert "/nonexistent/scenario.toml" in str(e.value) and isinstance(e.value, OSError)


def test_radius_inside_a_horizon_is_a_numerical_error():
    sc = junctura.Scenario.load("scenarios/reissner-nordstrom-wormhole.toml")
    with pytest.raises(junctura.NumericalError, match="minus side"):
        sc.derive(1.0)


def test_bad_arguments_are_input_errors():
    sc = junctura.Scenario.load(GRAVASTAR)
    with pytest.raises(junctura.InputError, match="expected 4 fields"):
        sc.sweep("w:0.3:1.2")
    with pytest.raises(junctura.InputError, match="both 'radius'"):
        sc.map("radius:2:3:4", ("radius", 2, 3, 4))
    with pytest.raises(junctura.InputError, match="one of kick"):
        sc.evolve(3.06, 10.0)
    with pytest.raises(junctura.InputError, match="positive"):
        sc.derive(-1.0)
    with pytest.raises(junctura.InputError, match="direction 'up'"):
        sc.geodesic(4.0, 1.1, direction="up")


def test_bad_dict_names_the_generated_toml_line():
    d = {"name": "x", "minus": {"A": "1", "keep": "sideways"}, "plus": {"A": "1", "keep": "outer"}}
    with pytest.raises(junctura.InputError) as e:
        junctura.Scenario.from_dict(d)
    assert "<dict>:" in e.value.message and "sideways" in e.value.hint + e.value.message


def test_chain_file_error_names_the_file(tmp_path):
    bad = tmp_path / "c.toml"
    bad.write_text('name = "c"\ncrossings = 3\n[particle]\nenergy = 0.9\n')
    with pytest.raises(junctura.InputError, match="missing field `stage`") as e:
        junctura.chain(bad)
    assert f"{bad}:1:1" in str(e.value) and "[[stage]]" in e.value.hint
