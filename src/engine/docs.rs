//! Documentation of every native function a script can call: signature with units and a
//! one-line description. The REPL's `help`/`doc`, `tickwork doc` and `tickwork defs` read it.

/// One documented script function.
#[derive(Clone, Copy, Debug)]
pub struct Doc {
    pub name: &'static str,
    /// Signature with units, e.g. `eng(x: float, unit: string, digits: int) -> string`.
    pub sig: &'static str,
    pub summary: &'static str,
}

/// All documented functions, from every registration module.
pub fn all() -> Vec<Doc> {
    let mut v = Vec::new();
    v.extend_from_slice(super::core_api::DOCS);
    v.extend_from_slice(super::series_api::DOCS);
    v.extend_from_slice(super::report_api::DOCS);
    v.extend_from_slice(super::physics_api::DOCS);
    v.extend_from_slice(super::timing_api::DOCS);
    v.extend_from_slice(super::analysis_api::DOCS);
    v.extend_from_slice(super::fit_api::DOCS);
    v
}

/// Entries for one name (all overloads).
pub fn lookup(name: &str) -> Vec<Doc> {
    all().into_iter().filter(|d| d.name == name).collect()
}
