//! Drawing a [`Figure`] onto any plotters backend (SVG text or an RGB pixel buffer), in device pixels at
//! `px_per_pt` pixels per printer's point.

use super::geom::{self, Window};
use super::style::{self, render_error};
use super::{Band, Figure, LineStyle, Orientation};
use crate::error::{Error, Result};
use plotters::coord::Shift;
use plotters::element::{BitMapElement, Circle, PathElement, Polygon, Rectangle, Text};
use plotters::prelude::{ChartBuilder, DrawingArea, DrawingAreaErrorKind, DrawingBackend, IntoDrawingArea};
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{Color, IntoFont, RGBColor, ShapeStyle, TextStyle, WHITE};

/// How to draw the category map.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum MapMode {
    /// Leave it out: the SVG encoder inserts it as one `<image>` afterwards.
    Deferred,
    /// Paint it into the pixel buffer (PNG output).
    Pixels,
}

/// Device settings for one rendering.
pub(crate) struct Device<'a> {
    /// Pixels per printer's point.
    pub px_per_pt: f64,
    /// Font family name registered with plotters.
    pub family: &'a str,
    /// Ratio of the backend's font "size" to the em size it shows (SVG writes size/1.24 as font-size; the
    /// raster text scales glyphs to ascent + descent, 1.164 em for DejaVu Sans).
    pub size_per_em: f64,
    /// Category map handling.
    pub map: MapMode,
}

/// Pixel geometry of what was drawn, for the encoders.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Layout {
    /// Plot area: left, top, right, bottom (pixels).
    pub plot: (f64, f64, f64, f64),
    /// The category map's extent in pixels (left, top, right, bottom), if there is a map.
    pub map: Option<(f64, f64, f64, f64)>,
}

fn area_error<E: std::error::Error + Send + Sync>(e: DrawingAreaErrorKind<E>) -> Error {
    let text = e.to_string();
    if text.contains("FontUnavailable") {
        render_error(format!("{text}: no font is registered for the figure text"))
    } else {
        render_error(text)
    }
}

fn rgb((r, g, b): (u8, u8, u8)) -> RGBColor {
    RGBColor(r, g, b)
}

/// Linear data -> pixel map of the plot area.
#[derive(Clone, Copy)]
struct Mapper {
    w: Window,
    plot: (f64, f64, f64, f64),
}

impl Mapper {
    fn px(&self, (x, y): (f64, f64)) -> (f64, f64) {
        let (l, t, r, b) = self.plot;
        (
            l + (x - self.w.x0) / (self.w.x1 - self.w.x0) * (r - l),
            b - (y - self.w.y0) / (self.w.y1 - self.w.y0) * (b - t),
        )
    }
    fn data(&self, (px, py): (f64, f64)) -> (f64, f64) {
        let (l, t, r, b) = self.plot;
        (
            self.w.x0 + (px - l) / (r - l) * (self.w.x1 - self.w.x0),
            self.w.y0 + (b - py) / (b - t) * (self.w.y1 - self.w.y0),
        )
    }
}

fn ipt(p: (f64, f64)) -> (i32, i32) {
    (p.0.round() as i32, p.1.round() as i32)
}

/// A pixel box: left, top, right, bottom.
type Boxed = (f64, f64, f64, f64);

/// What a legend row shows beside its text.
enum Sample {
    Line(LineStyle, usize),
    Swatch(RGBColor, f64),
}

