//! Quantiles the analyses quote intervals with (Student's t, the standard normal), from statrs,
//! and the Wilson score interval of a proportion.
use statrs::distribution::{ContinuousCDF, Normal, StudentsT};

/// Two-sided quantile of Student's t with `dof` degrees of freedom: t such that
/// P(|T| ≤ t) = `level` (e.g. 0.95).
pub fn t_two_sided(level: f64, dof: usize) -> Result<f64, String> {
    if dof == 0 {
        return Err("no degrees of freedom left for an interval".into());
    }
    let t = StudentsT::new(0.0, 1.0, dof as f64).map_err(|e| format!("Student's t: {e}"))?;
    Ok(t.inverse_cdf(0.5 + 0.5 * level))
}

/// Two-sided quantile of the standard normal: z with P(|Z| ≤ z) = `level`.
pub fn z_two_sided(level: f64) -> f64 {
    Normal::standard().inverse_cdf(0.5 + 0.5 * level)
}

/// Wilson score interval of a proportion with `k` successes in `n` trials at confidence
/// `level`: (p̂ + z²/2n ± z·√(p̂(1−p̂)/n + z²/4n²)) / (1 + z²/n) (Wilson, JASA 22, 1927).
/// (NaN, NaN) for n = 0.
pub fn wilson(k: u64, n: u64, level: f64) -> (f64, f64) {
    if n == 0 {
        return (f64::NAN, f64::NAN);
    }
    let (nf, z) = (n as f64, z_two_sided(level));
    let p = k as f64 / nf;
    let z2n = z * z / nf;
    let centre = (p + 0.5 * z2n) / (1.0 + z2n);
    let half = z / (1.0 + z2n) * (p * (1.0 - p) / nf + z * z / (4.0 * nf * nf)).sqrt();
    // At k = 0 or k = n one end is exactly 0 or 1; rounding must not move it past.
    ((centre - half).max(0.0), (centre + half).min(1.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quantiles_match_the_tables() {
        // t(0.975, 10) = 2.228139 and z(0.975) = 1.959964 (scipy.stats.t.ppf / norm.ppf;
        // also any printed table, e.g. Abramowitz & Stegun 26.7 and 26.2).
        assert!((t_two_sided(0.95, 10).unwrap() - 2.228_138_851_986_273_5).abs() < 1e-9);
        assert!((z_two_sided(0.95) - 1.959_963_984_540_054).abs() < 1e-9);
        assert!((z_two_sided(0.99) - 2.575_829_303_548_900_4).abs() < 1e-9);
    }
}
