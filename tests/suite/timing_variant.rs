//! The per-sample evaluation path (`Variant`) and `on_process` against the plain path
//! (`with(...).cycle(...)`, `osc_from`) for every topology, explicit and from the demo process;
//! and the period model against values produced by the period model as it stood before its
//! quadrature and delay-phase integration were replaced (kept below, 1e-9 relative).
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::timing::from_process::{Choices, osc_from};
use tickwork::timing::{Mask, Osc};

use super::timing_transient::every;

/// Keys to vary for `o`: the capacitor, the charging element, and a parasitic it has.
fn varied(o: &Osc) -> Vec<&'static str> {
    let given: Vec<&'static str> = o.params.given().map(|(k, _)| k).collect();
    let mut keys = vec!["c", if given.contains(&"r") { "r" } else { "i" }];
    for k in ["vos_hi", "vos", "t_logic", "t_cmp", "t_reset"] {
        if given.contains(&k) {
            keys.push(k);
            break;
        }
    }
    keys
}

#[test]
fn variant_gives_the_plain_paths_numbers_for_every_topology() {
    for o in every() {
        let keys = varied(&o);
        let v = o.variant(&keys).unwrap();
        for scale in [0.97, 1.0, 1.04] {
            let values: Vec<f64> = keys.iter().map(|k| o.params.get(k) * scale).collect();
            let pairs: Vec<(String, f64)> = keys.iter().zip(&values).map(|(k, x)| (k.to_string(), *x)).collect();
            let plain = o.with(&pairs).and_then(|w| w.cycle(Mask::ALL));
            match (v.eval(&values), plain) {
                (Ok((t, d)), Ok(c)) => {
                    assert!((t - c.period).abs() <= 1e-13 * c.period, "{:?} {keys:?}: {t} vs {}", o.kind(), c.period);
                    assert!((d - c.duty).abs() <= 1e-12, "{:?}: duty {d} vs {}", o.kind(), c.duty);
                }
                (Err(a), Err(b)) => assert_eq!(a, b),
                (a, b) => panic!("{:?} {keys:?} ×{scale}: variant {a:?}, plain {b:?}", o.kind()),
            }
        }
    }
}

#[test]
fn on_process_rebuilds_the_same_oscillator_on_a_moved_process() {
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode, res_type: "rpoly".into() };
    let mut moved = Process::demo180();
    moved.cap_scale *= 1.05;
    moved.res_scale *= 0.97;
    for o in every().into_iter().filter(|o| o.origin().starts_with("process")) {
        // The same process gives the same numbers.
        assert_eq!(o.on_process(&Process::demo180()).unwrap().period().unwrap(), o.period().unwrap());
        let pairs: Vec<(String, f64)> = o.params.given().map(|(k, x)| (k.to_string(), x)).collect();
        let direct = osc_from(&moved, o.kind(), ch.clone(), &pairs).unwrap().period().unwrap();
        let t = o.on_process(&moved).unwrap().period().unwrap();
        assert_eq!(t, direct, "{:?}", o.kind());
        assert!((t / o.period().unwrap() - 1.0).abs() > 1e-3, "{:?}: the moved process changes the period", o.kind());
    }
    let explicit = every().into_iter().find(|o| o.origin() == "explicit numbers").unwrap();
    assert!(explicit.on_process(&moved).unwrap_err().contains("explicit numbers"));
}

/// The explicit window oscillator of the speed benchmark (benches/variant.rs and
/// benches/window_numpy.py hold the same numbers): the wake-up clock's 4 MHz candidate with
/// every parasitic of the ramp and a fixed delay chain. Invented numbers.
pub(crate) const BENCH_WINDOW: &[(&str, f64)] = &[
    ("c", 250e-15),
    ("i", 1.2e-6),
    ("v_lo", 0.5),
    ("v_hi", 1.1),
    ("c_vc1", 2e-3),
    ("c_vc2", 1e-4),
    ("c_swn", 5e-15),
    ("c_swp", 8e-15),
    ("c_in", 10e-15),
    ("r_out", 5e6),
    ("i_mismatch", 0.02),
    ("vos_hi", 3e-3),
    ("vos_lo", -2e-3),
    ("t_cmp", 2e-9),
    ("t_latch", 0.3e-9),
    ("t_logic", 0.3e-9),
    ("t_sw", 0.2e-9),
];

/// The six keys the benchmark varies.
pub(crate) const BENCH_KEYS: [&str; 6] = ["c", "i", "i_mismatch", "vos_hi", "vos_lo", "r_out"];

fn bench_window() -> Osc {
    let pairs: Vec<(String, f64)> = BENCH_WINDOW.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(tickwork::timing::Kind::Window, &pairs).unwrap()
}

#[test]
fn periods_stay_those_of_the_fixed_step_model() {
    // Produced by the period model as of commit ca82a0f (adaptive Gauss–Kronrod ramps to 1e-12,
    // fixed-step RK4 delay phases with at least 256 steps, two full cycles of the steady-state
    // iteration), printed with {:?}; the order of `every()`.
    const EVERY: [f64; 11] = [
        3.595319934041387e-7,
        2.5153230973282357e-7,
        2.130901439275138e-7,
        2.9106169041957555e-7,
        2.2802960231763674e-7,
        4.03483873268811e-7,
        3.308913090086578e-7,
        2.908292068931634e-7,
        2.396386114699249e-7,
        2.2389858824283503e-7,
        1.7926059282998862e-6,
    ];
    let all = every();
    assert_eq!(all.len(), EVERY.len());
    for (o, want) in all.iter().zip(EVERY) {
        let t = o.period().unwrap();
        assert!((t / want - 1.0).abs() <= 1e-9, "{:?} ({}): {t:e} vs {want:e}", o.kind(), o.origin());
    }
    // The benchmark oscillator at three points of its six keys (same source), with the duty.
    let v = bench_window().variant(&BENCH_KEYS).unwrap();
    for (x, (want_t, want_d)) in [
        ([250e-15, 1.2e-6, 0.02, 3e-3, -2e-3, 5e6], (2.7659952373044637e-7, 0.4969033746639344)),
        ([270e-15, 1.1e-6, -0.03, -4e-3, 5e-3, 2e6], (2.990981276349498e-7, 0.4730111508074494)),
        ([230e-15, 1.3e-6, 0.05, 8e-3, 1e-3, 20e6], (2.4478878308492807e-7, 0.5102848209006519)),
    ] {
        let (t, d) = v.eval(&x).unwrap();
        assert!(
            (t / want_t - 1.0).abs() <= 1e-9 && (d - want_d).abs() <= 1e-9,
            "{x:?}: ({t:e}, {d}) vs ({want_t:e}, {want_d})"
        );
    }
}
