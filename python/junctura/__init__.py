"""junctura from Python: thin shells between two static spherically symmetric spacetimes.

Load a scenario, change parameters, run the library's analyses and get results as objects with attribute
access and NumPy arrays, figures that a notebook displays, and exceptions that name the bad input::

    import junctura
    sc = junctura.Scenario.load("scenarios/gravastar-linear.toml")
    st = sc.statics()
    st.static_radii.radius          # array([2.2898..., 3.0637...])
    st.static_radii.stability       # ['unstable', 'stable']
    st.figure("potential")          # shown as SVG/PNG in a notebook

Every method runs the same library code as the command-line program (``junctura statics ... --format json``
gives the same numbers as ``st.to_dict()``); long work releases the GIL. Radius ranges are ``from_`` and
``to`` (the command line's ``--from`` / ``--to``).
"""

import sys

from . import _native
from ._results import Figure, MapResult, Record, Result, Table
from .errors import InputError, IoError, JuncturaError, NumericalError

__version__ = _native.VERSION

__all__ = [
    "Scenario",
    "chain",
    "merge",
    "Figure",
    "MapResult",
    "Record",
    "Result",
    "Table",
    "JuncturaError",
    "InputError",
    "NumericalError",
    "IoError",
]


def _axis(value, what):
    """An axis given as "NAME:LO:HI:N" or as a tuple (name, lo, hi, n)."""
    if isinstance(value, str):
        return value
    try:
        name, lo, hi, n = value
    except (TypeError, ValueError):
        raise InputError(f"{what} {value!r}: expected 'NAME:LO:HI:N' or (name, lo, hi, n)",
                         f"e.g. {what}=('radius', 2.1, 6.0, 100)") from None
    return f"{name}:{float(lo)!r}:{float(hi)!r}:{int(n)}"


def _pair(value, what):
    if value is None or isinstance(value, str):
        return value
    try:
        lo, hi = value
    except (TypeError, ValueError):
        raise InputError(f"{what} {value!r}: expected (lo, hi) or 'LO:HI'", f"e.g. {what}=(0, 2)") from None
    return f"{float(lo)!r}:{float(hi)!r}"


def _progress(progress, what):
    """None/False: silent; True: a line on stderr; a callable: called as progress(done, total)."""
    if not progress:
        return None
    if callable(progress):
        return progress

    def show(done, total):
        sys.stderr.write(f"\r{what} {done}/{total}")
        if done >= total:
            sys.stderr.write("\n")
        sys.stderr.flush()

    return show


def _result(name, raw):
    return Result(name, raw["result"], raw.get("figures"))


