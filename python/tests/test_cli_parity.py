"""The Python results are the command-line program's results: for every shipped scenario, the same keys and
the same numbers as `junctura COMMAND ... --format json` (both run the same library code)."""

import csv
import json
import math
import pathlib

import numpy as np
import pytest

import junctura
from conftest import SCENARIOS, same, usable_radius

IDS = [p.name for p in SCENARIOS]


def rel(p):
    return str(p.relative_to(p.parents[1]))


@pytest.mark.parametrize("path", SCENARIOS, ids=IDS)
def test_check_derive_statics_match_the_cli(path, cli_json):
    p = rel(path)
    sc = junctura.Scenario.load(p)
    want = cli_json("check", p, "--from", "0.05", "--to", "50")
    same(sc.check(from_=0.05, to=50).to_dict(), want)
    timelike = want["shell_kind"] == "timelike"
    r = usable_radius(want, timelike)
    assert r is not None, p
    same(sc.derive(r).to_dict(), cli_json("derive", p, "--radius", repr(r)))
    if timelike and "pressure" in sc.source:
        same(sc.statics().to_dict(), cli_json("statics", p))


@pytest.mark.parametrize("path", SCENARIOS, ids=IDS)
def test_evolve_from_every_static_radius_matches_the_cli(path, cli_json):
    p = rel(path)
    sc = junctura.Scenario.load(p)
    if sc.shell_kind != "timelike" or "pressure" not in sc.source:
        pytest.skip("no equation of state: no static radius to start from")
    radii = sc.statics().static_radii.radius
    for a0 in radii:
        want = cli_json("evolve", p, "--radius", repr(float(a0)), "--kick", "1e-4", "--duration", "20")
        same(sc.evolve(float(a0), 20.0, kick=1e-4).to_dict(), want)


@pytest.mark.parametrize("path", SCENARIOS, ids=IDS)
def test_geodesic_matches_the_cli(path, cli_json):
    p = rel(path)
    sc = junctura.Scenario.load(p)
    chk = sc.check(from_=0.05, to=50).to_dict()
    r = usable_radius(chk, sc.shell_kind == "timelike")
    for extra, kw in [((), {}), (("--null",), {"null": True})]:
        want = cli_json("geodesic", p, "--radius", repr(r), "--energy", "1.05", *extra)
        same(sc.geodesic(r, 1.05, **kw).to_dict(), want)


def test_moving_shell_crossing_matches_the_cli(cli_json):
    p = "scenarios/star-shell.toml"
    want = cli_json("geodesic", p, "--radius", "4", "--energy", "1.1", "--shell-velocity", "-0.3", "--direction",
                    "inward")
    got = junctura.Scenario.load(p).geodesic(4.0, 1.1, shell_velocity=-0.3, direction="inward")
    same(got.to_dict(), want)


def test_tune_and_sweep_match_the_cli(cli_json):
    p = "scenarios/schwarzschild-wormhole-linear.toml"
    sc = junctura.Scenario.load(p)
    same(sc.tune("w", radius=4.0).to_dict(), cli_json("tune", p, "--solve", "w", "--radius", "4"))
    same(sc.tune("w", radius=4.0, within=(-2, 0)).to_dict(),
         cli_json("tune", p, "--solve", "w", "--radius", "4", "--within=-2:0"))
    g = "scenarios/gravastar-linear.toml"
    sg = junctura.Scenario.load(g)
    same(sg.sweep(("w", 0.3, 1.2, 19)).to_dict(), cli_json("sweep", g, "--vary", "w:0.3:1.2:19"))
    same(sg.sweep("w:0.3:1.2:19").to_dict(), cli_json("sweep", g, "--vary", "w:0.3:1.2:19"))


def test_set_matches_the_cli_set(cli_json):
    p = "scenarios/gravastar-linear.toml"
    sc = junctura.Scenario.load(p).with_params(w=0.45, l=0.04)
    same(sc.statics().to_dict(), cli_json("statics", p, "--set", "w=0.45", "--set", "l=0.04"))


