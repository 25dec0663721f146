//! Sensitivity of the period to every numeric key: normalised ∂ln T/∂ln p, or ∂T/∂p (s per
//! unit of the key) where the nominal value is zero, by Richardson-extrapolated finite
//! differences of the analytic period, ranked by contribution.
use crate::timing::Osc;
use crate::timing::keys::{Dflt, def};

/// One key's sensitivity.
#[derive(Clone, Debug, PartialEq)]
pub struct SensRow {
    pub key: &'static str,
    pub unit: &'static str,
    /// Value of the key (given, or its default).
    pub value: f64,
    /// ∂ln T/∂ln p (None where the nominal is zero, or for `temp`).
    pub normalised: Option<f64>,
    /// ∂T/∂p, s per unit of the key.
    pub absolute: f64,
}

impl SensRow {
    /// What the ranking sorts by: |∂ln T/∂ln p| for a key with a nominal, else the relative
    /// period change for one step of the key's scale (`scale`), which puts offsets and delays
    /// in the same list.
    pub fn contribution(&self, period: f64) -> f64 {
        match self.normalised {
            Some(s) => s.abs(),
            None => (self.absolute * scale(self.unit, period)).abs() / period,
        }
    }
}

/// The period, the rows ranked, and the keys skipped with the reason.
pub type Sensitivity = (f64, Vec<SensRow>, Vec<(&'static str, String)>);

/// A relative step for the normalised derivative (common practice: about ε^(1/5) for a
/// fourth-order central scheme whose function is accurate to ~1e-13).
const REL_STEP: f64 = 1e-3;

/// Natural size of one unit of change, for zero-nominal keys (used for the step and the
/// ranking): 1 mV, 1 ps, 1 fF, 1 nA, 1 ppm of the dimensionless and per-unit keys.
fn scale(unit: &str, period: f64) -> f64 {
    match unit {
        "V" => 1e-3,
        "s" => 1e-3 * period,
        "F" => 1e-15,
        "A" => 1e-9,
        "°C" => 1.0,
        "Ω" => 1.0,
        _ => 1e-6,
    }
}

/// Fourth-order central difference by Richardson extrapolation of two central differences
/// with steps h and h/2 (Richardson 1911; Press et al., Numerical Recipes, §5.7):
/// D = (4·D(h/2) − D(h)) / 3.
pub fn richardson_central(f: &dyn Fn(f64) -> Result<f64, String>, x: f64, h: f64) -> Result<f64, String> {
    let d = |h: f64| -> Result<f64, String> { Ok((f(x + h)? - f(x - h)?) / (2.0 * h)) };
    Ok((4.0 * d(0.5 * h)? - d(h)?) / 3.0)
}

/// One-sided difference for a key that may not go below its nominal (a delay or a capacitance
/// at zero): the second-order forward difference D2(h) = (−3f(x) + 4f(x+h) − f(x+2h))/(2h)
/// (Fornberg 1988), Richardson-extrapolated D = (4·D2(h/2) − D2(h))/3. A negative `h` steps down.
pub fn richardson_forward(f: &dyn Fn(f64) -> Result<f64, String>, x: f64, h: f64) -> Result<f64, String> {
    let f0 = f(x)?;
    let d = |h: f64| -> Result<f64, String> { Ok((-3.0 * f0 + 4.0 * f(x + h)? - f(x + 2.0 * h)?) / (2.0 * h)) };
    Ok((4.0 * d(0.5 * h)? - d(h)?) / 3.0)
}

/// The keys a sensitivity table covers: every key of the oscillator's kind with a finite
/// value (given, or a numeric default); derived keys that are absent and infinite defaults
/// (ideal r_out, cmp_gbw) have no value to perturb.
pub fn numeric_keys(o: &Osc) -> Vec<(&'static str, f64)> {
    o.kind()
        .keys_for(o.params.mode)
        .iter()
        .filter_map(|k| {
            let d = def(k)?;
            let v = o.params.get(k);
            let usable = v.is_finite() && (o.params.has(k) || matches!(d.default, Dflt::Value(_)));
            usable.then_some((d.name, v))
        })
        .collect()
}

/// Sensitivities of the period with every parasitic, ranked by contribution (largest first).
/// Keys whose neighbourhood the model rejects (a step out of range, a ramp that no longer
/// ends) are returned separately with the reason.
pub fn sensitivity(o: &Osc) -> Result<Sensitivity, String> {
    let t0 = o.period()?;
    let mut rows = Vec::new();
    let mut skipped = Vec::new();
    for (key, value) in numeric_keys(o) {
        let d = def(key).ok_or_else(|| format!("internal: key '{key}' has no definition"))?;
        let period_at = |x: f64| -> Result<f64, String> { o.with(&[(key.to_string(), x)])?.period() };
        let row = if value != 0.0 && key != "temp" {
            // ∂ln T/∂ln p = (p/T)·∂T/∂p, from a step relative to the value.
            let h = REL_STEP * value.abs();
            let lo_room = if d.open_min { value - h > d.min } else { value - h >= d.min };
            let r = if lo_room && value + h <= d.max {
                richardson_central(&period_at, value, h)
            } else {
                richardson_forward(&period_at, value, if value + 2.0 * h <= d.max { h } else { -h })
            };
            r.map(|dt| SensRow { key, unit: d.unit, value, normalised: Some(dt * value / t0), absolute: dt })
        } else {
            let h = scale(d.unit, t0) * if d.unit == "°C" { 1.0 } else { 10.0 };
            let r = if value - h >= d.min {
                richardson_central(&period_at, value, h)
            } else {
                richardson_forward(&period_at, value, h)
            };
            r.map(|dt| SensRow { key, unit: d.unit, value, normalised: None, absolute: dt })
        };
        match row {
            Ok(r) if r.absolute.is_finite() => rows.push(r),
            Ok(_) => skipped.push((key, "the derivative is not finite".to_string())),
            Err(e) => skipped.push((key, e)),
        }
    }
    rows.sort_by(|a, b| b.contribution(t0).total_cmp(&a.contribution(t0)).then(a.key.cmp(b.key)));
    Ok((t0, rows, skipped))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    fn window(extra: &[(&str, f64)]) -> Osc {
        crate::analysis::test_osc(Kind::Window, extra)
    }

    #[test]
    fn ideal_window_scales_with_c_and_inverse_i() {
        // T = 2·C·ΔV/I (common practice): ∂ln T/∂ln C = 1, ∂ln T/∂ln I = −1 exactly.
        let (_, rows, _) = sensitivity(&window(&[])).unwrap();
        let get = |k: &str| rows.iter().find(|r| r.key == k).unwrap().normalised.unwrap();
        assert!((get("c") - 1.0).abs() < 1e-9, "{}", get("c"));
        assert!((get("i") + 1.0).abs() < 1e-9, "{}", get("i"));
        // ∂ln T/∂ln v_hi = v_hi/(v_hi − v_lo) = 2 for 0.6…1.2 V.
        assert!((get("v_hi") - 2.0).abs() < 1e-9);
    }

    #[test]
    fn zero_nominal_delay_counts_four_times_per_period() {
        // Each of the two phases waits t_sw after its crossing while the node keeps moving; the
        // next ramp then has the overshoot s·t_sw to undo at the same slope: each delay costs
        // 2·t_sw, and a window has two of them: ∂T/∂t_sw = 4 (symmetric ramps, common practice).
        let (_, rows, _) = sensitivity(&window(&[])).unwrap();
        let r = rows.iter().find(|r| r.key == "t_sw").unwrap();
        assert!(r.normalised.is_none());
        assert!((r.absolute - 4.0).abs() < 1e-6, "{}", r.absolute);
    }
}
