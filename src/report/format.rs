//! Number formatting for reports: engineering notation with SI prefixes, except for units
//! that are never prefixed in circuit work (%, ppm, dB, °C, …), which get plain decimals.
use crate::num::si::eng;

/// Units shown without an SI prefix (common practice: nobody writes "50 m%" or "2 kppm").
const PLAIN_UNITS: &[&str] = &["%", "ppm", "ppb", "dB", "dBc", "dBc/Hz", "dBm", "°C", "degC", "°", "deg", "ppm/°C", "%/°C", "%/V", "ppm/V", "σ", "sigma"];

/// Whether values in `unit` are written without an SI prefix.
pub fn plain_unit(unit: &str) -> bool {
    PLAIN_UNITS.contains(&unit)
}

/// `x` with `digits` significant digits and its unit: `3.33 µs`, `1.50 %`.
pub fn value(x: f64, unit: &str, digits: usize) -> String {
    if plain_unit(unit) {
        format!("{} {unit}", plain(x, digits))
    } else {
        eng(x, unit, digits)
    }
}

/// `x` for a table cell or tick whose unit is written elsewhere: `3.33µ`, `1.50`.
pub fn bare(x: f64, unit: &str, digits: usize) -> String {
    if plain_unit(unit) { plain(x, digits) } else { eng(x, "", digits) }
}

/// `digits` significant digits without a prefix; exponent form outside 1e-4 … 1e9.
pub fn plain(x: f64, digits: usize) -> String {
    let digits = digits.clamp(1, 17);
    if !x.is_finite() {
        return eng(x, "", digits);
    }
    if x == 0.0 {
        return "0".into();
    }
    let rounded: f64 = format!("{:.*e}", digits - 1, x).parse().unwrap_or(x);
    let e = rounded.abs().log10().floor() as i32;
    if !(-4..9).contains(&e) {
        return format!("{:.*e}", digits - 1, rounded);
    }
    let decimals = (digits as i32 - 1 - e).max(0) as usize;
    format!("{rounded:.decimals$}")
}

/// Drop trailing zeros of a mantissa: `2.50µ` → `2.5µ`, `3.00` → `3`. For tick labels.
pub fn trim_zeros(s: &str) -> String {
    let split = s.find(|c: char| !(c.is_ascii_digit() || c == '.' || c == '-')).unwrap_or(s.len());
    let (num, rest) = s.split_at(split);
    if !num.contains('.') || num.contains('e') {
        return s.to_string();
    }
    let t = num.trim_end_matches('0').trim_end_matches('.');
    format!("{t}{rest}")
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn formats() {
        assert_eq!(value(3.333e-6, "s", 3), "3.33 µs");
        assert_eq!(value(0.05, "%", 3), "0.0500 %");
        assert_eq!(value(125.0, "°C", 3), "125 °C");
        assert_eq!(bare(3.333e-6, "s", 3), "3.33µ");
        assert_eq!(bare(4700.0, "Ohm", 3), "4.70k");
        assert_eq!(plain(-40.0, 3), "-40.0");
        assert_eq!(plain(1.0e-7, 3), "1.00e-7");
        assert_eq!(trim_zeros("2.50µ"), "2.5µ");
        assert_eq!(trim_zeros("3.00"), "3");
        assert_eq!(trim_zeros("100"), "100");
        assert_eq!(trim_zeros("-0.500m"), "-0.5m");
    }
}
