//! The behavioural transient simulation checked against outside references (each check names
//! its source) and cross-checked against the analytic period model for every topology.
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::timing::from_process::{Choices, osc_from};
use tickwork::timing::transient::{EventKind, Options, Transient, simulate, simulate_masked};
use tickwork::timing::{Kind, Mask, Osc};

fn osc(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(kind, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

fn demo(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode, res_type: "rpoly".into() };
    osc_from(&Process::demo180(), kind, ch, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

fn sim(o: &Osc, cycles: usize) -> Transient {
    simulate(o, cycles, &Options::default()).unwrap_or_else(|e| panic!("{:?}: {e}", o.kind()))
}

fn close(a: f64, b: f64, rtol: f64) {
    assert!((a - b).abs() <= rtol * b.abs(), "{a} vs reference {b} (rtol {rtol}, off by {:.2e})", (a / b - 1.0));
}

/// Times of the events of one kind.
fn times(s: &Transient, kind: EventKind) -> Vec<f64> {
    s.events.iter().filter(|e| e.kind == kind).map(|e| e.t).collect()
}

/// Every parasitic of every kind switched on, explicit numbers (invented, demo scale).
pub(crate) fn explicit_full() -> Vec<Osc> {
    let ramp = [
        ("c_vc1", 0.02),
        ("c_vc2", -0.005),
        ("c_swn", 20e-15),
        ("c_swp", 15e-15),
        ("c_in", 10e-15),
        ("r_out", 5e6),
        ("v_ds_ref", 0.6),
        ("cmp_gbw", 200e6),
        ("cmp_a0", 1e3),
        ("t_cmp", 0.5e-9),
    ];
    let with = |base: &[(&'static str, f64)], extra: &[(&'static str, f64)]| -> Vec<(&'static str, f64)> {
        base.iter().chain(extra).copied().collect()
    };
    vec![
        osc(
            Kind::Window,
            &with(
                &ramp,
                &[
                    ("c", 250e-15),
                    ("i", 1.2e-6),
                    ("v_lo", 0.5),
                    ("v_hi", 1.1),
                    ("i_mismatch", 0.02),
                    ("vos_hi", 3e-3),
                    ("vos_lo", -2e-3),
                    ("t_latch", 0.3e-9),
                    ("t_logic", 0.3e-9),
                    ("t_sw", 0.2e-9),
                ],
            ),
        ),
        osc(
            Kind::Schmitt,
            &with(
                &ramp,
                &[
                    ("c", 250e-15),
                    ("i", 1.2e-6),
                    ("vtn", 0.45),
                    ("vtp", 0.5),
                    ("ratio_n", 1.5),
                    ("ratio_p", 1.2),
                    ("i_mismatch", -0.03),
                    ("vos_hi", 2e-3),
                    ("t_logic", 0.4e-9),
                    ("t_sw", 0.2e-9),
                ],
            ),
        ),
        osc(
            Kind::Reset,
            &with(
                &ramp,
                &[
                    ("c", 250e-15),
                    ("i", 1.2e-6),
                    ("v_hi", 0.9),
                    ("vos", 4e-3),
                    ("t_logic", 0.3e-9),
                    ("t_reset", 3e-9),
                    ("r_reset", 2e3),
                ],
            ),
        ),
        osc(
            Kind::PingPong,
            &with(
                &ramp,
                &[
                    ("c", 250e-15),
                    ("i", 1.2e-6),
                    ("v_hi", 0.6),
                    ("vos", 4e-3),
                    ("c_mismatch", 0.01),
                    ("t_latch", 0.3e-9),
                    ("t_logic", 0.3e-9),
                    ("t_sw", 0.2e-9),
                    ("r_reset", 5e3),
                ],
            ),
        ),
        osc(
            Kind::RcInverter,
            &[
                ("c", 1e-12),
                ("r", 100e3),
                ("vtn", 0.45),
                ("vtp", 0.5),
                ("ratio_pn", 2.0),
                ("r_vc", 0.01),
                ("c_in", 20e-15),
                ("vos", 5e-3),
                ("t_logic", 1e-9),
            ],
        ),
    ]
}

/// The demo-process oscillators of scripts/02-period-budget.rhai and tests/timing_process.rs
/// (invented sizes and delays).
pub(crate) fn demo_full() -> Vec<Osc> {
    let common = [
        ("c", 250e-15),
        ("i", 1.2e-6),
        ("cmp_itail", 1e-6),
        ("t_latch", 0.3e-9),
        ("t_logic", 0.3e-9),
        ("t_sw", 0.2e-9),
    ];
    let with =
        |extra: &[(&'static str, f64)]| -> Vec<(&'static str, f64)> { common.iter().chain(extra).copied().collect() };
    vec![
        demo(Kind::Window, &with(&[("v_lo", 0.5), ("v_hi", 1.1)])),
        demo(Kind::PingPong, &with(&[("v_hi", 0.6)])),
        demo(Kind::Reset, &[("c", 250e-15), ("i", 1e-6), ("v_hi", 1.0), ("t_reset", 5e-9)]),
        demo(Kind::Schmitt, &[("c", 250e-15), ("i", 1e-6), ("t_cmp", 1e-9)]),
        demo(Kind::RcInverter, &[("c", 1e-12), ("r", 100e3), ("c_in", 5e-15), ("t_logic", 1e-9)]),
    ]
}

/// Every oscillator of the cross-checks: full explicit parasitics, the demo process, and a
/// ping-pong whose residual after a slow reset takes several cycles to settle.
pub(crate) fn every() -> Vec<Osc> {
    let mut v = explicit_full();
    v.extend(demo_full());
    v.push(osc(Kind::PingPong, &[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0), ("r_reset", 400e3), ("t_cmp", 3e-9)]));
    v
}

#[test]
fn ideal_window_gives_two_c_dv_over_i_every_cycle() {
    // T = 2·C·ΔV/I (common practice, charge balance): 1 pF, 1.66 V window, 1 µA → 3.32 µs
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.07), ("v_hi", 1.73)]);
    let s = sim(&o, 25);
    assert_eq!(s.periods.len(), 25);
    for p in &s.periods {
        close(*p, 3.32e-6, 1e-12);
    }
    close(s.period, 3.32e-6, 1e-12);
    close(s.duty, 0.5, 1e-12);
    // Crossings alternate at v_hi and v_lo every half period (constant slope I/C)
    for (k, t) in times(&s, EventKind::Crossing).iter().enumerate() {
        close(*t, (k + 1) as f64 * 1.66e-6, 1e-12);
    }
}

