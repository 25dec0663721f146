//! Oscillator periods checked against outside references; each check names its source.
use tickwork::timing::{Kind, Mask, Osc};

fn osc(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(kind, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

fn close(a: f64, b: f64, rtol: f64) {
    assert!((a - b).abs() <= rtol * b.abs(), "{a} vs reference {b} (rtol {rtol})");
}

#[test]
fn ideal_window_is_two_c_dv_over_i() {
    // T = 2·C·ΔV/I (common practice, charge balance): 1 pF, 1.66 V window, 1 µA → 3.32 µs
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.07), ("v_hi", 1.73)]);
    close(o.ideal_period().unwrap(), 3.32e-6, 1e-12);
    close(o.period().unwrap(), 3.32e-6, 1e-12);
    close(o.cycle(Mask::ALL).unwrap().duty, 0.5, 1e-12);
}

#[test]
fn rc_schmitt_matches_astable_multivibrator_formula() {
    // Sedra/Smith, Microelectronic Circuits, astable multivibrator: output ±L, thresholds ±βL,
    // T = 2·τ·ln((1+β)/(1−β)). Shifted by +L (vdd = 2L) this is an RC Schmitt oscillator with
    // thresholds (1 ± β)·vdd/2.
    let (r, c, vdd) = (100e3, 10e-12, 1.8);
    for beta in [0.1, 0.462, 0.5, 0.8] {
        let o = osc(
            Kind::Schmitt,
            &[("r", r), ("c", c), ("vdd", vdd), ("v_lo", (1.0 - beta) * vdd / 2.0), ("v_hi", (1.0 + beta) * vdd / 2.0)],
        );
        let t = 2.0 * r * c * ((1.0 + beta) / (1.0 - beta)).ln();
        close(o.period().unwrap(), t, 1e-10);
        close(o.ideal_period().unwrap(), t, 1e-12);
    }
}

#[test]
fn thresholds_at_one_and_two_thirds_give_ln2_rc_per_phase() {
    // Bipolar 555-style timer data-sheet formula: with thresholds at 1/3 and 2/3 of the supply,
    // each phase lasts t = ln 2·R·C (≈ 0.693·R·C).
    let (r, c, vdd) = (47e3, 2.2e-12, 5.0);
    let o = osc(Kind::Schmitt, &[("r", r), ("c", c), ("vdd", vdd), ("v_lo", vdd / 3.0), ("v_hi", 2.0 * vdd / 3.0)]);
    let cy = o.cycle(Mask::ALL).unwrap();
    for ph in &cy.phases {
        close(ph.ramp, std::f64::consts::LN_2 * r * c, 1e-10);
    }
    close(cy.period, 2.0 * std::f64::consts::LN_2 * r * c, 1e-12);
}

#[test]
fn two_inverter_astable_is_2_2_rc() {
    // CMOS two-inverter RC astable with the threshold at vdd/2: T = 2·ln 3·RC ≈ 2.197·RC
    // (textbook / logic application notes quote "about 2.2 RC"; recalled from memory).
    let (r, c) = (220e3, 4.7e-12);
    let o = osc(Kind::RcInverter, &[("r", r), ("c", c), ("vdd", 1.8)]);
    close(o.period().unwrap(), 2.0 * 3f64.ln() * r * c, 1e-10);
    close(o.period().unwrap() / (r * c), 2.197, 1e-3);
}

#[test]
fn reset_and_pingpong_charge_balance() {
    // T = C·V/I per ramp (common practice, charge balance)
    let base = [("c", 2e-12), ("i", 0.5e-6), ("v_hi", 0.8)];
    close(osc(Kind::Reset, &base).period().unwrap(), 2e-12 * 0.8 / 0.5e-6, 1e-12);
    close(osc(Kind::PingPong, &base).period().unwrap(), 2.0 * 2e-12 * 0.8 / 0.5e-6, 1e-12);
}

