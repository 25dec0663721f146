//! Device physics: constants, process files, MOSFET, capacitors, resistors, switches,
//! mirrors, comparators, mismatch, device noise. Plain Rust, no Rhai types.
pub mod capacitor;
pub mod comparator;
pub mod constants;
pub mod ekv;
pub mod junction;
pub mod mirror;
pub mod mismatch;
pub mod mosfet;
pub mod noise;
pub mod process;
pub mod reference;
pub mod resistor;
pub mod switch;
