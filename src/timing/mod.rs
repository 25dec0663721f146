//! Oscillator topologies, analytic period with parasitics, error budget. Plain Rust.
