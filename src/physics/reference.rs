//! Reference generators: the output of ΔVbe/R (PTAT), Vbe/R (CTAT) and beta-multiplier
//! (constant-gm) current references, the base–emitter voltage of the parasitic vertical
//! bipolar versus temperature, threshold ladders from the supply and bandgap-style thresholds.
use super::constants::{K_B, Q_E, kelvin, thermal_voltage};
use crate::num::math;

/// ΔVbe of two bipolars at equal current with emitter-area ratio `n`, V: U_T·ln N (Gray, Hurst,
/// Lewis & Meyer, Analysis and Design of Analog Integrated Circuits, the PTAT ΔVbe of §4.4.3).
pub fn delta_vbe(n: f64, temp_c: f64) -> f64 {
    thermal_voltage(temp_c) * math::ln(n)
}

/// Output of a ΔVbe/R reference, A: U_T·ln N / R (Gray, Hurst, Lewis & Meyer §4.4.3).
pub fn ptat_current(n: f64, r: f64, temp_c: f64) -> f64 {
    delta_vbe(n, temp_c) / r
}

/// Beta-multiplier (constant-gm) reference current, A: I = 2·(1 − 1/√K)² / (µCox·(W/L)·R²),
/// K the width ratio of the source-degenerated device to the other (Razavi, Design of Analog
/// CMOS Integrated Circuits, 2nd ed., §12.3, square law, body effect and λ neglected).
pub fn constant_gm_current(kp: f64, wl: f64, r: f64, k: f64) -> f64 {
    let a = 1.0 - 1.0 / k.sqrt();
    2.0 * a * a / (kp * wl * r * r)
}

/// Transconductance of the unit device of a beta multiplier, S: gm = 2·(1 − 1/√K)/R (Razavi
/// §12.3: independent of supply, mobility and temperature apart from R).
pub fn constant_gm_gm(r: f64, k: f64) -> f64 {
    2.0 * (1.0 - 1.0 / k.sqrt()) / r
}

/// Whether a beta multiplier has an operating point other than zero current: only for K > 1
/// (Razavi §12.3; with K ≤ 1 the degenerated device can never carry the unit device's current).
pub fn constant_gm_starts(k: f64) -> Result<(), String> {
    if k.is_finite() && k > 1.0 {
        Ok(())
    } else {
        Err(format!(
            "a beta-multiplier reference with width ratio k = {k} cannot start up: it has no operating point but zero current unless k > 1"
        ))
    }
}

/// Tap of a resistor ladder across the supply, V: frac·V_DD (voltage divider).
pub fn ladder(frac: f64, vdd: f64) -> f64 {
    frac * vdd
}

/// Check a ladder ratio: strictly inside 0..1.
pub fn check_ladder(frac: f64) -> Result<(), String> {
    if frac.is_finite() && frac > 0.0 && frac < 1.0 {
        Ok(())
    } else {
        Err(format!("ladder ratio {frac} is outside 0..1 (a tap strictly between ground and the supply)"))
    }
}

/// Output of a bandgap-style reference, V: v·(1 + tc·ΔT + tc2·ΔT²) + ΔV_DD·10^(−PSRR/20), ΔT
/// from 27 °C and ΔV_DD from the supply it was set at (common practice: polynomial tempco; the
/// PSRR in dB as the ratio of output change to supply change).
pub fn bandgap(v: f64, tc: f64, tc2: f64, psrr_db: f64, temp_c: f64, dvdd: f64) -> f64 {
    let dt = temp_c - 27.0;
    v * (1.0 + tc * dt + tc2 * dt * dt) + dvdd * math::pow(10.0, -psrr_db / 20.0)
}

/// The parasitic vertical bipolar of a CMOS process (p+ emitter, n-well base, substrate
/// collector), as its base–emitter voltage versus temperature needs it.
#[derive(Clone, Debug, PartialEq)]
pub struct Bipolar {
    /// Vbe at `t_ref` at the reference's bias, V.
    pub vbe_ref: f64,
    /// Extrapolated bandgap voltage at 0 K, V.
    pub vg0: f64,
    /// Temperature exponent η = XTI − α (saturation current exponent minus that of the bias
    /// current), 1.
    pub eta: f64,
    /// Temperature at which `vbe_ref` holds, °C.
    pub t_ref: f64,
}

impl Bipolar {
    /// Vbe(T) = V_G0 − (T/T_r)·(V_G0 − Vbe(T_r)) − η·(kT/q)·ln(T/T_r), V (Tsividis, "Accurate
    /// analysis of temperature effects in I_C–V_BE characteristics with application to bandgap
    /// reference sources", IEEE JSSC 15(6), 1980).
    pub fn vbe(&self, temp_c: f64) -> f64 {
        let (t, tr) = (kelvin(temp_c), kelvin(self.t_ref));
        self.vg0 - t / tr * (self.vg0 - self.vbe_ref) - self.eta * thermal_voltage(temp_c) * math::ln(t / tr)
    }

    /// dVbe/dT at `temp_c`, V/K: the derivative of `vbe` (Tsividis 1980).
    pub fn dvbe_dt(&self, temp_c: f64) -> f64 {
        let (t, tr) = (kelvin(temp_c), kelvin(self.t_ref));
        let k = K_B / Q_E;
        -(self.vg0 - self.vbe_ref) / tr - self.eta * k * (math::ln(t / tr) + 1.0)
    }

    /// Check the numbers (ranges in docs/process-format.md), naming `what` in errors.
    pub fn check(&self, what: &str) -> Result<(), String> {
        let ok = |x: f64, lo: f64, hi: f64| x.is_finite() && x > lo && x < hi;
        if !ok(self.vbe_ref, 0.2, 1.0) {
            return Err(format!("{what}: vbe must be in 0.2 … 1.0 V, got {}", self.vbe_ref));
        }
        if !ok(self.vg0, self.vbe_ref, 1.5) {
            return Err(format!("{what}: vg0 must be above vbe and below 1.5 V, got {}", self.vg0));
        }
        if !(self.eta.is_finite() && (0.0..=6.0).contains(&self.eta)) {
            return Err(format!("{what}: eta must be in 0 … 6, got {}", self.eta));
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tsividis_vbe_passes_through_its_reference_point() {
        let b = Bipolar { vbe_ref: 0.65, vg0: 1.17, eta: 3.0, t_ref: 27.0 };
        assert!((b.vbe(27.0) - 0.65).abs() < 1e-15);
        // Central difference against the closed-form derivative.
        let h = 1e-3;
        let d = (b.vbe(80.0 + h) - b.vbe(80.0 - h)) / (2.0 * h);
        assert!((d - b.dvbe_dt(80.0)).abs() < 1e-9, "{d} {}", b.dvbe_dt(80.0));
    }

    #[test]
    fn beta_multiplier_gm_is_that_of_its_current() {
        // gm = √(2·β·I) (square law) equals 2(1 − 1/√K)/R.
        let (kp, wl, r, k) = (300e-6, 10.0, 50e3, 4.0);
        let i = constant_gm_current(kp, wl, r, k);
        assert!(((2.0 * kp * wl * i).sqrt() - constant_gm_gm(r, k)).abs() < 1e-18);
        assert!(constant_gm_starts(1.0).is_err() && constant_gm_starts(4.0).is_ok());
    }
}
