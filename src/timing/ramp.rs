//! Ramps of a node: time between two voltages, voltage after a given time, and the periodic
//! steady state of a cycle map.
use crate::num::quad::integrate;

/// Relative tolerance of the ramp quadrature.
pub const RTOL: f64 = 1e-12;

/// Time for a node of capacitance `c(V)` driven by the signed current `i(V)` (positive raises
/// the node) to move from `v0` to `v1`: t = ∫ C(V)/I(V) dV (charge balance C·dV = I·dt).
/// An error if the current does not push the node all the way (it reaches zero or reverses).
pub fn ramp_time(c: impl Fn(f64) -> f64, i: impl Fn(f64) -> f64, v0: f64, v1: f64) -> Result<f64, String> {
    if v0 == v1 {
        return Ok(0.0);
    }
    let dir = (v1 - v0).signum();
    const N: usize = 16;
    for k in 0..=N {
        let v = v0 + (v1 - v0) * k as f64 / N as f64;
        let (ci, ii) = (c(v), i(v));
        if ii.is_nan() || ii * dir <= 0.0 {
            return Err(format!(
                "the ramp from {v0:.4} V to {v1:.4} V stops: the current is {ii:.3e} A at {v:.4} V, so the node never reaches the threshold"
            ));
        }
        if !(ci > 0.0 && ci.is_finite()) {
            return Err(format!("the node capacitance is {ci:.3e} F at {v:.4} V (must be positive)"));
        }
    }
    ramp_integral(c, i, v0, v1)
}

/// The integral of `ramp_time` without its checks of the current and the capacitance along the
/// ramp, for a caller that has established them otherwise.
pub fn ramp_integral(c: impl Fn(f64) -> f64, i: impl Fn(f64) -> f64, v0: f64, v1: f64) -> Result<f64, String> {
    if v0 == v1 {
        return Ok(0.0);
    }
    let t = integrate(|v| c(v) / i(v), v0, v1, RTOL)?;
    if !(t >= 0.0 && t.is_finite()) {
        return Err(format!("the ramp time from {v0} V to {v1} V is not a finite positive number ({t})"));
    }
    Ok(t)
}

/// Node voltage after `dt` seconds from `v0` under dV/dt = I(V)/C(V): classical fourth-order
/// Runge–Kutta (exact for a constant slope) with step doubling. The first step count keeps
/// steps at 1/100 of the local time constant |d(I/C)/dV|⁻¹ at `v0` (one step for a delay
/// phase, over which the slope barely changes); the count is doubled until two counts agree
/// to 1e-12 V relative (Richardson: the finer result's error is a fifteenth of the
/// difference), so a current that bends along the way, or a fast RC discharge through a reset
/// switch, gets the steps it needs.
pub fn advance(c: impl Fn(f64) -> f64, i: impl Fn(f64) -> f64, v0: f64, dt: f64) -> Result<f64, String> {
    if dt == 0.0 {
        return Ok(v0);
    }
    let f = |v: f64| i(v) / c(v);
    let rk4 = |n: usize| {
        let h = dt / n as f64;
        let mut v = v0;
        for _ in 0..n {
            let k1 = f(v);
            let k2 = f(v + 0.5 * h * k1);
            let k3 = f(v + 0.5 * h * k2);
            let k4 = f(v + h * k3);
            v += h / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
        }
        v
    };
    let dv = 1e-3 * v0.abs().max(1e-3);
    let rate = ((f(v0 + dv) - f(v0 - dv)) / (2.0 * dv)).abs();
    let stiff = if rate.is_finite() { (100.0 * rate * dt).ceil() } else { 256.0 };
    let mut n = stiff.clamp(1.0, 1e6) as usize;
    let mut coarse = rk4(n);
    let v = loop {
        n *= 2;
        let fine = rk4(n);
        if !fine.is_finite() || (fine - coarse).abs() <= 15e-12 * (fine.abs() + 1e-3) || n >= 2_000_000 {
            break fine;
        }
        coarse = fine;
    };
    if !v.is_finite() {
        return Err(format!("the node voltage is not finite after {dt:.3e} s from {v0} V"));
    }
    Ok(v)
}

/// Periodic steady state of a cycle map: iterate x ← f(x) from `x0` until the state (node
/// voltages at the start of a cycle) stops moving (1e-13 relative, 1e-15 V absolute).
/// `f` returns the next state and what the cycle computed; the result is that of the last
/// cycle (which starts and ends at the fixed point) and the number of cycles it took.
pub fn steady<const N: usize, T>(
    mut f: impl FnMut([f64; N]) -> Result<([f64; N], T), String>,
    x0: [f64; N],
) -> Result<(T, usize), String> {
    let mut x = x0;
    for n in 1..=1000 {
        let (y, out) = f(x)?;
        let moved = x.iter().zip(&y).map(|(a, b)| (a - b).abs() - 1e-13 * b.abs()).fold(f64::MIN, f64::max);
        x = y;
        if moved <= 1e-15 {
            return Ok((out, n));
        }
    }
    Err(format!("no periodic steady state after 1000 cycles (start voltages {x:?} still moving)"))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::num::math;
    #[test]
    fn constant_ramp() {
        // t = C·ΔV/I (charge balance): 1 pF over 1 V at 1 µA is 1 µs
        let t = ramp_time(|_| 1e-12, |_| 1e-6, 0.2, 1.2).unwrap();
        assert!((t - 1e-6).abs() < 1e-18);
        let v = advance(|_| 1e-12, |_| 1e-6, 0.2, 1e-6).unwrap();
        assert!((v - 1.2).abs() < 1e-12);
    }
    #[test]
    fn rc_ramp_and_stall() {
        // RC charging toward 1 V: t = RC·ln((1−v0)/(1−v1)) (first-order circuit, textbook)
        let t = ramp_time(|_| 1e-12, |v| (1.0 - v) / 1e6, 0.0, 0.5).unwrap();
        assert!((t / (1e-6 * math::ln(2f64)) - 1.0).abs() < 1e-12);
        let v = advance(|_| 1e-12, |v| (1.0 - v) / 1e6, 0.0, 1e-6 * math::ln(2f64)).unwrap();
        assert!((v - 0.5).abs() < 1e-10);
        assert!(ramp_time(|_| 1e-12, |v| (1.0 - v) / 1e6, 0.0, 1.2).is_err());
    }
}
