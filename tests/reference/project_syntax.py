"""Convert expressions written in junctura's input syntax into SymPy expressions.

The syntax (common to every expression a user types in a scenario file):
  sum     := product (('+' | '-') product)*
  product := unary (('*' | '/') unary)*
  unary   := ('-' | '+') unary | power        (so -r^2 means -(r^2))
  power   := atom ('^' unary)?                 (right-associative: r^2^3 = r^(2^3))
  atom    := number | 'pi' | variable | parameter | function '(' sum ')' | '(' sum ')'
Functions: sqrt exp log sin cos tan sinh cosh tanh abs (log is the natural logarithm).
'pi' is the constant; every other name must be the variable or a declared parameter, so a parameter
called `e` is an ordinary symbol and never Euler's number.

Numeric literals are converted to the exact rational value of the IEEE double the Rust parser produces
(`sympy.Rational(float(text))`), so the reference and the library evaluate the very same input numbers.
"""
import re

import sympy as sp

FUNCTIONS = {
    "sqrt": sp.sqrt,
    "exp": sp.exp,
    "log": sp.log,
    "sin": sp.sin,
    "cos": sp.cos,
    "tan": sp.tan,
    "sinh": sp.sinh,
    "cosh": sp.cosh,
    "tanh": sp.tanh,
    "abs": sp.Abs,
}

_TOKEN = re.compile(
    r"\s*(?:(?P<num>(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)|(?P<name>[A-Za-z_][A-Za-z0-9_]*)|(?P<op>[-+*/^()]))"
)


def exact(value):
    """The exact rational value of a Python float (an IEEE double)."""
    return sp.Rational(float(value))


def _tokens(src):
    pos, out = 0, []
    src = src.rstrip()
    while pos < len(src):
        m = _TOKEN.match(src, pos)
        if not m:
            raise ValueError(f"cannot read {src!r} at column {pos + 1}")
        pos = m.end()
        if m.group("num") is not None:
            out.append(("num", m.group("num")))
        elif m.group("name") is not None:
            out.append(("name", m.group("name")))
        else:
            out.append(("op", m.group("op")))
    out.append(("end", None))
    return out


class _Parser:
    def __init__(self, src, symbols):
        self.toks = _tokens(src)
        self.pos = 0
        self.symbols = symbols
        self.src = src

    def peek(self):
        return self.toks[self.pos]

    def bump(self):
        t = self.toks[self.pos]
        self.pos += 1
        return t

    def expect(self, op):
        t = self.bump()
        if t != ("op", op):
            raise ValueError(f"expected {op!r} in {self.src!r}, found {t}")

    def sum(self):
        lhs = self.product()
        while self.peek() in (("op", "+"), ("op", "-")):
            op = self.bump()[1]
            rhs = self.product()
            lhs = lhs + rhs if op == "+" else lhs - rhs
        return lhs

    def product(self):
        lhs = self.unary()
        while self.peek() in (("op", "*"), ("op", "/")):
            op = self.bump()[1]
            rhs = self.unary()
            lhs = lhs * rhs if op == "*" else lhs / rhs
        return lhs

    def unary(self):
        if self.peek() == ("op", "-"):
            self.bump()
            return -self.unary()
        if self.peek() == ("op", "+"):
            self.bump()
            return self.unary()
        return self.power()

    def power(self):
        base = self.atom()
        if self.peek() == ("op", "^"):
            self.bump()
            return sp.Pow(base, self.unary())
        return base

    def atom(self):
        kind, text = self.bump()
        if kind == "num":
            return exact(float(text))
        if kind == "op" and text == "(":
            inner = self.sum()
            self.expect(")")
            return inner
        if kind == "name":
            if text in FUNCTIONS:
                self.expect("(")
                arg = self.sum()
                self.expect(")")
                return FUNCTIONS[text](arg)
            if text == "pi":
                return sp.pi
            if text in self.symbols:
                return self.symbols[text]
            raise ValueError(f"unknown name {text!r} in {self.src!r}")
        raise ValueError(f"unexpected {text!r} in {self.src!r}")


def parse(src, symbols):
    """Parse `src` (project syntax) with `symbols` mapping each allowed name to a SymPy symbol."""
    p = _Parser(src, symbols)
    e = p.sum()
    if p.peek()[0] != "end":
        raise ValueError(f"trailing input in {src!r}: {p.peek()}")
    return e
