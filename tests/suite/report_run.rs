//! End-to-end checks of `tickwork run` reports: byte-identical re-runs, changes confined to
//! the lines that depend on a changed constant, Markdown structure, SVG contents, exit codes.
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const BIN: &str = env!("CARGO_BIN_EXE_tickwork");

/// A script in the demo scenario (all numbers invented) using every report output.
const SCRIPT: &str = r#"/// # Wake-up clock period
/// Invented numbers for the 4 MHz demo clock.
const C = 2p;
const I_CHG = 1u;
const SWING = 0.9;
let t = C * SWING / I_CHG;
show("timing capacitor", C, "F");
show("period", t, "s");
print("charging with " + eng(I_CHG, "A"));

/// ## Capacitor sweep
let cs = span(1p, 4p, 4);
table(#{c: cs, t: cs * SWING / I_CHG}, #{columns: ["c", "t"], units: #{c: "F", t: "s"}});
plot(#{title: "Period versus C", x: cs, y: cs * SWING / I_CHG, x_label: "timing capacitor", x_unit: "F", y_label: "period", y_unit: "s"});

/// ## Budget
plot(#{title: "Error budget", kind: "bar", waterfall: true, labels: ["delay", "leakage"], y: [1.2, -0.2], y_label: "period error", y_unit: "%"});
plot(#{title: "Supply spread", kind: "histogram", x: span(4u, 5u, 30), x_label: "supply current", x_unit: "A"});
metric("osc.period", t, "s", #{min: 1.4u, max: 1.9u});
metric("osc.supply", 4.2u, "A", #{max: 5u});
"#;

fn run(dir: &Path, script: &str, args: &[&str]) -> Output {
    std::fs::write(dir.join("clock.rhai"), script).unwrap();
    Command::new(BIN)
        .current_dir(dir)
        .args(["run", "clock.rhai"])
        .args(args)
        .output()
        .expect("the tickwork binary runs")
}

fn files(out: &Path) -> Vec<(String, Vec<u8>)> {
    let mut v: Vec<(String, Vec<u8>)> = std::fs::read_dir(out)
        .unwrap()
        .flatten()
        .map(|e| (e.file_name().to_string_lossy().to_string(), std::fs::read(e.path()).unwrap()))
        .collect();
    v.sort();
    v
}

fn out_dir(dir: &Path) -> PathBuf {
    dir.join("out").join("clock")
}

#[test]
fn rerun_gives_byte_identical_files() {
    let a = tempfile::tempdir().unwrap();
    let b = tempfile::tempdir().unwrap();
    assert_eq!(run(a.path(), SCRIPT, &[]).status.code(), Some(0));
    let first = files(&out_dir(a.path()));
    let names: Vec<&str> = first.iter().map(|(n, _)| n.as_str()).collect();
    assert_eq!(
        names,
        [
            "fig-01-period-versus-c.svg",
            "fig-02-error-budget.svg",
            "fig-03-supply-spread.svg",
            "report.md",
            "results.json"
        ]
    );
    // Same folder again, and a different folder: the same bytes.
    assert_eq!(run(a.path(), SCRIPT, &[]).status.code(), Some(0));
    assert_eq!(files(&out_dir(a.path())), first);
    assert_eq!(run(b.path(), SCRIPT, &[]).status.code(), Some(0));
    assert_eq!(files(&out_dir(b.path())), first);
}

/// Lines of `a` and `b` that differ (the files have the same number of lines here).
fn changed_lines(a: &str, b: &str) -> Vec<(String, String)> {
    assert_eq!(a.lines().count(), b.lines().count());
    a.lines().zip(b.lines()).filter(|(x, y)| x != y).map(|(x, y)| (x.to_string(), y.to_string())).collect()
}

#[test]
fn changing_a_constant_changes_only_dependent_lines() {
    let a = tempfile::tempdir().unwrap();
    let b = tempfile::tempdir().unwrap();
    run(a.path(), SCRIPT, &[]);
    // The charging current feeds the period, the sweep table and the period plot, not C.
    run(b.path(), &SCRIPT.replace("const I_CHG = 1u;", "const I_CHG = 1.2u;"), &[]);
    let (ra, rb) = (out_dir(a.path()), out_dir(b.path()));
    let md = changed_lines(
        &std::fs::read_to_string(ra.join("report.md")).unwrap(),
        &std::fs::read_to_string(rb.join("report.md")).unwrap(),
    );
    let starts: Vec<&str> = md.iter().map(|(x, _)| x.split(':').next().unwrap_or("")).collect();
    assert!(md[0].0.starts_with("- script: `clock.rhai` (SHA-256"), "{md:?}");
    assert!(
        md.iter().any(|(x, y)| x.contains("| `osc.period` | 1.80 µs") && y.contains("| `osc.period` | 1.50 µs")),
        "{md:?}"
    );
    assert!(md.iter().any(|(x, y)| x == "- **period**: 1.80 µs" && y == "- **period**: 1.50 µs"), "{md:?}");
    assert!(md.iter().any(|(x, y)| x == "charging with 1.00 µA" && y == "charging with 1.20 µA"), "{md:?}");
    assert!(!starts.iter().any(|s| s.contains("timing capacitor")), "C did not change: {md:?}");
    // Script hash, metrics summary row, period line, print, 4 table rows, metric line.
    assert_eq!(md.len(), 9, "{md:?}");
    // The period plot changes; the budget and histogram plots do not depend on I_CHG.
    let read = |d: &Path, f: &str| std::fs::read(d.join(f)).unwrap();
    assert_ne!(read(&ra, "fig-01-period-versus-c.svg"), read(&rb, "fig-01-period-versus-c.svg"));
    assert_eq!(read(&ra, "fig-02-error-budget.svg"), read(&rb, "fig-02-error-budget.svg"));
    assert_eq!(read(&ra, "fig-03-supply-spread.svg"), read(&rb, "fig-03-supply-spread.svg"));
    let js = changed_lines(
        &std::fs::read_to_string(ra.join("results.json")).unwrap(),
        &std::fs::read_to_string(rb.join("results.json")).unwrap(),
    );
    assert_eq!(js.len(), 2, "the period value and the script hash: {js:?}");
}

#[test]
fn markdown_structure() {
    let d = tempfile::tempdir().unwrap();
    run(d.path(), SCRIPT, &[]);
    let md = std::fs::read_to_string(out_dir(d.path()).join("report.md")).unwrap();
    let pos = |needle: &str| md.find(needle).unwrap_or_else(|| panic!("'{needle}' missing from\n{md}"));
    // Title, provenance, estimates note, metrics, then the sections in script order, each
    // output below its own prose.
    let order = [
        "# clock\n",
        "**Provenance**",
        "> **Estimates.**",
        "**Metrics**",
        "# Wake-up clock period",
        "- **timing capacitor**: 2.00 pF",
        "```text\ncharging with 1.00 µA\n```",
        "## Capacitor sweep",
        "| c (F) | t (s) |",
        "![Period versus C](fig-01-period-versus-c.svg)\n\n*Figure 1: Period versus C*\n",
        "## Budget",
        "![Error budget](fig-02-error-budget.svg)",
        "![Supply spread](fig-03-supply-spread.svg)",
        "- metric `osc.period` = 1.80 µs, spec 1.40 µs … 1.90 µs: pass",
    ];
    let at: Vec<usize> = order.iter().map(|n| pos(n)).collect();
    assert!(at.windows(2).all(|w| w[0] < w[1]), "out of order: {at:?}\n{md}");
    // Every table (GitHub-flavoured): header, delimiter row of ---/---:, rows with as many cells.
    let lines: Vec<&str> = md.lines().collect();
    let mut tables = 0;
    for (k, l) in lines.iter().enumerate() {
        let is_delim = l.starts_with("| ---") && l.split('|').all(|c| matches!(c.trim(), "" | "---" | "---:"));
        if !is_delim {
            continue;
        }
        tables += 1;
        let cells = |s: &str| s.matches(" | ").count();
        let head = lines[k - 1];
        assert!(head.starts_with("| ") && head.ends_with(" |"), "{head}");
        assert!(k < 2 || lines[k - 2].is_empty(), "a table needs a blank line before it");
        let mut r = k + 1;
        while r < lines.len() && lines[r].starts_with('|') {
            assert_eq!(cells(lines[r]), cells(head), "row '{}' under '{head}'", lines[r]);
            r += 1;
        }
        assert!(r > k + 1, "a table without rows");
    }
    assert_eq!(tables, 2, "the metrics summary and the sweep table");
    assert!(md.contains("| 1.00p | 900n |"), "{md}");
}

#[test]
fn every_svg_parses_and_has_title_and_axis_labels() {
    let d = tempfile::tempdir().unwrap();
    run(d.path(), SCRIPT, &[]);
    let want = [
        ("fig-01-period-versus-c.svg", ["Period versus C", "timing capacitor (F)", "period (s)"]),
        ("fig-02-error-budget.svg", ["Error budget", "period error (%)", "delay"]),
        ("fig-03-supply-spread.svg", ["Supply spread", "supply current (A)", "count"]),
    ];
    for (file, texts) in want {
        let svg = std::fs::read_to_string(out_dir(d.path()).join(file)).unwrap();
        let doc = roxmltree::Document::parse(&svg).unwrap_or_else(|e| panic!("{file} is not XML: {e}"));
        assert_eq!(doc.root_element().tag_name().name(), "svg");
        let shown: Vec<String> = doc
            .descendants()
            .filter(|n| n.tag_name().name() == "text")
            .map(|n| n.text().unwrap_or("").trim().to_string())
            .collect();
        for t in texts {
            assert!(shown.iter().any(|s| s == t), "{file}: no text '{t}' in {shown:?}");
        }
    }
}

#[test]
fn failed_spec_exits_3_and_is_marked() {
    let d = tempfile::tempdir().unwrap();
    let script = SCRIPT.replace("#{max: 5u}", "#{max: 4u}");
    let o = run(d.path(), &script, &[]);
    assert_eq!(o.status.code(), Some(3), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(String::from_utf8_lossy(&o.stderr).contains("metric 'osc.supply' = 4.20 µA fails its spec ≤ 4.00 µA"));
    let md = std::fs::read_to_string(out_dir(d.path()).join("report.md")).unwrap();
    assert!(md.contains("| `osc.supply` | 4.20 µA | ≤ 4.00 µA | **FAIL** |"), "{md}");
    assert!(md.contains("**1 metric fails its spec.**"), "{md}");
    let js: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out_dir(d.path()).join("results.json")).unwrap()).unwrap();
    assert_eq!(js["pass"], false);
    assert_eq!(js["metrics"][1]["name"], "osc.supply");
    assert_eq!(js["metrics"][1]["pass"], false);
    assert_eq!(js["metrics"][1]["spec"]["max"], 4e-6);
    assert_eq!(js["metrics"][0]["pass"], true);
}

#[test]
fn script_error_exits_1_and_leaves_the_previous_report() {
    let d = tempfile::tempdir().unwrap();
    assert_eq!(run(d.path(), SCRIPT, &[]).status.code(), Some(0));
    let before = files(&out_dir(d.path()));
    let o = run(
        d.path(),
        &SCRIPT.replace("show(\"period\", t, \"s\");", "show(\"period\", t, \"s\"); let z = no_such_thing;"),
        &[],
    );
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("no report written; the previous one in"));
    assert_eq!(files(&out_dir(d.path())), before);
    // A bad metric name is a script error too, and says what a name may hold.
    let o = run(d.path(), &SCRIPT.replace("\"osc.supply\"", "\"Osc Supply\""), &[]);
    assert_eq!(o.status.code(), Some(1));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(err.contains("metric name 'Osc Supply'") && err.contains("lower-case letters a-z, digits 0-9"), "{err}");
}

#[test]
fn script_error_outranks_a_failed_spec() {
    let d = tempfile::tempdir().unwrap();
    std::fs::write(d.path().join("bad.rhai"), "let x = ;").unwrap();
    std::fs::write(d.path().join("spec.rhai"), "metric(\"f\", 2.0, \"Hz\", #{max: 1.0});").unwrap();
    let o = Command::new(BIN).current_dir(d.path()).args(["run", "spec.rhai", "bad.rhai"]).output().unwrap();
    assert_eq!(o.status.code(), Some(1));
    let o = Command::new(BIN).current_dir(d.path()).args(["run", "spec.rhai"]).output().unwrap();
    assert_eq!(o.status.code(), Some(3));
}

#[test]
fn provenance_lists_overrides_seed_and_stamp_only_on_request() {
    let d = tempfile::tempdir().unwrap();
    run(d.path(), SCRIPT, &["--set", "C=3p", "--seed", "7"]);
    let md = std::fs::read_to_string(out_dir(d.path()).join("report.md")).unwrap();
    assert!(md.contains("- overrides: `--set C=3p`\n- seed: 7\n"), "{md}");
    assert!(md.contains("- **timing capacitor**: 3.00 pF"), "{md}");
    assert!(!md.contains("run at:"));
    let sha = tickwork::report::provenance::sha256_hex(SCRIPT.as_bytes());
    assert!(md.contains(&format!("- script: `clock.rhai` (SHA-256 `{sha}`)")), "{md}");
    run(d.path(), SCRIPT, &["--stamp"]);
    let md = std::fs::read_to_string(out_dir(d.path()).join("report.md")).unwrap();
    let line = md.lines().find(|l| l.starts_with("- run at: ")).expect("a stamp line");
    assert_eq!(line.len(), "- run at: 2026-12-01T22:52:16Z".len(), "{line}");
}

#[test]
fn repl_save_report_writes_inside_the_output_folder() {
    use std::io::Write;
    let d = tempfile::tempdir().unwrap();
    let mut child = Command::new(BIN)
        .current_dir(d.path())
        .args(["repl"])
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    let input = "show(\"period\", 250n, \"s\");\nmetric(\"osc.period\", 250n, \"s\");\nsave_report(\"today\");\nsave_report(\"../escape\");\n";
    child.stdin.take().unwrap().write_all(input.as_bytes()).unwrap();
    let o = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(err.contains("must be a plain relative path inside the output folder"), "{err}");
    let md = std::fs::read_to_string(d.path().join("out/repl/today/report.md")).unwrap();
    assert!(md.contains("- script: interactive session"), "{md}");
    assert!(md.contains("- **period**: 250 ns"), "{md}");
    assert!(d.path().join("out/repl/today/results.json").exists());
    assert!(!d.path().join("out/escape").exists());
}

#[test]
fn provenance_lists_imported_project_modules_with_their_hash() {
    let d = tempfile::tempdir().unwrap();
    let helper = "fn double(x) { x * 2.0 }\n";
    std::fs::write(d.path().join("helpers.rhai"), helper).unwrap();
    let script = "import \"helpers\" as h;\nimport \"ratio\" as r;\nshow(\"twice\", h::double(1.5));\n";
    let o = run(d.path(), script, &[]);
    assert_eq!(o.status.code(), Some(0), "{}", String::from_utf8_lossy(&o.stderr));
    let md = std::fs::read_to_string(out_dir(d.path()).join("report.md")).unwrap();
    let sha = tickwork::report::provenance::sha256_hex(helper.as_bytes());
    assert!(md.contains(&format!("- files read:\n  - `helpers.rhai` (SHA-256 `{sha}`)\n- overrides")), "{md}");
    assert!(!md.contains("stdlib/"), "built-in modules come with the tool version: {md}");
}

#[test]
fn figures_of_an_earlier_run_are_removed_and_files_are_readable() {
    let d = tempfile::tempdir().unwrap();
    run(d.path(), SCRIPT, &[]);
    std::fs::write(out_dir(d.path()).join("notes.txt"), "kept").unwrap();
    let fewer = SCRIPT.replace("plot(#{title: \"Supply spread\"", "//plot(#{title: \"Supply spread\"");
    assert_eq!(run(d.path(), &fewer, &[]).status.code(), Some(0));
    let names: Vec<String> = files(&out_dir(d.path())).into_iter().map(|(n, _)| n).collect();
    assert_eq!(
        names,
        ["fig-01-period-versus-c.svg", "fig-02-error-budget.svg", "notes.txt", "report.md", "results.json"]
    );
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        let mode = std::fs::metadata(out_dir(d.path()).join("report.md")).unwrap().permissions().mode();
        assert_eq!(mode & 0o777, 0o644);
    }
}
