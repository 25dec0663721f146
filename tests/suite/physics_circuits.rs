//! Switches, mirrors and comparators: textbook limits, monotonicity and continuity over the
//! operating range, and clear errors for bad parameters.
use tickwork::physics::comparator::{Comparator, ComparatorSpec, PairDesign, pair_tradeoff};
use tickwork::physics::mirror::{Mirror, MirrorKind, pair_mismatch};
use tickwork::physics::mismatch::{current_sigma, offset_sigma};
use tickwork::physics::mosfet::{Mos, MosType};
use tickwork::physics::process::Process;
use tickwork::physics::switch::{Switch, SwitchKind};

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

fn volts(a: f64, b: f64, n: usize) -> impl Iterator<Item = f64> {
    (0..=n).map(move |k| a + (b - a) * k as f64 / n as f64)
}

#[test]
fn switch_on_resistance_versus_signal() {
    // Razavi ch. 12: the NMOS switch's Ron rises with the signal (less overdrive, body effect),
    // the PMOS's falls, the transmission gate is below both.
    let p = Process::demo180();
    let n = Switch::from_process(&p, SwitchKind::N, 1e-6, 1e-6, 0.18e-6).unwrap();
    let s = Switch::from_process(&p, SwitchKind::P, 2e-6, 2e-6, 0.18e-6).unwrap();
    let tg = Switch::from_process(&p, SwitchKind::Tg, 1e-6, 2e-6, 0.18e-6).unwrap();
    let (mut ln, mut lp) = (0.0, f64::INFINITY);
    for v in volts(0.0, 1.8, 360) {
        let (rn, rp, rt) = (n.ron(v), s.ron(v), tg.ron(v));
        assert!(rn.is_finite() && rp.is_finite() && rt.is_finite());
        assert!(rn > ln && rp < lp, "at {v}");
        assert!(rt < rn.min(rp) && rel(1.0 / rt, 1.0 / rn + 1.0 / rp) < 1e-12);
        ln = rn;
        lp = rp;
    }
    // Strong-inversion check of the NMOS at v_sig = 0: 1/(β(VDD − VT)) (Razavi ch. 2).
    let m = Mos::from_process(&p, MosType::N, 1e-6, 0.18e-6).unwrap();
    assert!(rel(n.ron(0.0), 1.0 / (m.beta(27.0) * (1.8 - m.vt(27.0)))) < 0.03);
}

#[test]
fn switch_node_capacitance_versus_node_voltage() {
    let p = Process::demo180();
    let off = Switch::from_process(&p, SwitchKind::N, 2e-6, 2e-6, 0.18e-6).unwrap();
    let on = off.with_on(true);
    let mut last = f64::INFINITY;
    for v in volts(-0.3, 2.1, 240) {
        let c = off.node_cap(v);
        // Off NMOS: reverse bias grows with v, so the junction part shrinks (Sze).
        assert!(c.is_finite() && c > 0.0 && c < last, "at {v}");
        last = c;
        // On adds the channel's share while the channel conducts (signal well below VDD − VT with body effect).
        assert!(on.node_cap(v) >= c && (v > 0.7 || on.node_cap(v) > c + 0.5e-15), "at {v}");
    }
    let tg = Switch::from_process(&p, SwitchKind::Tg, 2e-6, 2e-6, 0.18e-6).unwrap();
    assert!(volts(0.0, 1.8, 50).all(|v| tg.node_cap(v).is_finite()));
    assert!(Switch::explicit(0.0, 1e-15, 0.0, 0.0, 1.8).unwrap_err().contains("ron must be > 0"));
    assert!(Switch::explicit(1e3, -1e-15, 0.0, 0.0, 1.8).unwrap_err().contains("c_node"));
    assert!(off.at(1.8, 500.0).unwrap_err().contains("temp"));
}

fn mirror(kind: MirrorKind, ty: MosType) -> Mirror {
    Mirror::from_process(&Process::demo180(), kind, ty, 1e-6, 1.0, 4e-6, 2e-6, 0.1).unwrap()
}

