//! Expression values and derivatives against an independent symbolic reference.
//!
//! Source: tests/reference/expr_reference.py (SymPy 1.14 symbolic differentiation), committed output
//! tests/reference/expr_golden.json. Re-run the script to regenerate the golden file; this test never runs Python.

use junctura::expr::Expr;
use serde_json::Value;

/// Relative tolerance for every check in this file (the library differentiates exactly with dual numbers, so
/// only rounding separates it from the 50-digit reference).
const REL_TOL: f64 = 1e-12;

fn golden() -> Value {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/reference/expr_golden.json");
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("cannot read {path}: {e}"));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("{path} is not valid JSON: {e}"))
}

fn num(v: &Value, what: &str) -> f64 {
    v.as_f64().unwrap_or_else(|| panic!("{what} is not a number: {v}"))
}

/// `got` within `REL_TOL` of `want`, relative to |want| (with a floor of 1e-15 for values that are exactly zero).
fn close(got: f64, want: f64) -> bool {
    (got - want).abs() <= REL_TOL * want.abs().max(1e-3) || (got - want).abs() <= 1e-15
}

#[test]
fn derivatives_match_symbolic_reference() {
    let doc = golden();
    let cases = doc["cases"].as_array().expect("golden file has a `cases` array");
    assert!(cases.len() >= 30, "expected the full reference set, found {} cases", cases.len());
    let mut failures = Vec::new();
    for case in cases {
        let src = case["expr"].as_str().expect("expr is a string");
        let var = case["var"].as_str().expect("var is a string");
        let params = case["params"].as_object().expect("params is an object");
        let names: Vec<String> = params.keys().cloned().collect();
        let values: Vec<f64> = params.iter().map(|(k, v)| num(v, k)).collect();
        let x = num(&case["x"], "x");
        let e = Expr::parse(src, var, &names).unwrap_or_else(|err| panic!("reference expression rejected:\n{err}"));
        let got = e.derivatives(x, &values);
        for (k, g) in got.iter().enumerate() {
            // Source: tests/reference/expr_reference.py (SymPy 1.14 symbolic differentiation)
            let want = num(&case[format!("d{k}")], "derivative");
            if !close(*g, want) {
                failures.push(format!("{src} at {var} = {x}: d{k} = {g:e}, reference {want:e}"));
            }
        }
        if let Some(dp) = case.get("dparam") {
            let name = dp["name"].as_str().expect("dparam.name is a string");
            let k = names.iter().position(|n| n == name).expect("dparam names a parameter of the case");
            // Source: tests/reference/expr_reference.py (SymPy 1.14 symbolic differentiation)
            let want = num(&dp["value"], "dparam.value");
            let g = e.param_derivative(x, &values, k);
            if !close(g, want) {
                failures.push(format!("{src} at {var} = {x}: d/d{name} = {g:e}, reference {want:e}"));
            }
        }
    }
    assert!(failures.is_empty(), "{} mismatches:\n{}", failures.len(), failures.join("\n"));
}

#[test]
fn reference_covers_every_function_and_operator() {
    let doc = golden();
    let all: String =
        doc["cases"].as_array().expect("cases").iter().filter_map(|c| c["expr"].as_str()).collect::<Vec<_>>().join(" ");
    for needle in
        ["sqrt(", "exp(", "log(", "sin(", "cos(", "tan(", "sinh(", "cosh(", "tanh(", "abs(", "pi", "^-", "-r^2", "/"]
    {
        assert!(all.contains(needle), "no reference expression uses `{needle}`");
    }
}
