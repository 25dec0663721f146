//! Switching thresholds derived from device parameters.

/// Upper and lower switching points of the six-transistor CMOS Schmitt trigger:
/// V_SPH = (V_DD + √(β1/β3)·V_TN)/(1 + √(β1/β3)), V_SPL = √(β5/β6)·(V_DD − |V_TP|)/(1 + √(β5/β6))
/// (I. M. Filanovsky and H. Baltes, "CMOS Schmitt trigger design", IEEE Trans. Circuits Syst. I,
/// 1994; long-channel square law; recalled from memory). Returns (v_lo, v_hi).
pub fn schmitt_cmos(vdd: f64, vtn: f64, vtp_abs: f64, ratio_n: f64, ratio_p: f64) -> (f64, f64) {
    let (sn, sp) = (ratio_n.sqrt(), ratio_p.sqrt());
    let v_hi = (vdd + sn * vtn) / (1.0 + sn);
    let v_lo = sp * (vdd - vtp_abs) / (1.0 + sp);
    (v_lo, v_hi)
}

/// Switching threshold of a CMOS inverter with both devices in saturation (long-channel square
/// law): V_M = (V_TN + r·(V_DD − |V_TP|))/(1 + r), r = √(βp/βn) (Rabaey, Digital Integrated
/// Circuits, ch. 5).
pub fn inverter_vm(vdd: f64, vtn: f64, vtp_abs: f64, ratio_pn: f64) -> f64 {
    let r = ratio_pn.sqrt();
    (vtn + r * (vdd - vtp_abs)) / (1.0 + r)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn symmetric_inverter_switches_at_half_supply() {
        // Rabaey: equal thresholds and βp = βn put V_M at V_DD/2
        assert!((inverter_vm(1.8, 0.45, 0.45, 1.0) - 0.9).abs() < 1e-15);
        // a stronger PMOS pulls V_M up
        assert!(inverter_vm(1.8, 0.45, 0.45, 4.0) > 0.9);
    }
    #[test]
    fn symmetric_trigger_is_centred() {
        // With equal ratios and |Vtp| = Vtn the switching points sit symmetrically about VDD/2
        // (symmetry of the Filanovsky–Baltes expressions).
        let (lo, hi) = schmitt_cmos(1.8, 0.45, 0.45, 1.0, 1.0);
        assert!((hi - 1.125).abs() < 1e-12 && (lo - 0.675).abs() < 1e-12);
        assert!(((hi + lo) / 2.0 - 0.9).abs() < 1e-12);
    }
}
