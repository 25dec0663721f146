//! Numerical quadrature.
use crate::num::math;

/// 7-point Gauss–Kronrod 15 rule (nodes and weights from Piessens et al., QUADPACK, 1983):
/// returns (K15 estimate, error estimate) on [a, b]. The error estimate is QUADPACK's (QK15):
/// |K15 − G7| scaled as resasc·min(1, (200·|K15 − G7|/resasc)^1.5), floored at 50·ε·∫|f|; the
/// raw difference is the error of G7, far larger than that of K15 on a smooth integrand.
#[allow(clippy::excessive_precision)] // the published digits, kept as printed
fn gk15(f: &impl Fn(f64) -> f64, a: f64, b: f64) -> (f64, f64) {
    const XGK: [f64; 8] = [
        0.991455371120812639206854697526329,
        0.949107912342758524526189684047851,
        0.864864423359769072789712788640926,
        0.741531185599394439863864773280788,
        0.586087235467691130294144845693013,
        0.405845151377397166906606412076961,
        0.207784955007898467600689403773245,
        0.000000000000000000000000000000000,
    ];
    const WGK: [f64; 8] = [
        0.022935322010529224963732008058970,
        0.063092092629978553290700663189204,
        0.104790010322250183839876322541518,
        0.140653259715525918745189590510238,
        0.169004726639267902826583426598550,
        0.190350578064785409913256402421014,
        0.204432940075298892414161999234649,
        0.209482141084727828012999174891714,
    ];
    const WG: [f64; 4] = [
        0.129484966168869693270611432679082,
        0.279705391489276667901467771423780,
        0.381830050505118944950369775488975,
        0.417959183673469387755102040816327,
    ];
    let c = 0.5 * (a + b);
    let h = 0.5 * (b - a);
    let fc = f(c);
    let mut fv = [(0.0, 0.0); 7];
    for (j, x) in XGK[..7].iter().enumerate() {
        fv[j] = (f(c - h * x), f(c + h * x));
    }
    let mut resk = fc * WGK[7];
    let mut resg = fc * WG[3];
    let mut resabs = fc.abs() * WGK[7];
    for (j, (f1, f2)) in fv.iter().enumerate() {
        resk += WGK[j] * (f1 + f2);
        resabs += WGK[j] * (f1.abs() + f2.abs());
        if j % 2 == 1 {
            resg += WG[j / 2] * (f1 + f2);
        }
    }
    let mean = 0.5 * resk;
    let mut resasc = WGK[7] * (fc - mean).abs();
    for (j, (f1, f2)) in fv.iter().enumerate() {
        resasc += WGK[j] * ((f1 - mean).abs() + (f2 - mean).abs());
    }
    let h = h.abs();
    let (resabs, resasc) = (resabs * h, resasc * h);
    let mut err = ((resk - resg) * h).abs();
    if resasc != 0.0 && err != 0.0 {
        err = resasc * math::pow(200.0 * err / resasc, 1.5).min(1.0);
    }
    if resabs > f64::MIN_POSITIVE / (50.0 * f64::EPSILON) {
        err = err.max(50.0 * f64::EPSILON * resabs);
    }
    (resk * (0.5 * (b - a)), err)
}

/// Adaptive Gauss–Kronrod integral of `f` over [a, b] to relative tolerance `rtol`
/// (bisection of the interval with the largest error estimate, as in QUADPACK's QAG).
pub fn integrate(f: impl Fn(f64) -> f64, a: f64, b: f64, rtol: f64) -> Result<f64, String> {
    if a == b {
        return Ok(0.0);
    }
    let mut parts = vec![(a, b, gk15(&f, a, b))];
    for _ in 0..2000 {
        let total: f64 = parts.iter().map(|p| p.2.0).sum();
        let err: f64 = parts.iter().map(|p| p.2.1).sum();
        if !total.is_finite() {
            return Err(format!("integrand is not finite on [{a}, {b}]"));
        }
        if err <= rtol * total.abs() || err < 1e-300 {
            return Ok(total);
        }
        let (k, _) = parts.iter().enumerate().max_by(|x, y| x.1.2.1.partial_cmp(&y.1.2.1).unwrap()).unwrap();
        let (lo, hi, _) = parts.swap_remove(k);
        let mid = 0.5 * (lo + hi);
        parts.push((lo, mid, gk15(&f, lo, mid)));
        parts.push((mid, hi, gk15(&f, mid, hi)));
    }
    Err(format!("quadrature on [{a}, {b}] did not reach rtol {rtol}"))
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn integrates_exp_and_inverse() {
        // ∫0..1 e^x dx = e − 1; ∫1..2 dx/x = ln 2 (calculus identities)
        let v = integrate(f64::exp, 0.0, 1.0, 1e-13).unwrap();
        assert!((v - (std::f64::consts::E - 1.0)).abs() < 1e-13);
        let w = integrate(|x| 1.0 / x, 1.0, 2.0, 1e-13).unwrap();
        assert!((w - std::f64::consts::LN_2).abs() < 1e-13);
    }
    #[test]
    fn integrates_sqrt_singularity() {
        // ∫0..1 √x dx = 2/3
        let v = integrate(f64::sqrt, 0.0, 1.0, 1e-10).unwrap();
        assert!((v - 2.0 / 3.0).abs() < 1e-9);
    }
}
