//! A small recursive-descent parser for the expressions users type in scenario files.
//!
//! Grammar (lowest precedence first; `^` binds tighter than unary minus, so `-r^2` is `-(r^2)`):
//! ```text
//! sum     := product (('+' | '-') product)*
//! product := unary (('*' | '/') unary)*
//! unary   := ('-' | '+') unary | power
//! power   := atom ('^' unary)?          (right-associative)
//! atom    := number | 'pi' | variable | parameter | function '(' sum ')' | '(' sum ')'
//! ```

use super::ast::{BinOp, Func, Node};
use std::fmt;

/// A located parse error: the message, the 1-based column (in characters) and the offending text.
#[derive(Debug, Clone, PartialEq)]
pub struct ParseError {
    /// What was wrong and what was expected.
    pub message: String,
    /// 1-based character column inside the expression.
    pub column: usize,
    /// The expression as typed.
    pub source: String,
    /// A suggestion, when we have one.
    pub hint: Option<String>,
}

impl fmt::Display for ParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(f, "{} (column {})", self.message, self.column)?;
        writeln!(f, "    {}", self.source)?;
        write!(f, "    {}^", " ".repeat(self.column.saturating_sub(1)))?;
        if let Some(h) = &self.hint {
            write!(f, "\n  hint: {h}")?;
        }
        Ok(())
    }
}

#[derive(Debug, Clone, PartialEq)]
enum Tok {
    Num(f64),
    Name(String),
    Op(char),
    LParen,
    RParen,
    End,
}

fn describe(t: &Tok) -> String {
    match t {
        Tok::Num(v) => format!("the number {v}"),
        Tok::Name(n) => format!("the name '{n}'"),
        Tok::Op(c) => format!("'{c}'"),
        Tok::LParen => "'('".into(),
        Tok::RParen => "')'".into(),
        Tok::End => "the end of the expression".into(),
    }
}

struct Lexer {
    toks: Vec<(Tok, usize)>,
}

fn lex(src: &str) -> Result<Lexer, ParseError> {
    let chars: Vec<char> = src.chars().collect();
    let mut toks = Vec::new();
    let mut i = 0;
    let err =
        |col: usize, msg: String| ParseError { message: msg, column: col + 1, source: src.to_string(), hint: None };
    while i < chars.len() {
        let c = chars[i];
        if c.is_whitespace() {
            i += 1;
            continue;
        }
        let start = i;
        if c.is_ascii_digit() || (c == '.' && i + 1 < chars.len() && chars[i + 1].is_ascii_digit()) {
            while i < chars.len() && (chars[i].is_ascii_digit() || chars[i] == '.') {
                i += 1;
            }
            if i < chars.len() && (chars[i] == 'e' || chars[i] == 'E') {
                let mut j = i + 1;
                if j < chars.len() && (chars[j] == '+' || chars[j] == '-') {
                    j += 1;
                }
                if j < chars.len() && chars[j].is_ascii_digit() {
                    i = j;
                    while i < chars.len() && chars[i].is_ascii_digit() {
                        i += 1;
                    }
                }
            }
            let text: String = chars[start..i].iter().collect();
            let v: f64 = text.parse().map_err(|_| err(start, format!("'{text}' is not a valid number")))?;
            if !v.is_finite() {
                let mut e = err(start, format!("the number '{text}' is too large for a 64-bit float"));
                e.hint = Some("numbers must stay below about 1.8e308 in magnitude".into());
                return Err(e);
            }
            toks.push((Tok::Num(v), start));
            if i < chars.len() && (chars[i].is_alphabetic() || chars[i] == '_') {
                return Err(ParseError {
                    message: format!("expected an operator after the number '{text}'"),
                    column: i + 1,
                    source: src.to_string(),
                    hint: Some("multiplication must be written out, e.g. 2*m".into()),
                });
            }
            continue;
        }
        if c.is_alphabetic() || c == '_' {
            while i < chars.len() && (chars[i].is_alphanumeric() || chars[i] == '_') {
                i += 1;
            }
            toks.push((Tok::Name(chars[start..i].iter().collect()), start));
            continue;
        }
        match c {
            '+' | '-' | '*' | '/' | '^' => toks.push((Tok::Op(c), i)),
            '(' => toks.push((Tok::LParen, i)),
            ')' => toks.push((Tok::RParen, i)),
            _ => {
                let hint = if c == '[' || c == '{' { Some("use round parentheses ( )".to_string()) } else { None };
                let mut e = err(i, format!("unexpected character '{c}'"));
                e.hint = hint;
                return Err(e);
            }
        }
        i += 1;
    }
    toks.push((Tok::End, chars.len()));
    Ok(Lexer { toks })
}

