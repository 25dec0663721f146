//! Error messages: `file:line:col: message`, the source line and a caret, a non-zero exit,
//! positions exact in the original text even after SI literals were rewritten.
use crate::cli_util;
use cli_util::*;

fn run_err(src: &str) -> String {
    let p = Project::new();
    p.write("e.rhai", src);
    let o = p.tickwork(&["run", "e.rhai"]);
    assert_eq!(o.status.code(), Some(1), "expected a script error; stdout: {}", stdout(&o));
    stderr(&o)
}

#[test]
fn syntax_error_after_si_literals_points_at_the_original_column() {
    // `2pF` and `1.5uA` are rewritten to longer text; the column must still be that of `)`.
    let e = run_err("let a = 1;\nlet b = 2pF * 1.5uA + );\n");
    assert!(e.starts_with("e.rhai:2:23: syntax error"), "{e}");
    assert!(e.contains("    2 | let b = 2pF * 1.5uA + );\n      |                       ^"), "{e}");
}

#[test]
fn runtime_error_position_and_message() {
    let e = run_err("let s = span(0, 1, 5);\nlet t = span(0, 1, 4);\nlet u = s + t;\n");
    assert!(e.starts_with("e.rhai:3:11: series lengths differ: 5 and 4"), "{e}");
}

#[test]
fn error_inside_a_function_names_the_call() {
    let e = run_err("fn f(x) {\n  x.quantile(2.0)\n}\nlet s = span(0, 1, 3);\nf(s);\n");
    assert!(e.contains("e.rhai:2:5: quantile p must be in [0, 1], got 2"), "{e}");
    assert!(e.contains("in 'f' called at e.rhai:5"), "{e}");
}

#[test]
fn undefined_variable_is_caught_before_running() {
    let e = run_err("print(\"first\");\nlet x = periodd * 2;\n");
    assert!(e.starts_with("e.rhai:2:9: undefined name 'periodd'"), "{e}");
}

#[test]
fn failed_run_leaves_the_previous_report() {
    let p = Project::new();
    p.write("r.rhai", "show(\"x\", 1.0);\n");
    assert!(p.tickwork(&["run", "r.rhai"]).status.success());
    let before = std::fs::read_to_string(p.path().join("out/r/report.md")).unwrap();
    p.write("r.rhai", "show(\"x\", 2.0);\nlet y = nope;\n");
    let o = p.tickwork(&["run", "r.rhai"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("no report written; the previous one"), "{}", stderr(&o));
    assert_eq!(std::fs::read_to_string(p.path().join("out/r/report.md")).unwrap(), before);
}

#[test]
fn operation_limit_stops_a_runaway_script() {
    let p = Project::new();
    p.write("loop.rhai", "let n = 0;\nloop {\n  n += 1;\n}\n");
    let o = p.tickwork(&["run", "loop.rhai", "--max-ops", "100000"]);
    assert_eq!(o.status.code(), Some(1));
    let e = stderr(&o);
    assert!(e.contains("loop.rhai:3:"), "{e}");
    assert!(e.contains("script stopped after 100000 operations"), "{e}");
    assert!(e.contains("--max-ops"), "{e}");
}

#[test]
fn a_large_enough_limit_lets_the_same_work_finish() {
    let p = Project::new();
    p.write("count.rhai", "let n = 0;\nfor i in 0..1000 { n += i; }\nprint(n);\n");
    let o = p.tickwork(&["run", "count.rhai", "--max-ops", "100000"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "499500\n"); // Σ 0..999 = 999·1000/2
}

#[test]
fn missing_script_file_is_a_clear_error() {
    let p = Project::new();
    let o = p.tickwork(&["run", "nothere.rhai"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("nothere.rhai: cannot read the script"), "{}", stderr(&o));
}

#[test]
fn scripts_cannot_import_from_outside_the_project() {
    let outer = Project::new();
    outer.write("secret.rhai", "fn f() { 1 }\n");
    let p = Project::new();
    let rel = format!("{}/secret", outer.path().display());
    p.write("i.rhai", &format!("import \"{rel}\" as s;\nprint(s::f());\n"));
    let o = p.tickwork(&["run", "i.rhai"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("outside the project root"), "{}", stderr(&o));
}

#[test]
fn modules_from_stdlib_and_beside_the_script() {
    let p = Project::new();
    p.write("lib/helpers.rhai", "/// Twice x.\nfn twice(x) { 2.0 * x }\nfn cap() { 2p }\n");
    p.write(
        "lib/m.rhai",
        "import \"ratio\" as r;\nimport \"helpers\" as h;\nprint(h::twice(r::pct(1.5, 1.0)));\nprint(h::cap());\n",
    );
    let o = p.tickwork(&["run", "lib/m.rhai"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "100.0\n2e-12\n");
}

#[test]
fn every_stdlib_file_is_embedded() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("stdlib");
    for e in std::fs::read_dir(dir).unwrap() {
        let name = e.unwrap().path().file_stem().unwrap().to_string_lossy().to_string();
        assert!(
            tickwork::engine::stdlib::get(&name).is_some(),
            "stdlib/{name}.rhai is not listed in src/engine/stdlib.rs"
        );
    }
}
