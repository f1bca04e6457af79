//! The expression tree shared by the parser, the evaluator and the symbolic printer.

/// A built-in function of one argument.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Func {
    /// Square root.
    Sqrt,
    /// Exponential.
    Exp,
    /// Natural logarithm.
    Log,
    /// Sine.
    Sin,
    /// Cosine.
    Cos,
    /// Tangent.
    Tan,
    /// Hyperbolic sine.
    Sinh,
    /// Hyperbolic cosine.
    Cosh,
    /// Hyperbolic tangent.
    Tanh,
    /// Absolute value.
    Abs,
    /// Sign: -1 for negative arguments, +1 otherwise (so it is the derivative of `abs` everywhere, with the
    /// right derivative at 0, matching how the evaluator differentiates `abs`).
    Sign,
}

impl Func {
    /// Every function, in the order they are listed to users.
    pub const ALL: [Func; 11] = [
        Func::Sqrt,
        Func::Exp,
        Func::Log,
        Func::Sin,
        Func::Cos,
        Func::Tan,
        Func::Sinh,
        Func::Cosh,
        Func::Tanh,
        Func::Abs,
        Func::Sign,
    ];

    /// The name users type.
    pub fn name(self) -> &'static str {
        match self {
            Func::Sqrt => "sqrt",
            Func::Exp => "exp",
            Func::Log => "log",
            Func::Sin => "sin",
            Func::Cos => "cos",
            Func::Tan => "tan",
            Func::Sinh => "sinh",
            Func::Cosh => "cosh",
            Func::Tanh => "tanh",
            Func::Abs => "abs",
            Func::Sign => "sign",
        }
    }

    /// Look a function up by the name users type.
    pub fn from_name(name: &str) -> Option<Func> {
        Func::ALL.iter().copied().find(|f| f.name() == name)
    }
}

/// A binary operator.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum BinOp {
    /// `+`
    Add,
    /// `-`
    Sub,
    /// `*`
    Mul,
    /// `/`
    Div,
    /// `^` (right-associative)
    Pow,
}

/// A node of the expression tree.
#[derive(Debug, Clone, PartialEq)]
pub enum Node {
    /// A numeric literal.
    Num(f64),
    /// The constant pi.
    Pi,
    /// The independent variable (`r` for metric functions, `sigma` for equations of state).
    Var,
    /// A named parameter, by its index in the scenario's parameter table.
    Param(usize),
    /// Unary minus.
    Neg(Box<Node>),
    /// A binary operation.
    Bin(BinOp, Box<Node>, Box<Node>),
    /// A function call.
    Call(Func, Box<Node>),
}

impl Node {
    /// `Bin` constructor that boxes its operands.
    pub fn bin(op: BinOp, l: Node, r: Node) -> Node {
        Node::Bin(op, Box::new(l), Box::new(r))
    }

    /// `Call` constructor that boxes its argument.
    pub fn call(f: Func, arg: Node) -> Node {
        Node::Call(f, Box::new(arg))
    }

    /// `Neg` constructor that boxes its operand.
    pub fn negate(x: Node) -> Node {
        Node::Neg(Box::new(x))
    }

    /// True if the independent variable occurs in this tree.
    pub fn depends_on_var(&self) -> bool {
        match self {
            Node::Var => true,
            Node::Num(_) | Node::Pi | Node::Param(_) => false,
            Node::Neg(x) | Node::Call(_, x) => x.depends_on_var(),
            Node::Bin(_, l, r) => l.depends_on_var() || r.depends_on_var(),
        }
    }

    /// True if parameter `k` occurs in this tree.
    pub fn depends_on_param(&self, k: usize) -> bool {
        match self {
            Node::Param(j) => *j == k,
            Node::Num(_) | Node::Pi | Node::Var => false,
            Node::Neg(x) | Node::Call(_, x) => x.depends_on_param(k),
            Node::Bin(_, l, r) => l.depends_on_param(k) || r.depends_on_param(k),
        }
    }

    /// The value of a constant integer literal (possibly negated), if this node is one and |n| <= 1024.
    ///
    /// The bound keeps n (n - 1) (n - 2), which third-order dual numbers form in `i32` for powi, from
    /// overflowing; larger exponents are evaluated as real powers.
    pub fn as_integer(&self) -> Option<i32> {
        match self {
            Node::Num(v) if v.fract() == 0.0 && v.abs() <= 1024.0 => Some(*v as i32),
            Node::Neg(x) => x.as_integer().map(|n| -n),
            _ => None,
        }
    }

    /// The value of a constant real literal (possibly negated), if this node is one.
    pub fn as_constant(&self) -> Option<f64> {
        match self {
            Node::Num(v) => Some(*v),
            Node::Neg(x) => x.as_constant().map(|v| -v),
            _ => None,
        }
    }
}
