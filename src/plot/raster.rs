//! PNG bytes from 8-bit RGB pixels: the category map's one pixel per cell (embedded in the SVG by the scene) and
//! the rastered figure (with text chunks and a resolution). Shared by the scene and the encoders, so that
//! neither imports the other.

use super::style::{self, render_error};
use super::CategoryMap;
use crate::error::Result;

/// One pixel per cell of a category map (top row first), as PNG bytes.
pub(crate) fn category_png(m: &CategoryMap) -> Result<Vec<u8>> {
    let (nx, ny) = (m.x.2, m.y.2);
    let mut rgb = Vec::with_capacity(nx * ny * 3);
    for row in (0..ny).rev() {
        for col in 0..nx {
            let cat = m.cells[row * nx + col] as usize;
            let (cr, cg, cb) = style::category_fill(m.categories[cat].1);
            rgb.extend_from_slice(&[cr, cg, cb]);
        }
    }
    encode_png(&rgb, (nx as u32, ny as u32), &[], None)
}

/// Encode 8-bit RGB pixels as PNG with text chunks (`tEXt` for Latin-1 text, `iTXt` otherwise) and an
/// optional resolution in dots per inch.
pub(crate) fn encode_png(rgb: &[u8], (w, h): (u32, u32), text: &[(&str, String)], dpi: Option<f64>) -> Result<Vec<u8>> {
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
