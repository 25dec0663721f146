//! Drawing a [`Plot`] as SVG with plotters: white canvas, light grid, SI-prefixed ticks, our
//! palette, reference lines, bands and event marks, a legend where the data are not, label
//! areas sized to their text.
//!
//! plotters' SVG backend writes whole pixels, which stair-steps shallow lines on an 800 × 500
//! figure; so the figure is drawn at [`S`] times its size and the SVG's viewBox scales it
//! back: coordinates then have a tenth of a pixel's resolution.
use plotters::coord::Shift;
use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::font::{self, FAMILY};
use super::ticks::{self, Axis};
use super::{Kind, Plot, auto_bins, clip, thin};
use crate::num::math;

/// Figure size in pixels.
pub const WIDTH: u32 = 800;
pub const HEIGHT: u32 = 500;
/// Drawing units per pixel of the figure.
pub const S: u32 = 10;

// Text sizes in plotters units per pixel (the SVG font-size is these divided by 1.24).
const TITLE: f64 = 24.0;
const DESC: f64 = 19.0;
const TICK: f64 = 17.0;
const LEGEND: f64 = 16.0;
const NOTE: f64 = 15.0;

/// Series colours, in this order: wine, periwinkle, saffron, indigo, bark, sand. Our own set,
/// tuned so that every pair stays at least ΔE*ab 32 apart for normal vision and for simulated
/// protan, deutan and tritan vision (Machado et al. 2009), and every colour at least 37 from
/// the white canvas; the first two differ in lightness as well as hue. See docs/plots.md and
/// tests/reference/palette_cvd.py.
pub const PALETTE: [RGBColor; 6] = [
    RGBColor(0x6B, 0x11, 0x48),
    RGBColor(0x8F, 0xA8, 0xF0),
    RGBColor(0xFC, 0x99, 0x15),
    RGBColor(0x10, 0x4D, 0xA1),
    RGBColor(0x52, 0x46, 0x17),
    RGBColor(0xB2, 0x9B, 0x5E),
];
/// Marks that are not data: reference lines, event markers, histogram mean and ±σ.
pub const MARK: RGBColor = RGBColor(20, 20, 20);
/// Shaded bands (a spec window): a green-grey tint, apart from every series colour.
pub const BAND: RGBColor = RGBColor(96, 160, 120);
const BAND_ALPHA: f64 = 0.16;
/// Legend background: white, nearly opaque.
pub const LEGEND_ALPHA: f64 = 0.92;
const INK: RGBColor = RGBColor(40, 40, 40);
const AXIS: RGBColor = RGBColor(90, 90, 90);
const GRID: RGBColor = RGBColor(218, 218, 218);
const GRID_MINOR: RGBColor = RGBColor(238, 238, 238);
const TOTAL: RGBColor = RGBColor(70, 70, 70);

type Area<'a> = DrawingArea<SVGBackend<'a>, Shift>;
type Coords = Cartesian2d<Ticked, Ticked>;
type Chart<'a, 'b> = ChartContext<'a, SVGBackend<'b>, Coords>;

/// Pixels of the figure in drawing units.
fn z(px: f64) -> i32 {
    (px * S as f64).round() as i32
}

/// A font of `size` (plotters units per pixel) at the drawing scale.
fn font(size: f64) -> FontDesc<'static> {
    (FAMILY, size * S as f64).into_font()
}

/// A linear coordinate (log axes are laid out in log10) whose grid lines are exactly our ticks.
#[derive(Clone)]
struct Ticked(Axis);

impl Ranged for Ticked {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;
    fn map(&self, v: &f64, limit: (i32, i32)) -> i32 {
        let t = (v - self.0.lo) / (self.0.hi - self.0.lo);
        limit.0 + ((limit.1 - limit.0) as f64 * t).round() as i32
    }
    fn key_points<Hint: KeyPointHint>(&self, hint: Hint) -> Vec<f64> {
        if hint.weight().allow_light_points() { self.0.minor.clone() } else { self.0.ticks.clone() }
    }
    fn range(&self) -> std::ops::Range<f64> {
        self.0.lo..self.0.hi
    }
}

fn pe<E: std::fmt::Display>(e: E) -> String {
    format!("drawing failed: {e}")
}

/// What a first drawing found wanting: room above the data for the legend, room beside the
/// bars for their value labels (fractions of the axis span).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
struct Fix {
    headroom: f64,
    left: f64,
    right: f64,
}

/// The SVG text of a checked plot.
pub fn render(p: &Plot) -> Result<String, String> {
    p.check()?;
    font::ensure()?;
    let mut fix = Fix::default();
    let mut out = String::new();
    // Layout that depends on drawn text (legend, bar labels) is measured in a first drawing
    // and corrected in a second; the third is final whatever it finds.
    for _ in 0..3 {
        out.clear();
        let need = {
            let root = SVGBackend::with_string(&mut out, (WIDTH * S, HEIGHT * S)).into_drawing_area();
            root.fill(&WHITE).map_err(pe)?;
            let need = match p.kind {
                Kind::Line | Kind::Scatter | Kind::Step => xy(&root, p, fix)?,
                Kind::Histogram => histogram(&root, p, fix)?,
                Kind::Bar => bars(&root, p, fix)?,
            };
            root.present().map_err(pe)?;
            need
        };
        match need {
            Some(f) if f != fix => fix = f,
            _ => break,
        }
    }
    let (w, h) = (WIDTH * S, HEIGHT * S);
    out = out.replacen(
        &format!("width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\""),
        &format!("width=\"{WIDTH}\" height=\"{HEIGHT}\" viewBox=\"0 0 {w} {h}\""),
        1,
    );
    // An SVG <title> names the figure for screen readers and as the tooltip in browsers.
    if !p.title.is_empty()
        && let Some(k) = out.find('>')
    {
        out.insert_str(k + 1, &format!("\n<title>{}</title>", xml_escape(&p.title)));
    }
    Ok(out)
}

