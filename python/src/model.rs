//! `Model`: a validated scenario and every analysis of the library on it. Each method checks its arguments as
//! the command-line program does, runs the library with the GIL released, and returns the result as Python
//! objects (`pythonize` of the library's `Serialize` struct), with figures where the library draws one.

use crate::errors::IntoPyResult;
use crate::figure::Figure;
use junctura::geodesic::{Chain, ChainRequest, CrossingRequest, Direction, Particle};
use junctura::report::derive::{derive, State};
use junctura::report::map::{check_size, map_cells, map_spec};
use junctura::request::{parse_axis, parse_pair, range, RangeRequest};
use junctura::scan::{CellClass, Summary};
use junctura::scenario::Scenario;
use junctura::statics::sweep::sweep_with_progress;
use junctura::statics::tune::{tune_at_radius, tune_marginal};
use junctura::statics::{find_static_radii, StaticsOptions};
use junctura::{Error, RequestField};
use numpy::{PyArray1, PyArrayMethods};
use pyo3::prelude::*;
use pyo3::types::PyDict;
use std::path::PathBuf;

/// A validated scenario (parameters may be changed with `set`).
#[pyclass(module = "junctura._native")]
#[derive(Clone)]
pub struct Model {
    s: Scenario,
}

/// Serde value -> Python object (dicts, lists, floats, strings, None).
fn to_object<'py, T: serde::Serialize>(py: Python<'py>, v: &T) -> PyResult<Bound<'py, PyAny>> {
    pythonize::pythonize(py, v).map_err(PyErr::from)
}

/// A dict `{"result": ..., "figures": {name: Figure}, "notes": [...]}` returned by the analyses.
fn bundle<'py, T: serde::Serialize>(
    py: Python<'py>,
    result: &T,
    figures: Vec<(&str, junctura::plot::Figure)>,
) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("result", to_object(py, result)?)?;
    let f = PyDict::new(py);
    for (name, fig) in figures {
        f.set_item(name, Py::new(py, Figure::new(name, fig))?)?;
    }
    d.set_item("figures", f)?;
    Ok(d)
}

/// Call an optional Python progress callback `(done, total)`; its errors are printed, not raised.
fn report_progress(cb: Option<&Py<PyAny>>, done: usize, total: usize) {
    if let Some(cb) = cb {
        Python::attach(|py| {
            if let Err(e) = cb.call1(py, (done, total)) {
                e.print(py);
            }
        });
    }
}

fn finite(name: &str, v: f64) -> junctura::Result<f64> {
    if v.is_finite() {
        Ok(v)
    } else {
        Err(Error::input(format!("{name} {v} is not a finite number")))
    }
}

#[pymethods]
impl Model {
    /// Read and validate a scenario file.
    #[staticmethod]
    fn load(py: Python<'_>, path: PathBuf) -> PyResult<Model> {
        Ok(Model { s: Scenario::load(&path).py(py)? })
    }

    /// Validate scenario text (TOML); `path` names it in messages and provenance.
    #[staticmethod]
    #[pyo3(signature = (text, path=None))]
    fn parse(py: Python<'_>, text: &str, path: Option<PathBuf>) -> PyResult<Model> {
        Ok(Model { s: Scenario::parse(text, path).py(py)? })
    }

    /// A scenario from a Python dict shaped like the TOML file (`{"name": ..., "parameters": {...},
    /// "minus": {...}, ...}`); it is written as TOML (returned with the model, so messages can be traced to it)
    /// and validated like a file named `path` (default `<dict>`).
    #[staticmethod]
    #[pyo3(signature = (data, path=None))]
    fn from_dict(py: Python<'_>, data: &Bound<'_, PyAny>, path: Option<PathBuf>) -> PyResult<(Model, String)> {
        let value: toml::Value = pythonize::depythonize(data).map_err(|e| {
            crate::errors::to_py(
                py,
                Error::input(format!("scenario dict: {e}"))
                    .with_hint("use the TOML file's shape: strings, numbers, booleans and nested dicts"),
            )
        })?;
        let text = toml::to_string(&value).map_err(|e| {
            crate::errors::to_py(py, Error::input(format!("scenario dict: cannot be written as TOML: {e}")))
        })?;
        let path = path.unwrap_or_else(|| PathBuf::from("<dict>"));
        let s = Scenario::parse(&text, Some(path)).map_err(|e| {
            let hint = e.hint.clone().unwrap_or_default();
            e.with_hint(format!("{hint}\n  the dict as TOML (lines and columns refer to it):\n{text}"))
        });
        Ok((Model { s: s.py(py)? }, text))
    }

