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
    assert (e.value.file, e.value.line, e.value.column) == (str(bad), 3, 5)
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
    with pytest.raises(junctura.NumericalError, match="minus side") as e:
        sc.derive(1.0)
    assert e.value.radius == 1.0 and "minus side" in e.value.reason


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


def test_errors_carry_their_facts_as_data():
    sc = junctura.Scenario.load(GRAVASTAR)
    with pytest.raises(junctura.InputError) as e:
        sc.set(ww=0.5)
    assert (e.value.parameter, e.value.suggestion, e.value.field) == ("ww", "w", None)
    with pytest.raises(junctura.InputError) as e:
        sc.geodesic(-1.0, 1.1)
    assert (e.value.field, e.value.value) == ("radius", "-1")
    with pytest.raises(junctura.InputError) as e:
        sc.check(from_=5, to=3)
    assert (e.value.field, e.value.value) == ("from", "5")
    assert e.value.message == "the range from 5 to 3 is empty or not finite"
    with pytest.raises(junctura.InputError) as e:
        junctura.chain("scenarios/chains/bounce-chain.toml", mass="3parsec")
    assert (e.value.field, e.value.value) == ("mass", "3parsec")
    with pytest.raises(junctura.IoError) as e:
        junctura.Scenario.load("/nonexistent/scenario.toml")
    assert e.value.path == "/nonexistent/scenario.toml" and e.value.field is None


def test_messages_name_arguments_not_command_line_options():
    sc = junctura.Scenario.load(GRAVASTAR)
    bad = [
        lambda: sc.check(from_=0.0, to=3.0),
        lambda: sc.sweep("w:0.3:1.2:1"),
        lambda: sc.geodesic(4.0, float("nan")),
        lambda: sc.evolve(3.06, -1.0, kick=0.01),
        lambda: junctura.chain("scenarios/chains/bounce-chain.toml", crossings=0),
        lambda: junctura.chain("scenarios/chains/bounce-chain.toml", crossings=2, within="1lP"),
    ]
    for call in bad:
        with pytest.raises(junctura.JuncturaError) as e:
            call()
        assert " --" not in f" {e.value}", str(e.value)
