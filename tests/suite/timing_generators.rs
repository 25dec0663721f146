//! References as key values (`ptat`, `ctat`, `constant_gm`, `ladder`, `bandgap`): their
//! formulas against outside sources, what they do to the period, their budget rows, and the
//! transient agreeing with the period model with them on. Each check names its source.
use crate::cli_util::{eval, eval_f64};
use tickwork::physics::constants::thermal_voltage;
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::physics::reference::{Bipolar, constant_gm_current, delta_vbe};
use tickwork::timing::from_process::{Choices, osc_from_refs};
use tickwork::timing::process_refs::{CurrentChoice, ThresholdChoice};
use tickwork::timing::reference::Reference;
use tickwork::timing::transient::{Options, simulate};
use tickwork::timing::{Kind, Mask, Osc, Parasitic};

fn close(a: f64, b: f64, rtol: f64) {
    assert!((a - b).abs() <= rtol * b.abs(), "{a} vs reference {b} (rtol {rtol}, off by {:.2e})", a / b - 1.0);
}

fn pairs(keys: &[(&str, f64)]) -> Vec<(String, f64)> {
    keys.iter().map(|(k, v)| (k.to_string(), *v)).collect()
}

fn with_refs(kind: Kind, keys: &[(&str, f64)], refs: &[(&str, Reference)]) -> Osc {
    let refs: Vec<(String, Reference)> = refs.iter().map(|(k, r)| (k.to_string(), r.clone())).collect();
    Osc::new_with(kind, &pairs(keys), &refs).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn ptat_delta_vbe_is_ut_ln_n() {
    // ΔVbe = U_T·ln N (Gray, Hurst, Lewis & Meyer §4.4.3); values from scipy's CODATA constants,
    // tests/reference/reference_generators.py.
    close(delta_vbe(8.0, -40.0), 0.04177870984080925, 1e-14);
    close(delta_vbe(8.0, 27.0), 0.053784601152558, 1e-14);
    close(delta_vbe(8.0, 125.0), 0.07134545710108602, 1e-14);
    close(delta_vbe(8.0, 27.0), thermal_voltage(27.0) * 8f64.ln(), 1e-15);
}

#[test]
fn beta_multiplier_current_is_the_textbook_formula() {
    // Razavi, Design of Analog CMOS ICs §12.3: I = 2(1 − 1/√K)²/(µCox·W/L·R²); the loop
    // equation solved by brentq in tests/reference/reference_generators.py gives 1.6666…e-8 A
    // for kp = 300 µA/V², W/L = 10, R = 100 kΩ, K = 4.
    close(constant_gm_current(300e-6, 10.0, 100e3, 4.0), 1.6666666666666664e-08, 1e-12);
    let r = Reference::constant_gm(300e-6, 1.5, 10.0, 4.0, 100e3, 0.0).unwrap();
    close(r.nominal(), 1.6666666666666664e-08, 1e-12);
    // With kp ∝ T^−1.5 and a zero-tempco resistor, I ∝ T^1.5 (the formula's 1/µ).
    close(r.at(125.0, 1.8) / r.nominal(), ((125.0 + 273.15) / 300.15f64).powf(1.5), 1e-12);
}

#[test]
fn tsividis_vbe_matches_the_diode_law() {
    // Tsividis (IEEE JSSC 1980) against Vbe = U_T·ln(Ic/Is) with Is ∝ T^3.5·exp(−q·1.17 V/kT),
    // Ic ∝ T^0.5 (η = 3): tests/reference/reference_generators.py.
    let b = Bipolar { vbe_ref: 0.65, vg0: 1.17, eta: 3.0, t_ref: 27.0 };
    close(b.vbe(-40.0), 0.7813005119745511, 1e-12);
    close(b.vbe(125.0), 0.45113579043390223, 1e-12);
}

#[test]
fn a_ladder_window_scales_exactly_with_the_supply() {
    // Thresholds k·vdd from a ladder, ideal current: T = 2·C·(k_hi − k_lo)·vdd/I (charge
    // balance, common practice), at every supply.
    let o = with_refs(
        Kind::Window,
        &[("c", 1e-12), ("i", 1e-6), ("vdd", 1.8)],
        &[("v_lo", Reference::ladder(0.25).unwrap()), ("v_hi", Reference::ladder(0.75).unwrap())],
    );
    for vdd in [1.6, 1.8, 2.0, 3.3] {
        let t = o.at(None, Some(vdd), None).unwrap().period().unwrap();
        close(t, 2.0 * 1e-12 * 0.5 * vdd / 1e-6, 1e-12);
    }
}

#[test]
fn a_ptat_current_gives_the_tempco_of_one_over_t() {
    // I ∝ T (ΔVbe/R with a zero-tempco resistor) and fixed thresholds: T_period ∝ 1/T.
    let o = with_refs(
        Kind::Window,
        &[("c", 1e-12), ("v_lo", 0.4), ("v_hi", 1.2)],
        &[("i", Reference::ptat(750e-9, 0.0, 0.0).unwrap())],
    );
    let p27 = o.period().unwrap();
    close(p27, 2.0 * 1e-12 * 0.8 / 750e-9, 1e-12);
    for t in [-40.0, 0.0, 85.0, 125.0] {
        let p = o.at(Some(t), None, None).unwrap().period().unwrap();
        close(p / p27, 300.15 / (t + 273.15), 1e-12);
    }
}

#[test]
fn the_reference_is_a_budget_row_and_ideal_when_off() {
    let o = with_refs(
        Kind::Window,
        &[("c", 1e-12), ("v_lo", 0.4), ("v_hi", 1.2), ("temp", 125.0)],
        &[("i", Reference::ptat(750e-9, 0.0, 0.0).unwrap())],
    );
    assert_eq!(o.active(), vec![Parasitic::CurrentRef]);
    let ideal = 2.0 * 1e-12 * 0.8 / 750e-9;
    close(o.cycle(Mask::NONE).unwrap().period, ideal, 1e-12);
    close(o.ideal_period().unwrap(), ideal, 1e-12);
    let b = tickwork::timing::budget::budget(&o).unwrap();
    assert_eq!(b.rows.len(), 1);
    close(b.rows[0].alone, ideal * (300.15 / 398.15 - 1.0), 1e-10);
    // A new nominal value scales the reference and keeps its law.
    let m = o.with(&pairs(&[("i", 1.5e-6)])).unwrap();
    close(m.period().unwrap(), ideal / 2.0 * 300.15 / 398.15, 1e-12);
}

#[test]
fn the_transient_agrees_with_the_period_with_references_on() {
    // Two independent solutions of the same model (see timing_transient.rs), with a mixed
    // current reference, a ladder and a bandgap threshold, away from their nominal point.
    let mix = Reference::ptat(400e-9, 0.0, 0.0).unwrap().plus(&Reference::ctat(350e-9, -3e-3).unwrap()).unwrap();
    let bg = Reference::bandgap(0.9, 2e-5, 0.0, 40.0).unwrap();
    let base = [("c", 1e-12), ("c_in", 10e-15), ("t_cmp", 1e-9), ("r_out", 5e6), ("vdd", 1.8)];
    let all = [
        with_refs(
            Kind::Window,
            &base,
            &[("i", mix.clone()), ("v_lo", Reference::ladder(0.25).unwrap()), ("v_hi", bg.clone())],
        ),
        with_refs(Kind::Reset, &base, &[("i", mix.clone()), ("v_hi", Reference::ladder(0.5).unwrap())]),
        with_refs(Kind::PingPong, &base, &[("i", mix.clone()), ("v_hi", bg.clone())]),
        with_refs(Kind::Schmitt, &base[..3], &[("i", mix), ("v_lo", Reference::ladder(0.3).unwrap()), ("v_hi", bg)]),
    ];
    for o in all {
        let o = o.at(Some(125.0), Some(2.0), None).unwrap();
        let p = o.period().unwrap();
        let s = simulate(&o, 40, &Options::default()).unwrap();
        close(s.period, p, 1e-8);
        assert!(
            (p / o.cycle(Mask::NONE).unwrap().period - 1.0).abs() > 1e-3,
            "{:?}: the references moved nothing",
            o.kind()
        );
    }
}

#[test]
fn references_from_a_script() {
    // ptat at 125 °C: i27·398.15/300.15 (proportional to absolute temperature).
    let r = eval_f64("ptat(750n).at(125, 1.8)");
    close(r, 750e-9 * 398.15 / 300.15, 1e-14);
    let r = eval_f64("(ptat(400n) + ctat(350n, -2m)).at(-40, 1.8)");
    close(r, 400e-9 * 233.15 / 300.15 + 350e-9 * (1.0 + 2e-3 * 67.0), 1e-14);
    let t = eval_f64(
        r#"let o = osc("window", #{c: 1p, i: 1u, v_lo: ladder(0.25), v_hi: ladder(0.75), vdd: 1.8});
           o.at(#{vdd: 2.0}).period()"#,
    );
    close(t, 2.0 * 1e-12 * 0.5 * 2.0 / 1e-6, 1e-12);
    // bandgap: v + Δvdd·10^(−psrr/20): 40 dB → 1 % of the supply step.
    close(eval_f64("bandgap(1.2, #{psrr: 40}).at(27, 2.8)"), 1.2 + 0.01, 1e-12);
    let d = eval(r#"osc("window", #{c: 1p, i: ptat(1u), v_lo: 0.4, v_hi: ladder(0.7)}).to_string()"#).unwrap();
    assert!(d.to_string().contains("i = ptat(1 µA)") && d.to_string().contains("v_hi = ladder(0.7)"), "{d}");
}

#[test]
fn bad_references_are_named() {
    let e = eval("ladder(1.2)").unwrap_err();
    assert!(e.contains("ladder ratio 1.2 is outside 0..1"), "{e}");
    let e = eval("constant_gm(#{r: 100k, kp: 300u, w: 10u, l: 1u, k: 1})").unwrap_err();
    assert!(e.contains("cannot start up") && e.contains("k = 1"), "{e}");
    let e = eval(r#"osc("window", #{c: 1p, i: ladder(0.5), v_lo: 0.4, v_hi: 1.2})"#).unwrap_err();
    assert!(e.contains("key 'i'") && e.contains("cannot take the reference ladder(0.5)"), "{e}");
    let e = eval("ctat(1u, 0.01)").unwrap_err();
    assert!(e.contains("ctat: tc = 0.01"), "{e}");
    // A ladder above the other threshold at the operating point.
    let e = eval(r#"osc("window", #{c: 1p, i: 1u, v_lo: 1.0, v_hi: ladder(0.5)})"#).unwrap_err();
    assert!(e.contains("must be below 'v_hi'"), "{e}");
    let e = eval("ptat(1u) + ladder(0.5)").unwrap_err();
    assert!(e.contains("only current references add up"), "{e}");
}

fn demo_refs(current: Option<CurrentChoice>, thresholds: Option<ThresholdChoice>) -> Osc {
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode, res_type: "rpoly".into() };
    let keys = pairs(&[("c", 250e-15), ("i", 1.2e-6), ("v_lo", 0.5), ("v_hi", 1.1)]);
    osc_from_refs(&Process::demo180(), Kind::Window, ch, &keys, &[], current, thresholds)
        .unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn process_references_follow_their_devices() {
    // ΔVbe/R on rpoly (demo180: tc1 = −1.2e-3 /K, tc2 = 1e-6 /K², invented): I ∝ T/R(T), so with
    // only the reference on, T_period/T_ideal = (300.15/398.15)·R(125 °C)/R(27 °C) at 125 °C.
    let o = demo_refs(Some(CurrentChoice::Ptat { res_type: "rpoly".into() }), None);
    let h = o.at(Some(125.0), None, None).unwrap();
    let r = 1.0 - 1.2e-3 * 98.0 + 1e-6 * 98.0 * 98.0;
    close(
        h.cycle(Mask::only(Parasitic::CurrentRef)).unwrap().period / h.ideal_period().unwrap(),
        300.15 / 398.15 * r,
        1e-10,
    );
    // The ss corner's resistor factor 1.15 lowers the current by 1/1.15.
    let s = o.at(None, None, Some("ss")).unwrap();
    close(s.cycle(Mask::only(Parasitic::CurrentRef)).unwrap().period / s.ideal_period().unwrap(), 1.15, 1e-10);
    // A ladder from the supply: the window scales with vdd (charge balance).
    let l = demo_refs(None, Some(ThresholdChoice::Ladder)).at(None, Some(2.0), None).unwrap();
    close(l.cycle(Mask::only(Parasitic::ThresholdRef)).unwrap().period / l.ideal_period().unwrap(), 2.0 / 1.8, 1e-10);
    // A first-order bandgap of the bipolar has zero slope at 27 °C: a small central difference
    // of the thresholds' factor is second order.
    let b = demo_refs(None, Some(ThresholdChoice::Bandgap { tc: 0.0, psrr: f64::INFINITY }));
    let f = |t: f64| {
        let o = b.at(Some(t), None, None).unwrap();
        o.cycle(Mask::only(Parasitic::ThresholdRef)).unwrap().period / o.ideal_period().unwrap()
    };
    assert!(((f(28.0) - f(26.0)) / 2.0).abs() < 1e-6, "{}", f(28.0) - f(26.0));
    // Every parasitic on: the transient agrees with the period model.
    let o = demo_refs(
        Some(CurrentChoice::Mix { ptat: 0.45, res_type: "rpoly".into() }),
        Some(ThresholdChoice::Bandgap { tc: 0.0, psrr: 40.0 }),
    )
    .at(Some(125.0), Some(2.0), None)
    .unwrap();
    close(simulate(&o, 40, &Options::default()).unwrap().period, o.period().unwrap(), 1e-8);
    let e = eval(r#"osc_from("demo180", "window", #{c: 250f, i: 1u, v_lo: 0.5, v_hi: 1.1, reference: #{kind: "constant_gm", k: 1}})"#).unwrap_err();
    assert!(e.contains("cannot start up"), "{e}");
}
