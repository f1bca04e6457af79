//! Layout of a figure (or a grid of panels) in printer's points: plot areas, ticks, labels, legend, notes,
//! and the list of primitives to draw. Every text box and every drawn data line is recorded in a
//! [`Layout`], so that placement can avoid collisions and tests can check them. Pure geometry: the encoders
//! turn a [`Scene`] into SVG, PDF or PNG.

use super::geom::{self, Window};
use super::style::{self, Style};
use super::text;
use super::window::plot_window;
use super::{Band, Figure, LegendPos, LineStyle, Look, Orientation};
use crate::error::{Error, Result};

/// An axis-aligned box in points, y growing downwards (SVG convention): left, top, right, bottom.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BBox {
    /// Left edge.
    pub x0: f64,
    /// Top edge.
    pub y0: f64,
    /// Right edge.
    pub x1: f64,
    /// Bottom edge.
    pub y1: f64,
}

impl BBox {
    fn new(x0: f64, y0: f64, x1: f64, y1: f64) -> BBox {
        BBox { x0, y0, x1, y1 }
    }
    /// Whether the interiors of two boxes intersect.
    pub fn overlaps(&self, o: &BBox) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }
    /// Whether `self` lies inside `o` (edges may touch).
    pub fn inside(&self, o: &BBox) -> bool {
        self.x0 >= o.x0 - 1e-9 && self.x1 <= o.x1 + 1e-9 && self.y0 >= o.y0 - 1e-9 && self.y1 <= o.y1 + 1e-9
    }
    /// Whether any segment of the polyline passes through the box.
    pub fn hits(&self, line: &[(f64, f64)]) -> bool {
        let w = Window { x0: self.x0, x1: self.x1, y0: self.y0, y1: self.y1 };
        if line.len() == 1 {
            let p = line[0];
            return p.0 > w.x0 && p.0 < w.x1 && p.1 > w.y0 && p.1 < w.y1;
        }
        line.windows(2).any(|s| geom::clip_segment(s[0], s[1], &w).is_some_and(|(a, b)| a != b || in_open(a, &w)))
    }
    fn grow(&self, d: f64) -> BBox {
        BBox::new(self.x0 - d, self.y0 - d, self.x1 + d, self.y1 + d)
    }
}

fn in_open(p: (f64, f64), w: &Window) -> bool {
    p.0 > w.x0 && p.0 < w.x1 && p.1 > w.y0 && p.1 < w.y1
}

/// What a text box is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TextKind {
    /// Figure or panel title.
    Title,
    /// Axis label.
    AxisLabel,
    /// Tick label.
    Tick,
    /// Legend entry.
    Legend,
    /// Label of a reference line or a marked point.
    Annotation,
    /// Note under the plot.
    Note,
}

/// One piece of text and the box it occupies.
#[derive(Debug, Clone, PartialEq)]
pub struct TextBox {
    /// The text.
    pub text: String,
    /// What it is.
    pub kind: TextKind,
    /// Its box (points, y down).
    pub bbox: BBox,
}

/// Where everything went: the figure's layout data.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Layout {
    /// Canvas width and height in points.
    pub canvas: (f64, f64),
    /// Plot area of each panel.
    pub plots: Vec<BBox>,
    /// Every text drawn.
    pub texts: Vec<TextBox>,
    /// Every data curve and reference line as drawn (points, clipped to its plot area).
    pub data_lines: Vec<Vec<(f64, f64)>>,
    /// Legend box, if any.
    pub legend: Option<BBox>,
    /// Labels that found no free place and were left out.
    pub dropped: Vec<String>,
}

/// RGB colour.
pub(crate) type Rgb = (u8, u8, u8);

/// Text anchoring along the baseline.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Anchor {
    Start,
    Middle,
    End,
}

/// A drawing primitive in points.
#[derive(Debug, Clone)]
pub(crate) enum Item {
    Line { pts: Vec<(f64, f64)>, colour: Rgb, width: f64, dash: Vec<f64> },
    Fill { pts: Vec<(f64, f64)>, colour: Rgb, opacity: f64 },
    Rect { b: BBox, fill: Option<(Rgb, f64)>, stroke: Option<(Rgb, f64)> },
    Circle { c: (f64, f64), r: f64, fill: Rgb, stroke: Option<(Rgb, f64)> },
    Text { at: (f64, f64), size: f64, colour: Rgb, text: String, anchor: Anchor, rotate: bool },
    Image { b: BBox, clip: BBox, png: Vec<u8> },
}

/// Everything to draw, and where it went.
#[derive(Debug, Clone)]
pub(crate) struct Scene {
    pub w: f64,
    pub h: f64,
    pub family: &'static str,
    pub items: Vec<Item>,
    pub layout: Layout,
}

const BLACK: Rgb = (0, 0, 0);

/// What a legend row shows beside its text.
#[derive(Debug, Clone, PartialEq)]
enum Sample {
    Line(LineStyle, usize),
    Swatch(Rgb, f64),
}