/// Draw the whole figure; returns the pixel layout.
pub(crate) fn draw<DB: DrawingBackend>(fig: &Figure, w: Window, backend: DB, dev: &Device) -> Result<Layout> {
    let k = dev.px_per_pt;
    let px = |pt: f64| (pt * k).round().max(1.0) as i32;
    let font = |pt: f64| (dev.family, pt * dev.size_per_em * k).into_font();
    let root = backend.into_drawing_area();
    root.fill(&WHITE).map_err(area_error)?;

    // Room for the y tick labels: the widest of a few representative labels.
    let (xd, yd) = (style::tick_decimals(w.x1 - w.x0), style::tick_decimals(w.y1 - w.y0));
    let tick_font: TextStyle = font(style::TICK_PT).into();
    let mut widest = 0u32;
    for v in [w.y0, w.y1, 0.5 * (w.y0 + w.y1), w.y0 + 0.1 * (w.y1 - w.y0)] {
        let (tw, _) = root.estimate_text_size(&style::tick_label(v, yd), &tick_font).map_err(area_error)?;
        widest = widest.max(tw);
    }
    let y_area = widest as i32 + px(3.0 + 3.0 + style::LABEL_PT * 1.3 + 1.0);
    let x_area = px(3.0 + 2.0 + style::TICK_PT * 1.2 + style::LABEL_PT * 1.3 + 1.0);

    let mut builder = ChartBuilder::on(&root);
    builder
        .margin_top(px(if fig.title.is_some() { 3.0 } else { 6.0 }))
        .margin_right(px(8.0))
        .margin_left(px(2.0))
        .margin_bottom(px(2.0))
        .x_label_area_size(x_area)
        .y_label_area_size(y_area);
    if let Some(t) = &fig.title {
        builder.caption(t, font(style::LABEL_PT));
    }
    let mut chart = builder.build_cartesian_2d(w.x0..w.x1, w.y0..w.y1).map_err(area_error)?;
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    let plot = (xr.start as f64, yr.start as f64, (xr.end - 1) as f64, (yr.end - 1) as f64);
    let map = Mapper { w, plot };

    // Category map first, so that everything else lies on top of it.
    let mut layout = Layout { plot, map: None };
    if let Some(m) = &fig.categories {
        let (l, t) = map.px((m.x.0, m.y.1));
        let (r, b) = map.px((m.x.1, m.y.0));
        layout.map = Some((l, t, r, b));
        if dev.map == MapMode::Pixels {
            paint_map(&root, m, &map)?;
        }
    }

    let xf = move |v: &f64| style::tick_label(*v, xd);
    let yf = move |v: &f64| style::tick_label(*v, yd);
    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(fig.x_label.as_str())
        .y_desc(fig.y_label.as_str())
        .x_labels(6)
        .y_labels(6)
        .x_label_formatter(&xf)
        .y_label_formatter(&yf)
        .label_style(font(style::TICK_PT))
        .axis_desc_style(font(style::LABEL_PT))
        .axis_style(ShapeStyle {
            color: rgb((0, 0, 0)).to_rgba(),
            filled: false,
            stroke_width: px(style::FRAME_PT) as u32,
        })
        .set_all_tick_mark_size(px(3.0))
        .draw()
        .map_err(area_error)?;

    let poly_px = |pts: &[(f64, f64)]| -> Vec<(i32, i32)> { pts.iter().map(|&p| ipt(map.px(p))).collect() };

    for b in &fig.bands {
        let (pieces, colour) = band_polygons(b, &w);
        let fill = rgb(style::colour(colour)).mix(0.25).filled();
        for poly in pieces {
            root.draw(&Polygon::new(poly_px(&poly), fill)).map_err(area_error)?;
        }
    }

    // What the legend should avoid: drawn curve points (fewest wins) and text labels (never cover).
    let mut occupied: Vec<(f64, f64)> = Vec::new();
    let mut labels: Vec<Boxed> = Vec::new();
    let grey = rgb(style::GREY);
    let ref_font = font(style::LEGEND_PT).color(&grey);
    for rl in fig.ref_lines.iter().filter(|r| r.at.is_finite()) {
        let (a, b) = match rl.orientation {
            Orientation::Vertical => ((rl.at, w.y0), (rl.at, w.y1)),
            Orientation::Horizontal => ((w.x0, rl.at), (w.x1, rl.at)),
        };
        for piece in geom::clip_polyline(&[a, b], &w) {
            let p: Vec<(f64, f64)> = piece.iter().map(|&q| map.px(q)).collect();
            stroke(&root, &p, &[0.8 * k, 1.6 * k], grey, px(style::REF_PT))?;
            if !rl.label.is_empty() {
                let (pos, anchor) = match rl.orientation {
                    Orientation::Vertical => ((p[1].0 + 2.0 * k, p[1].1 + 2.0 * k), Pos::new(HPos::Left, VPos::Top)),
                    Orientation::Horizontal => {
                        ((p[1].0 - 2.0 * k, p[1].1 - 1.5 * k), Pos::new(HPos::Right, VPos::Bottom))
                    }
                };
                let (tw, th) = root.estimate_text_size(&rl.label, &ref_font).map_err(area_error)?;
                let (tw, th) = (tw as f64, th as f64);
                labels.push(match rl.orientation {
                    Orientation::Vertical => (pos.0, pos.1, pos.0 + tw, pos.1 + th),
                    Orientation::Horizontal => (pos.0 - tw, pos.1 - th, pos.0, pos.1),
                });
                root.draw(&Text::new(rl.label.clone(), ipt(pos), ref_font.pos(anchor))).map_err(area_error)?;
            }
        }
    }

    for s in &fig.series {
        let pattern: Vec<f64> = s.style.pattern_pt().iter().map(|l| l * k).collect();
        for run in geom::split_finite(&s.points) {
            for piece in geom::clip_polyline(&run, &w) {
                let p: Vec<(f64, f64)> = piece.iter().map(|&q| map.px(q)).collect();
                occupied.extend(p.iter().copied());
                stroke(&root, &p, &pattern, rgb(style::colour(s.colour)), px(style::CURVE_PT))?;
            }
        }
    }

    let label_font = font(style::LEGEND_PT).color(&rgb((0, 0, 0)));
    for m in fig.markers.iter().filter(|m| m.x.is_finite() && m.y.is_finite()) {
        if m.x < w.x0 || m.x > w.x1 || m.y < w.y0 || m.y > w.y1 {
            continue;
        }
        let c = map.px((m.x, m.y));
        occupied.push(c);
        let colour = rgb(style::colour(m.colour));
        let r = px(style::MARKER_PT);
        if m.filled {
            root.draw(&Circle::new(ipt(c), r, colour.filled())).map_err(area_error)?;
        } else {
            root.draw(&Circle::new(ipt(c), r, WHITE.filled())).map_err(area_error)?;
            root.draw(&Circle::new(ipt(c), r, colour.stroke_width(px(0.8) as u32))).map_err(area_error)?;
        }
        if !m.label.is_empty() {
            let pos = (c.0 + (style::MARKER_PT + 1.5) * k, c.1 - (style::MARKER_PT + 0.5) * k);
            let (tw, th) = root.estimate_text_size(&m.label, &label_font).map_err(area_error)?;
            labels.push((pos.0, pos.1 - th as f64, pos.0 + tw as f64, pos.1));
            root.draw(&Text::new(m.label.clone(), ipt(pos), label_font.pos(Pos::new(HPos::Left, VPos::Bottom))))
                .map_err(area_error)?;
        }
    }

    // Full frame around the plot area (a closed path: the SVG backend ignores stroke widths of rectangles),
    // its left and bottom sides on top of the axis lines, which plotters draws one pixel outside the area.
    let (fl, fb) = (plot.0 - 1.0, plot.3 + 1.0);
    let frame = [(fl, plot.1), (plot.2, plot.1), (plot.2, fb), (fl, fb), (fl, plot.1)];
    stroke(&root, &frame, &[], rgb((0, 0, 0)), px(style::FRAME_PT))?;

    legend(&root, fig, &map, (&occupied, &labels), dev)?;
    root.present().map_err(area_error)?;
    Ok(layout)
}

