//! The command line against hostile surroundings: a full or closed standard error or output
//! never aborts, and a FIFO among the project's files is refused instead of read forever.
use std::process::{Command, Stdio};

use crate::cli_util::{Project, stderr};

const BIN: &str = env!("CARGO_BIN_EXE_tickwork");

#[test]
fn a_full_stderr_gives_the_normal_exit_code() {
    // `2>/dev/full`: every write to stderr fails with ENOSPC.
    let p = Project::new();
    p.write("bad.rhai", "let x = nosuch;\n");
    for (args, code) in
        [(vec!["run", "bad.rhai"], 1), (vec!["doc", "nosuch"], 1), (vec!["run", "--set", "x", "bad.rhai"], 2)]
    {
        let full = std::fs::OpenOptions::new().write(true).open("/dev/full").expect("/dev/full exists on Linux");
        let o = Command::new(BIN).args(&args).current_dir(p.path()).stderr(full).output().unwrap();
        assert_eq!(o.status.code(), Some(code), "{args:?}");
    }
}

#[test]
fn a_closed_stdout_gives_the_normal_exit_code() {
    // `tickwork doc | head -1`: the reader has gone before the listing is written.
    let p = Project::new();
    p.write("ok.rhai", "for k in 0..200 { print(`line ${k}`); }\n");
    for args in [vec!["doc"], vec!["run", "ok.rhai"]] {
        let mut child = Command::new(BIN)
            .args(&args)
            .current_dir(p.path())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        drop(child.stdout.take());
        let o = child.wait_with_output().unwrap();
        assert_eq!(o.status.code(), Some(0), "{args:?}: {}", stderr(&o));
    }
}

/// Make a FIFO at `path` (mkfifo(3)).
fn fifo(path: &std::path::Path) {
    use std::os::unix::ffi::OsStrExt;
    let c = std::ffi::CString::new(path.as_os_str().as_bytes()).unwrap();
    assert_eq!(unsafe { libc::mkfifo(c.as_ptr(), 0o600) }, 0, "mkfifo {}", path.display());
}

#[test]
fn a_fifo_is_refused_as_script_module_and_data() {
    let p = Project::new();
    for name in ["pipe.rhai", "pipe.toml", "pipe.csv"] {
        fifo(&p.path().join(name));
    }
    p.write("mod.rhai", "import \"pipe\" as m;\n");
    p.write("proc.rhai", "process_file(\"pipe.toml\");\n");
    p.write("csv.rhai", "read_csv(\"pipe.csv\");\n");
    let cases = [
        ("pipe.rhai", "pipe.rhai: cannot read the script: not a regular file"),
        ("mod.rhai", "'pipe.rhai' is not a regular file"),
        ("proc.rhai", "'pipe.toml' is not a regular file"),
        ("csv.rhai", "'pipe.csv' is not a regular file"),
    ];
    for (script, want) in cases {
        // A hang would block here forever; the FIFO has no writer.
        let o = p.tickwork(&["run", script]);
        assert_eq!(o.status.code(), Some(1), "{script}");
        assert!(stderr(&o).contains(want), "{script}: {}", stderr(&o));
    }
}

#[test]
fn the_script_path_in_the_provenance_is_relative_to_the_project_root() {
    // Run from the root and from a subfolder (with --root ..): the same report.md.
    let p = Project::new();
    p.write("scripts/clock.rhai", "show(\"t\", 2 * 1p * 0.9 / 1u, \"s\");\n");
    let a = p.tickwork(&["run", "scripts/clock.rhai", "--out", "out-a"]);
    assert_eq!(a.status.code(), Some(0), "{}", stderr(&a));
    let b = Command::new(BIN)
        .args(["run", "clock.rhai", "--root", "..", "--out", "../out-b"])
        .current_dir(p.path().join("scripts"))
        .output()
        .unwrap();
    assert_eq!(b.status.code(), Some(0), "{}", stderr(&b));
    let ra = std::fs::read_to_string(p.path().join("out-a/clock/report.md")).unwrap();
    let rb = std::fs::read_to_string(p.path().join("out-b/clock/report.md")).unwrap();
    assert!(ra.contains("- script: `scripts/clock.rhai` (SHA-256"), "{ra}");
    assert_eq!(ra, rb);
}

#[test]
fn save_report_in_a_run_names_the_script() {
    // One provenance for `run` and `save_report`: a snapshot written by the script says which
    // script wrote it, as the run's own report does.
    let p = Project::new();
    p.write("snap.rhai", "show(\"x\", 1.0);\nsave_report(\"snapshot\");\n");
    let o = p.tickwork(&["run", "snap.rhai", "--seed", "5"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let snap = std::fs::read_to_string(p.path().join("out/snap/snapshot/report.md")).unwrap();
    let full = std::fs::read_to_string(p.path().join("out/snap/report.md")).unwrap();
    let prov =
        |t: &str| t.lines().skip_while(|l| !l.starts_with("**Provenance**")).take(6).collect::<Vec<_>>().join("\n");
    assert!(snap.contains("- script: `snap.rhai` (SHA-256"), "{snap}");
    assert_eq!(prov(&snap), prov(&full));
}
