//! The EKV interpolation function and its helpers (normalised, dimensionless).
use crate::num::math;

/// ln(1 + e^y) without overflow or loss of precision.
pub fn softplus(y: f64) -> f64 {
    if y > 0.0 { y + math::ln_1p(math::exp(-y)) } else { math::ln_1p(math::exp(y)) }
}

/// 1/(1 + e^−y) without overflow.
pub fn sigmoid(y: f64) -> f64 {
    if y >= 0.0 {
        1.0 / (1.0 + math::exp(-y))
    } else {
        let e = math::exp(y);
        e / (1.0 + e)
    }
}

/// Normalised current F(x) = ln²(1 + e^{x/2}) (Enz, Krummenacher, Vittoz 1995, eq. for i_f, i_r).
pub fn f(x: f64) -> f64 {
    softplus(0.5 * x).powi(2)
}

/// dF/dx = ln(1 + e^{x/2})·σ(x/2) (derivative of the EKV 1995 interpolation).
pub fn df(x: f64) -> f64 {
    softplus(0.5 * x) * sigmoid(0.5 * x)
}

/// Inverse of F: x with F(x) = i, i > 0 (algebraic inverse of the EKV 1995 interpolation).
pub fn f_inv(i: f64) -> f64 {
    let s = i.sqrt();
    if s < 30.0 { 2.0 * math::ln(math::exp_m1(s)) } else { 2.0 * (s + math::ln_1p(-math::exp(-s))) }
}

/// Normalised inversion charge q from normalised current i: q = √(1/4 + i) − 1/2
/// (Enz, Krummenacher, Vittoz 1995, charge model; from memory).
pub fn charge(i: f64) -> f64 {
    // Written to keep precision when i ≪ 1 (q ≈ i).
    i / ((0.25 + i).sqrt() + 0.5)
}
