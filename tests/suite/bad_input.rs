//! The bad-input corpus: every file under tests/bad_input/ is one case, run through the built
//! binary in a scratch project. Its first lines say what it must produce:
//!
//! ```text
//! // expect: exit 1, stderr contains "{file}:3:9: key 'c' must be > 0"
//! // expect: stderr lacks "NaN"
//! // args: --set C=abc
//! ```
//!
//! - `.rhai` cases run as `tickwork run {file} [args]` from the project root;
//! - `.repl` cases are piped into `tickwork repl [args]`;
//! - `.toml` cases (comments start with `#`) are written under their own name and read by a
//!   script, `process_file("{file}");` unless a `# script: CODE` line gives another one.
//!
//! Clauses: `exit N`, `stderr|stdout contains "TEXT"`, `stderr|stdout lacks "TEXT"`; `{file}`
//! stands for the case's file name. Files in tests/bad_input/support/ are not cases: they are
//! copied into every project (modules to import, process files to read).
//!
//! Every case is also checked for what must never happen: a panic (exit 101, "internal
//! error"), an internal identifier in a message, NaN shown as a result, and a failed run that
//! touches the previous report. A case that shows a bug in code owned elsewhere carries a
//! `known-bug: REASON` line; it is skipped by `corpus` and run by the ignored `known_bugs`.
use crate::cli_util;

use std::path::{Path, PathBuf};
use std::process::Output;

use cli_util::{Project, stderr, stdout};

const CORPUS: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/bad_input");

/// Text no user should ever see: the engine's own hook names and Rhai's internal spellings.
const INTERNAL: &[&str] = &[
    "__override",
    "__section",
    "$get$",
    "$set$",
    "index$",
    "EvalAltResult",
    "panicked",
    "internal error",
    "RUST_BACKTRACE",
    "tickwork::",
];

/// The report a previous run left; a failed run must leave it as it was.
const PREVIOUS: &str = "# previous report (must survive a failed run)\n";

