//! Registration of the physics layer (process, devices, switches, mirrors, comparators).
use rhai::Engine;

use super::docs::Doc;
use super::session::Shared;

pub const DOCS: &[Doc] = &[];

pub fn register(_engine: &mut Engine, _session: &Shared) {}