#[test]
fn mirror_output_is_monotonic_and_finite() {
    for kind in [MirrorKind::Simple, MirrorKind::Cascode, MirrorKind::WideSwing] {
        let (n, p) = (mirror(kind, MosType::N), mirror(kind, MosType::P));
        assert!(n.i_out(0.0).abs() < 1e-18 && p.i_out(1.8).abs() < 1e-18);
        let (mut ln, mut lp) = (-1.0, f64::INFINITY);
        for v in volts(0.0, 1.8, 360) {
            let (i_n, i_p) = (n.i_out(v), p.i_out(v));
            assert!(i_n.is_finite() && i_n >= ln, "{kind:?} N at {v}");
            assert!(i_p.is_finite() && i_p <= lp, "{kind:?} P at {v}");
            ln = i_n;
            lp = i_p;
        }
    }
}

#[test]
fn mirror_compliance_and_output_resistance() {
    // Razavi ch. 5: a simple mirror needs Vdsat of headroom and has Rout = ro; a cascode needs
    // Vgs + Vdsat and has Rout ≈ gm·ro² (here gm of the cascode seen from its source, n·gm,
    // in the bulk-referred EKV model); the wide-swing cascode needs about 2·Vdsat (+ margin).
    let s = mirror(MirrorKind::Simple, MosType::N);
    let c = mirror(MirrorKind::Cascode, MosType::N);
    let w = mirror(MirrorKind::WideSwing, MosType::N);
    let tol = 1e-3;
    let (cs, cc, cw) =
        (s.compliance(1.8, tol).unwrap(), c.compliance(1.8, tol).unwrap(), w.compliance(1.8, tol).unwrap());
    assert!(cs < cw && cw < cc, "{cs} {cw} {cc}");
    let dev = Mos::from_process(&Process::demo180(), MosType::N, 4e-6, 2e-6).unwrap();
    let (vg, vb) = c.bias().unwrap();
    assert!(cc < vb && cc > vg - dev.vt(27.0), "{cc}");
    // Simple: Rout = ro of the output device at its bias.
    assert!(rel(s.rout(1.0), dev.ro(vg, 1.0, 27.0)) < 1e-3);
    // Cascode: the internal node sits near vg; Rout ≈ n·gm·ro_casc·ro_bottom.
    let (_, gm_c, _, gds_c) = dev.ids_derivs(vb, vg, 1.2, 27.0);
    let estimate = dev.p.n * gm_c / gds_c * dev.ro(vg, vg, 27.0);
    assert!(rel(c.rout(1.2), estimate) < 0.3, "{} vs {estimate}", c.rout(1.2));
    assert!(w.rout(1.2) > 100.0 * s.rout(1.2));
    // Rout compliance: the cascode keeps its high Rout only above about Vgs + Vdsat
    // (= vb − VT with the bias of this mirror), the wide-swing one down to about 2·Vdsat + margin.
    let rc = c.compliance_rout(1.8, 0.5).unwrap();
    let rw = w.compliance_rout(1.8, 0.5).unwrap();
    let vdsat = dev.vdsat(vg, 27.0);
    assert!(rw < rc, "{rw} {rc}");
    assert!(rc > vg && rc < vb, "{rc}");
    assert!(rw > 2.0 * vdsat && rw < 2.0 * vdsat + 0.1 + 0.15, "{rw} vs vdsat {vdsat}");
    assert!(c.compliance_rout(1.8, 1.5).unwrap_err().contains("frac"));
    // Systematic error of the simple mirror: (1 + λVout)/(1 + λVgs) − 1 (Razavi ch. 5).
    let lam = dev.lambda();
    assert!(s.systematic_error(vg).abs() < 1e-9);
    let expect = (1.0 + lam * 1.5) / (1.0 + lam * vg) - 1.0;
    assert!(rel(s.systematic_error(1.5), expect) < 0.02, "{} vs {expect}", s.systematic_error(1.5));
    assert!(c.systematic_error(1.2).abs() < 1e-3 && w.systematic_error(1.2).abs() < 1e-3);
}

