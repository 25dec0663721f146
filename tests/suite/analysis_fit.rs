//! Fits: read_csv, fit_linear and fit_curve against numpy.linalg.lstsq and
//! scipy.optimize.curve_fit (values from tests/reference/fit_reference.py, run once), and the
//! recovery of known parameters from noisy data within their intervals.
use crate::cli_util::{Project, eval, stderr};

fn close(got: f64, want: f64, rel: f64) -> bool {
    (got - want).abs() <= rel * want.abs()
}

fn floats(v: &rhai::Dynamic) -> Vec<f64> {
    v.clone().into_array().unwrap().iter().map(|x| x.as_float().unwrap()).collect()
}

#[test]
fn fit_linear_matches_numpy_lstsq() {
    // Data and reference values: tests/reference/fit_reference.py, case 1 (numpy lstsq; the
    // intervals with scipy.stats.t.ppf(0.975, 10)).
    let m = eval(
        r#"
        let k = span(0, 11, 12);
        let i = 0.5e-6 + k * (1.5e-6 / 11);
        let x = 1e-12 * 0.6 / i;
        let t = 2.02 * x + 35e-9 + 2e-9 * (k * 1.7).map(|v| v.sin());
        fit_linear(t, #{terms: #{a: x}})
        "#,
    )
    .unwrap()
    .cast::<rhai::Map>();
    let get = |field: &str, name: &str| m[field].clone().cast::<rhai::Map>()[name].as_float().unwrap();
    assert!(close(get("coef", "intercept"), 3.44645171416462e-08, 1e-8));
    assert!(close(get("coef", "a"), 2.020914405708654, 1e-10));
    assert!(close(get("stderr", "intercept"), 1.0000577351642804e-09, 1e-7));
    assert!(close(get("stderr", "a"), 0.0015831266938154743, 1e-7));
    assert!(close(get("lo", "a"), 2.0173869796145474, 1e-9));
    assert!(close(get("hi", "a"), 2.024441831802761, 1e-9));
    assert!(close(get("lo", "intercept"), 3.223624964769727e-08, 1e-7));
    assert!(close(m["r2"].as_float().unwrap(), 0.9999938633290195, 1e-10));
    // The known slope lies inside its interval.
    assert!(get("lo", "a") < 2.02 && 2.02 < get("hi", "a"));
}

#[test]
fn fit_curve_matches_scipy_curve_fit() {
    // tests/reference/fit_reference.py, case 2 (scipy.optimize.curve_fit from p0 = [1, 1, 0]).
    let m = eval(
        r#"
        let k = span(0, 24, 25);
        let x = k * 0.4;
        let y = 2.0 * exp(-x / 3.0) + 0.5 + 0.01 * (k * 2.1 + 0.3).map(|v| v.sin());
        fit_curve(|x, p| p[0] * exp(-x / p[1]) + p[2], x, y, [1.0, 1.0, 0.0])
        "#,
    )
    .unwrap()
    .cast::<rhai::Map>();
    let p = floats(&m["p"]);
    let se = floats(&m["stderr"]);
    let (lo, hi) = (floats(&m["lo"]), floats(&m["hi"]));
    let want = [2.0014643381466293, 2.9934925575605678, 0.5007855937531037];
    let want_se = [0.005455205792522794, 0.0235982812515091, 0.004746227015206363];
    for j in 0..3 {
        assert!(close(p[j], want[j], 1e-7), "p{j} = {} vs {}", p[j], want[j]);
        assert!(close(se[j], want_se[j], 1e-4), "se{j} = {} vs {}", se[j], want_se[j]);
    }
    assert!(close(lo[1], 2.9445527176242385, 1e-6) && close(hi[1], 3.042432397496897, 1e-6));
    // The parameters the data were made with lie inside their 95 % intervals.
    for (j, truth) in [2.0, 3.0, 0.5].iter().enumerate() {
        assert!(lo[j] < *truth && *truth < hi[j], "p{j}: {truth} outside [{}, {}]", lo[j], hi[j]);
    }
}

#[test]
fn read_csv_gives_series_by_header_and_records_the_input() {
    let p = Project::new();
    p.write("data/period.csv", "# invented numbers\ni,period\n1e-6,2.5e-7\n2e-6,1.25e-7\n");
    p.write(
        "fit.rhai",
        "let d = read_csv(\"data/period.csv\");\nshow(\"n\", d.period.len());\nlet f = fit_linear(d.period, #{terms: #{inv_i: 1.0 / d.i}, intercept: false});\nshow(\"k\", f.coef.inv_i);\n",
    );
    let out = p.tickwork(&["run", "fit.rhai"]);
    assert!(out.status.success(), "{}", stderr(&out));
    let report = std::fs::read_to_string(p.path().join("out/fit/report.md")).unwrap();
    assert!(report.contains("data/period.csv"), "the provenance names the data file:\n{report}");
}
