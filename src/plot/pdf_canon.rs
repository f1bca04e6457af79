//! Byte-identical PDF files from identical figures. The SVG-to-PDF converter keeps fonts and resource entries in
//! hash maps, so the order of font objects, the numbers given to them and the order of resource dictionary
//! entries change from run to run. [`canonical`] rewrites a finished PDF (as written by `pdf-writer`: one
//! object per `N 0 obj ... endobj`, streams with a direct `/Length`, a classic cross-reference table) into one
//! canonical form: entries of dictionaries that hold only references sorted by name, objects renumbered in the
//! order they are first reached from the trailer (`/Root`, then `/Info`), written in that order with a new
//! cross-reference table. The content of every object is unchanged except for its reference numbers.

use std::collections::HashMap;

struct Obj {
    /// Dictionary / value text before any stream data (references rewritten later).
    head: Vec<u8>,
    /// Raw stream bytes and what follows them, if a stream.
    stream: Option<Vec<u8>>,
}

fn find(hay: &[u8], needle: &[u8], from: usize) -> Option<usize> {
    hay.get(from..)?.windows(needle.len()).position(|w| w == needle).map(|p| p + from)
}

fn parse_uint(b: &[u8]) -> Option<(u32, usize)> {
    let n = b.iter().take_while(|c| c.is_ascii_digit()).count();
    if n == 0 || n > 9 {
        return None;
    }
    std::str::from_utf8(&b[..n]).ok()?.parse().ok().map(|v| (v, n))
}

/// Every `N 0 R` in `head` outside literal strings: (byte range, N).
fn refs(head: &[u8]) -> Vec<(usize, usize, u32)> {
    let mut out = Vec::new();
    let (mut i, mut depth) = (0, 0usize);
    while i < head.len() {
        let c = head[i];
        if depth > 0 {
            match c {
                b'\\' => i += 1,
                b'(' => depth += 1,
                b')' => depth -= 1,
                _ => {}
            }
            i += 1;
            continue;
        }
        if c == b'(' {
            depth = 1;
            i += 1;
            continue;
        }
        let boundary = i == 0 || !head[i - 1].is_ascii_alphanumeric();
        if c.is_ascii_digit() && boundary {
            if let Some((n, len)) = parse_uint(&head[i..]) {
                let rest = &head[i + len..];
                let ends = rest.len() == 4 || rest.get(4).is_some_and(|b| !b.is_ascii_alphanumeric());
                if rest.starts_with(b" 0 R") && ends {
                    out.push((i, i + len, n));
                    i += len + 4;
                    continue;
                }
                i += len;
                continue;
            }
        }
        i += 1;
    }
    out
}

/// Sort the lines of every `<< ... >>` block whose lines are all `/Name N 0 R` entries.
fn sort_reference_dicts(head: &[u8]) -> Vec<u8> {
    let Ok(text) = std::str::from_utf8(head) else { return head.to_vec() };
    let lines: Vec<&str> = text.split('\n').collect();
    let is_entry = |l: &str| {
        let t = l.trim();
        let mut p = t.split(' ');
        matches!((p.next(), p.next(), p.next(), p.next(), p.next()),
            (Some(n), Some(k), Some("0"), Some("R"), None) if n.starts_with('/') && k.bytes().all(|b| b.is_ascii_digit()))
    };
    let mut out: Vec<String> = Vec::with_capacity(lines.len());
    let mut i = 0;
    while i < lines.len() {
        out.push(lines[i].to_string());
        if lines[i].ends_with("<<") {
            let start = i + 1;
            let mut j = start;
            while j < lines.len() && is_entry(lines[j]) {
                j += 1;
            }
            if j > start + 1 && j < lines.len() && lines[j].trim() == ">>" {
                let mut block: Vec<&str> = lines[start..j].to_vec();
                block.sort_by_key(|l| l.trim().split(' ').next().unwrap_or("").to_string());
                out.extend(block.into_iter().map(String::from));
                i = j;
                continue;
            }
        }
        i += 1;
    }
    out.join("\n").into_bytes()
}

/// The canonical form of `pdf`; input that is not in the expected layout is returned unchanged.
pub fn canonical(pdf: &[u8]) -> Vec<u8> {
    try_canonical(pdf).unwrap_or_else(|| pdf.to_vec())
}

