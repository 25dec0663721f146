//! Analyses of an oscillator built on the timing layer: sensitivities, tempco and supply
//! coefficient, the PVT grid, the key value for a target period, jitter and phase noise, Monte
//! Carlo and sweeps (through one parallel map), and least-squares fits of data. Plain Rust; each
//! analysis calls the oscillator only through `Osc::with`, `at`, `period` and `cycle`.
pub mod distribution;
pub mod fit_curve;
pub mod fit_linear;
pub mod jitter;
pub mod monte_carlo;
pub mod parallel;
pub mod phase_noise;
pub mod pvt;
pub mod sensitivity;
pub mod solve;
pub mod stats;
pub mod sweep;
pub mod tempco;
pub mod trim;

/// A test oscillator: the basic keys c = 1 pF, i = 1 µA, v_lo = 0.6 V, v_hi = 1.2 V and `extra`.
#[cfg(test)]
pub(crate) fn test_osc(kind: crate::timing::Kind, extra: &[(&str, f64)]) -> crate::timing::Osc {
    let mut p: Vec<(String, f64)> =
        [("c", 1e-12), ("i", 1e-6), ("v_lo", 0.6), ("v_hi", 1.2)].iter().map(|(k, v)| (k.to_string(), *v)).collect();
    p.extend(extra.iter().map(|(k, v)| (k.to_string(), *v)));
    crate::timing::Osc::new(kind, &p).unwrap()
}
