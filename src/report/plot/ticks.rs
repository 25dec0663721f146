//! Axis ranges, tick positions and tick labels: "nice" steps of 1, 2, 2.5 or 5 × 10^k on
//! linear axes, decades (with 2 and 5 between them on short ranges) on log axes.
//!
//! Labels follow one rule on both kinds of axis: the unit is written once, in the axis
//! description, and each label carries only an SI prefix (none for units never prefixed,
//! such as `%` or `dB`), with trailing zeros dropped. A linear axis uses one prefix for all
//! its ticks and exactly as many decimals as its step needs, so labels are always distinct;
//! when that would take more than [`MAX_DIGITS`] significant digits (a narrow range far from
//! zero, as around a trimmed period), the ticks are labelled relative to an offset that the
//! axis description states. A log axis gives each decade its own prefix.
use crate::num::{math, si};
use crate::report::format;

/// Most significant digits a linear tick label may need before the axis switches to an offset.
pub const MAX_DIGITS: i32 = 5;

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
    /// Step between linear ticks (0 on log axes and on category axes).
    pub step: f64,
    /// Linear ticks are labelled as value − offset (0: no offset).
    pub offset: f64,
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
    let mut axis = Axis { lo, hi, ticks, minor, log: false, step, offset: 0.0 };
    axis.offset = offset_for(&axis);
    axis
}

/// Position of the last significant digit of a nice step: −7 for 2e-7, −8 for 2.5e-7.
fn last_digit(step: f64) -> i32 {
    let mut e = math::log10(step.abs()).floor() as i32;
    let mut m = step.abs() / math::pow(10f64, e as f64);
    if m >= 9.5 {
        e += 1;
        m /= 10.0;
    }
    if (m - 2.5).abs() < 1e-6 { e - 1 } else { e }
}

/// Significant digits a label of `top` needs when its last digit sits at 10^last.
fn digits_needed(top: f64, last: i32) -> i32 {
    if top == 0.0 { 1 } else { math::log10(top.abs()).floor() as i32 - last + 1 }
}

/// The offset a linear axis is labelled from: 0 when every tick fits in [`MAX_DIGITS`]
/// significant digits, else the multiple of 10^q nearest the middle of the range, where
/// 10^q is the first power of ten above the range, so labels stay within ±10^q.
fn offset_for(a: &Axis) -> f64 {
    if a.step <= 0.0 || a.ticks.is_empty() {
        return 0.0;
    }
    let top = a.ticks.iter().fold(0.0f64, |m, t| m.max(t.abs()));
    if digits_needed(top, last_digit(a.step)) <= MAX_DIGITS {
        return 0.0;
    }
    let q = math::pow(10f64, math::log10(a.hi - a.lo).floor() + 1.0);
    ((a.lo + a.hi) / 2.0 / q).round() * q
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
    Axis { lo, hi, ticks, minor, log: true, step: 0.0, offset: 0.0 }
}

impl Axis {
    /// A data value in drawing coordinates.
    pub fn to_coord(&self, v: f64) -> f64 {
        if self.log { math::log10(v) } else { v }
    }

    /// The label of a tick at drawing coordinate `c`: `2.5µ`, `100k`, `-40` (relative to
    /// the offset, if the axis has one).
    pub fn label(&self, c: f64, unit: &str) -> String {
        if self.log {
            return log_label(math::pow(10f64, c), unit);
        }
        if self.step <= 0.0 {
            return format::trim_zeros(&format::bare(c, unit, 4));
        }
        let rel = |t: f64| {
            let w = t - self.offset;
            // k × step − offset can miss zero by rounding.
            if w.abs() < 1e-6 * self.step { 0.0 } else { w }
        };
        let last = last_digit(self.step);
        let top = self.ticks.iter().fold(0.0f64, |m, t| m.max(rel(*t).abs()));
        let w = rel(c);
        if w == 0.0 {
            return "0".into();
        }
        if unit.ends_with(['²', '³']) {
            // Prefixes of a powered unit go on its length (`µm²`); the label keeps the unit.
            let d = digits_needed(w, last).clamp(1, 17) as usize;
            return format::trim_zeros(&format::bare(w, unit, d));
        }
        let p3 = if format::plain_unit(unit) || top == 0.0 {
            0
        } else {
            (math::log10(top).floor() as i32).div_euclid(3).clamp(-10, 10) * 3
        };
        let prefix = si::prefix_symbol(p3).unwrap_or("");
        let decimals = (p3 - last).max(0) as usize;
        format::trim_zeros(&format!("{:.decimals$}{prefix}", w / math::pow(10f64, p3 as f64)))
    }