#[test]
fn nonlinear_ramp_matches_scipy() {
    // Values from tests/reference/timing_nonlinear_ramp.py (scipy 1.17 quad and solve_ivp
    // DOP853 with event location, run once, printed values pasted here).
    let keys = [
        ("c", 1e-12),
        ("c_vc1", 0.02),
        ("c_vc2", -0.005),
        ("c_swn", 50e-15),
        ("c_swp", 40e-15),
        ("sw_phi", 0.8),
        ("sw_m", 0.5),
        ("i", 1e-6),
        ("i_mismatch", 0.03),
        ("r_out", 2e6),
        ("v_ds_ref", 0.6),
        ("vdd", 1.8),
        ("v_lo", 0.2),
        ("v_hi", 1.6),
    ];
    let o = osc(Kind::Window, &keys);
    let cy = o.cycle(Mask::ALL).unwrap();
    close(cy.phases[0].ramp, 1.3539604604349296e-06, 1e-11); // t_up (quad)
    close(cy.phases[0].ramp, 1.3539604604136674e-06, 1e-10); // t_up_ode (solve_ivp event)
    close(cy.phases[1].ramp, 1.315764256593471e-06, 1e-11); // t_dn (quad)

    // With a fixed 20 ns delay after each crossing: overshoot, carried start, steady state.
    let mut k: Vec<(&str, f64)> = keys.to_vec();
    k.push(("t_cmp", 20e-9));
    let cy = osc(Kind::Window, &k).cycle(Mask::ALL).unwrap();
    close(cy.v_peak, 1.614692785254783, 1e-10); // v_peak
    close(cy.v_valley, 0.1845813855645148, 1e-9); // v_valley
    close(cy.period, 2.731096211631474e-06, 1e-9); // period
    close(cy.duty, 0.5071031317210694, 1e-9); // duty
}

#[test]
fn fixed_delay_adds_four_delays_to_a_window_period() {
    // Constant C and I: the node overshoots by I·td/C and must come back, so each of the two
    // phases gains 2·td (analytic, charge balance); v_peak = v_hi + I·td/C.
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.3), ("v_hi", 1.3), ("t_logic", 7e-9)]);
    let cy = o.cycle(Mask::ALL).unwrap();
    close(cy.period, 2e-6 + 4.0 * 7e-9, 1e-10);
    close(cy.v_peak, 1.3 + 1e-6 * 7e-9 / 1e-12, 1e-10);
    close(cy.overshoot, 7e-3, 1e-8);
}

#[test]
fn pingpong_residual_after_finite_reset_solves_the_steady_state() {
    // Each idle capacitor discharges through R for the other's ramp: first-order RC decay
    // x = V_ref·exp(−t_other/(R·C)) with t_other = C·(V_ref − x)/I (textbook RC discharge);
    // the fixed point solved here independently by bisection.
    let (c, i, vref, r) = (1e-12, 1e-6, 1.0, 400e3);
    let o = osc(Kind::PingPong, &[("c", c), ("i", i), ("v_hi", vref), ("r_reset", r)]);
    let g = |x: f64| x - vref * (-(c * (vref - x) / i) / (r * c)).exp();
    let (mut lo, mut hi) = (0.0, vref);
    for _ in 0..200 {
        let m = 0.5 * (lo + hi);
        if g(m) > 0.0 { hi = m } else { lo = m }
    }
    let x = 0.5 * (lo + hi);
    let cy = o.cycle(Mask::ALL).unwrap();
    close(cy.phases[0].v_start, x, 1e-9);
    close(cy.period, 2.0 * c * (vref - x) / i, 1e-9);
    assert!(cy.iterations > 2, "a residual needs several cycles to settle");
}

#[test]
fn reset_pulse_through_a_resistor() {
    // During the reset pulse the node obeys C·dV/dt = I − V/R: V(t) = I·R + (V_pk − I·R)·e^(−t/RC)
    // (first-order circuit, textbook); the next ramp starts there.
    let (c, i, vref, r, tr) = (1e-12, 1e-6, 1.0, 20e3, 30e-9);
    let o = osc(Kind::Reset, &[("c", c), ("i", i), ("v_hi", vref), ("r_reset", r), ("t_reset", tr)]);
    let start = i * r + (vref - i * r) * (-tr / (r * c)).exp();
    let cy = o.cycle(Mask::ALL).unwrap();
    close(cy.phases[0].v_start, start, 1e-9);
    close(cy.period, c * (vref - start) / i + tr, 1e-9);
}

#[test]
fn inverter_threshold_from_devices() {
    // Rabaey, Digital Integrated Circuits, ch. 5: V_M = (V_TN + r(V_DD − |V_TP|))/(1 + r),
    // r = √(βp/βn); with V_TN = 0.4, |V_TP| = 0.5, βp/βn = 0.5, V_DD = 1.8: V_M = 1.3192/1.7071 ≈ 0.7728 V (worked by hand).
    let vm = (0.4 + 0.5f64.sqrt() * (1.8 - 0.5)) / (1.0 + 0.5f64.sqrt());
    assert!((vm - 0.7728).abs() < 1e-4);
    let (r, c) = (100e3, 1e-12);
    let o = osc(Kind::RcInverter, &[("r", r), ("c", c), ("vtn", 0.4), ("vtp", 0.5), ("ratio_pn", 0.5)]);
    let t = r * c * (((1.8 + vm) / vm).ln() + ((3.6 - vm) / (1.8 - vm)).ln());
    close(o.period().unwrap(), t, 1e-10);
}
