//! What the two-threshold oscillators on one capacitor share (the window comparator oscillator,
//! `window.rs`, and the Schmitt-trigger oscillator, `schmitt.rs`): thresholds, the node, the
//! cycle and the transient circuit.
use std::rc::Rc;

use super::super::osc::{Cycle, Osc, View};
use super::super::ramp::steady;
use super::super::thresholds::schmitt_cmos;
use super::super::transient::circuit::{Circuit, End, Phase, rate, zero};
use super::{NodeFn, check_rails, ramp_phase};

/// Ideal window / current-starved Schmitt oscillator: T = 2·C·(V_hi − V_lo)/I (common practice:
/// charge balance C·ΔV = I·t over each of two equal ramps).
pub fn ideal_current(c: f64, i: f64, v_lo: f64, v_hi: f64) -> f64 {
    2.0 * c * (v_hi - v_lo) / i
}

/// Ideal RC Schmitt-trigger oscillator charging toward V_DD and discharging toward 0:
/// T = RC·[ln((V_DD − V_lo)/(V_DD − V_hi)) + ln(V_hi/V_lo)] (first-order RC response between two
/// thresholds; textbook astable, e.g. Sedra/Smith, Microelectronic Circuits).
pub fn ideal_rc(r: f64, c: f64, vdd: f64, v_lo: f64, v_hi: f64) -> f64 {
    r * c * (((vdd - v_lo) / (vdd - v_hi)).ln() + (v_hi / v_lo).ln())
}

/// Thresholds (v_lo, v_hi) at the operating point: as given, or from the Schmitt trigger's
/// devices.
pub fn thresholds(o: &Osc) -> (f64, f64) {
    let p = &o.params;
    if let Some(l) = o.parts.levels {
        l
    } else if p.has("vtn") {
        let dt = p.get("tc_vt") * (o.env.temp_c - super::super::env::T_REF_C);
        schmitt_cmos(o.env.vdd, p.get("vtn") + dt, p.get("vtp") + dt, p.get("ratio_n"), p.get("ratio_p"))
    } else {
        (p.get("v_lo"), p.get("v_hi"))
    }
}

/// Charged through the timing resistor (the RC Schmitt trigger) rather than by current sources.
pub(crate) fn rc_mode(o: &Osc) -> bool {
    o.params.has("r")
}

/// The timing resistor at zero volts, Ω.
fn resistance(o: &Osc) -> f64 {
    o.parts.res.as_ref().map_or(f64::NAN, |r| r.r(0.0, o.env.temp_c))
}

pub fn ideal(o: &Osc) -> Result<f64, String> {
    let (lo, hi) = thresholds(o);
    check_levels(o, lo, hi)?;
    let c = o.parts.cap.nominal(&o.env);
    Ok(if rc_mode(o) {
        ideal_rc(resistance(o), c, o.env.vdd, lo, hi)
    } else {
        ideal_current(c, o.parts.charge.nominal(&o.env), lo, hi)
    })
}

pub(crate) fn check_levels(o: &Osc, lo: f64, hi: f64) -> Result<(), String> {
    if lo.is_nan() || hi.is_nan() || lo >= hi {
        return Err(format!("the low threshold {lo:.4} V is not below the high threshold {hi:.4} V"));
    }
    if rc_mode(o) && !(lo > 0.0 && hi < o.env.vdd) {
        return Err(format!(
            "an RC oscillator needs both thresholds strictly inside (0, vdd = {} V); they are {lo:.4} V and {hi:.4} V",
            o.env.vdd
        ));
    }
    Ok(())
}

/// The node of a two-threshold oscillator under the mask of `v`.
pub(crate) struct Node<'a> {
    /// Thresholds with the comparator offsets, V.
    pub lo: f64,
    pub hi: f64,
    /// Capacitance on the node: capacitor, switch junctions, both comparator inputs, F.
    pub c: NodeFn<'a>,
    /// Charging (positive) and discharging (negative) current into the node, A.
    pub up: NodeFn<'a>,
    pub dn: NodeFn<'a>,
    /// The window oscillator's SR latch is in the delay chain; the Schmitt trigger has none.
    pub latch: bool,
    /// Charged through a resistor (RC Schmitt) rather than by current sources.
    pub rc: bool,
}

