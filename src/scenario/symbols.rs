//! The scenario's `[symbols]` table: how each parameter is written in formulas (LaTeX) and figures (Unicode).
//!
//! ```toml
//! [symbols]
//! lam = '\lambda'
//! q2 = 'q_2'
//! ```
//! A parameter without an entry is written by [`crate::expr::print::name_latex`]: one letter as is, Greek names
//! as their commands, trailing digits or the part after `_` as a subscript (`q2` -> `q_{2}`), any other
//! multi-letter name upright (`\mathrm{name}`).

use std::collections::BTreeMap;

/// Display symbols of the parameters, keyed by parameter name. The values are LaTeX math-mode strings.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Symbols {
    latex: BTreeMap<String, String>,
}

impl Symbols {
    /// Symbols from (parameter name, LaTeX) pairs; the names are checked by the scenario loader.
    pub fn new(pairs: impl IntoIterator<Item = (String, String)>) -> Symbols {
        Symbols { latex: pairs.into_iter().collect() }
    }

    /// The symbol the user chose for `name`, if any.
    pub fn explicit(&self, name: &str) -> Option<&str> {
        self.latex.get(name).map(String::as_str)
    }

    /// Every (name, LaTeX) entry of the table, in name order.
    pub fn entries(&self) -> impl Iterator<Item = (&str, &str)> {
        self.latex.iter().map(|(k, v)| (k.as_str(), v.as_str()))
    }

    /// LaTeX (math mode) for parameter `name`: the table entry, else the default rule of the module docs.
    pub fn latex(&self, name: &str) -> String {
        if let Some(s) = self.explicit(name) {
            return s.to_string();
        }
        default_latex(name)
    }

    /// Plain Unicode for parameter `name` (figure labels): the LaTeX symbol with Greek letters, sub- and
    /// superscripts of digits and signs turned into their Unicode characters; what cannot be converted is
    /// written as its LaTeX text without backslashes and braces.
    pub fn unicode(&self, name: &str) -> String {
        latex_to_unicode(&self.latex(name))
    }
}

fn default_latex(name: &str) -> String {
    crate::expr::print::name_latex(name)
}

/// Greek letters by LaTeX name and Unicode character.
const GREEK: [(&str, char); 40] = [
    ("alpha", 'α'),
    ("beta", 'β'),
    ("gamma", 'γ'),
    ("delta", 'δ'),
    ("epsilon", 'ϵ'),
    ("varepsilon", 'ε'),
    ("zeta", 'ζ'),
    ("eta", 'η'),
    ("theta", 'θ'),
    ("vartheta", 'ϑ'),
    ("iota", 'ι'),
    ("kappa", 'κ'),
    ("lambda", 'λ'),
    ("mu", 'μ'),
    ("nu", 'ν'),
    ("xi", 'ξ'),
    ("rho", 'ρ'),
    ("varrho", 'ϱ'),
    ("tau", 'τ'),
    ("upsilon", 'υ'),
    ("phi", 'ϕ'),
    ("varphi", 'φ'),
    ("chi", 'χ'),
    ("psi", 'ψ'),
    ("omega", 'ω'),
    ("Gamma", 'Γ'),
    ("Delta", 'Δ'),
    ("Theta", 'Θ'),
    ("Lambda", 'Λ'),
    ("Xi", 'Ξ'),
    ("Pi", 'Π'),
    ("Sigma", 'Σ'),
    ("Upsilon", 'Υ'),
    ("Phi", 'Φ'),
    ("Psi", 'Ψ'),
    ("Omega", 'Ω'),
    ("pi", 'π'),
    ("sigma", 'σ'),
    ("ell", 'ℓ'),
    ("hbar", 'ℏ'),
];

fn sub_char(c: char) -> Option<char> {
    Some(match c {
        '0'..='9' => char::from_u32('₀' as u32 + (c as u32 - '0' as u32))?,
        '+' => '₊',
        '-' => '₋',
        '=' => '₌',
        '(' => '₍',
        ')' => '₎',
        'a' => 'ₐ',
        'e' => 'ₑ',
        'o' => 'ₒ',
        'x' => 'ₓ',
        'h' => 'ₕ',
        'k' => 'ₖ',
        'l' => 'ₗ',
        'm' => 'ₘ',
        'n' => 'ₙ',
        'p' => 'ₚ',
        's' => 'ₛ',
        't' => 'ₜ',
        'i' => 'ᵢ',
        'j' => 'ⱼ',
        'r' => 'ᵣ',
        'u' => 'ᵤ',
        'v' => 'ᵥ',
        _ => return None,
    })
}

