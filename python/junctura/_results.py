"""Result objects: the library's results with attribute access, NumPy arrays for numbers, and figures.

Conversion rules (the same for every result, so new library fields appear without changes here):

- a JSON-like object becomes a :class:`Record` (``r.field``, ``r["field"]``, ``r.to_dict()``);
- a list of numbers (``None`` meaning "not defined" becomes NaN) becomes a 1-D ``float64`` array
  (``int64`` when every entry is an integer), a list of booleans a ``bool`` array, a list of equal-length
  number lists a 2-D ``float64`` array;
- a list of objects becomes a :class:`Table`: rows as records (``t[0].radius``), columns as arrays
  (``t.radius``); an empty list becomes an empty table, which acts as an empty array;
- other lists (of strings, say) stay lists.

``to_dict()`` gives the plain data with the same keys and numbers as the command-line program's JSON output
(NaN where that JSON writes ``null`` for a number that is not defined).
"""

import copy
import math
import numbers

import numpy as np


def _is_number(v):
    return v is None or (isinstance(v, numbers.Real) and not isinstance(v, bool))


def plain(value):
    """The data with tuples as lists (the shape JSON has), recursively."""
    if isinstance(value, dict):
        return {k: plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [plain(v) for v in value]
    return value


def wrap(name, value):
    """Convert a plain value into a record, table, array or itself (see the module docstring)."""
    if isinstance(value, dict):
        return Record(name, value)
    if isinstance(value, list):
        if not value:
            return Table(name, [])
        if all(isinstance(v, dict) for v in value):
            return Table(name, value)
        if all(isinstance(v, bool) for v in value):
            return np.array(value, dtype=bool)
        if all(_is_number(v) for v in value):
            if all(isinstance(v, numbers.Integral) for v in value):
                return np.array(value, dtype=np.int64)
            return np.array([math.nan if v is None else v for v in value], dtype=np.float64)
        if all(isinstance(v, list) and all(_is_number(x) for x in v) for v in value):
            if len({len(v) for v in value}) == 1:
                return np.array([[math.nan if x is None else x for x in v] for v in value], dtype=np.float64)
        return [wrap(name, v) for v in value]
    return value


def _short(v, depth=0):
    """A short representation for ``__repr__``."""
    if isinstance(v, np.ndarray):
        if v.size <= 6:
            return np.array2string(v, separator=", ", precision=6)
        return f"array(shape={v.shape}, dtype={v.dtype})"
    if isinstance(v, (Record, Table)):
        return v._repr(depth + 1)
    if isinstance(v, str) and len(v) > 60:
        return repr(v[:57] + "...")
    if isinstance(v, list) and len(v) > 4:
        return f"[{len(v)} items]"
    return repr(v)


class Record:
    """One result object: attribute access to its fields (``r.radius``), ``to_dict()``, readable ``repr``."""

    __slots__ = ("_name", "_data", "_cache")

    def __init__(self, name, data):
        object.__setattr__(self, "_name", name)
        object.__setattr__(self, "_data", data)
        object.__setattr__(self, "_cache", {})

    def __getattr__(self, key):
        try:
            return self[key]
        except KeyError:
            raise AttributeError(f"{self._name} has no field {key!r} (fields: {', '.join(self._data)})") from None

    def __getitem__(self, key):
        cache = self._cache
        if key not in cache:
            cache[key] = wrap(key, self._data[key])
        return cache[key]

    def __setattr__(self, key, value):
        raise AttributeError("results are read-only; use to_dict() for a mutable copy")

    def __contains__(self, key):
        return key in self._data

    def __dir__(self):
        return list(self._data) + ["to_dict", "keys"]

    def __eq__(self, other):
        return isinstance(other, Record) and self._data == other._data

    __hash__ = None

    def keys(self):
        """The field names, in the library's order."""
        return list(self._data)

    def to_dict(self):
        """The plain data (a deep copy): dicts, lists, numbers, strings, None."""
        return copy.deepcopy(self._data)

    def _repr(self, depth=0):
        if depth > 1:
            return f"{self._name}(...)"
        inner = ", ".join(f"{k}={_short(self[k], depth)}" for k in self._data)
        return f"{self._name}({inner})"

    def __repr__(self):
        return self._repr()


class Table:
    """A list of records of the same shape: ``t[i]`` is a :class:`Record`, ``t.column`` a NumPy array."""

    __slots__ = ("_name", "_rows", "_cache")

    def __init__(self, name, rows):
        self._name = name
        self._rows = rows
        self._cache = {}

    def __len__(self):
        return len(self._rows)

    def __getitem__(self, i):
        if isinstance(i, str):
            return self.column(i)
        if isinstance(i, slice):
            return Table(self._name, self._rows[i])
        return Record(self._name, self._rows[i])

    def __iter__(self):
        return (Record(self._name, r) for r in self._rows)

    def __getattr__(self, key):
        if key.startswith("_"):
            raise AttributeError(key)
        if self._rows and not all(key in r for r in self._rows):
            raise AttributeError(f"{self._name} rows have no field {key!r} (fields: {', '.join(self.columns)})")
        return self.column(key)

    def __array__(self, dtype=None, copy=None):
        if self._rows:
            raise TypeError(f"{self._name} is a table of records; take a column, e.g. .{self.columns[0]}")
        return np.empty(0, dtype=dtype or np.float64)

    def __dir__(self):
        return self.columns + ["column", "columns", "to_list"]

    @property
    def columns(self):
        """The field names of the rows."""
        return list(self._rows[0]) if self._rows else []

    def column(self, key):
        """One field of every row, converted like a list (numbers -> array); empty tables give an empty array."""
        if key not in self._cache:
            if not self._rows:
                self._cache[key] = np.empty(0, dtype=np.float64)
            else:
                self._cache[key] = wrap(key, [r.get(key) for r in self._rows])
        return self._cache[key]

    def to_list(self):
        """The plain rows (a deep copy)."""
        return copy.deepcopy(self._rows)

    def _repr(self, depth=0):
        if not self._rows:
            return "[]"
        return f"{self._name}[{len(self._rows)} rows: {', '.join(self.columns)}]"

    def __repr__(self):
        return self._repr()


class Figure:
    """A figure the library draws. ``svg()`` (text), ``png()``, ``pdf()`` (bytes); a notebook shows it."""

    def __init__(self, native):
        self._native = native
        self._svg = None
        self._png = None

    @property
    def name(self):
        """The figure's name (``potential``, ``sigma_pressure``, ``map``, ``sweep``, ``evolve_radius``, ...)."""
        return self._native.name

    @property
    def provenance(self):
        """Scenario, hash, parameters and tool version of the data drawn."""
        return self._native.provenance

    def svg(self):
        """SVG text, 8.5 cm wide, with the embedded font."""
        if self._svg is None:
            self._svg = self._native.svg()
        return self._svg

    def png(self):
        """PNG bytes at 300 dpi."""
        if self._png is None:
            self._png = self._native.png()
        return self._png

    def pdf(self):
        """PDF bytes (one page, vector curves)."""
        return self._native.pdf()

    def save(self, folder, stem=None):
        """Write ``stem``.svg/.pdf/.png into ``folder`` (default stem: the figure's name); returns the paths."""
        return self._native.save(str(folder), stem or self.name)

    def _repr_svg_(self):
        return self.svg()

    def _repr_png_(self):
        return self.png()

    def __repr__(self):
        return f"Figure({self.name!r})"


class Result(Record):
    """An analysis result: its fields as a :class:`Record`, plus ``figures`` (name -> :class:`Figure`)."""

    __slots__ = ("_figures", "_extras")

    def __init__(self, name, data, figures=None, extras=None):
        super().__init__(name, plain(data))
        object.__setattr__(self, "_figures", {k: Figure(v) for k, v in (figures or {}).items()})
        object.__setattr__(self, "_extras", {k: wrap(k, v) for k, v in (extras or {}).items()})

    def __getattr__(self, key):
        extras = object.__getattribute__(self, "_extras")
        if key in extras:
            return extras[key]
        return super().__getattr__(key)

    @property
    def figures(self):
        """The figures of this result, by name."""
        return dict(self._figures)

    def figure(self, name=None):
        """One figure by name (default: the first one)."""
        if not self._figures:
            raise KeyError(f"{self._name} has no figure")
        if name is None:
            return next(iter(self._figures.values()))
        return self._figures[name]

    def __dir__(self):
        return super().__dir__() + list(self._extras) + ["figures", "figure"]


class MapResult(Result):
    """A two-parameter map. 2-D arrays indexed ``[iy, ix]`` (shape ``(len(y), len(x))``):
    ``classes`` (uint8 codes, names in ``class_names``), ``sigma``, ``pressure``, ``radius``, ``beta2``,
    ``potential_second_derivative`` (V''), ``beta2_critical``, ``energy_bits`` (1 null, 2 weak, 4 strong,
    8 dominant), ``n_static``; axis vectors ``x``, ``y`` with names ``x_name``, ``y_name``; ``summary``
    (counts); the other fields (``spec``, ``provenance``, ...) are the map metadata the command line writes."""

    __slots__ = ("_arrays", "_extra")

    ARRAYS = (
        "class",
        "sigma",
        "pressure",
        "radius",
        "beta2",
        "potential_second_derivative",
        "beta2_critical",
        "energy_bits",
        "n_static",
    )

    def __init__(self, raw):
        super().__init__("MapResult", raw["result"], raw["figures"])
        object.__setattr__(self, "_arrays", raw["arrays"])
        object.__setattr__(
            self,
            "_extra",
            {
                "class_names": list(raw["class_names"]),
                "x_name": raw["x_name"],
                "y_name": raw["y_name"],
            },
        )

    def __getattr__(self, key):
        if key == "classes":
            return self._arrays["class"]
        if key in ("x", "y") or key in MapResult.ARRAYS:
            return self._arrays[key]
        if key in self._extra:
            return self._extra[key]
        return super().__getattr__(key)

    def class_mask(self, name):
        """Boolean 2-D array: cells of class ``name`` (one of ``class_names``)."""
        return self.classes == self.class_names.index(name)

    def energy_condition(self, name):
        """Boolean 2-D array: cells whose shell satisfies the ``null``, ``weak``, ``strong`` or ``dominant``
        energy condition."""
        bit = {"null": 1, "weak": 2, "strong": 4, "dominant": 8}[name]
        return (self.energy_bits & bit) != 0

    def arrays(self):
        """Every 2-D array and the axis vectors, by name."""
        return dict(self._arrays)

    def __dir__(self):
        return super().__dir__() + ["classes", "x", "y", *MapResult.ARRAYS, *self._extra, "class_mask",
                                    "energy_condition", "arrays"]

    def _repr(self, depth=0):
        ny, nx = self.classes.shape
        counts = ", ".join(f"{n}={int((self.classes == i).sum())}" for i, n in enumerate(self.class_names))
        return f"MapResult({self.x_name} x {self.y_name}: {nx} x {ny} cells; {counts})"
