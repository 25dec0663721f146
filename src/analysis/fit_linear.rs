//! Linear least squares y ≈ Σ βⱼ·xⱼ (optionally with an intercept) by the singular value
//! decomposition of the design matrix (nalgebra), with standard errors, 95 % intervals from
//! Student's t, residuals and R².
use nalgebra::{DMatrix, DVector};

use super::stats::t_two_sided;

/// The result of a fit (shared by the linear and the curve fit).
#[derive(Clone, Debug, PartialEq)]
pub struct Fit {
    /// Parameter names, in order.
    pub names: Vec<String>,
    pub coef: Vec<f64>,
    /// Standard errors of the coefficients.
    pub stderr: Vec<f64>,
    /// 95 % confidence intervals (lo, hi).
    pub lo: Vec<f64>,
    pub hi: Vec<f64>,
    /// y − model, per point.
    pub residuals: Vec<f64>,
    /// Coefficient of determination (centred; uncentred for a fit through the origin).
    pub r2: f64,
    /// Residual standard deviation √(SSR/(n − p)).
    pub sigma: f64,
    /// Degrees of freedom n − p.
    pub dof: usize,
    /// Iterations (curve fit; 0 for the linear fit).
    pub iterations: usize,
}

/// Relative size below which a singular value counts as zero (a singular design), as
/// numpy.linalg.lstsq's default rcond = eps·max(n, p).
fn rcond(n: usize, p: usize) -> f64 {
    f64::EPSILON * n.max(p) as f64
}

/// Coefficient of determination: 1 − SSR/SST, SST about the mean when the model has an
/// intercept, about zero otherwise (common practice; as statsmodels' rsquared).
pub fn r_squared(y: &[f64], residuals: &[f64], centred: bool) -> f64 {
    let n = y.len() as f64;
    let mean = if centred { y.iter().sum::<f64>() / n } else { 0.0 };
    let sst: f64 = y.iter().map(|v| (v - mean).powi(2)).sum();
    let ssr: f64 = residuals.iter().map(|r| r * r).sum();
    1.0 - ssr / sst
}

/// The intervals and summary of a least-squares solution, given the covariance shape
/// (XᵀX)⁻¹ (or (JᵀJ)⁻¹): cov = s²·(XᵀX)⁻¹ with s² = SSR/(n − p) (Gauss–Markov; as
/// scipy.optimize.curve_fit with absolute_sigma = False).
pub fn summarise(
    names: Vec<String>,
    coef: Vec<f64>,
    xtx_inv: &DMatrix<f64>,
    y: &[f64],
    residuals: Vec<f64>,
    centred: bool,
    iterations: usize,
) -> Result<Fit, String> {
    let (n, p) = (y.len(), coef.len());
    let dof = n - p;
    let ssr: f64 = residuals.iter().map(|r| r * r).sum();
    let s2 = ssr / dof as f64;
    let t = t_two_sided(0.95, dof)?;
    let stderr: Vec<f64> = (0..p).map(|j| (s2 * xtx_inv[(j, j)]).max(0.0).sqrt()).collect();
    let lo = coef.iter().zip(&stderr).map(|(c, s)| c - t * s).collect();
    let hi = coef.iter().zip(&stderr).map(|(c, s)| c + t * s).collect();
    let r2 = r_squared(y, &residuals, centred);
    Ok(Fit { names, coef, stderr, lo, hi, residuals, r2, sigma: s2.sqrt(), dof, iterations })
}

/// Check the data of a fit: equal lengths, finite numbers, more points than parameters.
pub fn check_data(what: &str, y: &[f64], columns: &[(&str, &[f64])], p: usize) -> Result<(), String> {
    if let Some(k) = y.iter().position(|v| !v.is_finite()) {
        return Err(format!("{what}: y[{k}] = {} is not a finite number", y[k]));
    }
    for (name, x) in columns {
        if x.len() != y.len() {
            return Err(format!(
                "{what}: '{name}' has {} points but y has {}; every series must be as long as y",
                x.len(),
                y.len()
            ));
        }
        if let Some(k) = x.iter().position(|v| !v.is_finite()) {
            return Err(format!("{what}: '{name}'[{k}] = {} is not a finite number", x[k]));
        }
    }
    if y.len() <= p {
        return Err(format!(
            "{what}: {p} parameters need more than {p} points (one more at least, for the intervals); y has {}",
            y.len()
        ));
    }
    Ok(())
}

