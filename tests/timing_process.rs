//! Oscillators built from the devices of the demo process (physics models): the ideal limit,
//! budget bookkeeping, and corners moving the period the way the process file says.
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::timing::budget::budget;
use tickwork::timing::from_process::{osc_from, Choices};
use tickwork::timing::{Kind, Mask, Osc};

fn build(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode };
    osc_from(&Process::demo180(), kind, ch, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

fn all() -> Vec<Osc> {
    vec![
        build(Kind::Window, &[("c", 250e-15), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0), ("t_latch", 0.3e-9), ("t_logic", 0.3e-9)]),
        build(Kind::PingPong, &[("c", 125e-15), ("i", 1e-6), ("v_hi", 1.0), ("t_latch", 0.3e-9)]),
        build(Kind::Reset, &[("c", 250e-15), ("i", 1e-6), ("v_hi", 1.0), ("t_reset", 5e-9)]),
        build(Kind::Schmitt, &[("c", 250e-15), ("i", 1e-6), ("t_cmp", 1e-9)]),
    ]
}

#[test]
fn physics_parts_off_is_the_ideal_period() {
    for o in all() {
        let (t, ideal) = (o.cycle(Mask::NONE).unwrap().period, o.ideal_period().unwrap());
        assert!((t - ideal).abs() <= 1e-9 * ideal, "{:?}: {t} vs {ideal}", o.kind());
        // Real devices always cost something: junctions, input pairs, finite output resistance.
        assert!(o.period().unwrap() > ideal, "{:?}", o.kind());
    }
}

#[test]
fn process_budget_adds_up() {
    for o in all() {
        let b = budget(&o).unwrap();
        assert!((b.sum_alone + b.remainder - b.total_error()).abs() <= 1e-14 * b.ideal);
        let steps: f64 = b.rows.iter().map(|r| r.step).sum();
        assert!((steps - b.total_error()).abs() <= 1e-14 * b.ideal);
        assert!(!b.rows.is_empty());
    }
}

#[test]
fn corners_scale_the_capacitor_as_the_process_file_says() {
    // demo180.toml: corner ss has cap = 1.10, ff has cap = 0.90 (invented numbers); the ideal
    // period C·ΔV/I scales with them (charge balance, common practice).
    let pr = Process::demo180();
    let (ss, ff) = (&pr.corners["ss"], &pr.corners["ff"]);
    let o = &all()[0];
    let t0 = o.ideal_period().unwrap();
    let slow = o.at(None, None, Some("ss")).unwrap();
    let fast = o.at(None, None, Some("ff")).unwrap();
    assert!((slow.ideal_period().unwrap() / t0 - ss.cap).abs() < 1e-12);
    assert!((fast.ideal_period().unwrap() / t0 - ff.cap).abs() < 1e-12);
    // Slow devices and a larger capacitor lengthen the real period too.
    assert!(slow.period().unwrap() > o.period().unwrap() && o.period().unwrap() > fast.period().unwrap());
    // A corner that fixes its own temperature and supply brings them along.
    let hot = o.at(None, None, Some("ss_hot_low")).unwrap();
    assert_eq!((hot.env.temp_c, hot.env.vdd), (pr.corners["ss_hot_low"].temp, pr.corners["ss_hot_low"].vdd));
}

#[test]
fn schmitt_thresholds_follow_the_process_threshold_voltages() {
    // Filanovsky & Baltes 1994 switching points with unit ratios: the hysteresis is
    // (VTN + |VTP|)/2, so at corner ss (both thresholds +40 mV in demo180.toml, invented) the
    // ideal period grows by the hysteresis ratio times the capacitor factor.
    let pr = Process::demo180();
    let o = &all()[3];
    let (vtn, vtp) = (pr.nmos.vth0, pr.pmos.vth0);
    let ss = &pr.corners["ss"];
    let h0 = 0.5 * (vtn + vtp);
    let h1 = 0.5 * (vtn + ss.nmos_dvth + vtp + ss.pmos_dvth);
    let r = o.at(None, None, Some("ss")).unwrap().ideal_period().unwrap() / o.ideal_period().unwrap();
    assert!((r - h1 / h0 * ss.cap).abs() < 1e-12, "{r} vs {}", h1 / h0 * ss.cap);
}

#[test]
fn process_keys_are_checked() {
    let ch = || Choices { cap_type: "mim".into(), mirror: MirrorKind::Simple };
    let pr = Process::demo180();
    let p = |k: &[(&str, f64)]| k.iter().map(|(a, b)| (a.to_string(), *b)).collect::<Vec<_>>();
    let e = osc_from(&pr, Kind::Window, ch(), &p(&[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0), ("c_swn", 1e-15)])).unwrap_err();
    assert!(e.contains("unknown key 'c_swn'") && e.contains("mirror_w"), "{e}");
    let e = osc_from(&pr, Kind::RcInverter, ch(), &p(&[("c", 1e-12), ("r", 1e5)])).unwrap_err();
    assert!(e.contains("rc-inverter") && e.contains("explicit numbers"), "{e}");
    let e = osc_from(&pr, Kind::Reset, ch(), &p(&[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0)])).unwrap_err();
    assert!(e.contains("'t_reset'"), "{e}");
    let bad = Choices { cap_type: "glass".into(), mirror: MirrorKind::Simple };
    assert!(osc_from(&pr, Kind::Window, bad, &p(&[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0)])).is_err());
}
