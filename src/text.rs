//! User text on its way to an output or the terminal: scenario and chain names, file names, `[symbols]`
//! entries, figure labels. Every writer passes such text through [`one_line`], so a newline or a control
//! character can never start a new CSV row, end a LaTeX `%` comment, add a Markdown block or send a terminal
//! escape sequence. The scenario and chain loaders reject such characters up front ([`unsafe_char`]); the
//! writers escape them again as defence in depth.

use std::borrow::Cow;

/// Characters that must not reach an output raw: control characters (C0, DEL, C1, including newline, carriage
/// return and tab), the Unicode line and paragraph separators, and the bidirectional overrides and isolates
/// (which reorder how the text around them is displayed).
pub fn is_unsafe(c: char) -> bool {
    c.is_control() || matches!(c, '\u{2028}' | '\u{2029}' | '\u{202A}'..='\u{202E}' | '\u{2066}'..='\u{2069}')
}

/// The first unsafe character of `s` and its byte offset, if any.
pub fn unsafe_char(s: &str) -> Option<(usize, char)> {
    s.char_indices().find(|&(_, c)| is_unsafe(c))
}

/// A number as every output prints it: full f64 precision (shortest round-trip form), NaN and infinities
/// spelled out (`NaN`, `inf`, `-inf`).
pub fn num(x: f64) -> String {
    if x.is_finite() {
        format!("{x:?}")
    } else {
        format!("{x}")
    }
}

/// `s` with every unsafe character written as a visible escape (`\n`, `\r`, `\t`, else `\u{1b}`), so the
/// result is one line of printable text.
pub fn one_line(s: &str) -> Cow<'_, str> {
    if unsafe_char(s).is_none() {
        return Cow::Borrowed(s);
    }
    let mut o = String::with_capacity(s.len() + 8);
    for c in s.chars() {
        match c {
            '\n' => o.push_str("\\n"),
            '\r' => o.push_str("\\r"),
            '\t' => o.push_str("\\t"),
            c if is_unsafe(c) => o.push_str(&format!("\\u{{{:x}}}", c as u32)),
            c => o.push(c),
        }
    }
    Cow::Owned(o)
}

/// Text for the terminal: each line of `s` made safe with [`one_line`] (our own line breaks are kept).
pub fn terminal(s: &str) -> String {
    s.split('\n').map(one_line).collect::<Vec<_>>().join("\n")
}

/// TeX commands a `[symbols]` entry may not use: they read or write files, run programs or redefine macros.
const TEX_FORBIDDEN: [&str; 17] = [
    "input",
    "include",
    "write",
    "immediate",
    "openout",
    "openin",
    "read",
    "def",
    "edef",
    "gdef",
    "xdef",
    "let",
    "catcode",
    "csname",
    "special",
    "newcommand",
    "renewcommand",
];

/// Why `s` cannot be a math-mode symbol, if it cannot: an unsafe character, a character that ends or breaks
/// math mode (`$ % # &`), unbalanced braces, or a command from a list of file, shell and macro commands.
pub fn tex_symbol_problem(s: &str) -> Option<String> {
    if let Some((_, c)) = unsafe_char(s) {
        return Some(format!("contains the control character {}", one_line(&c.to_string())));
    }
    if let Some(c) = s.chars().find(|c| matches!(c, '$' | '%' | '#' | '&')) {
        return Some(format!("contains '{c}', which breaks out of math mode"));
    }
    let mut depth = 0i64;
    let mut prev_backslash = false;
    for c in s.chars() {
        if !prev_backslash {
            match c {
                '{' => depth += 1,
                '}' => depth -= 1,
                _ => {}
            }
        }
        if depth < 0 {
            return Some("has a '}' without its '{'".into());
        }
        prev_backslash = c == '\\' && !prev_backslash;
    }
    if depth != 0 {
        return Some("has unbalanced braces".into());
    }
    let bytes = s.as_bytes();
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i] == b'\\' {
            let start = i + 1;
            let mut j = start;
            while j < bytes.len() && bytes[j].is_ascii_alphabetic() {
                j += 1;
            }
            let cmd = &s[start..j];
            if TEX_FORBIDDEN.contains(&cmd) {
                return Some(format!("uses \\{cmd}, which is not allowed in a symbol"));
            }
            i = j.max(start + 1);
        } else {
            i += 1;
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn one_line_escapes_row_and_comment_breakers() {
        // common practice: a CSV row ends at '\n' (RFC 4180), a TeX comment at the end of the line.
        assert_eq!(one_line("a\nb,1\r\t\u{1b}[2J"), "a\\nb,1\\r\\t\\u{1b}[2J");
        assert_eq!(one_line("x\u{2028}y\u{202e}z"), "x\\u{2028}y\\u{202e}z");
        assert!(matches!(one_line("plain name, ±1 σ"), Cow::Borrowed(_)));
        assert_eq!(terminal("line one\nbad \u{7} bell"), "line one\nbad \\u{7} bell");
    }

    #[test]
    fn symbols_that_escape_math_mode_are_refused() {
        assert_eq!(tex_symbol_problem("\\lambda_{2}"), None);
        assert_eq!(tex_symbol_problem("\\mathcal{Q}^{\\prime}"), None);
        assert_eq!(tex_symbol_problem("\\{x\\}"), None);
        assert!(tex_symbol_problem("x$ \\input{/etc/passwd} $").is_some());
        assert!(tex_symbol_problem("\\input{secret}").unwrap().contains("\\input"));
        assert!(tex_symbol_problem("\\immediate\\write18{rm -rf}").is_some());
        assert!(tex_symbol_problem("a}\\b{").is_some());
        assert!(tex_symbol_problem("{a").is_some());
        assert!(tex_symbol_problem("m % rest").is_some());
        assert!(tex_symbol_problem("m\n\\section{x}").is_some());
    }
}