fn xml_escape(t: &str) -> String {
    t.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// Width of `t` in drawing units at `size` (plotters units per pixel).
fn text_w(root: &Area, t: &str, size: f64) -> i32 {
    root.estimate_text_size(t, &TextStyle::from(font(size)))
        .map(|s| s.0 as i32)
        .unwrap_or(z(t.len() as f64 * size * 0.6))
}

/// Width in pixels of `t` set at SVG font-size `font_size` in the embedded font, as the
/// layout measures it (for checks on rendered figures).
pub fn text_width(t: &str, font_size: f64) -> f64 {
    if font::ensure().is_err() {
        return t.chars().count() as f64 * font_size * 0.6;
    }
    let f: FontDesc = (FAMILY, font_size * 1.24).into_font();
    f.box_size(t).map(|s| s.0 as f64).unwrap_or(t.chars().count() as f64 * font_size * 0.6)
}

/// Finite (min, max) of values, or None.
fn extent<'a>(vals: impl Iterator<Item = &'a f64>) -> Option<(f64, f64)> {
    vals.filter(|v| v.is_finite()).fold(None, |acc, &v| match acc {
        None => Some((v, v)),
        Some((a, b)) => Some((a.min(v), b.max(v))),
    })
}

/// The title and its font size: shrunk until it fits the width, then cut with an ellipsis.
/// The title is bold; its width is estimated from the regular face, 12 % wider.
fn title_fit(root: &Area, t: &str) -> (String, f64) {
    let w = |t: &str, s: f64| (text_w(root, t, s) as f64 * 1.12) as i32;
    let max = z(WIDTH as f64 - 40.0);
    let mut s = TITLE;
    while s > 18.0 && w(t, s) > max {
        s -= 1.0;
    }
    let mut chars: Vec<char> = t.chars().collect();
    let mut shown = t.to_string();
    while w(&shown, s) > max && !chars.is_empty() {
        chars.pop();
        shown = format!("{}…", chars.iter().collect::<String>().trim_end());
    }
    (shown, s)
}

/// The right-hand axis of a plot with a secondary y axis: its ticks and description.
struct Right<'a> {
    axis: &'a Axis,
    unit: &'a str,
    desc: String,
}

/// Chart with label areas that fit the tick labels and descriptions; draws the mesh.
#[allow(clippy::too_many_arguments)]
fn chart<'a, 'b>(
    root: &'a Area<'b>,
    p: &Plot,
    xa: &Axis,
    ya: &Axis,
    x_fmt: &'a dyn Fn(&f64) -> String,
    y_fmt: &'a dyn Fn(&f64) -> String,
    x_desc: &str,
    y_desc: &str,
    right: Option<&Right>,
) -> Result<Chart<'a, 'b>, String> {
    let y_tick_w = ya.ticks.iter().map(|t| text_w(root, &y_fmt(t), TICK)).max().unwrap_or(0);
    let y_area = y_tick_w + z(16.0) + if y_desc.is_empty() { 0 } else { z(DESC * 1.1 + 8.0) };
    let x_area = z(TICK + 10.0) + if x_desc.is_empty() { 0 } else { z(DESC + 6.0) };
    // Room on the right for half of the last x tick label, or for the right axis.
    let last_x = xa.ticks.last().map(|t| text_w(root, &x_fmt(t), TICK) / 2).unwrap_or(0);
    let right_area = right.map(|r| {
        let w = r.axis.ticks.iter().map(|t| text_w(root, &r.axis.label(*t, r.unit), TICK)).max().unwrap_or(0);
        w + z(16.0) + if r.desc.is_empty() { 0 } else { z(DESC * 1.1 + 8.0) }
    });
    let mut b = ChartBuilder::on(root);
    b.margin_top(z(12.0)).margin_left(z(14.0)).margin_bottom(z(10.0));
    match right_area {
        // Our own labels go there (a label area would repeat the left axis' labels).
        Some(w) => b.margin_right(z(14.0) + w),
        None => b.margin_right(last_x.max(z(18.0)) + z(8.0)),
    };
    if !p.title.is_empty() {
        let (t, size) = title_fit(root, &p.title);
        b.caption(t, font(size).style(FontStyle::Bold).color(&INK));
    }
    b.x_label_area_size(x_area).y_label_area_size(y_area);
    let mut c = b.build_cartesian_2d(Ticked(xa.clone()), Ticked(ya.clone())).map_err(pe)?;
    let mut m = c.configure_mesh();
    m.x_labels(1000)
        .y_labels(1000)
        .x_label_formatter(x_fmt)
        .y_label_formatter(y_fmt)
        .label_style(font(TICK).color(&INK))
        .axis_desc_style(font(DESC).color(&INK))
        .bold_line_style(GRID.stroke_width(S))
        .light_line_style(GRID_MINOR.stroke_width(S))
        .axis_style(AXIS.stroke_width(S))
        .set_all_tick_mark_size(z(4.0));
    if !x_desc.is_empty() {
        m.x_desc(x_desc);
    }
    if !y_desc.is_empty() {
        m.y_desc(y_desc);
    }
    m.draw().map_err(pe)?;
    if let Some(r) = right {
        right_axis(root, &c, ya, r)?;
    }
    Ok(c)
}

