//! The per-sample evaluation path: one analytic period of the benchmark window oscillator,
//! `Variant::eval` over varied samples of its six keys, the same 10^6 samples split over two
//! threads, and a demo180 window oscillator rebuilt on a moved process (`on_process` + period).
//! `benches/compare_variant.sh` sets these beside a numpy implementation of the same model.
use criterion::{Criterion, criterion_group, criterion_main};
use tickwork::physics::mirror::MirrorKind;
use tickwork::physics::process::Process;
use tickwork::timing::from_process::{Choices, osc_from};
use tickwork::timing::{Kind, Osc, Variant};

/// The benchmark window oscillator (tests/suite/timing_variant.rs and benches/window_numpy.py
/// hold the same numbers). Invented numbers.
const WINDOW: &[(&str, f64)] = &[
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
const KEYS: [&str; 6] = ["c", "i", "i_mismatch", "vos_hi", "vos_lo", "r_out"];

fn pairs(kv: &[(&str, f64)]) -> Vec<(String, f64)> {
    kv.iter().map(|(k, v)| (k.to_string(), *v)).collect()
}

/// `n` samples of the six keys, uniform in the ranges benches/window_numpy.py draws from
/// (xorshift64, fixed seed).
fn samples(n: usize) -> Vec<[f64; 6]> {
    let mut s: u64 = 0x7469_636b;
    let mut u = move || {
        s ^= s << 13;
        s ^= s >> 7;
        s ^= s << 17;
        (s >> 11) as f64 / (1u64 << 53) as f64
    };
    (0..n)
        .map(|_| {
            [
                250e-15 * (0.97 + 0.06 * u()),
                1.2e-6 * (0.97 + 0.06 * u()),
                -0.03 + 0.06 * u(),
                -5e-3 + 10e-3 * u(),
                -5e-3 + 10e-3 * u(),
                2e6 + 18e6 * u(),
            ]
        })
        .collect()
}

fn run(v: &Variant, xs: &[[f64; 6]]) -> f64 {
    xs.iter().map(|x| v.eval(x).unwrap().0).sum()
}

fn window(c: &mut Criterion) {
    let o = Osc::new(Kind::Window, &pairs(WINDOW)).unwrap();
    let v = o.variant(&KEYS).unwrap();
    let xs = samples(1000);
    let mut g = c.benchmark_group("window");
    g.bench_function("one_period", |b| b.iter(|| std::hint::black_box(o.period().unwrap())));
    g.bench_function("variant_eval_1000", |b| b.iter(|| std::hint::black_box(run(&v, &xs))));
    g.finish();
}

fn million(c: &mut Criterion) {
    let v = Osc::new(Kind::Window, &pairs(WINDOW)).unwrap().variant(&KEYS).unwrap();
    let xs = samples(1_000_000);
    let mut g = c.benchmark_group("window_1e6");
    g.sample_size(10);
    g.bench_function("two_threads", |b| {
        b.iter(|| {
            let (lo, hi) = xs.split_at(xs.len() / 2);
            let t = std::thread::scope(|s| {
                let a = s.spawn(|| run(&v, lo));
                run(&v, hi) + a.join().unwrap()
            });
            std::hint::black_box(t)
        })
    });
    g.finish();
}

fn process(c: &mut Criterion) {
    let ch = Choices { cap_type: "mim".into(), mirror: MirrorKind::Cascode, res_type: "rpoly".into() };
    let keys = [("c", 250e-15), ("i", 1.2e-6), ("v_lo", 0.5), ("v_hi", 1.1), ("t_latch", 0.3e-9), ("t_logic", 0.3e-9)];
    let o = osc_from(&Process::demo180(), Kind::Window, ch, &pairs(&keys)).unwrap();
    let mut moved = Process::demo180();
    moved.cap_scale *= 1.01;
    let mut g = c.benchmark_group("demo180_window");
    g.sample_size(10);
    g.bench_function("on_process_period", |b| {
        b.iter(|| std::hint::black_box(o.on_process(&moved).unwrap().period().unwrap()))
    });
    g.finish();
}

criterion_group!(benches, window, million, process);
criterion_main!(benches);