class Scenario:
    """A validated scenario. Create it with :meth:`load`, :meth:`from_toml` or :meth:`from_dict`; change
    parameters with :meth:`set` (in place) or :meth:`with_params` (a copy)."""

    __slots__ = ("_m",)

    def __init__(self, model):
        if not isinstance(model, _native.Model):
            raise TypeError("use Scenario.load(path), Scenario.from_toml(text) or Scenario.from_dict(d)")
        self._m = model

    # --- construction -------------------------------------------------------------------------------------
    @classmethod
    def load(cls, path):
        """Read and validate a scenario file (TOML)."""
        return cls(_native.Model.load(str(path)))

    @classmethod
    def from_toml(cls, text, path=None):
        """Validate scenario text; ``path`` (optional) names it in messages and in the provenance line."""
        return cls(_native.Model.parse(text, None if path is None else str(path)))

    @classmethod
    def from_dict(cls, data, path=None):
        """A scenario from a dict shaped like the file, e.g.
        ``{"name": "...", "parameters": {"m": 1.0}, "minus": {"A": "1", "keep": "inner"}, ...}``."""
        model, _text = _native.Model.from_dict(data, None if path is None else str(path))
        return cls(model)

    def set(self, **params):
        """Set parameters in place (``sc.set(w=0.5, m=1)``); returns the scenario."""
        for k, v in params.items():
            self._m.set(k, float(v))
        return self

    def with_params(self, **params):
        """A copy with parameters changed; the original is left as it was."""
        return Scenario(self._m.copy()).set(**params)

    def copy(self):
        """An independent copy."""
        return Scenario(self._m.copy())

    # --- what it is ---------------------------------------------------------------------------------------
    @property
    def name(self):
        return self._m.name

    @property
    def dimension(self):
        return self._m.dimension

    @property
    def shell_kind(self):
        return self._m.shell_kind

    @property
    def params(self):
        """Parameters as a dict (file order)."""
        return dict(self._m.params)

    @property
    def provenance(self):
        """Scenario, hash, parameters and tool version, as written into every output."""
        return self._m.provenance

    @property
    def source(self):
        """The scenario text (for ``from_dict``: the TOML written from the dict)."""
        return self._m.source

    @property
    def path(self):
        return self._m.path

    def __repr__(self):
        ps = ", ".join(f"{k}={v!r}" for k, v in self.params.items())
        return f"Scenario({self.name!r}, D={self.dimension}, {self.shell_kind}; {ps})"

    # --- analyses ------------------------------------------------------------------------------------------
    def check(self, from_=None, to=None):
        """Survey both sides over a radius range: horizons, R-/T-regions, circular photon orbits."""
        return _result("CheckResult", self._m.check(from_, to))

    def derive(self, radius, velocity=0.0, acceleration=0.0):
        """Junction quantities at one shell state: sigma, p (or S^l_l, S^theta_theta), potential, mass, energy
        conditions, stability, and the formulas (``formulas``: text and LaTeX)."""
        return _result("DeriveResult", self._m.derive(float(radius), float(velocity), float(acceleration)))

    def closed_forms(self, state="static", width="column", numbered=True):
        """Exact closed forms of the junction quantities in this scenario's metric, parameters symbolic.
        ``state="static"``: sigma0(a), p0(a), the energy-condition combinations, shell mass, flux term, V(a),
        c0, c1 and beta^2_crit; ``"moving"``: sigma, p (or S^l_l, S^theta_theta) at R, Rdot, Rddot.
        ``quantities`` lists each one (``id``, ``lhs``, ``text``, ``sympy``, ``latex``); ``text``, ``sympy``
        (a snippet that defines every quantity with SymPy) and ``latex`` (an amsmath ``align`` block laid out
        for ``width``: ``"column"``, ``"page"`` or centimetres) hold the whole set."""
        return _result("ClosedForms", self._m.closed_forms(str(state), str(width), bool(numbered)))

    def statics(self, from_=None, to=None):
        """Every static radius of the equation of state in a radius range, each with its linear stability.
        Figure: ``potential``."""
        return _result("StaticsResult", self._m.statics(from_, to))

    def tune(self, solve, radius=None, marginal=False, from_=None, to=None, within=None):
        """Solve for parameter ``solve`` that puts a static shell at ``radius``, or (``marginal=True``) for
        static marginally stable shells with the radius in ``from_..to``; ``within=(lo, hi)`` bounds the
        search."""
        raw = self._m.tune(solve, radius, marginal, from_, to, _pair(within, "within"))
        return _result("TuneResult", raw)

    def sweep(self, vary, from_=None, to=None, progress=False):
        """Follow every branch of static radii as one parameter varies: ``vary=("w", 0.3, 1.2, 46)`` or
        ``"w:0.3:1.2:46"`` (N values, both ends included). Figure: ``sweep``."""
        raw = self._m.sweep(_axis(vary, "vary"), from_, to, _progress(progress, "sweep"))
        return _result("SweepResult", raw)

    def map(self, x, y, beta2=None, from_=None, to=None, progress=False):
        """A two-parameter map of static shells (axes ``radius``, ``beta2`` or a parameter), as 2-D arrays;
        see :class:`MapResult`. Figure: ``map``."""
        raw = self._m.map(_axis(x, "x"), _axis(y, "y"), beta2, from_, to, _progress(progress, "map"))
        return MapResult(raw)

    def map_summary(self, x, y, beta2=None, from_=None, to=None):
        """Counts only (no cells kept): the numbers of ``map --summary``."""
        return _result("MapSummary", self._m.map_summary(_axis(x, "x"), _axis(y, "y"), beta2, from_, to))

    def evolve(
        self,
        radius,
        duration,
        kick=None,
        velocity=None,
        sigma=None,
        direction=None,
        from_static=False,
        stop_at_horizon=False,
        max_turns=20,
        ensemble=None,
    ):
        """Integrate the shell's nonlinear motion in proper time, through horizons, from exactly one start:
        ``velocity`` (at ``radius`` with dR/dtau = velocity, its sign the direction), ``sigma`` (at ``radius``
        with that surface energy density; ``direction="inward"|"outward"``), ``kick`` (at rest at
        ``radius + kick``, ``radius`` a static radius of the law) or ``from_static=True`` (at the static radius
        ``radius``, at rest or with ``velocity``). ``stop_at_horizon=True`` stops where a side's horizon is
        reached; ``ensemble=(n, spread)`` adds n kicks in [-spread, spread] (static-radius starts only).
        ``samples`` is the time series (columns ``tau``, ``radius``, ``rdot``, ``sigma``, ``pressure``,
        ``constraint`` as arrays; ``n_r`` has two columns, the radial normal on the minus and plus side);
        ``events`` lists horizon crossings, turning points and normal flips. Figures: ``evolve_radius``,
        ``evolve_phase``."""
        ens = None if ensemble is None else (int(ensemble[0]), float(ensemble[1]))
        fl = lambda v: None if v is None else float(v)  # noqa: E731
        raw = self._m.evolve(
            float(radius),
            float(duration),
            fl(kick),
            fl(velocity),
            fl(sigma),
            direction,
            bool(from_static),
            bool(stop_at_horizon),
            int(max_turns),
            ens,
        )
        return Result("EvolveResult", raw["result"], raw["figures"], {"samples": raw["samples"]})

    def geodesic(self, radius, energy, null=False, shell_velocity=0.0, direction=None):
        """A radial test particle (or light ray, ``null=True``) with Killing energy ``energy`` on the minus
        side crossing the shell at ``radius``; ``direction`` = "inward" / "outward" on the minus side."""
        raw = self._m.geodesic(float(radius), float(energy), bool(null), float(shell_velocity), direction)
        return _result("GeodesicResult", raw)

    # --- figures -------------------------------------------------------------------------------------------
    def sigma_pressure_figure(self, from_=None, to=None):
        """sigma0(a) and p0(a) with energy-condition bands (default range: where a static shell can sit)."""
        return Figure(self._m.sigma_pressure_figure(from_, to))

    def figure(self, name, **kwargs):
        """A figure by name, running its analysis with ``kwargs``: ``potential`` (statics), ``sigma_pressure``,
        ``map``, ``sweep``, ``evolve_radius`` / ``evolve`` and ``evolve_phase`` (evolve)."""
        if name == "sigma_pressure":
            return self.sigma_pressure_figure(**kwargs)
        runs = {
            "potential": (self.statics, "potential"),
            "map": (self.map, "map"),
            "sweep": (self.sweep, "sweep"),
            "evolve": (self.evolve, "evolve_radius"),
            "evolve_radius": (self.evolve, "evolve_radius"),
            "evolve_phase": (self.evolve, "evolve_phase"),
        }
        if name not in runs:
            raise InputError(f"figure {name!r}: unknown", f"one of: sigma_pressure, {', '.join(runs)}")
        run, fig = runs[name]
        res = run(**kwargs)
        if fig not in res.figures:
            raise NumericalError(f"figure {name!r}: nothing to draw for this scenario (no static radius?)")
        return res.figures[fig]


