//! `--set NAME=VALUE` overrides of top-level constants.
use crate::cli_util;
use cli_util::*;

const SCRIPT: &str = "\
const C = 1pF;
const I = 1uA;
const N = 4;
const KIND = \"window\";
const FAST = false;
let t = 2.0 * C * 1.66 / I;
show(\"period\", t, \"s\");
print(N * 2);
print(KIND);
print(FAST);
";

fn run(sets: &[&str]) -> std::process::Output {
    let p = Project::new();
    p.write("s.rhai", SCRIPT);
    let mut args = vec!["run", "s.rhai"];
    for s in sets {
        args.push("--set");
        args.push(s);
    }
    p.tickwork(&args)
}

#[test]
fn without_overrides_the_script_values_hold() {
    let o = run(&[]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "period = 3.32 µs\n8\nwindow\nfalse\n");
}

#[test]
fn overrides_take_si_literals_and_keep_types() {
    // 2·2 pF·1.66 V / 4 µA = 1.66 µs (hand calculation)
    let o = run(&["C=2p", "I=4uA", "N=10", "KIND=pingpong", "FAST=true"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "period = 1.66 µs\n20\npingpong\ntrue\n");
}

#[test]
fn unknown_name_lists_the_declared_constants() {
    let o = run(&["VDD=1.6"]);
    assert_eq!(o.status.code(), Some(1));
    let e = stderr(&o);
    assert!(
        e.contains("--set VDD: the script declares no top-level constant 'VDD'; it declares: C, I, N, KIND, FAST"),
        "{e}"
    );
}

#[test]
fn wrong_type_is_an_error_naming_the_constant() {
    let o = run(&["N=2.5"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("--set N=2.5: N is an integer in the script"), "{}", stderr(&o));
    let o = run(&["C=big"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("--set C=big"), "{}", stderr(&o));
}

#[test]
fn malformed_set_is_a_usage_error() {
    let o = run(&["C"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("expected NAME=VALUE"), "{}", stderr(&o));
}

#[test]
fn constants_inside_functions_are_not_set_targets() {
    let p = Project::new();
    p.write("f.rhai", "fn f() { const X = 1; X }\nconst Y = 2;\nprint(f() + Y);\n");
    let o = p.tickwork(&["run", "f.rhai", "--set", "X=5"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("it declares: Y"), "{}", stderr(&o));
    let o = p.tickwork(&["run", "f.rhai", "--set", "Y=5"]);
    assert_eq!(stdout(&o), "6\n");
}

#[test]
fn multi_line_constant_expressions_are_wrapped_whole() {
    let p = Project::new();
    p.write("m.rhai", "const V = [\n  1.0,\n  2.0\n];\nprint(V.len());\nconst W = 3k\n");
    let o = p.tickwork(&["run", "m.rhai"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "2\n");
}