/// Lay out one figure.
pub(crate) fn scene(fig: &Figure) -> Result<Scene> {
    scene_grid(std::slice::from_ref(fig), 1, &fig.look, None)
}

/// Lay out panels in a grid of `cols` columns with shared axes (the union of the panels' ranges), tick
/// labels on the outer panels only and one legend above the grid.
pub(crate) fn scene_grid(figs: &[Figure], cols: usize, look: &Look, title: Option<&str>) -> Result<Scene> {
    if !text::fonts_ok() {
        return Err(style::render_error("the embedded fonts could not be parsed"));
    }
    if figs.is_empty() {
        return Err(Error::input("a multi-panel figure needs at least one panel"));
    }
    if !(look.width_cm.is_finite() && look.width_cm >= 3.0 && look.width_cm <= 60.0) {
        return Err(Error::input(format!("figure width {} cm is outside 3..60 cm", look.width_cm))
            .with_hint("single column 8.5, double column 17.8"));
    }
    if !(look.aspect.is_finite() && look.aspect >= 0.2 && look.aspect <= 3.0) {
        return Err(Error::input(format!("figure aspect {} is outside 0.2..3 (height / width)", look.aspect)));
    }
    let figs: Vec<Figure> = figs.iter().map(|f| transformed(f, look)).collect::<Result<_>>()?;
    let mut windows: Vec<Window> = figs.iter().map(plot_window).collect::<Result<_>>()?;
    if figs.len() > 1 {
        let u = windows.iter().skip(1).fold(windows[0], |a, b| Window {
            x0: a.x0.min(b.x0),
            x1: a.x1.max(b.x1),
            y0: a.y0.min(b.y0),
            y1: a.y1.max(b.y1),
        });
        windows = vec![u; figs.len()];
    }
    let single_auto = figs.len() == 1 && look.legend == LegendPos::Auto;
    // A legend inside a category map would hide cells: maps put it above unless told otherwise.
    let map_auto = look.legend == LegendPos::Auto && figs.iter().any(|f| f.categories.is_some());
    let layout_once = |figs: &[Figure]| -> Result<Scene> {
        let first =
            build(figs, &windows, cols, look, title, figs.len() > 1 || look.legend == LegendPos::Above || map_auto)?;
        if single_auto && first.1 {
            // The legend would cover data inside the plot: put it above instead.
            return Ok(build(figs, &windows, cols, look, title, true)?.0);
        }
        Ok(first.0)
    };
    // A label that found no free place is named in a note under the plot rather than lost.
    let mut sc = layout_once(&figs)?;
    for _ in 0..2 {
        if sc.layout.dropped.is_empty() {
            break;
        }
        let mut names = sc.layout.dropped.clone();
        names.dedup();
        let mut with_note = figs.clone();
        with_note[0].notes.push(format!("Not labelled for lack of room: {}.", names.join(", ")));
        let next = layout_once(&with_note)?;
        let settled = next.layout.dropped == sc.layout.dropped;
        sc = next;
        if settled {
            break;
        }
    }
    Ok(sc)
}

/// The figure with log axes applied to its data (log10 of the coordinates).
fn transformed(fig: &Figure, look: &Look) -> Result<Figure> {
    if !(look.log_x || look.log_y) {
        return Ok(fig.clone());
    }
    if fig.categories.is_some() {
        use crate::RequestField::{LogX, LogY};
        return Err(Error::input("log axes are not available for maps").with_hint_phrase(crate::phrase![
            "drop ",
            LogX,
            " / ",
            LogY,
            " for maps"
        ]));
    }
    // A point on a log axis is drawn at log10 of its value; a non-positive one is not drawn (NaN).
    let log_if = |on: bool, v: f64| match (on, v > 0.0) {
        (false, _) => v,
        (true, true) => v.log10(),
        (true, false) => f64::NAN,
    };
    let lx = |x: f64| log_if(look.log_x, x);
    let ly = |y: f64| log_if(look.log_y, y);
    let mut f = fig.clone();
    let range = |r: Option<(f64, f64)>, on: bool, name: &str| -> Result<Option<(f64, f64)>> {
        match r {
            Some((a, b)) if on => {
                if a > 0.0 && b > 0.0 {
                    Ok(Some((a.log10(), b.log10())))
                } else {
                    Err(Error::input(format!("{name} limits ({a}, {b}) must be positive on a log axis")))
                }
            }
            r => Ok(r),
        }
    };
    f.x_range = range(f.x_range, look.log_x, "x")?;
    f.y_range = range(f.y_range, look.log_y, "y")?;
    for s in &mut f.series {
        for p in &mut s.points {
            *p = (lx(p.0), ly(p.1));
        }
    }
    for b in &mut f.bands {
        match b {
            Band::XInterval { from, to, .. } => {
                *from = lx(*from);
                *to = lx(*to);
            }
            Band::Between { points, .. } => {
                for p in points {
                    *p = (lx(p.0), ly(p.1), ly(p.2));
                }
            }
        }
    }
    for m in &mut f.markers {
        m.x = lx(m.x);
        m.y = ly(m.y);
    }
    for r in &mut f.ref_lines {
        r.at = match r.orientation {
            Orientation::Vertical => lx(r.at),
            Orientation::Horizontal => ly(r.at),
        };
    }
    Ok(f)
}

