//! Drawing a [`Plot`] as SVG with plotters: white canvas, light grid, SI-prefixed ticks,
//! a restrained palette, legend in a corner, label areas sized to their text.
use plotters::coord::Shift;
use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::font::{self, FAMILY};
use super::thin;
use super::ticks::{self, Axis};
use super::{Kind, Plot, auto_bins};

/// Canvas size in pixels.
pub const WIDTH: u32 = 800;
pub const HEIGHT: u32 = 500;

// Text sizes in plotters units (the SVG font-size is these divided by 1.24).
const TITLE: f64 = 24.0;
const DESC: f64 = 19.0;
const TICK: f64 = 17.0;
const LEGEND: f64 = 17.0;

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
const INK: RGBColor = RGBColor(40, 40, 40);
const AXIS: RGBColor = RGBColor(90, 90, 90);
const GRID: RGBColor = RGBColor(218, 218, 218);
const GRID_MINOR: RGBColor = RGBColor(238, 238, 238);
const TOTAL: RGBColor = RGBColor(70, 70, 70);

type Area<'a> = DrawingArea<SVGBackend<'a>, Shift>;
type Coords = Cartesian2d<Ticked, Ticked>;

/// A linear coordinate (log axes are laid out in log10) whose grid lines are exactly our ticks.
#[derive(Clone)]
struct Ticked(Axis);

impl Ranged for Ticked {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;
    fn map(&self, v: &f64, limit: (i32, i32)) -> i32 {
        let t = (v - self.0.lo) / (self.0.hi - self.0.lo);
        limit.0 + ((limit.1 - limit.0) as f64 * t + 1e-3).floor() as i32
    }
    fn key_points<Hint: KeyPointHint>(&self, hint: Hint) -> Vec<f64> {
        if hint.weight().allow_light_points() { self.0.minor.clone() } else { self.0.ticks.clone() }
    }
    fn range(&self) -> std::ops::Range<f64> {
        self.0.lo..self.0.hi
    }
}
type Chart<'a, 'b> = ChartContext<'a, SVGBackend<'b>, Coords>;

fn pe<E: std::fmt::Display>(e: E) -> String {
    format!("drawing failed: {e}")
}

/// The SVG text of a checked plot.
pub fn render(p: &Plot) -> Result<String, String> {
    p.check()?;
    font::ensure()?;
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (WIDTH, HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(pe)?;
        match p.kind {
            Kind::Line | Kind::Scatter | Kind::Step => xy(&root, p)?,
            Kind::Histogram => histogram(&root, p)?,
            Kind::Bar => bars(&root, p)?,
        }
        root.present().map_err(pe)?;
    }
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

fn text_w(root: &Area, t: &str, size: f64) -> u32 {
    root.estimate_text_size(t, &TextStyle::from((FAMILY, size).into_font()))
        .map(|s| s.0)
        .unwrap_or((t.len() as f64 * size * 0.6) as u32)
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
    let w = |t: &str, s: f64| (text_w(root, t, s) as f64 * 1.12) as u32;
    let mut s = TITLE;
    while s > 18.0 && w(t, s) + 40 > WIDTH {
        s -= 1.0;
    }
    let mut chars: Vec<char> = t.chars().collect();
    let mut shown = t.to_string();
    while w(&shown, s) + 40 > WIDTH && !chars.is_empty() {
        chars.pop();
        shown = format!("{}…", chars.iter().collect::<String>().trim_end());
    }
    (shown, s)
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
) -> Result<Chart<'a, 'b>, String> {
    let y_tick_w = ya.ticks.iter().map(|t| text_w(root, &y_fmt(t), TICK)).max().unwrap_or(0);
    let y_area = y_tick_w + 16 + if y_desc.is_empty() { 0 } else { (DESC * 1.1) as u32 + 8 };
    let x_area = TICK as u32 + 10 + if x_desc.is_empty() { 0 } else { DESC as u32 + 6 };
    // Room on the right for half of the last x tick label.
    let last_x = xa.ticks.last().map(|t| text_w(root, &x_fmt(t), TICK) / 2).unwrap_or(0);
    let mut b = ChartBuilder::on(root);
    b.margin_top(12).margin_left(14).margin_bottom(10).margin_right(last_x.max(18) + 8);
    if !p.title.is_empty() {
        let (t, size) = title_fit(root, &p.title);
        b.caption(t, (FAMILY, size).into_font().style(FontStyle::Bold).color(&INK));
    }
    b.x_label_area_size(x_area).y_label_area_size(y_area);
    let mut c = b.build_cartesian_2d(Ticked(xa.clone()), Ticked(ya.clone())).map_err(pe)?;
    let mut m = c.configure_mesh();
    m.x_labels(1000)
        .y_labels(1000)
        .x_label_formatter(x_fmt)
        .y_label_formatter(y_fmt)
        .label_style((FAMILY, TICK).into_font().color(&INK))
        .axis_desc_style((FAMILY, DESC).into_font().color(&INK))
        .bold_line_style(GRID.stroke_width(1))
        .light_line_style(GRID_MINOR.stroke_width(1))
        .axis_style(AXIS.stroke_width(1))
        .set_all_tick_mark_size(4);
    if !x_desc.is_empty() {
        m.x_desc(x_desc);
    }
    if !y_desc.is_empty() {
        m.y_desc(y_desc);
    }
    m.draw().map_err(pe)?;
    Ok(c)
}

fn axis_for(vals: (f64, f64), log: bool, target: usize, exact: bool) -> Axis {
    if log { ticks::log(vals.0, vals.1) } else { ticks::linear(vals.0, vals.1, target, false, exact) }
}

fn legend<'a, 'b: 'a>(c: &mut Chart<'a, 'b>, p: &Plot, occupied: &[(f64, f64)]) -> Result<(), String> {
    if p.names.is_empty() && !(p.stats && p.kind == Kind::Histogram) {
        return Ok(());
    }
    c.configure_series_labels()
        .position(legend_corner(occupied))
        .margin(12)
        .legend_area_size(28)
        .label_font((FAMILY, LEGEND).into_font().color(&INK))
        .background_style(WHITE.mix(0.9))
        .border_style(GRID)
        .draw()
        .map_err(pe)
}

