//! The script-language modules of `stdlib/`: spec windows and ratios, checked by hand
//! arithmetic (4 MHz ± 1.5 % is 3.94 MHz to 4.06 MHz).
use crate::cli_util::{eval, eval_f64};

#[test]
fn spec_windows_around_a_target() {
    let s = "import \"spec\" as spec;\n";
    assert_eq!(eval_f64(&format!("{s}spec::pct(4e6, 1.5).min")), 4e6 - 4e6 * 1.5 / 100.0);
    assert_eq!(eval_f64(&format!("{s}spec::pct(4e6, 1.5).max")), 4e6 + 4e6 * 1.5 / 100.0);
    assert!((eval_f64(&format!("{s}spec::pct(4e6, 1.5).min")) - 3.94e6).abs() < 1e-6);
    // A negative target keeps min below max.
    assert!(eval_f64(&format!("{s}let w = spec::pct(-2.0, 10.0); w.max - w.min")) > 0.0);
    assert_eq!(eval_f64(&format!("{s}spec::ppm(1.0, 500.0).max")), 1.0 + 500.0 / 1e6);
    assert_eq!(eval_f64(&format!("{s}spec::at_most(5e-6).max")), 5e-6);
    let holds = |w: &str, x: &str| eval(&format!("{s}spec::holds({w}, {x})")).unwrap().as_bool().unwrap();
    assert!(holds("spec::pct(1.0, 1.0)", "1.01"), "the ends are inside, as metric judges them");
    assert!(!holds("spec::pct(1.0, 1.0)", "1.0101"));
    assert!(holds("spec::at_least(2.0)", "1e9"));
    assert!(holds("spec::between((), 3.0)", "-1e9"));
    assert!(!holds("spec::between(1.0, 3.0)", "0.5"));
}

#[test]
fn ratios_and_their_text() {
    let r = "import \"ratio\" as r;\n";
    assert_eq!(eval(&format!("{r}r::pct_text(0.01234)")).unwrap().into_string().unwrap(), "1.23 %");
    assert_eq!(eval_f64(&format!("{r}r::pct(1.015, 1.0)")), (1.015 - 1.0) / 1.0 * 100.0);
    // The worst error keeps its sign: −2 % outweighs +1 %.
    let w = eval_f64(&format!("{r}r::worst_pct(series([0.98, 1.0, 1.01]), 1.0)"));
    assert!((w + 2.0).abs() < 1e-12, "{w}");
}
