//! MOSFET model: limits of the EKV interpolation, subthreshold slope, small-signal limits,
//! continuity and monotonicity over the whole operating range.
use tickwork::physics::constants::thermal_voltage;
use tickwork::physics::mosfet::{Mos, MosType};
use tickwork::physics::process::Process;

fn nmos(w: f64, l: f64) -> Mos {
    Mos::from_process(&Process::demo180(), MosType::N, w, l).unwrap()
}

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

#[test]
fn strong_inversion_limit_is_the_square_law() {
    // Enz, Krummenacher, Vittoz 1995: in strong inversion and saturation
    // Id = β/(2n)·(Vgs − VT)²; times the CLM factor (1 + λ·Vds).
    let m = nmos(2e-6, 0.5e-6);
    let t = 27.0;
    let vt = m.vt(t);
    let ut = thermal_voltage(t);
    let vgs = vt + 40.0 * m.p.n * ut;
    let vds = 3.0;
    let square = m.beta(t) / (2.0 * m.p.n) * (vgs - vt).powi(2) * (1.0 + m.lambda() * vds);
    assert!(rel(m.id(vgs, vds, t), square) < 1e-6, "{} vs {square}", m.id(vgs, vds, t));
    // Same source: gm = β(Vgs − VT)/n = √(2βId/n) (Razavi ch. 2 with n = 1).
    let gm = m.beta(t) * (vgs - vt) / m.p.n * (1.0 + m.lambda() * vds);
    assert!(rel(m.gm(vgs, vds, t), gm) < 1e-6);
    // Saturation voltage tends to (Vgs − VT)/n (EKV).
    assert!(rel(m.vdsat(vgs, t), (vgs - vt) / m.p.n) < 0.08);
    // Triode on-resistance 1/(β(Vgs − VT)) (Razavi ch. 2).
    assert!(rel(m.ron(vgs, t), 1.0 / (m.beta(t) * (vgs - vt))) < 1e-6);
}

#[test]
fn weak_inversion_limit_is_exponential() {
    // Enz, Krummenacher, Vittoz 1995: weak inversion Id = I_spec·e^{(Vgs−VT)/(nU_T)}·(1 − e^{−Vds/U_T}).
    let m = nmos(2e-6, 0.5e-6);
    let t = 27.0;
    let ut = thermal_voltage(t);
    let n = m.p.n;
    let vgs = m.vt(t) - 20.0 * n * ut;
    for vds in [0.3 * ut, ut, 3.0 * ut, 0.9] {
        let expect = m.i_spec(t) * (-20.0f64).exp() * (1.0 - (-vds / ut).exp()) * (1.0 + m.lambda() * vds);
        assert!(rel(m.id(vgs, vds, t), expect) < 1e-4, "vds {vds}");
    }
    // gm/Id → 1/(nU_T) in weak inversion (same source).
    assert!(rel(m.gm_id(vgs, 0.9, t), 1.0 / (n * ut)) < 1e-3);
}

#[test]
fn subthreshold_slope_is_n_times_60_mv_per_decade() {
    // ~60 mV/decade × n at room temperature (common practice); exactly n·U_T·ln10 in the EKV
    // weak-inversion limit.
    let m = nmos(2e-6, 0.5e-6);
    let t = 26.85; // 300 K
    let (v1, v2) = (m.vt(t) - 0.35, m.vt(t) - 0.25);
    let decades = (m.id(v2, 0.9, t) / m.id(v1, 0.9, t)).log10();
    let slope = (v2 - v1) / decades;
    assert!(rel(slope, m.p.n * thermal_voltage(t) * 10f64.ln()) < 0.01, "{slope}");
    assert!(rel(slope / m.p.n, 0.060) < 0.02, "{slope}");
}

