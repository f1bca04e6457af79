//! Property-based fuzzing in the normal suite (modest case counts; raise PROPTEST_CASES for long runs): the
//! expression parser and the scenario loader never panic and locate their errors inside the input, and valid
//! expression trees evaluate (with derivatives) at any point without panicking. Crashes found by fuzzing are
//! kept below as regression tests named after what broke.

use junctura::expr::Expr;
use junctura::scenario::Scenario;
use junctura::ErrorKind;
use proptest::prelude::*;

fn params() -> Vec<String> {
    vec!["m".to_string(), "q".to_string()]
}

/// Text biased toward the parser's alphabet, plus arbitrary Unicode.
fn expr_text() -> impl Strategy<Value = String> {
    prop_oneof!["[0-9a-z+*/^(). eE-]{0,40}", "[rmqpisgtxhbcol0-9+\\-*/^() .]{0,60}", any::<String>(),]
}

/// A syntactically valid expression in r, m, q (depth-bounded).
fn valid_expr() -> impl Strategy<Value = String> {
    let leaf = prop_oneof![
        Just("r".to_string()),
        Just("m".to_string()),
        Just("q".to_string()),
        Just("pi".to_string()),
        (-1.0e3f64..1.0e3).prop_map(|v| format!("({v:?})")),
        (0u32..6).prop_map(|n| n.to_string()),
    ];
    leaf.prop_recursive(6, 64, 2, |inner| {
        let funcs =
            prop::sample::select(vec!["sqrt", "exp", "log", "sin", "cos", "tan", "sinh", "cosh", "tanh", "abs"]);
        prop_oneof![
            (inner.clone(), prop::sample::select(vec!["+", "-", "*", "/", "^"]), inner.clone())
                .prop_map(|(a, o, b)| format!("({a}){o}({b})")),
            (funcs, inner.clone()).prop_map(|(f, a)| format!("{f}({a})")),
            inner.prop_map(|a| format!("-({a})")),
        ]
    })
}

fn toml_string(s: &str) -> String {
    let mut o = String::from("\"");
    for c in s.chars() {
        match c {
            '"' => o.push_str("\\\""),
            '\\' => o.push_str("\\\\"),
            c if (c as u32) < 0x20 || c as u32 == 0x7f => o.push_str(&format!("\\u{:04x}", c as u32)),
            c => o.push(c),
        }
    }
    o.push('"');
    o
}

/// Number of lines of `text` (a located error may point one past the last line break).
fn n_lines(text: &str) -> usize {
    text.matches('\n').count() + 1
}

/// Check a scenario error: kind Input, message starting with the label and, when it carries `:LINE:COL`,
/// a line inside the text.
fn check_scenario_error(text: &str, e: &junctura::Error) -> Result<(), TestCaseError> {
    prop_assert_eq!(e.kind, ErrorKind::Input, "{}", e);
    prop_assert!(e.message.starts_with("<input>"), "{}", e);
    let rest = &e.message["<input>".len()..];
    if let Some(loc) = rest.strip_prefix(':') {
        let mut it = loc.splitn(3, ':');
        let line: usize = it.next().and_then(|l| l.parse().ok()).unwrap_or(0);
        let col: usize = it.next().and_then(|c| c.parse().ok()).unwrap_or(0);
        prop_assert!(line >= 1 && line <= n_lines(text), "line {} of {}: {}", line, n_lines(text), e);
        prop_assert!(col >= 1, "{}", e);
    }
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 512, ..ProptestConfig::default() })]

    #[test]
    fn expression_parser_never_panics_and_locates_errors(src in expr_text()) {
        match Expr::parse(&src, "r", &params()) {
            Ok(e) => {
                for r in [0.0, 1e-9, 2.0, -3.0] {
                    let _ = e.derivatives(r, &[1.0, 0.5]);
                }
            }
            Err(err) => {
                let n = src.chars().count();
                prop_assert!(err.column >= 1 && err.column <= n + 1, "column {} for {:?} ({} chars)", err.column, src, n);
                prop_assert_eq!(&err.source, &src);
                prop_assert!(!err.message.is_empty());
            }
        }
    }

    #[test]
    fn valid_expressions_parse_and_evaluate_anywhere(src in valid_expr(), r in prop_oneof![-1e6f64..1e6, Just(0.0), Just(2.0), any::<f64>()], m in -10.0f64..10.0) {
        let e = Expr::parse(&src, "r", &params()).map_err(|err| TestCaseError::fail(format!("{src}: {err}")))?;
        // Values may be NaN or inf (e.g. log of a negative number); what must not happen is a panic.
        let _ = e.derivatives(r, &[m, 0.5]);
        let _ = e.param_derivative(r, &[m, 0.5], 0);
        let _: f64 = e.eval_at(r, &[m, 0.5]);
    }

    #[test]
    fn scenario_loader_never_panics_on_arbitrary_text(text in prop_oneof![any::<String>(), "[a-z\\[\\]=\" \n0-9.]{0,120}"]) {
        if let Err(e) = Scenario::parse(&text, None) {
            check_scenario_error(&text, &e)?;
        }
    }

    #[test]
    fn scenario_loader_never_panics_on_arbitrary_values(
        a in expr_text(),
        keep in prop_oneof![Just("outer".to_string()), Just("inner".to_string()), Just("black-hole".to_string()), "[a-z-]{0,12}"],
        dim in any::<i64>(),
        m in prop_oneof![any::<f64>().prop_map(|v| format!("{v:?}")), "[a-z0-9\".]{0,8}"],
        kind in prop_oneof![Just("timelike".to_string()), Just("spacelike".to_string()), "[a-z]{0,9}"],
        pressure in expr_text(),
    ) {
        let text = format!(
            "name = \"fuzz\"\ndimension = {dim}\n[parameters]\nm = {m}\n[minus]\nA = {}\nkeep = {}\n[plus]\nA = \"1 - 2*m/r\"\nkeep = \"outer\"\n[shell]\nkind = {}\npressure = {}\n",
            toml_string(&a), toml_string(&keep), toml_string(&kind), toml_string(&pressure)
        );
        if let Err(e) = Scenario::parse(&text, None) {
            check_scenario_error(&text, &e)?;
        }
    }
}