/// A tick: position (axis units, transformed) and label.
struct Tick {
    at: f64,
    label: String,
    major: bool,
}

/// Ticks at 1, 2, 2.5 or 5 times a power of ten, about `target` of them (common practice).
fn linear_ticks(lo: f64, hi: f64, target: usize) -> Vec<Tick> {
    let span = hi - lo;
    if span.is_nan() || span <= 0.0 {
        return vec![];
    }
    let raw = span / target.max(2) as f64;
    let mag = 10f64.powf(raw.log10().floor());
    let mut step = mag;
    for m in [1.0, 2.0, 2.5, 5.0, 10.0] {
        if m * mag >= raw {
            step = m * mag;
            break;
        }
    }
    let decimals = ((-step.log10()).ceil().max(0.0) as usize) + usize::from((step / mag - 2.5).abs() < 1e-9);
    let k0 = (lo / step - 1e-9).ceil() as i64;
    let k1 = (hi / step + 1e-9).floor() as i64;
    (k0..=k1)
        .map(|k| {
            let v = k as f64 * step;
            Tick { at: v, label: style::tick_label(v, decimals), major: true }
        })
        .collect()
}

/// Superscript digits and minus for exponent labels.
fn superscript(n: i64) -> String {
    const D: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
    let mut s = String::new();
    if n < 0 {
        s.push('⁻');
    }
    for c in n.unsigned_abs().to_string().chars() {
        s.push(D[c as usize - '0' as usize]);
    }
    s
}

/// Ticks of an axis: linear, or decades (10ⁿ, with minor ticks at 2..9) on a log axis.
fn ticks(lo: f64, hi: f64, target: usize, log: bool) -> Vec<Tick> {
    if !log {
        return linear_ticks(lo, hi, target);
    }
    let (d0, d1) = ((lo - 1e-9).ceil() as i64, (hi + 1e-9).floor() as i64);
    if d1 - d0 < 1 {
        // Less than two decades shown: ticks at nice values of the quantity itself.
        return linear_ticks(10f64.powf(lo), 10f64.powf(hi), target)
            .into_iter()
            .filter(|t| t.at > 0.0)
            .map(|t| Tick { at: t.at.log10(), ..t })
            .collect();
    }
    let every = (((d1 - d0) as usize).div_ceil(target.max(2))).max(1) as i64;
    let mut out = Vec::new();
    for d in (lo.floor() as i64)..=(hi.ceil() as i64) {
        let v = d as f64;
        if v >= lo - 1e-9 && v <= hi + 1e-9 && (d - d0).rem_euclid(every) == 0 {
            out.push(Tick { at: v, label: format!("10{}", superscript(d)), major: true });
        }
        if every == 1 {
            for m in 2..10 {
                let mv = v + (m as f64).log10();
                if mv > lo && mv < hi {
                    out.push(Tick { at: mv, label: String::new(), major: false });
                }
            }
        }
    }
    out
}

/// Linear data -> point map of one plot area.
#[derive(Clone, Copy)]
struct Mapper {
    w: Window,
    b: BBox,
}

impl Mapper {
    fn px(&self, (x, y): (f64, f64)) -> (f64, f64) {
        (
            self.b.x0 + (x - self.w.x0) / (self.w.x1 - self.w.x0) * (self.b.x1 - self.b.x0),
            self.b.y1 - (y - self.w.y0) / (self.w.y1 - self.w.y0) * (self.b.y1 - self.b.y0),
        )
    }
}

struct Ctx {
    st: Style,
    items: Vec<Item>,
    layout: Layout,
    /// Obstacles for annotations: boxes of markers.
    dots: Vec<BBox>,
}