#[test]
fn rc_astable_matches_the_textbook_formula_every_cycle() {
    // Sedra/Smith, Microelectronic Circuits, astable multivibrator: thresholds ±βL about the
    // middle, T = 2·τ·ln((1+β)/(1−β)); shifted by vdd/2 it is the RC Schmitt oscillator with
    // thresholds (1 ± β)·vdd/2. Started at the low threshold, every cycle is the steady one.
    // Tolerance: the integrator's 1e-10 relative tolerance over ~20 steps per phase.
    let (r, c, vdd) = (100e3, 10e-12, 1.8);
    for beta in [0.1, 0.462, 0.8] {
        let o = osc(
            Kind::Schmitt,
            &[("r", r), ("c", c), ("vdd", vdd), ("v_lo", (1.0 - beta) * vdd / 2.0), ("v_hi", (1.0 + beta) * vdd / 2.0)],
        );
        let t = 2.0 * r * c * ((1.0 + beta) / (1.0 - beta)).ln();
        let s = sim(&o, 10);
        for p in &s.periods {
            close(*p, t, 1e-8);
        }
    }
}

#[test]
fn thresholds_at_one_and_two_thirds_give_ln2_rc_per_phase() {
    // Bipolar 555-style timer data-sheet formula: thresholds at 1/3 and 2/3 of the supply give
    // t = ln 2·R·C (≈ 0.693·R·C) per phase; the phases end at the switch events.
    let (r, c, vdd) = (47e3, 2.2e-12, 5.0);
    let o = osc(Kind::Schmitt, &[("r", r), ("c", c), ("vdd", vdd), ("v_lo", vdd / 3.0), ("v_hi", 2.0 * vdd / 3.0)]);
    let s = sim(&o, 8);
    let sw = times(&s, EventKind::Switch);
    assert_eq!(sw.len(), 16);
    let mut prev = 0.0;
    for t in sw {
        close(t - prev, std::f64::consts::LN_2 * r * c, 1e-8);
        prev = t;
    }
}

