//! Plots: a plain description (kind, data, labels, axes) checked before drawing, and its
//! rendering to SVG with plotters.
use crate::num::math;
pub mod clip;
pub mod font;
pub mod svg;
pub mod thin;
pub mod ticks;

/// A labelled straight line across the plot at one value: a threshold, a spec limit.
#[derive(Clone, Debug, PartialEq)]
pub struct RefLine {
    pub at: f64,
    pub label: String,
}

/// A shaded band of y values, such as a spec window; an open end reaches the frame.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Band {
    pub min: Option<f64>,
    pub max: Option<f64>,
    /// Legend entry (may be empty).
    pub label: String,
}

/// A marked event: where it happened (x, and y when known: a point on the curve, else a mark
/// on the top edge) and its kind; each kind gets a marker shape and a legend entry.
#[derive(Clone, Debug, PartialEq)]
pub struct Event {
    pub x: f64,
    pub y: Option<f64>,
    pub kind: String,
}

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
    /// The script-level name.
    pub fn name(self) -> &'static str {
        match self {
            Kind::Line => "line",
            Kind::Scatter => "scatter",
            Kind::Step => "step",
            Kind::Histogram => "histogram",
            Kind::Bar => "bar",
        }
    }
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
    /// Histogram: mark each sample set's mean and ±σ and give them in the legend.
    pub stats: bool,
    /// Reference lines at x values (vertical) and y values (horizontal).
    pub x_lines: Vec<RefLine>,
    pub y_lines: Vec<RefLine>,
    /// Shaded bands of y values (line, scatter, step).
    pub bands: Vec<Band>,
    /// Event markers (line, scatter, step).
    pub events: Vec<Event>,
    /// Axis limits (None: from the data); data outside are clipped at the frame.
    pub x_min: Option<f64>,
    pub x_max: Option<f64>,
    pub y_min: Option<f64>,
    pub y_max: Option<f64>,
    /// Series on a secondary y axis at the right (line, scatter, step); `names` lists `ys`
    /// first, then these.
    pub y2: Vec<Vec<f64>>,
    pub y2_label: String,
    pub y2_unit: String,
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
            x_lines: vec![],
            y_lines: vec![],
            bands: vec![],
            events: vec![],
            x_min: None,
            x_max: None,
            y_min: None,
            y_max: None,
            y2: vec![],
            y2_label: String::new(),
            y2_unit: String::new(),
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
        let n_series = self.ys.len() + self.y2.len();
        if !self.names.is_empty() && self.names.len() != n_series {
            return Err(format!("plot: 'names' has {} entries for {n_series} series", self.names.len()));
        }
        self.check_marks()?;
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
        // Refused like NaN in `show` and `table`: a point that cannot be placed is an error,
        // never a silent gap.
        if let Some((k, v)) = self.x.iter().enumerate().find(|(_, v)| !v.is_finite()) {
            return Err(format!("plot: element {k} of 'x' is {}; {NOT_FINITE}", not_finite(*v)));
        }
        for (k, y) in self.ys.iter().enumerate() {
            let what = if self.kind == Kind::Histogram { "'x'" } else { "'y'" };
            if let Some((i, v)) = y.iter().enumerate().find(|(_, v)| !v.is_finite()) {
                let which = if self.ys.len() > 1 { format!("{} of {what}", series(k)) } else { what.to_string() };
                return Err(format!("plot: element {i} of {which} is {}; {NOT_FINITE}", not_finite(*v)));
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

impl Plot {
    /// Reference lines, bands, events, limits and the secondary axis.
    fn check_marks(&self) -> Result<(), String> {
        let xy = matches!(self.kind, Kind::Line | Kind::Scatter | Kind::Step);
        let only_xy = |key: &str, used: bool| {
            if used && !xy {
                Err(format!("plot: '{key}' is for line, scatter and step plots, not {}", self.kind.name()))
            } else {
                Ok(())
            }
        };
        only_xy("band", !self.bands.is_empty())?;
        only_xy("events", !self.events.is_empty())?;
        only_xy("y2", !self.y2.is_empty())?;
        let lines = !self.x_lines.is_empty() || !self.y_lines.is_empty();
        if lines && self.kind == Kind::Bar {
            return Err("plot: 'x_lines' and 'y_lines' are for line, scatter, step and histogram plots".into());
        }
        let limits = [self.x_min, self.x_max, self.y_min, self.y_max].iter().any(Option::is_some);
        only_xy("x_min, x_max, y_min and y_max", limits)?;
        let positive = |key: &str, log: bool, v: f64| {
            if !v.is_finite() {
                Err(format!("plot: '{key}' holds {v}; it must be a finite number"))
            } else if log && v <= 0.0 {
                Err(format!("plot: '{key}' holds {v}, but a log axis needs values > 0"))
            } else {
                Ok(())
            }
        };
        for l in &self.x_lines {
            positive("x_lines", self.log_x, l.at)?;
        }
        for l in &self.y_lines {
            positive("y_lines", self.log_y, l.at)?;
        }
        for b in &self.bands {
            for v in [b.min, b.max].into_iter().flatten() {
                positive("band", self.log_y, v)?;
            }
            match (b.min, b.max) {
                (None, None) => return Err("plot: a 'band' needs min, max or both".into()),
                (Some(a), Some(c)) if a >= c => {
                    return Err(format!("plot: 'band' min {a} is not below its max {c}"));
                }
                _ => {}
            }
        }
        for (k, e) in self.events.iter().enumerate() {
            if !e.x.is_finite() || e.y.is_some_and(|y| !y.is_finite()) {
                return Err(format!("plot: event {k} is not at a finite place"));
            }
        }
        for (axis, lo, hi, log) in
            [("x", self.x_min, self.x_max, self.log_x), ("y", self.y_min, self.y_max, self.log_y)]
        {
            for v in [lo, hi].into_iter().flatten() {
                positive(&format!("{axis}_min/{axis}_max"), log, v)?;
            }
            if let (Some(a), Some(b)) = (lo, hi)
                && a >= b
            {
                return Err(format!("plot: {axis}_min {a} is not below {axis}_max {b}"));
            }
        }
        for (k, y) in self.y2.iter().enumerate() {
            if y.len() != self.x.len() {
                return Err(format!(
                    "plot: 'x' has {} values but series {} of 'y2' has {}",
                    self.x.len(),
                    k + 1,
                    y.len()
                ));
            }
            if let Some((i, v)) = y.iter().enumerate().find(|(_, v)| !v.is_finite()) {
                return Err(format!(
                    "plot: element {i} of series {} of 'y2' is {}; {NOT_FINITE}",
                    k + 1,
                    not_finite(*v)
                ));
            }
        }
        Ok(())
    }
}

/// Why a plot refuses a value that is not finite, and what to do.
pub const NOT_FINITE: &str = "a plot takes finite values only (as show and table refuse NaN): \
     drop the point from both x and y, or fix the undefined result upstream (0/0, ln or sqrt of a \
     negative number, inf - inf)";

fn not_finite(v: f64) -> &'static str {
    if v.is_nan() { "NaN (not a number)" } else { "infinite" }
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
