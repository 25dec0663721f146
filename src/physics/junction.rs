//! Depletion capacitance of a pn junction.
use crate::num::math;

/// Fraction of the built-in potential beyond which forward bias is linearised (common practice).
pub const FC: f64 = 0.5;

/// Junction capacitance Cj0/(1 + Vr/φ)^m (Sze, Physics of Semiconductor Devices, abrupt m = 1/2,
/// graded m = 1/3); for forward bias beyond FC·φ continued by its tangent (common practice), so
/// the value and slope are continuous and never NaN. Units: cj0 in F (or F/m², F/m), volts.
pub fn junction_cap(cj0: f64, v_reverse: f64, phi: f64, m: f64) -> f64 {
    let vf = -v_reverse;
    if vf < FC * phi {
        cj0 / math::pow(1.0 + v_reverse / phi, m)
    } else {
        // Tangent of cj0 (1 − vf/φ)^−m at vf = FC·φ.
        cj0 / math::pow(1.0 - FC, 1.0 + m) * (1.0 - FC * (1.0 + m) + m * vf / phi)
    }
}

/// Check junction parameters (names as in the process file), for explicit constructors.
pub fn check(cj0: f64, phi: f64, m: f64) -> Result<(), String> {
    if !(cj0.is_finite() && cj0 >= 0.0) {
        return Err(format!("cj0 must be ≥ 0 F, got {cj0}"));
    }
    if !(phi.is_finite() && (0.1..=1.5).contains(&phi)) {
        return Err(format!("phi (built-in potential) must be in 0.1..1.5 V, got {phi}"));
    }
    if !(m.is_finite() && (0.1..=1.0).contains(&m)) {
        return Err(format!("m (grading exponent) must be in 0.1..1 , got {m}"));
    }
    Ok(())
}