/// Polygons (data coordinates, clipped to the window) of one band, and its palette index.
fn band_polygons(b: &Band, w: &Window) -> (Vec<Vec<(f64, f64)>>, usize) {
    match b {
        Band::XInterval { from, to, colour, .. } => {
            if !(from.is_finite() && to.is_finite()) {
                return (vec![], *colour);
            }
            let (a, c) = (from.min(*to), from.max(*to));
            let poly = geom::clip_polygon(&[(a, w.y0), (c, w.y0), (c, w.y1), (a, w.y1)], w);
            (if poly.len() >= 3 { vec![poly] } else { vec![] }, *colour)
        }
        Band::Between { points, colour, .. } => {
            let mut out = Vec::new();
            let mut run: Vec<(f64, f64, f64)> = Vec::new();
            let flush = |run: &mut Vec<(f64, f64, f64)>, out: &mut Vec<Vec<(f64, f64)>>| {
                if run.len() >= 2 {
                    let mut poly: Vec<(f64, f64)> = run.iter().map(|&(x, _, hi)| (x, hi)).collect();
                    poly.extend(run.iter().rev().map(|&(x, lo, _)| (x, lo)));
                    let clipped = geom::clip_polygon(&poly, w);
                    if clipped.len() >= 3 {
                        out.push(clipped);
                    }
                }
                run.clear();
            };
            for &(x, lo, hi) in points {
                if x.is_finite() && lo.is_finite() && hi.is_finite() {
                    run.push((x, lo, hi));
                } else {
                    flush(&mut run, &mut out);
                }
            }
            flush(&mut run, &mut out);
            (out, *colour)
        }
    }
}