/// Parses one expression in the variable `var` with the given parameter names.
pub struct Parser<'a> {
    src: &'a str,
    var: &'a str,
    params: &'a [String],
    toks: Vec<(Tok, usize)>,
    pos: usize,
    depth: usize,
}

/// Deepest nesting of parentheses, function calls, signs and powers the parser accepts (deeper input would
/// exhaust the stack in the recursive descent, in evaluation and when the tree is dropped).
pub const MAX_DEPTH: usize = 200;

/// Chains of + - (or * /) up to this many terms are built left-leaning (as written); longer ones balanced.
const LEAN_CHAIN: usize = 16;

/// The tree of a chain of terms `(inverse, node)` of one precedence level (the first term is direct): up to
/// [`LEAN_CHAIN`] terms the usual left-leaning tree, as written; a longer chain a balanced tree of the same value
/// (terms regrouped, signs kept: a - b - c - d = (a - b) - (c + d)), so its depth grows with log2 of its length
/// and flat sums of any length are accepted.
#[inline(never)]
fn finish_chain(terms: Vec<(bool, Node)>, direct: BinOp, inverse: BinOp) -> Node {
    if terms.len() > LEAN_CHAIN {
        return balanced(terms, direct, inverse);
    }
    let mut it = terms.into_iter();
    let mut lhs = match it.next() {
        Some((_, n)) => n,
        None => return Node::Num(0.0),
    };
    for (inv, rhs) in it {
        lhs = Node::bin(if inv { inverse } else { direct }, lhs, rhs);
    }
    lhs
}

/// A balanced tree over signed terms `(inverse, node)`; the first term's sign must be direct.
fn balanced(mut terms: Vec<(bool, Node)>, direct: BinOp, inverse: BinOp) -> Node {
    if terms.len() == 1 {
        return terms.pop().map(|t| t.1).unwrap_or(Node::Num(0.0));
    }
    let mut right = terms.split_off(terms.len() / 2);
    let left = balanced(terms, direct, inverse);
    // x - r1 + r2 ... = x - (r1 - r2 ...): flip the signs of the right half when it starts with an inverse.
    let flip = right[0].0;
    if flip {
        for t in right.iter_mut() {
            t.0 = !t.0;
        }
    }
    let r = balanced(right, direct, inverse);
    Node::bin(if flip { inverse } else { direct }, left, r)
}

impl<'a> Parser<'a> {
    /// Parse `src` as a function of `var` with the parameters `params` (by name; `Node::Param(k)` refers to
    /// `params[k]`).
    pub fn parse(src: &'a str, var: &'a str, params: &'a [String]) -> Result<Node, ParseError> {
        let toks = lex(src)?.toks;
        let mut p = Parser { src, var, params, toks, pos: 0, depth: 0 };
        if matches!(p.peek(), Tok::End) {
            return Err(p.error_here("the expression is empty; expected a number, a name or '('".into()));
        }
        let node = p.sum()?;
        match p.peek() {
            Tok::End => Ok(node),
            Tok::RParen => Err(p.error_here("unmatched ')'".into())),
            t => {
                let d = describe(t);
                Err(p.error_here(format!("expected an operator (+ - * / ^) or the end, found {d}")))
            }
        }
    }

    fn peek(&self) -> &Tok {
        &self.toks[self.pos].0
    }

    fn col(&self) -> usize {
        self.toks[self.pos].1 + 1
    }

    fn bump(&mut self) -> Tok {
        let t = self.toks[self.pos].0.clone();
        if self.pos + 1 < self.toks.len() {
            self.pos += 1;
        }
        t
    }

    fn error_here(&self, message: String) -> ParseError {
        ParseError { message, column: self.col(), source: self.src.to_string(), hint: None }
    }

    /// A chain `t0 ± t1 ± t2 ...`: see [`finish_chain`] for how it becomes a tree. Each further term is counted
    /// as a nesting level up to [`LEAN_CHAIN`] (the depth of the tree it can add).
    fn sum(&mut self) -> Result<Node, ParseError> {
        let base = self.depth;
        let mut terms = vec![(false, self.product()?)];
        loop {
            let inverse = match self.peek() {
                Tok::Op('+') => false,
                Tok::Op('-') => true,
                _ => break,
            };
            self.bump();
            self.depth = base + terms.len().min(LEAN_CHAIN);
            let rhs = self.product();
            self.depth = base;
            terms.push((inverse, rhs?));
        }
        self.depth = base;
        Ok(finish_chain(terms, BinOp::Add, BinOp::Sub))
    }

