//! The SymPy-format closed forms against the independent first-principles SymPy derivation.
//!
//! `tests/reference/closed_forms.json` holds our closed forms (SymPy strings) for a set of cases; this test
//! checks that it is what the library prints now (regenerate it with
//! `JUNCTURA_WRITE_CLOSED_FORMS=1 cargo test --test closed_reference`). `tests/reference/closed_form_reference.py`
//! reads it, derives every quantity from first principles (junction_reference.py: Christoffel symbols ->
//! embedding -> normal -> K_ab -> Lanczos), compares values at 30 digits and, for metrics that are rational
//! functions of r, checks `simplify(ours - theirs) == 0`; its output `closed_forms_check.json` is read here.

use junctura::export::closed::render_all;
use junctura::junction::closed::{closed_forms, ClosedState};
use junctura::scenario::Scenario;
use serde_json::{json, Value};

/// (id, scenario text, radius, Rdot, Rddot): demo values, the check is the agreement.
const CASES: [(&str, &str, f64, f64, f64); 10] = [
    ("schwarzschild-wormhole", "[parameters]\nm = 1.0\n[minus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n", 4.0, 0.3, -0.1),
    ("rn-wormhole", "[parameters]\nm = 1.0\nq = 0.8\n[minus]\nA = \"1 - 2*m/r + q^2/r^2\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r + q^2/r^2\"\nkeep = \"outer\"\n", 3.5, 0.2, 0.05),
    ("gravastar", "[parameters]\nm = 1.0\nl = 0.05\n[minus]\nA = \"1 - l*r^2/3\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n", 3.0, 0.25, -0.05),
    ("flat-schwarzschild", "[parameters]\nm = 1.0\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n", 3.0, 0.4, -0.05),
    ("sds-wormhole", "[parameters]\nm = 1.0\nlam = 0.01\n[minus]\nA = \"1 - 2*m/r - lam*r^2/3\"\nkeep = \"outer\"\n[plus]\nA = \"1 - 2*m/r - lam*r^2/3\"\nkeep = \"outer\"\n", 4.0, 0.1, 0.02),
    ("hayward-core", "[parameters]\nm = 1.0\nl = 0.3\n[minus]\nA = \"1 - 2*m*r^2/(r^3 + 2*m*l^2)\"\nkeep = \"inner\"\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n", 4.0, 0.2, 0.03),
    ("redshift-flat-inside", "[parameters]\nm = 1.0\nb = 0.3\nq = 0.4\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"(1 - 2*m/r)*exp(-2*b/r)\"\nB = \"1 - 2*m/r + q^2/r^2\"\nkeep = \"outer\"\n", 3.0, 0.35, -0.07),
    ("tangherlini-wormhole-5d", "dimension = 5\n[parameters]\nmu = 1.0\n[minus]\nA = \"1 - mu/r^2\"\nkeep = \"outer\"\n[plus]\nA = \"1 - mu/r^2\"\nkeep = \"outer\"\n", 2.0, 0.3, -0.04),
    ("tangherlini-flat-6d", "dimension = 6\n[parameters]\nmu = 1.0\n[minus]\nA = \"1\"\nkeep = \"inner\"\n[plus]\nA = \"1 - mu/r^3\"\nkeep = \"outer\"\n", 2.0, 0.3, 0.06),
    ("spacelike-bh-wh", "[parameters]\nm1 = 1.0\nm2 = 1.5\n[minus]\nA = \"1 - 2*m1/r\"\nkeep = \"black-hole\"\n[plus]\nA = \"1 - 2*m2/r\"\nkeep = \"white-hole\"\n[shell]\nkind = \"spacelike\"\n", 1.2, 0.4, 0.1),
];

fn reference(name: &str) -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/reference").join(name)
}

fn current() -> Value {
    let mut cases = Vec::new();
    for (id, body, r, rdot, rddot) in CASES {
        let s = Scenario::parse(&format!("name = \"{id}\"\n{body}"), None).unwrap();
        let side = |sd: &junctura::scenario::Side| json!({"A": sd.a.source(), "B": sd.b.source(), "keep": sd.keep.name(), "normal_sign": sd.normal_sign()});
        let params: serde_json::Map<String, Value> =
            s.params.names().iter().zip(s.params.values()).map(|(n, v)| (n.clone(), json!(v))).collect();
        let mut forms = serde_json::Map::new();
        for (key, state) in [("static", ClosedState::Static), ("moving", ClosedState::Moving)] {
            let cf = closed_forms(&s, state).unwrap();
            let q: serde_json::Map<String, Value> =
                render_all(&cf, &s.symbols).into_iter().map(|r| (r.id, json!(r.sympy))).collect();
            forms.insert(key.into(), json!({"radius": cf.radius, "quantities": q}));
        }
        cases.push(json!({
            "id": id, "dimension": s.dimension, "shell": s.shell.kind.name(), "parameters": params,
            "minus": side(&s.minus), "plus": side(&s.plus), "R": r, "Rdot": rdot, "Rddot": rddot,
            "closed_forms": forms,
        }));
    }
    json!({"generator": "tests/closed_reference.rs (JUNCTURA_WRITE_CLOSED_FORMS=1)", "cases": cases})
}

#[test]
fn committed_closed_forms_are_what_the_library_prints() {
    let now = current();
    let path = reference("closed_forms.json");
    if std::env::var_os("JUNCTURA_WRITE_CLOSED_FORMS").is_some() {
        std::fs::write(&path, serde_json::to_string_pretty(&now).unwrap() + "\n").unwrap();
    }
    let committed: Value = serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    assert_eq!(committed, now, "closed forms changed: re-run with JUNCTURA_WRITE_CLOSED_FORMS=1 and the SymPy script");
}

#[test]
fn closed_forms_match_the_first_principles_sympy_derivation() {
    // Source: tests/reference/closed_form_reference.py (SymPy 1.14, first-principles derivation).
    let check: Value =
        serde_json::from_str(&std::fs::read_to_string(reference("closed_forms_check.json")).unwrap()).unwrap();
    let forms: Value = serde_json::from_str(&std::fs::read_to_string(reference("closed_forms.json")).unwrap()).unwrap();
    assert_eq!(check["input"], forms, "closed_forms_check.json was made from other closed forms: re-run the script");
    let mut values = 0;
    let mut exact = 0;
    for case in check["cases"].as_array().unwrap() {
        let id = case["id"].as_str().unwrap();
        let rational = case["rational"].as_bool().unwrap();
        for q in case["quantities"].as_array().unwrap() {
            let what = format!("{id} {} {}", q["state"], q["id"]);
            assert!(q["values_agree"].as_bool().unwrap(), "{what}: ours {} vs SymPy {}", q["ours"], q["theirs"]);
            values += 1;
            if rational {
                assert_eq!(q["simplify_zero"].as_bool(), Some(true), "{what}: simplify(ours - theirs) != 0");
                exact += 1;
            }
        }
    }
    assert!(values >= 80 && exact >= 60, "{values} values, {exact} exact");
}
