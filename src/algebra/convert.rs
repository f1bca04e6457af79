//! From the user's expression trees (`expr::Node`) to exact rational functions.
//!
//! Decimal literals become the exact rational of their shortest decimal spelling (`0.05` -> 1/20, `1e-3` ->
//! 1/1000), not of the binary double, so a typed 0.5 prints as 1/2. The variable becomes the radius atom,
//! parameters stay symbolic.

use super::poly::Q;
use super::ratfun::{Alg, RatFun};
use crate::expr::{BinOp, Node};
use num_bigint::BigInt;
use num_traits::Zero;

/// The exact rational of the shortest decimal that reads back to `v` (finite `v`).
pub fn decimal_rational(v: f64) -> Q {
    let text = format!("{:e}", v.abs());
    let (mantissa, exp) = text.split_once('e').unwrap_or((&text, "0"));
    let exp: i32 = exp.parse().unwrap_or(0);
    let (int_part, frac_part) = mantissa.split_once('.').unwrap_or((mantissa, ""));
    let digits: BigInt = format!("{int_part}{frac_part}").parse().unwrap_or_default();
    let shift = exp - frac_part.len() as i32;
    let ten = BigInt::from(10);
    let q = if shift >= 0 {
        Q::from_integer(digits * ten.pow(shift as u32))
    } else {
        Q::new(digits, ten.pow((-shift) as u32))
    };
    if v < 0.0 {
        -q
    } else {
        q
    }
}

impl Alg {
    /// The rational function of an expression tree in the radius and the parameters; an error names a
    /// division by an expression that is identically zero.
    pub fn from_node(&mut self, node: &Node) -> Result<RatFun, String> {
        Ok(match node {
            Node::Num(v) => {
                let q = decimal_rational(*v);
                if q.is_zero() {
                    RatFun::int(0)
                } else {
                    RatFun::constant(q)
                }
            }
            Node::Pi => self.pi(),
            Node::Var => self.radius(),
            Node::Param(k) => self.param(*k),
            Node::Neg(x) => {
                let x = self.from_node(x)?;
                self.neg(&x)
            }
            Node::Call(f, x) => {
                let x = self.from_node(x)?;
                self.func(*f, &x)
            }
            Node::Bin(op, l, r) => {
                let l = self.from_node(l)?;
                let r = self.from_node(r)?;
                match op {
                    BinOp::Add => self.add(&l, &r),
                    BinOp::Sub => self.sub(&l, &r),
                    BinOp::Mul => self.mul(&l, &r),
                    BinOp::Div if r.is_zero() => {
                        return Err("division by an expression that is identically zero".into())
                    }
                    BinOp::Div => self.div(&l, &r),
                    BinOp::Pow if l.is_zero() => {
                        return Err("a power of an expression that is identically zero".into());
                    }
                    BinOp::Pow => self.pow(&l, &r),
                }
            }
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn decimals_are_exact() {
        assert_eq!(decimal_rational(0.5), Q::new(1.into(), 2.into()));
        assert_eq!(decimal_rational(0.05), Q::new(1.into(), 20.into()));
        assert_eq!(decimal_rational(-1.5e-3), Q::new((-3).into(), 2000.into()));
        assert_eq!(decimal_rational(12.0), Q::from_integer(12.into()));
        assert_eq!(decimal_rational(2.5e20), Q::from_integer("250000000000000000000".parse().unwrap()));
    }
}