    /// A chain `t0 * t1 / t2 ...`, as [`Parser::sum`].
    fn product(&mut self) -> Result<Node, ParseError> {
        let base = self.depth;
        let mut terms = vec![(false, self.unary()?)];
        loop {
            let inverse = match self.peek() {
                Tok::Op('*') => false,
                Tok::Op('/') => true,
                _ => break,
            };
            self.bump();
            self.depth = base + terms.len().min(LEAN_CHAIN);
            let rhs = self.unary();
            self.depth = base;
            terms.push((inverse, rhs?));
        }
        self.depth = base;
        Ok(finish_chain(terms, BinOp::Mul, BinOp::Div))
    }

    /// Every nesting level (parentheses, calls, signs, exponents) passes through here, so the depth is
    /// counted once, in this one place.
    fn unary(&mut self) -> Result<Node, ParseError> {
        if self.depth >= MAX_DEPTH {
            let mut e =
                self.error_here(format!("the expression is nested or chained more than {MAX_DEPTH} levels deep"));
            e.hint = Some("split the expression or simplify it (each parenthesis, function, sign, power or further term adds a level)".into());
            return Err(e);
        }
        self.depth += 1;
        let r = self.unary_inner();
        self.depth -= 1;
        r
    }

    fn unary_inner(&mut self) -> Result<Node, ParseError> {
        match self.peek() {
            Tok::Op('-') => {
                self.bump();
                Ok(Node::negate(self.unary()?))
            }
            Tok::Op('+') => {
                self.bump();
                self.unary()
            }
            _ => self.power(),
        }
    }

    fn power(&mut self) -> Result<Node, ParseError> {
        let base = self.atom()?;
        if matches!(self.peek(), Tok::Op('^')) {
            self.bump();
            let exp = self.unary()?;
            return Ok(Node::bin(BinOp::Pow, base, exp));
        }
        Ok(base)
    }

    fn atom(&mut self) -> Result<Node, ParseError> {
        let col = self.col();
        match self.bump() {
            Tok::Num(v) => Ok(Node::Num(v)),
            Tok::LParen => {
                let inner = self.sum()?;
                if !matches!(self.peek(), Tok::RParen) {
                    let d = describe(self.peek());
                    return Err(self.error_here(format!("expected ')' to close the '(' at column {col}, found {d}")));
                }
                self.bump();
                Ok(inner)
            }
            Tok::Name(name) => self.name(name, col),
            t => {
                self.pos = self.pos.saturating_sub(usize::from(!matches!(t, Tok::End)));
                let d = describe(&t);
                Err(ParseError {
                    message: format!("expected a number, a name or '(', found {d}"),
                    column: col,
                    source: self.src.to_string(),
                    hint: None,
                })
            }
        }
    }

    fn name(&mut self, name: String, col: usize) -> Result<Node, ParseError> {
        let followed_by_paren = matches!(self.peek(), Tok::LParen);
        if let Some(f) = Func::from_name(&name) {
            if !followed_by_paren {
                return Err(ParseError {
                    message: format!("the function '{name}' needs an argument in parentheses"),
                    column: col + name.chars().count(),
                    source: self.src.to_string(),
                    hint: Some(format!("write {name}(...)")),
                });
            }
            self.bump();
            let arg = self.sum()?;
            if !matches!(self.peek(), Tok::RParen) {
                let d = describe(self.peek());
                return Err(self.error_here(format!("expected ')' to close the argument of '{name}', found {d}")));
            }
            self.bump();
            return Ok(Node::call(f, arg));
        }
        if followed_by_paren {
            let names: Vec<&str> = Func::ALL.iter().map(|f| f.name()).collect();
            return Err(ParseError {
                message: format!("unknown function '{name}'"),
                column: col,
                source: self.src.to_string(),
                hint: Some(match closest(&name, names.iter().copied()) {
                    Some(s) => format!("did you mean '{s}'? known functions: {}", names.join(", ")),
                    None => format!("known functions: {}", names.join(", ")),
                }),
            });
        }
        if name == self.var {
            return Ok(Node::Var);
        }
        if name == "pi" {
            return Ok(Node::Pi);
        }
        if let Some(k) = self.params.iter().position(|p| *p == name) {
            return Ok(Node::Param(k));
        }
        let mut known: Vec<&str> = vec![self.var];
        known.extend(self.params.iter().map(|s| s.as_str()));
        let list = if self.params.is_empty() {
            "no parameters are defined".to_string()
        } else {
            format!("known parameters: {}", self.params.join(", "))
        };
        let hint = match closest(&name, known.iter().copied().chain(["pi"])) {
            Some(s) => format!("did you mean '{s}'? The variable here is '{}'; {list}", self.var),
            None => format!("the variable here is '{}'; {list}; add new names under [parameters]", self.var),
        };
        Err(ParseError {
            message: format!("unknown name '{name}'"),
            column: col,
            source: self.src.to_string(),
            hint: Some(hint),
        })
    }
}

/// Longest name (in bytes) for which a suggestion is searched: the similarity costs length x length, and a
/// name this long is no typo of a short one.
pub const MAX_SUGGEST_LEN: usize = 64;

