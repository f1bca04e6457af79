//! Encoders: the laid-out scene as SVG text (physical size, provenance, real dash patterns, embedded
//! category bitmap), as a 300 dpi PNG rendered from that SVG (with text chunks), and as a PDF converted from
//! the same SVG with the embedded fonts.

use super::raster::encode_png;
use super::scene::{self, Anchor, Item, Scene};
use super::style::{self, render_error};
use super::{Figure, Look};
use crate::error::Result;
use std::fmt::Write;

const VERSION: &str = concat!("junctura ", env!("CARGO_PKG_VERSION"));

/// Render the figure as SVG text: its physical size (8.5 cm wide unless the look says otherwise), user
/// units of points (`viewBox`), text in the style's embedded font family, the category map (if any) as
/// one embedded PNG, and the provenance line as a comment and `<metadata>`.
pub fn render_svg(fig: &Figure) -> Result<String> {
    svg(&scene::scene(fig)?, &fig.provenance, fig.title.as_deref())
}

/// Render the figure as a PNG at 300 dpi, with `Title`, `Software` and `Comment` (provenance) text chunks
/// and the physical resolution recorded.
pub fn render_png(fig: &Figure) -> Result<Vec<u8>> {
    let sc = scene::scene(fig)?;
    let s = svg(&sc, &fig.provenance, fig.title.as_deref())?;
    png(&s, &sc, &fig.provenance, fig.title.as_deref())
}

/// Render the figure as a one-page PDF with vector curves and text in the embedded font; the provenance
/// line goes into the document information (Subject and Keywords).
pub fn render_pdf(fig: &Figure) -> Result<Vec<u8>> {
    let svg = render_svg(fig)?;
    pdf_from_svg(&svg, &fig.provenance, fig.title.as_deref())
}

/// Render panels in a grid of `cols` columns, with shared axes (the union of the panels' ranges; tick
/// labels on the outer panels), each panel's title above it and one legend above the grid, as SVG text.
pub fn render_panels(figs: &[Figure], cols: usize, look: &Look, provenance: &str) -> Result<String> {
    svg(&scene::scene_grid(figs, cols, look, None)?, provenance, None)
}

fn hex((r, g, b): (u8, u8, u8)) -> String {
    format!("#{r:02x}{g:02x}{b:02x}")
}

fn f(v: f64) -> String {
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".into()
    } else {
        s.to_string()
    }
}

