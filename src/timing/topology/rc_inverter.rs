//! Two-inverter RC astable: inverter 1 (input X, output A), inverter 2 (input A, output B),
//! R from A to X, C from B to X. Each edge of B kicks X by ±V_DD through C; X then relaxes
//! through R toward A until it crosses the inverter threshold.
use std::rc::Rc;

use super::super::env::T_REF_C;
use super::super::osc::{Cycle, Osc, View};
use super::super::ramp::steady;
use super::super::thresholds::inverter_vm;
use super::{NodeFn, ramp_phase};

/// Ideal period with inverter threshold V_T: T = RC·[ln((V_DD + V_T)/V_T) + ln((2·V_DD − V_T)/(V_DD − V_T))],
/// 2·ln 3·RC ≈ 2.2·RC at V_T = V_DD/2 (textbook CMOS two-inverter astable, first-order RC
/// response after each ±V_DD kick; the 2.2·RC figure is the usual application-note value).
pub fn ideal_formula(r: f64, c: f64, vdd: f64, vt: f64) -> f64 {
    r * c * (((vdd + vt) / vt).ln() + ((2.0 * vdd - vt) / (vdd - vt)).ln())
}

/// The inverter threshold: from the process devices, from vtn/vtp, as given, or vdd/2.
pub(crate) fn threshold(o: &Osc) -> f64 {
    let p = &o.params;
    if let Some(vt) = o.parts.v_th {
        vt
    } else if p.has("vtn") {
        let dt = p.get("tc_vt") * (o.env.temp_c - T_REF_C);
        inverter_vm(o.env.vdd, p.get("vtn") + dt, p.get("vtp") + dt, p.get("ratio_pn"))
    } else if p.has("v_th") {
        p.get("v_th")
    } else {
        0.5 * o.env.vdd
    }
}

/// The timing resistor at zero volts, Ω.
fn resistance(o: &Osc) -> f64 {
    o.parts.res.as_ref().map_or(f64::NAN, |r| r.r(0.0, o.env.temp_c))
}

pub fn ideal(o: &Osc) -> Result<f64, String> {
    let vt = threshold(o);
    if !(vt > 0.0 && vt < o.env.vdd) {
        return Err(format!("the threshold {vt} V must lie in (0, vdd = {} V)", o.env.vdd));
    }
    Ok(ideal_formula(resistance(o), o.parts.cap.nominal(&o.env), o.env.vdd, vt))
}

/// Node X of the RC astable under the mask of `v`.
pub(crate) struct Node<'a> {
    /// The inverter threshold with its shift, V.
    pub vt: f64,
    /// Capacitance at X: the timing capacitor (to B) and the inverter input, F.
    pub c: NodeFn<'a>,
    /// The step of X when B switches by V_DD, V.
    pub kick: NodeFn<'a>,
    /// Current into X through R while A is low (negative) and while A is high, A.
    pub fall: NodeFn<'a>,
    pub rise: NodeFn<'a>,
}

pub(crate) fn node<'a>(v: &'a View<'_>) -> Result<Node<'a>, String> {
    let o = v.o;
    let vdd = v.env.vdd;
    let vt = threshold(o) + v.vos_hi();
    if !(vt > 0.0 && vt < vdd) {
        return Err(format!("the threshold with its shift, {vt:.4} V, must lie in (0, vdd = {vdd} V)"));
    }
    let c0 = o.parts.cap.nominal(v.env);
    // X sees C (to B) plus the inverter input capacitance to ground; a step of B divides
    // between them (charge sharing, common practice).
    let c: NodeFn<'a> = Rc::new(move |x: f64| c0 + v.cin_hi(x));
    let cc = c.clone();
    Ok(Node {
        vt,
        c,
        kick: Rc::new(move |x: f64| vdd * c0 / cc(x)),
        fall: Rc::new(move |x: f64| -x / v.res(x)),
        rise: Rc::new(move |x: f64| (vdd - x) / v.res(vdd - x)),
    })
}

pub fn cycle(v: &View) -> Result<Cycle, String> {
    let vdd = v.env.vdd;
    let n = node(v)?;
    let vt = n.vt;
    let d = |_s: f64| v.chain(false);
    let one = |x0: f64| {
        let a = ramp_phase("X falls (A low)", &*n.c, &*n.fall, x0, vt, &d)?;
        let x1 = a.v_end - (n.kick)(a.v_end);
        let b = ramp_phase("X rises (A high)", &*n.c, &*n.rise, x1, vt, &d)?;
        let x2 = b.v_end + (n.kick)(b.v_end);
        Ok::<_, String>((a, b, x2))
    };
    let ((a, b), iterations) = steady(|[x]| one(x).map(|(a, b, n)| ([n], (a, b))), [vt + vdd])?;
    let period = a.ramp + a.delay + b.ramp + b.delay;
    Ok(Cycle {
        period,
        duty: (a.ramp + a.delay) / period,
        v_peak: a.v_start,
        v_valley: b.v_start,
        overshoot: (vt - a.v_end).max(b.v_end - vt),
        phases: vec![a, b],
        iterations,
    })
}
