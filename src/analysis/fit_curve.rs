//! Nonlinear least squares of a model y ≈ f(x; p) by Levenberg–Marquardt (Levenberg 1944,
//! Marquardt 1963, with Moré's scaling by the diagonal of JᵀJ, Moré 1978), the Jacobian by
//! forward differences; intervals from s²·(JᵀJ)⁻¹ at the optimum, as scipy.optimize.curve_fit.
use nalgebra::{DMatrix, DVector};

use super::fit_linear::{Fit, check_data, summarise};

/// The model: the predicted y at every point for parameters `p`.
pub type Model<'a> = dyn FnMut(&[f64]) -> Result<Vec<f64>, String> + 'a;

/// Most iterations before the fit is given up.
pub const MAX_ITER: usize = 500;

fn ssr(y: &[f64], m: &[f64]) -> f64 {
    y.iter().zip(m).map(|(a, b)| (a - b).powi(2)).sum()
}

fn eval(f: &mut Model, p: &[f64], n: usize) -> Result<Vec<f64>, String> {
    let m = f(p)?;
    if m.len() != n {
        return Err(format!("fit_curve: the model returned {} values for {n} points", m.len()));
    }
    if let Some(k) = m.iter().position(|v| !v.is_finite()) {
        return Err(format!("fit_curve: the model gives {} at point {k} for parameters {p:?}", m[k]));
    }
    Ok(m)
}

/// Forward-difference Jacobian ∂f_i/∂p_j, step √ε·|p_j|, or √ε for a parameter at zero (as
/// MINPACK's lmdif, Moré, Garbow and Hillstrom 1980).
fn jacobian(f: &mut Model, p: &[f64], m0: &[f64]) -> Result<DMatrix<f64>, String> {
    let (n, k) = (m0.len(), p.len());
    let mut j = DMatrix::zeros(n, k);
    for c in 0..k {
        let h = f64::EPSILON.sqrt() * if p[c] == 0.0 { 1.0 } else { p[c].abs() };
        let mut q = p.to_vec();
        q[c] += h;
        let h = q[c] - p[c];
        let m = eval(f, &q, n)?;
        for r in 0..n {
            j[(r, c)] = (m[r] - m0[r]) / h;
        }
    }
    Ok(j)
}

/// 1/√diag(JᵀJ): the scaling that makes parameters of very different sizes (farads beside
/// seconds) a well-conditioned system (Moré 1978).
fn scaling(jtj: &DMatrix<f64>) -> Vec<f64> {
    (0..jtj.ncols()).map(|c| 1.0 / jtj[(c, c)].sqrt()).collect()
}

fn scaled(a: &DMatrix<f64>, sc: &[f64]) -> DMatrix<f64> {
    DMatrix::from_fn(a.nrows(), a.ncols(), |r, c| a[(r, c)] * sc[r] * sc[c])
}

/// Fit `f` to `y` from the start `p0`.
pub fn fit_curve(f: &mut Model, x: &[f64], y: &[f64], p0: &[f64]) -> Result<Fit, String> {
    let k = p0.len();
    if k == 0 {
        return Err("fit_curve: p0 must hold at least one start value".into());
    }
    if let Some(j) = p0.iter().position(|v| !v.is_finite()) {
        return Err(format!("fit_curve: p0[{j}] = {} is not a finite number", p0[j]));
    }
    check_data("fit_curve", y, &[("x", x)], k)?;
    let n = y.len();
    let singular = || "fit_curve: the Jacobian is singular: some parameters are not determined by the data".to_string();
    let mut p = p0.to_vec();
    let mut m = eval(f, &p, n)?;
    let mut cost = ssr(y, &m);
    let mut lambda = 1e-3;
    let mut iterations = 0;
    let yv = DVector::from_column_slice(y);
    loop {
        iterations += 1;
        if iterations > MAX_ITER {
            return Err(format!(
                "fit_curve: no convergence in {MAX_ITER} iterations (last parameters {p:?}); try a start p0 closer to the data"
            ));
        }
        let j = jacobian(f, &p, &m)?;
        let r = &yv - DVector::from_column_slice(&m);
        let jtj = j.transpose() * &j;
        let g = j.transpose() * &r;
        let sc = scaling(&jtj);
        if sc.iter().any(|v| !v.is_finite()) {
            return Err(singular());
        }
        let a0 = scaled(&jtj, &sc);
        let gs = DVector::from_fn(k, |r, _| g[r] * sc[r]);
        // Inner loop: raise λ until a step lowers the cost.
        let mut done = false;
        let mut improved = false;
        for _ in 0..60 {
            let mut a = a0.clone();
            for c in 0..k {
                a[(c, c)] += lambda;
            }
            let Some(ds) = a.cholesky().map(|ch| ch.solve(&gs)) else {
                lambda *= 10.0;
                continue;
            };
            let delta: Vec<f64> = (0..k).map(|c| ds[c] * sc[c]).collect();
            let q: Vec<f64> = (0..k).map(|c| p[c] + delta[c]).collect();
            let tiny = (0..k).all(|c| delta[c].abs() <= 1e-12 * p[c].abs() || delta[c] == 0.0);
            let mq = match eval(f, &q, n) {
                Ok(v) => v,
                Err(_) if lambda < 1e12 => {
                    lambda *= 10.0;
                    continue;
                }
                Err(e) => return Err(e),
            };
            let cq = ssr(y, &mq);
            if cq <= cost {
                let rel = (cost - cq) / cost.max(f64::MIN_POSITIVE);
                p = q;
                m = mq;
                cost = cq;
                lambda = (lambda / 10.0).max(1e-12);
                improved = true;
                done = rel < 1e-14 || tiny || cost == 0.0;
                break;
            }
            lambda *= 10.0;
            if tiny {
                break;
            }
        }
        if !improved || done {
            break;
        }
    }
    let j = jacobian(f, &p, &m)?;
    let jtj = j.transpose() * &j;
    let sc = scaling(&jtj);
    if sc.iter().any(|v| !v.is_finite()) {
        return Err(singular());
    }
    let inv_s = scaled(&jtj, &sc).cholesky().ok_or_else(singular)?.inverse();
    let inv = scaled(&inv_s, &sc);
    let residuals: Vec<f64> = (0..n).map(|i| y[i] - m[i]).collect();
    let names = (0..k).map(|c| format!("p{c}")).collect();
    summarise(names, p, &inv, y, residuals, true, iterations)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::num::math;

    #[test]
    fn exponential_decay_is_recovered_exactly() {
        // y = 2·exp(−x/3) + 0.5 sampled exactly; LM from a poor start reaches it.
        let x: Vec<f64> = (0..20).map(|k| k as f64 * 0.5).collect();
        let y: Vec<f64> = x.iter().map(|v| 2.0 * math::exp(-v / 3.0) + 0.5).collect();
        let xs = x.clone();
        let mut f = |p: &[f64]| -> Result<Vec<f64>, String> {
            Ok(xs.iter().map(|v| p[0] * math::exp(-v / p[1]) + p[2]).collect())
        };
        let fit = fit_curve(&mut f, &x, &y, &[1.0, 1.0, 0.0]).unwrap();
        for (got, want) in fit.coef.iter().zip([2.0, 3.0, 0.5]) {
            assert!((got - want).abs() < 1e-8, "{:?}", fit.coef);
        }
    }
}
