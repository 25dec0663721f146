//! The value of one key that gives a target period (or frequency) with every parasitic on:
//! a bracket grown outward from the key's present value, then Brent's method.
use crate::num::math;
use crate::num::roots::brent;
use crate::num::si::eng;
use crate::timing::Osc;
use crate::timing::keys::def;

/// What the key is solved for.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Target {
    /// Period, s.
    Period(f64),
    /// Frequency, Hz.
    Frequency(f64),
}

impl Target {
    fn period(self) -> f64 {
        match self {
            Target::Period(t) => t,
            Target::Frequency(f) => 1.0 / f,
        }
    }
    /// A period as this target's quantity, for messages.
    fn show(self, t: f64) -> String {
        match self {
            Target::Period(_) => eng(t, "s", 4),
            Target::Frequency(_) => eng(1.0 / t, "Hz", 4),
        }
    }
    fn name(self) -> &'static str {
        match self {
            Target::Period(_) => "period",
            Target::Frequency(_) => "frequency",
        }
    }
}

/// Doublings (or halvings) of the key tried on each side of its present value: ×2^40 ≈ 10^12.
const MAX_STEPS: usize = 40;
/// Bisections towards the edge where the oscillator stops being valid (out of the key's range,
/// thresholds crossing, a ramp that stops), so a target just inside that edge is still found.
const EDGE_BISECTIONS: usize = 30;

/// The value of `key` for which `o` (every parasitic on) has the target period or frequency.
/// Keys with a positive value are searched on a logarithmic scale, others linearly in steps of
/// a quarter of their present value; the error names the interval searched and the range of
/// the target quantity that the key reaches there.
pub fn solve(o: &Osc, key: &str, target: Target) -> Result<f64, String> {
    let want = target.period();
    if !(want > 0.0 && want.is_finite()) {
        return Err(format!("solve: the target {} must be a positive number", target.name()));
    }
    let valid = o.kind().keys_for(o.params.mode);
    let Some(name) = valid.iter().copied().find(|k| *k == key) else {
        return Err(format!("solve: {} has no key '{key}'; valid keys are: {}", o.caller(), valid.join(", ")));
    };
    let d = def(name).ok_or_else(|| format!("solve: key '{key}' has no definition"))?;
    let v0 = o.params.get(name);
    if !v0.is_finite() || v0 == 0.0 {
        return Err(format!("solve: key '{key}' has no non-zero value to start from; give it one in {}", o.caller()));
    }
    let log = v0 > 0.0 && d.min >= 0.0;
    // x is the search variable: ln(value) on the log scale, the value itself on the linear one.
    let value = |x: f64| if log { math::exp(x) } else { x };
    let step = if log { std::f64::consts::LN_2 } else { v0.abs() / 4.0 };
    let x0 = if log { math::ln(v0) } else { v0 };
    let g = |x: f64| -> Option<f64> {
        let t = o.with(&[(name.to_string(), value(x))]).and_then(|p| p.period()).ok()?;
        Some(t / want - 1.0)
    };
    let g0 = g(x0).ok_or_else(|| format!("solve: {} does not evaluate at its own value of '{key}'", o.caller()))?;
    if g0 == 0.0 {
        return Ok(v0);
    }
    // Reached periods (for the message) and the searched ends, per side.
    let (mut t_lo, mut t_hi) = ((g0 + 1.0) * want, (g0 + 1.0) * want);
    let mut searched = (x0, x0);
    let mut bracket = None;
    'sides: for dir in [1.0, -1.0] {
        let (mut x_ok, mut g_ok) = (x0, g0);
        for k in 1..=MAX_STEPS {
            let x = x0 + dir * step * (1u64 << (k - 1)) as f64;
            match g(x) {
                Some(gx) => {
                    note(&mut t_lo, &mut t_hi, &mut searched, x, gx, want);
                    if gx.signum() != g_ok.signum() {
                        bracket = Some((x_ok, x));
                        break 'sides;
                    }
                    (x_ok, g_ok) = (x, gx);
                }
                None => {
                    // Close in on the edge of validity between x_ok and x.
                    let mut bad = x;
                    for _ in 0..EDGE_BISECTIONS {
                        let mid = 0.5 * (x_ok + bad);
                        match g(mid) {
                            Some(gm) => {
                                note(&mut t_lo, &mut t_hi, &mut searched, mid, gm, want);
                                if gm.signum() != g_ok.signum() {
                                    bracket = Some((x_ok, mid));
                                    break 'sides;
                                }
                                (x_ok, g_ok) = (mid, gm);
                            }
                            None => bad = mid,
                        }
                    }
                    break;
                }
            }
        }
    }
    let Some((a, b)) = bracket else {
        let (lo, hi) = (value(searched.0.min(searched.1)), value(searched.0.max(searched.1)));
        let unit = if d.unit == "1" { "" } else { d.unit };
        let (q_lo, q_hi) = match target {
            Target::Period(_) => (t_lo, t_hi),
            Target::Frequency(_) => (t_hi, t_lo),
        };
        return Err(format!(
            "solve: no value of '{key}' in {} … {} gives the {} {}; over that range the {} reaches {} … {}",
            eng(lo, unit, 4),
            eng(hi, unit, 4),
            target.name(),
            target.show(want),
            target.name(),
            target.show(q_lo),
            target.show(q_hi),
        ));
    };
    let tol = if log { 1e-14 } else { 1e-14 * v0.abs() };
    let x = brent(|x| g(x).unwrap_or(f64::NAN), a, b, tol, 200).map_err(|e| format!("solve: '{key}': {e}"))?;
    Ok(value(x))
}

/// Record a valid evaluation: the period reached and the interval searched.
fn note(t_lo: &mut f64, t_hi: &mut f64, searched: &mut (f64, f64), x: f64, gx: f64, want: f64) {
    let t = (gx + 1.0) * want;
    *t_lo = t_lo.min(t);
    *t_hi = t_hi.max(t);
    *searched = (searched.0.min(x), searched.1.max(x));
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    #[test]
    fn ideal_window_capacitor_is_the_charge_balance_value() {
        // Ideal window T = 2·C·(v_hi − v_lo)/I (charge balance): 1 µs at 1 µA, 0.6 V → C = 833.3 fF.
        let o = crate::analysis::test_osc(Kind::Window, &[]);
        let c = solve(&o, "c", Target::Period(1e-6)).unwrap();
        assert!((c / (1e-6 * 1e-6 / (2.0 * 0.6)) - 1.0).abs() < 1e-12, "{c}");
        let i = solve(&o, "i", Target::Frequency(2e6)).unwrap();
        assert!((i / (2.0 * 1e-12 * 0.6 * 2e6) - 1.0).abs() < 1e-12, "{i}");
    }

    #[test]
    fn unreachable_target_names_the_reached_range() {
        // v_hi is bounded by vdd = 1.8 V: T ≤ 2·1 pF·(1.8 − 0.6) V/1 µA = 2.4 µs.
        let o = crate::analysis::test_osc(Kind::Window, &[]);
        let e = solve(&o, "v_hi", Target::Period(10e-6)).unwrap_err();
        assert!(e.contains("no value of 'v_hi'") && e.contains("2.400 µs"), "{e}");
        assert!(solve(&o, "q", Target::Period(1e-6)).unwrap_err().contains("valid keys are"));
    }
}
