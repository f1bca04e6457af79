//! JSON: the result structs as pretty-printed objects (their `Serialize` form), with the few results whose JSON
//! shape differs from their struct (`tune`, `closed-form`).

use super::{Item, Renderer};
use crate::junction::closed::{ClosedForms, ClosedState};
use crate::scenario::Symbols;
use crate::statics::tune::TuneReport;

/// Pretty JSON: every command offers it.
pub struct Json;

impl Renderer for Json {
    fn render(&self, item: &Item<'_>) -> Option<String> {
        Some(match item {
            Item::Survey(r) => pretty(r),
            Item::Derive { report, .. } => pretty(report),
            Item::ClosedForms { forms, symbols, provenance, .. } => pretty(&closed(forms, symbols, provenance)) + "\n",
            Item::Statics(r) => pretty(r),
            Item::Tune(r) => pretty(&tune(r)),
            Item::Sweep(r) => pretty(r),
            Item::Evolve(r) => pretty(r),
            Item::Crossing(r) => pretty(r),
            Item::Chain(r) => pretty(r),
        })
    }
}

/// Pretty JSON of any result (never fails for our plain structs; an error object if it did).
pub fn pretty<T: serde::Serialize + ?Sized>(v: &T) -> String {
    serde_json::to_string_pretty(v).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"))
}

/// `tune`: each solution carries the parameter under its own name.
pub fn tune(r: &TuneReport) -> serde_json::Value {
    let sols: Vec<serde_json::Value> = r
        .solutions
        .iter()
        .map(|s| {
            let mut m = serde_json::Map::new();
            m.insert("radius".into(), s.radius.into());
            m.insert(s.parameter.clone(), s.value.into());
            m.insert("potential_second_derivative".into(), s.potential_second_derivative.into());
            m.insert("stability".into(), s.stability.name().into());
            m.insert("sigma".into(), s.sigma.into());
            m.insert("pressure".into(), s.pressure.into());
            m.insert("residual".into(), s.residual.into());
            m.insert(
                "d_radius_d_parameter".into(),
                s.d_radius_d_parameter.map(serde_json::Value::from).unwrap_or(serde_json::Value::Null),
            );
            serde_json::Value::Object(m)
        })
        .collect();
    serde_json::json!({
        "scenario": crate::text::one_line(&r.scenario),
        "provenance": r.provenance,
        "parameter": r.parameter,
        "searched": r.searched,
        "solutions": sols,
        "notes": r.notes,
    })
}

/// `closed-form`: every quantity in every form, with the notes.
pub fn closed(cf: &ClosedForms, symbols: &Symbols, provenance: &str) -> serde_json::Value {
    serde_json::json!({
        "provenance": provenance,
        "dimension": cf.dimension,
        "shell_kind": cf.kind.name(),
        "state": match cf.state { ClosedState::Static => "static", ClosedState::Moving => "moving" },
        "radius": cf.radius,
        "notes": cf.notes,
        "quantities": super::closed::render_all(cf, symbols),
    })
}
