//! Constants and textbook laws: CODATA, Pelgrom, junction capacitance, switch charge
//! injection and clock feedthrough, resistor and capacitor coefficients.
use tickwork::physics::capacitor::Capacitor;
use tickwork::physics::constants::{K_B, Q_E, thermal_voltage};
use tickwork::physics::junction::{self, junction_cap};
use tickwork::physics::mismatch::{pelgrom, pelgrom_unequal};
use tickwork::physics::mosfet::{Mos, MosType};
use tickwork::physics::process::Process;
use tickwork::physics::resistor::Resistor;
use tickwork::physics::switch::{Switch, SwitchKind};

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

#[test]
fn codata_thermal_voltage() {
    // CODATA 2018 exact values (SI 2019): k = 1.380649e-23 J/K, e = 1.602176634e-19 C.
    assert_eq!(K_B, 1.380649e-23);
    assert_eq!(Q_E, 1.602176634e-19);
    // kT/q at 300 K = 25.85 mV (CODATA).
    assert!((thermal_voltage(26.85) - 25.85e-3).abs() < 0.005e-3, "{}", thermal_voltage(26.85));
}

#[test]
fn pelgrom_area_law() {
    // Pelgrom, Duinmaijer, Welbers, JSSC 1989: σ(ΔVT) = A_VT/√(WL).
    let p = Process::demo180();
    let a = Mos::from_process(&p, MosType::N, 1e-6, 1e-6).unwrap();
    let b = Mos::from_process(&p, MosType::N, 4e-6, 4e-6).unwrap();
    assert!(rel(a.sigma_vt(), 5e-3) < 1e-12); // A_VT = 5 mV·µm (invented demo value), WL = 1 µm²
    assert!(rel(a.sigma_vt() / b.sigma_vt(), 4.0) < 1e-12); // 16× area → σ/4
    assert!(rel(pelgrom(5e-9, 2e-6, 8e-6), 5e-9 / 4e-6) < 1e-12);
    // Equal areas reduce to the same law.
    assert!(rel(pelgrom_unequal(5e-9, 4e-12, 4e-12), pelgrom(5e-9, 2e-6, 2e-6)) < 1e-12);
}

#[test]
fn junction_capacitance_law() {
    // Sze, Physics of Semiconductor Devices: abrupt junction C = C0/√(1 + Vr/φ) halves at
    // Vr = 3φ; linearly graded C = C0/(1 + Vr/φ)^{1/3} halves at Vr = 7φ.
    assert!(rel(junction_cap(1e-15, 3.0 * 0.8, 0.8, 0.5), 0.5e-15) < 1e-12);
    assert!(rel(junction_cap(1e-15, 7.0 * 0.7, 0.7, 1.0 / 3.0), 0.5e-15) < 1e-12);
    assert_eq!(junction_cap(2e-15, 0.0, 0.8, 0.4), 2e-15);
    // Forward bias: continuous value and slope at FC·φ, finite and increasing up to 2φ.
    let (phi, m) = (0.8, 0.45);
    let vb = -junction::FC * phi;
    let (a, b) = (junction_cap(1.0, vb + 1e-9, phi, m), junction_cap(1.0, vb - 1e-9, phi, m));
    assert!((a - b).abs() < 1e-8);
    let s1 = (junction_cap(1.0, vb + 1e-4, phi, m) - junction_cap(1.0, vb + 2e-4, phi, m)) / 1e-4;
    let s2 = (junction_cap(1.0, vb - 2e-4, phi, m) - junction_cap(1.0, vb - 1e-4, phi, m)) / 1e-4;
    assert!(rel(s1, s2) < 1e-3, "{s1} {s2}");
    let mut last = 0.0;
    for k in 0..=400 {
        let vr = 5.0 - k as f64 * (5.0 + 2.0 * phi) / 400.0;
        let c = junction_cap(1.0, vr, phi, m);
        assert!(c.is_finite() && c > last, "at vr {vr}");
        last = c;
    }
    assert!(junction::check(1e-15, 0.05, 0.5).unwrap_err().contains("phi"));
    assert!(junction::check(1e-15, 0.8, 2.0).unwrap_err().contains("m (grading"));
    assert!(junction::check(-1.0, 0.8, 0.5).unwrap_err().contains("cj0"));
}

#[test]
fn diffusion_capacitance_is_area_plus_sidewall() {
    // Area and sidewall components each follow the Sze law with their own φ and m.
    let p = Process::demo180();
    let m = Mos::from_process(&p, MosType::N, 3e-6, 0.18e-6).unwrap();
    let (a, per) = (3e-6 * p.nmos.ldiff, 3e-6 + 2.0 * p.nmos.ldiff);
    let vr = 1.2;
    let expect = p.nmos.cj * a / (1.0 + vr / p.nmos.pb).powf(p.nmos.mj)
        + p.nmos.cjsw * per / (1.0 + vr / p.nmos.pbsw).powf(p.nmos.mjsw);
    assert!(rel(m.cj_diffusion(vr), expect) < 1e-12);
}