#[test]
fn nonlinear_ramp_event_times_match_scipy() {
    // Values from tests/reference/timing_transient.py (scipy 1.17 solve_ivp, DOP853 with event
    // location, rtol 1e-13; run once, printed values pasted here): crossing, comparator
    // decision and switch times of the first three cycles, and the node at each.
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
        ("t_cmp", 20e-9),
        ("t_logic", 5e-9),
        ("t_latch", 2e-9),
        ("t_sw", 1e-9),
    ];
    let o = osc(Kind::Window, &keys);
    #[rustfmt::skip]
    let reference = [
        // (crossing, decision, v at decision, switch, v at switch)
        (1.3539604604136674e-06, 1.3739604604136674e-06, 1.6146927852547832, 1.3819604604136674e-06, 1.6205311621607865),
        (2.7122225145619896e-06, 2.7322225145619894e-06, 0.18458138556451495, 2.7402225145619896e-06, 0.1784541070777793),
        (4.109520530783087e-06, 4.129520530783087e-06, 1.614692785254783, 4.1375205307830865e-06, 1.620531162160786),
        (5.467782584931402e-06, 5.487782584931402e-06, 0.18458138556451495, 5.495782584931402e-06, 0.17845410707777964),
        (6.865080601152499e-06, 6.885080601152499e-06, 1.614692785254783, 6.8930806011524985e-06, 1.620531162160786),
        (8.223342655300815e-06, 8.243342655300815e-06, 0.18458138556451495, 8.251342655300816e-06, 0.178454107077779),
    ];
    // Default tolerance (1e-10) and a tight one (1e-12). The tight bound is scipy's own event
    // accuracy: its event time for the first crossing and its quad of t = ∫C/I dV differ by
    // 1.6e-11 relative (tests/reference/timing_nonlinear_ramp.py).
    for (rtol, t_tol, v_tol) in [(None, 1e-9, 1e-9), (Some(1e-12), 5e-11, 5e-11)] {
        let s = simulate(&o, 3, &Options { rtol, ..Options::default() }).unwrap();
        let ev =
            |k: EventKind| -> Vec<(f64, f64)> { s.events.iter().filter(|e| e.kind == k).map(|e| (e.t, e.v)).collect() };
        let (cr, de, sw) = (ev(EventKind::Crossing), ev(EventKind::Decision), ev(EventKind::Switch));
        assert_eq!((cr.len(), de.len(), sw.len()), (6, 6, 6));
        for (k, r) in reference.iter().enumerate() {
            close(cr[k].0, r.0, t_tol);
            close(de[k].0, r.1, t_tol);
            close(de[k].1, r.2, v_tol);
            close(sw[k].0, r.3, t_tol);
            close(sw[k].1, r.4, v_tol);
        }
    }
}

#[test]
fn steady_state_agrees_with_the_period_model_for_every_topology() {
    // Cross-check against the analytic model (o.period(): ramp quadrature to 1e-12, steady
    // state to 1e-13). The simulation integrates the same parts in time to a 1e-10 relative
    // tolerance with errors against the supply; over ≤ 100 steps per phase that leaves ≲ 1e-9
    // of the period, so 1e-8 is a tight bound that still leaves margin (observed ≤ 2e-10).
    for o in every() {
        let p = o.period().unwrap();
        let cy = o.cycle(Mask::ALL).unwrap();
        let s = sim(&o, 40);
        close(s.period, p, 1e-8);
        assert!((s.duty - cy.duty).abs() < 1e-8, "{:?}: duty {} vs {}", o.kind(), s.duty, cy.duty);
        // The transient from the defined start settles onto the analytic period: every cycle
        // of the second half agrees with it.
        for (k, q) in s.periods.iter().enumerate().skip(20) {
            assert!((q / p - 1.0).abs() < 1e-8, "{:?}: cycle {k} lasts {q} s, analytic {p} s", o.kind());
        }
        assert!(s.settle_cycles <= 20, "{:?}: settles after {} cycles", o.kind(), s.settle_cycles);
    }
}

