//! Plots: a plain description (kind, data, labels, axes) checked before drawing, and its
//! rendering to SVG with plotters.
use crate::num::math;
pub mod font;
pub mod svg;
pub mod ticks;

/// The kinds of chart.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Kind {
    Line,
    Scatter,
    /// A staircase: each value holds until the next x.
    Step,
    /// Counts of samples in equal-width bins.
    Histogram,
    /// Horizontal bars, one per label; with `waterfall`, each starts where the last ended.
    Bar,
}

impl Kind {
    pub const NAMES: &'static str = "line, scatter, step, histogram, bar";
    pub fn parse(s: &str) -> Result<Kind, String> {
        Ok(match s {
            "line" => Kind::Line,
            "scatter" => Kind::Scatter,
            "step" => Kind::Step,
            "histogram" => Kind::Histogram,
            "bar" => Kind::Bar,
            _ => return Err(format!("plot kind '{s}' is unknown; kinds are {}", Kind::NAMES)),
        })
    }
}

/// A plot as the script described it, in SI units.
#[derive(Clone, Debug, PartialEq)]
pub struct Plot {
    pub title: String,
    pub kind: Kind,
    /// Shared x values (line, scatter, step); empty for histogram and bar.
    pub x: Vec<f64>,
    /// One vector per series: y values (line, scatter, step), samples (histogram), bar values.
    pub ys: Vec<Vec<f64>>,
    /// Legend entries, one per series (may be empty: no legend).
    pub names: Vec<String>,
    /// Bar labels, one per value.
    pub labels: Vec<String>,
    pub x_label: String,
    pub y_label: String,
    pub x_unit: String,
    pub y_unit: String,
    pub log_x: bool,
    pub log_y: bool,
    /// Histogram bins (None: Freedman–Diaconis).
    pub bins: Option<usize>,
    /// Bar: stack the bars end to end and add a total bar.
    pub waterfall: bool,
    pub total_label: String,
    /// Histogram: mark each sample set's mean and give mean and standard deviation in the legend.
    pub stats: bool,
}

impl Plot {
    pub fn new(kind: Kind) -> Plot {
        Plot {
            title: String::new(),
            kind,
            x: vec![],
            ys: vec![],
            names: vec![],
            labels: vec![],
            x_label: String::new(),
            y_label: String::new(),
            x_unit: String::new(),
            y_unit: String::new(),
            log_x: false,
            log_y: false,
            bins: None,
            waterfall: false,
            total_label: "total".into(),
            stats: false,
        }
    }

    /// Check the description; errors name the key at fault.
    pub fn check(&self) -> Result<(), String> {
        if self.ys.is_empty() || self.ys.iter().all(|y| y.is_empty()) {
            return Err(match self.kind {
                Kind::Histogram => "plot: key 'x' (the samples) is missing or empty".into(),
                _ => "plot: key 'y' is missing or empty".into(),
            });
        }
        if !self.names.is_empty() && self.names.len() != self.ys.len() {
            return Err(format!("plot: 'names' has {} entries for {} series", self.names.len(), self.ys.len()));
        }
        let series =
            |k: usize| self.names.get(k).map(|n| format!("series '{n}'")).unwrap_or(format!("series {}", k + 1));
        match self.kind {
            Kind::Line | Kind::Scatter | Kind::Step => {
                if self.x.is_empty() {
                    return Err("plot: key 'x' is missing or empty".into());
                }
                for (k, y) in self.ys.iter().enumerate() {
                    if y.len() != self.x.len() {
                        return Err(format!(
                            "plot: 'x' has {} values but {} of 'y' has {}",
                            self.x.len(),
                            series(k),
                            y.len()
                        ));
                    }
                }
                if self.log_x
                    && let Some(v) = self.x.iter().find(|v| v.is_finite() && **v <= 0.0)
                {
                    return Err(format!("plot: log_x needs x > 0, but 'x' holds {v}"));
                }
                if !self.x.iter().any(|v| v.is_finite()) {
                    return Err("plot: 'x' has no finite value".into());
                }
            }
            Kind::Histogram => {
                if self.log_x || self.log_y {
                    return Err("plot: a histogram has linear axes; remove log_x/log_y".into());
                }
                if let Some(b) = self.bins
                    && !(1..=1000).contains(&b)
                {
                    return Err(format!("plot: bins must be in 1..=1000, got {b}"));
                }
            }
            Kind::Bar => {
                if self.ys.len() != 1 {
                    return Err("plot: a bar chart takes one series in 'y'".into());
                }
                if self.labels.len() != self.ys[0].len() {
                    return Err(format!(
                        "plot: 'labels' has {} entries for {} bars in 'y'",
                        self.labels.len(),
                        self.ys[0].len()
                    ));
                }
                if self.log_x || self.log_y {
                    return Err("plot: a bar chart has a linear value axis; remove log_x/log_y".into());
                }
                if let Some(v) = self.ys[0].iter().find(|v| !v.is_finite()) {
                    return Err(format!("plot: bar values must be finite, found {v}"));
                }
            }
        }
        for (k, y) in self.ys.iter().enumerate() {
            let what = if self.kind == Kind::Histogram { "'x'" } else { "'y'" };
            if !y.iter().any(|v| v.is_finite()) {
                return Err(format!("plot: {} of {what} has no finite value", series(k)));
            }
            if self.log_y
                && let Some(v) = y.iter().find(|v| v.is_finite() && **v <= 0.0)
            {
                return Err(format!("plot: log_y needs y > 0, but {} holds {v}", series(k)));
            }
        }
        Ok(())
    }
}