// Regression tests for what fuzzing broke.

#[test]
fn deeply_nested_parentheses_do_not_overflow_the_stack() {
    let src = format!("{}r{}", "(".repeat(100_000), ")".repeat(100_000));
    let e = Expr::parse(&src, "r", &params()).unwrap_err();
    assert!(e.message.contains("nested"), "{e}");
    assert!(e.column <= src.chars().count());
}

#[test]
fn long_chains_of_terms_and_signs_do_not_overflow_the_stack() {
    // A flat sum is not nested: it is accepted (built as a balanced tree) and evaluates on a small stack.
    let flat = Expr::parse(&("r+".repeat(100_000) + "r"), "r", &params()).expect("a flat sum of any length");
    let h = std::thread::Builder::new().stack_size(2 << 20).spawn(move || flat.derivatives(1.0, &[1.0, 0.5])).unwrap();
    let d = h.join().unwrap();
    assert_eq!(d[0], 100_001.0);
    for src in ["-".repeat(100_000) + "r", "r^".repeat(100_000) + "r", "sqrt(".repeat(50_000) + "r"] {
        let e = Expr::parse(&src, "r", &params()).unwrap_err();
        assert!(e.message.contains("nested"), "{e}");
    }
}

#[test]
fn number_literal_beyond_f64_is_an_error_not_infinity() {
    let e = Expr::parse("1 + 1e400*r", "r", &params()).unwrap_err();
    assert_eq!(e.column, 5);
    assert!(Expr::parse("1e308*r", "r", &params()).is_ok());
}

#[test]
fn the_deepest_accepted_expression_evaluates_on_a_small_worker_stack() {
    // Nested just below the limit, evaluated with third derivatives on a 2 MiB stack (rayon's default).
    let depth = junctura::expr::parse::MAX_DEPTH - 1;
    let src = format!("{}r{}", "exp(-".repeat(depth / 2), ")".repeat(depth / 2));
    let e = Expr::parse(&src, "r", &params()).unwrap();
    let h = std::thread::Builder::new().stack_size(2 << 20).spawn(move || e.derivatives(2.0, &[1.0, 0.5])).unwrap();
    let d = h.join().unwrap();
    assert!(d.iter().all(|x| x.is_finite()), "{d:?}");
}

#[test]
fn large_integer_exponent_does_not_overflow_in_the_derivatives() {
    // Found by cargo fuzz (input "555^5554^555^5554555"): powi's third derivative formed n (n-1) (n-2) in i32.
    // d^k/dr^k r^n at r = 1 is n (n-1) ... (n-k+1) (common practice).
    for n in [1024.0f64, 1025.0, 5554.0, 1.0e6] {
        let e = Expr::parse(&format!("r^{n}"), "r", &params()).unwrap();
        let d = e.derivatives(1.0, &[1.0, 0.5]);
        let want = [1.0, n, n * (n - 1.0), n * (n - 1.0) * (n - 2.0)];
        for k in 0..4 {
            assert!(
                (d[k] - want[k]).abs() <= 1e-12 * want[k].abs().max(1.0),
                "r^{n}, order {k}: {} vs {}",
                d[k],
                want[k]
            );
        }
    }
    let e = Expr::parse("555^5554^555^5554555", "r", &params()).unwrap();
    let _ = e.derivatives(2.0, &[1.0, 0.5]);
    // Negative bases keep exact integer powers up to the bound.
    let e = Expr::parse("r^1023", "r", &params()).unwrap();
    assert_eq!(e.derivatives(-1.0, &[1.0, 0.5])[0], -1.0);
}
