//! Monte Carlo: statistics against first-order propagation and an exact nonlinear closed form
//! (each within the estimator's own 99 % interval), the Wilson interval against statsmodels,
//! and reproducibility: identical bits for 1 and 2 threads, for the range split in 4, and for
//! the report files written with --threads 1 and 2.
use std::sync::Arc;

use tickwork::analysis::distribution::Distribution;
use tickwork::analysis::monte_carlo::{McSpec, MonteCarlo, stats};
use tickwork::analysis::stats::wilson;
use tickwork::timing::{Kind, Osc};

use super::cli_util::Project;

/// 99 % two-sided normal quantile (scipy.stats.norm.ppf(0.995)).
const Z99: f64 = 2.575_829_303_548_900_4;

fn window() -> Osc {
    let p: Vec<(String, f64)> =
        [("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2)].iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(Kind::Window, &p).unwrap()
}

fn run(o: &Osc, vary: &[(&str, Distribution)], n: u64, seed: u64, threads: usize) -> MonteCarlo {
    let vary: Vec<(String, Distribution)> = vary.iter().map(|(k, d)| (k.to_string(), *d)).collect();
    let spec = Arc::new(McSpec::new(o, &vary, n, seed).unwrap());
    spec.run(0..n, threads).unwrap()
}

#[test]
fn wilson_matches_statsmodels() {
    // statsmodels.stats.proportion.proportion_confint(k, n, alpha=0.05, method="wilson"),
    // produced by tests/reference/wilson_reference.py.
    let reference = [
        (0, 10, 0.0, 0.27753279986288926),
        (10, 10, 0.7224672001371106, 1.0),
        (5, 10, 0.23659309051256394, 0.7634069094874361),
        (95, 100, 0.8882495307680808, 0.9784563208456319),
        (1, 1000, 0.00017654637062607765, 0.005642558597957937),
        (500, 1000, 0.4690696003681042, 0.5309303996318958),
        (9990, 10000, 0.9981600556125619, 0.9994567140135028),
        (999000, 1000000, 0.9989361050825679, 0.9990600611562565),
    ];
    for (k, n, lo, hi) in reference {
        let (a, b) = wilson(k, n, 0.95);
        assert!((a - lo).abs() < 1e-12 && (b - hi).abs() < 1e-12, "{k}/{n}: {a} {b} vs {lo} {hi}");
    }
}

#[test]
fn spread_agrees_with_first_order_propagation() {
    // Ideal window: T = 2·C·(V_hi − V_lo)/I (charge balance), so ∂lnT/∂lnC = 1, ∂lnT/∂lnI = −1,
    // ∂T/∂V_hi = T/(V_hi − V_lo); first order: (σ_T/T)² = Σ(S_i·σ_i)².
    let (sc, si, sv) = (0.004, 0.008, 2e-3);
    let mc = run(
        &window(),
        &[
            ("c", Distribution::rel_normal(sc).unwrap()),
            ("i", Distribution::rel_normal(si).unwrap()),
            ("v_hi", Distribution::normal(1.2, sv).unwrap()),
        ],
        20_000,
        7,
        2,
    );
    let t0 = 2.0 * 1e-12 * 0.8 / 1e-6;
    let rel = (sc * sc + si * si + (sv / 0.8).powi(2)).sqrt();
    let s = stats(&mc.period);
    let n = s.n as f64;
    // σ of a normal sample's standard deviation: σ/√(2(n−1)) (any statistics text).
    let tol_sigma = Z99 * rel * t0 / (2.0 * (n - 1.0)).sqrt();
    assert!((s.sigma - rel * t0).abs() < tol_sigma, "σ {} vs first order {} ± {tol_sigma}", s.sigma, rel * t0);
    // Mean: E[1/I] = (1 + σ_i² + …)/I0 (second order of the Taylor series), σ/√n wide.
    let mean = t0 * (1.0 + si * si);
    let tol_mean = Z99 * s.sigma / n.sqrt();
    assert!((s.mean - mean).abs() < tol_mean, "mean {} vs {mean} ± {tol_mean}", s.mean);
    // The estimate must be able to fail: half the spread is far outside the interval.
    assert!((s.sigma - 0.5 * rel * t0).abs() > tol_sigma);
}

#[test]
fn period_of_a_uniform_current_matches_its_closed_form() {
    // T = K/I with I uniform on [a, b): E[T^k] = K^k·∫ I^−k dI/(b − a), so
    // E[T] = K·ln(b/a)/(b − a), E[T²] = K²/(ab), E[T³] = K³(a⁻² − b⁻²)/(2(b − a)),
    // E[T⁴] = K⁴(a⁻³ − b⁻³)/(3(b − a)); the median is K/((a + b)/2). Strongly nonlinear.
    let (a, b) = (0.5e-6, 1.5e-6);
    let mc = run(&window(), &[("i", Distribution::uniform(a, b).unwrap())], 20_000, 11, 2);
    let k = 2.0 * 1e-12 * 0.8;
    let m1 = k * (b / a).ln() / (b - a);
    let m2 = k * k / (a * b);
    let m3 = k.powi(3) * (a.powi(-2) - b.powi(-2)) / (2.0 * (b - a));
    let m4 = k.powi(4) * (a.powi(-3) - b.powi(-3)) / (3.0 * (b - a));
    let var = m2 - m1 * m1;
    let mu4 = m4 - 4.0 * m1 * m3 + 6.0 * m1 * m1 * m2 - 3.0 * m1.powi(4);
    let s = stats(&mc.period);
    let n = s.n as f64;
    let tol_mean = Z99 * (var / n).sqrt();
    assert!((s.mean - m1).abs() < tol_mean, "mean {} vs {m1} ± {tol_mean}", s.mean);
    // Var(s²) ≈ (μ4 − σ⁴)/n for large n; δs ≈ δ(s²)/(2σ) (delta method).
    let tol_sigma = Z99 * ((mu4 - var * var) / n).sqrt() / (2.0 * var.sqrt());
    assert!((s.sigma - var.sqrt()).abs() < tol_sigma, "σ {} vs {} ± {tol_sigma}", s.sigma, var.sqrt());
    // Sample median: σ ≈ 1/(2·f(m)·√n), f_T(t) = K/(t²(b − a)).
    let med = k / (0.5 * (a + b));
    let f = k / (med * med * (b - a));
    let tol_med = Z99 / (2.0 * f * n.sqrt());
    assert!((s.q50 - med).abs() < tol_med, "median {} vs {med} ± {tol_med}", s.q50);
    // A first-order estimate (T0·σ_I/I0) is far off here, which is why the closed form is used.
    let first_order = k / 1e-6 * ((b - a) / 12f64.sqrt()) / 1e-6;
    assert!((s.sigma - first_order).abs() > 10.0 * tol_sigma);
}

fn bits(x: &[f64]) -> Vec<u64> {
    x.iter().map(|v| v.to_bits()).collect()
}

#[test]
fn threads_and_splits_give_identical_bits() {
    let o = window();
    let vary: Vec<(String, Distribution)> = vec![
        ("c".into(), Distribution::rel_normal(0.01).unwrap()),
        ("vos_hi".into(), Distribution::normal(0.0, 3e-3).unwrap()),
        ("i".into(), Distribution::uniform(0.9e-6, 1.1e-6).unwrap()),
    ];
    let n = 1001;
    let spec = Arc::new(McSpec::new(&o, &vary, n, 42).unwrap());
    let one = spec.run(0..n, 1).unwrap();
    let two = spec.run(0..n, 2).unwrap();
    assert_eq!(bits(&one.period), bits(&two.period));
    assert_eq!(bits(&one.duty), bits(&two.duty));
    let cuts = [0, 137, 500, 501, n];
    let parts: Vec<MonteCarlo> = cuts.windows(2).map(|w| spec.run(w[0]..w[1], 2).unwrap()).collect();
    let joined = MonteCarlo::concat(parts).unwrap();
    assert_eq!(bits(&joined.period), bits(&one.period));
    for (a, b) in joined.values.iter().zip(&one.values) {
        assert_eq!(bits(a), bits(b));
    }
    // Sample i's oscillator gives sample i's period; another seed gives other samples.
    for i in [0, 500, 1000] {
        assert_eq!(one.sample_osc(i).unwrap().period().unwrap(), one.period[i as usize]);
    }
    let other = Arc::new(McSpec::new(&o, &vary, n, 43).unwrap()).run(0..n, 2).unwrap();
    assert_ne!(bits(&other.period), bits(&one.period));
    assert!(spec.run(0..n + 1, 1).is_err());
}

#[test]
fn report_bytes_do_not_depend_on_the_thread_count() {
    let p = Project::new();
    p.write(
        "mc.rhai",
        r#"/// Monte Carlo
let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.4, v_hi: 1.2, vos_hi: 1m, t_logic: 5n});
let mc = monte_carlo(o, #{n: 3000, vary: #{c: rel_normal(0.01), i: rel_normal(0.02), vos_hi: normal(1m, 2m)}});
let s = mc.stats();
show("mean", s.mean, "s", #{digits: 17});
show("sigma", s.sigma, "s", #{digits: 17});
let y = mc.yield_within(#{min: 1.55u, max: 1.65u});
show("yield", y["yield"], #{digits: 17});
table(mc);
plot(#{title: "period", kind: "histogram", x: mc, x_unit: "s"});
plot(#{title: "c vs period", kind: "scatter", x: mc.samples().c, y: mc.period});
"#,
    );
    let mut outs = Vec::new();
    for t in ["1", "2"] {
        let out = format!("out{t}");
        let r = p.tickwork(&["run", "mc.rhai", "--threads", t, "--out", &out]);
        assert!(r.status.success(), "{}", super::cli_util::stderr(&r));
        let dir = p.path().join(&out).join("mc");
        let mut files: Vec<_> = std::fs::read_dir(&dir).unwrap().map(|e| e.unwrap().path()).collect();
        files.sort();
        outs.push(files.iter().map(|f| std::fs::read(f).unwrap()).collect::<Vec<_>>());
    }
    assert_eq!(outs[0].len(), 4, "two figures, report.md, results.json");
    assert_eq!(outs[0], outs[1]);
    let report = String::from_utf8(outs[0].iter().find(|b| b.starts_with(b"#")).unwrap().clone()).unwrap();
    assert!(report.contains("| key of the oscillator | c | rel_normal(0.01) |"), "{report}");
}