/// The closest of `candidates` to `name` by Jaro-Winkler similarity, if it is close enough to suggest. Names or
/// candidates longer than [`MAX_SUGGEST_LEN`] are not compared.
pub fn closest<'c>(name: &str, candidates: impl Iterator<Item = &'c str>) -> Option<&'c str> {
    if name.len() > MAX_SUGGEST_LEN {
        return None;
    }
    candidates
        .filter(|c| c.len() <= MAX_SUGGEST_LEN)
        .map(|c| (strsim::jaro_winkler(name, c), c))
        .filter(|(s, _)| *s > 0.75)
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .map(|(_, c)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn p(src: &str) -> Result<Node, ParseError> {
        let params = vec!["m".to_string(), "q".to_string(), "e".to_string()];
        Parser::parse(src, "r", &params)
    }

    #[test]
    fn unary_minus_binds_looser_than_power() {
        let n = p("-r^2").unwrap();
        assert_eq!(n, Node::negate(Node::bin(BinOp::Pow, Node::Var, Node::Num(2.0))));
    }

    #[test]
    fn power_is_right_associative() {
        let n = p("r^2^3").unwrap();
        assert_eq!(n, Node::bin(BinOp::Pow, Node::Var, Node::bin(BinOp::Pow, Node::Num(2.0), Node::Num(3.0))));
    }

    #[test]
    fn parameter_named_e_is_a_parameter() {
        assert_eq!(p("e").unwrap(), Node::Param(2));
        assert_eq!(p("1.5e-3").unwrap(), Node::Num(1.5e-3));
    }

    #[test]
    fn accepts_typical_metrics() {
        for s in ["1 - 2*m/r + q^2/r^2", "exp(-2*m/r)", "1-2*m*r^2/(r^3+2*m*e^2)", "sqrt(abs(r)) * pi", "+r", "2^-1"] {
            assert!(p(s).is_ok(), "{s}");
        }
    }

    #[test]
    fn rejects_with_columns() {
        let cases = [
            ("1 - 2*m/", 9),
            ("1 - 2*m/r)", 10),
            ("(1 - r", 7),
            ("2m", 2),
            ("1 $ r", 3),
            ("", 1),
            ("r r", 3),
            ("sqrt r", 5),
            ("sqr(r)", 1),
            ("1 - 2*M/r", 7),
        ];
        for (src, col) in cases {
            let e = p(src).unwrap_err();
            assert_eq!(e.column, col, "{src}: {e}");
        }
    }

    #[test]
    fn unknown_name_suggests_close_match() {
        let e = p("1 - 2*mm/r").unwrap_err();
        assert!(e.hint.as_deref().unwrap().contains("'m'"), "{e}");
        assert!(e.hint.as_deref().unwrap().contains("known parameters: m, q, e"), "{e}");
        let e = p("sqr(r)").unwrap_err();
        assert!(e.hint.as_deref().unwrap().contains("'sqrt'"), "{e}");
    }

    #[test]
    fn flat_chains_of_any_length_are_not_too_deep() {
        // common practice: a flat sum is not nested; its value is the plain sum (integers, so exact).
        let terms: Vec<String> =
            (1..=500).map(|k| if k % 3 == 0 { format!("- {k}*r") } else { format!("+ {k}*r") }).collect();
        let src = format!("0 {}", terms.join(" "));
        let n = p(&src).expect("500 terms are a flat sum");
        let expected: f64 = (1..=500).map(|k| if k % 3 == 0 { -(k as f64) } else { k as f64 }).sum();
        assert_eq!(crate::expr::eval::eval_node(&n, 1.0f64, |_| 0.0), expected);
        let prod =
            format!("r {}", (0..300).map(|k| if k % 2 == 0 { "* 2" } else { "/ 2" }).collect::<Vec<_>>().join(" "));
        assert_eq!(crate::expr::eval::eval_node(&p(&prod).unwrap(), 3.0f64, |_| 0.0), 3.0);
        let mixed = format!("1 {}", (0..40).map(|k| if k < 20 { "- 1" } else { "+ 2" }).collect::<Vec<_>>().join(" "));
        assert_eq!(crate::expr::eval::eval_node(&p(&mixed).unwrap(), 0.0f64, |_| 0.0), 1.0 - 20.0 + 40.0);
        // Short chains keep the tree as written.
        assert_eq!(
            p("r - 1 - 2").unwrap(),
            Node::bin(BinOp::Sub, Node::bin(BinOp::Sub, Node::Var, Node::Num(1.0)), Node::Num(2.0))
        );
        // Nesting is still limited.
        assert!(p(&format!("{}r{}", "(".repeat(300), ")".repeat(300))).is_err());
    }
}
