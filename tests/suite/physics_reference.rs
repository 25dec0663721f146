//! Numerical cross-checks against values computed independently with numpy/scipy by
//! tests/reference/physics_reference.py (printed values pasted here).
use tickwork::physics::comparator::{Comparator, ComparatorSpec};
use tickwork::physics::constants::thermal_voltage;
use tickwork::physics::mirror::{Mirror, MirrorKind};
use tickwork::physics::mosfet::{Mos, MosType};
use tickwork::physics::process::Process;

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

#[test]
fn thermal_voltage_matches_scipy_constants() {
    // scipy.constants (CODATA 2018) k·T/e, from physics_reference.py.
    for (t_k, v) in [(300.0, 0.025851999786435535), (233.15, 0.020091312500691485), (398.15, 0.03430991238323103)] {
        assert!(rel(thermal_voltage(t_k - 273.15), v) < 1e-13, "{t_k} K");
    }
}

#[test]
fn ekv_current_and_derivatives_match_numpy() {
    // physics_reference.py: EKV 1995 Id in numpy, gm and gds by central differences (h = 1 µV).
    let m = Mos::from_process(&Process::demo180(), MosType::N, 2e-6, 0.5e-6).unwrap();
    let rows = [
        (0.2, 0.9, 1.8160092292438336e-09, 5.1299786229248905e-08, 1.9667970008349612e-10),
        (0.45, 0.9, 1.153873411136219e-06, 2.3837335231041896e-05, 1.2496823947077176e-07),
        (0.6, 0.05, 6.5425871115375874e-06, 5.7047306456464275e-05, 9.425352713064443e-05),
        (0.9, 0.9, 9.976919326307395e-05, 0.0004426053592100458, 1.0805327823899119e-05),
        (1.8, 0.3, 0.00042797151964233315, 0.0003729610655955982, 0.0012243945457664739),
    ];
    for (vgs, vds, id, gm, gds) in rows {
        assert!(rel(m.id(vgs, vds, 27.0), id) < 1e-12, "id at {vgs}, {vds}");
        assert!(rel(m.gm(vgs, vds, 27.0), gm) < 1e-6, "gm at {vgs}, {vds}");
        assert!(rel(m.gds(vgs, vds, 27.0), gds) < 1e-5, "gds at {vgs}, {vds}");
    }
    // Temperature dependence (threshold tempco and mobility exponent), same script.
    assert!(rel(m.id(0.6, 0.9, 125.0), 2.0821412484393995e-05) < 1e-12);
    assert!(rel(m.id(0.6, 0.9, -40.0), 6.306120246418615e-06) < 1e-12);
    // vgs for a current, scipy brentq.
    for (id, vgs) in [(1e-9, 0.1789180328406237), (1e-6, 0.44314587253344256), (1e-4, 0.9005211686560892)] {
        assert!((m.vgs_for(id, 0.9, 27.0).unwrap() - vgs).abs() < 1e-9, "vgs_for {id}");
    }
}

#[test]
fn cascode_mirror_matches_scipy_solution() {
    // physics_reference.py: cascode of demo180 NMOS 4 µm/2 µm at 1 µA, internal node by brentq.
    let p = Process::demo180();
    let mi = Mirror::from_process(&p, MirrorKind::Cascode, MosType::N, 1e-6, 1.0, 4e-6, 2e-6, 0.0).unwrap();
    let (vg, vb) = mi.bias().unwrap();
    assert!((vg - 0.4826166753081596).abs() < 1e-9 && (vb - 1.1338798093218607).abs() < 1e-9, "{vg} {vb}");
    for (v, i) in [
        (0.3, 9.943922728982453e-07),
        (0.6, 9.999516688993243e-07),
        (1.0, 9.999953295504563e-07),
        (1.8, 1.0000229148887246e-06),
    ] {
        assert!(rel(mi.i_out(v), i) < 1e-8, "vout {v}: {} vs {i}", mi.i_out(v));
    }
}

