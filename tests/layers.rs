//! The module layout of the library (DEVELOPERS.md, "Data flow and module map"): no import cycles between sibling
//! modules at any depth, and the layer rules the map states (the model free of the file format, results free of
//! renderers and writers, renderers free of writers, the physics free of outputs).
//!
//! Imports are read from the source text: every `crate::a::b` path (in `use` trees too) and every `super::x`
//! outside test code. An edge a -> b between two modules is counted at the level where their paths part, so
//! `scan::fast` using `scan::cell` is an edge between the siblings `fast` and `cell`, and `report::derive` using
//! `junction::point` one between `report` and `junction`; a module using its own parent or child is no edge.

use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;

type Module = Vec<String>;

/// Module path of a file below `src/` (`a/mod.rs` is `a`, `a/b.rs` is `a::b`).
fn module_of(rel: &Path) -> Module {
    let mut parts: Vec<String> = rel.iter().map(|p| p.to_string_lossy().into_owned()).collect();
    let last = parts.pop().unwrap();
    let stem = last.trim_end_matches(".rs");
    if stem != "mod" && stem != "lib" {
        parts.push(stem.to_string());
    }
    parts
}

fn read_tree(dir: &Path, root: &Path, out: &mut BTreeMap<Module, String>) {
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        let rel = p.strip_prefix(root).unwrap().to_path_buf();
        if p.is_dir() {
            // The command-line program is a separate crate (main.rs) on top of the library.
            if rel != Path::new("cli") {
                read_tree(&p, root, out);
            }
        } else if p.extension().is_some_and(|x| x == "rs") {
            let name = p.file_name().unwrap().to_string_lossy();
            // Test-only files (`#[cfg(test)] mod x_tests;`) and the binary's entry point.
            if name.ends_with("_tests.rs") || name == "testgen.rs" || rel == Path::new("main.rs") {
                continue;
            }
            out.insert(module_of(&rel), std::fs::read_to_string(&p).unwrap());
        }
    }
}

/// The text without line comments and without test code: the item after each `#[cfg(test)]` or
/// `#[cfg(all(test, ...))]` (a `mod x;` up to its `;`, anything else up to its balanced closing brace).
fn code_only(text: &str) -> String {
    let text: String = text.lines().map(|l| l.split("//").next().unwrap_or("")).collect::<Vec<_>>().join("\n");
    let s = text.as_bytes();
    let mut out = String::new();
    let mut i = 0;
    while i < s.len() {
        let next = ["#[cfg(test)]", "#[cfg(all(test"].iter().filter_map(|m| text[i..].find(m)).min();
        let Some(k) = next else {
            out.push_str(&text[i..]);
            break;
        };
        out.push_str(&text[i..i + k]);
        i += k + 2;
        let (mut depth, mut opened) = (0usize, false);
        while i < s.len() {
            match s[i] {
                b';' if !opened => {
                    i += 1;
                    break;
                }
                b'{' => {
                    depth += 1;
                    opened = true;
                }
                b'}' if opened => {
                    depth -= 1;
                    if depth == 0 {
                        i += 1;
                        break;
                    }
                }
                _ => {}
            }
            i += 1;
        }
    }
    out
}

fn is_ident(c: u8) -> bool {
    c.is_ascii_alphanumeric() || c == b'_'
}

fn skip_ws(s: &[u8], i: &mut usize) {
    while *i < s.len() && s[*i].is_ascii_whitespace() {
        *i += 1;
    }
}

/// Parse one path (with `{...}` groups) starting at `i`, prefixed by `base`; push every full path to `out`.
fn parse_path(s: &[u8], i: &mut usize, base: Module, out: &mut Vec<Module>) {
    let mut cur = base;
    loop {
        skip_ws(s, i);
        if *i < s.len() && s[*i] == b'{' {
            *i += 1;
            loop {
                skip_ws(s, i);
                if *i >= s.len() {
                    return;
                }
                if s[*i] == b'}' {
                    *i += 1;
                    return;
                }
                let before = *i;
                parse_path(s, i, cur.clone(), out);
                skip_ws(s, i);
                // Skip `as alias` and anything else up to the next item.
                while *i < s.len() && s[*i] != b',' && s[*i] != b'}' {
                    *i += 1;
                }
                if *i < s.len() && s[*i] == b',' {
                    *i += 1;
                }
                if *i == before {
                    *i += 1;
                }
            }
        }
        let start = *i;
        while *i < s.len() && is_ident(s[*i]) {
            *i += 1;
        }
        if *i == start {
            out.push(cur);
            return;
        }
        let word = String::from_utf8_lossy(&s[start..*i]).into_owned();
        if word != "self" {
            cur.push(word);
        }
        if s[*i..].starts_with(b"::") {
            *i += 2;
        } else {
            out.push(cur);
            return;
        }
    }
}

