//! Registration of the timing layer (`osc(kind, #{...})` and its methods).
use rhai::Engine;

use super::docs::Doc;

pub const DOCS: &[Doc] = &[];

pub fn register(_engine: &mut Engine) {}