fn sup_char(c: char) -> Option<char> {
    Some(match c {
        '0' => '⁰',
        '1' => '¹',
        '2' => '²',
        '3' => '³',
        '4'..='9' => char::from_u32('⁴' as u32 + (c as u32 - '4' as u32))?,
        '+' => '⁺',
        '-' => '⁻',
        '=' => '⁼',
        '(' => '⁽',
        ')' => '⁾',
        'n' => 'ⁿ',
        'i' => 'ⁱ',
        _ => return None,
    })
}

/// Convert a short LaTeX math string (Greek letters, `_`/`^` scripts, `\mathrm{..}`) to Unicode text.
pub fn latex_to_unicode(s: &str) -> String {
    let chars: Vec<char> = s.chars().collect();
    let mut out = String::new();
    let mut i = 0;
    // Read one script argument: a braced group or a single character (or a command such as \alpha).
    fn group(chars: &[char], i: &mut usize) -> String {
        if *i < chars.len() && chars[*i] == '{' {
            let mut depth = 0;
            let start = *i + 1;
            while *i < chars.len() {
                match chars[*i] {
                    '{' => depth += 1,
                    '}' => {
                        depth -= 1;
                        if depth == 0 {
                            let g: String = chars[start..*i].iter().collect();
                            *i += 1;
                            return g;
                        }
                    }
                    _ => {}
                }
                *i += 1;
            }
            chars[start..].iter().collect()
        } else if *i < chars.len() && chars[*i] == '\\' {
            let start = *i;
            *i += 1;
            while *i < chars.len() && chars[*i].is_ascii_alphabetic() {
                *i += 1;
            }
            chars[start..*i].iter().collect()
        } else if *i < chars.len() {
            *i += 1;
            chars[*i - 1].to_string()
        } else {
            String::new()
        }
    }
    while i < chars.len() {
        let c = chars[i];
        match c {
            '\\' => {
                let start = i + 1;
                let mut j = start;
                while j < chars.len() && chars[j].is_ascii_alphabetic() {
                    j += 1;
                }
                let cmd: String = chars[start..j].iter().collect();
                i = j;
                if let Some((_, g)) = GREEK.iter().find(|(n, _)| *n == cmd) {
                    out.push(*g);
                } else if matches!(cmd.as_str(), "mathrm" | "mathit" | "text" | "mathsf" | "operatorname") {
                    let g = group(&chars, &mut i);
                    out.push_str(&latex_to_unicode(&g));
                } else if cmd.is_empty() && i < chars.len() {
                    // an escaped character such as \_ or \,
                    if chars[i] != ',' && chars[i] != ';' && chars[i] != '!' {
                        out.push(chars[i]);
                    }
                    i += 1;
                } else {
                    out.push_str(&cmd);
                }
            }
            '_' | '^' => {
                i += 1;
                let g = latex_to_unicode(&group(&chars, &mut i));
                let conv: Option<String> =
                    g.chars().map(|ch| if c == '_' { sub_char(ch) } else { sup_char(ch) }).collect();
                match conv {
                    Some(t) => out.push_str(&t),
                    None => {
                        out.push(c);
                        out.push_str(&g);
                    }
                }
            }
            '{' | '}' => i += 1,
            _ => {
                out.push(c);
                i += 1;
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn defaults_follow_the_documented_rule() {
        let s = Symbols::default();
        assert_eq!(s.latex("m"), "m");
        assert_eq!(s.latex("q2"), "q_{2}");
        assert_eq!(s.latex("lambda"), "\\lambda");
        assert_eq!(s.latex("mass"), "\\mathrm{mass}");
        assert_eq!(s.unicode("q2"), "q₂");
        assert_eq!(s.unicode("lambda"), "λ");
    }

    #[test]
    fn table_entries_win_and_convert_to_unicode() {
        let s =
            Symbols::new([("lam".to_string(), "\\lambda".to_string()), ("q2".to_string(), "q_{2}^{+}".to_string())]);
        assert_eq!(s.latex("lam"), "\\lambda");
        assert_eq!(s.unicode("lam"), "λ");
        assert_eq!(s.unicode("q2"), "q₂⁺");
        assert_eq!(latex_to_unicode("\\mathrm{M}_{\\odot}"), "M_odot");
        assert_eq!(latex_to_unicode("\\Lambda"), "Λ");
    }
}
