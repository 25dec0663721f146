//! The noisy transient against the jitter analysis: over 10^4 cycles the sample σ of the
//! period must lie within the 99 % confidence interval of its own estimate around the analytic
//! σ (normal approximation of the sampling distribution of s, σ·(1 ± z·√((1 + 2ρ₁²)/(2(n−1))))
//! with ρ₁ the lag-1 correlation of the periods; common practice, e.g. Bartlett 1946 for the
//! correction). Runs are reproducible with the seed.
use crate::cli_util::eval;
use tickwork::analysis::stats::z_two_sided;
use tickwork::num::Series;

fn run(osc: &str, seed: i64) -> (Vec<f64>, f64, f64) {
    let m = eval(&format!(
        "let o = {osc}; let s = o.simulate(10000, #{{noise: true, points_per_phase: 0, seed: {seed}}});
         let j = o.jitter(); #{{periods: s.periods, sigma: j.sigma_period, c2c: j.sigma_c2c}}"
    ))
    .unwrap()
    .cast::<rhai::Map>();
    let p = m["periods"].clone().cast::<Series>().to_vec();
    (p[16..].to_vec(), m["sigma"].as_float().unwrap(), m["c2c"].as_float().unwrap())
}

fn check(osc: &str) {
    let (p, sigma, c2c) = run(osc, 11);
    let n = p.len() as f64;
    let mean = p.iter().sum::<f64>() / n;
    let d: Vec<f64> = p.iter().map(|x| x - mean).collect();
    let var = d.iter().map(|x| x * x).sum::<f64>() / (n - 1.0);
    let rho1 = d.windows(2).map(|w| w[0] * w[1]).sum::<f64>() / (n - 1.0) / var;
    let half = z_two_sided(0.99) * ((1.0 + 2.0 * rho1 * rho1) / (2.0 * (n - 1.0))).sqrt();
    let s = var.sqrt();
    assert!(
        (s / sigma - 1.0).abs() < half,
        "{osc}: transient σ {s:.4e} vs analytic {sigma:.4e} (99 % half-width {half:.4})"
    );
    // Cycle-to-cycle: the σ of consecutive differences, same test (its lag-1 correlation is
    // about −1/2 for independent periods).
    let dd: Vec<f64> = p.windows(2).map(|w| w[1] - w[0]).collect();
    let m = dd.iter().sum::<f64>() / dd.len() as f64;
    let v2 = dd.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (dd.len() as f64 - 1.0);
    let r2 = dd.windows(2).map(|w| (w[0] - m) * (w[1] - m)).sum::<f64>() / (dd.len() as f64 - 1.0) / v2;
    let half2 = z_two_sided(0.99) * ((1.0 + 2.0 * r2 * r2) / (2.0 * (dd.len() as f64 - 1.0))).sqrt();
    assert!((v2.sqrt() / c2c - 1.0).abs() < half2, "{osc}: c2c {:.4e} vs {c2c:.4e}", v2.sqrt());
}

#[test]
fn reset_oscillator_current_noise_matches_the_analysis() {
    check(r#"osc("reset", #{c: 1p, i: 1u, v_hi: 1.2, t_reset: 20n, i_noise: 2e-12})"#);
}

#[test]
fn window_with_current_and_comparator_noise_matches_the_analysis() {
    check(
        r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, t_cmp: 5n, t_logic: 1n, i_mismatch: 0.05,
            i_noise: 1e-12, vn_cmp: 100n, cmp_nbw: 10M})"#,
    );
}

#[test]
fn noisy_runs_repeat_with_the_seed_and_differ_without_it() {
    let o = r#"osc("reset", #{c: 1p, i: 1u, v_hi: 1.2, t_reset: 20n, i_noise: 2e-12})"#;
    let a = eval(&format!("let o = {o}; o.simulate(50, #{{noise: true, seed: 3}}).periods")).unwrap().cast::<Series>();
    let b = eval(&format!("let o = {o}; o.simulate(50, #{{noise: true, seed: 3}}).periods")).unwrap().cast::<Series>();
    let c = eval(&format!("let o = {o}; o.simulate(50, #{{noise: true, seed: 4}}).periods")).unwrap().cast::<Series>();
    assert_eq!(a, b);
    assert_ne!(a, c);
}
