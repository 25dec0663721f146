//! Report model: sections of prose and outputs, tables, plots, metrics, provenance, and the
//! files they are written to. Plain Rust; the engine turns script values into these types.
pub mod change;
pub mod compare;
pub mod digest;
pub mod format;
pub mod git;
pub mod history;
pub mod index;
pub mod markdown;
pub mod metric;
pub mod model;
pub mod output;
pub mod plot;
pub mod provenance;
pub mod results;
pub mod table;

pub use metric::{Metric, Spec};
pub use model::{Figure, Item, Report, Section};
pub use provenance::Provenance;
pub use table::{Cell, Column, Table};