impl Ctx {
    fn text_box(&self, s: &str, size: f64, (x, y): (f64, f64), anchor: Anchor) -> BBox {
        let w = text::width(s, self.st.family, size);
        let (asc, desc) = text::vertical(self.st.family, size);
        let x0 = match anchor {
            Anchor::Start => x,
            Anchor::Middle => x - w / 2.0,
            Anchor::End => x - w,
        };
        BBox::new(x0, y - asc, x0 + w, y + desc)
    }
    fn text(&mut self, s: &str, size: f64, at: (f64, f64), anchor: Anchor, kind: TextKind, colour: Rgb) {
        if s.is_empty() {
            return;
        }
        let bbox = self.text_box(s, size, at, anchor);
        self.layout.texts.push(TextBox { text: s.to_string(), kind, bbox });
        self.items.push(Item::Text { at, size, colour, text: s.to_string(), anchor, rotate: false });
    }
    /// Rotated by -90 degrees about `at` (reads bottom to top), centred there.
    fn text_up(&mut self, s: &str, size: f64, at: (f64, f64), kind: TextKind) {
        if s.is_empty() {
            return;
        }
        let w = text::width(s, self.st.family, size);
        let (asc, desc) = text::vertical(self.st.family, size);
        let bbox = BBox::new(at.0 - asc, at.1 - w / 2.0, at.0 + desc, at.1 + w / 2.0);
        self.layout.texts.push(TextBox { text: s.to_string(), kind, bbox });
        self.items.push(Item::Text {
            at,
            size,
            colour: BLACK,
            text: s.to_string(),
            anchor: Anchor::Middle,
            rotate: true,
        });
    }
    fn free(&self, b: &BBox, within: &BBox) -> bool {
        b.inside(within)
            && !self.layout.texts.iter().any(|t| t.bbox.overlaps(&b.grow(0.5)))
            && !self.layout.data_lines.iter().any(|l| b.grow(0.5).hits(l))
            && !self.dots.iter().any(|d| d.overlaps(b))
            && !self.layout.legend.is_some_and(|l| l.overlaps(b))
    }
    /// Place an annotation at the first free candidate baseline position; false if none is free.
    fn annotate(&mut self, s: &str, cands: &[((f64, f64), Anchor)], within: &BBox, colour: Rgb) -> bool {
        let size = self.st.legend_pt;
        for &(at, anchor) in cands {
            let b = self.text_box(s, size, at, anchor);
            if self.free(&b, within) {
                self.text(s, size, at, anchor, TextKind::Annotation, colour);
                return true;
            }
        }
        self.layout.dropped.push(s.to_string());
        false
    }
}

/// Legend rows of all panels (first occurrence of each label).
fn legend_rows(figs: &[Figure], opacity: f64) -> Vec<(String, Sample)> {
    let mut rows: Vec<(String, Sample)> = Vec::new();
    let mut push = |label: &str, s: Sample| {
        if !label.is_empty() && !rows.iter().any(|r| r.0 == label) {
            rows.push((label.to_string(), s));
        }
    };
    for fig in figs {
        for s in &fig.series {
            push(&s.label, Sample::Line(s.style, s.colour));
        }
        for b in &fig.bands {
            let (label, colour) = match b {
                Band::XInterval { label, colour, .. } | Band::Between { label, colour, .. } => (label, *colour),
            };
            push(label, Sample::Swatch(style::colour(colour), opacity));
        }
        if let Some(m) = &fig.categories {
            for (idx, (name, colour)) in m.categories.iter().enumerate() {
                if m.cells.iter().any(|&c| c as usize == idx) {
                    push(name, Sample::Swatch(style::category_fill(*colour), 1.0));
                }
            }
        }
    }
    rows
}

/// Word-wrap `s` to lines no wider than `w` points.
fn wrap(s: &str, family: &str, size: f64, w: f64) -> Vec<String> {
    let mut lines = Vec::new();
    let mut cur = String::new();
    for word in s.split_whitespace() {
        let cand = if cur.is_empty() { word.to_string() } else { format!("{cur} {word}") };
        if !cur.is_empty() && text::width(&cand, family, size) > w {
            lines.push(std::mem::replace(&mut cur, word.to_string()));
        } else {
            cur = cand;
        }
    }
    if !cur.is_empty() {
        lines.push(cur);
    }
    lines
}

