//! The noisy transient against the quiet one: 10^4 cycles of the demo window oscillator with
//! and without its noise sources (target: noisy within 2× of quiet). `benches/noise_compare.sh`
//! prints the medians and the ratio from one run.
use criterion::{Criterion, criterion_group, criterion_main};
use tickwork::timing::transient::{Options, simulate};
use tickwork::timing::{Kind, Osc};

fn window() -> Osc {
    // Invented numbers (the demo scenario's window oscillator, explicit parts).
    let keys = [
        ("c", 250e-15),
        ("i", 1.2e-6),
        ("v_lo", 0.5),
        ("v_hi", 1.1),
        ("c_in", 12e-15),
        ("t_cmp", 4e-9),
        ("t_logic", 0.5e-9),
        ("t_sw", 0.2e-9),
        ("i_noise", 1.5e-12),
        ("vn_cmp", 60e-9),
        ("cmp_nbw", 50e6),
    ];
    let pairs: Vec<(String, f64)> = keys.iter().map(|(k, v)| (k.to_string(), *v)).collect();
    Osc::new(Kind::Window, &pairs).unwrap()
}

fn transient(c: &mut Criterion) {
    let o = window();
    let quiet = Options { points_per_phase: Some(0), ..Options::default() };
    let noisy = Options { noise_seed: Some(1), ..quiet.clone() };
    let mut g = c.benchmark_group("transient_1e4_cycles");
    g.sample_size(20);
    g.bench_function("quiet", |b| b.iter(|| simulate(&o, 10_000, &quiet).unwrap()));
    g.bench_function("noisy", |b| b.iter(|| simulate(&o, 10_000, &noisy).unwrap()));
    g.finish();
}

criterion_group!(benches, transient);
criterion_main!(benches);
