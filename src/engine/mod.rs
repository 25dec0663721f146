//! The scripting engine: Rhai set-up, the source pre-pass, module resolution, sandboxed file
//! access, and registration of every native module. The only layer that knows about Rhai.
pub mod analysis_api;
pub mod api;
pub mod args;
pub mod core_api;
pub mod display;
pub mod division;
pub mod docs;
pub mod errors;
pub mod fit_api;
pub mod grid_api;
pub mod monte_carlo_api;
pub mod physics_api;
pub mod prepass;
pub mod reference_api;
pub mod repl_session;
pub mod report_api;
pub mod resolver;
pub mod sandbox;
pub mod script;
pub mod series_api;
pub mod session;
pub mod stdlib;
pub mod term;
pub mod timing_api;
pub mod trim_api;
pub mod value;

use rhai::Engine;

use session::Shared;

/// Default operation limit: enough for any design calculation that keeps its heavy loops
/// native, small enough to stop a runaway loop within seconds.
pub const DEFAULT_MAX_OPS: u64 = 50_000_000;

/// `print`: echo to the terminal and place the text in the report.
fn print_text(session: &Shared, text: &str) {
    let mut g = session.lock();
    if g.echo {
        term::out(text);
    }
    g.push(crate::report::Item::Text(text.to_string()));
}

/// A configured engine with every tickwork function registered, reporting into `session`.
pub fn build(session: &Shared, max_ops: u64) -> Engine {
    let mut engine = Engine::new();
    engine.set_max_operations(max_ops);
    engine.set_max_call_levels(64);
    engine.set_max_expr_depths(128, 64);
    engine.set_strict_variables(true);
    engine.set_fail_on_invalid_map_property(true);
    // Scripts may not evaluate text as code: what runs is what is in the file.
    engine.disable_symbol("eval");
    engine.set_module_resolver(resolver::Resolver::new(session.clone()));

    let s = session.clone();
    engine.on_print(move |text| print_text(&s, text));
    // Rhai turns a printed value into text with its `print` function, then calls the hook.
    // Its own text of a float is 0.000000000002 for 2e-12; use the shortest form that reads
    // back exactly instead.
    // NaN is never shown as a result: printing one is an error that says where it came from.
    engine.register_fn("print", |x: f64| -> Result<String, Box<rhai::EvalAltResult>> {
        if x.is_nan() {
            return Err("print: the value is NaN (not a number): an undefined result upstream (0/0, ln or sqrt of a negative number, inf - inf, the mean of nothing)".into());
        }
        Ok(format!("{x:?}"))
    });
    engine.on_debug(|text, _src, pos| term::err(&format!("debug (line {}): {text}", pos.line().unwrap_or(0))));

    division::register(&mut engine);
    display::register(&mut engine);
    core_api::register(&mut engine, session);
    series_api::register(&mut engine);
    report_api::register(&mut engine, session);
    physics_api::register(&mut engine, session);
    reference_api::register(&mut engine);
    timing_api::register(&mut engine, session);
    analysis_api::register(&mut engine);
    grid_api::register(&mut engine);
    fit_api::register(&mut engine, session);
    monte_carlo_api::register(&mut engine, session);
    trim_api::register(&mut engine);
    engine
}