/// Position of drawing coordinate `c` along an axis, 0 at `lo`, 1 at `hi`.
fn unit(a: &Axis, c: f64) -> f64 {
    (c - a.lo) / (a.hi - a.lo)
}

/// The plot corner holding the fewest of the points (unit coordinates, y up); ties go to
/// upper right, upper left, lower right, lower left, in that order.
fn legend_corner(pts: &[(f64, f64)]) -> SeriesLabelPosition {
    let corners = [
        (SeriesLabelPosition::UpperRight, 0.55, 1.0, 0.65, 1.0),
        (SeriesLabelPosition::UpperLeft, 0.0, 0.45, 0.65, 1.0),
        (SeriesLabelPosition::LowerRight, 0.55, 1.0, 0.0, 0.35),
        (SeriesLabelPosition::LowerLeft, 0.0, 0.45, 0.0, 0.35),
    ];
    let count = |&(_, x0, x1, y0, y1): &(SeriesLabelPosition, f64, f64, f64, f64)| {
        pts.iter().filter(|(x, y)| *x >= x0 && *x <= x1 && *y >= y0 && *y <= y1).count()
    };
    let mut best = 0;
    for k in 1..corners.len() {
        if count(&corners[k]) < count(&corners[best]) {
            best = k;
        }
    }
    corners[best].0.clone()
}

