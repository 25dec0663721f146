//! Analyses of an oscillator built on the timing layer: sensitivities, tempco and supply
//! coefficient, jitter and phase noise, and least-squares fits of data. Plain Rust; each
//! analysis calls the oscillator only through `Osc::with`, `at`, `period` and `cycle`.
pub mod fit_curve;
pub mod fit_linear;
pub mod jitter;
pub mod phase_noise;
pub mod sensitivity;
pub mod stats;
pub mod tempco;
