# %% [markdown]
# # A thin-shell gravastar from Python
#
# The README's worked example, as notebook cells (`# %%`; Jupyter, VS Code and jupytext open it as a notebook,
# and `python python/examples/gravastar.py [FOLDER]` runs it as a script, saving the figures into FOLDER).
# A de Sitter core (keeps r < a) inside a Schwarzschild exterior (keeps r > a), the shell obeying p = w sigma:
# two static radii, a = 2.2898 (unstable) and a = 3.0638 (stable).

# %%
import pathlib
import sys

import numpy as np

import junctura

here = pathlib.Path(__file__).resolve().parent
sc = junctura.Scenario.load(here.parents[1] / "scenarios" / "gravastar-linear.toml")
print(sc)

# %% Every static radius of the law, each with its linear stability.
st = sc.statics()
radii = st.static_radii
for r in radii:
    print(f"a0 = {r.radius:.4f}  sigma0 = {r.sigma:.6f}  p0 = {r.pressure:.6f}  "
          f"V''(a0) = {r.potential_second_derivative:+.6f}  -> {r.stability}")

# %% The columns are NumPy arrays.
print("static radii:", np.round(radii.radius, 4), "stability:", radii.stability)
print("beta^2_crit:", radii.beta2_critical)

# %% The junction quantities at the stable radius, with the formulas as text (LaTeX in `.latex`).
d = sc.derive(radii.radius[1])
for f in d.formulas:
    print(f"{f.name}: {f.text}")

# %% Stability over (a, beta^2): 2-D arrays indexed [iy, ix], with the axis vectors.
m = sc.map(("radius", 2.05, 7.7, 120), ("beta2", -2.0, 2.0, 90))
print(m)
stable_fraction = m.class_mask("stable").mean()
print(f"stable cells: {stable_fraction:.1%}")

# %% The stable shell after a 1% kick oscillates with the linear period 2 pi / sqrt(V''/2).
a0 = float(radii.radius[1])
ev = sc.evolve(a0, duration=80.0, kick=0.01 * a0)
print(f"fate: {ev.fate}, measured period {ev.measured_period.value:.4f}, linear {ev.linear_period:.4f}")

# %% Figures display in a notebook (they have _repr_svg_ / _repr_png_); here they are saved when a folder is given.
figures = {
    "potential": st.figure("potential"),
    "sigma_pressure": sc.sigma_pressure_figure(),
    "map": m.figure("map"),
    "evolve_radius": ev.figure("evolve_radius"),
}
if len(sys.argv) > 1:
    for name, fig in figures.items():
        for path in fig.save(sys.argv[1], name):
            print("wrote", path)
