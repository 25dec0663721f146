//! Delay and junction formulas used by the explicit-number parts.
//!
//! LOCAL STAND-INS: the physics layer (src/physics) owns device formulas. `junction_cap` is
//! to be replaced by `physics::junction::junction_cap` and `ramp_delay` by
//! `physics::comparator::Comparator::delay_ramp` once those exist on the main branch; until
//! then these minimal versions keep the explicit-number oscillators working.

/// Junction capacitance Cj0/(1 + Vr/φ)^m (Sze, Physics of Semiconductor Devices, abrupt/graded
/// junction). Forward bias is limited at Vr = −φ/2, where the depletion formula stops holding
/// (common practice).
pub fn junction_cap(cj0: f64, v_reverse: f64, phi: f64, m: f64) -> f64 {
    let vr = v_reverse.max(-0.5 * phi);
    cj0 / (1.0 + vr / phi).powf(m)
}

/// Delay of a comparator whose first stage acts as an integrator for a ramp input past its
/// threshold: vout = 2π·GBW·S·t²/2 reaches the switching swing v_sw after
/// t = √(2·v_sw / (2π·GBW·S)) (common practice: integrator approximation of a high-gain stage
/// well above its dominant pole). Infinite GBW gives zero.
pub fn ramp_delay(slope: f64, gbw: f64, v_sw: f64) -> f64 {
    if gbw.is_infinite() {
        return 0.0;
    }
    (2.0 * v_sw / (2.0 * std::f64::consts::PI * gbw * slope.abs())).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn junction_law() {
        // Cj0/(1+Vr/φ)^m with m = 1/2 (abrupt junction, Sze): Vr = 3φ halves the capacitance
        assert!((junction_cap(2e-15, 2.4, 0.8, 0.5) - 1e-15).abs() < 1e-30);
        assert_eq!(junction_cap(2e-15, 0.0, 0.8, 0.5), 2e-15);
    }
    #[test]
    fn ramp_delay_scales_as_inverse_sqrt_slope() {
        // t ∝ S^(-1/2) (integrator approximation): four times the slope halves the delay
        let a = ramp_delay(1e6, 100e6, 0.9);
        let b = ramp_delay(4e6, 100e6, 0.9);
        assert!((a / b - 2.0).abs() < 1e-12);
        assert_eq!(ramp_delay(1e6, f64::INFINITY, 0.9), 0.0);
    }
}
