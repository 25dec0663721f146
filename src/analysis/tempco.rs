//! Temperature coefficient (box method and slope at 27 °C) and supply coefficient of the
//! period, and the value of a tempco key that cancels the period's first-order tempco.
use super::sensitivity::richardson_central;
use crate::num::roots::brent;
use crate::timing::Osc;
use crate::timing::env::T_REF_C;
use crate::timing::keys::def;

/// A sweep of the period over one operating variable, with its coefficients.
#[derive(Clone, Debug, PartialEq)]
pub struct Coefficient {
    /// The swept variable (°C or V).
    pub x: Vec<f64>,
    /// Period at each point, s.
    pub period: Vec<f64>,
    /// The nominal period the coefficient is referred to (27 °C, or the oscillator's supply), s.
    pub nominal: f64,
    /// Box-method coefficient, per unit of x (1/°C or 1/V; ×1e6 for ppm, ×100 for %).
    pub box_coeff: f64,
    /// Slope at the nominal point, (1/T)·dT/dx, signed.
    pub slope: f64,
}

/// Box method: (T_max − T_min) / (T_nom · (x_max − x_min)) over the sweep (common practice
/// for references and oscillators; e.g. Gray, Hurst, Lewis, Meyer, "Analysis and Design of
/// Analog Integrated Circuits", bandgap tempco).
pub fn box_coefficient(period: &[f64], nominal: f64, x_min: f64, x_max: f64) -> f64 {
    let hi = period.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let lo = period.iter().copied().fold(f64::INFINITY, f64::min);
    (hi - lo) / (nominal * (x_max - x_min))
}

fn points(what: &str, lo: f64, hi: f64, n: usize) -> Result<Vec<f64>, String> {
    if !(lo.is_finite() && hi.is_finite() && lo < hi) {
        return Err(format!("{what}: the range must have min < max, got {lo} … {hi}"));
    }
    if !(2..=10_000).contains(&n) {
        return Err(format!("{what}: 'n' must be in 2..=10000, got {n}"));
    }
    Ok((0..n).map(|k| lo + (hi - lo) * k as f64 / (n - 1) as f64).collect())
}

fn period_at_temp(o: &Osc, t: f64) -> Result<f64, String> {
    o.at(Some(t), None, None)?.period()
}

/// Period versus temperature over [t_min, t_max] (°C, n points): box-method tempco about the
/// period at 27 °C, and the slope (1/T)·dT/dtemp at 27 °C.
pub fn tempco(o: &Osc, t_min: f64, t_max: f64, n: usize) -> Result<Coefficient, String> {
    let x = points("tempco", t_min, t_max, n)?;
    let period = x.iter().map(|t| period_at_temp(o, *t)).collect::<Result<Vec<_>, _>>()?;
    let nominal = period_at_temp(o, T_REF_C)?;
    let slope = richardson_central(&|t| period_at_temp(o, t), T_REF_C, 1.0)? / nominal;
    Ok(Coefficient { box_coeff: box_coefficient(&period, nominal, t_min, t_max), x, period, nominal, slope })
}

fn period_at_vdd(o: &Osc, v: f64) -> Result<f64, String> {
    o.at(None, Some(v), None)?.period()
}

/// Period versus supply over [v_min, v_max] (V, n points): box-method coefficient about the
/// period at the oscillator's own supply, and the slope there.
pub fn supply_sensitivity(o: &Osc, v_min: f64, v_max: f64, n: usize) -> Result<Coefficient, String> {
    let x = points("supply_sensitivity", v_min, v_max, n)?;
    let period = x.iter().map(|v| period_at_vdd(o, *v)).collect::<Result<Vec<_>, _>>()?;
    let v0 = o.env.vdd;
    let nominal = period_at_vdd(o, v0)?;
    let h = 1e-3 * v0;
    let slope = richardson_central(&|v| period_at_vdd(o, v), v0, h)? / nominal;
    Ok(Coefficient { box_coeff: box_coefficient(&period, nominal, v_min, v_max), x, period, nominal, slope })
}

/// The value of `key` (a tempco key such as `tc_i`, or any key that moves the tempco) for which
/// the slope dT/dtemp at 27 °C is zero, searched by Brent's method inside `[lo, hi]` (default:
/// the key's own range, clipped to ±0.01 for per-kelvin keys).
pub fn cancel_tempco(o: &Osc, key: &str, bracket: Option<(f64, f64)>) -> Result<f64, String> {
    let d = def(key).ok_or_else(|| format!("tempco_cancel: unknown key '{key}'"))?;
    if !o.kind().keys_for(o.params.mode).contains(&key) {
        return Err(format!("tempco_cancel: a {} oscillator has no key '{key}'", o.kind().name()));
    }
    let (lo, hi) =
        bracket.unwrap_or_else(|| if d.unit == "1/K" { (d.min.max(-0.01), d.max.min(0.01)) } else { (d.min, d.max) });
    let slope = |v: f64| -> f64 {
        o.with(&[(key.to_string(), v)])
            .and_then(|p| richardson_central(&|t| period_at_temp(&p, t), T_REF_C, 1.0))
            .unwrap_or(f64::NAN)
    };
    brent(slope, lo, hi, 1e-12 * (hi - lo).abs().max(1e-12), 200).map_err(|e| {
        format!("tempco_cancel: no value of '{key}' in [{lo}, {hi}] {} cancels the period tempco ({e})", d.unit)
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    fn window(extra: &[(&str, f64)]) -> Osc {
        crate::analysis::test_osc(Kind::Window, extra)
    }

    #[test]
    fn capacitor_tempco_alone_is_the_period_tempco() {
        // T ∝ C(T) = c·(1 + tc_c·(T − 27)): box (1 + 98·tc) − (1 − 67·tc) over 165 K = tc.
        let c = tempco(&window(&[("tc_c", 100e-6)]), -40.0, 125.0, 34).unwrap();
        assert!((c.box_coeff * 1e6 - 100.0).abs() < 1e-9, "{}", c.box_coeff * 1e6);
        assert!((c.slope * 1e6 - 100.0).abs() < 1e-6);
    }

    #[test]
    fn current_tempco_is_cancelled_by_equal_capacitor_tempco() {
        // T ∝ (1 + tc_c·ΔT)/(1 + tc_i·ΔT): the slope at 27 °C is tc_c − tc_i, zero at tc_i = tc_c.
        let tc_i = cancel_tempco(&window(&[("tc_c", 50e-6)]), "tc_i", None).unwrap();
        assert!((tc_i - 50e-6).abs() < 1e-10, "{tc_i}");
    }
}
