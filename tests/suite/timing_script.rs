//! The timing functions as scripts see them: results, budget map, and error messages that name
//! the key, run through the built binary.
use std::process::Command;

fn run(script: &str) -> (bool, String, String) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("t.rhai"), script).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_tickwork"))
        .args(["run", "t.rhai", "--out", "out"])
        .current_dir(dir.path())
        .output()
        .unwrap();
    (o.status.success(), String::from_utf8_lossy(&o.stdout).into(), String::from_utf8_lossy(&o.stderr).into())
}

#[test]
fn window_period_and_budget_from_a_script() {
    // 1 pF, 1.66 V, 1 µA → 3.32 µs (common practice, T = 2·C·ΔV/I)
    let (ok, out, err) = run(r#"
let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.07V, v_hi: 1.73V});
show("ideal", o.ideal_period(), "s");
let r = o.modified(#{t_logic: 5n, c_in: 20f});
let b = r.budget();
show("rows", b.rows.len());
show("sum", b.sum_alone + b.remainder - b.total_error, "s");
show("labels", b.waterfall.labels.len());
show("duty", r.duty());
"#);
    assert!(ok, "{err}");
    assert!(out.contains("ideal = 3.32 µs"), "{out}");
    assert!(out.contains("rows = 2") && out.contains("labels = 3"), "{out}");
}

#[test]
fn script_errors_name_the_key() {
    let cases = [
        (
            r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.2, v_hi: 1.2, colour: 3})"#,
            "unknown key 'colour'; valid keys are: c, i, v_lo",
        ),
        (r#"osc("window", #{c: "big", i: 1u, v_lo: 0.2, v_hi: 1.2})"#, "key 'c' must be a number"),
        (r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.2, v_hi: 1.2, t_logic: -1n})"#, "key 't_logic'"),
        (r#"osc("ring", #{c: 1p})"#, "unknown oscillator kind 'ring'"),
        (r#"osc("reset", #{c: 1p, i: 1u, v_hi: 1.0}).at(#{pressure: 1})"#, "at: unknown key 'pressure'"),
        (r#"osc_from("demo180", "window", #{c: 1p, i: 1u, v_lo: 0.2, v_hi: 1.2, mirror: "bent"})"#, "key 'mirror'"),
        (r#"osc_from("demo999", "window", #{c: 1p})"#, "no built-in process 'demo999'"),
    ];
    for (code, msg) in cases {
        let (ok, _, err) = run(&format!("let x = {code};\n"));
        assert!(!ok && err.contains(msg), "{code}: {err}");
    }
}

#[test]
fn example_script_runs() {
    // scripts/02-period-budget.rhai end to end: every timing call succeeds, the report has its
    // tables and both waterfall figures.
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/scripts/02-period-budget.rhai")).unwrap();
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("t.rhai"), text).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_tickwork"))
        .args(["run", "t.rhai", "--out", "out"])
        .current_dir(dir.path())
        .output()
        .unwrap();
    let (out, err) = (String::from_utf8_lossy(&o.stdout), String::from_utf8_lossy(&o.stderr));
    assert!(o.status.success(), "{err}");
    assert!(out.contains("window: ideal period = 250 ns") && out.contains("ping-pong: ideal period = 250 ns"), "{out}");
    let report = std::fs::read_to_string(dir.path().join("out/t/report.md")).unwrap();
    assert!(report.contains("| parasitic | alone (s)") && report.contains("interaction remainder"), "{report}");
    // two budget waterfalls and two simulated waveforms
    assert_eq!(report.matches(".svg)").count(), 4, "{report}");
}
