//! Properties of the period model and the budget: the ideal limit, physical signs of each
//! contribution, exact bookkeeping of the budget, operating-point behaviour.
use tickwork::timing::budget::budget;
use tickwork::timing::{Kind, Mask, Osc, Parasitic};

fn osc(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(kind, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

/// One realistic oscillator of each kind with every parasitic set (invented numbers).
fn loaded() -> Vec<Osc> {
    let cur = [
        ("c", 1e-12),
        ("i", 1e-6),
        ("c_vc1", 0.01),
        ("c_swn", 20e-15),
        ("c_swp", 15e-15),
        ("c_in", 10e-15),
        ("r_out", 20e6),
        ("t_cmp", 2e-9),
        ("cmp_gbw", 200e6),
        ("t_logic", 1e-9),
        ("vdd", 1.8),
    ];
    let with =
        |extra: &[(&'static str, f64)]| -> Vec<(&'static str, f64)> { cur.iter().chain(extra).copied().collect() };
    vec![
        osc(
            Kind::Window,
            &with(&[
                ("v_lo", 0.4),
                ("v_hi", 1.2),
                ("i_mismatch", 0.02),
                ("vos_hi", 2e-3),
                ("vos_lo", -1e-3),
                ("t_latch", 1e-9),
                ("t_sw", 0.3e-9),
            ]),
        ),
        osc(
            Kind::Schmitt,
            &with(&[("v_lo", 0.6), ("v_hi", 1.2), ("i_mismatch", -0.02), ("vos_hi", 1e-3), ("t_sw", 0.3e-9)]),
        ),
        osc(Kind::Schmitt, &with(&[("vtn", 0.45), ("vtp", 0.5), ("ratio_n", 2.0), ("ratio_p", 1.5)])),
        osc(Kind::Reset, &with(&[("v_hi", 1.0), ("vos", 2e-3), ("t_reset", 5e-9), ("r_reset", 2e3)])),
        osc(
            Kind::PingPong,
            &with(&[
                ("v_hi", 1.0),
                ("vos", 2e-3),
                ("c_mismatch", 0.01),
                ("t_latch", 1e-9),
                ("t_sw", 0.3e-9),
                ("r_reset", 5e3),
            ]),
        ),
        osc(Kind::RcInverter, &[("c", 1e-12), ("r", 500e3), ("c_in", 30e-15), ("vos", 0.05), ("t_logic", 2e-9)]),
        osc(
            Kind::Schmitt,
            &[("c", 1e-12), ("r", 500e3), ("v_lo", 0.6), ("v_hi", 1.2), ("c_in", 30e-15), ("t_cmp", 3e-9)],
        ),
    ]
}

#[test]
fn all_parasitics_off_is_the_ideal_period() {
    for o in loaded() {
        let t = o.cycle(Mask::NONE).unwrap().period;
        let ideal = o.ideal_period().unwrap();
        assert!((t - ideal).abs() <= 1e-9 * ideal, "{:?}: {t} vs ideal {ideal}", o.kind());
        assert!((o.period().unwrap() - ideal).abs() > 1e-6 * ideal, "{:?}: the parasitics should matter", o.kind());
    }
}

#[test]
fn basic_keys_only_is_the_ideal_circuit() {
    let cases = [
        osc(Kind::Window, &[("c", 3e-12), ("i", 2e-6), ("v_lo", 0.5), ("v_hi", 1.0)]),
        osc(Kind::Schmitt, &[("c", 3e-12), ("i", 2e-6), ("v_lo", 0.5), ("v_hi", 1.0)]),
        osc(Kind::Schmitt, &[("c", 3e-12), ("r", 1e5), ("v_lo", 0.5), ("v_hi", 1.0)]),
        osc(Kind::Reset, &[("c", 3e-12), ("i", 2e-6), ("v_hi", 1.0)]),
        osc(Kind::PingPong, &[("c", 3e-12), ("i", 2e-6), ("v_lo", 0.1), ("v_hi", 1.0)]),
        osc(Kind::RcInverter, &[("c", 3e-12), ("r", 1e5), ("v_th", 0.7)]),
    ];
    for o in cases {
        let (t, ideal) = (o.period().unwrap(), o.ideal_period().unwrap());
        assert!((t - ideal).abs() <= 1e-9 * ideal, "{:?}: {t} vs {ideal}", o.kind());
        assert!(o.active().is_empty());
    }
}

/// Period change when parasitic `p` alone is switched on.
fn alone(o: &Osc, p: Parasitic) -> f64 {
    o.cycle(Mask::only(p)).unwrap().period - o.ideal_period().unwrap()
}

#[test]
fn each_contribution_has_its_physical_sign() {
    use Parasitic::*;
    // Delays lengthen; added node capacitance lengthens; a positive voltage coefficient adds
    // capacitance; a widened window lengthens (charge balance).
    for o in loaded() {
        for p in o.active() {
            let d = alone(&o, p);
            match p {
                CmpDelay | LogicDelay | SwitchDelay | SwitchCap | InputCap | CapVc => {
                    assert!(d > 0.0, "{:?} {p:?}: {d}", o.kind())
                }
                _ => {}
            }
        }
    }
    let w = |extra: &[(&'static str, f64)]| {
        let base: Vec<(&str, f64)> = [("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2)]
            .into_iter()
            .chain(extra.iter().copied())
            .collect();
        osc(Kind::Window, &base)
    };
    // Offsets that widen the window lengthen the period, offsets that narrow it shorten it.
    assert!(alone(&w(&[("vos_hi", 3e-3), ("vos_lo", -3e-3)]), Offset) > 0.0);
    assert!(alone(&w(&[("vos_hi", -3e-3)]), Offset) < 0.0);
    // A stronger discharge current shortens the period; a weaker one lengthens it.
    assert!(alone(&w(&[("i_mismatch", 0.05)]), Mismatch) < 0.0);
    assert!(alone(&w(&[("i_mismatch", -0.05)]), Mismatch) > 0.0);
    // Mirrors matched at |Vds| above every operating point deliver less than nominal: longer.
    assert!(alone(&w(&[("r_out", 5e6), ("v_ds_ref", 1.6)]), MirrorRout) > 0.0);
    // A reset pulse adds its width; an incomplete reset starts the next ramp higher: shorter.
    let r = osc(Kind::Reset, &[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0), ("t_reset", 10e-9)]);
    assert!((alone(&r, Reset) - 10e-9).abs() < 1e-18);
    let pp = osc(Kind::PingPong, &[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0), ("r_reset", 300e3)]);
    assert!(alone(&pp, Reset) < 0.0);
    // A resistor that grows with the voltage across it slows the RC ramps.
    let rc = osc(Kind::RcInverter, &[("c", 1e-12), ("r", 1e5), ("r_vc", 0.02)]);
    assert!(alone(&rc, ResVc) > 0.0);
    // Ping-pong: a larger second capacitor lengthens its ramp.
    let pp = osc(Kind::PingPong, &[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0), ("c_mismatch", 0.02)]);
    assert!((alone(&pp, CapMismatch) - 0.02 * 1e-6).abs() < 1e-15);
    // A faster comparator (higher gain-bandwidth) has less delay.
    let slow = w(&[("cmp_gbw", 50e6)]);
    let fast = w(&[("cmp_gbw", 500e6)]);
    assert!(alone(&slow, CmpDelay) > alone(&fast, CmpDelay));
}

#[test]
fn budget_adds_up_exactly() {
    for o in loaded() {
        let b = budget(&o).unwrap();
        let total = b.total_error();
        let eps = 1e-14 * b.ideal;
        // Contributions plus the interaction remainder are the total error.
        assert!((b.sum_alone + b.remainder - total).abs() <= eps, "{:?}", o.kind());
        // The sequential build-up telescopes to the total error and ends on the full period.
        let steps: f64 = b.rows.iter().map(|r| r.step).sum();
        assert!((steps - total).abs() <= eps, "{:?}: steps {steps} vs {total}", o.kind());
        assert_eq!(b.rows.last().unwrap().cumulative, b.full);
        assert_eq!(b.full, o.period().unwrap());
        // The comparator scenario lies between ideal-ish and full: it removes real effects.
        assert!(b.ideal_comparators.is_finite() && b.ideal_delay_chain < b.full, "{:?}", o.kind());
    }
}

#[test]
fn operating_point_moves_the_period() {
    // Linear tempco of the current (common practice, first-order): T(125 °C)/T(27 °C) = 1/(1 + tc·98 K).
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2), ("tc_i", 1e-3)]);
    let hot = o.at(Some(125.0), None, None).unwrap();
    let r = hot.period().unwrap() / o.period().unwrap();
    assert!((r - 1.0 / 1.098).abs() < 1e-12);
    // The two-inverter astable at vdd/2 does not depend on the supply (the ratio form of its
    // formula); a finite-r_out window does.
    let inv = osc(Kind::RcInverter, &[("c", 1e-12), ("r", 1e5)]);
    let (a, b) = (inv.period().unwrap(), inv.at(None, Some(1.6), None).unwrap().period().unwrap());
    assert!((a - b).abs() < 1e-12 * a);
    let w = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2), ("r_out", 5e6)]);
    assert!(w.at(None, Some(2.0), None).unwrap().period().unwrap() < w.period().unwrap());
    // Explicit numbers know only the typical corner.
    let e = o.at(None, None, Some("ss")).unwrap_err();
    assert!(e.contains("corner 'ss'") && e.contains("typical"), "{e}");
    // Schmitt thresholds from devices move with Vth(T): with unit ratios the hysteresis is
    // (Vtn + |Vtp|)/2 (Filanovsky–Baltes expressions), so a Vth falling with temperature
    // narrows the window and shortens the period.
    let s = osc(
        Kind::Schmitt,
        &[
            ("c", 1e-12),
            ("i", 1e-6),
            ("vtn", 0.45),
            ("vtp", 0.45),
            ("ratio_n", 1.0),
            ("ratio_p", 1.0),
            ("tc_vt", -1e-3),
        ],
    );
    let (hot, room) = (s.at(Some(125.0), None, None).unwrap().period().unwrap(), s.period().unwrap());
    assert!((hot / room - (0.45 - 0.098) / 0.45).abs() < 1e-9, "{hot} {room}");
}

