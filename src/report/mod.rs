//! Report model: sections of prose and outputs, tables, plots, metrics, provenance.
pub mod markdown;
pub mod model;
pub mod output;

pub use model::{Item, Report, Section};
