//! Engine overhead: a trivial script start to finish (process start, engine set-up, report
//! write), and a 10^6-element Series expression against the same arithmetic as a Rust loop.
use std::path::Path;
use std::process::Command;

use criterion::{Criterion, criterion_group, criterion_main};
use rhai::Scope;
use tickwork::engine::{
    self,
    sandbox::Sandbox,
    session::{Session, Shared},
};
use tickwork::num::Series;

fn trivial_run(c: &mut Criterion) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("trivial.rhai"), "let t = 2 * 1pF * 1.66V / 1uA;\nshow(\"period\", t, \"s\");\n")
        .unwrap();
    let exe = env!("CARGO_BIN_EXE_tickwork");
    c.bench_function("run_trivial_script", |b| {
        b.iter(|| {
            let o = Command::new(exe).args(["run", "trivial.rhai"]).current_dir(dir.path()).output().unwrap();
            assert!(o.status.success());
        })
    });
}

const N: usize = 1_000_000;

fn inputs() -> (Vec<f64>, Vec<f64>, Vec<f64>) {
    let a: Vec<f64> = (0..N).map(|k| 1.0 + k as f64 * 1e-6).collect();
    let b: Vec<f64> = (0..N).map(|k| 2.0 - k as f64 * 1e-7).collect();
    let c: Vec<f64> = (0..N).map(|k| (k % 7) as f64).collect();
    (a, b, c)
}

fn series_expression(c: &mut Criterion) {
    // As the tickwork binary does at start-up (src/main.rs).
    tickwork::num::alloc::keep_large_blocks();
    let (a, b, cc) = inputs();
    let mut g = c.benchmark_group("series_1e6_a_mul_b_plus_c_div_2");
    g.sample_size(30);
    g.bench_function("rust_loop", |bench| {
        bench.iter(|| {
            let out: Vec<f64> = a.iter().zip(&b).zip(&cc).map(|((x, y), z)| x * y + z / 2.0).collect();
            std::hint::black_box(out)
        })
    });
    let sandbox = Sandbox::new(Path::new("."), Path::new("."), Path::new(".")).unwrap();
    let mut s = Session::new("bench", sandbox);
    s.echo = false;
    let shared = Shared::new(s);
    let e = engine::build(&shared, engine::DEFAULT_MAX_OPS);
    let mut scope = Scope::new();
    scope.push("a", Series::from(a.clone()));
    scope.push("b", Series::from(b.clone()));
    scope.push("c", Series::from(cc.clone()));
    let ast = e.compile_with_scope(&scope, "a * b + c / 2.0").unwrap();
    g.bench_function("script", |bench| {
        bench.iter(|| {
            let r: Series = e.eval_ast_with_scope(&mut scope, &ast).unwrap();
            std::hint::black_box(r)
        })
    });
    g.finish();

    // One operation on its own: the per-operation cost against the same loop in Rust.
    let mut g = c.benchmark_group("series_1e6_a_mul_b");
    g.sample_size(30);
    g.bench_function("rust_loop", |bench| {
        bench.iter(|| {
            let out: Vec<f64> = a.iter().zip(&b).map(|(x, y)| x * y).collect();
            std::hint::black_box(out)
        })
    });
    let ast = e.compile_with_scope(&scope, "a * b").unwrap();
    g.bench_function("script", |bench| {
        bench.iter(|| {
            let r: Series = e.eval_ast_with_scope(&mut scope, &ast).unwrap();
            std::hint::black_box(r)
        })
    });
    g.finish();
}

/// The cost of the true-quotient `/` on integers (`engine::division`): it needs Rhai's fast
/// built-in operators off, so every scalar operator in a script loop is looked up. The same
/// loop with fast operators back on is the reference (there `3/5` would be 0 again).
fn scalar_operators(c: &mut Criterion) {
    let sandbox = Sandbox::new(Path::new("."), Path::new("."), Path::new(".")).unwrap();
    let mut s = Session::new("bench", sandbox);
    s.echo = false;
    let shared = Shared::new(s);
    let code = "let s = 0.0; for k in 0..100000 { s += k * 0.5 + k / 7 - 1.0; } s";
    let mut g = c.benchmark_group("scalar_loop_1e5");
    g.sample_size(20);
    for (name, fast) in [("fast_builtin_operators", true), ("true_quotient", false)] {
        let mut e = engine::build(&shared, engine::DEFAULT_MAX_OPS);
        e.set_fast_operators(fast);
        let ast = e.compile(code).unwrap();
        g.bench_function(name, |bench| bench.iter(|| std::hint::black_box(e.eval_ast::<f64>(&ast).unwrap())));
    }
    g.finish();
}

criterion_group!(benches, trivial_run, series_expression, scalar_operators);
criterion_main!(benches);