/// Stroke a device-space path with a dash pattern (device units; empty = solid).
fn stroke<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    path: &[(f64, f64)],
    pattern: &[f64],
    colour: RGBColor,
    width: i32,
) -> Result<()> {
    let style = ShapeStyle { color: colour.to_rgba(), filled: false, stroke_width: width.max(1) as u32 };
    for piece in geom::dash(path, pattern) {
        let mut pts: Vec<(i32, i32)> = piece.iter().map(|&p| ipt(p)).collect();
        pts.dedup();
        if pts.len() == 1 {
            pts.push(pts[0]);
        }
        root.draw(&PathElement::new(pts, style)).map_err(area_error)?;
    }
    Ok(())
}

/// Paint the category map into the pixel buffer, one colour per device pixel (nearest cell).
fn paint_map<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, m: &super::CategoryMap, map: &Mapper) -> Result<()> {
    let (l, t, r, b) = map.plot;
    let (wpx, hpx) = ((r - l) as u32 + 1, (b - t) as u32 + 1);
    let mut buf = vec![255u8; (wpx * hpx * 3) as usize];
    let (nx, ny) = (m.x.2 as f64, m.y.2 as f64);
    for j in 0..hpx {
        for i in 0..wpx {
            let (x, y) = map.data((l + i as f64, t + j as f64));
            let fx = ((x - m.x.0) / (m.x.1 - m.x.0) * nx).floor();
            let fy = ((y - m.y.0) / (m.y.1 - m.y.0) * ny).floor();
            if fx < 0.0 || fy < 0.0 || fx >= nx || fy >= ny {
                continue;
            }
            let cell = m.cells[fy as usize * m.x.2 + fx as usize] as usize;
            let (cr, cg, cb) = style::category_fill(m.categories[cell].1);
            let o = ((j * wpx + i) * 3) as usize;
            buf[o..o + 3].copy_from_slice(&[cr, cg, cb]);
        }
    }
    let elem: BitMapElement<(i32, i32)> = BitMapElement::with_owned_buffer((l as i32, t as i32), (wpx, hpx), buf)
        .ok_or_else(|| render_error("category map buffer has the wrong size"))?;
    root.draw(&elem).map_err(area_error)
}

