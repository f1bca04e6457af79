//! Text metrics from the embedded fonts (glyph advances, ascent and descent), so that the layout knows the
//! box of every label before anything is drawn. A character the chosen font lacks is measured in the other
//! embedded font, as the SVG renderers fall back to it.

use super::style::{SANS_FAMILY, SERIF_FAMILY, SERIF_FONT};
use std::sync::OnceLock;

struct Metrics {
    face: ttf_parser::Face<'static>,
    upem: f64,
}

fn faces() -> &'static [Option<Metrics>; 2] {
    static F: OnceLock<[Option<Metrics>; 2]> = OnceLock::new();
    F.get_or_init(|| {
        let load = |bytes: &'static [u8]| {
            ttf_parser::Face::parse(bytes, 0).ok().map(|face| Metrics { upem: face.units_per_em() as f64, face })
        };
        [load(SERIF_FONT), load(dejavu::sans::regular())]
    })
}

/// The primary face for a family (index into `faces`).
fn primary(family: &str) -> usize {
    if family == SERIF_FAMILY {
        0
    } else {
        debug_assert_eq!(family, SANS_FAMILY);
        1
    }
}

/// Vertical position of a run of text.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Script {
    Normal,
    Sub,
    Super,
}

/// Size of sub- and superscripts relative to the text, and their baseline shifts (fractions of the text
/// size; positive is up). Typeset as smaller base glyphs, as TeX does, since the serif font has no Unicode
/// subscript characters.
pub(crate) const SCRIPT_SCALE: f64 = 0.7;
pub(crate) const SUB_SHIFT: f64 = -0.22;
pub(crate) const SUPER_SHIFT: f64 = 0.36;

/// The base character of a Unicode sub- or superscript character.
fn script_of(c: char) -> Option<(Script, char)> {
    const SUB: &str = "₀₁₂₃₄₅₆₇₈₉";
    const SUP: &str = "⁰¹²³⁴⁵⁶⁷⁸⁹";
    if let Some(i) = SUB.chars().position(|x| x == c) {
        return Some((Script::Sub, char::from(b'0' + i as u8)));
    }
    if let Some(i) = SUP.chars().position(|x| x == c) {
        return Some((Script::Super, char::from(b'0' + i as u8)));
    }
    Some(match c {
        '₊' => (Script::Sub, '+'),
        '₋' => (Script::Sub, '−'),
        '₌' => (Script::Sub, '='),
        'ₐ' => (Script::Sub, 'a'),
        'ₑ' => (Script::Sub, 'e'),
        'ₕ' => (Script::Sub, 'h'),
        'ₖ' => (Script::Sub, 'k'),
        'ₘ' => (Script::Sub, 'm'),
        'ₙ' => (Script::Sub, 'n'),
        'ₚ' => (Script::Sub, 'p'),
        'ₛ' => (Script::Sub, 's'),
        'ₜ' => (Script::Sub, 't'),
        '⁺' => (Script::Super, '+'),
        '⁻' => (Script::Super, '−'),
        'ⁱ' => (Script::Super, 'i'),
        'ⁿ' => (Script::Super, 'n'),
        _ => return None,
    })
}

/// Split text into runs of normal, subscript and superscript characters (the latter as base characters).
pub(crate) fn runs(text: &str) -> Vec<(String, Script)> {
    let mut out: Vec<(String, Script)> = Vec::new();
    for c in text.chars() {
        let (sc, ch) = script_of(c).unwrap_or((Script::Normal, c));
        match out.last_mut() {
            Some((s, k)) if *k == sc => s.push(ch),
            _ => out.push((ch.to_string(), sc)),
        }
    }
    out
}

/// Width of `text` at `size` points in `family`, in points (sub- and superscripts at their smaller size).
pub(crate) fn width(text: &str, family: &str, size: f64) -> f64 {
    runs(text)
        .iter()
        .map(|(s, k)| {
            if *k == Script::Normal {
                plain_width(s, family, size)
            } else {
                plain_width(s, family, size * SCRIPT_SCALE)
            }
        })
        .sum()
}

fn plain_width(text: &str, family: &str, size: f64) -> f64 {
    let f = faces();
    let p = primary(family);
    let mut w = 0.0;
    for c in text.chars() {
        let mut adv = None;
        for idx in [p, 1 - p] {
            if let Some(m) = &f[idx] {
                if let Some(g) = m.face.glyph_index(c) {
                    adv = m.face.glyph_hor_advance(g).map(|a| a as f64 / m.upem);
                    break;
                }
            }
        }
        w += adv.unwrap_or(0.5);
    }
    w * size
}

/// Ascent and descent (both positive, points) of `family` at `size`.
pub(crate) fn vertical(family: &str, size: f64) -> (f64, f64) {
    match &faces()[primary(family)] {
        Some(m) => (m.face.ascender() as f64 / m.upem * size, -(m.face.descender() as f64) / m.upem * size),
        None => (0.8 * size, 0.2 * size),
    }
}

/// Whether both embedded fonts parse (the renderers refuse to draw otherwise).
pub(crate) fn fonts_ok() -> bool {
    faces().iter().all(Option::is_some)
}

/// Whether the primary font of `family` has a glyph for `c`.
#[cfg(test)]
pub(crate) fn has_glyph(family: &str, c: char) -> bool {
    faces()[primary(family)].as_ref().and_then(|m| m.face.glyph_index(c)).is_some()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn serif_font_covers_the_figure_symbols() {
        assert!(fonts_ok());
        for c in "aβσστλ−±√≥ΛΦ+0123456789".chars() {
            assert!(has_glyph(SERIF_FAMILY, c), "STIX lacks {c:?}");
        }
    }

    #[test]
    fn scripts_become_small_base_glyphs() {
        let r = runs("a₀ = r₊²");
        assert_eq!(
            r,
            vec![
                ("a".to_string(), Script::Normal),
                ("0".to_string(), Script::Sub),
                (" = r".to_string(), Script::Normal),
                ("+".to_string(), Script::Sub),
                ("2".to_string(), Script::Super),
            ]
        );
        assert!(width("a₀", SERIF_FAMILY, 10.0) < width("a0", SERIF_FAMILY, 10.0));
    }

    #[test]
    fn wider_text_measures_wider() {
        let a = width("a/M", SERIF_FAMILY, 9.0);
        let b = width("a/M a/M", SERIF_FAMILY, 9.0);
        assert!(a > 9.0 && b > 2.0 * a, "{a} {b}");
        let (asc, desc) = vertical(SERIF_FAMILY, 10.0);
        assert!(asc > 5.0 && asc < 12.0 && desc > 0.5 && desc < 5.0, "{asc} {desc}");
    }
}