/// Fit y ≈ intercept + Σ βⱼ·termⱼ (the intercept first when `intercept`).
pub fn fit_linear(y: &[f64], terms: &[(String, Vec<f64>)], intercept: bool) -> Result<Fit, String> {
    let cols: Vec<(&str, &[f64])> = terms.iter().map(|(n, v)| (n.as_str(), v.as_slice())).collect();
    let p = terms.len() + intercept as usize;
    if p == 0 {
        return Err("fit_linear: no terms to fit (give terms: #{name: Series}, or keep the intercept)".into());
    }
    check_data("fit_linear", y, &cols, p)?;
    let n = y.len();
    let mut names = Vec::with_capacity(p);
    if intercept {
        names.push("intercept".to_string());
    }
    names.extend(terms.iter().map(|(n, _)| n.clone()));
    let x = DMatrix::from_fn(n, p, |i, j| if intercept && j == 0 { 1.0 } else { terms[j - intercept as usize].1[i] });
    // Columns scaled to unit norm first, so that terms of very different sizes (farads next to
    // ones) do not make a well-posed design look singular.
    let norms: Vec<f64> = (0..p).map(|j| x.column(j).norm()).collect();
    if let Some(j) = norms.iter().position(|v| *v == 0.0) {
        return Err(format!("fit_linear: the design is singular: term '{}' is zero at every point", names[j]));
    }
    let xs = DMatrix::from_fn(n, p, |i, j| x[(i, j)] / norms[j]);
    let svd = xs.clone().svd(true, true);
    let smax = svd.singular_values.max();
    let smin = svd.singular_values.min();
    if smin <= rcond(n, p) * smax {
        return Err(format!(
            "fit_linear: the design is singular (the terms {} are linearly dependent, or one is constant beside the intercept)",
            names.join(", ")
        ));
    }
    let yv = DVector::from_column_slice(y);
    let bs = svd.solve(&yv, 0.0).map_err(|e| format!("fit_linear: {e}"))?;
    let coef: Vec<f64> = (0..p).map(|j| bs[j] / norms[j]).collect();
    let fitted = &x * DVector::from_column_slice(&coef);
    let residuals: Vec<f64> = (0..n).map(|i| y[i] - fitted[i]).collect();
    // (XᵀX)⁻¹ = D⁻¹·V·Σ⁻²·Vᵀ·D⁻¹ with D the column norms.
    let v_t = svd.v_t.as_ref().ok_or("fit_linear: SVD without V")?;
    let s = &svd.singular_values;
    let inv = DMatrix::from_fn(p, p, |a, b| {
        (0..p).map(|k| v_t[(k, a)] * v_t[(k, b)] / (s[k] * s[k])).sum::<f64>() / (norms[a] * norms[b])
    });
    summarise(names, coef, &inv, y, residuals, intercept, 0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_line_is_recovered() {
        // y = 3 + 2x exactly: coefficients exact, residuals zero, R² = 1.
        let x: Vec<f64> = (0..10).map(|k| k as f64).collect();
        let y: Vec<f64> = x.iter().map(|v| 3.0 + 2.0 * v).collect();
        let f = fit_linear(&y, &[("x".into(), x)], true).unwrap();
        assert!((f.coef[0] - 3.0).abs() < 1e-12 && (f.coef[1] - 2.0).abs() < 1e-12);
        assert!((f.r2 - 1.0).abs() < 1e-12);
    }

    #[test]
    fn singular_and_short_designs_are_refused() {
        let x = vec![1.0, 2.0, 3.0, 4.0];
        let e =
            fit_linear(&[1.0, 2.0, 3.0, 4.0], &[("a".into(), x.clone()), ("b".into(), x.clone())], true).unwrap_err();
        assert!(e.contains("singular"), "{e}");
        let e = fit_linear(&[1.0, 2.0], &[("a".into(), vec![1.0, 2.0])], true).unwrap_err();
        assert!(e.contains("need more than 2 points"), "{e}");
    }
}