/// Every module path the code of module `m` names.
fn references(m: &Module, code: &str) -> Vec<Module> {
    let s = code.as_bytes();
    let mut out = Vec::new();
    for (prefix, base) in [("crate::", Vec::new()), ("super::", m[..m.len().saturating_sub(1)].to_vec())] {
        let mut from = 0;
        while let Some(k) = code[from..].find(prefix) {
            let at = from + k;
            from = at + prefix.len();
            if at > 0 && (is_ident(s[at - 1]) || s[at - 1] == b'$' || s[at - 1] == b':') {
                continue;
            }
            let mut i = from;
            parse_path(s, &mut i, base.clone(), &mut out);
        }
    }
    out
}

/// The sibling-level import graph of the library.
fn graph() -> BTreeMap<Module, BTreeMap<Module, Module>> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut files = BTreeMap::new();
    read_tree(&root, &root, &mut files);
    let mods: BTreeSet<Module> = files.keys().cloned().collect();
    // edges[a][b] = the module whose code makes the edge (for the message).
    let mut edges: BTreeMap<Module, BTreeMap<Module, Module>> = BTreeMap::new();
    for (m, text) in &files {
        for r in references(m, &code_only(text)) {
            let Some(target) = (1..=r.len()).rev().map(|k| r[..k].to_vec()).find(|p| mods.contains(p)) else {
                continue;
            };
            let common = m.iter().zip(&target).take_while(|(a, b)| a == b).count();
            if common == m.len() || common == target.len() {
                continue;
            }
            let (a, b) = (m[..=common].to_vec(), target[..=common].to_vec());
            edges.entry(a).or_default().entry(b).or_insert_with(|| m.clone());
        }
    }
    edges
}

fn name(m: &Module) -> String {
    m.join("::")
}

/// A path from `from` to `to` along the edges, if there is one.
fn path(edges: &BTreeMap<Module, BTreeMap<Module, Module>>, from: &Module, to: &Module) -> Option<Vec<Module>> {
    let mut prev: BTreeMap<Module, Module> = BTreeMap::new();
    let mut queue = std::collections::VecDeque::from([from.clone()]);
    let mut seen = BTreeSet::from([from.clone()]);
    while let Some(v) = queue.pop_front() {
        if &v == to {
            let mut p = vec![v.clone()];
            while let Some(u) = prev.get(p.last().unwrap()) {
                p.push(u.clone());
            }
            p.reverse();
            return Some(p);
        }
        for w in edges.get(&v).into_iter().flat_map(|e| e.keys()) {
            if seen.insert(w.clone()) {
                prev.insert(w.clone(), v.clone());
                queue.push_back(w.clone());
            }
        }
    }
    None
}

#[test]
fn no_import_cycles_between_sibling_modules() {
    let edges = graph();
    // The reader must see the crate: a handful of well-known edges (common practice: a test of a test).
    for (a, b) in [("scan", "junction"), ("report", "statics"), ("scenario", "model")] {
        let (a, b) = (vec![a.to_string()], vec![b.to_string()]);
        assert!(
            edges.get(&a).is_some_and(|e| e.contains_key(&b)),
            "the import reader lost {} -> {}",
            name(&a),
            name(&b)
        );
    }
    let mut cycles = Vec::new();
    for (a, out) in &edges {
        for (b, via) in out {
            if let Some(back) = path(&edges, b, a) {
                let round: Vec<String> = back.iter().map(name).collect();
                cycles.push(format!("{} -> {} (in {}), back: {}", name(a), name(b), name(via), round.join(" -> ")));
            }
        }
    }
    assert!(cycles.is_empty(), "import cycles:\n{}", cycles.join("\n"));
}

#[test]
fn layers_import_only_downward() {
    let edges = graph();
    let uses = |a: &str| -> BTreeSet<String> {
        edges.get(&vec![a.to_string()]).map(|e| e.keys().map(name).collect()).unwrap_or_default()
    };
    let forbid = |a: &str, banned: &[&str], why: &str| {
        let bad: Vec<String> = uses(a).into_iter().filter(|b| banned.contains(&b.as_str())).collect();
        assert!(bad.is_empty(), "{a} imports {bad:?}: {why}");
    };
    let model: Vec<String> = uses("model").into_iter().collect();
    assert!(
        model.iter().all(|m| m == "expr" || m == "tolerances"),
        "model imports {model:?}: the model is free of the file format and of the computations (expr and tolerances only)"
    );
    let writers = ["output", "files"];
    let above_physics = ["report", "export", "files", "output"];
    for physics in
        ["expr", "metric", "rational", "roots", "junction", "statics", "scan", "dynamics", "geodesic", "survey"]
    {
        forbid(physics, &above_physics, "the physics returns values; results, renderers and writers sit above it");
    }
    forbid(
        "report",
        &["export", "output", "files"],
        "result structs are rendered by export and written by files/output",
    );
    forbid("export", &writers, "renderers return text or bytes; files and output write them");
    forbid(
        "error",
        &["scenario", "junction", "statics", "scan", "report", "export"],
        "the error type sits below every layer",
    );
}