def test_map_arrays_and_metadata_match_the_cli_files(cli, tmp_path):
    p = "scenarios/gravastar-linear.toml"
    cli("map", p, "--x", "radius:2.1:6:23", "--y", "beta2:-1:1.5:17", "--out", tmp_path)
    m = junctura.Scenario.load(p).map(("radius", 2.1, 6, 23), "beta2:-1:1.5:17")
    got, want = m.to_dict(), json.loads((tmp_path / "map.json").read_text())
    # The row count and SHA-256 of map.csv describe the file (merge verifies parts with them); the arrays
    # in memory have no file.
    assert want["data_rows"] == 23 * 17 and len(want["data_sha256"]) == 64
    for key in ["data_rows", "data_sha256"]:
        want.pop(key)
        got.pop(key, None)
    same(got, want)
    lines = [ln for ln in (tmp_path / "map.csv").read_text().splitlines() if not ln.startswith("#")]
    rows = list(csv.reader(lines))[1:]  # columns: ix, iy, x, y, radius, sigma, p, beta2, V'', beta2_crit, class, ...
    assert len(rows) == 23 * 17
    num = lambda s: math.nan if s == "" else float(s)  # noqa: E731
    cols = [m.radius, m.sigma, m.pressure, m.beta2, m.potential_second_derivative, m.beta2_critical]
    for row in rows:
        ix, iy = int(row[0]), int(row[1])
        assert m.x[ix] == float(row[2]) and m.y[iy] == float(row[3])
        for k, arr in enumerate(cols):
            a, b = arr[iy, ix], num(row[4 + k])
            assert (math.isnan(a) and math.isnan(b)) or a == b, (k, ix, iy, a, b)
        assert m.class_names[m.classes[iy, ix]] == row[10]
        for j, cond in enumerate(["null", "weak", "strong", "dominant"]):
            if row[11 + j]:
                assert bool(m.energy_condition(cond)[iy, ix]) == (row[11 + j] == "true")
        assert m.n_static[iy, ix] == int(row[15])


def test_map_summary_matches_the_cli(cli):
    p = "scenarios/reissner-nordstrom-wormhole.toml"
    out = cli("map", p, "--x", "radius:1.2:5:40", "--y", "beta2:-2:2:30", "--summary")
    got = junctura.Scenario.load(p).map_summary("radius:1.2:5:40", ("beta2", -2, 2, 30))
    same(got.to_dict(), json.loads(out.stdout))
    m = junctura.Scenario.load(p).map("radius:1.2:5:40", ("beta2", -2, 2, 30))
    assert int(m.class_mask("stable").sum()) == got.stable_cells


def test_chain_matches_the_cli(cli, cli_json):
    p = "scenarios/chains/bounce-chain.toml"
    want = cli_json("chain", p, "--crossings", "40", "--mass", "1Msun")
    got = junctura.chain(p, crossings=40, mass="1Msun")
    same(got.to_dict(), want)
    assert got.csv == cli("chain", p, "--crossings", "40", "--mass", "1Msun", "--format", "csv").stdout
    assert np.all(np.diff(got.rows.crossing) == 1)


def test_evolve_time_series_matches_the_cli_csv(cli):
    p = "scenarios/gravastar-linear.toml"
    args = ["--radius", "3.063772328317274", "--kick", "0.01", "--duration", "50"]
    out = cli("evolve", p, *args, "--format", "csv").stdout
    rows = [ln.split(",") for ln in out.splitlines() if ln and not ln.startswith("#")][1:]
    ev = junctura.Scenario.load(p).evolve(3.063772328317274, 50.0, kick=0.01)
    s = ev.samples
    assert len(s) == len(rows) > 10
    got = np.column_stack([s.tau, s.radius, s.rdot, s.sigma, s.pressure, s.constraint, s.n_r])
    assert got.dtype == np.float64
    assert np.array_equal(got, np.array(rows, dtype=float))