fn try_canonical(pdf: &[u8]) -> Option<Vec<u8>> {
    let first = find(pdf, b"\n1 0 obj\n", 0)? + 1;
    let header = &pdf[..first];
    let xref = find(pdf, b"\nxref\n", first)?;
    let trailer_at = find(pdf, b"trailer\n", xref)?;
    let trailer_end = find(pdf, b"startxref", trailer_at)?;
    let trailer = &pdf[trailer_at..trailer_end];
    let mut objs: HashMap<u32, Obj> = HashMap::new();
    let mut order = Vec::new();
    let mut pos = first;
    while pos < xref {
        let (num, len) = parse_uint(&pdf[pos..])?;
        let body_start = pos + len;
        if !pdf[body_start..].starts_with(b" 0 obj\n") {
            return None;
        }
        let body_start = body_start + 7;
        let endobj = find(pdf, b"\nendobj\n", body_start)?;
        let stream_kw = find(pdf, b">>\nstream\n", body_start).filter(|&s| s < endobj);
        let (obj, end) = match stream_kw {
            None => (Obj { head: pdf[body_start..endobj].to_vec(), stream: None }, endobj + 8),
            Some(s) => {
                let head = &pdf[body_start..s + 2];
                let l = find(head, b"/Length ", 0)?;
                let (length, _) = parse_uint(&head[l + 8..])?;
                let data_start = s + 10;
                let data_end = data_start + length as usize;
                let tail = b"\nendstream\nendobj\n";
                if pdf.get(data_end..data_end + tail.len())? != tail {
                    return None;
                }
                (Obj { head: head.to_vec(), stream: Some(pdf[data_start..data_end].to_vec()) }, data_end + tail.len())
            }
        };
        objs.insert(num, Obj { head: sort_reference_dicts(&obj.head), stream: obj.stream });
        order.push(num);
        pos = end;
        while pos < xref && pdf[pos] == b'\n' {
            pos += 1;
        }
    }
    // Number objects in the order they are first reached from the trailer (depth first).
    let mut new_num: HashMap<u32, u32> = HashMap::new();
    let mut seq = Vec::new();
    let mut stack: Vec<u32> = refs(trailer).into_iter().rev().map(|r| r.2).collect();
    while let Some(n) = stack.pop() {
        if new_num.contains_key(&n) || !objs.contains_key(&n) {
            continue;
        }
        new_num.insert(n, seq.len() as u32 + 1);
        seq.push(n);
        for r in refs(&objs[&n].head).into_iter().rev() {
            if !new_num.contains_key(&r.2) {
                stack.push(r.2);
            }
        }
    }
    for n in order {
        if let std::collections::hash_map::Entry::Vacant(e) = new_num.entry(n) {
            e.insert(seq.len() as u32 + 1);
            seq.push(n);
        }
    }
    let rewrite = |head: &[u8]| -> Option<Vec<u8>> {
        let mut out = Vec::with_capacity(head.len());
        let mut last = 0;
        for (a, b, n) in refs(head) {
            out.extend_from_slice(&head[last..a]);
            out.extend_from_slice(new_num.get(&n)?.to_string().as_bytes());
            last = b;
        }
        out.extend_from_slice(&head[last..]);
        Some(out)
    };
    let mut out = header.to_vec();
    let mut offsets = Vec::with_capacity(seq.len());
    for (k, n) in seq.iter().enumerate() {
        let o = &objs[n];
        offsets.push(out.len());
        out.extend_from_slice(format!("{} 0 obj\n", k + 1).as_bytes());
        out.extend_from_slice(&rewrite(&o.head)?);
        match &o.stream {
            None => out.extend_from_slice(b"\nendobj\n\n"),
            Some(data) => {
                out.extend_from_slice(b"\nstream\n");
                out.extend_from_slice(data);
                out.extend_from_slice(b"\nendstream\nendobj\n\n");
            }
        }
    }
    let xref_at = out.len();
    out.extend_from_slice(format!("xref\n0 {}\n0000000000 65535 f\r\n", seq.len() + 1).as_bytes());
    for o in offsets {
        out.extend_from_slice(format!("{o:010} 00000 n\r\n").as_bytes());
    }
    let trailer = rewrite(trailer)?;
    let size_at = find(&trailer, b"/Size ", 0)?;
    let (_, size_len) = parse_uint(&trailer[size_at + 6..])?;
    out.extend_from_slice(&trailer[..size_at + 6]);
    out.extend_from_slice((seq.len() + 1).to_string().as_bytes());
    out.extend_from_slice(&trailer[size_at + 6 + size_len..]);
    out.extend_from_slice(format!("startxref\n{xref_at}\n%%EOF").as_bytes());
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn references_outside_strings_only() {
        let r = refs(b"<< /A 12 0 R /B (x 3 0 R) /C [4 0 R 5 0 R] /D 10 0 Rx >>");
        assert_eq!(r.iter().map(|r| r.2).collect::<Vec<_>>(), vec![12, 4, 5]);
    }

    #[test]
    fn reference_dicts_sorted_by_name() {
        let h = b"<<\n  /XObject <<\n    /xo2 8 0 R\n    /xo0 6 0 R\n  >>\n>>";
        assert_eq!(sort_reference_dicts(h), b"<<\n  /XObject <<\n    /xo0 6 0 R\n    /xo2 8 0 R\n  >>\n>>".to_vec());
    }

    fn doc(swap: bool) -> Vec<u8> {
        use pdf_writer::{Finish, Name, Pdf, Ref};
        let mut pdf = Pdf::new();
        pdf.catalog(Ref::new(1)).pages(Ref::new(2));
        pdf.pages(Ref::new(2)).kids([Ref::new(3)]).count(1);
        let (a, b) = if swap { (Ref::new(5), Ref::new(4)) } else { (Ref::new(4), Ref::new(5)) };
        let mut p = pdf.page(Ref::new(3));
        p.parent(Ref::new(2));
        let mut res = p.resources();
        let mut x = res.x_objects();
        if swap {
            x.pair(Name(b"b"), b).pair(Name(b"a"), a);
        } else {
            x.pair(Name(b"a"), a).pair(Name(b"b"), b);
        }
        x.finish();
        res.finish();
        p.finish();
        let (first, second) = if swap { (b, a) } else { (a, b) };
        let data_a: &[u8] = b"stream endobj A";
        let data_b: &[u8] = b"B";
        pdf.form_xobject(first, if swap { data_b } else { data_a });
        pdf.form_xobject(second, if swap { data_a } else { data_b });
        pdf.finish()
    }

    #[test]
    fn shuffled_objects_and_entries_give_identical_bytes() {
        // The same document written with its objects numbered, ordered and listed differently.
        let (x, y) = (doc(false), doc(true));
        assert_ne!(x, y);
        assert_eq!(canonical(&x), canonical(&y));
        assert_eq!(canonical(&canonical(&x)), canonical(&x));
        let c = canonical(&x);
        let text = String::from_utf8_lossy(&c);
        assert!(text.contains("stream endobj A") && text.contains("/Size 6") && text.ends_with("%%EOF"));
    }
}