#[test]
fn bad_input_is_named() {
    let bad = |kind: Kind, keys: &[(&str, f64)]| {
        let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
        Osc::new(kind, &pairs).unwrap_err()
    };
    let e = bad(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2), ("r", 1e3)]);
    assert!(e.contains("unknown key 'r'") && e.contains("c, i, v_lo, v_hi"), "{e}");
    let e = bad(Kind::Window, &[("c", -1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2)]);
    assert!(e.contains("osc(\"window\"): key 'c' (timing capacitance) = -1 pF is out of range (0, 1 mF]"), "{e}");
    let e = bad(Kind::Window, &[("c", 1e-12), ("v_lo", 0.4), ("v_hi", 1.2)]);
    assert!(e.contains("'i' is required"), "{e}");
    let e = bad(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 1.4), ("v_hi", 1.2)]);
    assert!(e.contains("'v_lo'") && e.contains("below 'v_hi'"), "{e}");
    let e = bad(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2), ("i_mismatch", f64::NAN)]);
    assert!(e.contains("'i_mismatch'"), "{e}");
    let e = bad(Kind::Schmitt, &[("c", 1e-12), ("i", 1e-6), ("r", 1e5), ("v_lo", 0.4), ("v_hi", 1.2)]);
    assert!(e.contains("either 'i'"), "{e}");
    assert!(Kind::parse("relax").unwrap_err().contains("rc-inverter, schmitt, window, reset, pingpong"));
    // A delay chain so slow that the node would leave the supply is an error, not a number.
    let o = osc(Kind::Window, &[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.1), ("v_hi", 1.7), ("t_logic", 500e-9)]);
    assert!(o.period().unwrap_err().contains("outside the supply"));
}
