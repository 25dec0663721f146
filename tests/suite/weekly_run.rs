//! The weekly run: a folder of scripts run as one batch (sub-paths kept, same-named scripts
//! apart, `--set` taken by the scripts that declare it), `OUT/index.md`, and the history.
use std::path::Path;

use crate::cli_util;
use cli_util::*;
use tickwork::report::history::{History, Status};

/// period = 2·C·1.66 V / 1 µA (the window's ideal formula by hand: 1 pF gives 3.32 µs).
const OSC: &str = "\
/// Window oscillator period.
const C = 1pF;
let t = 2.0 * C * 1.66 / 1uA;
metric(\"osc.period\", t, \"s\", #{max: 4u});
";
/// The same file name in another folder, with a constant of the same name and its own metric.
const REF: &str = "\
const C = 1pF;
metric(\"ref.c\", C, \"F\", #{min: 0.5p, max: 2p});
";
const TOP: &str = "metric(\"top.n\", 3.0, \"\");\n";

/// A design repo: design/osc/period.rhai, design/ref/period.rhai, design/top.rhai, and a module
/// design/osc/_helper.rhai that a folder run skips.
pub fn design_repo() -> Project {
    let p = Project::new();
    p.write("design/osc/period.rhai", OSC);
    p.write("design/ref/period.rhai", REF);
    p.write("design/top.rhai", TOP);
    p.write("design/osc/_helper.rhai", "fn twice(x) { 2.0 * x }\n");
    p
}

fn read(p: &Path) -> String {
    std::fs::read_to_string(p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

#[test]
fn a_folder_runs_recursively_with_sub_paths_and_one_index() {
    let p = design_repo();
    let o = p.tickwork(&["run", "design", "--out", "out", "--threads", "2"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    // Same-named scripts keep their folders; the underscore module is not a script.
    for sub in ["osc/period", "ref/period", "top"] {
        assert!(p.path().join("out").join(sub).join("report.md").is_file(), "{sub}");
    }
    assert!(!p.path().join("out/osc/_helper").exists());
    assert_eq!(stdout(&o), "tickwork: 3 scripts run: 0 failed, 0 with a metric out of spec\n");
    let index = read(&p.path().join("out/index.md"));
    assert!(
        index.contains("| [osc/period](osc/period/report.md) | `osc.period` | 3.320 µs | ≤ 4.00 µs | pass |"),
        "{index}"
    );
    assert!(
        index.contains("| [ref/period](ref/period/report.md) | `ref.c` | 1.000 pF | 500 fF … 2.00 pF | pass |"),
        "{index}"
    );
    assert!(index.contains("| [top](top/report.md) | `top.n` | 3.000 | — | — |"), "{index}");
    // Stable order and bytes: a second run with one thread writes the same index.
    let o = p.tickwork(&["run", "design", "--out", "out", "--threads", "1"]);
    assert_eq!(o.status.code(), Some(0));
    assert_eq!(read(&p.path().join("out/index.md")), index);
}

#[test]
fn set_in_a_batch_goes_to_the_scripts_that_declare_it() {
    let p = design_repo();
    // 2·1.5 pF·1.66 V / 1 µA = 4.98 µs: out of spec, exit 3.
    let o = p.tickwork(&["run", "design", "--set", "C=1.5p"]);
    assert_eq!(o.status.code(), Some(3), "{}", stderr(&o));
    assert!(stdout(&o).contains("--set C taken by osc/period, ref/period\n"), "{}", stdout(&o));
    assert!(stdout(&o).contains("3 scripts run: 0 failed, 1 with a metric out of spec"), "{}", stdout(&o));
    let r = read(&p.path().join("out/osc/period/report.md"));
    assert!(r.contains("`--set C=1.5p`"), "{r}");
    assert!(!read(&p.path().join("out/top/report.md")).contains("--set"));
    // A name no script declares is refused before anything runs.
    let o = p.tickwork(&["run", "design", "--set", "VDD=1.6", "--out", "other"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        stderr(&o).contains("--set VDD: no script of this run declares a top-level constant 'VDD'"),
        "{}",
        stderr(&o)
    );
    assert!(!p.path().join("other").exists());
}

#[test]
fn same_named_files_given_one_by_one_are_refused() {
    let p = design_repo();
    let o = p.tickwork(&["run", "design/osc/period.rhai", "design/ref/period.rhai"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("would both write OUT/period/"), "{}", stderr(&o));
}

#[test]
fn history_records_every_script_of_every_run() {
    let p = design_repo();
    for (set, code) in [("C=1p", 0), ("C=1.1p", 0), ("C=1.3p", 3)] {
        let o = p.tickwork(&["run", "design", "--history", "h.jsonl", "--set", set, "--seed", "7"]);
        assert_eq!(o.status.code(), Some(code), "{set}: {}", stderr(&o));
    }
    let h = History::read(&p.path().join("h.jsonl")).unwrap();
    assert!(h.bad.is_empty(), "{:?}", h.bad);
    assert_eq!(h.records.len(), 9);
    assert_eq!(h.runs(), [1, 2, 3]);
    let osc: Vec<_> = h.records.iter().filter(|r| r.report == "osc/period").collect();
    // 2·C·1.66 V / 1 µA for C = 1.0, 1.1, 1.3 pF (by hand).
    let periods: Vec<f64> = osc.iter().map(|r| r.metrics[0].value).collect();
    for (got, want) in periods.iter().zip([3.32e-6, 3.652e-6, 4.316e-6]) {
        assert!((got / want - 1.0).abs() < 1e-12, "{got} vs {want}");
    }
    assert_eq!(osc.iter().map(|r| r.status).collect::<Vec<_>>(), [Status::Pass, Status::Pass, Status::SpecFailed]);
    let r = osc[2];
    assert_eq!(r.script.as_deref(), Some("design/osc/period.rhai"));
    assert_eq!(r.metrics[0].unit, "s");
    assert_eq!(r.metrics[0].max, Some(4e-6));
    assert_eq!(r.seed, 7);
    assert_eq!(r.overrides.get("C").map(String::as_str), Some("1.3p"));
    assert_eq!(r.script_sha256.as_deref(), Some(tickwork::report::provenance::sha256_hex(OSC.as_bytes()).as_str()));
    assert!(r.tool.starts_with("tickwork "));
    // The temp folder is not a git checkout.
    assert_eq!(r.commit, None);
    let top = h.records.iter().find(|r| r.report == "top").unwrap();
    assert!(top.overrides.is_empty());
}

#[test]
fn history_names_the_commit_of_a_git_checkout() {
    let p = design_repo();
    let hash = "4b825dc642cb6eb9a060e54bf8d69288fbee4904";
    p.write(".git/HEAD", "ref: refs/heads/main\n");
    p.write(".git/refs/heads/main", &format!("{hash}\n"));
    let o = p.tickwork(&["run", "design/top.rhai", "--history", "h.jsonl"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let h = History::read(&p.path().join("h.jsonl")).unwrap();
    assert_eq!(h.records[0].commit.as_deref(), Some(hash));
}

#[test]
fn a_failed_script_is_recorded_and_the_rest_still_run() {
    let p = design_repo();
    p.write("design/broken.rhai", "let x = ;\n");
    let o = p.tickwork(&["run", "design", "--history", "h.jsonl"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("design/broken.rhai:1:"), "{}", stderr(&o));
    assert!(stdout(&o).contains("4 scripts run: 1 failed, 0 with a metric out of spec"), "{}", stdout(&o));
    let h = History::read(&p.path().join("h.jsonl")).unwrap();
    let b = h.records.iter().find(|r| r.report == "broken").unwrap();
    assert_eq!(b.status, Status::Error);
    assert!(b.metrics.is_empty());
    assert!(
        read(&p.path().join("out/index.md"))
            .contains("| [broken](broken/report.md) | `design/broken.rhai` | **script error**")
    );
}
