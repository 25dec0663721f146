//! The REPL read through a pipe: the same statements give the same output as `tickwork run`,
//! variables and functions persist, multi-line entries continue, help shows signatures.
use crate::cli_util;
use cli_util::*;

const STATEMENTS: &str = "\
const C = 1pF;
let dv = 1.66V;
let i = span(1uA, 2uA, 3);
let t = 2 * C * dv / i;
show(\"periods\", t, \"s\");
show(\"first\", t[0], \"s\");
fn freq(p) {
    1.0 / p
}
print(eng(freq(t[0]), \"Hz\"));
import \"ratio\" as r;
print(eng(r::pct(t[2], t[0]), \"%\"));
";

#[test]
fn piped_repl_matches_batch_run() {
    let p = Project::new();
    p.write("same.rhai", STATEMENTS);
    let batch = p.tickwork(&["run", "same.rhai"]);
    assert!(batch.status.success(), "{}", stderr(&batch));
    let repl = p.repl(STATEMENTS);
    assert!(repl.status.success(), "{}", stderr(&repl));
    assert_eq!(stdout(&repl), stdout(&batch));
    // Hand calculation: 2·1 pF·1.66 V/1 µA = 3.32 µs → 301 kHz; at 2 µA the period halves (−50 %).
    assert_eq!(
        stdout(&batch),
        "periods = n = 3, min 1.66 µs, mean 2.40 µs, max 3.32 µs\nfirst = 3.32 µs\n301 kHz\n-50.0 %\n"
    );
}

#[test]
fn entries_continue_and_values_print() {
    let p = Project::new();
    let o = p.repl("let a = [1,\n 2,\n 3];\na.len()\nlet b = 1 +\n 2;\nb\n");
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "3\n3\n");
}

#[test]
fn errors_are_located_and_the_session_goes_on() {
    let p = Project::new();
    let o = p.repl("let x = 2;\nlet y = x +* 1;\nprint(x * 3);\n");
    assert_eq!(o.status.code(), Some(1)); // an entry failed
    assert_eq!(stdout(&o), "6\n");
    assert!(stderr(&o).contains("repl[2]:1:"), "{}", stderr(&o));
}

#[test]
fn help_shows_signature_units_and_description() {
    let p = Project::new();
    let o = p.repl("help eng\nhelp span\n");
    let out = stdout(&o);
    assert!(out.contains("eng(x: float, unit: string, digits: int) -> string"), "{out}");
    assert!(out.contains("n points from a to b inclusive"), "{out}");
    let o = p.repl("doc nosuchfn\n");
    assert!(stderr(&o).contains("no function named 'nosuchfn'"), "{}", stderr(&o));
}

#[test]
fn defs_writes_every_documented_and_registered_function() {
    let p = Project::new();
    let o = p.tickwork(&["defs", "--out", "defs.json"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(p.path().join("defs.json")).unwrap()).unwrap();
    let names: Vec<&str> = v["functions"].as_array().unwrap().iter().map(|f| f["name"].as_str().unwrap()).collect();
    assert_eq!(names.len(), tickwork::engine::docs::all().len());
    for must in ["eng", "span", "show", "plot", "process", "osc"] {
        assert!(names.contains(&must), "defs.json lacks {must}");
    }
    let nmos = v["functions"].as_array().unwrap().iter().find(|f| f["name"] == "nmos").unwrap();
    assert_eq!(nmos["params"][0]["type"], "Process");
    assert_eq!(nmos["result"], "Mos");
    // The default is the editor definition file with script-level types.
    let o = p.tickwork(&["defs"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let d = std::fs::read_to_string(p.path().join("tickwork.d.rhai")).unwrap();
    assert!(d.starts_with("module static;") && d.contains("fn osc(kind: string, params: map) -> Oscillator;"), "{d}");
}

#[test]
fn a_trailing_semicolon_suppresses_the_value_and_floats_print_exactly() {
    let p = Project::new();
    // Doubling is exact in binary, so 2·1.5e-6 is the double nearest 3e-6: engineering
    // notation to read, and `full` gives the shortest text that reads back exactly.
    let o = p.repl("1 + 2;\n2 * 1.5u\nfull\n");
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o), "3.000µ\n3e-6\n");
}

#[test]
fn interrupt_cancels_the_running_entry_and_the_session_goes_on() {
    // What Ctrl-C does while an entry runs: SIGINT to the process. The entry stops; variables
    // from earlier entries and later entries work.
    use std::io::{BufRead, BufReader, Write};
    use std::process::{Command, Stdio};
    let p = Project::new();
    let mut child = Command::new(env!("CARGO_BIN_EXE_tickwork"))
        .arg("repl")
        .current_dir(p.path())
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let pid = child.id() as i32;
    // A guard: a REPL that ignored the interrupt would run forever.
    std::thread::spawn(move || {
        std::thread::sleep(std::time::Duration::from_secs(60));
        unsafe { libc::kill(pid, libc::SIGKILL) };
    });
    let mut stdin = child.stdin.take().unwrap();
    stdin
        .write_all(
            b"let kept = 42;\nlet started = false; loop { if !started { print(\"started\"); started = true; } }\n",
        )
        .unwrap();
    let mut out = BufReader::new(child.stdout.take().unwrap());
    let mut line = String::new();
    out.read_line(&mut line).unwrap();
    assert_eq!(line, "started\n");
    unsafe { libc::kill(pid, libc::SIGINT) };
    stdin.write_all(b"kept + 1\n").unwrap();
    drop(stdin);
    let mut rest = String::new();
    std::io::Read::read_to_string(&mut out, &mut rest).unwrap();
    let o = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1), "{err}");
    assert!(err.contains("repl[2]: entry cancelled"), "{err}");
    assert_eq!(rest, "43\n");
}