/// The legend: a framed box at the corner (or edge centre) of the plot area that hides no text label and
/// covers the fewest drawn curve points.
fn legend<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    fig: &Figure,
    map: &Mapper,
    (occupied, labels): (&[(f64, f64)], &[Boxed]),
    dev: &Device,
) -> Result<()> {
    let mut rows: Vec<(String, Sample)> = Vec::new();
    for s in fig.series.iter().filter(|s| !s.label.is_empty()) {
        rows.push((s.label.clone(), Sample::Line(s.style, s.colour)));
    }
    for b in &fig.bands {
        let (label, colour) = match b {
            Band::XInterval { label, colour, .. } | Band::Between { label, colour, .. } => (label, *colour),
        };
        if !label.is_empty() {
            rows.push((label.clone(), Sample::Swatch(rgb(style::colour(colour)), 0.25)));
        }
    }
    if let Some(m) = &fig.categories {
        for (idx, (name, colour)) in m.categories.iter().enumerate() {
            if !name.is_empty() && m.cells.iter().any(|&c| c as usize == idx) {
                rows.push((name.clone(), Sample::Swatch(rgb(style::category_fill(*colour)), 1.0)));
            }
        }
    }
    if rows.is_empty() {
        return Ok(());
    }
    let k = dev.px_per_pt;
    let font: TextStyle = (dev.family, style::LEGEND_PT * dev.size_per_em * k).into_font().color(&rgb((0, 0, 0)));
    let mut text_w = 0.0_f64;
    for (label, _) in &rows {
        let (tw, _) = root.estimate_text_size(label, &font).map_err(area_error)?;
        text_w = text_w.max(tw as f64);
    }
    let (pad, sample_w, gap, row_h) = (3.0 * k, 14.0 * k, 3.0 * k, style::LEGEND_PT * 1.35 * k);
    let (bw, bh) = (pad + sample_w + gap + text_w + pad, pad + row_h * rows.len() as f64 + pad * 0.5);
    let (l, t, r, b) = map.plot;
    let inset = 3.0 * k;
    let corners = [
        (r - inset - bw, t + inset),
        (l + inset, t + inset),
        (r - inset - bw, b - inset - bh),
        (l + inset, b - inset - bh),
        (0.5 * (l + r - bw), t + inset),
        (0.5 * (l + r - bw), b - inset - bh),
    ];
    let cover = |(x, y): (f64, f64)| {
        let points = occupied.iter().filter(|p| p.0 >= x && p.0 <= x + bw && p.1 >= y && p.1 <= y + bh).count();
        let hidden = labels.iter().filter(|l| l.0 < x + bw && l.2 > x && l.1 < y + bh && l.3 > y).count();
        points + 1_000_000 * hidden
    };
    let (x, y) = corners.iter().copied().min_by_key(|&c| cover(c)).unwrap_or(corners[0]);
    let edge_colour = rgb((0x99, 0x99, 0x99));
    root.draw(&Rectangle::new([ipt((x, y)), ipt((x + bw, y + bh))], WHITE.mix(0.9).filled())).map_err(area_error)?;
    stroke(
        root,
        &[(x, y), (x + bw, y), (x + bw, y + bh), (x, y + bh), (x, y)],
        &[],
        edge_colour,
        (0.5 * k).round() as i32,
    )?;
    for (i, (label, sample)) in rows.iter().enumerate() {
        let cy = y + pad + row_h * (i as f64 + 0.5);
        let (sx0, sx1) = (x + pad, x + pad + sample_w);
        match sample {
            Sample::Line(ls, c) => {
                let pattern: Vec<f64> = ls.pattern_pt().iter().map(|v| v * k).collect();
                stroke(
                    root,
                    &[(sx0, cy), (sx1, cy)],
                    &pattern,
                    rgb(style::colour(*c)),
                    (style::CURVE_PT * k).round() as i32,
                )?;
            }
            Sample::Swatch(c, alpha) => {
                let (h0, h1) = (cy - 0.3 * row_h, cy + 0.3 * row_h);
                root.draw(&Rectangle::new([ipt((sx0, h0)), ipt((sx1, h1))], c.mix(*alpha).filled()))
                    .map_err(area_error)?;
            }
        }
        let tp = ipt((sx1 + gap, cy));
        root.draw(&Text::new(label.clone(), tp, font.pos(Pos::new(HPos::Left, VPos::Center)))).map_err(area_error)?;
    }
    Ok(())
}
