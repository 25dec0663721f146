//! Distributions a Monte Carlo draws a key's value from: absolute normal, relative normal
//! (value·(1 + N(0, σ))) and uniform. The draws are rand_distr's, from the caller's stream.
use rand::Rng;
use rand_distr::{Distribution as _, StandardNormal, Uniform};

/// How one key (or one device parameter) spreads from sample to sample.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Distribution {
    /// mean + σ·N(0, 1), in the key's unit.
    Normal { mean: f64, sigma: f64 },
    /// nominal·(1 + σ·N(0, 1)): σ is a fraction of the oscillator's own value of the key.
    RelNormal { sigma: f64 },
    /// Uniform on [lo, hi).
    Uniform { lo: f64, hi: f64 },
}

/// Largest relative σ accepted: beyond it a relative normal is negative in more than one
/// sample in 10^6 (4.9σ), which no physical spread of a value is.
pub const REL_SIGMA_MAX: f64 = 0.2;

impl Distribution {
    /// `normal(mean, sigma)`: both finite, σ ≥ 0.
    pub fn normal(mean: f64, sigma: f64) -> Result<Distribution, String> {
        if !mean.is_finite() {
            return Err(format!("normal: 'mean' must be a finite number, got {mean}"));
        }
        if !(sigma.is_finite() && sigma >= 0.0) {
            return Err(format!("normal: 'sigma' must be a finite number ≥ 0, got {sigma}"));
        }
        Ok(Distribution::Normal { mean, sigma })
    }

    /// `rel_normal(sigma)`: σ a fraction in [0, REL_SIGMA_MAX].
    pub fn rel_normal(sigma: f64) -> Result<Distribution, String> {
        if !(sigma.is_finite() && (0.0..=REL_SIGMA_MAX).contains(&sigma)) {
            return Err(format!(
                "rel_normal: 'sigma' is a fraction of the value and must be in [0, {REL_SIGMA_MAX}], got {sigma}"
            ));
        }
        Ok(Distribution::RelNormal { sigma })
    }

    /// `uniform(lo, hi)`: finite, lo < hi.
    pub fn uniform(lo: f64, hi: f64) -> Result<Distribution, String> {
        if !(lo.is_finite() && hi.is_finite() && lo < hi) {
            return Err(format!("uniform: needs finite lo < hi, got lo = {lo}, hi = {hi}"));
        }
        Ok(Distribution::Uniform { lo, hi })
    }

    /// One draw around `nominal` (the oscillator's own value of the key; only the relative
    /// normal uses it).
    pub fn draw<R: Rng + ?Sized>(&self, nominal: f64, rng: &mut R) -> f64 {
        match *self {
            Distribution::Normal { mean, sigma } => {
                let z: f64 = StandardNormal.sample(rng);
                mean + sigma * z
            }
            Distribution::RelNormal { sigma } => {
                let z: f64 = StandardNormal.sample(rng);
                nominal * (1.0 + sigma * z)
            }
            Distribution::Uniform { lo, hi } => match Uniform::new(lo, hi) {
                Ok(u) => u.sample(rng),
                Err(_) => lo,
            },
        }
    }

    /// Mean and standard deviation of the drawn value for a key whose nominal is `nominal`.
    pub fn moments(&self, nominal: f64) -> (f64, f64) {
        match *self {
            Distribution::Normal { mean, sigma } => (mean, sigma),
            Distribution::RelNormal { sigma } => (nominal, nominal.abs() * sigma),
            // Uniform on [a, b): mean (a+b)/2, σ (b−a)/√12 (any statistics text).
            Distribution::Uniform { lo, hi } => (0.5 * (lo + hi), (hi - lo) / 12f64.sqrt()),
        }
    }

    /// As a script writes it: `normal(1e-12, 1e-14)`.
    pub fn describe(&self) -> String {
        match *self {
            Distribution::Normal { mean, sigma } => format!("normal({mean:e}, {sigma:e})"),
            Distribution::RelNormal { sigma } => format!("rel_normal({sigma})"),
            Distribution::Uniform { lo, hi } => format!("uniform({lo:e}, {hi:e})"),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::SeedableRng;
    use rand_chacha::ChaCha8Rng;

    #[test]
    fn bad_parameters_are_refused() {
        assert!(Distribution::normal(1.0, -0.1).unwrap_err().contains("'sigma'"));
        assert!(Distribution::rel_normal(0.5).unwrap_err().contains("[0, 0.2]"));
        assert!(Distribution::uniform(2.0, 1.0).is_err());
        assert!(Distribution::normal(f64::NAN, 0.1).is_err());
    }

    #[test]
    fn draws_stay_in_their_support() {
        let mut r = ChaCha8Rng::seed_from_u64(3);
        let u = Distribution::uniform(1.0, 2.0).unwrap();
        assert!((0..1000).map(|_| u.draw(0.0, &mut r)).all(|x| (1.0..2.0).contains(&x)));
        // σ = 0 gives the nominal exactly.
        assert_eq!(Distribution::rel_normal(0.0).unwrap().draw(3.0, &mut r), 3.0);
    }
}