    /// This axis with its ends moved to `lo` and `hi` (drawing coordinates), keeping the ticks
    /// and grid lines between them: axis limits, and log axes that end where the data end.
    pub fn limited(mut self, lo: f64, hi: f64) -> Axis {
        let eps = 1e-9 * (hi - lo).abs();
        self.lo = lo;
        self.hi = hi;
        self.ticks.retain(|t| *t >= lo - eps && *t <= hi + eps);
        self.minor.retain(|t| *t >= lo - eps && *t <= hi + eps);
        self
    }

    /// Labels of all ticks, in order.
    pub fn labels(&self, unit: &str) -> Vec<String> {
        self.ticks.iter().map(|t| self.label(*t, unit)).collect()
    }

    /// The axis description with its unit and offset: `period (s)`, `period − 30.5 µs (s)`.
    pub fn describe(&self, label: &str, unit: &str) -> String {
        let label = if self.offset != 0.0 {
            let q = math::pow(10f64, math::log10(self.hi - self.lo).floor() + 1.0);
            let d = digits_needed(self.offset, math::log10(q).round() as i32).clamp(1, 17) as usize;
            let off = format::trim_zeros(&format::value(self.offset.abs(), unit, d));
            let sign = if self.offset < 0.0 { "+" } else { "−" };
            if label.is_empty() { format!("value {sign} {off}") } else { format!("{label} {sign} {off}") }
        } else {
            label.to_string()
        };
        match (label.is_empty(), unit.is_empty()) {
            (_, true) => label,
            (true, false) => format!("({unit})"),
            (false, false) => format!("{label} ({unit})"),
        }
    }
}

/// A log-axis label: the decade's own SI prefix, or plain decimals for unprefixed units.
fn log_label(v: f64, unit: &str) -> String {
    // 10^c is exact only up to rounding; ticks are 1, 2 or 5 × 10^k.
    let v: f64 = format!("{v:.2e}").parse().unwrap_or(v);
    if format::plain_unit(unit) {
        if (1e-4..1e6).contains(&v) { format!("{v}") } else { format!("{v:e}") }
    } else {
        format::trim_zeros(&format::bare(v, unit, 3))
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
    fn narrow_ranges_get_distinct_labels() {
        // A trimmed 32.768 kHz clock: 32.760k … 32.770k, step 2 → five digits, no offset.
        let a = linear(32760.0, 32770.0, 6, false, false);
        assert_eq!(a.offset, 0.0);
        assert_eq!(a.labels("Hz"), ["32.76k", "32.762k", "32.764k", "32.766k", "32.768k", "32.77k"]);
        // 30.5 µs ± 0.4 ns would need seven digits: labelled from an offset of 30.5 µs.
        let b = linear(30.5e-6 - 0.4e-9, 30.5e-6 + 0.4e-9, 6, false, false);
        assert!(b.offset != 0.0);
        let l = b.labels("s");
        let mut d = l.clone();
        d.dedup();
        assert_eq!(d.len(), l.len(), "{l:?}");
        assert_eq!(b.describe("period", "s"), "period − 30.5 µs (s)");
        assert_eq!(l, ["-400p", "-300p", "-200p", "-100p", "0", "100p", "200p", "300p", "400p"]);
    }
    #[test]
    fn one_prefix_per_linear_axis() {
        let a = linear(0.0, 2e-6, 5, false, false);
        assert_eq!(a.labels("s"), ["0", "0.5µ", "1µ", "1.5µ", "2µ"]);
        // The same value reads the same on a log axis.
        let l = log(1e-7, 1e-5);
        assert!(l.labels("s").contains(&"1µ".to_string()));
        // Units never prefixed: plain decimals on both kinds of axis.
        assert_eq!(linear(0.0, 100.0, 5, false, false).labels("%"), ["0", "20", "40", "60", "80", "100"]);
        assert_eq!(log(0.1, 100.0).labels("%"), ["0.1", "1", "10", "100"]);
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
