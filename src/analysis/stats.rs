//! Quantiles the analyses quote intervals with (Student's t, the standard normal), from statrs.
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
