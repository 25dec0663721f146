//! SI prefixes (BIPM, The International System of Units, 9th edition 2019, table 7):
//! parsing suffixes of literals and engineering-notation formatting.
use crate::num::math;

/// The prefixes accepted after a number. Case-sensitive: `m` is milli, `M` is mega.
/// `u`, `µ` (micro sign) and `μ` (Greek mu) all mean micro. Centi, deci, deca and hecto are left
/// out on purpose: they are not used in circuit work and would shadow unit symbols.
pub const PREFIXES: &[(&str, i32)] = &[
    ("q", -30),
    ("r", -27),
    ("y", -24),
    ("z", -21),
    ("a", -18),
    ("f", -15),
    ("p", -12),
    ("n", -9),
    ("u", -6),
    ("µ", -6),
    ("μ", -6),
    ("m", -3),
    ("k", 3),
    ("M", 6),
    ("G", 9),
    ("T", 12),
    ("P", 15),
    ("E", 18),
    ("Z", 21),
    ("Y", 24),
    ("R", 27),
    ("Q", 30),
];

/// Unit symbols that may follow a number (with or without a prefix); they are checked and
/// dropped, since values inside tickwork are plain SI numbers.
pub const UNITS: &[&str] = &["s", "F", "A", "V", "Ohm", "ohm", "Ω", "Hz", "W", "J", "S", "H", "C", "m"];

/// Exponent of ten for a suffix such as `p`, `pF`, `kOhm`, `V`, `ms`.
/// A single character that is a prefix is always the prefix (`2m` is 2 milli, not 2 metres).
pub fn suffix_exponent(suffix: &str) -> Result<i32, String> {
    if let Some((_, e)) = PREFIXES.iter().find(|(p, _)| *p == suffix) {
        return Ok(*e);
    }
    if UNITS.contains(&suffix) {
        return Ok(0);
    }
    for (p, e) in PREFIXES {
        if let Some(unit) = suffix.strip_prefix(p)
            && UNITS.contains(&unit)
        {
            return Ok(*e);
        }
    }
    let hint = match suffix.chars().next() {
        Some('K') => " (kilo is lower-case k)",
        Some('U') => " (micro is u or µ)",
        _ => "",
    };
    Err(format!(
        "unknown unit '{suffix}' after a number{hint}; a number may be followed by an SI prefix \
         (a f p n u µ m k M G T …) and/or one of the units {}",
        UNITS.join(" ")
    ))
}

/// The prefix symbol for a multiple of 3 in [-30, 30] (micro printed as `µ`).
fn prefix_symbol(exp3: i32) -> Option<&'static str> {
    if exp3 == 0 {
        return Some("");
    }
    if exp3 == -6 {
        return Some("µ");
    }
    PREFIXES.iter().find(|(p, e)| *e == exp3 && *p != "u" && *p != "μ").map(|(p, _)| *p)
}

