//! Scalar root finding.

/// Brent's method (R. P. Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 4):
/// a root of `f` in `[a, b]` where f(a) and f(b) have opposite signs, to absolute tolerance `tol`.
pub fn brent(f: impl Fn(f64) -> f64, mut a: f64, mut b: f64, tol: f64, max_iter: usize) -> Result<f64, String> {
    let mut fa = f(a);
    let mut fb = f(b);
    if fa.is_nan() || fb.is_nan() {
        return Err(format!("function is NaN at the bracket [{a}, {b}]"));
    }
    if fa == 0.0 {
        return Ok(a);
    }
    if fb == 0.0 {
        return Ok(b);
    }
    if fa.signum() == fb.signum() {
        return Err(format!("no sign change in [{a}, {b}]: f = {fa} and {fb}"));
    }
    let (mut c, mut fc) = (a, fa);
    let mut d = b - a;
    let mut e = d;
    for _ in 0..max_iter {
        if fb.signum() == fc.signum() {
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol1 = 2.0 * f64::EPSILON * b.abs() + 0.5 * tol;
        let xm = 0.5 * (c - b);
        if xm.abs() <= tol1 || fb == 0.0 {
            return Ok(b);
        }
        if e.abs() >= tol1 && fa.abs() > fb.abs() {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * xm * s;
                q = 1.0 - s;
            } else {
                let qq = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * xm * qq * (qq - r) - (b - a) * (r - 1.0));
                q = (qq - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            }
            p = p.abs();
            let min1 = 3.0 * xm * q - (tol1 * q).abs();
            let min2 = (e * q).abs();
            if 2.0 * p < min1.min(min2) {
                e = d;
                d = p / q;
            } else {
                d = xm;
                e = d;
            }
        } else {
            d = xm;
            e = d;
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol1 { d } else { tol1.copysign(xm) };
        fb = f(b);
        if fb.is_nan() {
            return Err(format!("function became NaN at {b}"));
        }
    }
    Err(format!("no convergence after {max_iter} iterations"))
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn finds_sqrt2() {
        // √2 = 1.41421356237309504880… (known constant)
        let r = brent(|x| x * x - 2.0, 0.0, 2.0, 1e-15, 100).unwrap();
        assert!((r - std::f64::consts::SQRT_2).abs() < 1e-14);
    }
    #[test]
    fn rejects_no_bracket() {
        assert!(brent(|x| x * x + 1.0, -1.0, 1.0, 1e-12, 100).is_err());
    }
}