#[test]
fn mirror_random_error_follows_pelgrom() {
    // (σI/I)² = (gm/Id)²σ²(ΔVT) + σ²(Δβ/β) (Pelgrom 1989) with the pair's A/√(WL).
    let s = mirror(MirrorKind::Simple, MosType::N);
    let dev = Mos::from_process(&Process::demo180(), MosType::N, 4e-6, 2e-6).unwrap();
    let (vg, _) = s.bias().unwrap();
    let expect = current_sigma(dev.gm_id(vg, vg, 27.0), dev.sigma_vt(), dev.sigma_beta());
    assert!(rel(s.sigma_ratio(), expect) < 1e-12);
    let big =
        Mirror::from_process(&Process::demo180(), MirrorKind::Simple, MosType::N, 1e-6, 4.0, 4e-6, 2e-6, 0.1).unwrap();
    assert!(big.sigma_ratio() < s.sigma_ratio());
}

#[test]
fn charge_discharge_pair_mismatch() {
    // High-side (PMOS) current falls and low-side (NMOS) current rises with the node voltage,
    // so their systematic mismatch falls monotonically; random parts add in quadrature.
    let hi = mirror(MirrorKind::Simple, MosType::P);
    let lo = mirror(MirrorKind::Simple, MosType::N);
    let mut last = f64::INFINITY;
    for v in volts(0.3, 1.5, 120) {
        let (sys, sig) = pair_mismatch(&hi, &lo, v);
        assert!(sys < last && sys.is_finite());
        last = sys;
        assert!(rel(sig, (hi.sigma_ratio().powi(2) + lo.sigma_ratio().powi(2)).sqrt()) < 1e-12);
    }
    let (a, _) = pair_mismatch(&hi, &lo, 0.3);
    let (b, _) = pair_mismatch(&hi, &lo, 1.5);
    assert!(a > 0.0 && b < 0.0);
}

#[test]
fn explicit_mirror_and_bad_parameters() {
    let m = Mirror::explicit(2e-6, 50e6, 0.3, 0.01).unwrap();
    assert!(rel(m.i_out(0.3), 0.99 * 2e-6) < 1e-12);
    assert!(rel(m.compliance(1.2, 0.01).unwrap(), 0.3) < 0.01);
    assert!(rel(m.rout(1.0), 50e6) < 1e-3);
    assert_eq!(m.sigma_ratio(), 0.01);
    let p = Process::demo180();
    let bad = |i: f64, r: f64, w: f64, margin: f64| {
        Mirror::from_process(&p, MirrorKind::WideSwing, MosType::N, i, r, w, 2e-6, margin).unwrap_err()
    };
    assert!(bad(0.0, 1.0, 4e-6, 0.1).contains("i_ref"));
    assert!(bad(1e-6, -2.0, 4e-6, 0.1).contains("ratio"));
    assert!(bad(1e-6, 1.0, 1e-9, 0.1).contains("w must be in"));
    assert!(bad(1e-6, 1.0, 4e-6, 5.0).contains("margin"));
    assert!(Mirror::explicit(1e-6, 0.0, 0.2, 0.0).unwrap_err().contains("rout"));
    assert!(Mirror::explicit(1e-6, 1e6, 0.2, f64::NAN).unwrap_err().contains("sigma"));
    assert!(m.compliance(1.0, 0.9).unwrap_err().contains("tol"));
}

fn spec() -> ComparatorSpec {
    ComparatorSpec {
        a0: 1000.0,
        gbw: 20e6,
        slew: 20e6,
        v_swing: 0.9,
        t0: 1e-9,
        offset: 2e-3,
        sigma_offset: 1e-3,
        c_in: 10e-15,
        hyst: 10e-3,
    }
}

