//! Number formatting for reports: engineering notation with SI prefixes, except for units
//! that are never prefixed in circuit work (%, ppm, dB, °C, …), which get plain decimals.
use crate::num::si::eng;

/// Significant digits of a value in the report when the script asks for none: `show`,
/// `table` and `metric` alike.
pub const DIGITS: usize = 3;

/// `x` for a table cell or tick whose unit is written elsewhere: `3.33µ`, `1.50`.
/// A unit with a power (`m²`) keeps its unit, since a bare prefix would read as a prefix of
/// the whole unit (`4p` of m² is 4 µm², not 4 pm²).
pub fn bare(x: f64, unit: &str, digits: usize) -> String {
    if plain_unit(unit) {
        plain(x, digits)
    } else if unit.ends_with(['²', '³']) {
        eng(x, unit, digits)
    } else {
        eng(x, "", digits)
    }
}

pub use crate::num::si::{plain, plain_unit, trim_zeros, value};

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
        assert_eq!(bare(4e-12, "m²", 3), "4.00 µm²");
        assert_eq!(plain(-40.0, 3), "-40.0");
        assert_eq!(plain(1.0e-7, 3), "1.00e-7");
        assert_eq!(trim_zeros("2.50µ"), "2.5µ");
        assert_eq!(trim_zeros("3.00"), "3");
        assert_eq!(trim_zeros("100"), "100");
        assert_eq!(trim_zeros("-0.500m"), "-0.5m");
    }
}
