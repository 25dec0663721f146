//! Axis ranges and tick positions: "nice" steps of 1, 2, 2.5 or 5 × 10^k on linear axes,
//! decades (with 2 and 5 between them on short ranges) on log axes, and SI-prefixed labels.
use crate::num::math;
use crate::report::format;

/// One axis in drawing coordinates: log axes are laid out in log10 of the value.
#[derive(Clone, Debug, PartialEq)]
pub struct Axis {
    pub lo: f64,
    pub hi: f64,
    /// Labelled ticks (with grid lines), in drawing coordinates.
    pub ticks: Vec<f64>,
    /// Unlabelled minor grid lines, in drawing coordinates.
    pub minor: Vec<f64>,
    pub log: bool,
}

/// Step of 1, 2, 2.5 or 5 × 10^k nearest to `raw` on a log scale (common practice for
/// axis ticks).
pub fn nice_step(raw: f64) -> f64 {
    let e = math::log10(raw).floor();
    let base = math::pow(10f64, e);
    let f = raw / base;
    let m = [1.0, 2.0, 2.5, 5.0, 10.0]
        .into_iter()
        .min_by(|a: &f64, b: &f64| math::ln(a / f).abs().total_cmp(&math::ln(b / f).abs()))
        .unwrap_or(1.0);
    m * base
}

/// A linear axis over data in [a, b], widened to whole ticks, with about `target` ticks.
/// `from_zero` makes the axis include 0 (bars, histograms). `exact` keeps the data ends
/// as the axis ends (the x axis of a sweep).
pub fn linear(a: f64, b: f64, target: usize, from_zero: bool, exact: bool) -> Axis {
    let (mut a, mut b) = (a.min(b), a.max(b));
    if from_zero {
        a = a.min(0.0);
        b = b.max(0.0);
    }
    if b - a <= f64::EPSILON * a.abs().max(b.abs()) {
        // One value: a window of ±10 % around it (±1 around zero).
        let w = if a == 0.0 { 1.0 } else { 0.1 * a.abs() };
        a -= w;
        b += w;
    }
    let step = nice_step((b - a) / target.max(2) as f64);
    let (lo, hi) = if exact { (a, b) } else { ((a / step).floor() * step, (b / step).ceil() * step) };
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    let mut ticks = Vec::new();
    for k in first..=last {
        let t = k as f64 * step;
        // k * step, not repeated addition, so 0 is exactly 0.
        ticks.push(if k == 0 { 0.0 } else { t });
    }
    // One unlabelled grid line halfway between ticks.
    let minor_step = step / 2.0;
    let mut minor = Vec::new();
    let mf = (lo / minor_step - 1e-9).ceil() as i64;
    let ml = (hi / minor_step + 1e-9).floor() as i64;
    for k in mf..=ml {
        minor.push(k as f64 * minor_step);
    }
    Axis { lo, hi, ticks, minor, log: false }
}

/// A log axis over positive data in [a, b]; ends snapped down/up to 1, 2 or 5 × 10^k.
pub fn log(a: f64, b: f64) -> Axis {
    let (a, b) = (a.min(b), a.max(b));
    let (la, lb) = (math::log10(a), math::log10(b));
    let snap_down = |l: f64| {
        let d = l.floor();
        let m = math::pow(10f64, l - d);
        d + if m >= 5.0 - 1e-9 {
            math::log10(5f64)
        } else if m >= 2.0 - 1e-9 {
            math::log10(2f64)
        } else {
            0.0
        }
    };
    let snap_up = |l: f64| {
        let d = l.floor();
        let m = math::pow(10f64, l - d);
        if m <= 1.0 + 1e-9 {
            d
        } else if m <= 2.0 + 1e-9 {
            d + math::log10(2f64)
        } else if m <= 5.0 + 1e-9 {
            d + math::log10(5f64)
        } else {
            d + 1.0
        }
    };
    let mut lo = snap_down(la);
    let mut hi = snap_up(lb);
    if hi - lo < 1e-9 {
        lo -= 1.0;
        hi += 1.0;
    }
    let decades = hi - lo;
    let every = (decades / 8.0).ceil().max(1.0) as i64;
    let mut ticks = Vec::new();
    let mut minor = Vec::new();
    for d in (lo.floor() as i64)..=(hi.ceil() as i64) {
        let dd = d as f64;
        if d % every == 0 && dd >= lo - 1e-9 && dd <= hi + 1e-9 {
            ticks.push(dd);
        }
        for m in 2..=9 {
            let t = dd + math::log10(m as f64);
            if t >= lo - 1e-9 && t <= hi + 1e-9 {
                if decades <= 2.0 && (m == 2 || m == 5) {
                    ticks.push(t);
                } else if every == 1 {
                    minor.push(t);
                }
            }
        }
    }
    ticks.sort_by(f64::total_cmp);
    Axis { lo, hi, ticks, minor, log: true }
}

impl Axis {
    /// A data value in drawing coordinates.
    pub fn to_coord(&self, v: f64) -> f64 {
        if self.log { math::log10(v) } else { v }
    }
    /// The label of a tick at drawing coordinate `c`: `2.5µ`, `100k`, `-40`.
    pub fn label(&self, c: f64, unit: &str) -> String {
        let v = if self.log { math::pow(10f64, c) } else { c };
        // Ticks near zero on a linear axis are zero (rounding of k × step).
        let span = (self.hi - self.lo).abs();
        let v = if !self.log && v.abs() < 1e-9 * span { 0.0 } else { v };
        format::trim_zeros(&format::bare(v, unit, 4))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn nice_steps() {
        assert_eq!(nice_step(0.13), 0.1);
        assert_eq!(nice_step(2.2e-7), 2e-7);
        assert_eq!(nice_step(4.0), 5.0);
        assert_eq!(nice_step(8.0), 10.0);
    }
    #[test]
    fn linear_ticks_cover_the_data() {
        let a = linear(0.93, 4.1, 6, false, false);
        assert_eq!((a.lo, a.hi), (0.5, 4.5));
        assert_eq!(a.ticks, vec![0.5, 1.0, 1.5, 2.0, 2.5, 3.0, 3.5, 4.0, 4.5]);
        let z = linear(-40.0, 125.0, 6, false, false);
        assert!(z.ticks.contains(&0.0));
        assert_eq!(z.label(0.0, "°C"), "0");
    }
    #[test]
    fn log_ticks_on_decades() {
        let a = log(1e-12, 1e-9);
        assert_eq!(a.ticks.len(), 4);
        assert_eq!(a.label(a.ticks[0], "F"), "1p");
        assert_eq!(a.label(a.ticks[3], "F"), "1n");
        let b = log(2.2e-12, 30e-12);
        assert_eq!(b.label(b.lo, "F"), "2p");
        assert_eq!(b.label(b.hi, "F"), "50p");
        let labels: Vec<String> = b.ticks.iter().map(|t| b.label(*t, "F")).collect();
        assert_eq!(labels, ["2p", "5p", "10p", "20p", "50p"]);
    }
}
