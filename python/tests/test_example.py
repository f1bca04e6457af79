"""The example script runs and reproduces the README's worked gravastar example."""

import pathlib
import subprocess
import sys

EXAMPLE = pathlib.Path(__file__).resolve().parents[1] / "examples" / "gravastar.py"


def test_gravastar_example_reproduces_the_worked_example(tmp_path):
    out = subprocess.run([sys.executable, str(EXAMPLE), str(tmp_path)], capture_output=True, text=True, timeout=600)
    assert out.returncode == 0, out.stderr
    # The README's worked example (`junctura statics scenarios/gravastar-linear.toml`): 2.2898 unstable,
    # 3.0638 stable (demo values; Visser & Wiltshire 2004 for the construction).
    assert "a0 = 2.2898" in out.stdout and "-> unstable" in out.stdout
    assert "a0 = 3.0638" in out.stdout and "-> stable" in out.stdout
    assert "fate: oscillates" in out.stdout
    for name in ["potential", "sigma_pressure", "map", "evolve_radius"]:
        for ext in ["svg", "pdf", "png"]:
            assert (tmp_path / f"{name}.{ext}").stat().st_size > 0, (name, ext)