/// The secondary y axis at the right edge: line, ticks, labels, description.
fn right_axis(root: &Area, c: &Chart, ya: &Axis, r: &Right) -> Result<(), String> {
    let (xs, ys) = c.plotting_area().get_pixel_range();
    let x = xs.end;
    root.draw(&PathElement::new(vec![(x, ys.start), (x, ys.end)], AXIS.stroke_width(S))).map_err(pe)?;
    let style = font(TICK).color(&INK).pos(Pos::new(HPos::Left, VPos::Center));
    let mut widest = 0;
    for t in &r.axis.ticks {
        let y = c.backend_coord(&(0.0, to_primary(ya, r.axis, *t))).1;
        root.draw(&PathElement::new(vec![(x, y), (x + z(4.0), y)], AXIS.stroke_width(S))).map_err(pe)?;
        let label = r.axis.label(*t, r.unit);
        widest = widest.max(text_w(root, &label, TICK));
        root.draw(&Text::new(label, (x + z(7.0), y), style.clone())).map_err(pe)?;
    }
    if !r.desc.is_empty() {
        let d = font(DESC).color(&INK).transform(FontTransform::Rotate90).pos(Pos::new(HPos::Center, VPos::Top));
        let xd = x + z(7.0) + widest + z(8.0 + DESC * 1.1);
        root.draw(&Text::new(r.desc.clone(), (xd, (ys.start + ys.end) / 2), d)).map_err(pe)?;
    }
    Ok(())
}

/// A secondary-axis coordinate in primary drawing coordinates (the two axes share the frame).
fn to_primary(ya: &Axis, y2: &Axis, v: f64) -> f64 {
    ya.lo + (v - y2.lo) / (y2.hi - y2.lo) * (ya.hi - ya.lo)
}

/// The range (lo, hi) in drawing coordinates widened by `frac` of its span on each side.
fn padded(lo: f64, hi: f64, frac: f64) -> (f64, f64) {
    let span = hi - lo;
    if span <= 0.0 { (lo, hi) } else { (lo - frac * span, hi + frac * span) }
}

/// An axis over data [lo, hi] (values), with optional limits that replace the data ends.
/// Linear data ends that are not limits are padded by 4 % of the span unless `exact`, so no
/// point sits on the frame; `headroom` widens the top by that fraction of the span.
fn data_axis(
    lo: f64,
    hi: f64,
    limits: (Option<f64>, Option<f64>),
    log: bool,
    target: usize,
    exact: bool,
    headroom: f64,
) -> Axis {
    let c = |v: f64| if log { math::log10(v) } else { v };
    let (mut a, mut b) = (c(lo), c(hi));
    if !exact {
        (a, b) = padded(a, b, 0.04);
    }
    b += headroom * (b - a).max(f64::MIN_POSITIVE);
    let (a, b) = (limits.0.map(c).unwrap_or(a), limits.1.map(c).unwrap_or(b));
    let v = |x: f64| if log { math::pow(10.0, x) } else { x };
    let exact = exact || limits.0.is_some() || limits.1.is_some();
    let mut axis = if log { ticks::log(v(a), v(b)) } else { ticks::linear(a, b, target, false, exact) };
    if log || exact {
        let (lo, hi) = (limits.0.map(c).unwrap_or(axis.lo), limits.1.map(c).unwrap_or(axis.hi));
        axis = axis.limited(lo, hi);
    }
    axis
}

/// One legend entry: its sample and its text.
enum Sample {
    Line(RGBColor),
    Dot(RGBColor),
    Fill(RGBColor, f64),
    Marker(usize),
    Dashed(RGBColor),
}

/// A legend box in drawing units: entries, size.
struct Legend {
    entries: Vec<(Sample, String)>,
    w: i32,
    h: i32,
    row: i32,
}

impl Legend {
    fn new(root: &Area, entries: Vec<(Sample, String)>) -> Legend {
        let row = z(LEGEND * 1.3);
        let text = entries.iter().map(|(_, t)| text_w(root, t, LEGEND)).max().unwrap_or(0);
        let w = z(10.0 + 24.0 + 8.0 + 10.0) + text;
        let h = row * entries.len() as i32 + z(12.0);
        Legend { entries, w, h, row }
    }

    /// Candidate top-left corners inside the plot area, in order of preference.
    fn spots(&self, xs: &std::ops::Range<i32>, ys: &std::ops::Range<i32>) -> Vec<(i32, i32)> {
        let m = z(10.0);
        let (l, r) = (xs.start + m, xs.end - m - self.w);
        let (t, b) = (ys.start + m, ys.end - m - self.h);
        let (cx, cy) = ((xs.start + xs.end - self.w) / 2, (ys.start + ys.end - self.h) / 2);
        // One row lower at the top: below the labels of vertical lines and histogram marks.
        let t2 = t + z(NOTE * 1.1 + 6.0);
        vec![(r, t), (l, t), (cx, t), (r, b), (l, b), (cx, b), (r, t2), (l, t2), (cx, t2), (r, cy), (l, cy)]
    }

