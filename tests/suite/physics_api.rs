//! Script-level interface of the physics layer: every registered function is documented,
//! the objects and methods work from a script, process files are read through the sandbox and
//! recorded, and bad arguments give errors naming the parameter.

use tickwork::engine::sandbox::Sandbox;
use tickwork::engine::session::{Session, Shared};
use tickwork::engine::{self, script::run_source};

fn session(root: &std::path::Path) -> Shared {
    let sandbox = Sandbox::new(root, &root.join("out"), root).unwrap();
    let mut s = Session::new("t", sandbox);
    s.echo = false;
    Shared::new(s)
}

fn run(text: &str) -> Result<Shared, String> {
    let dir = tempfile::tempdir().unwrap();
    run_in(dir.path(), text)
}

fn run_in(root: &std::path::Path, text: &str) -> Result<Shared, String> {
    let s = session(root);
    let e = engine::build(&s, engine::DEFAULT_MAX_OPS);
    run_source(&e, &s, "t.rhai", text, engine::DEFAULT_MAX_OPS).map_err(|e| e.message)?;
    Ok(s)
}

fn eval_f64(expr: &str) -> f64 {
    let dir = tempfile::tempdir().unwrap();
    let s = session(dir.path());
    let e = engine::build(&s, engine::DEFAULT_MAX_OPS);
    e.eval::<f64>(expr).unwrap_or_else(|err| panic!("{expr}: {err}"))
}