    /// Set a parameter (an unknown name is an InputError naming the known ones).
    fn set(&mut self, py: Python<'_>, name: &str, value: f64) -> PyResult<()> {
        let v = finite(name, value).py(py)?;
        self.s.params.set(name, v).py(py)
    }

    /// An independent copy.
    fn copy(&self) -> Model {
        self.clone()
    }

    /// Scenario name.
    #[getter]
    fn name(&self) -> &str {
        &self.s.name
    }

    /// Spacetime dimension D.
    #[getter]
    fn dimension(&self) -> u32 {
        self.s.dimension
    }

    /// `timelike` or `spacelike`.
    #[getter]
    fn shell_kind(&self) -> &'static str {
        self.s.shell.kind.name()
    }

    /// Parameters as (name, value) pairs in file order.
    #[getter]
    fn params(&self) -> Vec<(String, f64)> {
        self.s.params.names().iter().cloned().zip(self.s.params.values().iter().copied()).collect()
    }

    /// The provenance line (scenario, hash, parameters, tool version).
    #[getter]
    fn provenance(&self) -> String {
        self.s.provenance()
    }

    /// The scenario text as read.
    #[getter]
    fn source(&self) -> &str {
        &self.s.origin.text
    }

    /// The file the scenario came from, if any.
    #[getter]
    fn path(&self) -> Option<String> {
        self.s.origin.path.as_ref().map(|p| p.display().to_string())
    }

    /// Survey both sides (`check`).
    #[pyo3(signature = (from_=None, to=None))]
    fn check<'py>(&self, py: Python<'py>, from_: Option<f64>, to: Option<f64>) -> PyResult<Bound<'py, PyDict>> {
        let req = RangeRequest { from: from_, to };
        let r = py.detach(|| junctura::survey::check(&self.s, &req)).py(py)?;
        bundle(py, &r, vec![])
    }

    /// Junction quantities at one shell state (`derive`), formulas as text and LaTeX included.
    #[pyo3(signature = (radius, velocity=0.0, acceleration=0.0))]
    fn derive<'py>(
        &self,
        py: Python<'py>,
        radius: f64,
        velocity: f64,
        acceleration: f64,
    ) -> PyResult<Bound<'py, PyDict>> {
        for (name, v) in [("radius", radius), ("velocity", velocity), ("acceleration", acceleration)] {
            finite(name, v).py(py)?;
        }
        if radius <= 0.0 {
            return Err(Error::input(format!("radius {radius}: the areal radius must be positive"))).py(py);
        }
        let state = State { radius, velocity, acceleration };
        let r = py.detach(|| derive(&self.s, state).map_err(|e| e.context(self.s.origin.label()))).py(py)?;
        bundle(py, &r, vec![])
    }

    /// Exact closed forms of the junction quantities in the scenario's own metric (`closed-form`): every
    /// quantity as text, SymPy and one-line LaTeX (`quantities`), and the whole set as a text listing, a
    /// SymPy snippet and an amsmath `align` block laid out for `width` (`column`, `page` or centimetres).
    #[pyo3(signature = (state="static", width="column", numbered=true))]
    fn closed_forms<'py>(
        &self,
        py: Python<'py>,
        state: &str,
        width: &str,
        numbered: bool,
    ) -> PyResult<Bound<'py, PyDict>> {
        use junctura::export::closed as render;
        use junctura::junction::closed::{closed_forms, ClosedState};
        let state = match state {
            "static" => ClosedState::Static,
            "moving" => ClosedState::Moving,
            other => {
                return Err(Error::input(format!("state {other:?}: not \"static\" or \"moving\""))
                    .with_hint("state=\"static\" (sigma0(a), p0(a), V, c0, c1, ...) or state=\"moving\""))
                .py(py)
            }
        };
        let width_pt = render::parse_width(width).py(py)?;
        let s = &self.s;
        let cf = py.detach(|| closed_forms(s, state).map_err(|e| e.context(s.origin.label()))).py(py)?;
        let prov = s.provenance();
        let layout = render::LatexLayout { width_pt, numbered };
        let mut v = junctura::export::json::closed(&cf, &s.symbols, &prov);
        v["text"] = junctura::export::text::closed(&cf, &s.symbols, &prov).into();
        v["sympy"] = junctura::export::sympy::closed(&cf, &s.symbols, &prov).into();
        v["latex"] = junctura::export::latex::closed(&cf, &s.symbols, &layout, &prov).into();
        bundle(py, &v, vec![])
    }

    /// Every static radius of the law in a radius range (`statics`), with the potential figure.
    #[pyo3(signature = (from_=None, to=None))]
    fn statics<'py>(&self, py: Python<'py>, from_: Option<f64>, to: Option<f64>) -> PyResult<Bound<'py, PyDict>> {
        let (lo, hi) = range(from_, to, junctura::metric::default_range(&self.s)).py(py)?;
        let r = py.detach(|| find_static_radii(&self.s, lo, hi, &StaticsOptions::default())).py(py)?;
        let mut figs = vec![];
        if let Some(f) = junctura::report::figures::potential_figure(&self.s, &r) {
            figs.push(("potential", f));
        }
        bundle(py, &r, figs)
    }

    /// sigma0(a), p0(a) with energy-condition bands over `from_..to` (default: where a static shell can sit).
    #[pyo3(signature = (from_=None, to=None))]
    fn sigma_pressure_figure(&self, py: Python<'_>, from_: Option<f64>, to: Option<f64>) -> PyResult<Figure> {
        let default = junctura::report::bundle::plot_range(&self.s).ok_or_else(|| {
            Error::numerical("no radius where both sides are R-regions: no static timelike shell")
                .with_hint("give from_ and to")
        });
        let (lo, hi) = match (from_, to) {
            (Some(lo), Some(hi)) => range(Some(lo), Some(hi), (lo, hi)),
            _ => default.and_then(|d| range(from_, to, d)),
        }
        .py(py)?;
        let f = py.detach(|| junctura::report::figures::sigma_pressure_figure(&self.s, lo, hi));
        Ok(Figure::new("sigma_pressure", f))
    }

    /// Solve for a parameter (`tune`): a static shell at `radius`, or with `marginal` the static marginally
    /// stable configurations with the radius in `from_..to`. `within` = (lo, hi) or "LO:HI" bounds the search.
    #[pyo3(signature = (solve, radius=None, marginal=false, from_=None, to=None, within=None))]
    #[allow(clippy::too_many_arguments)]
    fn tune<'py>(
        &self,
        py: Python<'py>,
        solve: &str,
        radius: Option<f64>,
        marginal: bool,
        from_: Option<f64>,
        to: Option<f64>,
        within: Option<&str>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let within = within.map(|w| parse_pair(RequestField::Within, w)).transpose().py(py)?;
        let opts = StaticsOptions::default();
        let s = &self.s;
        let r = if marginal {
            let (lo, hi) = match (from_, to) {
                (Some(lo), Some(hi)) => range(Some(lo), Some(hi), (lo, hi)).py(py)?,
                _ => {
                    return Err(Error::input("marginal=True needs from_=LO and to=HI (the radius range)")
                        .with_hint("e.g. tune(\"w\", marginal=True, from_=2.1, to=6)"))
                    .py(py)
                }
            };
            py.detach(|| tune_marginal(s, solve, lo, hi, within, &opts).map_err(|e| e.context(s.origin.label())))
        } else {
            let a = radius
                .ok_or_else(|| {
                    Error::input("tune needs radius=R or marginal=True").with_hint("e.g. tune(\"w\", radius=4)")
                })
                .py(py)?;
            if !(a.is_finite() && a > 0.0) {
                return Err(Error::input(format!("radius {a}: the areal radius must be a positive number"))).py(py);
            }
            py.detach(|| tune_at_radius(s, solve, a, within, &opts).map_err(|e| e.context(s.origin.label())))
        }
        .py(py)?;
        // The same object as the command-line JSON (solutions keyed by the solved parameter's name).
        let v = junctura::export::json::tune(&r);
        bundle(py, &v, vec![])
    }

    /// Follow every branch of static radii as one parameter varies (`sweep`); `vary` is "NAME:LO:HI:N".
    #[pyo3(signature = (vary, from_=None, to=None, progress=None))]
    fn sweep<'py>(
        &self,
        py: Python<'py>,
        vary: &str,
        from_: Option<f64>,
        to: Option<f64>,
        progress: Option<Py<PyAny>>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let axis = parse_axis(RequestField::Vary, vary).py(py)?;
        if axis.n > 100_000 {
            return Err(Error::input(format!("vary {vary}: N = {} values is more than a sweep needs", axis.n))
                .with_hint("use at most 100000 values; for dense 2-D scans use map"))
            .py(py);
        }
        let (lo, hi) = range(from_, to, junctura::metric::default_range(&self.s)).py(py)?;
        let values = axis.values();
        let cb = progress.as_ref();
        let r = py
            .detach(|| {
                sweep_with_progress(&self.s, &axis.name, &values, lo, hi, &StaticsOptions::default(), &|d, t| {
                    report_progress(cb, d, t)
                })
            })
            .py(py)?;
        let fig = junctura::report::figures::sweep_figure(&r);
        bundle(py, &r, vec![("sweep", fig)])
    }

    /// A two-parameter map (`map`): axes "AXIS:LO:HI:N", every cell as 2-D arrays indexed [iy, ix].
    #[pyo3(signature = (x, y, beta2=None, from_=None, to=None, progress=None))]
    #[allow(clippy::too_many_arguments)]
    fn map<'py>(
        &self,
        py: Python<'py>,
        x: &str,
        y: &str,
        beta2: Option<f64>,
        from_: Option<f64>,
        to: Option<f64>,
        progress: Option<Py<PyAny>>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let s = &self.s;
        let spec = map_spec(s, x, y, beta2, from_, to).py(py)?;
        check_size(&spec, true).py(py)?;
        let cb = progress.as_ref();
        let cells = py.detach(|| map_cells(s, &spec, &|d, t| report_progress(cb, d, t))).py(py)?;
        let (nx, ny) = (spec.x.n, spec.y.n);
        let mut summary = Summary::default();
        for c in &cells {
            summary.add(c.class, c.energy_bits);
        }
        let fig = junctura::report::figures::map_figure(s.provenance(), &spec, &cells);
        let d = PyDict::new(py);
        let meta = junctura::export::map::meta(s, &spec, summary, None);
        d.set_item("result", to_object(py, &meta)?)?;
        let arrays = PyDict::new(py);
        macro_rules! grid {
            ($name:expr, $f:expr) => {
                let v: Vec<_> = cells.iter().map($f).collect();
                arrays.set_item($name, PyArray1::from_vec(py, v).reshape([ny, nx])?)?;
            };
        }
        grid!("class", |c| c.class as u8);
        grid!("sigma", |c| c.sigma);
        grid!("pressure", |c| c.pressure);
        grid!("radius", |c| c.radius);
        grid!("beta2", |c| c.beta2);
        grid!("potential_second_derivative", |c| c.v2);
        grid!("beta2_critical", |c| c.beta2_critical);
        grid!("energy_bits", |c| c.energy_bits);
        grid!("n_static", |c| c.n_static);
        arrays.set_item("x", PyArray1::from_vec(py, (0..nx).map(|i| spec.x.value(i)).collect()))?;
        arrays.set_item("y", PyArray1::from_vec(py, (0..ny).map(|i| spec.y.value(i)).collect()))?;
        d.set_item("arrays", arrays)?;
        d.set_item("class_names", CellClass::ALL.iter().map(|c| c.name()).collect::<Vec<_>>())?;
        d.set_item("x_name", &spec.x.name)?;
        d.set_item("y_name", &spec.y.name)?;
        let f = PyDict::new(py);
        f.set_item("map", Py::new(py, Figure::new("map", fig))?)?;
        d.set_item("figures", f)?;
        Ok(d)
    }

    /// Counts only (`map --summary`): streams, stores no cells.
    #[pyo3(signature = (x, y, beta2=None, from_=None, to=None))]
    fn map_summary<'py>(
        &self,
        py: Python<'py>,
        x: &str,
        y: &str,
        beta2: Option<f64>,
        from_: Option<f64>,
        to: Option<f64>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let s = &self.s;
        let spec = map_spec(s, x, y, beta2, from_, to).py(py)?;
        check_size(&spec, false).py(py)?;
        let v = py.detach(|| junctura::report::map::map_summary(s, &spec, 0..spec.n_lines())).py(py)?;
        bundle(py, &v, vec![])
    }

    /// The nonlinear motion of the shell (`evolve`), from exactly one start: `velocity` (at `radius` with
    /// dR/dtau = velocity), `sigma` (at `radius` with that surface energy density, `direction` "inward" or
    /// "outward"), `kick` (at rest at a0 + kick, a0 = `radius` a static radius of the law), or
    /// `from_static` (with `velocity`: at a0 with that dR/dtau; alone: at rest at a0). Crosses horizons unless
    /// `stop_at_horizon`; `ensemble` = (N, spread) adds N kicks in [-spread, spread]. `samples` holds the time
    /// series.
    #[pyo3(signature = (radius, duration, kick=None, velocity=None, sigma=None, direction=None, from_static=false,
        stop_at_horizon=false, max_turns=20, ensemble=None))]
    #[allow(clippy::too_many_arguments)]
    fn evolve<'py>(
        &self,
        py: Python<'py>,
        radius: f64,
        duration: f64,
        kick: Option<f64>,
        velocity: Option<f64>,
        sigma: Option<f64>,
        direction: Option<&str>,
        from_static: bool,
        stop_at_horizon: bool,
        max_turns: usize,
        ensemble: Option<(usize, f64)>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let start = EvolveStart { kick, velocity, sigma, direction, from_static, stop_at_horizon };
        let (rep, figs) = evolve_adapter(&self.s, py, radius, duration, start, max_turns, ensemble)?;
        let d = bundle(py, &rep, figs)?;
        // The time series (the CLI's CSV rows), outside `result` so that it stays the CLI's JSON.
        d.set_item("samples", to_object(py, &rep.samples)?)?;
        Ok(d)
    }

    /// A radial test particle (or light ray, `null=True`) crossing the shell at `radius` (`geodesic`).
    /// `direction` is "inward" or "outward" on the minus side (default: along the normal).
    #[pyo3(signature = (radius, energy, null=false, shell_velocity=0.0, direction=None))]
    fn geodesic<'py>(
        &self,
        py: Python<'py>,
        radius: f64,
        energy: f64,
        null: bool,
        shell_velocity: f64,
        direction: Option<&str>,
    ) -> PyResult<Bound<'py, PyDict>> {
        let direction = match direction {
            None => None,
            Some("inward") => Some(Direction::Inward),
            Some("outward") => Some(Direction::Outward),
            Some(d) => {
                return Err(Error::input(format!("direction '{d}': expected 'inward' or 'outward'"))).py(py);
            }
        };
        let req = CrossingRequest {
            radius,
            shell_velocity,
            energy_minus: energy,
            particle: if null { Particle::Null } else { Particle::Timelike },
            direction,
        };
        let r = py.detach(|| junctura::geodesic::report(&self.s, &req)).py(py)?;
        bundle(py, &r, vec![])
    }
}