#[test]
fn charge_injection_estimate() {
    // Razavi, Design of Analog CMOS ICs, ch. 12: an NMOS switch turning off dumps half its
    // channel charge W·L·Cox·(VDD − Vin − VTH) onto the hold capacitor: ΔV = −Q/(2C).
    // VTH with the body effect of the EKV slope factor: VT0 + (n − 1)·Vin; the EKV charge sits
    // within n·U_T of the strong-inversion formula.
    let p = Process::demo180();
    let s = Switch::from_process(&p, SwitchKind::N, 2e-6, 2e-6, 0.18e-6).unwrap();
    let c = 1e-12;
    let cox_wl = p.nmos.cox * 2e-6 * 0.18e-6;
    for vin in [0.0, 0.3, 0.6] {
        let vth = p.nmos.vth0 + (p.nmos.n - 1.0) * vin;
        let razavi = -cox_wl * (1.8 - vin - vth) / (2.0 * c);
        let slack = p.nmos.n * thermal_voltage(27.0) * cox_wl / (2.0 * c) * 1.05;
        assert!((s.injection(vin, c) - razavi).abs() < slack, "vin {vin}: {} vs {razavi}", s.injection(vin, c));
        assert!(s.injection(vin, c) < 0.0);
    }
    // A transmission gate's two charges have opposite signs and partly cancel.
    let tg = Switch::from_process(&p, SwitchKind::Tg, 2e-6, 2e-6, 0.18e-6).unwrap();
    assert!(tg.injection(0.9, c).abs() < s.injection(0.9, c).abs());
    // Explicit switch: exactly −q/(2C).
    let e = Switch::explicit(1e3, 0.0, 2e-15, 0.0, 1.8).unwrap();
    assert!(rel(e.injection(0.5, 1e-12), -1e-3) < 1e-12);
}

#[test]
fn clock_feedthrough_estimate() {
    // Razavi, Design of Analog CMOS ICs, ch. 12: ΔV = VCK·W·Cov/(W·Cov + CH).
    let p = Process::demo180();
    let s = Switch::from_process(&p, SwitchKind::N, 2e-6, 2e-6, 0.18e-6).unwrap();
    let cov = p.nmos.cgdo * 2e-6;
    assert!(rel(s.feedthrough(100e-15), -1.8 * cov / (cov + 100e-15)) < 1e-12);
    assert!(rel(s.pedestal(0.4, 100e-15), s.injection(0.4, 100e-15) + s.feedthrough(100e-15)) < 1e-12);
}

#[test]
fn resistor_and_capacitor_coefficients() {
    // Common practice polynomial coefficients: R = R0(1 + TC1ΔT + TC2ΔT²)(1 + VC|V|).
    let r = Resistor::new(10e3, 1e-3, 2e-6, 1e-4, 27.0).unwrap();
    assert!(rel(r.r(2.0, 127.0), 10e3 * (1.0 + 0.1 + 0.02) * (1.0 + 2e-4)) < 1e-12);
    assert_eq!(r.r(0.0, 27.0), 10e3);
    let p = Process::demo180();
    let rp = Resistor::from_process(&p, "rpoly", 1e-6, 20e-6).unwrap();
    assert!(rel(rp.r0, 20e3) < 1e-12); // 1 kΩ/□ × 20 squares (invented layer)
    assert!(rel(rp.sigma, 2e-8 / (20e-12f64).sqrt()) < 1e-12);
    let c = Capacitor::new(1e-12, 1e-4, 1e-5, 3e-5, 0.0, 27.0).unwrap();
    assert!(rel(c.c(1.0, 127.0), 1e-12 * (1.0 + 1e-4 + 1e-5) * (1.0 + 3e-3)) < 1e-12);
    let cm = Capacitor::from_process(&p, "mim", 10e-6, 10e-6).unwrap();
    assert!(rel(cm.c0, 2e-3 * 1e-10 + 5e-11 * 40e-6) < 1e-12);
    // Corners scale R and C.
    let ss = p.at_corner("ss").unwrap();
    assert!(rel(Resistor::from_process(&ss, "rpoly", 1e-6, 20e-6).unwrap().r0, 20e3 * 1.15) < 1e-12);
    // Bad parameters name themselves.
    assert!(Resistor::new(-1.0, 0.0, 0.0, 0.0, 27.0).unwrap_err().contains("r must be > 0"));
    assert!(Resistor::new(1e3, 0.5, 0.0, 0.0, 27.0).unwrap_err().contains("tc1"));
    assert!(Capacitor::new(1e-12, 0.0, 0.0, 0.0, 0.0, 1e4).unwrap_err().contains("tnom"));
    assert!(Capacitor::new(f64::NAN, 0.0, 0.0, 0.0, 0.0, 27.0).unwrap_err().contains("c must be > 0"));
    assert!(Resistor::from_process(&p, "metal9", 1e-6, 1e-6).unwrap_err().contains("no resistor layer 'metal9'"));
    assert!(Resistor::from_process(&p, "rpoly", 0.1e-6, 1e-6).unwrap_err().contains("w must be in"));
    assert!(Capacitor::from_process(&p, "mom", 1e-6, 1e-6).unwrap_err().contains("no capacitor type 'mom'"));
}