#[test]
fn objects_and_methods_from_a_script() {
    // Values agree with the Rust layer (tested against outside sources elsewhere).
    let p = tickwork::physics::process::Process::demo180();
    let m =
        tickwork::physics::mosfet::Mos::from_process(&p, tickwork::physics::mosfet::MosType::N, 2e-6, 0.5e-6).unwrap();
    let id = eval_f64(r#"let p = process("demo180"); let m = p.nmos(2e-6, 0.5e-6); m.id(0.6, 0.9, 27)"#);
    assert_eq!(id, m.id(0.6, 0.9, 27.0));
    let k =
        eval_f64(r#"let m = process("demo180").nmos(2e-6, 0.5e-6); let s = m.id(span(0.0, 1.8, 7), 0.9, 27); s[3]"#);
    assert!((k / m.id(0.9, 0.9, 27.0) - 1.0).abs() < 1e-12); // span point 3 is 0.9 up to rounding
    assert!((eval_f64("thermal_voltage(26.85)") - 0.025852).abs() < 1e-6);
    let t = eval_f64(r#"let c = comparator(#{a0: 200.0, gbw: 50e6, slew: 40e6, v_swing: 0.9}); c.delay(0.01)"#);
    assert!((t - 3.8059485531588233e-07).abs() < 1e-12); // scipy ODE, tests/reference/physics_reference.py
    let script = r#"
        let p = process("demo180");
        let ss = p.corner("ss_hot_low");
        show("vdd", ss.vdd(), "V");
        let sw = p.mos_switch("tg", 1u, 2u, 0.18u).on();
        show("ron", sw.ron(span(0, 1.8, 5)), "Ω");
        show("cap", sw.node_cap(0.9), "F");
        show("ped", sw.pedestal(0.9, 1p), "V");
        let lo = p.mirror(#{kind: "wide-swing", type: "n", i_ref: 1u, w: 4u, l: 2u});
        let hi = p.mirror(#{type: "p", i_ref: 1u, w: 4u, l: 2u});
        show("iout", lo.i_out(span(0, 1.8, 10)), "A");
        show("compliance", lo.compliance(), "V");
        let pm = pair_mismatch(hi, lo, span(0.3, 1.5, 4));
        show("sys", pm.systematic);
        let c = p.comparator(#{w: 4u, l: 1u, i_tail: 2u, c_load: 50f, hyst: 10m});
        show("cin", c.input_cap(span(0, 1.8, 5)), "F");
        show("ramp", c.delay_ramp(1e6), "s");
        let th = c.thresholds(0.9);
        show("hyst", th.rising - th.falling, "V");
        let tr = p.pair_tradeoff(#{i_tail: 2u, c_load: 50f, areas: span_log(1p, 100p, 3)});
        show("offset", tr.offset, "V");
        show("r", p.resistor("rpoly", 1u, 20u).r(0.5, 125), "Ω");
        show("c", p.capacitor("mim", 10u, 10u).c(1.0, 27), "F");
        show("moscap", p.moscap("n", 10u, 10u).c(span(0, 1.8, 4), 27), "F");
        show("cj", junction_cap(1f, span(0, 1.8, 3), 0.8, 0.5), "F");
        show("pel", pelgrom(5n, 1u, 1u), "V");
        let src = mirror(#{i_out: 1u, rout: 10M, v_compliance: 0.2, type: "p", vdd: 1.8});
        // No headroom at 1.8 V; at 1.0 V: 1 µA + (0.8 − 0.2) V / 10 MΩ = 1.06 µA.
        show("src", src.i_out(1.8) + src.i_out(1.0), "A");
    "#;
    let s = run(script).unwrap();
    let g = s.lock();
    let shown: Vec<String> = g.report.sections.iter().flat_map(|x| x.items.iter()).map(|i| format!("{i:?}")).collect();
    assert!(shown.iter().any(|t| t.contains("\"vdd\"") && t.contains("1.60 V")), "{shown:?}");
    assert!(shown.iter().any(|t| t.contains("\"hyst\"") && t.contains("10.0 mV")), "{shown:?}");
    assert!(shown.iter().any(|t| t.contains("\"pel\"") && t.contains("5.00 mV")), "{shown:?}");
    assert!(shown.iter().any(|t| t.contains("\"src\"") && t.contains("1.06 µA")), "{shown:?}");
    assert_eq!(shown.len(), 17);
}

#[test]
fn process_file_is_sandboxed_and_recorded() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("lab.toml"), tickwork::physics::process::DEMO180_TOML).unwrap();
    let s = run_in(dir.path(), r#"let p = process_file("lab.toml"); show("vt", p.nmos(1u, 1u).vt(27), "V");"#).unwrap();
    let g = s.lock();
    assert_eq!(g.inputs.len(), 1);
    assert!(g.inputs[0].0.ends_with("lab.toml") && g.inputs[0].1.len() == 64, "{:?}", g.inputs);
    drop(g);
    let bad = tickwork::physics::process::DEMO180_TOML.replacen("mu_exp = 1.5", "mu_exp = 15", 1);
    std::fs::write(dir.path().join("bad.toml"), bad).unwrap();
    let e = run_in(dir.path(), r#"let p = process_file("bad.toml");"#).unwrap_err();
    assert!(e.contains("bad.toml") && e.contains("'nmos.mu_exp' = 15 is out of range"), "{e}");
    let e = run_in(dir.path(), r#"let p = process_file("../outside.toml");"#).unwrap_err();
    assert!(e.contains("process_file"), "{e}");
    let e = run_in(dir.path(), r#"let p = process_file("missing.toml");"#).unwrap_err();
    assert!(e.contains("missing.toml"), "{e}");
}

#[test]
fn bad_arguments_name_the_parameter() {
    let cases = [
        (r#"process("demo90")"#, "no built-in process 'demo90'"),
        (r#"process("demo180").nmos(1u, 0.01u)"#, "l must be in"),
        (r#"process("demo180").nmos(1u, 1u).id(0.5, 0.9, 900)"#, "m.id: temp must be in"),
        (r#"process("demo180").nmos(1u, 1u).id(0.5, "x", 27)"#, "m.id: vds must be a number"),
        (r#"process("demo180").nmos(1u, 1u).vgs_for(-1u, 0.9, 27)"#, "id must be > 0"),
        (r#"process("demo180").mirror(#{i_ref: 1u, w: 4u, l: 2u, ratoi: 2})"#, "mirror: unknown key 'ratoi'"),
        (r#"process("demo180").mirror(#{w: 4u, l: 2u})"#, "mirror: key 'i_ref' is required"),
        (r#"process("demo180").mirror(#{kind: "triple", i_ref: 1u, w: 4u, l: 2u})"#, "key 'kind'"),
        (r#"process("demo180").mos_switch("x", 1u, 1u)"#, "switch kind must be"),
        (r#"process("demo180").mos_switch("tg", 1u, 1u)"#, "needs both widths"),
        (r#"process("demo180").corner("hot")"#, "no corner 'hot'"),
        (r#"comparator(#{a0: 100, gbw: 1e6, slew: 1e6})"#, "key 'v_swing' is required"),
        (r#"comparator(#{a0: 100, gbw: 1e6, slew: 1e6, v_swing: 0.9}).delay(1e-4)"#, "never toggles"),
        (r#"comparator(#{a0: 100, gbw: 1e6, slew: 1e6, v_swing: 0.9}).delay_ramp(-1)"#, "slope must be > 0"),
        (r#"mos_switch(#{ron: 1k}).injection(0.5, 0)"#, "c_node must be > 0"),
        (r#"junction_cap(1f, 0.5, 3.0, 0.5)"#, "phi"),
        (r#"process("demo180").resistor("metal", 1u, 1u)"#, "no resistor layer 'metal'"),
        (r#"process("demo180").nmos(1u, 1u).id(series([0.1, 0.2]) / 0.0, 0.9, 27)"#, "vgs[0] must be finite"),
        (r#"thermal_voltage(-300)"#, "temp must be in"),
        (r#"mirror(#{i_out: 1u, rout: 1M, v_compliance: 0.2, type: "p"})"#, "needs key 'vdd'"),
        (r#"process("demo180").pair_tradeoff(#{w: 1u, i_tail: 1u, c_load: 1p, areas: [1p]})"#, "unknown key 'w'"),
        (r#"process("demo180").nmos(1u, 1u).with_mismatch(2.0, 0)"#, "dvt must be in"),
        (r#"process("demo180").with_vdd(0)"#, "vdd must be in"),
    ];
    for (code, want) in cases {
        let e = run(&format!("let x = {code};")).unwrap_err();
        assert!(e.contains(want), "{code}: {e}");
    }
}