/// Build the scene; the flag says whether an inside legend had to cover data (so the caller can move it).
fn build(
    figs: &[Figure],
    windows: &[Window],
    cols: usize,
    look: &Look,
    title: Option<&str>,
    legend_above: bool,
) -> Result<(Scene, bool)> {
    let st = Style::of(look.style);
    let cols = cols.clamp(1, figs.len());
    let rows_n = figs.len().div_ceil(cols);
    let w = look.width_cm / 2.54 * 72.0;
    let mut h = w * look.aspect * rows_n as f64 / cols as f64;
    let fam = st.family;
    let (tasc, tdesc) = text::vertical(fam, st.tick_pt);
    let (lasc, ldesc) = text::vertical(fam, st.label_pt);
    let (gasc, gdesc) = text::vertical(fam, st.legend_pt);
    let (tick_h, label_h, leg_h) = (tasc + tdesc, lasc + ldesc, gasc + gdesc);
    let target = ((w / cols as f64) / 45.0).round().clamp(3.0, 10.0) as usize;
    let xt = ticks(windows[0].x0, windows[0].x1, target, look.log_x);
    let yt =
        ticks(windows[0].y0, windows[0].y1, ((h / rows_n as f64) / 30.0).round().clamp(3.0, 8.0) as usize, look.log_y);
    let ytick_w = yt.iter().map(|t| text::width(&t.label, fam, st.tick_pt)).fold(0.0, f64::max);
    let out_len = if st.ticks_inside { 0.0 } else { st.tick_len };
    let rows = legend_rows(figs, look.band_opacity);
    let pad = 3.0;
    let (sample_w, gap, row_h) = (14.0, 3.0, leg_h * 1.25);
    let text_w = rows.iter().map(|r| text::width(&r.0, fam, st.legend_pt)).fold(0.0, f64::max);
    let item_w = sample_w + gap + text_w + 2.0 * pad;
    // Notes under the plot, wrapped to the canvas width.
    let mut notes: Vec<String> = Vec::new();
    for f in figs {
        for n in &f.notes {
            for l in wrap(n, fam, st.legend_pt, w - 2.0 * pad) {
                if !notes.contains(&l) {
                    notes.push(l);
                }
            }
        }
    }
    let title_h = if title.is_some() { label_h + 2.0 } else { 0.0 };
    let panel_title_h = if figs.len() > 1 && figs.iter().any(|f| f.title.is_some()) { label_h + 2.0 } else { 0.0 };
    let single_title = if figs.len() == 1 { figs[0].title.as_deref() } else { title };
    let top_title_h = if single_title.is_some() { label_h + 2.0 } else { title_h };
    let legend_cols = if legend_above && !rows.is_empty() {
        (((w - 2.0 * pad) / item_w).floor() as usize).clamp(1, rows.len())
    } else {
        1
    };
    let legend_h_above =
        if legend_above && !rows.is_empty() { rows.len().div_ceil(legend_cols) as f64 * row_h + pad } else { 0.0 };
    // A legend above the plot adds to the canvas height, so the plot keeps its aspect.
    h += legend_h_above;
    let has_ylabel = figs.iter().any(|f| !f.y_label.is_empty());
    let has_xlabel = figs.iter().any(|f| !f.x_label.is_empty());
    let left = pad + if has_ylabel { label_h + 3.0 } else { 0.0 } + ytick_w + 2.5 + out_len;
    let xlast = xt.last().map(|t| text::width(&t.label, fam, st.tick_pt) / 2.0).unwrap_or(0.0);
    let right = pad + xlast.max(3.0);
    let top = pad + 1.0 + top_title_h + legend_h_above + tasc * 0.5;
    let notes_h = notes.len() as f64 * leg_h * 1.15 + if notes.is_empty() { 0.0 } else { 1.5 };
    let bottom = pad + notes_h + if has_xlabel { label_h + 2.0 } else { 0.0 } + tick_h + 2.0 + out_len;
    let (gap_x, gap_y) = (6.0, 6.0 + panel_title_h);
    let pw = (w - left - right - (cols - 1) as f64 * gap_x) / cols as f64;
    let ph = (h - top - bottom - panel_title_h - (rows_n - 1) as f64 * gap_y) / rows_n as f64;
    if pw < 25.0 || ph < 25.0 {
        return Err(Error::input(format!(
            "the figure is too small for its labels ({:.1} x {:.1} pt plot area)",
            pw, ph
        ))
        .with_hint("give a larger width or aspect, or fewer panels per row"));
    }
    let mut cx =
        Ctx { st, items: Vec::new(), layout: Layout { canvas: (w, h), ..Layout::default() }, dots: Vec::new() };
    cx.items.push(Item::Rect { b: BBox::new(0.0, 0.0, w, h), fill: Some(((255, 255, 255), 1.0)), stroke: None });
    let canvas = BBox::new(0.0, 0.0, w, h);
    let mut covered = false;
    let mut plots = Vec::new();
    for i in 0..figs.len() {
        let (c, r) = (i % cols, i / cols);
        let x0 = left + c as f64 * (pw + gap_x);
        let y0 = top + panel_title_h + r as f64 * (ph + gap_y);
        plots.push(BBox::new(x0, y0, x0 + pw, y0 + ph));
    }
    cx.layout.plots = plots.clone();
    for (i, fig) in figs.iter().enumerate() {
        let b = plots[i];
        let m = Mapper { w: windows[i], b };
        let (c, r) = (i % cols, i / cols);
        let last_row = r == rows_n - 1 || i + cols >= figs.len();
        panel_data(&mut cx, fig, &m, look.band_opacity)?;
        // Frame and ticks.
        let frame = vec![(b.x0, b.y0), (b.x1, b.y0), (b.x1, b.y1), (b.x0, b.y1), (b.x0, b.y0)];
        cx.items.push(Item::Line { pts: frame, colour: BLACK, width: st.frame_pt, dash: vec![] });
        let dir = if st.ticks_inside { -1.0 } else { 1.0 };
        let tick = |cx: &mut Ctx, p: (f64, f64), q: (f64, f64)| {
            cx.items.push(Item::Line { pts: vec![p, q], colour: BLACK, width: st.frame_pt, dash: vec![] })
        };
        // Tick labels stay within half the gap to the next panel.
        let lim_x0 = if c == 0 { 0.0 } else { b.x0 - gap_x / 2.0 };
        let lim_x1 = if c + 1 == cols || i + 1 == figs.len() { w } else { b.x1 + gap_x / 2.0 };
        let mut last_right = f64::NEG_INFINITY;
        for t in &xt {
            let x = m.px((t.at, m.w.y0)).0;
            if x < b.x0 - 1e-6 || x > b.x1 + 1e-6 {
                continue;
            }
            let len = if t.major { st.tick_len } else { st.tick_len * 0.55 };
            tick(&mut cx, (x, b.y1), (x, b.y1 + dir * len));
            if st.ticks_all_sides {
                tick(&mut cx, (x, b.y0), (x, b.y0 - dir * len));
            }
            if last_row && !t.label.is_empty() {
                let at = (x, b.y1 + out_len + 2.0 + tasc);
                let bb = cx.text_box(&t.label, st.tick_pt, at, Anchor::Middle);
                if bb.x0 >= lim_x0 && bb.x1 <= lim_x1 && bb.x0 > last_right + 2.0 {
                    last_right = bb.x1;
                    cx.text(&t.label, st.tick_pt, at, Anchor::Middle, TextKind::Tick, BLACK);
                }
            }
        }
        let lim_y0 = if r == 0 { 0.0 } else { b.y0 - gap_y / 2.0 };
        let lim_y1 = if last_row { h } else { b.y1 + gap_y / 2.0 };
        let mut last_top = f64::INFINITY;
        for t in &yt {
            let y = m.px((m.w.x0, t.at)).1;
            if y < b.y0 - 1e-6 || y > b.y1 + 1e-6 {
                continue;
            }
            let len = if t.major { st.tick_len } else { st.tick_len * 0.55 };
            tick(&mut cx, (b.x0, y), (b.x0 - dir * len, y));
            if st.ticks_all_sides {
                tick(&mut cx, (b.x1, y), (b.x1 + dir * len, y));
            }
            if c == 0 && !t.label.is_empty() {
                let at = (b.x0 - out_len - 2.5, y + (tasc - tdesc) / 2.0 - 0.5);
                let bb = cx.text_box(&t.label, st.tick_pt, at, Anchor::End);
                if bb.y0 >= lim_y0 && bb.y1 <= lim_y1 && bb.y1 < last_top - 1.0 {
                    last_top = bb.y0;
                    cx.text(&t.label, st.tick_pt, at, Anchor::End, TextKind::Tick, BLACK);
                }
            }
        }
        if figs.len() > 1 {
            if let Some(t) = &fig.title {
                cx.text(t, st.label_pt, (b.x0, b.y0 - ldesc - 1.5), Anchor::Start, TextKind::Title, BLACK);
            }
        }
    }
    // Axis labels: centred on the whole grid.
    let grid = BBox::new(plots[0].x0, plots[0].y0, plots.iter().map(|b| b.x1).fold(0.0, f64::max), {
        plots.iter().map(|b| b.y1).fold(0.0, f64::max)
    });
    let xl = &figs[0].x_label;
    let yl = &figs[0].y_label;
    cx.text(
        xl,
        st.label_pt,
        ((grid.x0 + grid.x1) / 2.0, grid.y1 + out_len + 2.0 + tick_h + 2.0 + lasc),
        Anchor::Middle,
        TextKind::AxisLabel,
        BLACK,
    );
    cx.text_up(yl, st.label_pt, (pad + lasc, (grid.y0 + grid.y1) / 2.0), TextKind::AxisLabel);
    if let Some(t) = single_title {
        cx.text(t, st.label_pt, ((grid.x0 + grid.x1) / 2.0, pad + lasc), Anchor::Middle, TextKind::Title, BLACK);
    }
    // Notes at the bottom.
    for (k, n) in notes.iter().enumerate() {
        let y = h - pad - notes_h + 1.5 + leg_h * 1.15 * k as f64 + gasc;
        cx.text(n, st.legend_pt, (pad, y), Anchor::Start, TextKind::Note, (0x33, 0x33, 0x33));
    }
    // Legend.
    if !rows.is_empty() && look.legend != LegendPos::None {
        let (bw, bh, lcols, origin) = if legend_above {
            let bw = item_w * legend_cols as f64;
            let bh = rows.len().div_ceil(legend_cols) as f64 * row_h + pad * 0.5;
            let x = ((grid.x0 + grid.x1) / 2.0 - bw / 2.0).min(w - pad - bw).max(pad);
            (bw, bh, legend_cols, (x, pad + 1.0 + top_title_h))
        } else {
            let (bw, bh) = (item_w, pad + row_h * rows.len() as f64 + pad * 0.5);
            let b = plots[0];
            let inset = 3.0;
            let corner = |p: LegendPos| match p {
                LegendPos::UpperLeft => (b.x0 + inset, b.y0 + inset),
                LegendPos::LowerRight => (b.x1 - inset - bw, b.y1 - inset - bh),
                LegendPos::LowerLeft => (b.x0 + inset, b.y1 - inset - bh),
                _ => (b.x1 - inset - bw, b.y0 + inset),
            };
            let cover = |o: (f64, f64)| {
                let lb = BBox::new(o.0, o.1, o.0 + bw, o.1 + bh);
                cx.layout.data_lines.iter().filter(|l| lb.hits(l)).count()
                    + cx.dots.iter().filter(|d| d.overlaps(&lb)).count()
                    + 1000 * cx.layout.texts.iter().filter(|t| t.bbox.overlaps(&lb)).count()
                    + if lb.inside(&b) { 0 } else { 1_000_000 }
            };
            let origin = if look.legend == LegendPos::Auto {
                let cands = [LegendPos::UpperRight, LegendPos::UpperLeft, LegendPos::LowerRight, LegendPos::LowerLeft];
                let best = cands.iter().map(|&p| corner(p)).min_by_key(|&o| cover(o)).unwrap_or(corner(cands[0]));
                covered = cover(best) > 0;
                best
            } else {
                corner(look.legend)
            };
            (bw, bh, 1, origin)
        };
        let lb = BBox::new(origin.0, origin.1, origin.0 + bw, origin.1 + bh);
        cx.layout.legend = Some(lb);
        if !legend_above {
            let stroke = if st.legend_frame { Some(((0x99, 0x99, 0x99), 0.5)) } else { None };
            cx.items.push(Item::Rect { b: lb, fill: Some(((255, 255, 255), 0.9)), stroke });
        }
        for (k, (label, sample)) in rows.iter().enumerate() {
            let (col, row) = (k % lcols, k / lcols);
            let x = origin.0 + pad + col as f64 * item_w;
            let cy = origin.1 + pad * 0.5 + row_h * (row as f64 + 0.5) + if legend_above { 0.0 } else { pad * 0.5 };
            match sample {
                Sample::Line(ls, c) => cx.items.push(Item::Line {
                    pts: vec![(x, cy), (x + sample_w, cy)],
                    colour: style::colour(*c),
                    width: st.curve_pt,
                    dash: ls.pattern_pt().to_vec(),
                }),
                Sample::Swatch(c, a) => cx.items.push(Item::Rect {
                    b: BBox::new(x, cy - 0.3 * row_h, x + sample_w, cy + 0.3 * row_h),
                    fill: Some((*c, *a)),
                    stroke: None,
                }),
            }
            let at = (x + sample_w + gap, cy + (gasc - gdesc) / 2.0);
            cx.text(label, st.legend_pt, at, Anchor::Start, TextKind::Legend, BLACK);
        }
    }
    // Annotations last: they avoid everything placed so far.
    for (i, fig) in figs.iter().enumerate() {
        let m = Mapper { w: windows[i], b: plots[i] };
        annotations(&mut cx, fig, &m);
    }
    let _ = canvas;
    Ok((Scene { w, h, family: fam, items: cx.items, layout: cx.layout }, covered))
}

