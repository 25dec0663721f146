//! `tickwork doc [NAME]` and `tickwork defs`: views of the documentation that each function
//! carries from its registration (`engine::docs`).
use std::path::Path;

use crate::engine::docs;
use crate::engine::term::err;

pub fn doc(name: Option<&str>, markdown: bool) -> i32 {
    if markdown {
        crate::engine::term::out(docs::markdown().trim_end());
        return 0;
    }
    match name {
        None => {
            for d in docs::all() {
                crate::engine::term::out(&format!("{:<60} {}", d.sig, d.summary));
            }
            0
        }
        Some(n) => match docs::describe_or_hint(n) {
            Ok(t) => {
                crate::engine::term::out(&t);
                0
            }
            Err(e) => {
                err(&e);
                super::EXIT_SCRIPT_ERROR
            }
        },
    }
}

/// The definitions as JSON: name, signature with units, summary, parameters and result with
/// script-level types.
fn json() -> String {
    let functions: Vec<serde_json::Value> = docs::all()
        .iter()
        .map(|d| {
            let params: Vec<serde_json::Value> =
                d.params.iter().map(|(n, t)| serde_json::json!({"name": n, "type": t})).collect();
            serde_json::json!({"name": d.name, "signature": d.sig, "summary": d.summary, "params": params, "result": d.result})
        })
        .collect();
    let v = serde_json::json!({"tool": "tickwork", "version": env!("CARGO_PKG_VERSION"), "functions": functions});
    serde_json::to_string_pretty(&v).unwrap_or_default() + "\n"
}

/// Write the editor definition file (or JSON, for a `.json` name).
pub fn defs(out: &Path) -> i32 {
    let text = if out.extension().is_some_and(|e| e == "json") { json() } else { docs::definitions() };
    match crate::report::output::write_atomic(out, text.as_bytes()) {
        Ok(()) => {
            crate::engine::term::out(&format!("wrote {}", out.display()));
            0
        }
        Err(e) => {
            err(&format!("cannot write {}: {e}", out.display()));
            super::EXIT_SCRIPT_ERROR
        }
    }
}