/// The `x`, `y`, `width` and `height` attributes of an SVG element covering the box `b`.
fn box_attrs(b: &scene::BBox) -> String {
    format!("x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"", f(b.x0), f(b.y0), f(b.x1 - b.x0), f(b.y1 - b.y0))
}

fn path_d(pts: &[(f64, f64)], close: bool) -> String {
    let mut d = String::new();
    for (k, p) in pts.iter().enumerate() {
        let _ = write!(d, "{}{} {}", if k == 0 { "M" } else { " L" }, f(p.0), f(p.1));
    }
    if close {
        d.push_str(" Z");
    }
    d
}

/// The SVG text of a scene.
pub(crate) fn svg(sc: &Scene, provenance: &str, title: Option<&str>) -> Result<String> {
    let mut s = String::new();
    let _ = write!(
        s,
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\" \
         width=\"{:.3}cm\" height=\"{:.3}cm\" viewBox=\"0 0 {} {}\">\n<!-- {} -->\n",
        sc.w / 72.0 * 2.54,
        sc.h / 72.0 * 2.54,
        f(sc.w),
        f(sc.h),
        xml_escape(provenance).replace("--", "- -")
    );
    if let Some(t) = title {
        let _ = writeln!(s, "<title>{}</title>", xml_escape(t));
    }
    let _ = writeln!(
        s,
        "<metadata><provenance xmlns=\"urn:junctura:provenance\" generator=\"{VERSION}\">{}</provenance></metadata>",
        xml_escape(provenance)
    );
    let mut clip_id = 0;
    let _ = writeln!(s, "<g font-family=\"{}\">", sc.family);
    for it in &sc.items {
        match it {
            Item::Line { pts, colour, width, dash } => {
                if pts.len() < 2 {
                    continue;
                }
                let _ = write!(
                    s,
                    "<path d=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"{}\" stroke-linejoin=\"round\"",
                    path_d(pts, false),
                    hex(*colour),
                    f(*width)
                );
                if !dash.is_empty() {
                    let pat: Vec<String> = dash.iter().map(|v| f(*v)).collect();
                    let _ = write!(s, " stroke-dasharray=\"{}\"", pat.join(" "));
                }
                s.push_str("/>\n");
            }
            Item::Fill { pts, colour, opacity } => {
                let _ = writeln!(
                    s,
                    "<path d=\"{}\" fill=\"{}\" fill-opacity=\"{}\" stroke=\"none\"/>",
                    path_d(pts, true),
                    hex(*colour),
                    f(*opacity)
                );
            }
            Item::Rect { b, fill, stroke } => {
                let _ = write!(s, "<rect {}", box_attrs(b));
                match fill {
                    Some((c, a)) => {
                        let _ = write!(s, " fill=\"{}\"", hex(*c));
                        if *a < 1.0 {
                            let _ = write!(s, " fill-opacity=\"{}\"", f(*a));
                        }
                    }
                    None => s.push_str(" fill=\"none\""),
                }
                if let Some((c, w)) = stroke {
                    let _ = write!(s, " stroke=\"{}\" stroke-width=\"{}\"", hex(*c), f(*w));
                }
                s.push_str("/>\n");
            }
            Item::Circle { c, r, fill, stroke } => {
                let _ =
                    write!(s, "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" fill=\"{}\"", f(c.0), f(c.1), f(*r), hex(*fill));
                if let Some((sc, w)) = stroke {
                    let _ = write!(s, " stroke=\"{}\" stroke-width=\"{}\"", hex(*sc), f(*w));
                }
                s.push_str("/>\n");
            }
            Item::Text { at, size, colour, text, anchor, rotate } => {
                let a = match anchor {
                    Anchor::Start => "start",
                    Anchor::Middle => "middle",
                    Anchor::End => "end",
                };
                let _ = write!(
                    s,
                    "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{a}\" fill=\"{}\"",
                    f(at.0),
                    f(at.1),
                    f(*size),
                    hex(*colour)
                );
                if *rotate {
                    let _ = write!(s, " transform=\"rotate(-90 {} {})\"", f(at.0), f(at.1));
                }
                s.push('>');
                for (run, k) in super::text::runs(text) {
                    use super::text::{Script, SCRIPT_SCALE, SUB_SHIFT, SUPER_SHIFT};
                    match k {
                        Script::Normal => s.push_str(&xml_escape(&run)),
                        Script::Sub | Script::Super => {
                            let shift = if k == Script::Sub { SUB_SHIFT } else { SUPER_SHIFT };
                            let _ = write!(
                                s,
                                "<tspan font-size=\"{}\" baseline-shift=\"{}\">{}</tspan>",
                                f(size * SCRIPT_SCALE),
                                f(size * shift),
                                xml_escape(&run)
                            );
                        }
                    }
                }
                s.push_str("</text>\n");
            }
            Item::Image { b, clip, png } => {
                clip_id += 1;
                let _ = writeln!(
                    s,
                    "<defs><clipPath id=\"plot-area-{clip_id}\"><rect {}/></clipPath></defs>",
                    box_attrs(clip)
                );
                let _ = writeln!(
                    s,
                    "<image {} preserveAspectRatio=\"none\" image-rendering=\"optimizeSpeed\" \
                     style=\"image-rendering:pixelated\" clip-path=\"url(#plot-area-{clip_id})\" \
                     href=\"data:image/png;base64,{}\"/>",
                    box_attrs(b),
                    base64(png)
                );
            }
        }
    }
    s.push_str("</g>\n</svg>\n");
    Ok(s)
}

/// Options for reading our SVG: both embedded fonts in the font database (checked to be non-empty, since
/// an empty one silently drops all text).
fn svg_options() -> Result<usvg::Options<'static>> {
    let mut opt = usvg::Options { font_family: style::SERIF_FAMILY.to_string(), ..usvg::Options::default() };
    {
        let db = opt.fontdb_mut();
        db.load_font_data(style::SERIF_FONT.to_vec());
        db.load_font_data(dejavu::sans::regular().to_vec());
        db.set_serif_family(style::SERIF_FAMILY);
        db.set_sans_serif_family(style::SANS_FAMILY);
    }
    if opt.fontdb.len() < 2 {
        return Err(render_error("the font database is missing the embedded fonts"));
    }
    Ok(opt)
}

