"""Shared helpers: the repository root, the command-line program (built with `cargo build` when missing) and a
deep comparison of Python results with the program's JSON output."""

import json
import math
import os
import pathlib
import subprocess

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]
SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))


def cli_binary():
    """The debug binary of the command-line program (JUNCTURA_BIN overrides); built if it is not there."""
    env = os.environ.get("JUNCTURA_BIN")
    if env:
        return pathlib.Path(env)
    exe = ROOT / "target" / "debug" / "junctura"
    if not exe.exists():
        subprocess.run(["cargo", "build", "--bin", "junctura"], cwd=ROOT, check=True)
    return exe


@pytest.fixture(scope="session")
def cli():
    exe = cli_binary()

    def run(*args, ok=True):
        out = subprocess.run([str(exe), *map(str, args)], cwd=ROOT, capture_output=True, text=True)
        if ok:
            assert out.returncode == 0, f"{args}: {out.stderr}"
        return out

    return run


@pytest.fixture(scope="session")
def cli_json(cli):
    def run(*args):
        return json.loads(cli(*args, "--format", "json").stdout)

    return run


@pytest.fixture(autouse=True)
def at_root(monkeypatch):
    """Run from the repository root, so relative scenario paths (and provenance lines) match the CLI's."""
    monkeypatch.chdir(ROOT)


def same(a, b, path="$"):
    """Assert two JSON-like values are equal: the same keys, the same numbers (NaN in Python where the JSON
    writes null for an undefined number)."""
    if isinstance(a, dict):
        assert isinstance(b, dict), f"{path}: {a!r} vs {b!r}"
        assert list(a) == list(b), f"{path}: keys {list(a)} vs {list(b)}"
        for k in a:
            same(a[k], b[k], f"{path}.{k}")
    elif isinstance(a, (list, tuple)):
        assert isinstance(b, (list, tuple)) and len(a) == len(b), f"{path}: {a!r} vs {b!r}"
        for i, (x, y) in enumerate(zip(a, b)):
            same(x, y, f"{path}[{i}]")
    elif isinstance(a, float) and math.isnan(a):
        assert b is None or (isinstance(b, float) and math.isnan(b)), f"{path}: NaN vs {b!r}"
    elif isinstance(b, float) and math.isnan(b):
        assert a is None, f"{path}: {a!r} vs NaN"
    else:
        assert type(a) is type(b) and a == b, f"{path}: {a!r} vs {b!r}"


def usable_radius(check, timelike):
    """A radius where a static shell of the scenario's kind can sit: the same rule as tests/cli.rs (the
    geometric middle of the first interval of the right region kind on both sides, at most 1.5 x its start)."""
    want = "r" if timelike else "t"

    def regions(side):
        return [(r["from"], r["to"]) for r in check[side]["regions"] if r["kind"] == want]

    for a0, a1 in regions("minus"):
        for b0, b1 in regions("plus"):
            lo, hi = max(a0, b0), min(a1, b1)
            if hi > lo * 1.01:
                return min(math.sqrt(lo * hi), lo * 1.5)
    return None
