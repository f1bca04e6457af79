//! The tape's instruction set and block size, shared by the tape (`tape.rs`, which compiles and runs
//! instructions) and the block derivative arithmetic (`jets.rs`, which applies one instruction to a block).

use super::ast::Func;

/// One tape instruction; operands are slot indices of earlier instructions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) enum Inst {
    Const(f64),
    Var,
    Param(usize),
    Neg(u32),
    Add(u32, u32),
    Sub(u32, u32),
    Mul(u32, u32),
    Div(u32, u32),
    Square(u32),
    Powi(u32, i32),
    Powf(u32, f64),
    Call(Func, u32),
}

/// Points per block in the batch evaluators (structure of arrays: one lane per point).
pub(crate) const BLOCK: usize = 64;
