//! Oscillator topologies, analytic period with parasitics, error budget. Plain Rust.
//!
//! An oscillator (`Osc`) is a topology (`Kind`), its parameters (`Params`, checked against the
//! key table of its kind) and its parts (`Parts`: capacitor, node capacitance, current
//! sources, comparators) behind small traits, so that explicit numbers and physics models
//! plug in alike. Every period is evaluated under a `Mask` of parasitics: the empty mask is
//! the ideal circuit, the full mask the real one; the error budget compares masks.
//! `transient` runs the same parts in time (event-driven, exact threshold crossings) as a
//! cross-check of the period model and for waveforms.
pub mod budget;
pub mod env;
pub mod from_process;
pub mod keys;
pub mod noise;
pub mod osc;
pub mod parasitic;
pub mod parts;
pub mod process_refs;
pub mod ramp;
pub mod reference;
pub mod thresholds;
pub mod topology;
pub mod transient;
pub mod variant;

pub use budget::{Budget, BudgetRow};
pub use env::Env;
pub use keys::{Kind, Params};
pub use osc::{Cycle, Osc, PhaseTiming};
pub use parasitic::{Mask, Parasitic};
pub use variant::Variant;