/// `latch`: an SR latch sits in the delay chain (the window oscillator).
pub(crate) fn node<'a>(v: &'a View<'_>, latch: bool) -> Result<Node<'a>, String> {
    let o = v.o;
    let (lo0, hi0) = thresholds(o);
    let (lo, hi) = (lo0 + v.vos_lo(), hi0 + v.vos_hi());
    check_levels(o, lo, hi)?;
    let vdd = v.env.vdd;
    let rc = rc_mode(o);
    Ok(Node {
        lo,
        hi,
        c: Rc::new(move |x| v.cap(x) + v.node(x) + v.cin_hi(x) + v.cin_lo(x)),
        up: Rc::new(move |x| if rc { (vdd - x) / v.res(vdd - x) } else { v.i_ch(x) }),
        dn: Rc::new(move |x| if rc { -x / v.res(x) } else { -v.i_dis(x) }),
        latch,
        rc,
    })
}

pub fn cycle(v: &View, latch: bool) -> Result<Cycle, String> {
    let n = node(v, latch)?;
    let (lo, hi, rc, vdd) = (n.lo, n.hi, n.rc, v.env.vdd);
    let d_hi = |s: f64| v.delay_hi(s) + v.chain(n.latch);
    let d_lo = |s: f64| v.delay_lo(s) + v.chain(n.latch);
    let one = |valley: f64| {
        let a = ramp_phase("charge", &*n.c, &*n.up, valley, hi, &d_hi)?;
        let b = ramp_phase("discharge", &*n.c, &*n.dn, a.v_end, lo, &d_lo)?;
        Ok::<_, String>((a, b))
    };
    let ((a, b), iterations) = steady(|[x]| one(x).map(|(a, b)| ([b.v_end], (a, b))), [lo])?;
    let period = a.ramp + a.delay + b.ramp + b.delay;
    let cy = Cycle {
        period,
        duty: (a.ramp + a.delay) / period,
        v_peak: a.v_end.max(a.v_start),
        v_valley: b.v_end.min(b.v_start),
        overshoot: (a.v_end - a.v_threshold).max(b.v_threshold - b.v_end),
        phases: vec![a, b],
        iterations,
    };
    if !rc {
        check_rails(&cy, vdd)?;
    }
    Ok(cy)
}

/// Window and Schmitt oscillators. Start: the node at the low threshold (with offset), charging.
pub(crate) fn circuit<'a>(v: &'a View<'_>, latch: bool) -> Result<Circuit<'a>, String> {
    let n = node(v, latch)?;
    let vdd = v.env.vdd;
    let phases = vec![
        Phase {
            name: "charge",
            rate: [rate(&n.up, &n.c), zero()],
            end: End::Threshold {
                node: 0,
                level: n.hi,
                rising: true,
                cmp: Box::new(move |s| v.delay_hi(s)),
                chain: v.chain(n.latch),
            },
            jump: None,
            no_early_trip: None,
            rest: None,
        },
        Phase {
            name: "discharge",
            rate: [rate(&n.dn, &n.c), zero()],
            end: End::Threshold {
                node: 0,
                level: n.lo,
                rising: false,
                cmp: Box::new(move |s| v.delay_lo(s)),
                chain: v.chain(n.latch),
            },
            jump: None,
            no_early_trip: None,
            rest: None,
        },
    ];
    Ok(Circuit {
        phases,
        start: [n.lo, 0.0],
        nodes: 1,
        node_names: ["node", ""],
        rails: if n.rc { None } else { Some((0.0, vdd)) },
        duty_phase: 0,
    })
}