#[derive(Debug, Default)]
struct Case {
    path: PathBuf,
    name: String,
    text: String,
    exit: Option<i32>,
    checks: Vec<(Stream, bool, String)>, // (stream, must contain?, text)
    args: Vec<String>,
    script: Option<String>,
    known_bug: Option<String>,
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Stream {
    Stdout,
    Stderr,
}

/// The quoted clauses of an `expect:` line, split at commas outside quotes.
fn clauses(s: &str) -> Vec<String> {
    let mut out = vec![String::new()];
    let mut quoted = false;
    let mut esc = false;
    for c in s.chars() {
        if esc {
            out.last_mut().unwrap().push(c);
            esc = false;
            continue;
        }
        match c {
            '\\' if quoted => {
                out.last_mut().unwrap().push(c);
                esc = true;
            }
            '"' => {
                quoted = !quoted;
                out.last_mut().unwrap().push(c);
            }
            ',' if !quoted => out.push(String::new()),
            _ => out.last_mut().unwrap().push(c),
        }
    }
    out.into_iter().map(|c| c.trim().to_string()).filter(|c| !c.is_empty()).collect()
}

fn unquote(s: &str, name: &str) -> Result<String, String> {
    let s = s.trim();
    let inner = s
        .strip_prefix('"')
        .and_then(|s| s.strip_suffix('"'))
        .ok_or_else(|| format!("expected a quoted text, found {s}"))?;
    Ok(inner.replace("\\\"", "\"").replace("\\n", "\n").replace("\\\\", "\\").replace("{file}", name))
}

fn parse_case(path: &Path) -> Result<Case, String> {
    let text = std::fs::read_to_string(path).map_err(|e| e.to_string())?;
    let name = path.file_name().unwrap().to_string_lossy().to_string();
    let marker = if name.ends_with(".toml") { "#" } else { "//" };
    let mut case = Case { path: path.to_path_buf(), name: name.clone(), text: text.clone(), ..Default::default() };
    let mut lines = text.lines();
    // A case may start with a byte-order mark (the case of a file that has one).
    let first = lines.next().unwrap_or("").trim_start_matches('\u{feff}');
    if !first.trim_start().starts_with(&format!("{marker} expect:")) {
        return Err(format!("the first line must be `{marker} expect: ...`"));
    }
    for line in std::iter::once(first).chain(lines) {
        let Some(body) = line.trim_start().strip_prefix(marker) else { break };
        let body = body.trim();
        if let Some(e) = body.strip_prefix("expect:") {
            for c in clauses(e) {
                if let Some(n) = c.strip_prefix("exit ") {
                    case.exit = Some(n.trim().parse().map_err(|_| format!("bad exit code in '{c}'"))?);
                    continue;
                }
                let (stream, rest) = if let Some(r) = c.strip_prefix("stderr ") {
                    (Stream::Stderr, r)
                } else if let Some(r) = c.strip_prefix("stdout ") {
                    (Stream::Stdout, r)
                } else {
                    return Err(format!("unknown clause '{c}'"));
                };
                let (want, t) = if let Some(t) = rest.strip_prefix("contains ") {
                    (true, t)
                } else if let Some(t) = rest.strip_prefix("lacks ") {
                    (false, t)
                } else {
                    return Err(format!("unknown clause '{c}'"));
                };
                case.checks.push((stream, want, unquote(t, &name)?));
            }
        } else if let Some(a) = body.strip_prefix("args:") {
            case.args = a.split_whitespace().map(|s| s.replace("{file}", &name)).collect();
        } else if let Some(s) = body.strip_prefix("script:") {
            case.script = Some(s.trim().replace("{file}", &name));
        } else if let Some(r) = body.strip_prefix("known-bug:") {
            case.known_bug = Some(r.trim().to_string());
        }
    }
    if case.exit.is_none() {
        return Err("the expect line gives no exit code".into());
    }
    Ok(case)
}

fn corpus_files() -> Vec<PathBuf> {
    fn walk(dir: &Path, out: &mut Vec<PathBuf>) {
        let mut entries: Vec<_> = std::fs::read_dir(dir).unwrap().map(|e| e.unwrap().path()).collect();
        entries.sort();
        for p in entries {
            if p.is_dir() {
                if p.file_name().is_some_and(|n| n != "support") {
                    walk(&p, out);
                }
            } else if p.extension().is_some_and(|e| e == "rhai" || e == "repl" || e == "toml") {
                out.push(p);
            }
        }
    }
    let mut v = Vec::new();
    walk(Path::new(CORPUS), &mut v);
    v
}

/// A scratch project with the support files, the case file and a previous report.
fn project_for(case: &Case) -> (Project, PathBuf) {
    let p = Project::new();
    let support = Path::new(CORPUS).join("support");
    if let Ok(rd) = std::fs::read_dir(&support) {
        for e in rd {
            let e = e.unwrap().path();
            let n = e.file_name().unwrap().to_string_lossy().to_string();
            p.write(&n, &std::fs::read_to_string(&e).unwrap());
        }
    }
    let stem = case.name.rsplit_once('.').map(|(s, _)| s).unwrap_or(&case.name).to_string();
    let script = if case.name.ends_with(".toml") {
        p.write(&case.name, &case.text);
        let runner = format!("{stem}-run.rhai");
        p.write(&runner, &case.script.clone().unwrap_or_else(|| format!("process_file(\"{}\");", case.name)));
        runner
    } else {
        p.write(&case.name, &case.text);
        case.name.clone()
    };
    let runner_stem = script.trim_end_matches(".rhai").to_string();
    let prev = p.write(&format!("out/{runner_stem}/report.md"), PREVIOUS);
    (p, prev)
}

fn run_case(case: &Case) -> Result<(), String> {
    let (p, prev) = project_for(case);
    let args: Vec<&str> = case.args.iter().map(|s| s.as_str()).collect();
    let out: Output = if case.name.ends_with(".repl") {
        p.repl_with(&case.text, &args)
    } else {
        let runner = if case.name.ends_with(".toml") {
            format!("{}-run.rhai", case.name.trim_end_matches(".toml"))
        } else {
            case.name.clone()
        };
        let mut a = vec!["run", runner.as_str()];
        a.extend(args.iter().copied());
        p.tickwork(&a)
    };
    let (so, se) = (stdout(&out), stderr(&out));
    let code = out.status.code().unwrap_or(-1);
    let mut problems = Vec::new();
    if Some(code) != case.exit {
        problems.push(format!("exit code {code}, expected {}", case.exit.unwrap()));
    }
    for (stream, want, t) in &case.checks {
        let hay = if *stream == Stream::Stderr { &se } else { &so };
        if hay.contains(t.as_str()) != *want {
            problems.push(format!("{:?} {} {t:?}", stream, if *want { "lacks" } else { "contains" }));
        }
    }
    for bad in INTERNAL {
        if se.contains(bad) || so.contains(bad) {
            problems.push(format!("output shows the internal text {bad:?}"));
        }
    }
    if so.contains("NaN") {
        problems.push("stdout shows NaN as a result".into());
    }
    if code == 1 && !case.name.ends_with(".repl") {
        let now = std::fs::read_to_string(&prev).unwrap_or_default();
        if now != PREVIOUS {
            problems.push("the failed run changed the previous report".into());
        }
    }
    if problems.is_empty() {
        Ok(())
    } else {
        Err(format!(
            "{}:\n  {}\n  --- exit {code}\n  --- stderr:\n{se}\n  --- stdout:\n{so}",
            case.path.display(),
            problems.join("\n  ")
        ))
    }
}

fn run_all(known_bugs: bool) {
    let files = corpus_files();
    assert!(files.len() > 50, "the corpus has only {} cases", files.len());
    let mut names = std::collections::BTreeMap::new();
    let mut failures = Vec::new();
    let mut ran = 0;
    for f in &files {
        let case = match parse_case(f) {
            Ok(c) => c,
            Err(e) => {
                failures.push(format!("{}: {e}", f.display()));
                continue;
            }
        };
        if let Some(other) = names.insert(case.name.clone(), f.clone()) {
            failures.push(format!("{}: same file name as {}", f.display(), other.display()));
        }
        if case.known_bug.is_some() != known_bugs {
            continue;
        }
        ran += 1;
        if let Err(e) = run_case(&case) {
            failures.push(e);
        }
    }
    eprintln!("bad_input: {ran} cases run of {} files", files.len());
    assert!(failures.is_empty(), "{} of {ran} cases failed:\n\n{}", failures.len(), failures.join("\n\n"));
}

#[test]
fn corpus() {
    run_all(false);
}

#[test]
#[ignore = "runs the cases marked known-bug: a bug recorded before it is fixed (none at present)"]
fn known_bugs() {
    run_all(true);
}

/// Random byte strings and random mutations of the demo scripts, evaluated in-process: every
/// one must give a value or an error, never a panic. A fixed seed keeps failures repeatable.
#[test]
fn random_and_mutated_scripts_never_panic() {
    use std::panic::{AssertUnwindSafe, catch_unwind};
    // xorshift64* (Vigna 2016): small, fast and enough to pick edits.
    struct Rng(u64);
    impl Rng {
        fn next(&mut self) -> u64 {
            self.0 ^= self.0 >> 12;
            self.0 ^= self.0 << 25;
            self.0 ^= self.0 >> 27;
            self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
        }
        fn below(&mut self, n: usize) -> usize {
            (self.next() % n.max(1) as u64) as usize
        }
    }
    const PIECES: &[&str] = &[
        "0",
        "-1",
        "1e308",
        "0.0/0.0",
        "1.0/0.0",
        "-1p",
        "2K",
        "µ",
        "\"",
        "(",
        ")",
        "[",
        "]",
        "{",
        "}",
        "#{",
        ",",
        ";",
        "..",
        "span(0, 1, 0)",
        "series([])",
        "\"pie\"",
        "true",
        "x",
        "/*",
        "*/",
        "///",
        "\n",
        "`${",
        "'",
        "_",
        "1.5.5",
        "2p5",
        "#{c: -1p}",
        "[]",
        "osc(\"window\", #{})",
        "process_file(\"../x\")",
        "import \"y\" as z;",
    ];
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/scripts");
    let mut demos: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|e| e == "rhai"))
        .map(|p| std::fs::read_to_string(p).unwrap())
        .collect();
    demos.sort();
    assert!(!demos.is_empty());
    let mut rng = Rng(0x7469_636b_776f_726b);
    let start = std::time::Instant::now();
    let mut runs = 0;
    let mut panics = Vec::new();
    // A demo that takes long (a full error budget) is mutated only a few times.
    let mut slow_runs = vec![0usize; demos.len()];
    // Bounded in count, not in time: the same scripts run on a fast and on a loaded machine.
    for k in 0..150 {
        let pick = rng.below(demos.len());
        let text = if k % 4 == 0 || slow_runs[pick] >= 3 {
            let n = rng.below(200);
            let bytes: Vec<u8> = (0..n).map(|_| (rng.next() >> 24) as u8).collect();
            String::from_utf8_lossy(&bytes).to_string()
        } else {
            let base = &demos[pick];
            let mut chars: Vec<char> = base.chars().collect();
            for _ in 0..1 + rng.below(4) {
                let at = rng.below(chars.len() + 1);
                match rng.below(4) {
                    0 => {
                        let len = rng.below(12).min(chars.len() - at.min(chars.len()));
                        chars.drain(at..at + len);
                    }
                    1 => chars.splice(at..at, PIECES[rng.below(PIECES.len())].chars()).for_each(drop),
                    2 if at < chars.len() => chars[at] = PIECES[rng.below(PIECES.len())].chars().next().unwrap_or(' '),
                    _ => {
                        // Replace a number with another value.
                        if let Some(p) = chars[at.min(chars.len())..].iter().position(|c| c.is_ascii_digit()) {
                            let s = at + p;
                            chars.splice(s..s + 1, PIECES[rng.below(3)].chars()).for_each(drop);
                        }
                    }
                }
            }
            chars.into_iter().collect()
        };
        runs += 1;
        let t0 = std::time::Instant::now();
        if catch_unwind(AssertUnwindSafe(|| {
            let _ = cli_util::eval(&text);
        }))
        .is_err()
        {
            panics.push(text);
        }
        if k % 4 != 0 && t0.elapsed().as_millis() > 200 {
            slow_runs[pick] += 1;
        }
    }
    eprintln!("{runs} random or mutated scripts, {} s", start.elapsed().as_secs());
    assert_eq!(runs, 150);
    assert!(panics.is_empty(), "{} of {runs} scripts panicked; the first:\n{}", panics.len(), panics[0]);
}

