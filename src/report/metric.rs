//! Metrics: named figures of merit with an optional spec window, for `results.json`, the
//! metrics history and the digest. Names are stable identifiers, so they are checked.
use crate::num::si::eng;
use crate::report::format;

/// Longest accepted metric name.
pub const MAX_NAME: usize = 64;

/// What a metric name may contain, in words (for error messages and docs).
pub const NAME_RULE: &str = "a lower-case letter first, then lower-case letters a-z, digits 0-9, '_' or '.' \
    (a '.' only between two other characters), at most 64 characters, e.g. 'osc.period_nom'";

/// An inclusive spec window; either end may be open.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Spec {
    pub min: Option<f64>,
    pub max: Option<f64>,
}

impl Spec {
    /// Whether `x` lies in the window (ends included).
    pub fn contains(&self, x: f64) -> bool {
        self.min.is_none_or(|a| x >= a) && self.max.is_none_or(|b| x <= b)
    }

    pub fn is_open(&self) -> bool {
        self.min.is_none() && self.max.is_none()
    }
    /// The spec as text, e.g. `3.20 µs … 3.40 µs`, `≥ 1.00 MHz`.
    pub fn text(&self, unit: &str) -> String {
        match (self.min, self.max) {
            (Some(a), Some(b)) => format!("{} … {}", eng(a, unit, 3), eng(b, unit, 3)),
            (Some(a), None) => format!("≥ {}", eng(a, unit, 3)),
            (None, Some(b)) => format!("≤ {}", eng(b, unit, 3)),
            (None, None) => String::new(),
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
pub struct Metric {
    pub name: String,
    pub value: f64,
    pub unit: String,
    pub spec: Spec,
}

impl Metric {
    /// Build a metric, checking the name, the value and the spec.
    pub fn new(name: &str, value: f64, unit: &str, spec: Spec) -> Result<Metric, String> {
        check_name(name)?;
        if !value.is_finite() {
            return Err(format!("metric '{name}': the value is {value}; a metric must be a finite number"));
        }
        for (k, v) in [("min", spec.min), ("max", spec.max)] {
            if let Some(x) = v
                && !x.is_finite()
            {
                return Err(format!("metric '{name}': spec {k} is {x}; it must be a finite number"));
            }
        }
        if let (Some(a), Some(b)) = (spec.min, spec.max)
            && a > b
        {
            return Err(format!("metric '{name}': spec min {a} is above spec max {b}"));
        }
        Ok(Metric { name: name.to_string(), value, unit: unit.to_string(), spec })
    }

    /// Whether the value lies in the spec window (ends included); None without a spec.
    pub fn pass(&self) -> Option<bool> {
        if self.spec.is_open() {
            return None;
        }
        Some(self.spec.contains(self.value))
    }

    /// The value as the report shows it: [`format::DIGITS`] significant digits, as `show`
    /// gives, or more (up to 9) where fewer would round it onto or across a spec limit, so
    /// that the number shown passes or fails as the value does.
    pub fn value_text(&self) -> String {
        let at_limit = |x: f64| self.spec.min == Some(x) || self.spec.max == Some(x);
        for d in format::DIGITS..=9 {
            let shown: f64 = format!("{:.*e}", d - 1, self.value).parse().unwrap_or(self.value);
            let same = self.spec.is_open()
                || (self.spec.contains(shown) == self.spec.contains(self.value)
                    && at_limit(shown) == at_limit(self.value));
            if same {
                return format::value(self.value, &self.unit, d);
            }
        }
        format::value(self.value, &self.unit, 9)
    }
}

/// Check a metric name against [`NAME_RULE`].
pub fn check_name(name: &str) -> Result<(), String> {
    let bad = |why: &str| Err(format!("metric name '{name}' {why}; a metric name is {NAME_RULE}"));
    if name.is_empty() {
        return bad("is empty");
    }
    if name.len() > MAX_NAME {
        return bad("is too long");
    }
    if !name.starts_with(|c: char| c.is_ascii_lowercase()) {
        return bad("does not start with a lower-case letter");
    }
    if let Some(c) = name.chars().find(|c| !(c.is_ascii_lowercase() || c.is_ascii_digit() || *c == '_' || *c == '.')) {
        return bad(&format!("contains '{c}'"));
    }
    if name.ends_with('.') || name.contains("..") {
        return bad("has a '.' that is not between two other characters");
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn names() {
        assert!(check_name("osc.period_nom").is_ok());
        assert!(check_name("i_supply2").is_ok());
        for bad in ["", "Period", "1st", "a b", "a..b", "a.", "período", "a-b", &"x".repeat(65)] {
            assert!(check_name(bad).is_err(), "{bad}");
        }
        assert!(check_name("a-b").unwrap_err().contains("'-'"));
    }
    #[test]
    fn spec_window_includes_its_ends() {
        let m = |v| Metric::new("f", v, "Hz", Spec { min: Some(1.0), max: Some(2.0) }).unwrap().pass();
        assert_eq!(m(1.0), Some(true));
        assert_eq!(m(2.0), Some(true));
        assert_eq!(m(2.0000001), Some(false));
        assert_eq!(m(0.5), Some(false));
        assert_eq!(Metric::new("f", 1.0, "", Spec::default()).unwrap().pass(), None);
        assert!(Metric::new("f", f64::NAN, "", Spec::default()).is_err());
        assert!(Metric::new("f", 1.0, "", Spec { min: Some(3.0), max: Some(2.0) }).is_err());
    }
}
