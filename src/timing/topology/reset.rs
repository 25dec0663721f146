//! Charge-and-reset oscillator: one capacitor charged by a mirrored current up to a reference,
//! then reset by a switch; the finite reset pulse and switch resistance are parasitics.
use super::super::osc::{Cycle, Osc, PhaseTiming, View};
use super::super::parasitic::Parasitic;
use super::super::ramp::{advance, steady};
use super::{check_rails, ramp_phase};

/// Ideal period T = C·(V_ref − V_reset)/I (common practice: charge balance, instant reset).
pub fn ideal_formula(c: f64, i: f64, v_reset: f64, v_ref: f64) -> f64 {
    c * (v_ref - v_reset) / i
}

pub(crate) fn v_reset(o: &Osc) -> f64 {
    if o.params.has("v_lo") { o.params.get("v_lo") } else { 0.0 }
}

pub fn ideal(o: &Osc) -> Result<f64, String> {
    Ok(ideal_formula(o.parts.cap.nominal(&o.env), o.parts.charge.nominal(&o.env), v_reset(o), o.params.get("v_hi")))
}

pub fn cycle(v: &View) -> Result<Cycle, String> {
    let o = v.o;
    let vl = v_reset(o);
    let vref = o.params.get("v_hi") + v.vos_hi();
    if vref <= vl {
        return Err(format!("osc(\"reset\"): the threshold with offset, {vref:.4} V, is not above the reset level {vl} V"));
    }
    let c = |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x);
    let up = |x: f64| v.i_ch(x);
    let d = |s: f64| v.delay_hi(s) + v.chain(false);
    let reset_on = v.on(Parasitic::Reset);
    let (t_reset, r_reset) = if reset_on { (v.p("t_reset"), v.o.parts.r_reset) } else { (0.0, 0.0) };
    // During the reset pulse the source keeps feeding the node: C·dV/dt = I(V) − (V − V_reset)/R.
    let during = |x: f64| v.i_ch(x) - (x - vl) / r_reset;
    let one = |x0: f64| {
        let a = ramp_phase("charge", &c, &up, x0, vref, &d)?;
        let next = if r_reset > 0.0 { advance(&c, &during, a.v_end, t_reset)? } else { vl };
        let b = PhaseTiming { name: "reset", v_start: a.v_end, v_threshold: vl, v_end: next, ramp: 0.0, delay: t_reset, slope: 0.0 };
        Ok::<_, String>((a, b))
    };
    let ((a, b), iterations) = steady(|[x]| one(x).map(|(a, b)| ([b.v_end], (a, b))), [vl])?;
    if b.v_end >= vref {
        return Err(format!("osc(\"reset\"): the reset pulse leaves the node at {:.4} V, above the threshold {vref:.4} V: the reset is too short or its switch too weak", b.v_end));
    }
    let period = a.ramp + a.delay + b.delay;
    let cy = Cycle {
        period,
        duty: b.delay / period,
        v_peak: a.v_end,
        v_valley: a.v_start.min(vl),
        overshoot: a.v_end - a.v_threshold,
        phases: vec![a, b],
        iterations,
    };
    check_rails("reset", &cy, v.env.vdd)?;
    Ok(cy)
}