#[test]
fn first_cycle_is_the_transient_from_the_defined_start() {
    // A window oscillator started at v_lo misses the undershoot below v_lo that the delay chain
    // causes in steady state, so its first cycle is shorter by the time of that undershoot
    // (constant C and I: the undershoot is I·td/C, its time td; charge balance); from the
    // second cycle on it is steady: T = 2·C·ΔV/I + 4·td.
    let (c, i, td) = (1e-12, 1e-6, 7e-9);
    let o = osc(Kind::Window, &[("c", c), ("i", i), ("v_lo", 0.3), ("v_hi", 1.3), ("t_logic", td)]);
    let s = sim(&o, 6);
    close(s.periods[0], 2e-6 + 3.0 * td, 1e-10);
    for p in &s.periods[1..] {
        close(*p, 2e-6 + 4.0 * td, 1e-10);
    }
    assert_eq!(s.settle_cycles, 1);
    // The ping-pong with a slow reset starts both capacitors at 0 V; its residual then builds
    // up over several cycles toward the fixed point of the period model.
    let o = every().pop().unwrap();
    let s = sim(&o, 30);
    assert!(s.settle_cycles >= 2 && s.periods[0] > s.period, "{:?}", &s.periods[..4]);
}

#[test]
fn ideal_mask_is_the_textbook_period() {
    // With every parasitic off the simulation is the ideal circuit: its steady period is the
    // topology's textbook formula (o.ideal_period(), each formula's source in its topology).
    for o in every() {
        let s = simulate_masked(&o, Mask::NONE, 6, &Options::default()).unwrap();
        close(s.period, o.ideal_period().unwrap(), 1e-8);
    }
}

#[test]
fn waveforms_stay_within_physical_bounds() {
    // No NaN; time never runs backwards; current-source nodes stay within the supply and
    // between the analytic cycle's valley and peak (thresholds plus overshoot; the reset
    // level for the resetting kinds); the RC pair's X stays between its kicked extremes.
    for o in every() {
        let cy = o.cycle(Mask::ALL).unwrap();
        let s = simulate(&o, 12, &Options { points_per_phase: Some(200), ..Options::default() }).unwrap();
        let vdd = o.env.vdd;
        let eps = 1e-6 * vdd;
        let (mut lo, hi) = (cy.v_valley, cy.v_peak);
        if matches!(o.kind(), Kind::Reset | Kind::PingPong) {
            lo = lo.min(o.params.get("v_lo").max(0.0).min(cy.v_valley));
            lo = lo.min(0.0);
        }
        assert!(s.t.windows(2).all(|w| w[1] >= w[0]) && s.t.iter().all(|t| t.is_finite()));
        for v in &s.v {
            assert_eq!(v.len(), s.t.len());
            for x in v {
                assert!(
                    x.is_finite() && *x >= lo - eps && *x <= hi + eps,
                    "{:?}: {x} V outside [{lo}, {hi}]",
                    o.kind()
                );
                if o.kind() != Kind::RcInverter {
                    assert!(*x >= -eps && *x <= vdd + eps, "{:?}: {x} V outside the supply", o.kind());
                }
            }
        }
        assert!(s.v_min >= lo - eps && s.v_max <= hi + eps, "{:?}: {} … {} V", o.kind(), s.v_min, s.v_max);
    }
}

#[test]
fn waveform_points_are_bounded_by_the_option() {
    let o = osc(Kind::Reset, &[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0), ("t_reset", 5e-9)]);
    let n = |p: Option<usize>, cycles: usize| {
        simulate(&o, cycles, &Options { points_per_phase: p, ..Options::default() }).unwrap().t.len()
    };
    assert_eq!(n(Some(10), 7), 10 * 2 * 7);
    assert_eq!(n(Some(0), 7), 0);
    assert_eq!(n(None, 3), 64 * 2 * 3);
    // Long runs get fewer points per phase by default (total within 1e6).
    assert!(n(None, 20_000) <= 1_000_000);
}