#[test]
fn inversion_coefficient_and_gm_over_id_span_the_regions() {
    // Enz/Vittoz: IC < 0.1 weak, IC > 10 strong; gm/Id falls from 1/(nU_T) as IC grows.
    let m = nmos(2e-6, 0.5e-6);
    let t = 27.0;
    assert!(m.ic(m.vt(t) - 0.15, t) < 0.1);
    assert!(m.ic(m.vt(t) + 0.4, t) > 10.0);
    let mut last = f64::INFINITY;
    for k in 0..200 {
        let v = -0.2 + 0.01 * k as f64;
        let g = m.gm_id(v, 1.0, t);
        assert!(g.is_finite() && g > 0.0 && g <= last * (1.0 + 1e-9), "gm/Id not decreasing at {v}");
        last = g;
    }
}

#[test]
fn current_is_monotonic_and_smooth_in_vgs_and_vds() {
    // Property (no kinks across region boundaries): Id is increasing in Vgs and Vds, and the
    // analytic gm and gds agree with central differences of Id everywhere.
    let m = nmos(1e-6, 0.18e-6);
    for t in [-40.0, 27.0, 125.0] {
        let mut last = -1.0;
        for k in 0..=2300 {
            let vgs = -0.5 + 1e-3 * k as f64;
            let i = m.id(vgs, 0.9, t);
            assert!(i.is_finite() && i > last, "Id not increasing at vgs {vgs}, {t} °C");
            last = i;
            let h = 1e-6;
            let fd = (m.id(vgs + h, 0.9, t) - m.id(vgs - h, 0.9, t)) / (2.0 * h);
            let gm = m.gm(vgs, 0.9, t);
            assert!((gm - fd).abs() <= 1e-5 * gm.abs() + 1e-18, "gm {gm} vs {fd} at {vgs}");
        }
        for vgs in [0.2, 0.5, 1.0, 1.8] {
            let mut last = f64::NEG_INFINITY;
            for k in 0..=2100 {
                let vds = -0.3 + 1e-3 * k as f64;
                let i = m.id(vgs, vds, t);
                assert!(i.is_finite() && i > last, "Id not increasing in vds at {vds}");
                last = i;
                let h = 1e-6;
                let fd = (m.id(vgs, vds + h, t) - m.id(vgs, vds - h, t)) / (2.0 * h);
                let g = m.gds(vgs, vds, t);
                assert!(g > 0.0 && (g - fd).abs() <= 1e-4 * g + 1e-15, "gds {g} vs {fd} at vgs {vgs} vds {vds}");
            }
            assert_eq!(m.id(vgs, 0.0, t), 0.0);
        }
    }
}

#[test]
fn gate_capacitances_are_continuous_and_bounded() {
    // Meyer (1971): saturation Cgs = 2/3·Cox·WL, Cgd = overlap only; Vds = 0: Cgs = Cgd = Cox·WL/2.
    // The inversion weight 2q/(1 + 2q) (EKV charge model) keeps them ~3 % below Meyer at 1.35 V
    // of overdrive, hence the 3 % tolerance.
    let m = nmos(10e-6, 1e-6);
    let t = 27.0;
    let c_ox = m.p.cox * m.w * m.l;
    let (ovs, ovd) = (m.p.cgso * m.w, m.p.cgdo * m.w);
    let sat = m.caps(1.8, 1.8, t);
    assert!(rel(sat.cgs - ovs, 2.0 / 3.0 * c_ox) < 0.03, "{sat:?}");
    assert!((sat.cgd - ovd).abs() < 1e-3 * c_ox);
    let lin = m.caps(1.8, 0.0, t);
    assert!(rel(lin.cgs - ovs, 0.5 * c_ox) < 0.03 && rel(lin.cgd - ovd, 0.5 * c_ox) < 0.03, "{lin:?}");
    // Weak inversion: intrinsic Cgs, Cgd vanish, Cgb = Cox·WL·(n − 1)/n (EKV depletion).
    let off = m.caps(-0.3, 0.9, t);
    assert!(off.cgs - ovs < 1e-3 * c_ox);
    assert!(rel(off.cgb, c_ox * (m.p.n - 1.0) / m.p.n) < 0.01);
    // Continuity: no step larger than 1 % of Cox·WL per mV, in Vgs and in Vds.
    let mut prev = m.caps(-0.5, 0.9, t);
    for k in 1..=2300 {
        let c = m.caps(-0.5 + 1e-3 * k as f64, 0.9, t);
        for (a, b) in [(c.cgs, prev.cgs), (c.cgd, prev.cgd), (c.cgb, prev.cgb)] {
            assert!(a.is_finite() && a >= 0.0 && (a - b).abs() < 0.01 * c_ox);
        }
        prev = c;
    }
    let mut prev = m.caps(0.9, -0.5, t);
    for k in 1..=2300 {
        let c = m.caps(0.9, -0.5 + 1e-3 * k as f64, t);
        for (a, b) in [(c.cgs, prev.cgs), (c.cgd, prev.cgd)] {
            assert!(a.is_finite() && a >= 0.0 && (a - b).abs() < 0.01 * c_ox);
        }
        prev = c;
    }
}

