//! Adaptive explicit Runge–Kutta stepping of a few decoupled node equations dV_k/dt = g_k(V_k),
//! and exact location of a threshold crossing inside a step.
use crate::num::math;
use crate::num::roots::brent;

/// Up to two node voltages (the second is unused for one-capacitor topologies).
pub type State = [f64; 2];

/// The right-hand side of one phase: dV/dt of each node, V/s.
pub trait Rates {
    fn rates(&self, y: &State) -> State;
}

// Dormand–Prince 5(4) tableau (J. R. Dormand and P. J. Prince, "A family of embedded
// Runge–Kutta formulae", J. Comput. Appl. Math. 6, 1980): nodes, stages, 5th-order weights and
// the difference between the 5th- and 4th-order weights (the error estimate).
const A2: [f64; 1] = [1.0 / 5.0];
const A3: [f64; 2] = [3.0 / 40.0, 9.0 / 40.0];
const A4: [f64; 3] = [44.0 / 45.0, -56.0 / 15.0, 32.0 / 9.0];
const A5: [f64; 4] = [19372.0 / 6561.0, -25360.0 / 2187.0, 64448.0 / 6561.0, -212.0 / 729.0];
const A6: [f64; 5] = [9017.0 / 3168.0, -355.0 / 33.0, 46732.0 / 5247.0, 49.0 / 176.0, -5103.0 / 18656.0];
const B: [f64; 6] = [35.0 / 384.0, 0.0, 500.0 / 1113.0, 125.0 / 192.0, -2187.0 / 6784.0, 11.0 / 84.0];
const E: [f64; 7] =
    [71.0 / 57600.0, 0.0, -71.0 / 16695.0, 71.0 / 1920.0, -17253.0 / 339200.0, 22.0 / 525.0, -1.0 / 40.0];

fn comb(y: &State, h: f64, ks: &[State], a: &[f64]) -> State {
    let mut out = *y;
    for n in 0..2 {
        let s: f64 = ks.iter().zip(a).map(|(k, c)| k[n] * c).sum();
        out[n] += h * s;
    }
    out
}

/// One Dormand–Prince step of length `h` from `y` whose slope there is `k1`: the 5th-order
/// result, the embedded error estimate per node, and the slope at the result.
pub fn step(g: &dyn Rates, y: &State, k1: &State, h: f64) -> (State, State, State) {
    let k2 = g.rates(&comb(y, h, &[*k1], &A2));
    let k3 = g.rates(&comb(y, h, &[*k1, k2], &A3));
    let k4 = g.rates(&comb(y, h, &[*k1, k2, k3], &A4));
    let k5 = g.rates(&comb(y, h, &[*k1, k2, k3, k4], &A5));
    let k6 = g.rates(&comb(y, h, &[*k1, k2, k3, k4, k5], &A6));
    let y1 = comb(y, h, &[*k1, k2, k3, k4, k5, k6], &B);
    let k7 = g.rates(&y1);
    let ks = [*k1, k2, k3, k4, k5, k6, k7];
    let mut err = [0.0; 2];
    for (n, e) in err.iter_mut().enumerate() {
        *e = h * ks.iter().zip(&E).map(|(k, c)| k[n] * c).sum::<f64>();
    }
    (y1, err, k7)
}

/// Tolerances of the step-size control.
#[derive(Clone, Copy, Debug)]
pub struct Tol {
    pub rtol: f64,
    /// Absolute tolerance, V.
    pub atol: f64,
}

/// An accepted step: time advanced by `h` to state `y` with slope `f` there; `next_h` is the
/// proposed next step.
pub struct Accepted {
    pub h: f64,
    pub y: State,
    pub f: State,
    pub next_h: f64,
}

/// Try steps of at most `h_max` from `y` (slope `k1` there) until one is accepted (standard controller: error
/// norm max_k |err_k| / (atol + rtol·|y_k|), safety 0.9, growth between 0.2 and 5; a step whose
/// rates are not finite counts as rejected).
pub fn advance(g: &dyn Rates, y: &State, k1: &State, h_try: f64, h_max: f64, tol: Tol) -> Result<Accepted, String> {
    if !(k1[0].is_finite() && k1[1].is_finite()) {
        return Err(format!("the node rate is not finite at V = {:?}", y));
    }
    let mut h = h_try.min(h_max);
    for _ in 0..200 {
        let (y1, err, f1) = step(g, y, k1, h);
        let mut norm = 0.0f64;
        for n in 0..2 {
            let scale = tol.atol + tol.rtol * y[n].abs().max(y1[n].abs());
            norm = norm.max((err[n] / scale).abs());
        }
        if norm.is_finite() && y1[0].is_finite() && y1[1].is_finite() {
            let grow = if norm == 0.0 { 5.0 } else { (0.9 * math::pow(norm, -0.2)).clamp(0.2, 5.0) };
            if norm <= 1.0 {
                return Ok(Accepted { h, y: y1, f: f1, next_h: h * grow });
            }
            h *= grow.min(0.9);
        } else {
            h *= 0.2;
        }
        if h == 0.0 || !h.is_finite() {
            break;
        }
    }
    Err(format!("the integrator cannot make progress from V = {y:?} (the node equations are not finite or too stiff)"))
}

