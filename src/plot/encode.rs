//! Encoders: the figure as SVG text (physical size, provenance, embedded category bitmap), as a 300 dpi PNG
//! with text chunks, and as a PDF converted from the SVG with the same embedded font.

use super::draw::{self, Device, Layout, MapMode};
use super::style::{self, render_error};
use super::{plot_window, CategoryMap, Figure};
use crate::error::Result;
use plotters::prelude::{BitMapBackend, SVGBackend};

const VERSION: &str = concat!("junctura ", env!("CARGO_PKG_VERSION"));

/// Render the figure as SVG text: 8.5 cm wide, drawn on a 4x-per-point grid (`viewBox`), DejaVu Sans text,
/// the category map (if any) as one embedded PNG, and the provenance line as a comment and `<metadata>`.
pub fn render_svg(fig: &Figure) -> Result<String> {
    style::ensure_font()?;
    svg_with_family(fig, style::FONT_FAMILY)
}

/// Render the figure as a PNG at 300 dpi, 8.5 cm wide, with `Title`, `Software` and `Comment`
/// (provenance) text chunks and the physical resolution recorded.
pub fn render_png(fig: &Figure) -> Result<Vec<u8>> {
    style::ensure_font()?;
    png_with_family(fig, style::FONT_FAMILY)
}

/// Render the figure as a one-page PDF (8.5 cm wide) with vector curves and text in the embedded DejaVu
/// Sans; the provenance line goes into the document information (Subject and Keywords).
pub fn render_pdf(fig: &Figure) -> Result<Vec<u8>> {
    let svg = render_svg(fig)?;
    pdf_from_svg(&svg, &fig.provenance, fig.title.as_deref())
}

fn size_px(px_per_pt: f64) -> (u32, u32) {
    ((style::WIDTH_PT * px_per_pt).round() as u32, (style::HEIGHT_PT * px_per_pt).round() as u32)
}

/// SVG rendering with an explicit font family (tests use an unregistered one to check the failure path).
pub(crate) fn svg_with_family(fig: &Figure, family: &str) -> Result<String> {
    let window = plot_window(fig)?;
    let k = style::SVG_PX_PER_PT;
    let (w, h) = size_px(k);
    let mut svg = String::new();
    let layout = {
        let backend = SVGBackend::with_string(&mut svg, (w, h));
        let dev = Device { px_per_pt: k, family, size_per_em: 1.24, map: MapMode::Deferred };
        draw::draw(fig, window, backend, &dev)?
    };
    if svg.matches("<text").count() < 2 {
        return Err(render_error("the SVG came out without text (axis labels and ticks are missing)"));
    }
    finish_svg(svg, fig, &layout, (w, h))
}

/// Give the SVG its physical size, provenance and (if any) the category map image.
fn finish_svg(mut svg: String, fig: &Figure, layout: &Layout, (w, h): (u32, u32)) -> Result<String> {
    let old = format!("width=\"{w}\" height=\"{h}\"");
    let new =
        format!("width=\"{:.3}cm\" height=\"{:.3}cm\"", style::WIDTH_PT / 72.0 * 2.54, style::HEIGHT_PT / 72.0 * 2.54);
    if !svg.contains(&old) {
        return Err(render_error("unexpected SVG header from the drawing backend"));
    }
    svg = svg.replacen(&old, &new, 1);
    let open_end = svg.find("<svg").and_then(|i| svg[i..].find('>').map(|j| i + j + 1));
    let Some(open_end) = open_end else {
        return Err(render_error("unexpected SVG header from the drawing backend"));
    };
    let mut head = String::new();
    head.push_str(&format!("\n<!-- {} -->\n", xml_escape(&fig.provenance).replace("--", "- -")));
    if let Some(t) = &fig.title {
        head.push_str(&format!("<title>{}</title>\n", xml_escape(t)));
    }
    head.push_str(&format!(
        "<metadata><provenance xmlns=\"urn:junctura:provenance\" generator=\"{VERSION}\">{}</provenance></metadata>\n",
        xml_escape(&fig.provenance)
    ));
    svg.insert_str(open_end, &head);
    if let (Some(m), Some(rect)) = (&fig.categories, layout.map) {
        // Under everything but the white background: right after the first (background) rectangle.
        let bg_end = svg[open_end..]
            .find("<rect")
            .and_then(|i| svg[open_end + i..].find("/>").map(|j| open_end + i + j + 2))
            .ok_or_else(|| render_error("no background rectangle in the SVG"))?;
        svg.insert_str(bg_end, &map_image(m, rect, layout.plot)?);
    }
    Ok(svg)
}