fn marker(cx: &mut Ctx, c: (f64, f64), colour: usize, filled: bool) {
    let r = cx.st.marker_pt;
    let col = style::colour(colour);
    if filled {
        cx.items.push(Item::Circle { c, r, fill: col, stroke: None });
    } else {
        cx.items.push(Item::Circle { c, r, fill: (255, 255, 255), stroke: Some((col, 0.8)) });
    }
    cx.dots.push(BBox::new(c.0 - r, c.1 - r, c.0 + r, c.1 + r));
}

/// Map, bands, reference lines, curves and markers of one panel.
fn panel_data(cx: &mut Ctx, fig: &Figure, m: &Mapper, opacity: f64) -> Result<()> {
    let w = m.w;
    let b = m.b;
    if let Some(cm) = &fig.categories {
        let (l, t) = m.px((cm.x.0, cm.y.1));
        let (r, btm) = m.px((cm.x.1, cm.y.0));
        cx.items.push(Item::Image { b: BBox::new(l, t, r, btm), clip: b, png: super::raster::category_png(cm)? });
    }
    for band in &fig.bands {
        let (pieces, colour) = band_polygons(band, &w);
        for poly in pieces {
            let pts = poly.iter().map(|&p| m.px(p)).collect();
            cx.items.push(Item::Fill { pts, colour: style::colour(colour), opacity });
        }
    }
    for rl in fig.ref_lines.iter().filter(|r| r.at.is_finite()) {
        let (p, q) = match rl.orientation {
            Orientation::Vertical => ((rl.at, w.y0), (rl.at, w.y1)),
            Orientation::Horizontal => ((w.x0, rl.at), (w.x1, rl.at)),
        };
        for piece in geom::clip_polyline(&[p, q], &w) {
            let pts: Vec<(f64, f64)> = piece.iter().map(|&q| m.px(q)).collect();
            let colour = rl.colour.map(style::colour).unwrap_or(style::GREY);
            let dash = rl.style.map(|s| s.pattern_pt().to_vec()).unwrap_or_else(|| vec![0.8, 1.6]);
            cx.layout.data_lines.push(pts.clone());
            cx.items.push(Item::Line { pts, colour, width: cx.st.ref_pt, dash });
        }
    }
    let _ = b;
    for s in &fig.series {
        for run in geom::split_finite(&s.points) {
            for piece in geom::clip_polyline(&run, &w) {
                let pts: Vec<(f64, f64)> = piece.iter().map(|&q| m.px(q)).collect();
                cx.layout.data_lines.push(pts.clone());
                let width = cx.st.curve_pt;
                cx.items.push(Item::Line {
                    pts,
                    colour: style::colour(s.colour),
                    width,
                    dash: s.style.pattern_pt().to_vec(),
                });
            }
        }
    }
    for mk in fig.markers.iter().filter(|m| m.x.is_finite() && m.y.is_finite()) {
        if mk.x < w.x0 || mk.x > w.x1 || mk.y < w.y0 || mk.y > w.y1 {
            continue;
        }
        marker(cx, m.px((mk.x, mk.y)), mk.colour, mk.filled);
    }
    Ok(())
}