#[test]
fn vgs_for_inverts_the_current() {
    let m = nmos(2e-6, 0.5e-6);
    for t in [-40.0, 27.0, 125.0] {
        for e in -12..=-3 {
            let id = 10f64.powi(e);
            for vds in [0.05, 0.9] {
                let v = m.vgs_for(id, vds, t).unwrap();
                assert!(rel(m.id(v, vds, t), id) < 1e-9, "id {id} vds {vds} t {t}");
            }
        }
    }
    assert!(m.vgs_for(0.0, 0.9, 27.0).unwrap_err().contains("id must be > 0"));
    assert!(m.vgs_for(-1e-6, 0.9, 27.0).unwrap_err().contains("id"));
    assert!(m.vgs_for(1e-6, 0.0, 27.0).unwrap_err().contains("vds must be > 0"));
    assert!(m.vgs_for(f64::NAN, 0.9, 27.0).is_err());
    for id in [1e-10, 1e-6, 1e-4] {
        let v = m.diode_vgs(id, 27.0).unwrap();
        assert!(rel(m.id(v, v, 27.0), id) < 1e-9);
    }
    assert!(m.diode_vgs(0.0, 27.0).unwrap_err().contains("id must be > 0"));
    assert!(m.diode_vgs(10.0, 27.0).unwrap_err().contains("20 V"));
}

#[test]
fn temperature_moves_current_both_ways() {
    // Common practice: below the zero-temperature-coefficient point the current rises with
    // temperature (threshold falls), above it the current falls (mobility falls).
    let m = nmos(2e-6, 0.5e-6);
    assert!(m.id(0.4, 0.9, 125.0) > m.id(0.4, 0.9, -40.0));
    assert!(m.id(1.8, 0.9, 125.0) < m.id(1.8, 0.9, -40.0));
    assert!((m.vt(125.0) - m.vt(27.0) - 98.0 * m.p.tc_vth).abs() < 1e-12);
    // Smooth and monotonic over −55…150 °C in 0.1 °C steps, at both ends of the bias range.
    let (mut lo, mut hi) = (0.0, f64::INFINITY);
    for k in 0..=2050 {
        let t = -55.0 + 0.1 * k as f64;
        let (a, b) = (m.id(0.3, 0.9, t), m.id(1.8, 0.9, t));
        assert!(a.is_finite() && a > lo && b.is_finite() && b < hi, "at {t} °C");
        lo = a;
        hi = b;
    }
}

#[test]
fn gm_over_id_follows_the_ekv_universal_curve() {
    // Enz, Krummenacher, Vittoz 1995: in saturation gm·n·U_T/Id = (1 − e^{−√IC})/√IC.
    let m = nmos(4e-6, 1e-6);
    let t = 27.0;
    let nut = m.p.n * thermal_voltage(t);
    for ic in [0.01, 0.1, 1.0, 10.0, 100.0] {
        let sq = f64::sqrt(ic);
        // Vgs for this IC: IC = F((Vgs − VT)/(nU_T)), F⁻¹(IC) = 2·ln(e^{√IC} − 1).
        let vgs = m.vt(t) + nut * 2.0 * sq.exp_m1().ln();
        assert!((m.ic(vgs, t) / ic - 1.0).abs() < 1e-12);
        let got = m.gm_id(vgs, 1.8, t) * nut;
        assert!(rel(got, (1.0 - (-sq).exp()) / sq) < 1e-6, "IC {ic}: {got}");
    }
}