    fn draw(&self, root: &Area, at: (i32, i32)) -> Result<(), String> {
        let (x, y) = at;
        let bg = WHITE.mix(LEGEND_ALPHA).filled();
        root.draw(&Rectangle::new([(x, y), (x + self.w, y + self.h)], bg)).map_err(pe)?;
        root.draw(&Rectangle::new([(x, y), (x + self.w, y + self.h)], GRID.stroke_width(S))).map_err(pe)?;
        let style = font(LEGEND).color(&INK).pos(Pos::new(HPos::Left, VPos::Center));
        for (k, (sample, text)) in self.entries.iter().enumerate() {
            let cy = y + z(6.0) + self.row * k as i32 + self.row / 2;
            let (x0, x1) = (x + z(10.0), x + z(34.0));
            match sample {
                Sample::Line(c) => {
                    root.draw(&PathElement::new(vec![(x0, cy), (x1, cy)], c.stroke_width(2 * S))).map_err(pe)?
                }
                Sample::Dashed(c) => dashed(root, (x0, cy), (x1, cy), z(5.0), z(3.0), c.stroke_width(z(1.5) as u32))?,
                Sample::Dot(c) => root.draw(&Circle::new(((x0 + x1) / 2, cy), z(4.0), c.filled())).map_err(pe)?,
                Sample::Fill(c, a) => root
                    .draw(&Rectangle::new([(x0, cy - z(6.0)), (x1, cy + z(6.0))], c.mix(*a).filled()))
                    .map_err(pe)?,
                Sample::Marker(k) => marker(root, *k, ((x0 + x1) / 2, cy))?,
            }
            root.draw(&Text::new(text.clone(), (x1 + z(8.0), cy), style.clone())).map_err(pe)?;
        }
        Ok(())
    }
}

/// A dashed axis-aligned line from `a` to `b` in drawing units: dashes of `on`, gaps of
/// `off` (drawn as short paths, so the SVG stays plain and the layout exact).
fn dashed(root: &Area, a: (i32, i32), b: (i32, i32), on: i32, off: i32, st: ShapeStyle) -> Result<(), String> {
    let len = (b.0 - a.0).abs().max((b.1 - a.1).abs());
    let dir = ((b.0 - a.0).signum(), (b.1 - a.1).signum());
    let mut d = 0;
    while d < len {
        let e = (d + on).min(len);
        let p = |t: i32| (a.0 + dir.0 * t, a.1 + dir.1 * t);
        root.draw(&PathElement::new(vec![p(d), p(e)], st)).map_err(pe)?;
        d = e + off;
    }
    Ok(())
}

/// Event marker `k` (shape by kind) centred at a drawing point: open circle, open triangle,
/// open diamond, cross.
fn marker(root: &Area, k: usize, at: (i32, i32)) -> Result<(), String> {
    let (x, y) = at;
    let r = z(4.5);
    let st = MARK.stroke_width(z(1.4) as u32);
    match k % 4 {
        0 => root.draw(&Circle::new(at, r, st)),
        1 => root.draw(&PathElement::new(vec![(x, y - r), (x + r, y + r), (x - r, y + r), (x, y - r)], st)),
        2 => root.draw(&PathElement::new(vec![(x, y - r), (x + r, y), (x, y + r), (x - r, y), (x, y - r)], st)),
        _ => {
            root.draw(&PathElement::new(vec![(x - r, y - r), (x + r, y + r)], st)).map_err(pe)?;
            root.draw(&PathElement::new(vec![(x - r, y + r), (x + r, y - r)], st))
        }
    }
    .map_err(pe)
}

/// Places the legend where it covers the fewest occupied drawing points (and none if any
/// place allows); returns the headroom that would free the top of the plot when every place
/// covers data.
fn place_legend(
    root: &Area,
    legend: &Legend,
    c: &Chart,
    occupied: &[(i32, i32)],
    fix: Fix,
) -> Result<Option<Fix>, String> {
    if legend.entries.is_empty() {
        return Ok(None);
    }
    let (xs, ys) = c.plotting_area().get_pixel_range();
    let covered = |&(x, y): &(i32, i32)| {
        occupied.iter().filter(|(a, b)| *a >= x && *a <= x + legend.w && *b >= y && *b <= y + legend.h).count()
    };
    let spots = legend.spots(&xs, &ys);
    let best = spots.iter().min_by_key(|s| covered(s)).copied().unwrap_or((xs.start, ys.start));
    let need = if covered(&best) > 0 && fix.headroom == 0.0 {
        // Free a band at the top as tall as the legend: new span = old × (1 + h), with the
        // data in the lower 1/(1 + h) of it.
        let r = (legend.h + z(20.0)) as f64 / (ys.end - ys.start) as f64;
        Some(Fix { headroom: (r / (1.0 - r).max(0.2)).min(2.0), ..fix })
    } else {
        None
    };
    legend.draw(root, best)?;
    Ok(need)
}

/// Drawing points along a polyline, at most about two pixels apart, so a legend test sees
/// lines and not only their vertices.
fn along(c: &Chart, pts: &[(f64, f64)], out: &mut Vec<(i32, i32)>) {
    let px: Vec<(i32, i32)> = pts.iter().map(|p| c.backend_coord(p)).collect();
    for w in px.windows(2) {
        let d = (w[1].0 - w[0].0).abs().max((w[1].1 - w[0].1).abs());
        let n = (d / z(2.0)).max(1);
        for k in 0..n {
            let t = k as f64 / n as f64;
            out.push((
                w[0].0 + ((w[1].0 - w[0].0) as f64 * t).round() as i32,
                w[0].1 + ((w[1].1 - w[0].1) as f64 * t).round() as i32,
            ));
        }
    }
    out.extend(px.last());
}

