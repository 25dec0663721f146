//! Device physics: constants, process files, MOSFET, capacitors, resistors, switches,
//! mirrors, comparators, mismatch. Plain Rust, no Rhai types.