#[test]
fn channel_charge_matches_the_textbook_in_strong_inversion() {
    // Razavi, Design of Analog CMOS ICs, ch. 12: Q = W·L·Cox·(VDD − Vin − VTH), VTH with body
    // effect; in the EKV charge model VTH(Vin) = VT0 + (n − 1)·Vin and the charge sits n·U_T·Cox·WL
    // lower, so the two agree within that.
    let m = nmos(1e-6, 0.18e-6);
    let t = 27.0;
    let c_ox = m.p.cox * m.w * m.l;
    for vin in [0.0, 0.2, 0.5] {
        let q = m.channel_charge(1.8, vin, t);
        let razavi = c_ox * (1.8 - vin - (m.vt(t) + (m.p.n - 1.0) * vin));
        assert!((q - razavi).abs() <= 1.05 * m.p.n * thermal_voltage(t) * c_ox, "{q} vs {razavi}");
    }
}

#[test]
fn pmos_uses_magnitudes() {
    let p = Process::demo180();
    let m = Mos::from_process(&p, MosType::P, 2e-6, 0.5e-6).unwrap();
    assert!(m.id(0.9, 0.9, 27.0) > 0.0);
    let n = Mos::from_process(&p, MosType::N, 2e-6, 0.5e-6).unwrap();
    // Lower kp: less current than the NMOS of the same size (demo numbers).
    assert!(m.id(1.2, 0.9, 27.0) < n.id(1.2, 0.9, 27.0));
}

#[test]
fn bad_sizes_are_clear_errors() {
    let p = Process::demo180();
    let e = Mos::from_process(&p, MosType::N, 0.1e-6, 1e-6).unwrap_err();
    assert!(e.contains("nmos") && e.contains("w must be in"), "{e}");
    let e = Mos::from_process(&p, MosType::P, 1e-6, 0.1e-6).unwrap_err();
    assert!(e.contains("pmos") && e.contains("l must be in"), "{e}");
    assert!(Mos::from_process(&p, MosType::N, f64::NAN, 1e-6).is_err());
    assert!(Mos::from_process(&p, MosType::N, 1e-6, f64::INFINITY).is_err());
    // Explicit parameters are held to the same ranges as a process file.
    let mut bad = p.nmos.clone();
    bad.n = 0.5;
    let e = Mos::new(MosType::N, bad, 1e-6, 1e-6, 27.0).unwrap_err();
    assert!(e.contains("nmos") && e.contains("n = 0.5 is out of range; allowed 1..3"), "{e}");
    let mut bad = p.pmos.clone();
    bad.kp = f64::NAN;
    assert!(Mos::new(MosType::P, bad, 1e-6, 1e-6, 27.0).unwrap_err().contains("kp"));
    assert!(Mos::new(MosType::N, p.nmos.clone(), 1e-6, 1e-6, 1e6).unwrap_err().contains("tnom"));
}

#[test]
fn mismatch_sample_shifts_threshold_and_current_factor() {
    // A threshold shift ΔVT is a gate-voltage shift; Δβ/β scales the current (Pelgrom 1989).
    let m = nmos(2e-6, 0.5e-6);
    let s = m.with_mismatch(3e-3, 0.02).unwrap();
    for vgs in [0.2, 0.5, 1.2] {
        let expect = 1.02 * m.id(vgs - 3e-3, 0.9, 27.0);
        assert!(rel(s.id(vgs, 0.9, 27.0), expect) < 1e-12);
    }
    assert!(m.with_mismatch(1.0, 0.0).unwrap_err().contains("dvt"));
    assert!(m.with_mismatch(0.0, -1.0).unwrap_err().contains("dbeta"));
    assert!(m.with_mismatch(f64::NAN, 0.0).is_err());
}
