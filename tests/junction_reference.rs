//! Every formula path of the junction module against an independent derivation from first principles:
//! `tests/reference/junction_reference.py` (SymPy: metric -> Christoffel symbols -> embedding -> unit normal ->
//! K_ab -> Lanczos equation, in the actual D-dimensional metric), whose output is committed as
//! `tests/reference/junction_golden.json`. Re-run the script to regenerate the golden values.
//!
//! Paths covered (see the "note" of each case): timelike standard (inner|outer), wormhole (outer|outer), closed
//! (inner|inner), outer|inner; A != B with the flux term; D = 5; spacelike transition surfaces in T-regions
//! (black-hole -> white-hole, different masses, A != B, D = 5); a timelike shell in a T-region with explicit
//! normal signs; moving and static states; V''(a0) at beta^2 = 0 and 1.

use junctura::junction::potential::Law;
use junctura::junction::Junction;
use junctura::scenario::Scenario;
use serde_json::Value;

fn golden() -> Value {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/reference/junction_golden.json");
    serde_json::from_str(&std::fs::read_to_string(path).expect("golden file present")).expect("valid JSON")
}

fn scenario_of(case: &Value) -> Scenario {
    let params: Vec<String> =
        case["parameters"].as_object().unwrap().iter().map(|(k, v)| format!("{k} = {}", v.as_f64().unwrap())).collect();
    let side = |name: &str| {
        let s = &case[name];
        format!(
            "[{name}]\nA = \"{}\"\nB = \"{}\"\nkeep = \"{}\"\nnormal_sign = {}\n",
            s["A"].as_str().unwrap(),
            s["B"].as_str().unwrap(),
            s["keep"].as_str().unwrap(),
            s["normal_sign"].as_i64().unwrap()
        )
    };
    let text = format!(
        "name = \"{}\"\ndimension = {}\n[parameters]\n{}\n{}{}[shell]\nkind = \"{}\"\n",
        case["id"].as_str().unwrap(),
        case["dimension"].as_i64().unwrap(),
        params.join("\n"),
        side("minus"),
        side("plus"),
        case["shell"].as_str().unwrap()
    );
    Scenario::parse(&text, None).unwrap_or_else(|e| panic!("{}: {e}", case["id"]))
}

fn check(id: &str, what: &str, got: f64, want: f64, rel: f64) {
    let tol = (rel * want.abs()).max(1e-15);
    assert!((got - want).abs() <= tol, "{id}: {what}: junctura {got:e} vs SymPy {want:e}");
}

#[test]
fn every_formula_path_matches_the_sympy_derivation() {
    let g = golden();
    let cases = g["cases"].as_array().unwrap();
    assert!(cases.len() >= 12, "the golden file should cover every path");
    let mut static_checked = 0;
    let mut v2_checked = 0;
    for case in cases {
        let id = case["id"].as_str().unwrap();
        let s = scenario_of(case);
        // The scenario's own orientation rule must agree with the sign the derivation used.
        for side in ["minus", "plus"] {
            let sd = if side == "minus" { &s.minus } else { &s.plus };
            assert_eq!(sd.normal_sign(), case[side]["normal_sign"].as_f64().unwrap(), "{id} {side}");
        }
        let j = Junction::new(&s);
        let r = case["R"].as_f64().unwrap();
        let st = j
            .stress(r, case["Rdot"].as_f64().unwrap(), case["Rddot"].as_f64().unwrap())
            .unwrap_or_else(|e| panic!("{id}: {e}"));
        // Source: tests/reference/junction_reference.py (SymPy 1.14, first-principles derivation).
        check(id, "K^s_s minus", st.k_ss[0], case["K_ss_minus"].as_f64().unwrap(), 1e-11);
        check(id, "K^s_s plus", st.k_ss[1], case["K_ss_plus"].as_f64().unwrap(), 1e-11);
        check(id, "K^th_th minus", st.k_thth[0], case["K_thth_minus"].as_f64().unwrap(), 1e-11);
        check(id, "K^th_th plus", st.k_thth[1], case["K_thth_plus"].as_f64().unwrap(), 1e-11);
        check(id, "S^s_s", st.s_ss, case["S_ss"].as_f64().unwrap(), 1e-10);
        check(id, "S^th_th", st.s_thth, case["S_thth"].as_f64().unwrap(), 1e-9);
        if let Some(stat) = case.get("static") {
            let a = stat["a"].as_f64().unwrap();
            let sv = j.static_values(a).unwrap_or_else(|e| panic!("{id}: {e}"));
            check(id, "static S^s_s", sv.stress.s_ss, stat["S_ss"].as_f64().unwrap(), 1e-11);
            check(id, "static S^th_th", sv.stress.s_thth, stat["S_thth"].as_f64().unwrap(), 1e-10);
            static_checked += 1;
            if let (Some(v0), Some(v1)) = (stat.get("V2_beta2_0"), stat.get("V2_beta2_1")) {
                for (beta2, want) in [(0.0, v0), (1.0, v1)] {
                    let v = j.potential_taylor(&sv, Law::Linear { beta2 }).unwrap();
                    check(id, &format!("V''(a) at beta^2 = {beta2}"), v[2], want.as_f64().unwrap(), 1e-8);
                    assert!(v[0].abs() < 1e-12 && v[1].abs() < 1e-10, "{id}: V, V' at a static radius: {v:?}");
                }
                v2_checked += 1;
            }
        }
    }
    assert!(static_checked >= 10 && v2_checked >= 8, "static {static_checked}, V'' {v2_checked}");
}
