//! The modules of `stdlib/`, embedded in the binary so an installed tickwork finds them anywhere.

/// (module name, source). Every `stdlib/*.rhai` file must be listed (a test checks).
pub const MODULES: &[(&str, &str)] =
    &[("ratio", include_str!("../../stdlib/ratio.rhai")), ("spec", include_str!("../../stdlib/spec.rhai"))];

pub fn get(name: &str) -> Option<&'static str> {
    MODULES.iter().find(|(n, _)| *n == name).map(|(_, s)| *s)
}