#[test]
fn comparator_delay_regimes() {
    let c = Comparator::new(spec()).unwrap();
    let s = spec();
    // Slew-limited for large overdrive: t0 + v_swing/SR (Johns & Martin ch. 10).
    assert!(rel(c.delay(1.0), s.t0 + s.v_swing / s.slew) < 1e-12);
    // Linear settling, small overdrive: t0 − τ·ln(1 − v_swing/(A0·Vod)) (single pole).
    let vod = 1.2e-3;
    let expect = s.t0 - s.tau() * (1.0 - s.v_swing / (s.a0 * vod)).ln();
    assert!(rel(c.delay(vod), expect) < 1e-12);
    // Below v_swing/A0 the output never toggles.
    assert!(c.delay(0.8e-3).is_infinite() && c.delay(-1.0).is_infinite());
    // Monotonic and continuous over 6 decades of overdrive (through the slew boundary).
    let mut last = f64::INFINITY;
    for k in 0..=600 {
        let od = 1e-3 * 10f64.powf(k as f64 / 100.0);
        let t = c.delay(od);
        assert!(t.is_finite() && t <= last && (last.is_infinite() || (last - t) / t < 0.1), "at {od}");
        last = t;
    }
    // Ramp: for t ≪ τ and no slewing, the integrator law t = √(2·v_swing·τ/(A0·s)) (common practice).
    let slow = Comparator::new(ComparatorSpec { a0: 1e6, slew: 1e12, t0: 0.0, ..spec() }).unwrap();
    let sl = 1e5;
    let t = slow.delay_ramp(sl);
    assert!(rel(t, (2.0 * 0.9 * slow.spec.tau() / (1e6 * sl)).sqrt()) < 0.01, "{t}");
    let mut last = f64::INFINITY;
    for k in 0..=800 {
        let sl = 10f64.powf(2.0 + k as f64 / 100.0);
        let t = c.delay_ramp(sl);
        assert!(t.is_finite() && t < last, "ramp at {sl}");
        last = t;
    }
    assert!(c.delay_ramp(0.0).is_infinite());
    let (lo, hi) = c.thresholds(0.9);
    assert!(rel(lo, 0.9 + 2e-3 - 5e-3) < 1e-12 && rel(hi, 0.9 + 2e-3 + 5e-3) < 1e-12);
    assert_eq!(c.input_cap(0.3), 10e-15);
    assert_eq!(c.offset(), 2e-3);
}

fn design() -> PairDesign {
    PairDesign {
        kind: MosType::N,
        w: 4e-6,
        l: 1e-6,
        i_tail: 2e-6,
        c_load: 50e-15,
        tail_w: 2e-6,
        tail_l: 2e-6,
        v_cm: 0.9,
        v_swing: 0.9,
        t0: 0.0,
        offset: 0.0,
        hyst: 0.0,
    }
}

#[test]
fn comparator_from_input_pair() {
    let p = Process::demo180();
    let c = Comparator::from_pair(&p, &design()).unwrap();
    // Slew = I_tail/C_load; GBW = gm/(2π·C_load) (Razavi ch. 9); the tail delivers its current
    // to within its output resistance at this common mode.
    assert!(rel(c.spec.slew, 2e-6 / 50e-15) < 0.02);
    let pair = &c.stage.as_ref().unwrap().pair;
    // Offset: each pair contributes σ² = σ²(ΔVT) + (Id/gm)²σ²(Δβ/β) (Pelgrom 1989); the load
    // mirror's share is referred to the input by gm_load/gm_pair (Razavi ch. 14).
    let id = c.spec.slew * 50e-15 / 2.0;
    let gm = 2.0 * std::f64::consts::PI * c.spec.gbw * 50e-15;
    let load = Mos::from_process(&p, MosType::P, 4e-6, 1e-6).unwrap();
    let vl = load.diode_vgs(id, 27.0).unwrap();
    let gm_l = load.gm(vl, vl, 27.0);
    let s_pair = offset_sigma(gm / id, pair.sigma_vt(), pair.sigma_beta());
    let s_load = offset_sigma(gm_l / id, load.sigma_vt(), load.sigma_beta());
    let expect = (s_pair.powi(2) + (gm_l / gm * s_load).powi(2)).sqrt();
    assert!(rel(c.sigma_offset(), expect) < 1e-6, "{} vs {expect}", c.sigma_offset());
    assert!(c.sigma_offset() > s_pair);
    // Input capacitance versus common mode: finite, continuous, and lower where the tail has
    // no headroom (the pair leaves inversion) than at mid supply.
    let mut last = c.input_cap(0.0);
    for v in volts(0.0, 1.8, 360) {
        let ci = c.input_cap(v);
        assert!(ci.is_finite() && ci > 0.0 && (ci - last).abs() < 0.02 * last, "at {v}");
        last = ci;
    }
    assert!(c.input_cap(0.1) < c.input_cap(0.9));
    // A PMOS pair works in the mirrored frame.
    let pp = Comparator::from_pair(&p, &PairDesign { kind: MosType::P, ..design() }).unwrap();
    assert!(volts(0.0, 1.8, 36).all(|v| pp.input_cap(v).is_finite()));
    assert!(pp.input_cap(1.7) < pp.input_cap(0.9));
}

