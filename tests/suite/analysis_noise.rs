//! Sensitivities, tempco, jitter and phase noise at the script level, each against an outside
//! result: the ideal formula, a plain central difference, the Wiener-process variance, the
//! Lorentzian of Demir et al. (2000) and the Navid–Lee–Dutton (2005) bound.
use crate::cli_util::{eval, eval_f64};

/// A window oscillator with every parasitic of its kind switched on (invented numbers).
const REAL: &str = r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, vdd: 1.8, tc_i: 1e-4, tc_c: 3e-5,
    c_vc1: 0.01, c_vc2: 0.002, c_swn: 5f, c_swp: 5f, c_in: 10f, r_out: 50M, i_mismatch: 0.02,
    vos_hi: 2m, vos_lo: -1m, t_cmp: 5n, cmp_gbw: 100M, cmp_a0: 1000, t_latch: 1n, t_logic: 1n, t_sw: 0.5n})"#;

#[test]
fn ideal_window_sensitivities_are_one_and_minus_one() {
    // T = 2·C·ΔV/I (common practice): ∂ln T/∂ln c = 1, ∂ln T/∂ln i = −1.
    let s = |key: &str| {
        eval_f64(&format!(
            r#"let o = osc("window", #{{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2}});
            let r = o.sensitivity().filter(|r| r.key == "{key}"); r[0].normalised"#
        ))
    };
    assert!((s("c") - 1.0).abs() < 1e-9);
    assert!((s("i") + 1.0).abs() < 1e-9);
}

