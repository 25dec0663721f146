//! Series maths on 10^6 elements as a script runs it (exp, ln, sum, pow), for the side-by-side
//! comparison with numpy in `benches/compare_series.sh`.
use std::path::Path;

use criterion::{Criterion, criterion_group, criterion_main};
use rhai::Scope;
use tickwork::engine::{
    self,
    sandbox::Sandbox,
    session::{Session, Shared},
};
use tickwork::num::Series;

const N: usize = 1_000_000;

fn series_maths(c: &mut Criterion) {
    // As the tickwork binary does at start-up (src/main.rs).
    tickwork::num::alloc::keep_large_blocks();
    // The same inputs as benches/series_numpy.py: 10^6 points from 0.5 to 2.5.
    let a = Series::span(0.5, 2.5, N);
    let sandbox = Sandbox::new(Path::new("."), Path::new("."), Path::new(".")).unwrap();
    let mut s = Session::new("bench", sandbox);
    s.echo = false;
    let shared = Shared::new(s);
    let e = engine::build(&shared, engine::DEFAULT_MAX_OPS);
    let mut scope = Scope::new();
    scope.push("a", a);
    let mut g = c.benchmark_group("series_1e6_maths");
    g.sample_size(30);
    for (name, expr) in [("exp", "exp(a)"), ("ln", "ln(a)"), ("pow", "a ** 1.7"), ("sum", "a.sum()")] {
        let ast = e.compile_with_scope(&scope, expr).unwrap();
        g.bench_function(name, |bench| {
            bench.iter(|| {
                let r: rhai::Dynamic = e.eval_ast_with_scope(&mut scope, &ast).unwrap();
                std::hint::black_box(r)
            })
        });
    }
    g.finish();
}

criterion_group!(benches, series_maths);
criterion_main!(benches);
