//! Pure renderers: reports in, text/LaTeX/CSV bytes out. Nothing here writes files (see `output`).

pub mod closed;
pub mod derive;
pub mod evolve;
pub mod map;
pub mod statics;

/// A number with full f64 precision (shortest round-trip form), `null`-free: NaN and infinities spelled out.
pub fn num(x: f64) -> String {
    if x.is_finite() {
        format!("{x:?}")
    } else {
        format!("{x}")
    }
}

/// A number for LaTeX tables: 6 significant digits, scientific notation as `\times 10^{k}`.
pub fn latex_num(x: f64) -> String {
    if !x.is_finite() {
        return "\\text{--}".into();
    }
    if x == 0.0 {
        return "0".into();
    }
    let e = x.abs().log10().floor() as i32;
    if (-3..5).contains(&e) {
        let s = format!("{:.*}", (5 - e).clamp(0, 8) as usize, x);
        let s = if s.contains('.') { s.trim_end_matches('0').trim_end_matches('.').to_string() } else { s };
        if s == "-0" {
            "0".into()
        } else {
            s
        }
    } else {
        let m = x / 10f64.powi(e);
        let ms = format!("{m:.5}");
        let ms = ms.trim_end_matches('0').trim_end_matches('.');
        format!("{ms}\\times 10^{{{e}}}")
    }
}
