//! Phase noise of a free-running oscillator from its jitter: the Lorentzian spectrum of a
//! carrier whose phase diffuses (Demir, Mehrotra and Roychowdhury, IEEE TCAS-I 2000), the
//! usual figure of merit, and the minimum achievable phase noise of relaxation oscillators
//! (Navid, Lee and Dutton, IEEE JSSC 2005) as a check that the model does not beat physics.
use crate::num::math;
use crate::physics::constants::K_B;

/// Single-sideband phase noise L(f_m), linear (1/Hz), of a carrier f0 whose timing variance
/// grows as c·t: f0²·c / (π²·f0⁴·c² + f_m²) (Demir, Mehrotra, Roychowdhury 2000, eq. for the
/// first harmonic).
pub fn lorentzian(f0: f64, c: f64, fm: f64) -> f64 {
    f0 * f0 * c / (std::f64::consts::PI.powi(2) * f0.powi(4) * c * c + fm * fm)
}

/// Linear ratio in decibels, 10·log10(x).
pub fn db(x: f64) -> f64 {
    10.0 * math::log10(x)
}

/// Oscillator figure of merit, dB: −L(f_m) + 20·log10(f0/f_m) − 10·log10(P / 1 mW)
/// (common practice).
pub fn figure_of_merit(l_dbc: f64, f0: f64, fm: f64, power: f64) -> f64 {
    -l_dbc + 20.0 * math::log10(f0 / fm) - db(power / 1e-3)
}

/// Navid, Lee and Dutton's minimum phase noise of an RC (ring or relaxation) oscillator:
/// L_min(f_m) = 7.33·kT/P·(f0/f_m)² (IEEE JSSC 2005; the factor 7.33 recalled from memory).
pub fn navid_minimum(temp_k: f64, power: f64, f0: f64, fm: f64) -> f64 {
    7.33 * K_B * temp_k / power * (f0 / fm).powi(2)
}

/// Phase noise at a list of offsets.
#[derive(Clone, Debug, PartialEq)]
pub struct PhaseNoise {
    pub offsets: Vec<f64>,
    /// L(f) in dBc/Hz.
    pub l_dbc: Vec<f64>,
    /// Navid–Lee–Dutton minimum at each offset, dBc/Hz.
    pub bound_dbc: Vec<f64>,
    /// Figure of merit at each offset, dB, and the best one physics allows.
    pub fom: Vec<f64>,
    pub fom_bound: f64,
    /// Power the figure of merit and the bound are referred to, W.
    pub power: f64,
    /// Whether the model's phase noise falls below the physical minimum at any offset.
    pub beats_bound: bool,
    /// Half-width of the Lorentzian, π·f0²·c, Hz.
    pub corner: f64,
}

/// Phase noise of a carrier `f0` (Hz) with diffusion constant `c` (s) at `offsets` (Hz), the
/// figure of merit referred to `power` (W) at `temp_k` (K).
pub fn phase_noise(f0: f64, c: f64, offsets: &[f64], power: f64, temp_k: f64) -> Result<PhaseNoise, String> {
    if let Some(f) = offsets.iter().find(|f| !(**f > 0.0 && f.is_finite())) {
        return Err(format!("phase_noise: every offset must be a positive frequency in Hz, got {f}"));
    }
    if !(power > 0.0 && power.is_finite()) {
        return Err(format!("phase_noise: 'power' must be a positive number of watts, got {power}"));
    }
    let l_dbc: Vec<f64> = offsets.iter().map(|fm| db(lorentzian(f0, c, *fm))).collect();
    let bound_dbc: Vec<f64> = offsets.iter().map(|fm| db(navid_minimum(temp_k, power, f0, *fm))).collect();
    let fom: Vec<f64> = offsets.iter().zip(&l_dbc).map(|(fm, l)| figure_of_merit(*l, f0, *fm, power)).collect();
    let fom_bound = -db(7.33 * K_B * temp_k / 1e-3);
    // Inside the Lorentzian's corner the spectrum flattens, so compare where it is 1/f².
    let corner = std::f64::consts::PI * f0 * f0 * c;
    let beats_bound = offsets.iter().zip(l_dbc.iter().zip(&bound_dbc)).any(|(fm, (l, b))| *fm > 10.0 * corner && l < b);
    Ok(PhaseNoise { offsets: offsets.to_vec(), l_dbc, bound_dbc, fom, fom_bound, power, beats_bound, corner })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn far_from_the_carrier_the_lorentzian_is_f0_cubed_sigma_squared() {
        // c = σ_T²·f0 for independent periods; far out L = f0³·σ_T²/f_m² (common practice,
        // e.g. McNeill, IEEE JSSC 1997).
        let (f0, sigma): (f64, f64) = (4e6, 10e-12);
        let c = sigma * sigma * f0;
        let fm = 1e6;
        let want = f0.powi(3) * sigma * sigma / (fm * fm);
        assert!((lorentzian(f0, c, fm) / want - 1.0).abs() < 1e-6);
    }

    #[test]
    fn lorentzian_integrates_to_the_carrier_power() {
        // The two-sided Lorentzian of Demir et al. carries all the carrier's power:
        // ∫ L df over (−∞, ∞) = 1 (analytically: arctan to ±π/2).
        let (f0, c) = (4e6, 1e-15);
        let a = std::f64::consts::PI * f0 * f0 * c;
        let total = 2.0
            * crate::num::quad::integrate(
                |u: f64| lorentzian(f0, c, a * math::tan(u)) * a / math::cos(u).powi(2),
                0.0,
                std::f64::consts::FRAC_PI_2 - 1e-9,
                1e-10,
            )
            .unwrap();
        assert!((total - 1.0).abs() < 1e-5, "{total}");
    }
}
