//! Clipping of drawn data to the plot frame, for axis limits narrower than the data: a line
//! is cut where it leaves the frame (Liang and Barsky 1984) and resumes where it re-enters.

/// A rectangle in drawing coordinates: (x0, x1, y0, y1), x0 < x1, y0 < y1.
pub type Frame = (f64, f64, f64, f64);

/// The part of segment a–b inside the frame (Liang–Barsky parametric clipping), or None.
pub fn segment(a: (f64, f64), b: (f64, f64), f: Frame) -> Option<((f64, f64), (f64, f64))> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for (p, q) in [(-dx, a.0 - f.0), (dx, f.1 - a.0), (-dy, a.1 - f.2), (dy, f.3 - a.1)] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let r = q / p;
            if p < 0.0 {
                t0 = t0.max(r);
            } else {
                t1 = t1.min(r);
            }
        }
    }
    if t0 > t1 {
        return None;
    }
    let at = |t: f64| (a.0 + t * dx, a.1 + t * dy);
    Some((if t0 > 0.0 { at(t0) } else { a }, if t1 < 1.0 { at(t1) } else { b }))
}

/// A polyline cut into the runs that lie inside the frame.
pub fn polyline(pts: &[(f64, f64)], f: Frame) -> Vec<Vec<(f64, f64)>> {
    let inside = |p: &(f64, f64)| p.0 >= f.0 && p.0 <= f.1 && p.1 >= f.2 && p.1 <= f.3;
    if pts.iter().all(inside) {
        return vec![pts.to_vec()];
    }
    let mut runs: Vec<Vec<(f64, f64)>> = vec![];
    let mut cur: Vec<(f64, f64)> = vec![];
    if pts.len() == 1 && inside(&pts[0]) {
        return vec![pts.to_vec()];
    }
    for w in pts.windows(2) {
        match segment(w[0], w[1], f) {
            Some((a, b)) => {
                if cur.last() != Some(&a) {
                    if cur.len() > 1 {
                        runs.push(std::mem::take(&mut cur));
                    }
                    cur = vec![a];
                }
                cur.push(b);
                if b != w[1] {
                    runs.push(std::mem::take(&mut cur));
                }
            }
            None => {
                if cur.len() > 1 {
                    runs.push(std::mem::take(&mut cur));
                }
                cur.clear();
            }
        }
    }
    if cur.len() > 1 {
        runs.push(cur);
    }
    runs
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn cuts_where_the_line_leaves_and_reenters() {
        // A peak through the top of the unit square: 0,0 → 1,2 → 2,0 leaves at y = 1.
        let runs = polyline(&[(0.0, 0.0), (1.0, 2.0), (2.0, 0.0)], (0.0, 2.0, 0.0, 1.0));
        assert_eq!(runs, vec![vec![(0.0, 0.0), (0.5, 1.0)], vec![(1.5, 1.0), (2.0, 0.0)]]);
        assert_eq!(segment((-1.0, 5.0), (3.0, 5.0), (0.0, 1.0, 0.0, 1.0)), None);
    }
}