/// Raster the SVG at 300 dpi on white; fails if the picture comes out nearly blank.
pub(crate) fn png(svg: &str, sc: &Scene, provenance: &str, title: Option<&str>) -> Result<Vec<u8>> {
    let opt = svg_options()?;
    let tree = usvg::Tree::from_str(svg, &opt).map_err(|e| render_error(format!("reading our own SVG: {e}")))?;
    let k = style::PNG_DPI / 72.0;
    let (w, h) = ((sc.w * k).round() as u32, (sc.h * k).round() as u32);
    let mut pix = resvg::tiny_skia::Pixmap::new(w, h).ok_or_else(|| render_error("PNG size is zero"))?;
    pix.fill(resvg::tiny_skia::Color::WHITE);
    let sx = w as f32 / tree.size().width();
    let sy = h as f32 / tree.size().height();
    resvg::render(&tree, resvg::tiny_skia::Transform::from_scale(sx, sy), &mut pix.as_mut());
    let mut rgb = Vec::with_capacity((w * h * 3) as usize);
    for p in pix.pixels() {
        let c = p.demultiply();
        rgb.extend_from_slice(&[c.red(), c.green(), c.blue()]);
    }
    let inked = rgb.chunks(3).filter(|p| p.iter().any(|&c| c < 200)).count();
    if inked < (w * h / 500) as usize {
        return Err(render_error(format!("the PNG came out nearly blank ({inked} dark pixels)")));
    }
    let mut text = vec![("Software", VERSION.to_string()), ("Comment", provenance.to_string())];
    if let Some(t) = title {
        text.push(("Title", t.to_string()));
    }
    encode_png(&rgb, (w, h), &text, Some(style::PNG_DPI))
}

/// Convert our SVG to PDF: the embedded fonts are loaded into the converter's font database, the page is the SVG's physical size, and the
/// provenance goes into the document information.
pub(crate) fn pdf_from_svg(svg: &str, provenance: &str, title: Option<&str>) -> Result<Vec<u8>> {
    use pdf_writer::{Content, Finish, Name, Pdf, Rect, Ref, TextStr};
    let opt = svg_options()?;
    let tree = usvg::Tree::from_str(svg, &opt).map_err(|e| render_error(format!("reading our own SVG: {e}")))?;
    let (chunk, svg_ref) = svg2pdf::to_chunk(&tree, svg2pdf::ConversionOptions::default())
        .map_err(|e| render_error(format!("SVG to PDF conversion: {e}")))?;
    // usvg sizes are CSS pixels (96 per inch); PDF user space is points (72 per inch).
    let (w_pt, h_pt) = (tree.size().width() * 0.75, tree.size().height() * 0.75);

    let mut alloc = Ref::new(1);
    let (catalog, pages, page, content_ref, info) =
        (alloc.bump(), alloc.bump(), alloc.bump(), alloc.bump(), alloc.bump());
    let mut renumbered = std::collections::HashMap::new();
    let chunk = chunk.renumber(|old| *renumbered.entry(old).or_insert_with(|| alloc.bump()));
    let svg_ref =
        *renumbered.get(&svg_ref).ok_or_else(|| render_error("SVG to PDF conversion lost the figure object"))?;

    let mut pdf = Pdf::new();
    pdf.catalog(catalog).pages(pages);
    pdf.pages(pages).kids([page]).count(1);
    let mut p = pdf.page(page);
    p.media_box(Rect::new(0.0, 0.0, w_pt, h_pt));
    p.parent(pages);
    p.contents(content_ref);
    p.resources().x_objects().pair(Name(b"Fig"), svg_ref);
    p.finish();
    let mut content = Content::new();
    content.transform([w_pt, 0.0, 0.0, h_pt, 0.0, 0.0]).x_object(Name(b"Fig"));
    pdf.stream(content_ref, &content.finish());
    pdf.extend(&chunk);
    let mut doc = pdf.document_info(info);
    doc.subject(TextStr(provenance)).keywords(TextStr(provenance)).creator(TextStr(VERSION)).producer(TextStr(VERSION));
    if let Some(t) = title {
        doc.title(TextStr(t));
    }
    doc.finish();
    // The converter's hash maps order fonts and resources differently in each run: write one canonical form.
    Ok(super::pdf_canon::canonical(&pdf.finish()))
}

