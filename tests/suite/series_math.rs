//! Series maths checked against numpy (values printed by tests/reference/series_reference.py,
//! numpy 2.4, run once; pasted beside each check).
use crate::cli_util;
use cli_util::*;

const X: &str = "let x = series([3.1, -0.4, 2.7, 9.9, 0.05, 4.4, 4.4, -2.2, 7.5, 1.0]);\n";

fn x(expr: &str) -> f64 {
    eval_f64(&format!("{X}{expr}"))
}

fn close(a: f64, b: f64, rtol: f64) {
    assert!((a - b).abs() <= rtol * b.abs(), "{a} vs reference {b}");
}

#[test]
fn reductions_match_numpy() {
    close(x("x.mean()"), 3.0450000000000004, 1e-15); // np.mean
    close(x("x.stdev()"), 3.699282963554484, 1e-14); // np.std(ddof=1)
    close(x("x.sum()"), 30.450000000000004, 1e-14); // 10·mean
    assert_eq!(x("x.min()"), -2.2);
    assert_eq!(x("x.max()"), 9.9);
    assert_eq!(x("x.argmin()"), 7.0); // np.argmin
    assert_eq!(x("x.argmax()"), 3.0); // np.argmax
}

#[test]
fn quantiles_match_numpy_linear_method() {
    // np.quantile(x, p), default method 'linear'
    for (p, q) in [
        (0.0, -2.2),
        (0.1, -0.5800000000000001),
        (0.25, 0.2875),
        (0.5, 2.9000000000000004),
        (0.9, 7.739999999999999),
        (1.0, 9.9),
    ] {
        close(x(&format!("x.quantile({p:?})")), q, 1e-14);
    }
}

#[test]
fn elementwise_functions_match_numpy() {
    let y = "let y = abs(x) + 0.5;\n";
    close(x(&format!("{y}exp(-y).sum()")), 1.3572001306876837, 1e-14); // np.sum(np.exp(-y))
    close(x(&format!("{y}ln(y).sum()")), 10.739321778033071, 1e-14); // np.sum(np.log(y))
    close(x(&format!("{y}log10(y).sum()")), 4.664028187583182, 1e-14); // np.sum(np.log10(y))
    close(x(&format!("{y}sqrt(y).sum()")), 18.72495561706937, 1e-14); // np.sum(np.sqrt(y))
    close(x(&format!("{y}(y ** 1.5).sum()")), 97.94986365592469, 1e-14); // np.sum(y**1.5)
    close(x(&format!("{y}pow(y, 1.5).sum()")), 97.94986365592469, 1e-14);
    close(x(&format!("{y}((y * 2.5 - 1) / (y + 3)).sum()")), 10.828228769337679, 1e-14);
}

#[test]
fn spans_match_linspace_and_geomspace() {
    // np.linspace(1e-3, 2.0, 5)
    for (k, v) in [0.001, 0.50075, 1.0005, 1.5002499999999999, 2.0].iter().enumerate() {
        close(eval_f64(&format!("span(1m, 2, 5)[{k}]")), *v, 1e-15);
    }
    // np.geomspace(1e-9, 1e-3, 4)
    for (k, v) in [1e-9, 1e-7, 9.999999999999999e-06, 0.001].iter().enumerate() {
        close(eval_f64(&format!("span_log(1n, 1m, 4)[{k}]")), *v, 1e-14);
    }
    assert!(eval("span_log(0, 1, 3)").unwrap_err().contains("span_log needs both ends > 0"));
    assert!(eval("span(0, 1, 0)").unwrap_err().contains("n must be in 1..=100000000"));
}

#[test]
fn masks_selection_slicing_and_indexing() {
    assert_eq!(x("(x > 4).count()"), 4.0); // 9.9, 4.4, 4.4, 7.5
    assert_eq!(x("x.select(x < 0).sum()"), -2.6);
    assert_eq!(x("x[-1]"), 1.0);
    assert_eq!(x("x[1..3].sum()"), -0.4 + 2.7);
    assert_eq!(x("x[1..=3].len()"), 3.0);
    assert_eq!(x("x.slice(8, 100).len()"), 2.0);
    // numpy: float((a*a).sum()) for these ten values, pairwise summation.
    assert_eq!(x("x.map(|v| v * v).sum()"), 215.88250000000002);
    assert_eq!(x("let y = x; y[0] = 100; x[0] + y[0]"), 103.1); // copy on write: x unchanged
    // Iteration visits every element: a running sum agrees with the pairwise sum (numpy's
    // np.sum of these values is 30.450000000000003) to rounding.
    assert!((x("let s = 0.0; for v in x { s += v; } s") - 30.450000000000003).abs() < 1e-12);
    assert_eq!(x("x.sum()"), 30.450000000000003);
    assert_eq!(x("x.to_array().len()"), 10.0);
    assert!(eval(&format!("{X}x[10]")).unwrap_err().contains("index 10 is out of range for a Series of length 10"));
    assert!(eval(&format!("{X}x + span(0, 1, 3)")).unwrap_err().contains("series lengths differ: 10 and 3"));
    assert!(eval("series([1, \"a\"])").unwrap_err().contains("element 1 of the array is a string"));
}

#[test]
fn scalar_on_either_side_and_ints() {
    assert_eq!(x("(2 * x - x * 2).sum()"), 0.0);
    assert_eq!(x("(1.0 / (x * 0 + 4)).mean()"), 0.25);
    assert_eq!(x("(-x).sum() + x.sum()"), 0.0);
    assert_eq!(x("(10 - x)[0]"), 10.0 - 3.1);
}

#[test]
fn script_maths_is_the_same_on_every_machine() {
    // exp, ln and ** of floats and Series go through tickwork's pure-Rust maths (musl's libm),
    // not the platform's: glibc gives 0.0067382165290940784 for this exp and
    // -3.2256487091556294 for this ln (see num::math's tests).
    assert_eq!(eval_f64("exp(-4.999959999)"), 0.006738216529094079);
    assert_eq!(eval_f64("ln(0.039729999999999994)"), -3.22564870915563);
    assert_eq!(eval_f64("pow(0.50011, -0.513)"), 1.4268534796598518);
    assert_eq!(eval_f64("(series([0.50011]) ** -0.513)[0]"), 1.4268534796598518);
}
