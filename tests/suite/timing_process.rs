//! Oscillators built from the devices of the demo process (physics models): the ideal limit,
//! budget bookkeeping, and corners moving the period the way the process file says.
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::timing::budget::budget;
use tickwork::timing::from_process::{Choices, osc_from};
use tickwork::timing::{Kind, Mask, Osc};

fn build(kind: Kind, keys: &[(&str, f64)]) -> Osc {
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode, res_type: "rpoly".into() };
    osc_from(&Process::demo180(), kind, ch, &pairs).unwrap_or_else(|e| panic!("{e}"))
}

fn all() -> Vec<Osc> {
    vec![
        build(
            Kind::Window,
            &[("c", 250e-15), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0), ("t_latch", 0.3e-9), ("t_logic", 0.3e-9)],
        ),
        build(Kind::PingPong, &[("c", 125e-15), ("i", 1e-6), ("v_hi", 1.0), ("t_latch", 0.3e-9)]),
        build(Kind::Reset, &[("c", 250e-15), ("i", 1e-6), ("v_hi", 1.0), ("t_reset", 5e-9)]),
        build(Kind::Schmitt, &[("c", 250e-15), ("i", 1e-6), ("t_cmp", 1e-9)]),
        build(Kind::RcInverter, &[("c", 1e-12), ("r", 100e3), ("c_in", 5e-15), ("t_logic", 1e-9)]),
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
    let ch = || Choices { cap_type: "mim".into(), mirror: MirrorKind::Simple, res_type: "rpoly".into() };
    let pr = Process::demo180();
    let p = |k: &[(&str, f64)]| k.iter().map(|(a, b)| (a.to_string(), *b)).collect::<Vec<_>>();
    let e = osc_from(
        &pr,
        Kind::Window,
        ch(),
        &p(&[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0), ("c_swn", 1e-15)]),
    )
    .unwrap_err();
    assert!(e.contains("unknown key 'c_swn'") && e.contains("mirror_w"), "{e}");
    let e = osc_from(&pr, Kind::RcInverter, ch(), &p(&[("c", 1e-12), ("r", 1e5), ("v_th", 0.9)])).unwrap_err();
    assert!(e.contains("unknown key 'v_th'") && e.contains("inv_wn"), "{e}");
    let e = osc_from(&pr, Kind::Reset, ch(), &p(&[("c", 1e-12), ("i", 1e-6), ("v_hi", 1.0)])).unwrap_err();
    assert!(e.contains("'t_reset'"), "{e}");
    let bad = Choices { cap_type: "glass".into(), mirror: MirrorKind::Simple, res_type: "rpoly".into() };
    assert!(osc_from(&pr, Kind::Window, bad, &p(&[("c", 1e-12), ("i", 1e-6), ("v_lo", 0.5), ("v_hi", 1.0)])).is_err());
}

#[test]
fn inverter_threshold_and_resistor_come_from_the_process() {
    // Two-inverter astable T = RC·[ln((V_DD+V_M)/V_M) + ln((2V_DD−V_M)/(V_DD−V_M))] with the
    // inverter threshold V_M = (V_TN + r(V_DD − |V_TP|))/(1 + r), r = √(βp/βn) (Rabaey, Digital
    // Integrated Circuits, ch. 5), R and C scaled by the corner's res and cap factors
    // (demo180.toml, invented numbers): recomputed here from the process parameters.
    use tickwork::physics::mosfet::{Mos, MosType};
    let pr = Process::demo180();
    let o = build(Kind::RcInverter, &[("c", 1e-12), ("r", 100e3)]);
    let formula = |pr: &Process, r: f64, c: f64| {
        let (n, p) = (
            Mos::from_process(pr, MosType::N, 1e-6, 0.18e-6).unwrap(),
            Mos::from_process(pr, MosType::P, 2e-6, 0.18e-6).unwrap(),
        );
        let k = (p.beta(27.0) / n.beta(27.0)).sqrt();
        let vm = (n.vt(27.0) + k * (pr.vdd - p.vt(27.0))) / (1.0 + k);
        let vdd = pr.vdd;
        r * c * (((vdd + vm) / vm).ln() + ((2.0 * vdd - vm) / (vdd - vm)).ln())
    };
    let t = formula(&pr, 100e3, 1e-12);
    assert!((o.ideal_period().unwrap() / t - 1.0).abs() < 1e-12);
    let ss = pr.at_corner("ss").unwrap();
    let t_ss = formula(&ss, 100e3 * ss.res_scale, 1e-12 * ss.cap_scale);
    assert!((o.at(None, None, Some("ss")).unwrap().ideal_period().unwrap() / t_ss - 1.0).abs() < 1e-12);
}

#[test]
fn process_contributions_have_their_physical_sign() {
    use tickwork::timing::Parasitic::*;
    // Added node capacitance and every delay lengthen the period (charge balance; the delay
    // chain only adds time).
    for o in all() {
        for r in budget(&o).unwrap().rows {
            if matches!(r.parasitic, SwitchCap | InputCap | CmpDelay | LogicDelay | SwitchDelay) {
                assert!(r.alone > 0.0, "{:?} {:?}: {}", o.kind(), r.parasitic, r.alone);
            }
        }
    }
}