#[test]
fn pair_area_tradeoff() {
    // Pelgrom 1989: at a fixed W/L the offset σ scales as 1/√area; the gate capacitance grows
    // with the area.
    let p = Process::demo180();
    let areas = [1e-12, 4e-12, 16e-12, 64e-12];
    let (sig, cap) = pair_tradeoff(&p, &design(), 4.0, &areas).unwrap();
    for k in 1..areas.len() {
        assert!(rel(sig[k - 1] / sig[k], 2.0) < 0.01, "{sig:?}");
        assert!(cap[k] > 2.0 * cap[k - 1], "{cap:?}");
    }
    assert!(pair_tradeoff(&p, &design(), 4.0, &[1e-12, -1.0]).unwrap_err().contains("area 1"));
    assert!(pair_tradeoff(&p, &design(), 0.0, &areas).unwrap_err().contains("w_over_l"));
}

#[test]
fn comparator_bad_parameters() {
    let bad = |s: ComparatorSpec| Comparator::new(s).unwrap_err();
    assert!(bad(ComparatorSpec { a0: 0.5, ..spec() }).contains("a0"));
    assert!(bad(ComparatorSpec { gbw: 0.0, ..spec() }).contains("gbw"));
    assert!(bad(ComparatorSpec { slew: f64::NAN, ..spec() }).contains("slew"));
    assert!(bad(ComparatorSpec { v_swing: -1.0, ..spec() }).contains("v_swing"));
    assert!(bad(ComparatorSpec { hyst: -1e-3, ..spec() }).contains("hyst"));
    let p = Process::demo180();
    let e = |d: PairDesign| Comparator::from_pair(&p, &d).unwrap_err();
    assert!(e(PairDesign { i_tail: 0.0, ..design() }).contains("i_tail"));
    assert!(e(PairDesign { c_load: -1.0, ..design() }).contains("c_load"));
    assert!(e(PairDesign { v_cm: 3.0, ..design() }).contains("v_cm"));
    // An NMOS pair at a common mode below its headroom: an error that says what to change.
    let low = e(PairDesign { v_cm: 0.2, ..design() });
    assert!(low.contains("no headroom") && low.contains("PMOS pair"), "{low}");
    let high = e(PairDesign { kind: MosType::P, v_cm: 1.7, ..design() });
    assert!(high.contains("no headroom") && high.contains("NMOS pair"), "{high}");
    assert!(e(PairDesign { w: 1e-9, ..design() }).contains("w must be in"));
}

#[test]
fn comparator_extreme_inputs_stay_finite() {
    let c = Comparator::new(spec()).unwrap();
    let s = spec();
    assert!(rel(c.delay(f64::INFINITY), s.t0 + s.v_swing / s.slew) < 1e-12);
    assert!(rel(c.delay_ramp(f64::INFINITY), s.t0 + s.v_swing / s.slew) < 1e-12);
    assert!(c.delay(f64::NAN).is_infinite() && c.delay_ramp(f64::NAN).is_infinite());
    assert!(c.delay_ramp(1e-30).is_finite());
}
