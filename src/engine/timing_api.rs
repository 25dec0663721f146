//! Registration of the timing layer (`osc(kind, #{...})` and its methods).
use rhai::Engine;

use super::docs::Doc;
use super::session::Shared;

pub const DOCS: &[Doc] = &[];

pub fn register(_engine: &mut Engine, _session: &Shared) {}