/// Labels of reference lines and markers, each at the first free place near its object.
fn annotations(cx: &mut Ctx, fig: &Figure, m: &Mapper) {
    let b = m.b;
    let w = m.w;
    let (asc, _) = text::vertical(cx.st.family, cx.st.legend_pt);
    let step = asc * 1.2;
    for rl in fig.ref_lines.iter().filter(|r| r.at.is_finite() && !r.label.is_empty()) {
        let mut cands = Vec::new();
        match rl.orientation {
            Orientation::Vertical => {
                if rl.at < w.x0 || rl.at > w.x1 {
                    continue;
                }
                let x = m.px((rl.at, w.y0)).0;
                let n = ((b.y1 - b.y0) / step) as usize;
                for k in 0..n {
                    let y = b.y0 + 2.0 + asc + k as f64 * step;
                    cands.push(((x + 1.5, y), Anchor::Start));
                    cands.push(((x - 1.5, y), Anchor::End));
                }
            }
            Orientation::Horizontal => {
                if rl.at < w.y0 || rl.at > w.y1 {
                    continue;
                }
                let y = m.px((w.x0, rl.at)).1;
                let n = ((b.x1 - b.x0) / 10.0) as usize;
                for k in 0..n {
                    cands.push(((b.x1 - 2.0 - 10.0 * k as f64, y - 1.5), Anchor::End));
                    cands.push(((b.x1 - 2.0 - 10.0 * k as f64, y + 1.5 + asc), Anchor::End));
                }
            }
        }
        cx.annotate(&rl.label, &cands, &b, (0x33, 0x33, 0x33));
    }
    for mk in fig.markers.iter().filter(|m| m.x.is_finite() && m.y.is_finite() && !m.label.is_empty()) {
        if mk.x < w.x0 || mk.x > w.x1 || mk.y < w.y0 || mk.y > w.y1 {
            continue;
        }
        let c = m.px((mk.x, mk.y));
        let d = cx.st.marker_pt + 1.5;
        let mut cands = Vec::new();
        for k in 0..4 {
            let e = d + 4.0 * k as f64;
            cands.extend([
                ((c.0 + e, c.1 - e), Anchor::Start),
                ((c.0 - e, c.1 - e), Anchor::End),
                ((c.0 + e, c.1 + e + asc), Anchor::Start),
                ((c.0 - e, c.1 + e + asc), Anchor::End),
                ((c.0, c.1 - e), Anchor::Middle),
                ((c.0, c.1 + e + asc), Anchor::Middle),
            ]);
        }
        cx.annotate(&mk.label, &cands, &b, BLACK);
    }
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
                    run.push((x, lo.max(w.y0 - (w.y1 - w.y0)), hi.min(w.y1 + (w.y1 - w.y0))));
                } else {
                    flush(&mut run, &mut out);
                }
            }
            flush(&mut run, &mut out);
            (out, *colour)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn linear_ticks_are_round_numbers() {
        let t = linear_ticks(0.0, 1.2, 5);
        let labels: Vec<&str> = t.iter().map(|t| t.label.as_str()).collect();
        assert_eq!(labels, ["0", "0.25", "0.5", "0.75", "1"]);
        let t = linear_ticks(-3.0, 3.0, 6);
        assert_eq!(t.first().map(|t| t.label.as_str()), Some("\u{2212}3"));
    }

    #[test]
    fn log_ticks_are_decades() {
        let t: Vec<String> = ticks(-2.0, 1.0, 5, true).into_iter().filter(|t| t.major).map(|t| t.label).collect();
        assert_eq!(t, ["10⁻²", "10⁻¹", "10⁰", "10¹"]);
    }

    #[test]
    fn box_hits_a_line_through_it_only() {
        let b = BBox::new(0.0, 0.0, 1.0, 1.0);
        assert!(b.hits(&[(-1.0, 0.5), (2.0, 0.5)]));
        assert!(!b.hits(&[(-1.0, 2.0), (2.0, 2.0)]));
        assert!(b.hits(&[(0.5, 0.5)]) && !b.hits(&[(1.5, 0.5)]));
    }
}
