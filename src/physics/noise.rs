//! White noise of devices: the channel thermal noise of a MOSFET in saturation, and the
//! input-referred noise of a differential pair with a current-mirror load. Densities are
//! one-sided (per hertz of positive frequency).
use super::constants::{K_B, kelvin};

/// Channel thermal-noise excess factor γ of a long-channel MOSFET in saturation, 2/3
/// (van der Ziel; Razavi, Design of Analog CMOS Integrated Circuits, 2nd ed., §7.3). Short
/// channels and weak inversion move it (about 1/2 in weak inversion); a first estimate.
pub const GAMMA: f64 = 2.0 / 3.0;

/// Drain-current thermal noise of a saturated MOSFET, S_I = 4kTγ·gm, A²/Hz (Razavi §7.3).
pub fn drain_current_psd(gm: f64, temp_c: f64) -> f64 {
    4.0 * K_B * kelvin(temp_c) * GAMMA * gm
}

/// Output-current noise of a current mirror whose input device has transconductance `gm_in`
/// and whose output device (`ratio` × wider) has `gm_out`: the output device's own noise plus
/// the input device's, copied with current gain `ratio`: 4kTγ·(gm_out + ratio²·gm_in), A²/Hz
/// (Razavi §7.3; the reference current itself taken as noiseless, cascodes negligible at low
/// frequency: common practice).
pub fn mirror_output_psd(gm_in: f64, gm_out: f64, ratio: f64, temp_c: f64) -> f64 {
    drain_current_psd(gm_out, temp_c) + ratio * ratio * drain_current_psd(gm_in, temp_c)
}

/// Input-referred voltage noise of a differential pair (each device `gm`) with a current-mirror
/// load (each device `gm_load`): S_v = 2·4kTγ/gm·(1 + gm_load/gm), V²/Hz (Razavi §7.5).
pub fn pair_input_psd(gm: f64, gm_load: f64, temp_c: f64) -> f64 {
    2.0 * drain_current_psd(gm, temp_c) / (gm * gm) * (1.0 + gm_load / gm)
}

/// Equivalent noise bandwidth of a single pole at f_p: (π/2)·f_p (common practice).
pub fn single_pole_nbw(f_pole: f64) -> f64 {
    std::f64::consts::FRAC_PI_2 * f_pole
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thermal_noise_of_one_millisiemens_at_27_c() {
        // 4·k·T·γ·gm with CODATA 2018 k and T = 300.15 K: 4 · 1.380649e-23 · 300.15 · 2/3 · 1e-3.
        let want = 4.0 * 1.380649e-23 * 300.15 * (2.0 / 3.0) * 1e-3;
        assert!((drain_current_psd(1e-3, 27.0) / want - 1.0).abs() < 1e-15);
        // A 1:1 mirror doubles a device's noise; the pair's input noise is 8kTγ/gm with an
        // ideal (noiseless) load, twice that with a load of the same gm.
        assert!((mirror_output_psd(1e-3, 1e-3, 1.0, 27.0) / (2.0 * want) - 1.0).abs() < 1e-15);
        assert!((pair_input_psd(1e-3, 0.0, 27.0) / (2.0 * want / 1e-6) - 1.0).abs() < 1e-15);
        assert!((pair_input_psd(1e-3, 1e-3, 27.0) / (4.0 * want / 1e-6) - 1.0).abs() < 1e-15);
    }
}
