//! tickwork: a notebook-style scripting engine for the timing circuits of analog ICs.
//!
//! Layers (data flows downward, nothing imports upward): `cli` → `engine` → `report` →
//! `analysis` → `timing` → `physics` → `num`. Only `engine` knows about Rhai.
pub mod analysis;
pub mod cli;
pub mod engine;
pub mod num;
pub mod physics;
pub mod report;
pub mod timing;