/// Line, scatter and step charts.
fn xy(root: &Area, p: &Plot, fix: Fix) -> Result<Option<Fix>, String> {
    let xr = extent(p.x.iter()).ok_or("plot: 'x' has no finite value")?;
    let mut ys: Vec<f64> = p.ys.iter().flatten().copied().collect();
    ys.extend(p.y_lines.iter().map(|l| l.at));
    ys.extend(p.bands.iter().flat_map(|b| [b.min, b.max]).flatten());
    ys.extend(p.events.iter().filter_map(|e| e.y));
    let yr = extent(ys.iter()).ok_or("plot: 'y' has no finite value")?;
    let mut xs: Vec<f64> = vec![xr.0, xr.1];
    xs.extend(p.x_lines.iter().map(|l| l.at));
    let xr = extent(xs.iter()).unwrap_or(xr);
    let xa = data_axis(xr.0, xr.1, (p.x_min, p.x_max), p.log_x, 7, p.kind != Kind::Scatter, 0.0);
    let ya = data_axis(yr.0, yr.1, (p.y_min, p.y_max), p.log_y, 6, false, fix.headroom);
    let y2a = extent(p.y2.iter().flatten()).map(|(a, b)| data_axis(a, b, (None, None), false, 6, false, fix.headroom));
    let right = y2a.as_ref().map(|a| Right { axis: a, unit: &p.y2_unit, desc: a.describe(&p.y2_label, &p.y2_unit) });
    let xf = |c: &f64| xa.label(*c, &p.x_unit);
    let yf = |c: &f64| ya.label(*c, &p.y_unit);
    let (xd, yd) = (xa.describe(&p.x_label, &p.x_unit), ya.describe(&p.y_label, &p.y_unit));
    let mut c = chart(root, p, &xa, &ya, &xf, &yf, &xd, &yd, right.as_ref())?;
    let (w, h) = c.plotting_area().dim_in_pixel();
    let (w, h) = (w / S, h / S);
    let frame = (xa.lo, xa.hi, ya.lo, ya.hi);
    let mut entries = Vec::new();
    let mut occupied = Vec::new();
    // Bands first, under everything.
    for b in &p.bands {
        let y0 = b.min.map(|v| ya.to_coord(v)).unwrap_or(ya.lo).max(ya.lo);
        let y1 = b.max.map(|v| ya.to_coord(v)).unwrap_or(ya.hi).min(ya.hi);
        if y1 > y0 {
            c.draw_series(std::iter::once(Rectangle::new([(xa.lo, y0), (xa.hi, y1)], BAND.mix(BAND_ALPHA).filled())))
                .map_err(pe)?;
        }
        if !b.label.is_empty() {
            entries.push((Sample::Fill(BAND, 0.35), b.label.clone()));
        }
    }
    let all: Vec<(&Vec<f64>, bool)> = p.ys.iter().map(|y| (y, false)).chain(p.y2.iter().map(|y| (y, true))).collect();
    for (k, &(y, second)) in all.iter().enumerate() {
        let color = PALETTE[k % PALETTE.len()];
        // Every value is finite (checked); drawing coordinates, then thinned to the pixels.
        let to_y = |v: f64| match (second, &y2a) {
            (true, Some(a)) => to_primary(&ya, a, v),
            _ => ya.to_coord(v),
        };
        let pts: Vec<(f64, f64)> = p.x.iter().zip(y.iter()).map(|(&a, &b)| (xa.to_coord(a), to_y(b))).collect();
        let pts = if p.kind == Kind::Step { staircase(&pts) } else { pts };
        if p.kind == Kind::Scatter {
            let inside: Vec<(f64, f64)> = pts
                .into_iter()
                .filter(|q| q.0 >= frame.0 && q.0 <= frame.1 && q.1 >= frame.2 && q.1 <= frame.3)
                .collect();
            let pts = thin::scatter(&inside, (xa.lo, xa.hi), (ya.lo, ya.hi), w, h);
            occupied.extend(pts.iter().map(|q| c.backend_coord(q)));
            c.draw_series(pts.into_iter().map(|q| Circle::new(q, z(3.0), color.filled()))).map_err(pe)?;
        } else {
            let pts = thin::polyline(&pts, (xa.lo, xa.hi), (ya.lo, ya.hi), w, h);
            for run in clip::polyline(&pts, frame) {
                along(&c, &run, &mut occupied);
                c.draw_series(LineSeries::new(run, color.stroke_width(2 * S))).map_err(pe)?;
            }
        }
        if let Some(name) = p.names.get(k) {
            let name = if second { format!("{name} (right axis)") } else { name.clone() };
            entries.push((if p.kind == Kind::Scatter { Sample::Dot(color) } else { Sample::Line(color) }, name));
        }
    }
    ref_lines(root, &c, p, &xa, &ya, &mut occupied)?;
    events(root, &c, p, &xa, &ya, (w, h), &mut entries, &mut occupied)?;
    let legend = Legend::new(root, entries);
    place_legend(root, &legend, &c, &occupied, fix)
}

