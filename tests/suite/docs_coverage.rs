//! Every script function is documented, and every documentation entry names a function that
//! exists: for each registration module, the names it registers equal the names in its DOCS.
use std::collections::BTreeSet;
use std::path::Path;

use rhai::Engine;
use tickwork::engine::docs::Doc;
use tickwork::engine::sandbox::Sandbox;
use tickwork::engine::session::{Session, Shared};
use tickwork::engine::{analysis_api, core_api, fit_api, physics_api, report_api, series_api, timing_api};

/// Names a module registers that a user calls by name (not operators, indexers, internal
/// markers or the display hooks that print and string interpolation use).
fn registered(register: impl FnOnce(&mut Engine)) -> BTreeSet<String> {
    let mut e = Engine::new_raw();
    register(&mut e);
    e.gen_fn_signatures(false)
        .iter()
        .map(|sig| sig.split('(').next().unwrap_or("").trim().to_string())
        .filter(|n| n.chars().next().is_some_and(char::is_alphabetic))
        .filter(|n| !n.contains('$') && !["to_string", "to_debug", "print"].contains(&n.as_str()))
        .collect()
}

fn documented(docs: &[Doc]) -> BTreeSet<String> {
    docs.iter().map(|d| d.name.to_string()).collect()
}

fn session() -> Shared {
    let dir = std::env::temp_dir();
    Shared::new(Session::new("docs", Sandbox::new(Path::new("."), &dir, Path::new(".")).unwrap()))
}

#[test]
fn each_module_documents_exactly_what_it_registers() {
    let s = session();
    let cases: Vec<(&str, BTreeSet<String>, BTreeSet<String>)> = vec![
        ("core_api", registered(|e| core_api::register(e, &s)), documented(core_api::DOCS)),
        ("series_api", registered(series_api::register), documented(series_api::DOCS)),
        ("report_api", registered(|e| report_api::register(e, &s)), documented(report_api::DOCS)),
        ("physics_api", registered(|e| physics_api::register(e, &s)), documented(physics_api::DOCS)),
        ("timing_api", registered(|e| timing_api::register(e, &s)), documented(timing_api::DOCS)),
        ("analysis_api", registered(analysis_api::register), documented(analysis_api::DOCS)),
        ("fit_api", registered(|e| fit_api::register(e, &s)), documented(fit_api::DOCS)),
    ];
    for (module, reg, doc) in cases {
        assert!(!reg.is_empty(), "{module} registers nothing");
        let undocumented: Vec<_> = reg.difference(&doc).collect();
        let phantom: Vec<_> = doc.difference(&reg).collect();
        assert!(undocumented.is_empty(), "{module}: registered without a DOCS entry: {undocumented:?}");
        assert!(phantom.is_empty(), "{module}: DOCS entries for functions it does not register: {phantom:?}");
    }
}

#[test]
fn every_entry_has_a_signature_and_a_summary() {
    for d in tickwork::engine::docs::all() {
        assert!(d.sig.contains(d.name), "signature of {} does not name it: {}", d.name, d.sig);
        assert!(!d.summary.trim().is_empty(), "{} has no description", d.name);
    }
}