/// The start of `evolve` as given from Python (the command's --kick, --velocity, --sigma, --direction,
/// --from-static, --stop-at-horizon).
pub(crate) struct EvolveStart<'a> {
    kick: Option<f64>,
    velocity: Option<f64>,
    sigma: Option<f64>,
    direction: Option<&'a str>,
    from_static: bool,
    stop_at_horizon: bool,
}

/// The one place that binds `evolve`: its options and report are expected to change, so they are translated
/// here only. Returns the report and its figures (R(tau) and the phase portrait).
fn evolve_adapter(
    s: &Scenario,
    py: Python<'_>,
    radius: f64,
    duration: f64,
    start: EvolveStart<'_>,
    max_turns: usize,
    ensemble: Option<(usize, f64)>,
) -> PyResult<(junctura::dynamics::EvolveReport, Vec<(&'static str, junctura::plot::Figure)>)> {
    use junctura::dynamics::{evolve, EvolveOptions, Start};
    for (name, v) in [
        (RequestField::Radius, Some(radius)),
        (RequestField::Duration, Some(duration)),
        (RequestField::Kick, start.kick),
        (RequestField::Velocity, start.velocity),
        (RequestField::Sigma, start.sigma),
        (RequestField::Spread, ensemble.map(|e| e.1)),
    ] {
        if let Some(v) = v {
            junctura::request::value(name, v).py(py)?;
        }
    }
    let outward = match start.direction {
        None => None,
        Some("outward") => Some(true),
        Some("inward") => Some(false),
        Some(d) => return Err(Error::input(format!("direction '{d}': expected 'inward' or 'outward'"))).py(py),
    };
    let Some(begin) = Start::from_options(start.kick, start.velocity, start.sigma, outward, start.from_static) else {
        return Err(Error::input("give one of kick=DA, velocity=V or sigma=S (or from_static=True)")
            .with_hint("e.g. velocity=0 (at rest at radius), sigma=0.01 with direction=\"inward\", or kick=0.01 about a static radius"))
        .py(py);
    };
    if max_turns == 0 {
        return Err(Error::input("max_turns=0: at least one turning point is needed").with_hint("e.g. max_turns=20"))
            .py(py);
    }
    let opts = EvolveOptions { max_turns, stop_at_horizon: start.stop_at_horizon, ..EvolveOptions::default() };
    let rep = py.detach(|| evolve(s, radius, begin, duration, ensemble, &opts)).py(py)?;
    let j = junctura::junction::Junction::new(s);
    let figs = vec![
        ("evolve_radius", junctura::report::evolve::radius_figure(&rep)),
        ("evolve_phase", junctura::report::evolve::phase_figure(&j, &rep)),
    ];
    Ok((rep, figs))
}

/// Iterate shell crossings over a chain file (`chain`); `mass` (e.g. "1Msun") adds lengths in metres,
/// `within` (e.g. "1lP", "1e-3M") reports the first crossing that close to the horizon.
#[pyfunction]
#[pyo3(signature = (path=None, text=None, crossings=None, mass=None, within=None))]
pub fn chain<'py>(
    py: Python<'py>,
    path: Option<PathBuf>,
    text: Option<&str>,
    crossings: Option<usize>,
    mass: Option<&str>,
    within: Option<&str>,
) -> PyResult<Bound<'py, PyDict>> {
    let c = match (text, &path) {
        (Some(t), p) => Chain::parse(t, p.as_deref()),
        (None, Some(p)) => Chain::load(p),
        (None, None) => Err(Error::input("chain needs a file path or its text")),
    }
    .py(py)?;
    let req = ChainRequest { crossings, mass: mass.map(String::from), within: within.map(String::from) };
    let r = py.detach(|| junctura::geodesic::chain(&c, &req)).py(py)?;
    let d = PyDict::new(py);
    d.set_item("result", to_object(py, &r)?)?;
    d.set_item("csv", junctura::export::csv::chain(&r.run, &r.provenance, r.unit.as_ref()))?;
    let f = PyDict::new(py);
    for (name, fig) in r.figures() {
        f.set_item(&name, Py::new(py, Figure::new(&name, fig))?)?;
    }
    d.set_item("figures", f)?;
    Ok(d)
}

/// Join the parts of a sharded map (`merge`): the part metadata files `parts` (map.part-K-of-N.json, in any
/// order; the .csv beside each is read too) into `out` as map.csv, map.json and the map figure. The result
/// holds the parts in shard order, the merged map's metadata (`map`, with the summed `summary`) and the files
/// written.
#[pyfunction]
pub fn merge<'py>(py: Python<'py>, parts: Vec<PathBuf>, out: PathBuf) -> PyResult<Bound<'py, PyDict>> {
    let figure = junctura::plot::FigureOptions::default();
    let r = py.detach(|| junctura::files::merge_parts(&parts, &out, &figure)).py(py)?;
    bundle(py, &r, vec![])
}