/// Dashed reference lines with their labels: horizontal ones labelled at the right end above
/// the line, vertical ones at the top beside the line, moved down a row where two would touch.
fn ref_lines(
    root: &Area,
    c: &Chart,
    p: &Plot,
    xa: &Axis,
    ya: &Axis,
    occupied: &mut Vec<(i32, i32)>,
) -> Result<(), String> {
    let (xs, ys) = c.plotting_area().get_pixel_range();
    let st = MARK.stroke_width(z(1.3) as u32);
    let dash = |a: (i32, i32), b: (i32, i32)| dashed(root, a, b, z(6.0), z(4.0), st);
    let mut placed: Vec<(i32, i32, i32, i32)> = Vec::new();
    let mut free = |b: (i32, i32, i32, i32), step: i32| {
        let mut b = b;
        while placed.iter().any(|q| b.0 < q.2 && q.0 < b.2 && b.1 < q.3 && q.1 < b.3) {
            b = (b.0, b.1 + step, b.2, b.3 + step);
        }
        placed.push(b);
        b
    };
    let th = z(NOTE * 1.1);
    for l in &p.y_lines {
        let y = c.backend_coord(&(xa.lo, ya.to_coord(l.at))).1;
        dash((xs.start, y), (xs.end, y))?;
        if !l.label.is_empty() {
            let tw = text_w(root, &l.label, NOTE);
            let b = free((xs.end - z(6.0) - tw, y - z(3.0) - th, xs.end - z(6.0), y - z(3.0)), -th);
            label_at(root, &l.label, (b.0, b.1), occupied, tw, th)?;
        }
    }
    for l in &p.x_lines {
        let x = c.backend_coord(&(xa.to_coord(l.at), ya.lo)).0;
        dash((x, ys.start), (x, ys.end))?;
        if !l.label.is_empty() {
            let tw = text_w(root, &l.label, NOTE);
            // Right of the line, or left of it where the frame ends first.
            let x0 = if x + z(4.0) + tw <= xs.end { x + z(4.0) } else { x - z(4.0) - tw };
            let b = free((x0, ys.start + z(4.0), x0 + tw, ys.start + z(4.0) + th), th);
            label_at(root, &l.label, (b.0, b.1), occupied, tw, th)?;
        }
    }
    Ok(())
}

/// A note-sized label with its top-left corner at `at`, on a white ground; its box counts
/// as occupied for the legend.
fn label_at(
    root: &Area,
    t: &str,
    at: (i32, i32),
    occupied: &mut Vec<(i32, i32)>,
    tw: i32,
    th: i32,
) -> Result<(), String> {
    root.draw(&Rectangle::new([(at.0 - z(2.0), at.1), (at.0 + tw + z(2.0), at.1 + th)], WHITE.mix(0.8).filled()))
        .map_err(pe)?;
    let style = font(NOTE).color(&MARK).pos(Pos::new(HPos::Left, VPos::Top));
    root.draw(&Text::new(t.to_string(), (at.0, at.1 + z(1.0)), style)).map_err(pe)?;
    for i in 0..=4 {
        for j in 0..=2 {
            occupied.push((at.0 + tw * i / 4, at.1 + th * j / 2));
        }
    }
    Ok(())
}

/// Event markers: a shape per kind (in order of first appearance), on the curve where the
/// event has a y value, else on the top edge; one legend entry per kind.
#[allow(clippy::too_many_arguments)]
fn events(
    root: &Area,
    c: &Chart,
    p: &Plot,
    xa: &Axis,
    ya: &Axis,
    wh: (u32, u32),
    entries: &mut Vec<(Sample, String)>,
    occupied: &mut Vec<(i32, i32)>,
) -> Result<(), String> {
    let mut kinds: Vec<&str> = Vec::new();
    for e in &p.events {
        if !kinds.contains(&e.kind.as_str()) {
            kinds.push(&e.kind);
        }
    }
    for (k, kind) in kinds.iter().enumerate() {
        let pts: Vec<(f64, f64)> = p
            .events
            .iter()
            .filter(|e| e.kind == *kind)
            .map(|e| (xa.to_coord(e.x), e.y.map(|y| ya.to_coord(y)).unwrap_or(ya.hi)))
            .filter(|q| q.0 >= xa.lo && q.0 <= xa.hi && q.1 >= ya.lo && q.1 <= ya.hi)
            .collect();
        for q in thin::scatter(&pts, (xa.lo, xa.hi), (ya.lo, ya.hi), wh.0 / 2, wh.1 / 2) {
            let at = c.backend_coord(&q);
            occupied.push(at);
            marker(root, k, at)?;
        }
        let name = if kind.is_empty() { "event".to_string() } else { kind.to_string() };
        entries.push((Sample::Marker(k), name));
    }
    Ok(())
}

/// Post-step staircase: each y holds from its x to the next x.
fn staircase(pts: &[(f64, f64)]) -> Vec<(f64, f64)> {
    let mut v = Vec::with_capacity(pts.len() * 2);
    for (k, &(x, y)) in pts.iter().enumerate() {
        if k > 0 {
            v.push((x, pts[k - 1].1));
        }
        v.push((x, y));
    }
    v
}