/// Cubic Hermite interpolation at u ∈ [0, 1] between values p0, p1 with end slopes m0, m1
/// (already multiplied by the step length) (common practice).
pub fn hermite(p0: f64, m0: f64, p1: f64, m1: f64, u: f64) -> f64 {
    let (u2, u3) = (u * u, u * u * u);
    (2.0 * u3 - 3.0 * u2 + 1.0) * p0 + (u3 - 2.0 * u2 + u) * m0 + (-2.0 * u3 + 3.0 * u2) * p1 + (u3 - u2) * m1
}

/// The step length in (0, h] after which node `node` reaches `level`, when a step of length `h`
/// from `y` (to `y1`) passes it. The root of the re-integrated step s ↦ step(y, s)[node] − level
/// (one Dormand–Prince step of each trial length from the same start, so the crossing carries
/// the integrator's accuracy): Newton's method with the node rate as derivative, started from
/// the cubic Hermite interpolant of the step; Brent's method if Newton leaves the step.
pub fn crossing(
    g: &dyn Rates,
    y: &State,
    k1: &State,
    a: &Accepted,
    node: usize,
    level: f64,
    t: f64,
) -> Result<(f64, State), String> {
    let (y1, h) = (&a.y, a.h);
    let at = |s: f64| if s == 0.0 { *y } else { step(g, y, k1, s).0 };
    let tol = 4.0 * f64::EPSILON * (t.abs() + h);
    // Hermite guess: bisection on the cubic through (0, y0, f0) and (h, y1, f1).
    let (p0, p1, m0, m1) = (y[node] - level, y1[node] - level, k1[node] * h, a.f[node] * h);
    let mut s = brent(|u| hermite(p0, m0, p1, m1, u), 0.0, 1.0, 1e-12, 100).map(|u| u * h).unwrap_or(0.5 * h);
    for _ in 0..12 {
        let ys = at(s);
        let r = g.rates(&ys)[node];
        let ds = (ys[node] - level) / r;
        if !ds.is_finite() {
            break;
        }
        s -= ds;
        if !(s > 0.0 && s <= h) {
            break;
        }
        if ds.abs() <= tol {
            return Ok((s, at(s)));
        }
    }
    let f = |s: f64| at(s)[node] - level;
    let s = brent(f, 0.0, h, tol, 200).map_err(|e| format!("locating the threshold crossing: {e}"))?;
    Ok((s, at(s)))
}

#[cfg(test)]
mod tests {
    use super::*;
    struct Decay(f64);
    impl Rates for Decay {
        fn rates(&self, y: &State) -> State {
            [-y[0] / self.0, 1.0]
        }
    }
    #[test]
    fn exponential_decay_to_tolerance() {
        // dV/dt = −V/τ: V = V0·e^(−t/τ) (first-order circuit, textbook)
        let g = Decay(1e-6);
        let tol = Tol { rtol: 1e-10, atol: 1e-14 };
        let (mut t, mut y, mut h) = (0.0, [1.0, 0.0], 1e-9);
        while t < 3e-6 {
            let Accepted { h: hh, y: y1, next_h, .. } = advance(&g, &y, &g.rates(&y), h, 3e-6 - t, tol).unwrap();
            t += hh;
            y = y1;
            h = next_h;
        }
        assert!((y[0] - math::exp(-3.0f64)).abs() < 1e-9, "{}", y[0]);
        assert!((y[1] - 3e-6).abs() < 1e-18);
    }
    #[test]
    fn crossing_of_a_decay_is_exact() {
        // V = 0.502·e^(−t/τ) reaches 1/2 at t = τ·ln(0.502/0.5) (first-order decay, textbook)
        let g = Decay(1e-6);
        let y0 = [0.502, 0.0];
        let a = advance(&g, &y0, &g.rates(&y0), 1e-8, 1e-8, Tol { rtol: 1e-12, atol: 1e-15 }).unwrap();
        assert!(a.h == 1e-8 && a.y[0] < 0.5, "the step must pass the level");
        let (s, ys) = crossing(&g, &y0, &g.rates(&y0), &a, 0, 0.5, 0.0).unwrap();
        assert!((s / (1e-6 * math::ln(0.502f64 / 0.5)) - 1.0).abs() < 1e-9, "{s}");
        assert!((ys[0] - 0.5).abs() < 1e-12);
    }
}