#[test]
fn bad_arguments_are_named() {
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.2), ("v_hi", 1.0)]);
    let err = |cycles: usize, opts: Options| simulate(&o, cycles, &opts).unwrap_err();
    assert!(err(0, Options::default()).contains("'cycles' must be an integer in 1..=100000"));
    assert!(err(100_001, Options::default()).contains("'cycles'"));
    assert!(err(10, Options { points_per_phase: Some(20_000), ..Options::default() }).contains("'points_per_phase'"));
    assert!(err(100_000, Options { points_per_phase: Some(100), ..Options::default() }).contains("'points_per_phase'"));
    assert!(err(10, Options { v0: Some(2.5), ..Options::default() }).contains("'v0'"));
    assert!(err(10, Options { v0_b: Some(0.5), ..Options::default() }).contains("'v0_b'"));
    assert!(err(10, Options { rtol: Some(0.1), ..Options::default() }).contains("'rtol'"));
}

#[test]
fn script_level_simulation_and_errors() {
    use std::process::Command;
    let run = |code: &str| {
        let dir = tempfile::tempdir().unwrap();
        std::fs::write(dir.path().join("t.rhai"), code).unwrap();
        let o = Command::new(env!("CARGO_BIN_EXE_tickwork"))
            .args(["run", "t.rhai", "--out", "out"])
            .current_dir(dir.path())
            .output()
            .unwrap();
        (
            o.status.success(),
            String::from_utf8_lossy(&o.stdout).to_string(),
            String::from_utf8_lossy(&o.stderr).to_string(),
        )
    };
    // 1 pF, 1.66 V, 1 µA → 3.32 µs (common practice, ping-pong T = 2·C·V_ref/I)
    let (ok, out, err) = run(r#"
let o = osc("pingpong", #{c: 1p, i: 1u, v_hi: 1.66V});
let s = o.simulate(4, #{points_per_phase: 5});
show("period", s.period, "s");
show("points", s.t.len() + s.v2.len());
show("events", s.events.label.len());
show("label", s.events.label[2]);
"#);
    assert!(ok, "{err}");
    assert!(out.contains("period = 3.32 µs") && out.contains("points = 80") && out.contains("events = 24"), "{out}");
    assert!(out.contains("label = capacitor A: switch"), "{out}");
    for (code, msg) in [
        ("o.simulate(0)", "'cycles' must be an integer in 1..=100000, got 0"),
        ("o.simulate(2.5)", "'cycles' must be an integer"),
        ("o.simulate(3, #{points: 4})", "unknown option 'points'"),
        ("o.simulate(3, #{points_per_phase: -1})", "'points_per_phase' must be in 0..=10000"),
        ("o.simulate(3, #{v0: \"low\"})", "option 'v0' must be a number"),
    ] {
        let (ok, _, err) =
            run(&format!("let o = osc(\"window\", #{{c: 1p, i: 1u, v_lo: 0.2, v_hi: 1.0}});\nlet s = {code};\n"));
        assert!(!ok && err.contains(msg), "{code}: {err}");
    }
}

#[test]
fn a_ramp_that_cannot_reach_its_threshold_is_a_clear_error() {
    // A mirror with 100 kΩ output resistance stops sourcing at V = vdd − v_ds_ref + i·r_out =
    // 1.3 V (linear output conductance, common practice), short of the 1.5 V threshold: the node
    // creeps toward 1.3 V for ever. Both models say so instead of returning a number.
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.2), ("v_hi", 1.5), ("r_out", 100e3)]);
    assert!(o.period().is_err());
    let e = simulate(&o, 3, &Options::default()).unwrap_err();
    assert!(e.contains("phase 'charge'") && e.contains("without reaching it"), "{e}");
}

#[test]
fn start_voltage_option_moves_only_the_first_cycle() {
    // Started mid-window the first charge is shorter by C·(v0 − v_lo)/I (charge balance,
    // common practice); the cycles after it are the steady 2·C·ΔV/I.
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.2), ("v_hi", 1.2)]);
    let s = simulate(&o, 4, &Options { v0: Some(0.7), ..Options::default() }).unwrap();
    close(s.periods[0], 2e-6 - 0.5e-6, 1e-12);
    close(s.periods[3], 2e-6, 1e-12);
}
