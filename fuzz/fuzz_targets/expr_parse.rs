//! Arbitrary text into the expression parser: it must return Ok or a located error, never panic; a parsed
//! expression is also evaluated (value and derivatives) at a few radii, which must not panic either.
#![no_main]

use junctura::expr::Expr;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(src) = std::str::from_utf8(data) else { return };
    let params = vec!["m".to_string(), "q".to_string()];
    match Expr::parse(src, "r", &params) {
        Ok(e) => {
            for r in [-1.0, 0.0, 1e-300, 0.5, 2.0, 1e300] {
                let _ = e.eval_at(r, &[1.0, 0.5]);
                let _ = e.derivatives(r, &[1.0, 0.5]);
            }
            let _ = e.param_derivative(2.0, &[1.0, 0.5], 0);
        }
        Err(err) => {
            assert!(err.column >= 1 && err.column <= src.chars().count() + 1, "column {} outside {src:?}", err.column);
        }
    }
});
