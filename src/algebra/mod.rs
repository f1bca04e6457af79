//! Exact computer algebra for closed-form junction quantities: sparse multivariate polynomials over the
//! rationals (`poly`), rational functions with square-root and function atoms and a normal form (`ratfun`),
//! conversion from the user's expression trees (`convert`), a size-minimising display layout (`display`) and
//! printers for text, SymPy and LaTeX (`render`).
//!
//! ```
//! use junctura::algebra::{Alg, RatFun};
//! let mut alg = Alg::new(&["m".to_string()]);
//! let a = alg.radius();
//! let m = alg.param(0);
//! // B = 1 - 2m/a and (sqrt B)^2 = B exactly.
//! let two_m = alg.mul(&RatFun::int(2), &m);
//! let b = alg.sub(&RatFun::int(1), &alg.div(&two_m, &a));
//! let s = alg.sqrt(&b);
//! assert_eq!(alg.mul(&s, &s), b);
//! ```

pub mod convert;
pub mod display;
pub mod poly;
pub mod ratfun;
pub mod render;

pub use display::{Disp, Shower};
pub use poly::{Poly, Q};
pub use ratfun::{Alg, AtomKind, RatFun};
pub use render::Names;