/// Histograms of one or more sample sets on common bins; with `stats`, each set's mean as a
/// solid line and mean ± σ as dashed lines in the mark colour, labelled at the top.
fn histogram(root: &Area, p: &Plot, fix: Fix) -> Result<Option<Fix>, String> {
    let (lo, hi) = extent(p.ys.iter().flatten()).ok_or("plot: 'x' has no finite value")?;
    let all: Vec<f64> = p.ys.iter().flatten().copied().collect();
    let nb = p.bins.unwrap_or_else(|| auto_bins(&all)).max(1);
    let (lo, hi) = if hi > lo { (lo, hi) } else { (lo - 0.5 * lo.abs().max(1e-30), hi + 0.5 * hi.abs().max(1e-30)) };
    let w = (hi - lo) / nb as f64;
    let counts: Vec<Vec<usize>> =
        p.ys.iter()
            .map(|s| {
                let mut c = vec![0usize; nb];
                for &v in s {
                    let k = (((v - lo) / w).floor() as usize).min(nb - 1);
                    c[k] += 1;
                }
                c
            })
            .collect();
    let stats: Vec<(f64, f64)> =
        p.ys.iter()
            .map(|y| {
                let s: crate::num::Series = y.iter().copied().collect();
                (s.mean(), s.stdev())
            })
            .collect();
    // The axis shows the bins, the ±σ marks and any reference line.
    let mut ends = vec![lo, hi];
    if p.stats {
        ends.extend(stats.iter().filter(|s| s.1.is_finite()).flat_map(|s| [s.0 - s.1, s.0 + s.1]));
    }
    ends.extend(p.x_lines.iter().map(|l| l.at));
    let (xlo, xhi) = extent(ends.iter()).unwrap_or((lo, hi));
    let top = counts.iter().flatten().copied().max().unwrap_or(1).max(1) as f64;
    let xa = ticks::linear(xlo, xhi, 7, false, true);
    let mut ya = ticks::linear(0.0, top * (1.08 + fix.headroom), 6, true, false);
    if ya.ticks.len() > 1 && ya.ticks[1] - ya.ticks[0] < 1.0 {
        // Counts are whole numbers: one tick per count when there are few.
        ya.hi = ya.hi.ceil();
        ya.ticks = (0..=ya.hi as i64).map(|k| k as f64).collect();
        ya.minor.clear();
    }
    let xf = |c: &f64| xa.label(*c, &p.x_unit);
    let yf = |c: &f64| ya.label(*c, "");
    let y_desc = if p.y_label.is_empty() { "count".to_string() } else { p.y_label.clone() };
    let mut c = chart(root, p, &xa, &ya, &xf, &yf, &xa.describe(&p.x_label, &p.x_unit), &y_desc, None)?;
    let alpha = if p.ys.len() > 1 { 0.45 } else { 0.75 };
    let mut entries = Vec::new();
    let mut occupied = Vec::new();
    for (k, cs) in counts.iter().enumerate() {
        let color = PALETTE[k % PALETTE.len()];
        let bins = || cs.iter().enumerate().filter(|(_, n)| **n > 0).map(|(i, &n)| (lo + w * i as f64, n as f64));
        c.draw_series(bins().map(|(x0, n)| Rectangle::new([(x0, 0.0), (x0 + w, n)], color.mix(alpha).filled())))
            .map_err(pe)?;
        c.draw_series(bins().map(|(x0, n)| Rectangle::new([(x0, 0.0), (x0 + w, n)], color.stroke_width(S))))
            .map_err(pe)?;
        for (x0, n) in bins() {
            for i in 0..=4 {
                for j in 0..=8 {
                    occupied.push(c.backend_coord(&(x0 + w * i as f64 / 4.0, n * j as f64 / 8.0)));
                }
            }
        }
        let (m, sd) = stats[k];
        let name = match (p.names.get(k), p.stats) {
            (Some(n), true) => Some(format!("{n}: μ {}, σ {}", fmt_stat(m, &p.x_unit), fmt_stat(sd, &p.x_unit))),
            (None, true) => Some(format!("μ {}, σ {}", fmt_stat(m, &p.x_unit), fmt_stat(sd, &p.x_unit))),
            (n, false) => n.cloned(),
        };
        if let Some(name) = name {
            entries.push((Sample::Fill(color, alpha), name));
        }
    }
    if p.stats {
        let (_, ys) = c.plotting_area().get_pixel_range();
        let st = MARK.stroke_width(2 * S);
        for &(m, sd) in &stats {
            let x = c.backend_coord(&(m, 0.0)).0;
            root.draw(&PathElement::new(vec![(x, ys.start), (x, ys.end)], st)).map_err(pe)?;
            let mut marks = vec![(x, "μ".to_string())];
            if sd.is_finite() && sd > 0.0 {
                for (v, t) in [(m - sd, "−σ"), (m + sd, "+σ")] {
                    let xs = c.backend_coord(&(v, 0.0)).0;
                    dashed(root, (xs, ys.start), (xs, ys.end), z(6.0), z(4.0), MARK.stroke_width(z(1.3) as u32))?;
                    marks.push((xs, t.to_string()));
                }
            }
            for (x, t) in marks {
                let tw = text_w(root, &t, NOTE);
                label_at(root, &t, (x + z(3.0), ys.start + z(3.0)), &mut occupied, tw, z(NOTE * 1.1))?;
            }
        }
        entries.push((Sample::Line(MARK), "mean".into()));
        entries.push((Sample::Dashed(MARK), "mean ± σ".into()));
    }
    ref_lines(root, &c, p, &xa, &ya, &mut occupied)?;
    let legend = Legend::new(root, entries);
    place_legend(root, &legend, &c, &occupied, fix)
}