@pytest.mark.parametrize("path", SCENARIOS, ids=IDS)
def test_closed_forms_match_the_cli(path, cli, cli_json):
    p = rel(path)
    sc = junctura.Scenario.load(p)
    for state in ["static", "moving"]:
        cf = sc.closed_forms(state=state)
        want = cli_json("closed-form", p, "--state", state)
        got = cf.to_dict()
        for key in ["text", "sympy", "latex"]:
            got.pop(key)
        same(got, want)
        assert cf.text == cli("closed-form", p, "--state", state).stdout
        assert cf.sympy == cli("closed-form", p, "--state", state, "--format", "sympy").stdout
        for width, numbered in [("column", True), ("11", False)]:
            tex = cli(
                "closed-form", p, "--state", state, "--format", "latex", "--width", width,
                "--numbering", "on" if numbered else "off",
            ).stdout
            assert sc.closed_forms(state=state, width=width, numbered=numbered).latex == tex


@pytest.mark.parametrize(
    "path,args,kw",
    [
        ("scenarios/dust-collapse.toml", ["--velocity", "0"], {"velocity": 0.0}),
        ("scenarios/charged-dust-bounce.toml", ["--sigma", "0.000954929658551372", "--direction", "inward"],
         {"sigma": 0.000954929658551372, "direction": "inward"}),
        ("scenarios/dust-collapse.toml", ["--velocity", "-0.2", "--stop-at-horizon"],
         {"velocity": -0.2, "stop_at_horizon": True}),
    ],
)
def test_evolve_from_any_start_matches_the_cli(path, args, kw, cli_json):
    want = cli_json("evolve", path, "--radius", "5", "--duration", "30", *args)
    same(junctura.Scenario.load(path).evolve(5.0, 30.0, **kw).to_dict(), want)


def test_merge_joins_cli_shards_into_the_whole_maps_files(cli, tmp_path):
    p = "scenarios/reissner-nordstrom-wormhole.toml"
    axes = ["--x", "radius:1.7:6:13", "--y", "q:0:0.95:7", "--beta2", "-1"]
    cli("map", p, *axes, "--out", tmp_path / "whole")
    for k in [1, 2, 3]:
        cli("map", p, *axes, "--shard", f"{k}/3", "--out", tmp_path / "parts")
    parts = [tmp_path / "parts" / f"map.part-{k}-of-3.json" for k in [3, 1, 2]]
    r = junctura.merge(parts, tmp_path / "merged")
    # The independent path: the whole map's counts computed at once by `map --summary`.
    whole = json.loads(cli("map", p, *axes, "--summary").stdout)
    for key, n in r.map.summary.to_dict().items():
        assert n == whole[key], key
    assert r.parts == [str(tmp_path / "parts" / f"map.part-{k}-of-3.json") for k in [1, 2, 3]]
    assert [pathlib.Path(f).name for f in r.written] == ["map.csv", "map.json", "map.svg", "map.pdf", "map.png"]
    for f in ["map.csv", "map.json", "map.svg"]:
        assert (tmp_path / "merged" / f).read_bytes() == (tmp_path / "whole" / f).read_bytes(), f


def test_merge_refuses_a_missing_part_naming_the_parts(cli, tmp_path):
    p = "scenarios/schwarzschild-wormhole-linear.toml"
    for k in [1, 3]:
        cli("map", p, "--x", "m:0.5:2:4", "--y", "w:-0.9:-0.6:4", "--shard", f"{k}/3", "--out", tmp_path)
    with pytest.raises(junctura.InputError) as e:
        junctura.merge([tmp_path / "map.part-3-of-3.json", tmp_path / "map.part-1-of-3.json"], tmp_path / "m")
    assert e.value.message == "merge needs all 3 parts exactly once; got parts 1, 3"
    assert (e.value.field, e.value.value) == ("parts", "1, 3")
    assert "--" not in str(e.value) and "shard K/N" in e.value.hint
    assert not (tmp_path / "m" / "map.csv").exists()