#[test]
fn mirror_sigma_matches_monte_carlo() {
    // physics_reference.py: numpy Monte Carlo (400 000 pairs) of the EKV simple mirror with
    // Pelgrom ΔVT and Δβ gives σ(Iout/Iin) = 0.032804903; its sampling error is about 0.1 %.
    let p = Process::demo180();
    let mi = Mirror::from_process(&p, MirrorKind::Simple, MosType::N, 1e-6, 1.0, 4e-6, 2e-6, 0.0).unwrap();
    assert!(rel(mi.sigma_ratio(), 0.032804903089177155) < 0.005, "{}", mi.sigma_ratio());
}

fn comparator() -> Comparator {
    Comparator::new(ComparatorSpec {
        a0: 200.0,
        gbw: 50e6,
        slew: 40e6,
        v_swing: 0.9,
        t0: 0.0,
        offset: 0.0,
        sigma_offset: 0.0,
        c_in: 0.0,
        hyst: 0.0,
    })
    .unwrap()
}

#[test]
fn comparator_step_delay_matches_ode_solution() {
    // physics_reference.py: scipy solve_ivp of dv/dt = min((A0·Vod − v)/τ, SR), event at v = 0.9 V.
    let c = comparator();
    assert!(rel(c.spec.tau(), 6.366197723675814e-07) < 1e-14);
    for (vod, t) in
        [(0.006, 8.825424005622294e-07), (0.01, 3.8059485531588233e-07), (0.05, 6.004004329679616e-08), (0.3, 2.25e-08)]
    {
        assert!(rel(c.delay(vod), t) < 1e-6, "overdrive {vod}: {} vs {t}", c.delay(vod));
    }
}

#[test]
fn comparator_ramp_delay_matches_ode_solution() {
    // physics_reference.py: scipy solve_ivp of dv/dt = min((A0·s·t − v)/τ, SR), event at v = 0.9 V.
    let c = comparator();
    for (s, t) in [(1e4, 9.415547952990999e-07), (1e6, 7.722417524487625e-08), (1e8, 2.3137044610475758e-08)] {
        assert!(rel(c.delay_ramp(s), t) < 1e-6, "slope {s}: {} vs {t}", c.delay_ramp(s));
    }
}

#[test]
fn switch_on_resistance_matches_numpy() {
    // physics_reference.py: 1/(∂Id/∂Vd) at Vd = Vs by central differences of the bulk-referred
    // EKV current (NMOS 1 µm/0.18 µm, PMOS 2 µm/0.18 µm, VDD = 1.8 V, 27 °C); NaN marks a value
    // too small to difference (the device is off there).
    use tickwork::physics::switch::{Switch, SwitchKind};
    let p = Process::demo180();
    let n = Switch::from_process(&p, SwitchKind::N, 1e-6, 1e-6, 0.18e-6).unwrap();
    let s = Switch::from_process(&p, SwitchKind::P, 2e-6, 2e-6, 0.18e-6).unwrap();
    let tg = Switch::from_process(&p, SwitchKind::Tg, 1e-6, 2e-6, 0.18e-6).unwrap();
    let rows = [
        (0.0, 444.44444599408746, f64::NAN, 444.44444599408735),
        (0.5, 888.939436683124, f64::NAN, 888.9393919037545),
        (0.9, 4755.120519259173, 21418.675025097375, 3891.2346867913284),
        (1.3, f64::NAN, 2074.0833308850315, 2074.0787563714853),
        (1.8, f64::NAN, 974.0259857842113, 974.0259857842073),
    ];
    for (v, rn, rp, rt) in rows {
        assert!(rel(tg.ron(v), rt) < 1e-6, "tg at {v}");
        if rn.is_finite() {
            assert!(rel(n.ron(v), rn) < 1e-6, "n at {v}");
        }
        if rp.is_finite() {
            assert!(rel(s.ron(v), rp) < 1e-6, "p at {v}");
        }
    }
}