/// Horizontal bars, first label on top; a waterfall stacks them and ends with the total.
/// Value labels sit beside the bar ends, inside the frame: a first drawing measures them and
/// widens the value axis where one would reach the category labels or the right edge.
fn bars(root: &Area, p: &Plot, fix: Fix) -> Result<Option<Fix>, String> {
    let vals = &p.ys[0];
    let mut labels: Vec<String> = p.labels.clone();
    // (start, end, colour) of each bar.
    let mut spans: Vec<(f64, f64, RGBColor)> = Vec::new();
    let mut cum = 0.0;
    for &v in vals {
        let start = if p.waterfall { cum } else { 0.0 };
        let color = if v >= 0.0 { PALETTE[3] } else { PALETTE[2] };
        spans.push((start, start + v, color));
        cum += v;
    }
    if p.waterfall {
        spans.push((0.0, cum, TOTAL));
        labels.push(p.total_label.clone());
    }
    let n = spans.len();
    let ends = spans.iter().flat_map(|s| [s.0, s.1]).chain([0.0]);
    let (lo, hi) = extent(ends.collect::<Vec<_>>().iter()).unwrap_or((0.0, 1.0));
    let span = (hi - lo).max(f64::MIN_POSITIVE);
    // Room beside the bar ends for the value labels: a first guess, then what was measured.
    let lo = if lo < 0.0 { lo - (0.12 + fix.left) * span } else { lo - fix.left * span };
    let hi = if hi > 0.0 { hi + (0.12 + fix.right) * span } else { hi + fix.right * span };
    let mut xa = ticks::linear(lo, hi, 6, true, false);
    xa.minor.clear();
    let ya = Axis {
        lo: -0.6,
        hi: n as f64 - 0.4,
        ticks: (0..n).map(|k| k as f64).collect(),
        minor: vec![],
        log: false,
        step: 0.0,
        offset: 0.0,
    };
    let shown: Vec<String> = labels.iter().map(|l| fit(root, l, z(300.0))).collect();
    let xf = |c: &f64| xa.label(*c, &p.y_unit);
    let yf = |c: &f64| {
        let k = c.round() as i64;
        if k < 0 || k >= n as i64 { String::new() } else { shown[n - 1 - k as usize].clone() }
    };
    let mut c = chart(root, p, &xa, &ya, &xf, &yf, &xa.describe(&p.y_label, &p.y_unit), &p.x_label, None)?;
    let row = |k: usize| (n - 1 - k) as f64;
    c.draw_series(
        spans
            .iter()
            .enumerate()
            .map(|(k, &(a, b, col))| Rectangle::new([(a, row(k) - 0.32), (b, row(k) + 0.32)], col.filled())),
    )
    .map_err(pe)?;
    if p.waterfall {
        // Thin connectors from each bar's end to the next bar's start.
        c.draw_series((0..n.saturating_sub(1)).map(|k| {
            let x = spans[k].1;
            PathElement::new(vec![(x, row(k) - 0.32), (x, row(k + 1) + 0.32)], AXIS.stroke_width(S))
        }))
        .map_err(pe)?;
    }
    let (xs, _) = c.plotting_area().get_pixel_range();
    let plot_w = (xs.end - xs.start).max(1) as f64;
    let axis_span = xa.hi - xa.lo;
    let (mut need_l, mut need_r) = (0.0f64, 0.0f64);
    let style = font(TICK).color(&INK);
    for (k, &(a, b, _)) in spans.iter().enumerate() {
        let v = b - a;
        let right = b >= a;
        let text = crate::report::format::value(v, &p.y_unit, 3);
        // Contributions of a waterfall carry their sign; the total does not.
        let text = if p.waterfall && k < vals.len() && v >= 0.0 { format!("+{text}") } else { text };
        let tw = text_w(root, &text, TICK);
        let (x, y) = c.backend_coord(&(b, row(k)));
        let gap = z(6.0);
        if right {
            need_r = need_r.max((x + gap + tw + z(4.0) - xs.end) as f64);
        } else {
            need_l = need_l.max((xs.start + z(4.0) - (x - gap - tw)) as f64);
        }
        let pos = Pos::new(if right { HPos::Left } else { HPos::Right }, VPos::Center);
        root.draw(&Text::new(text, (if right { x + gap } else { x - gap }, y), style.clone().pos(pos))).map_err(pe)?;
    }
    // Overflow in pixels as a fraction of the data span, to widen the axis by.
    let frac = |px: f64| if px > 0.0 { px / plot_w * axis_span / span * 1.15 } else { 0.0 };
    let (l, r) = (frac(need_l), frac(need_r));
    if l > 0.0 || r > 0.0 {
        return Ok(Some(Fix { left: fix.left + l, right: fix.right + r, ..fix }));
    }
    Ok(None)
}

/// A mean or standard deviation for a legend: 3 digits with the unit.
fn fmt_stat(x: f64, unit: &str) -> String {
    if x.is_finite() { crate::report::format::value(x, unit, 3) } else { "n/a".into() }
}

/// `t`, cut with an ellipsis to at most `max` drawing units wide.
fn fit(root: &Area, t: &str, max: i32) -> String {
    if text_w(root, t, TICK) <= max {
        return t.to_string();
    }
    let mut s: Vec<char> = t.chars().collect();
    while !s.is_empty() && text_w(root, &format!("{}…", s.iter().collect::<String>()), TICK) > max {
        s.pop();
    }
    format!("{}…", s.iter().collect::<String>())
}
