//! Thinning of dense data to what a figure can show, so that a plot of any length stays a
//! small file that every SVG viewer renders. A line through many points per column of the
//! plot keeps, for each column, its first, lowest, highest and last point in their order
//! (so peaks, troughs and the shape of every edge survive); scattered points keep one
//! point per cell. Columns and cells are half a pixel wide, finer than the eye resolves.
use std::collections::HashSet;

/// Columns or cells per pixel.
pub const PER_PIXEL: f64 = 2.0;

/// A polyline in drawing coordinates over the x range `x` (drawn `width` pixels wide),
/// reduced to at most four points per column when x never decreases; a line that turns
/// back in x keeps a point only where it enters a new cell of `height` rows.
pub fn polyline(pts: &[(f64, f64)], x: (f64, f64), y: (f64, f64), width: u32, height: u32) -> Vec<(f64, f64)> {
    let cols = (width as f64 * PER_PIXEL).max(1.0);
    if pts.len() as f64 <= 4.0 * cols {
        return pts.to_vec();
    }
    let col = |v: f64| ((v - x.0) / (x.1 - x.0) * cols).floor() as i64;
    if !pts.windows(2).all(|w| w[1].0 >= w[0].0) {
        return by_cell(pts, x, y, width, height, false);
    }
    let mut out = Vec::with_capacity(4 * cols as usize + 4);
    let mut i = 0;
    while i < pts.len() {
        let c = col(pts[i].0);
        let (mut lo, mut hi, mut j) = (i, i, i);
        while j < pts.len() && col(pts[j].0) == c {
            if pts[j].1 < pts[lo].1 {
                lo = j;
            }
            if pts[j].1 > pts[hi].1 {
                hi = j;
            }
            j += 1;
        }
        let mut keep = [i, lo, hi, j - 1];
        keep.sort_unstable();
        for (n, &k) in keep.iter().enumerate() {
            if n == 0 || k != keep[n - 1] {
                out.push(pts[k]);
            }
        }
        i = j;
    }
    out
}

/// Scattered points in drawing coordinates, one kept per cell (the first in order).
pub fn scatter(pts: &[(f64, f64)], x: (f64, f64), y: (f64, f64), width: u32, height: u32) -> Vec<(f64, f64)> {
    by_cell(pts, x, y, width, height, true)
}

/// Points kept where they enter a cell: anywhere new (`once`), or different from the last
/// kept point's cell (a line, which may cross a cell again later). Ends are always kept.
fn by_cell(pts: &[(f64, f64)], x: (f64, f64), y: (f64, f64), width: u32, height: u32, once: bool) -> Vec<(f64, f64)> {
    let (cols, rows) = (width as f64 * PER_PIXEL, height as f64 * PER_PIXEL);
    let cell = |p: &(f64, f64)| {
        (((p.0 - x.0) / (x.1 - x.0) * cols).floor() as i64, ((p.1 - y.0) / (y.1 - y.0) * rows).floor() as i64)
    };
    let mut seen = HashSet::new();
    let mut last = None;
    let mut out = Vec::new();
    for (k, p) in pts.iter().enumerate() {
        let c = cell(p);
        let new = if once { seen.insert(c) } else { last != Some(c) };
        if new || (!once && k + 1 == pts.len()) {
            out.push(*p);
            last = Some(c);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn columns_keep_extremes_in_order() {
        // 1000 points of a sawtooth over 10 columns (5 pixels): each column keeps its first,
        // lowest, highest and last point.
        let pts: Vec<(f64, f64)> = (0..1000).map(|k| (k as f64 / 1000.0, ((k % 7) as f64))).collect();
        let t = polyline(&pts, (0.0, 1.0), (0.0, 6.0), 5, 5);
        assert!(t.len() <= 40, "{}", t.len());
        assert_eq!(t.first(), pts.first());
        assert_eq!(t.last(), pts.last());
        assert!(t.iter().any(|p| p.1 == 6.0) && t.iter().any(|p| p.1 == 0.0));
        assert!(t.windows(2).all(|w| w[1].0 >= w[0].0));
    }
    #[test]
    fn few_points_are_untouched() {
        let pts = vec![(0.0, 1.0), (1.0, 0.0), (0.5, 0.5)];
        assert_eq!(polyline(&pts, (0.0, 1.0), (0.0, 1.0), 100, 100), pts);
    }
}