#[test]
fn sensitivities_with_every_parasitic_agree_with_a_central_difference() {
    // Reference: a plain central difference of the analytic period with a small relative step
    // (1e-5), computed in the script independently of o.sensitivity().
    for key in ["c", "i", "v_hi", "v_lo", "r_out", "c_in", "t_cmp", "cmp_gbw", "vdd"] {
        let got = eval_f64(&format!(
            "let o = {REAL}; let r = o.sensitivity().filter(|r| r.key == \"{key}\"); r[0].normalised"
        ));
        let want = eval_f64(&format!(
            "let o = {REAL}; let p = o.params()[\"{key}\"] ?? 1.8; let h = 1e-5 * p;
             let up = o.modified(#{{\"{key}\": p + h}}).period(); let dn = o.modified(#{{\"{key}\": p - h}}).period();
             (up - dn) / (2 * h) * p / o.period()"
        ));
        assert!((got - want).abs() < 1e-6 * want.abs().max(1e-3), "{key}: {got} vs central difference {want}");
    }
}

#[test]
fn ranking_puts_the_largest_contribution_first() {
    let first = eval(&format!("let o = {REAL}; o.sensitivity()[0].key")).unwrap().into_string().unwrap();
    // v_hi and v_lo weigh ∂ln T/∂ln v = 1.2/0.6 = 2 and 1 in the ideal window; with offsets
    // the high threshold stays the largest lever.
    assert_eq!(first, "v_hi");
}

#[test]
fn capacitor_tempco_alone_gives_the_same_period_tempco() {
    // T ∝ C = c·(1 + tc_c·(T − 27 °C)); box method over −40…125 °C gives exactly tc_c.
    let ppm = eval_f64(
        r#"let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, tc_c: 100e-6});
        o.tempco(#{t_min: -40, t_max: 125, n: 34}).ppm_per_c"#,
    );
    assert!((ppm - 100.0).abs() < 1e-9, "{ppm}");
}

#[test]
fn supply_coefficient_of_a_ladder_free_window_is_zero() {
    // Thresholds and current fixed: the ideal period does not depend on vdd.
    let pct = eval_f64(
        r#"let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2});
        o.supply_sensitivity(#{v_min: 1.6, v_max: 2.0, n: 5}).pct_per_v"#,
    );
    assert!(pct.abs() < 1e-12, "{pct}");
}

#[test]
fn one_ramp_jitter_is_the_wiener_result() {
    // σ = √(S_i·t_ramp/2)/I (common practice, Wiener-process variance; S_i one-sided):
    // reset oscillator, t_ramp = C·ΔV/I = 1p·1.2/1u = 1.2 µs, i_noise = 1 pA/√Hz.
    let s = eval_f64(r#"osc("reset", #{c: 1p, i: 1u, v_hi: 1.2, i_noise: 1e-12}).jitter().sigma_period"#);
    let want = (1e-24f64 * 1.2e-6 / 2.0).sqrt() / 1e-6;
    assert!((s / want - 1.0).abs() < 1e-9, "{s} vs {want}");
}

#[test]
fn phase_noise_follows_the_lorentzian_of_the_period_jitter() {
    // Demir, Mehrotra, Roychowdhury (IEEE TCAS-I 2000): L(f) = f0²·c/(π²f0⁴c² + f²) with
    // c = σ_T²·f0 for independent periods (reset oscillator).
    let m = eval(
        r#"let o = osc("reset", #{c: 1p, i: 1u, v_hi: 1.2, i_noise: 1e-12});
        let j = o.jitter(); let pn = o.phase_noise(series([1e3, 1e5, 1e6]));
        #{sigma: j.sigma_period, f0: 1.0 / o.period(), l: pn.l_dbc}"#,
    )
    .unwrap()
    .cast::<rhai::Map>();
    let sigma = m["sigma"].as_float().unwrap();
    let f0 = m["f0"].as_float().unwrap();
    let l = m["l"].clone().cast::<tickwork::num::Series>();
    let c = sigma * sigma * f0;
    for (k, fm) in [1e3, 1e5, 1e6].iter().enumerate() {
        let want = 10.0 * (f0 * f0 * c / (std::f64::consts::PI.powi(2) * f0.powi(4) * c * c + fm * fm)).log10();
        assert!((l.as_slice()[k] - want).abs() < 1e-9, "{fm} Hz: {} vs {want}", l.as_slice()[k]);
    }
}

#[test]
fn device_level_noise_does_not_beat_the_navid_lee_dutton_bound() {
    // Navid, Lee, Dutton (IEEE JSSC 2005): L ≥ 7.33·kT/P·(f0/f)² (factor from memory). A
    // charging current whose noise is the channel thermal noise of a strong-inversion mirror
    // (two devices, 4kT·γ·gm each, γ = 2/3, gm = 2I/V_ov with V_ov = 0.2 V; common practice)
    // must not reach below it with the power the ramps draw from the supply.
    let k_t = 1.380649e-23 * 300.15;
    let i = 1e-6;
    let s_i: f64 = 2.0 * 4.0 * k_t * (2.0 / 3.0) * (2.0 * i / 0.2);
    let m = eval(&format!(
        r#"let o = osc("window", #{{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, i_noise: {}, vn_cmp: 30n, cmp_nbw: 20M}});
        o.phase_noise(span_log(1e3, 1e6, 4))"#,
        s_i.sqrt()
    ))
    .unwrap()
    .cast::<rhai::Map>();
    assert!(!m["beats_bound"].as_bool().unwrap());
    let fom = m["fom"].clone().cast::<tickwork::num::Series>();
    let bound = m["fom_bound"].as_float().unwrap();
    assert!(fom.as_slice().iter().all(|f| *f <= bound), "{fom:?} vs {bound}");
}

#[test]
fn a_process_mirror_has_the_thermal_noise_of_its_two_devices() {
    // Hand computation: 4kTγ·(gm_out + ratio²·gm_in) (Razavi, Design of Analog CMOS ICs, §7.3;
    // γ = 2/3 for a long channel in saturation), with k from CODATA 2018, T = 300.15 K, and
    // each device's gm taken at the Vgs that carries its current (solved here independently of
    // the mirror's own bias).
    use tickwork::physics::mirror::{Mirror, MirrorKind};
    use tickwork::physics::mosfet::{Mos, MosType};
    use tickwork::physics::process::Process;
    let p = Process::demo180();
    for (t, ratio) in [(MosType::N, 1.0), (MosType::P, 1.0), (MosType::N, 2.0)] {
        let i = 1e-6;
        let m = Mirror::from_process(&p, MirrorKind::Simple, t, i, ratio, 4e-6, 2e-6, 0.0).unwrap();
        let unit = Mos::from_process(&p, t, 4e-6, 2e-6).unwrap();
        let vgs = unit.diode_vgs(i, 27.0).unwrap();
        let gm_in = unit.gm(vgs, vgs, 27.0);
        let gm_out = Mos::from_process(&p, t, 4e-6 * ratio, 2e-6).unwrap().gm(vgs, vgs, 27.0);
        let want = 4.0 * 1.380649e-23 * 300.15 * (2.0 / 3.0) * (gm_out + ratio * ratio * gm_in);
        let got = m.noise_psd();
        assert!((got / want - 1.0).abs() < 1e-6, "{t:?} ×{ratio}: {got:e} vs hand {want:e} A²/Hz");
    }
    // A behavioural mirror has no devices, so no device noise.
    assert_eq!(Mirror::explicit(1e-6, 1e9, 0.2, 0.0).unwrap().noise_psd(), 0.0);
}

#[test]
fn an_oscillator_from_a_process_takes_its_noise_from_its_devices() {
    // osc_from without noise keys: the mirrors' and input pairs' thermal noise; a key given
    // replaces the devices' value for that source.
    let base = r#"let p = process("demo180");
        let o = osc_from(p, "window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2});"#;
    let dev = eval(&format!("{base} let j = o.jitter(); [j.from_devices, j.sigma_period, j.contributions.current, j.contributions.threshold]")).unwrap();
    let dev = dev.cast::<rhai::Array>();
    assert!(dev[0].as_bool().unwrap());
    let (sp, si, sv) = (dev[1].as_float().unwrap(), dev[2].as_float().unwrap(), dev[3].as_float().unwrap());
    assert!(si > 0.0 && sv > 0.0, "current {si:e}, threshold {sv:e}");
    assert!(sp >= si.max(sv) && sp <= si + sv + 1e-30, "σ_T {sp:e} combines {si:e} and {sv:e}");
    // Replacing both device sources by zero-valued keys leaves no noise at all.
    let e = eval(&format!(
        "{base} let q = osc_from(p, \"window\", #{{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, i_noise: 0, vn_cmp: 0}}); \
         let r = \"no error\"; try {{ q.jitter(); }} catch (e) {{ r = `${{e}}`; }} r"
    ))
    .unwrap();
    assert!(e.into_string().unwrap().contains("no noise source"));
}