/// Escape text for XML character data and attribute values (control characters, which XML 1.0 does not allow,
/// are written as visible escapes by [`crate::text::one_line`]).
fn xml_escape(s: &str) -> String {
    crate::text::one_line(s).replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// Standard base64 (RFC 4648 section 4, with padding).
fn base64(bytes: &[u8]) -> String {
    const ABC: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    let mut out = String::with_capacity(bytes.len().div_ceil(3) * 4);
    for c in bytes.chunks(3) {
        let n = (c[0] as u32) << 16 | (*c.get(1).unwrap_or(&0) as u32) << 8 | *c.get(2).unwrap_or(&0) as u32;
        for (i, shift) in [18, 12, 6, 0].into_iter().enumerate() {
            if i <= c.len() {
                out.push(ABC[(n >> shift & 63) as usize] as char);
            } else {
                out.push('=');
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::plot::CategoryMap;
    use crate::plot::{LineStyle, Series};

    fn small_figure() -> Figure {
        Figure {
            x_label: "a/M".into(),
            y_label: "V(a)".into(),
            series: vec![Series {
                label: "V".into(),
                points: vec![(0.0, 0.0), (1.0, 1.0)],
                style: LineStyle::Dashed,
                colour: 0,
            }],
            provenance: "unit test".into(),
            ..Figure::default()
        }
    }

    #[test]
    fn dashed_curves_carry_a_dash_array() {
        let svg = render_svg(&small_figure()).unwrap();
        assert!(svg.contains("stroke-dasharray=\"4 2\""), "{svg}");
    }

    #[test]
    fn category_map_pixels_have_their_category_colours() {
        // 3 x 2 grid on [0, 3] x [0, 2]; row 0 is the bottom row.
        let cells = vec![0, 1, 2, 3, 4, 0];
        let categories: Vec<(String, usize)> = (0..5).map(|i| (String::new(), i)).collect();
        let mut fig = Figure {
            categories: Some(CategoryMap { x: (0.0, 3.0, 3), y: (0.0, 2.0, 2), cells: cells.clone(), categories }),
            ..small_figure()
        };
        fig.series[0].label.clear();
        let sc = scene::scene(&fig).unwrap();
        let s = svg(&sc, "t", None).unwrap();
        let bytes = png(&s, &sc, "t", None).unwrap();
        let mut reader = png::Decoder::new(bytes.as_slice()).read_info().unwrap();
        let mut buf = vec![0; reader.output_buffer_size()];
        reader.next_frame(&mut buf).unwrap();
        let w = reader.info().width;
        let k = style::PNG_DPI / 72.0;
        let p = sc.layout.plots[0];
        for (idx, &cat) in cells.iter().enumerate() {
            let (ix, iy) = (idx % 3, idx / 3);
            // Cell centre, nudged off the diagonal test curve (which runs from (0,0) to (1,1) in data).
            let (x, y) = (ix as f64 + 0.5, iy as f64 + 0.3);
            let px = ((p.x0 + x / 3.0 * (p.x1 - p.x0)) * k).round() as u32;
            let py = ((p.y1 - y / 2.0 * (p.y1 - p.y0)) * k).round() as u32;
            let o = ((py * w + px) * 3) as usize;
            let (cr, cg, cb) = style::category_fill(cat as usize);
            assert_eq!(&buf[o..o + 3], &[cr, cg, cb], "cell ({ix}, {iy}) should show category {cat}");
        }
        assert_eq!(s.matches("<image").count(), 1);
        assert!(s.matches("<rect").count() < 10);
    }

    #[test]
    fn base64_matches_rfc4648_test_vectors() {
        // RFC 4648 section 10 test vectors.
        for (i, o) in
            [("", ""), ("f", "Zg=="), ("fo", "Zm8="), ("foo", "Zm9v"), ("foob", "Zm9vYg=="), ("foobar", "Zm9vYmFy")]
        {
            assert_eq!(base64(i.as_bytes()), o);
        }
    }

    #[test]
    fn xml_escape_handles_markup() {
        assert_eq!(xml_escape("a<b & \"c\">"), "a&lt;b &amp; &quot;c&quot;&gt;");
    }
}
