//! Every script function carries its documentation from its registration, and the generated
//! views of it (docs/functions.md, the editor definition file) are complete and current.
use tickwork::engine::docs;

#[test]
fn every_callable_function_is_documented_where_it_is_registered() {
    let all = docs::registered(&docs::reference_engine());
    assert!(all.len() > 100, "only {} functions registered", all.len());
    let undocumented: Vec<&str> =
        all.iter().filter(|r| docs::is_user_callable(&r.name) && r.doc.is_none()).map(|r| r.name.as_str()).collect();
    assert!(undocumented.is_empty(), "registered without documentation (use engine::api::fun): {undocumented:?}");
}

#[test]
fn every_entry_has_a_signature_and_a_summary() {
    for d in docs::all() {
        assert!(d.sig.contains(&format!("{}(", d.name)), "signature of {} does not name it: {}", d.name, d.sig);
        assert!(!d.summary.trim().is_empty(), "{} has no description", d.name);
    }
}

#[test]
fn functions_reference_is_current() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/docs/functions.md");
    let on_disk = std::fs::read_to_string(path).unwrap_or_default();
    assert!(
        on_disk == docs::markdown(),
        "docs/functions.md is stale: regenerate it with `cargo run --release -- doc --markdown > docs/functions.md`"
    );
}

#[test]
fn definitions_use_script_types_only() {
    let defs = docs::definitions();
    assert!(defs.starts_with("module static;"), "not a definition file");
    for bad in ["::", "&mut", "&str", "Dynamic", "ImmutableString", "i64", "f64", "INT", "FLOAT", "?", "Box<"] {
        assert!(!defs.contains(bad), "definition file contains a Rust type or path ({bad})");
    }
    // Every documented form is one `fn` line.
    assert_eq!(defs.lines().filter(|l| l.starts_with("fn ")).count(), docs::all().len());
    assert!(defs.contains("fn nmos(p: Process, w: float, l: float) -> Mos;"), "nmos not defined with script types");
}