/// File-name part from a title: lower-case ASCII letters and digits, other runs as '-',
/// at most 40 characters; "plot" when nothing is left.
pub fn slug(title: &str) -> String {
    let mut s = String::new();
    for c in title.chars() {
        if c.is_ascii_alphanumeric() {
            s.push(c.to_ascii_lowercase());
        } else if !s.ends_with('-') && !s.is_empty() {
            s.push('-');
        }
    }
    let mut s: String = s.chars().take(40).collect();
    while s.ends_with('-') {
        s.pop();
    }
    if s.is_empty() { "plot".into() } else { s }
}

/// Histogram bin count by the Freedman–Diaconis rule, width 2·IQR·n^(−1/3) (Freedman and
/// Diaconis 1981); Sturges' rule ⌈log2 n⌉ + 1 when the IQR is zero; clamped to 1..=200.
pub fn auto_bins(samples: &[f64]) -> usize {
    let mut v: Vec<f64> = samples.iter().copied().filter(|x| x.is_finite()).collect();
    let n = v.len();
    if n < 2 {
        return 1;
    }
    v.sort_by(f64::total_cmp);
    let q = |p: f64| {
        let h = (n - 1) as f64 * p;
        let (lo, hi) = (h.floor() as usize, h.ceil() as usize);
        v[lo] + (h - lo as f64) * (v[hi] - v[lo])
    };
    let iqr = q(0.75) - q(0.25);
    let range = v[n - 1] - v[0];
    let sturges = (math::log2(n as f64).ceil() as usize + 1).clamp(1, 200);
    if iqr <= 0.0 || range <= 0.0 {
        return sturges;
    }
    let width = 2.0 * iqr * math::pow(n as f64, -1.0 / 3.0);
    ((range / width).ceil() as usize).clamp(1, 200)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn slugs() {
        assert_eq!(slug("Period vs. C (pF)"), "period-vs-c-pf");
        assert_eq!(slug("  ---"), "plot");
        assert_eq!(slug("Δf/f über −40…125 °C"), "f-f-ber-40-125-c");
    }
    #[test]
    fn bins() {
        // n = 8 samples 1..8: IQR (numpy linear) = 6.25 − 2.75 = 3.5, width = 2·3.5/2 = 3.5,
        // range 7 → 2 bins (Freedman–Diaconis 1981, computed by hand).
        assert_eq!(auto_bins(&[1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0]), 2);
        // All equal: Sturges, ⌈log2 4⌉ + 1 = 3.
        assert_eq!(auto_bins(&[1.0; 4]), 3);
    }
    #[test]
    fn checks_name_keys() {
        let mut p = Plot::new(Kind::Line);
        p.x = vec![1.0, 2.0];
        p.ys = vec![vec![1.0]];
        assert!(p.check().unwrap_err().contains("'x' has 2 values"));
        p.ys = vec![vec![1.0, -1.0]];
        p.log_y = true;
        assert!(p.check().unwrap_err().contains("log_y"));
    }
}