def chain(path=None, text=None, crossings=None, mass=None, within=None):
    """Iterate shell crossings over a chain file (or its ``text``): ``mass`` (e.g. "1Msun") adds lengths in
    metres, ``within`` (e.g. "1lP", "1e-3M") reports the first crossing that close to the horizon. The result's
    ``csv`` attribute is the command line's CSV table. Figures: ``chain_distance``, ``chain_energy`` where
    defined."""
    raw = _native.chain(None if path is None else str(path), text, crossings, mass, within)
    return Result("ChainResult", raw["result"], raw["figures"], {"csv": raw["csv"]})


def merge(parts, out):
    """Join the parts of a sharded map (``junctura map --shard K/N``): the part metadata files ``parts``
    (``map.part-K-of-N.json``, in any order; the ``.csv`` beside each is read too) into the folder ``out`` as
    ``map.csv``, ``map.json`` and the map figure, exactly the files of the unsharded run. Every part is checked
    before anything is written; a refused part raises :class:`InputError` with ``field`` "parts" and the file
    (or the shards present) as ``value``. The result has ``parts`` (in shard order), ``map`` (the merged
    metadata, with the summed ``summary``) and ``written`` (the files written)."""
    raw = _native.merge([str(p) for p in parts], str(out))
    return _result("MergeResult", raw)