/// The `<image>` element for a category map: one pixel per cell, stretched over the map's extent without
/// smoothing, clipped to the plot area.
fn map_image(m: &CategoryMap, (l, t, r, b): (f64, f64, f64, f64), plot: (f64, f64, f64, f64)) -> Result<String> {
    let (nx, ny) = (m.x.2, m.y.2);
    let mut rgb = Vec::with_capacity(nx * ny * 3);
    for row in (0..ny).rev() {
        for col in 0..nx {
            let cat = m.cells[row * nx + col] as usize;
            let (cr, cg, cb) = style::category_fill(m.categories[cat].1);
            rgb.extend_from_slice(&[cr, cg, cb]);
        }
    }
    let png = encode_png(&rgb, (nx as u32, ny as u32), &[], None)?;
    Ok(format!(
        "\n<defs><clipPath id=\"plot-area\"><rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/></clipPath></defs>\n\
         <image x=\"{l}\" y=\"{t}\" width=\"{}\" height=\"{}\" preserveAspectRatio=\"none\" \
         image-rendering=\"optimizeSpeed\" style=\"image-rendering:pixelated\" clip-path=\"url(#plot-area)\" \
         href=\"data:image/png;base64,{}\"/>\n",
        plot.0,
        plot.1,
        plot.2 - plot.0,
        plot.3 - plot.1,
        r - l,
        b - t,
        base64(&png)
    ))
}

/// Raster rendering: RGB pixels, their size and the layout. Fails if the picture comes out nearly blank.
fn raster(fig: &Figure, family: &str) -> Result<(Vec<u8>, (u32, u32), Layout)> {
    let window = plot_window(fig)?;
    let k = style::PNG_DPI / 72.0;
    let (w, h) = size_px(k);
    let mut buf = vec![0u8; (w * h * 3) as usize];
    let layout = {
        let backend = BitMapBackend::with_buffer(&mut buf, (w, h));
        let dev = Device { px_per_pt: k, family, size_per_em: 1.164, map: MapMode::Pixels };
        draw::draw(fig, window, backend, &dev)?
    };
    let inked = buf.chunks(3).filter(|p| p.iter().any(|&c| c < 200)).count();
    if inked < (w * h / 500) as usize {
        return Err(render_error(format!("the PNG came out nearly blank ({inked} dark pixels)")));
    }
    Ok((buf, (w, h), layout))
}

/// PNG rendering with an explicit font family.
pub(crate) fn png_with_family(fig: &Figure, family: &str) -> Result<Vec<u8>> {
    let (buf, (w, h), _) = raster(fig, family)?;
    let mut text = vec![("Software", VERSION.to_string()), ("Comment", fig.provenance.clone())];
    if let Some(t) = &fig.title {
        text.push(("Title", t.clone()));
    }
    encode_png(&buf, (w, h), &text, Some(style::PNG_DPI))
}

/// Encode 8-bit RGB pixels as PNG with text chunks (`tEXt` for Latin-1 text, `iTXt` otherwise) and an
/// optional resolution in dots per inch.
fn encode_png(rgb: &[u8], (w, h): (u32, u32), text: &[(&str, String)], dpi: Option<f64>) -> Result<Vec<u8>> {
    let mut out = Vec::new();
    let fail = |e: png::EncodingError| render_error(format!("PNG encoding: {e}"));
    {
        let mut enc = png::Encoder::new(&mut out, w, h);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        enc.set_compression(png::Compression::Best);
        if let Some(dpi) = dpi {
            let ppm = (dpi / 0.0254).round() as u32;
            enc.set_pixel_dims(Some(png::PixelDimensions { xppu: ppm, yppu: ppm, unit: png::Unit::Meter }));
        }
        for (key, value) in text {
            if value.chars().all(|c| (c as u32) < 256) {
                enc.add_text_chunk(key.to_string(), value.clone()).map_err(fail)?;
            } else {
                enc.add_itxt_chunk(key.to_string(), value.clone()).map_err(fail)?;
            }
        }
        let mut writer = enc.write_header().map_err(fail)?;
        writer.write_image_data(rgb).map_err(fail)?;
        writer.finish().map_err(fail)?;
    }
    Ok(out)
}

