//! The SI-literal pre-pass as a user meets it: values, and text that only looks like literals.
use crate::cli_util;
use cli_util::*;

/// Relative closeness.
fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-15 * b.abs().max(1e-300)
}

#[test]
fn prefixes_have_their_si_values() {
    // BIPM SI Brochure, 9th ed., table 7: p = 1e-12, n = 1e-9, µ = 1e-6, m = 1e-3, k = 1e3, M = 1e6.
    for (lit, val) in [
        ("2p", 2e-12),
        ("1.5u", 1.5e-6),
        ("1.5µ", 1.5e-6),
        ("1.5μ", 1.5e-6),
        ("45n", 45e-9),
        ("3.3k", 3.3e3),
        ("10M", 10e6),
        ("2m", 2e-3),
        ("7f", 7e-15),
        ("1G", 1e9),
        ("1_000k", 1e6),
        ("2pF", 2e-12),
        ("1.66V", 1.66),
        ("45ns", 45e-9),
        ("2uA", 2e-6),
        ("3.3kOhm", 3.3e3),
        ("4MHz", 4e6),
        ("1.2e3k", 1.2e6),
        ("5mV", 5e-3),
    ] {
        assert!(close(eval_f64(lit), val), "{lit} should be {val}, got {}", eval_f64(lit));
    }
}

#[test]
fn milli_and_mega_are_case_sensitive() {
    // SI Brochure: m is milli, M is mega; confusing them is a 1e9 error.
    assert!(close(eval_f64("1m"), 1e-3));
    assert!(close(eval_f64("1M"), 1e6));
}

#[test]
fn suffixed_integers_become_floats() {
    let v = eval("2k").unwrap();
    assert!(v.is_float(), "2k must be a float, is {}", v.type_name());
    // A plain integer stays an integer.
    assert!(eval("2").unwrap().is_int());
}

#[test]
fn strings_comments_and_identifiers_are_untouched() {
    let p = Project::new();
    p.write(
        "look.rhai",
        r#"
let s = "2p 3.3k 10M";          // a comment with 2p and 45ns
/* block with 1.5u and /* nested 2k */ still comment */
let tag2p = 4;                    // identifier containing 2p
let c = 'k';
let t = `text 2p ${2p * 1e12} 3k`;
print(s);
print(tag2p);
print(c);
print(t);
print(0x1F);
print(1..3);
"#,
    );
    let o = p.tickwork(&["run", "look.rhai"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let out = stdout(&o);
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(lines[0], "2p 3.3k 10M");
    assert_eq!(lines[1], "4");
    assert_eq!(lines[2], "k");
    assert_eq!(lines[3], "text 2p 2.0 3k");
    assert_eq!(lines[4], "31");
    assert_eq!(lines[5], "1..3");
}

#[test]
fn unknown_unit_is_an_error_naming_it_at_its_position() {
    let p = Project::new();
    p.write("bad.rhai", "let a = 1;\nlet r = 3.3Kohm;\n");
    let o = p.tickwork(&["run", "bad.rhai"]);
    assert_eq!(o.status.code(), Some(1));
    let e = stderr(&o);
    assert!(e.contains("bad.rhai:2:12: unknown unit 'Kohm'"), "{e}");
    assert!(e.contains("kilo is lower-case k"), "{e}");
    assert!(e.contains("    2 | let r = 3.3Kohm;"), "{e}");
}

#[test]
fn eng_formats_with_prefixes() {
    // DESIGN.md contract: eng(3.33e-6, "s") → "3.33 µs".
    let s = eval(r#"eng(3.33e-6, "s")"#).unwrap().into_string().unwrap();
    assert_eq!(s, "3.33 µs");
    let s = eval(r#"eng(-0.000123456, "A", 5)"#).unwrap().into_string().unwrap();
    assert_eq!(s, "-123.46 µA");
    assert_eq!(eval("eng(0)").unwrap().into_string().unwrap(), "0");
    assert_eq!(eval(r#"eng(1.0/0.0, "Hz")"#).unwrap().into_string().unwrap(), "inf Hz");
    assert_eq!(eval(r#"eng(0.0/0.0, "V")"#).unwrap().into_string().unwrap(), "NaN V");
    assert!(eval(r#"eng(1.0, "V", 0)"#).unwrap_err().contains("digits must be in 1..=17"));
}

#[test]
fn hand_calculation_of_the_ideal_window_period() {
    // T = 2·C·ΔV/I (common practice): 1 pF, 1.66 V, 1 µA → 3.32 µs.
    let p = Project::new();
    p.write(
        "ideal.rhai",
        "let t = 2 * 1pF * 1.66V / 1uA;\nshow(\"period\", t, \"s\");\nprint(eng(1.0 / t, \"Hz\", 4));\n",
    );
    let o = p.tickwork(&["run", "ideal.rhai"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "period = 3.32 µs\n301.2 kHz\n");
}