/// Line, scatter and step charts.
fn xy(root: &Area, p: &Plot) -> Result<(), String> {
    let xr = extent(p.x.iter()).ok_or("plot: 'x' has no finite value")?;
    let yr = extent(p.ys.iter().flatten()).ok_or("plot: 'y' has no finite value")?;
    let xa = axis_for(xr, p.log_x, 7, p.kind != Kind::Scatter);
    let ya = axis_for(yr, p.log_y, 6, false);
    let xf = |c: &f64| xa.label(*c, &p.x_unit);
    let yf = |c: &f64| ya.label(*c, &p.y_unit);
    let mut c =
        chart(root, p, &xa, &ya, &xf, &yf, &xa.describe(&p.x_label, &p.x_unit), &ya.describe(&p.y_label, &p.y_unit))?;
    let (w, h) = c.plotting_area().dim_in_pixel();
    for (k, y) in p.ys.iter().enumerate() {
        let color = PALETTE[k % PALETTE.len()];
        // Every value is finite (checked); drawing coordinates, then thinned to the pixels.
        let pts: Vec<(f64, f64)> = p.x.iter().zip(y).map(|(&a, &b)| (xa.to_coord(a), ya.to_coord(b))).collect();
        let pts = if p.kind == Kind::Step { staircase(&pts) } else { pts };
        let (xr, yr) = ((xa.lo, xa.hi), (ya.lo, ya.hi));
        let ann = if p.kind == Kind::Scatter {
            let pts = thin::scatter(&pts, xr, yr, w, h);
            c.draw_series(pts.into_iter().map(|q| Circle::new(q, 3, color.filled()))).map_err(pe)?
        } else {
            c.draw_series(LineSeries::new(thin::polyline(&pts, xr, yr, w, h), color.stroke_width(2))).map_err(pe)?
        };
        if let Some(name) = p.names.get(k) {
            let a = ann.label(name.as_str());
            if p.kind == Kind::Scatter {
                a.legend(move |(x, y)| Circle::new((x + 10, y), 4, color.filled()));
            } else {
                a.legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], color.stroke_width(2)));
            }
        }
    }
    // Where the legend would hide the fewest points: the data in unit coordinates, with
    // points between samples so that a line through a corner counts.
    let mut occ = Vec::new();
    for y in &p.ys {
        let pts: Vec<(f64, f64)> =
            p.x.iter()
                .zip(y)
                .filter(|(a, b)| a.is_finite() && b.is_finite())
                .map(|(a, b)| (unit(&xa, xa.to_coord(*a)), unit(&ya, ya.to_coord(*b))))
                .collect();
        for w in pts.windows(2) {
            for k in 0..8 {
                let t = k as f64 / 8.0;
                occ.push((w[0].0 + t * (w[1].0 - w[0].0), w[0].1 + t * (w[1].1 - w[0].1)));
            }
        }
        occ.extend(pts.last());
    }
    legend(&mut c, p, &occ)
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

/// Histograms of one or more sample sets on common bins.
fn histogram(root: &Area, p: &Plot) -> Result<(), String> {
    let (lo, hi) = extent(p.ys.iter().flatten()).ok_or("plot: 'x' has no finite value")?;
    let all: Vec<f64> = p.ys.iter().flatten().copied().collect();
    let nb = p.bins.unwrap_or_else(|| auto_bins(&all)).max(1);
    let (lo, hi) = if hi > lo { (lo, hi) } else { (lo - 0.5 * lo.abs().max(1e-30), hi + 0.5 * hi.abs().max(1e-30)) };
    let w = (hi - lo) / nb as f64;
    let counts: Vec<Vec<usize>> =
        p.ys.iter()
            .map(|s| {
                let mut c = vec![0usize; nb];
                for &v in s.iter().filter(|v| v.is_finite()) {
                    let k = (((v - lo) / w).floor() as usize).min(nb - 1);
                    c[k] += 1;
                }
                c
            })
            .collect();
    let top = counts.iter().flatten().copied().max().unwrap_or(1).max(1) as f64;
    let xa = ticks::linear(lo, hi, 7, false, true);
    let mut ya = ticks::linear(0.0, top * 1.08, 6, true, false);
    if ya.ticks.len() > 1 && ya.ticks[1] - ya.ticks[0] < 1.0 {
        // Counts are whole numbers: one tick per count when there are few.
        ya.hi = ya.hi.ceil();
        ya.ticks = (0..=ya.hi as i64).map(|k| k as f64).collect();
        ya.minor.clear();
    }
    let xf = |c: &f64| xa.label(*c, &p.x_unit);
    let yf = |c: &f64| ya.label(*c, "");
    let y_desc = if p.y_label.is_empty() { "count".to_string() } else { p.y_label.clone() };
    let mut c = chart(root, p, &xa, &ya, &xf, &yf, &xa.describe(&p.x_label, &p.x_unit), &y_desc)?;
    let alpha = if p.ys.len() > 1 { 0.45 } else { 0.75 };
    for (k, cs) in counts.iter().enumerate() {
        let color = PALETTE[k % PALETTE.len()];
        let rects = cs.iter().enumerate().filter(|(_, n)| **n > 0).map(|(i, &n)| {
            let x0 = lo + w * i as f64;
            Rectangle::new([(x0, 0.0), (x0 + w, n as f64)], color.mix(alpha).filled())
        });
        let ann = c.draw_series(rects).map_err(pe)?;
        let stats = p.stats.then(|| {
            let s: crate::num::Series = p.ys[k].iter().copied().filter(|v| v.is_finite()).collect();
            (s.mean(), s.stdev())
        });
        let name = match (p.names.get(k), stats) {
            (Some(n), Some((m, sd))) => {
                Some(format!("{n}: μ {}, σ {}", fmt_stat(m, &p.x_unit), fmt_stat(sd, &p.x_unit)))
            }
            (None, Some((m, sd))) => Some(format!("μ {}, σ {}", fmt_stat(m, &p.x_unit), fmt_stat(sd, &p.x_unit))),
            (n, None) => n.cloned(),
        };
        if let Some(name) = name {
            ann.label(name)
                .legend(move |(x, y)| Rectangle::new([(x, y - 6), (x + 18, y + 6)], color.mix(alpha).filled()));
        }
        let outlines = cs.iter().enumerate().filter(|(_, n)| **n > 0).map(|(i, &n)| {
            let x0 = lo + w * i as f64;
            Rectangle::new([(x0, 0.0), (x0 + w, n as f64)], color.stroke_width(1))
        });
        c.draw_series(outlines).map_err(pe)?;
    }
    if p.stats {
        // The mean of each sample set as a vertical line in its colour.
        for (k, y) in p.ys.iter().enumerate() {
            let s: crate::num::Series = y.iter().copied().filter(|v| v.is_finite()).collect();
            let m = s.mean();
            let color = PALETTE[k % PALETTE.len()];
            c.draw_series(std::iter::once(PathElement::new(vec![(m, ya.lo), (m, ya.hi)], color.stroke_width(2))))
                .map_err(pe)?;
        }
    }
    let mut occ = Vec::new();
    for cs in &counts {
        for (i, &n) in cs.iter().enumerate() {
            let xc = unit(&xa, lo + w * (i as f64 + 0.5));
            for k in 0..=10 {
                occ.push((xc, unit(&ya, n as f64 * k as f64 / 10.0)));
            }
        }
    }
    legend(&mut c, p, &occ)
}