/// Convert our SVG to PDF: the bundled font is loaded into the converter's font database (checked to be
/// non-empty, since an empty one silently drops all text), the page is the SVG's physical size, and the
/// provenance goes into the document information.
pub(crate) fn pdf_from_svg(svg: &str, provenance: &str, title: Option<&str>) -> Result<Vec<u8>> {
    use pdf_writer::{Content, Finish, Name, Pdf, Rect, Ref, TextStr};
    let mut opt = usvg::Options { font_family: style::FONT_FAMILY.to_string(), ..usvg::Options::default() };
    {
        let db = opt.fontdb_mut();
        db.load_font_data(dejavu::sans::regular().to_vec());
        db.set_sans_serif_family(style::FONT_FAMILY);
    }
    if opt.fontdb.is_empty() {
        return Err(render_error("the PDF converter's font database is empty (the bundled font did not load)"));
    }
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
    Ok(pdf.finish())
}

/// Escape text for XML character data and attribute values.
fn xml_escape(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
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
    use crate::error::ErrorKind;
    use crate::plot::{LineStyle, Series};

    fn small_figure() -> Figure {
        Figure {
            x_label: "a/M".into(),
            y_label: "V(a)".into(),
            series: vec![Series {
                label: "V".into(),
                points: vec![(0.0, 0.0), (1.0, 1.0)],
                style: LineStyle::Solid,
                colour: 0,
            }],
            provenance: "unit test".into(),
            ..Figure::default()
        }
    }

    #[test]
    fn unregistered_font_is_an_error_not_a_blank_file() {
        style::ensure_font().unwrap();
        let fig = small_figure();
        for e in [
            svg_with_family(&fig, "no-such-font-family").unwrap_err(),
            png_with_family(&fig, "no-such-font-family").unwrap_err(),
        ] {
            assert_eq!(e.kind, ErrorKind::Io);
            assert!(e.message.contains("FontUnavailable"), "{}", e.message);
        }
        // The registered family renders.
        assert!(svg_with_family(&fig, style::FONT_FAMILY).is_ok());
    }

    #[test]
    fn category_map_pixels_have_their_category_colours() {
        // 3 x 2 grid on [0, 3] x [0, 2]; row 0 is the bottom row.
        let cells = vec![0, 1, 2, 3, 4, 0];
        // Unnamed categories and an unlabelled curve: no legend box hides any cell.
        let categories: Vec<(String, usize)> = (0..5).map(|i| (String::new(), i)).collect();
        let mut fig = Figure {
            categories: Some(CategoryMap { x: (0.0, 3.0, 3), y: (0.0, 2.0, 2), cells: cells.clone(), categories }),
            ..small_figure()
        };
        fig.series[0].label.clear();
        style::ensure_font().unwrap();
        let (buf, (w, _), layout) = raster(&fig, style::FONT_FAMILY).unwrap();
        let (l, t, r, b) = layout.plot;
        for (idx, &cat) in cells.iter().enumerate() {
            let (ix, iy) = (idx % 3, idx / 3);
            // Cell centre, nudged off the diagonal test curve (which runs from (0,0) to (1,1) in data).
            let (x, y) = (ix as f64 + 0.5, iy as f64 + 0.3);
            let px = (l + x / 3.0 * (r - l)).round() as u32;
            let py = (b - y / 2.0 * (b - t)).round() as u32;
            let o = ((py * w + px) * 3) as usize;
            let (cr, cg, cb) = style::category_fill(cat as usize);
            assert_eq!(&buf[o..o + 3], &[cr, cg, cb], "cell ({ix}, {iy}) should show category {cat}");
        }
        // The SVG carries the same map as one image, not as per-cell rectangles.
        let svg = render_svg(&fig).unwrap();
        assert_eq!(svg.matches("<image").count(), 1);
        assert!(svg.matches("<rect").count() < 10);
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
