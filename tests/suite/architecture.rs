//! The layer rules of the contributor guide, checked on the source: data flows downward
//! (cli → engine → report → analysis → timing → physics → num), only `src/engine/` knows the
//! scripting engine, and every module opens with a doc comment saying what it holds.
use std::path::{Path, PathBuf};

/// Layers from top to bottom; a layer may use the ones below it, never one above.
const LAYERS: &[&str] = &["cli", "engine", "report", "analysis", "timing", "physics", "num"];

fn sources(dir: &Path, out: &mut Vec<PathBuf>) {
    for e in std::fs::read_dir(dir).unwrap().flatten() {
        let p = e.path();
        if p.is_dir() {
            sources(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

fn src() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("src")
}

/// The layer a file belongs to: its first folder below src/.
fn layer_of(file: &Path) -> Option<&'static str> {
    let rel = file.strip_prefix(src()).ok()?;
    let first = rel.components().next()?.as_os_str().to_str()?;
    LAYERS.iter().copied().find(|l| *l == first)
}

/// Code lines only: comments and doc comments dropped.
fn code(text: &str) -> Vec<(usize, &str)> {
    text.lines().enumerate().filter(|(_, l)| !l.trim_start().starts_with("//")).map(|(i, l)| (i + 1, l)).collect()
}

#[test]
fn no_layer_imports_a_layer_above_it() {
    let mut files = Vec::new();
    sources(&src(), &mut files);
    let mut bad = Vec::new();
    for f in &files {
        let Some(layer) = layer_of(f) else { continue };
        let rank = LAYERS.iter().position(|l| *l == layer).unwrap();
        let text = std::fs::read_to_string(f).unwrap();
        for (n, line) in code(&text) {
            for (above, name) in LAYERS[..rank].iter().enumerate() {
                if line.contains(&format!("crate::{name}")) {
                    bad.push(format!("{}:{n}: {layer} uses {} (layer {above}, above it)", f.display(), name));
                }
            }
        }
    }
    assert!(bad.is_empty(), "upward imports:\n{}", bad.join("\n"));
}

/// A line that uses the scripting engine's crate.
fn uses_rhai(line: &str) -> bool {
    line.contains("use rhai") || line.contains("rhai::")
}

#[test]
fn only_the_engine_uses_the_scripting_engine() {
    let mut files = Vec::new();
    sources(&src(), &mut files);
    let engine = src().join("engine");
    let mut bad = Vec::new();
    for f in files.iter().filter(|f| !f.starts_with(&engine)) {
        let text = std::fs::read_to_string(f).unwrap();
        for (n, line) in code(&text) {
            if uses_rhai(line) {
                bad.push(format!("{}:{n}: {}", f.display(), line.trim()));
            }
        }
    }
    assert!(bad.is_empty(), "the scripting engine's types outside src/engine/:\n{}", bad.join("\n"));
}

#[test]
fn every_module_opens_with_its_doc() {
    let mut files = Vec::new();
    sources(&src(), &mut files);
    let missing: Vec<String> = files
        .iter()
        .filter(|f| !std::fs::read_to_string(f).unwrap().starts_with("//!"))
        .map(|f| f.display().to_string())
        .collect();
    assert!(missing.is_empty(), "modules without an opening //! doc comment: {missing:?}");
}

#[test]
fn the_checks_see_a_violation() {
    // The scanners themselves: a line that uses a higher layer is found, a comment is not.
    let text = "//! doc\n// crate::engine in a comment\nuse crate::engine::docs;\n";
    let hits: Vec<_> = code(text).into_iter().filter(|(_, l)| l.contains("crate::engine")).collect();
    assert_eq!(hits, vec![(3, "use crate::engine::docs;")]);
    assert_eq!(layer_of(&src().join("timing").join("osc.rs")), Some("timing"));
    assert!(uses_rhai("use rhai::{AST, Engine};") && uses_rhai("    let e: rhai::Engine = x;"));
    assert!(!uses_rhai("use rustyline::Editor;"));
}

/// Platform maths calls (`x.exp()`, `x.ln()`, `x.powf(y)`, …) found in a code line.
fn platform_maths(line: &str) -> Vec<&'static str> {
    const CALLS: &[&str] = &[
        ".exp(", ".ln(", ".powf(", ".log10(", ".log2(", ".sin(", ".cos(", ".tan(", ".tanh(", ".atan(", ".atan2(",
        ".exp_m1(", ".ln_1p(", ".cbrt(", ".hypot(", ".exp2(", ".sinh(", ".cosh(", ".asinh(",
    ];
    CALLS.iter().copied().filter(|c| line.contains(c)).collect()
}

#[test]
fn reported_numbers_do_not_use_the_platform_maths_library() {
    // f64's transcendental methods call the platform's libm, whose last bits differ between
    // machines; every such call goes through num::math (the pure-Rust port) instead.
    let mut files = Vec::new();
    sources(&src(), &mut files);
    let mut bad = Vec::new();
    for f in files.iter().filter(|f| !f.ends_with("num/math.rs")) {
        let text = std::fs::read_to_string(f).unwrap();
        for (n, line) in code(&text) {
            for call in platform_maths(line) {
                bad.push(format!("{}:{n}: {call}…) — use num::math", f.display()));
            }
        }
    }
    assert!(bad.is_empty(), "platform maths calls:\n{}", bad.join("\n"));
}

#[test]
fn the_maths_scan_sees_a_call() {
    assert_eq!(platform_maths("let y = (a / b).ln() + x.exp();"), vec![".exp(", ".ln("]);
    assert!(platform_maths("let y = math::ln(a / b) + x.sqrt();").is_empty());
}

#[test]
fn the_guides_stand_alone() {
    // A reader who clones the repository has only the repository: the guides and docs/ must
    // not send them to files outside it.
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let mut docs = vec![root.join("README.md"), root.join("DEVELOPERS.md")];
    for e in std::fs::read_dir(root.join("docs")).unwrap().flatten() {
        docs.push(e.path());
    }
    let mut bad = Vec::new();
    for d in docs.iter().filter(|d| d.extension().is_some_and(|x| x == "md")) {
        for (n, line) in std::fs::read_to_string(d).unwrap().lines().enumerate() {
            if line.contains("../shared") || line.contains("DESIGN.md") {
                bad.push(format!("{}:{}: {line}", d.display(), n + 1));
            }
        }
    }
    assert!(bad.is_empty(), "links outside the repository:\n{}", bad.join("\n"));
}