/// Engineering notation with an SI prefix and `digits` significant digits
/// (common practice): `eng(3.33e-6, "s", 3)` → `"3.33 µs"`, `eng(0.0, "V", 3)` → `"0 V"`.
pub fn eng(x: f64, unit: &str, digits: usize) -> String {
    let digits = digits.clamp(1, 17);
    let sep = if unit.is_empty() { "" } else { " " };
    if x.is_nan() {
        return format!("NaN{sep}{unit}");
    }
    if x.is_infinite() {
        return format!("{}inf{sep}{unit}", if x < 0.0 { "-" } else { "" });
    }
    if x == 0.0 {
        return format!("0{sep}{unit}");
    }
    // Round to the requested significant digits first, so 999.96 becomes 1.00 k, not 1000.
    let rounded: f64 = format!("{:.*e}", digits - 1, x).parse().unwrap_or(x);
    let power = unit_power(unit);
    if power > 1 {
        return eng_power(rounded, unit, digits, power);
    }
    let exp10 = math::log10(rounded.abs()).floor() as i32;
    let exp3 = exp10.div_euclid(3) * 3;
    match prefix_symbol(exp3) {
        Some(p) => {
            let mant = rounded / 10f64.powi(exp3);
            let int_digits = (exp10 - exp3 + 1) as usize;
            let decimals = digits.saturating_sub(int_digits);
            format!("{mant:.decimals$}{sep}{p}{unit}")
        }
        None => format!("{:.*e}{sep}{unit}", digits - 1, rounded),
    }
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

/// Units shown without an SI prefix (common practice: nobody writes "50 m%" or "2 kppm").
const PLAIN_UNITS: &[&str] = &[
    "%", "ppm", "ppb", "dB", "dBc", "dBc/Hz", "dBm", "°C", "degC", "°", "deg", "ppm/°C", "%/°C", "%/V", "ppm/V", "σ",
    "sigma",
];

/// Whether values in `unit` are written without an SI prefix.
pub fn plain_unit(unit: &str) -> bool {
    PLAIN_UNITS.contains(&unit)
}

/// `x` with `digits` significant digits and its unit: `3.33 µs`, `1.50 %`.
pub fn value(x: f64, unit: &str, digits: usize) -> String {
    if plain_unit(unit) { format!("{} {unit}", plain(x, digits)) } else { eng(x, unit, digits) }
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
    let e = math::log10(rounded.abs()).floor() as i32;
    if !(-4..9).contains(&e) {
        return format!("{:.*e}", digits - 1, rounded);
    }
    let decimals = (digits as i32 - 1 - e).max(0) as usize;
    format!("{rounded:.decimals$}")
}

/// A value for a message: up to 6 significant digits with an SI prefix, trailing zeros
/// dropped, so that limits read as written (`1 mF`, `-1 pF`, `2.5 µs`).
pub fn eng_exact(x: f64, unit: &str) -> String {
    trim_zeros(&value(x, unit, 6))
}

/// The power of a unit written with a superscript: 2 for `m²`, 3 for `m³`, else 1.
fn unit_power(unit: &str) -> i32 {
    match unit.chars().last() {
        Some('²') => 2,
        Some('³') => 3,
        _ => 1,
    }
}

/// Engineering notation for a unit raised to `power`: the prefix applies to the base unit
/// (SI Brochure 9th ed., 3: "µm²" means (µm)², so 1 µm² = 1e-12 m²). The prefix is chosen so
/// that the side length of an area sits between 0.1 and 100 of the prefixed unit.
fn eng_power(x: f64, unit: &str, digits: usize, power: i32) -> String {
    let root = math::pow(x.abs(), 1.0 / power as f64);
    let exp3 = ((math::log10(root) + 1.0) / 3.0).floor() as i32 * 3;
    match prefix_symbol(exp3) {
        Some(p) => {
            let mant = x / 10f64.powi(exp3 * power);
            let int_digits = math::log10(mant.abs()).floor() as i32 + 1;
            let decimals = (digits as i32 - int_digits).max(0) as usize;
            format!("{mant:.decimals$} {p}{unit}")
        }
        None => format!("{:.*e} {unit}", digits - 1, x),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn exact_form_for_messages() {
        assert_eq!(eng_exact(-1e-12, "F"), "-1 pF");
        assert_eq!(eng_exact(0.001, "F"), "1 mF");
        assert_eq!(eng_exact(2.5e-6, "s"), "2.5 µs");
        assert_eq!(eng_exact(-40.0, "°C"), "-40 °C");
    }
    #[test]
    fn formats_areas_with_the_prefix_on_the_length() {
        // 1 µm² = 1e-12 m² (SI Brochure: a prefix binds to its unit before the power).
        assert_eq!(eng(3.98e-12, "m²", 3), "3.98 µm²");
        assert_eq!(eng(4e-10, "m²", 3), "400 µm²");
        assert_eq!(eng(2.5e-13, "m²", 3), "0.250 µm²");
        assert_eq!(eng(1e-18, "m³", 3), "1.00 µm³");
    }
    #[test]
    fn formats_with_prefixes() {
        assert_eq!(eng(3.33e-6, "s", 3), "3.33 µs");
        assert_eq!(eng(3300.0, "Ohm", 3), "3.30 kOhm");
        assert_eq!(eng(-2e-12, "F", 3), "-2.00 pF");
        assert_eq!(eng(999.96, "V", 3), "1.00 kV");
        assert_eq!(eng(0.0, "", 3), "0");
        assert_eq!(eng(1.5, "", 3), "1.50");
        assert_eq!(eng(4.7e3, "", 2), "4.7k");
        assert_eq!(eng(f64::NEG_INFINITY, "s", 3), "-inf s");
        assert_eq!(eng(123.0e-40, "s", 3), "1.23e-38 s");
    }
    #[test]
    fn parses_suffixes() {
        assert_eq!(suffix_exponent("p"), Ok(-12));
        assert_eq!(suffix_exponent("pF"), Ok(-12));
        assert_eq!(suffix_exponent("m"), Ok(-3));
        assert_eq!(suffix_exponent("M"), Ok(6));
        assert_eq!(suffix_exponent("kOhm"), Ok(3));
        assert_eq!(suffix_exponent("V"), Ok(0));
        assert_eq!(suffix_exponent("µA"), Ok(-6));
        assert!(suffix_exponent("Kg").unwrap_err().contains("'Kg'"));
    }
}

/// Parse a number with an optional SI suffix, as on the command line (`--set C=2p`).
pub fn parse_number(text: &str) -> Result<f64, String> {
    let t = text.trim();
    let split = t
        .char_indices()
        .find(|(k, c)| {
            c.is_alphabetic()
                && !(*c == 'e' && t[k + 1..].starts_with(|d: char| d.is_ascii_digit() || d == '-' || d == '+'))
        })
        .map(|(k, _)| k)
        .unwrap_or(t.len());
    let (num, suffix) = t.split_at(split);
    let x: f64 = num.parse().map_err(|_| format!("'{text}' is not a number"))?;
    if suffix.is_empty() {
        return Ok(x);
    }
    let e = suffix_exponent(suffix)?;
    // Scale through the decimal string so that 2p is exactly the literal 2e-12.
    format!("{num}e{e}").parse::<f64>().or(Ok(x * 10f64.powi(e)))
}

#[cfg(test)]
mod parse_tests {
    use super::*;
    #[test]
    fn parses_numbers() {
        assert_eq!(parse_number("2p"), Ok(2e-12));
        assert_eq!(parse_number("1.5e-3"), Ok(1.5e-3));
        assert_eq!(parse_number("3.3kOhm"), Ok(3300.0));
        assert_eq!(parse_number("-40"), Ok(-40.0));
        assert!(parse_number("abc").is_err());
    }
}
