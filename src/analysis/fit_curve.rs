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

/// Forward-difference Jacobian ∂f_i/∂p_j, step √ε·max(|p_j|, typical) (common practice;
/// Dennis & Schnabel 1983, §5.4).
fn jacobian(f: &mut Model, p: &[f64], m0: &[f64], typical: &[f64]) -> Result<DMatrix<f64>, String> {
    let (n, k) = (m0.len(), p.len());
    let mut j = DMatrix::zeros(n, k);
    for c in 0..k {
        let h = f64::EPSILON.sqrt() * p[c].abs().max(typical[c]);
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
    // A parameter that starts at zero is stepped on the scale of the others.
    let scale = p0.iter().fold(0.0f64, |a, v| a.max(v.abs()));
    let typical: Vec<f64> = p0.iter().map(|v| if *v != 0.0 { v.abs() } else { scale.max(1e-300) * 1e-3 }).collect();
    let mut p = p0.to_vec();
    let mut m = eval(f, &p, n)?;
    let mut cost = ssr(y, &m);
    let mut lambda = 1e-3;
    let mut iterations = 0;
    let mut j = jacobian(f, &p, &m, &typical)?;
    let yv = DVector::from_column_slice(y);
    loop {
        iterations += 1;
        if iterations > MAX_ITER {
            return Err(format!(
                "fit_curve: no convergence in {MAX_ITER} iterations (last parameters {p:?}); try a start p0 closer to the data"
            ));
        }
        let r = &yv - DVector::from_column_slice(&m);
        let jtj = j.transpose() * &j;
        let g = j.transpose() * &r;
        let diag: Vec<f64> = (0..k).map(|c| jtj[(c, c)].max(1e-300)).collect();
        // Inner loop: raise λ until a step lowers the cost.
        let mut improved = false;
        let mut step_small = false;
        for _ in 0..60 {
            let mut a = jtj.clone();
            for c in 0..k {
                a[(c, c)] += lambda * diag[c];
            }
            let Some(delta) = a.cholesky().map(|ch| ch.solve(&g)) else {
                lambda *= 10.0;
                continue;
            };
            let q: Vec<f64> = (0..k).map(|c| p[c] + delta[c]).collect();
            step_small = (0..k).all(|c| delta[c].abs() <= 1e-12 * (p[c].abs() + 1e-12 * typical[c]));
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
                if rel < 1e-14 || step_small || cost == 0.0 {
                    step_small = true;
                }
                break;
            }
            lambda *= 10.0;
            if step_small {
                break;
            }
        }
        if !improved || step_small {
            break;
        }
        j = jacobian(f, &p, &m, &typical)?;
    }
    let j = jacobian(f, &p, &m, &typical)?;
    let jtj = j.transpose() * &j;
    let inv = jtj
        .try_inverse()
        .ok_or("fit_curve: the Jacobian at the optimum is singular: some parameters are not determined by the data")?;
    let residuals: Vec<f64> = (0..n).map(|i| y[i] - m[i]).collect();
    let names = (0..k).map(|c| format!("p{c}")).collect();
    summarise(names, p, &inv, y, residuals, true, iterations)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exponential_decay_is_recovered_exactly() {
        // y = 2·exp(−x/3) + 0.5 sampled exactly; LM from a poor start reaches it.
        let x: Vec<f64> = (0..20).map(|k| k as f64 * 0.5).collect();
        let y: Vec<f64> = x.iter().map(|v| 2.0 * (-v / 3.0).exp() + 0.5).collect();
        let xs = x.clone();
        let mut f = |p: &[f64]| -> Result<Vec<f64>, String> {
            Ok(xs.iter().map(|v| p[0] * (-v / p[1]).exp() + p[2]).collect())
        };
        let fit = fit_curve(&mut f, &x, &y, &[1.0, 1.0, 0.0]).unwrap();
        for (got, want) in fit.coef.iter().zip([2.0, 3.0, 0.5]) {
            assert!((got - want).abs() < 1e-8, "{:?}", fit.coef);
        }
    }
}