/// Every documented script function called with arguments of the wrong kind or count: an
/// error naming the function (and listing its forms when no form matches), never a panic,
/// never a result.
#[test]
fn every_function_rejects_wrong_arguments() {
    use tickwork::engine::docs;
    let mut names: Vec<&str> = docs::all().iter().map(|d| d.name.as_str()).collect();
    names.sort();
    names.dedup();
    let mut problems = Vec::new();
    // Calls that are valid: Rhai's own len, is_empty and trim of a string (and a map), the run's
    // seed.
    let valid = ["len(\"?\")", "len(#{zz: 1})", "is_empty(\"?\")", "is_empty(#{zz: 1})", "trim(\"?\")", "seed()"];
    for name in names {
        // save_report with a valid name would write a report; its bad paths are corpus cases.
        if name == "save_report" {
            continue;
        }
        for args in ["", "\"?\"", "#{zz: 1}", "[], [], [], [], []"] {
            let call = format!("{name}({args})");
            let r = std::panic::catch_unwind(|| cli_util::eval(&call));
            match r {
                Err(_) => problems.push(format!("{call}: panicked")),
                Ok(Ok(_)) if valid.contains(&call.as_str()) => {}
                Ok(Ok(v)) => problems.push(format!("{call}: gave {v} instead of an error")),
                Ok(Err(e)) => {
                    if !e.contains(name) {
                        problems.push(format!("{call}: the error does not name '{name}': {e}"));
                    }
                    if INTERNAL.iter().any(|t| e.contains(t)) || e.contains("i64") || e.contains("ImmutableString") {
                        problems.push(format!("{call}: internal text in: {e}"));
                    }
                }
            }
        }
    }
    assert!(problems.is_empty(), "{}", problems.join("\n"));
}
