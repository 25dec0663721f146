//! Noise in the transient: the same white sources as the jitter analysis (`timing::noise`),
//! drawn from per-cycle random streams derived from (seed, cycle), so a run is reproducible and
//! any cycle's draws are independent of how many cycles came before.
//!
//! Method: exact sampling, not a stochastic integrator. A ramp charged by a current I with white
//! noise of one-sided density S_i carries the charge Q(t) = I·t + σ_q·W(t), σ_q² = S_i/2; the
//! time at which it first reaches the threshold charge I·t_r is the first passage of a Brownian
//! motion with drift, an inverse-Gaussian variable IG(μ = t_r, λ = I²·t_r²/σ_q²) (Schrödinger
//! 1915; Chhikara and Folks 1989), drawn by Michael, Schucany and Haas (1976). The node is at its
//! threshold when the passage happens, so only the crossing time moves. A comparator or
//! reference error is a Gaussian shift of the threshold for that one decision (white noise
//! over a bandwidth much wider than the oscillation is uncorrelated between decisions).
//! The integrator then runs exactly as without noise: no step-size limit from the noise, one
//! normal and one uniform draw per ramp, so a noisy run costs about what a quiet one does.
use rand::{RngExt, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::StandardNormal;

use super::circuit::{Circuit, End};
use crate::timing::noise::Noise;
use crate::timing::osc::View;

/// One inverse-Gaussian draw IG(μ, λ) from a standard normal `z` and a uniform `u` in [0, 1)
/// (Michael, Schucany and Haas, The American Statistician 30, 1976).
pub fn inverse_gaussian(mu: f64, lambda: f64, z: f64, u: f64) -> f64 {
    let y = z * z;
    // x = μ + μ²y/(2λ) − (μ/2λ)·√(4μλy + μ²y²), written with φ = λ/μ to keep its digits.
    let phi = lambda / mu;
    let x = mu * (1.0 + y / (2.0 * phi) - (4.0 * phi * y + y * y).sqrt() / (2.0 * phi));
    if u * (mu + x) <= mu { x } else { mu * mu / x }
}

/// The noise of one run: sources, currents per phase, and the current cycle's stream.
pub struct Draws {
    seed: u64,
    rng: ChaCha8Rng,
    /// RMS threshold error of a rising and of a falling decision, V.
    sigma_v: [f64; 2],
    /// σ_q² = S_i/2 of the charge noise per phase (by the direction of its ramp), C²/s.
    var_q: Vec<f64>,
    /// Current into the watched node at its threshold, per phase (0 for a timed phase), A.
    current: Vec<f64>,
}

impl Draws {
    pub fn new(noise: &Noise, view: &View, c: &Circuit, seed: u64) -> Draws {
        let (current, var_q) = c
            .phases
            .iter()
            .map(|ph| match &ph.end {
                End::Threshold { level, rising, .. } => {
                    let i = if *rising { view.i_ch(*level) } else { view.i_dis(*level) };
                    (i, noise.current_psd(*rising) / 2.0)
                }
                End::Timed(_) => (0.0, 0.0),
            })
            .unzip();
        Draws {
            seed,
            rng: ChaCha8Rng::seed_from_u64(seed),
            sigma_v: [noise.sigma_threshold(true), noise.sigma_threshold(false)],
            var_q,
            current,
        }
    }

    /// Start the stream of cycle `k`: ChaCha8 keyed by the seed, stream number k.
    pub fn start_cycle(&mut self, k: usize) {
        let mut r = ChaCha8Rng::seed_from_u64(self.seed);
        r.set_stream(k as u64);
        self.rng = r;
    }

    /// The threshold of one decision with its noise, moved in the ramp's direction.
    pub fn level(&mut self, level: f64, rising: bool) -> f64 {
        let sigma = self.sigma_v[if rising { 0 } else { 1 }];
        if sigma == 0.0 {
            return level;
        }
        let e: f64 = self.rng.sample::<f64, _>(StandardNormal) * sigma;
        if rising { level + e } else { level - e }
    }

    /// The ramp time of phase `k` with the current noise, for a noiseless ramp time `t_r`.
    pub fn ramp_time(&mut self, k: usize, t_r: f64) -> f64 {
        let i = self.current.get(k).copied().unwrap_or(0.0);
        let var_q = self.var_q.get(k).copied().unwrap_or(0.0);
        if var_q == 0.0 || t_r <= 0.0 || i <= 0.0 {
            return t_r;
        }
        let lambda = i * i * t_r * t_r / var_q;
        let z: f64 = self.rng.sample(StandardNormal);
        let u: f64 = self.rng.random();
        inverse_gaussian(t_r, lambda, z, u)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn inverse_gaussian_has_its_mean_and_variance() {
        // IG(μ, λ): mean μ, variance μ³/λ (Chhikara and Folks 1989). 2·10^5 draws: the sample
        // mean lies within 4 standard errors, the variance within 3 %.
        let (mu, lambda) = (2.0, 50.0);
        let mut rng = ChaCha8Rng::seed_from_u64(7);
        let n = 200_000;
        let xs: Vec<f64> =
            (0..n).map(|_| inverse_gaussian(mu, lambda, rng.sample(StandardNormal), rng.random())).collect();
        let m = xs.iter().sum::<f64>() / n as f64;
        let v = xs.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (n - 1) as f64;
        let var = mu.powi(3) / lambda;
        assert!((m - mu).abs() < 4.0 * (var / n as f64).sqrt(), "{m}");
        assert!((v / var - 1.0).abs() < 0.03, "{v} vs {var}");
    }
}
