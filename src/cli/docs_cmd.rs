//! `tickwork doc [NAME]` and `tickwork defs`.
use std::path::Path;

use crate::engine::docs;

/// Text describing `name` (all overloads), or None if it is not a documented function.
pub fn describe(name: &str) -> Option<String> {
    let found = docs::lookup(name);
    if found.is_empty() {
        return None;
    }
    Some(found.iter().map(|d| format!("{}\n    {}", d.sig, d.summary)).collect::<Vec<_>>().join("\n"))
}

/// Names close to `name`, for a "did you mean" line.
pub fn similar(name: &str) -> Vec<&'static str> {
    let mut v: Vec<&'static str> =
        docs::all().iter().map(|d| d.name).filter(|n| n.contains(name) || name.contains(n)).collect();
    v.dedup();
    v
}

pub fn doc(name: Option<&str>) -> i32 {
    match name {
        None => {
            for d in docs::all() {
                crate::engine::term::out(&format!("{:<60} {}", d.sig, d.summary));
            }
            0
        }
        Some(n) => match describe(n) {
            Some(t) => {
                crate::engine::term::out(&t.to_string());
                0
            }
            None => {
                let sim = similar(n);
                eprintln!(
                    "no function named '{n}'{}",
                    if sim.is_empty() { String::new() } else { format!("; similar: {}", sim.join(", ")) }
                );
                super::EXIT_SCRIPT_ERROR
            }
        },
    }
}

/// Write every script function as JSON: the documented entries (signature with units,
/// description) and the engine's full list of registered signatures, for editor tooling.
pub fn defs(out: &Path) -> i32 {
    let sandbox = match crate::engine::sandbox::Sandbox::new(Path::new("."), Path::new("."), Path::new(".")) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("{e}");
            return super::EXIT_SCRIPT_ERROR;
        }
    };
    let session = crate::engine::session::Shared::new(crate::engine::session::Session::new("defs", sandbox));
    let engine = crate::engine::build(&session, crate::engine::DEFAULT_MAX_OPS);
    let documented: Vec<serde_json::Value> = docs::all()
        .iter()
        .map(|d| serde_json::json!({"name": d.name, "signature": d.sig, "summary": d.summary}))
        .collect();
    let mut registered = engine.gen_fn_signatures(false);
    registered.sort();
    let v = serde_json::json!({"tool": "tickwork", "version": env!("CARGO_PKG_VERSION"), "functions": documented, "registered": registered});
    let text = serde_json::to_string_pretty(&v).unwrap_or_default() + "\n";
    match crate::report::output::write_atomic(out, text.as_bytes()) {
        Ok(()) => {
            crate::engine::term::out(&format!("wrote {}", out.display()));
            0
        }
        Err(e) => {
            eprintln!("cannot write {}: {e}", out.display());
            super::EXIT_SCRIPT_ERROR
        }
    }
}
