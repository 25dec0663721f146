//! Trim at the script level on a Monte Carlo population, against independent computation:
//! the closed-form code of an ideal window (T ∝ C), the ±LSB/2 bound at the trim condition,
//! and the yield counted sample by sample.
use crate::cli_util::eval;

/// An ideal window (T = 2·C·ΔV/I = 1.2 µs at C = 1 pF, charge balance) whose capacitor spreads
/// by 5 %, trimmed on c with 6 bits of 1 % to 1.2 µs at its own operating point.
const SETUP: &str = r#"let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, tc_c: 50e-6});
    let mc = monte_carlo(o, #{n: 200, vary: #{c: rel_normal(0.05)}});
    let t = trim(mc, #{key: "c", bits: 6, lsb: 0.01, target: 1.2u, at: #{temp: 27, vdd: 1.8},
                       over: #{temp: [-40, 27, 125], vdd: [1.8]}});"#;

fn floats(script: &str) -> Vec<f64> {
    eval(script)
        .unwrap()
        .into_array()
        .unwrap()
        .iter()
        .map(|x| x.as_float().unwrap_or_else(|_| x.as_int().unwrap() as f64))
        .collect()
}

#[test]
fn codes_are_the_closed_form_and_the_residual_is_within_half_an_lsb() {
    // T ∝ C for the ideal window at 27 °C: the needed factor is target/T_k and the best code
    // the nearest, round((target/T_k − 1)/lsb) + 32; the error left is (T_k/target)·f − 1,
    // within ±(lsb/2)·T_k/target.
    let r = floats(&format!(
        r#"{SETUP}
        let bad_code = 0; let bad_bound = 0; let worst_ratio = 0.0;
        for k in 0..200 {{
            let need = 1.2u / mc.period[k];
            let code = ((need - 1.0) / 0.01 + 32.0).round();
            if t.codes[k] != code {{ bad_code += 1; }}
            let bound = 50.0 * 0.01 / need;
            let ratio = abs(t.at_pct[k]) / bound;
            if ratio > 1.0 + 1e-9 {{ bad_bound += 1; }}
            if ratio > worst_ratio {{ worst_ratio = ratio; }}
        }}
        [bad_code, bad_bound, worst_ratio, t.codes.len()]"#
    ));
    assert_eq!(r[3], 200.0);
    assert_eq!(r[0], 0.0, "codes differ from the closed form");
    assert_eq!(r[1], 0.0, "a residual beyond ±LSB/2");
    // With 200 samples the largest residual comes close to the bound (the bound is tight).
    assert!(r[2] > 0.8, "{}", r[2]);
}

#[test]
fn residual_over_temperature_and_yield_match_a_count_sample_by_sample() {
    // Linear capacitor tempco (common practice): after trim the error at 125 °C is
    // (1 + e_27)·(1 + 98·tc_c) − 1; the yield is the count of samples whose min and max error
    // stay inside the window, with its Wilson interval (the same as mc.yield_within's).
    let r = floats(&format!(
        r#"{SETUP}
        let bad = 0; let inside = 0;
        for k in 0..200 {{
            let hot = ((1.0 + t.at_pct[k] / 100.0) * (1.0 + 98.0 * 50e-6) - 1.0) * 100.0;
            if abs(t.max_pct[k] - hot) > 1e-9 {{ bad += 1; }}
            if t.min_pct[k] >= -0.3 && t.max_pct[k] <= 0.3 {{ inside += 1; }}
        }}
        let y = t.yield_within(#{{min: -0.3, max: 0.3}});
        [bad, inside, y.pass, y["yield"] * 200.0, y.lo, y.hi, y.fails.len()]"#
    ));
    assert_eq!(r[0], 0.0);
    assert_eq!(r[1], r[2]);
    assert!((r[3] - r[1]).abs() < 1e-9);
    // The Wilson interval holds the observed fraction (it reaches 1 when every sample passes).
    assert!(r[4] < r[5] && r[4] <= r[3] / 200.0 && r[3] / 200.0 <= r[5], "{r:?}");
    assert_eq!(r[6], 200.0 - r[1]);
}