/// Horizontal bars, first label on top; a waterfall stacks them and ends with the total.
fn bars(root: &Area, p: &Plot) -> Result<(), String> {
    let vals = &p.ys[0];
    let mut labels: Vec<String> = p.labels.clone();
    // (start, end, colour) of each bar.
    let mut spans: Vec<(f64, f64, RGBColor)> = Vec::new();
    let mut cum = 0.0;
    for &v in vals {
        let start = if p.waterfall { cum } else { 0.0 };
        let color = if v >= 0.0 { PALETTE[0] } else { PALETTE[1] };
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
    // Room beside the bar ends for the value labels.
    let lo = if lo < 0.0 { lo - 0.18 * span } else { lo };
    let hi = if hi > 0.0 { hi + 0.18 * span } else { hi };
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
    let shown: Vec<String> = labels.iter().map(|l| fit(root, l, 300)).collect();
    let xf = |c: &f64| xa.label(*c, &p.y_unit);
    let yf = |c: &f64| {
        let k = c.round() as i64;
        if k < 0 || k >= n as i64 { String::new() } else { shown[n - 1 - k as usize].clone() }
    };
    let mut c = chart(root, p, &xa, &ya, &xf, &yf, &xa.describe(&p.y_label, &p.y_unit), &p.x_label)?;
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
            PathElement::new(vec![(x, row(k) - 0.32), (x, row(k + 1) + 0.32)], AXIS.stroke_width(1))
        }))
        .map_err(pe)?;
    }
    let font = (FAMILY, TICK).into_font().color(&INK);
    c.draw_series(spans.iter().enumerate().map(|(k, &(a, b, _))| {
        let v = b - a;
        let right = b >= a;
        let text = crate::report::format::value(v, &p.y_unit, 3);
        // Contributions of a waterfall carry their sign; the total does not.
        let text = if p.waterfall && k < vals.len() && v >= 0.0 { format!("+{text}") } else { text };
        let pos = Pos::new(if right { HPos::Left } else { HPos::Right }, VPos::Center);
        EmptyElement::at((b, row(k))) + Text::new(text, (if right { 6 } else { -6 }, 0), font.clone().pos(pos))
    }))
    .map_err(pe)?;
    Ok(())
}

/// A mean or standard deviation for a legend: 3 digits with the unit.
fn fmt_stat(x: f64, unit: &str) -> String {
    if x.is_finite() { crate::report::format::value(x, unit, 3) } else { "n/a".into() }
}

/// `t`, cut with an ellipsis to at most `max` pixels wide.
fn fit(root: &Area, t: &str, max: u32) -> String {
    if text_w(root, t, TICK) <= max {
        return t.to_string();
    }
    let mut s: Vec<char> = t.chars().collect();
    while !s.is_empty() && text_w(root, &format!("{}…", s.iter().collect::<String>()), TICK) > max {
        s.pop();
    }
    format!("{}…", s.iter().collect::<String>())
}
