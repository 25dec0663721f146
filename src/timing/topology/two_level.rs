//! What the two-threshold oscillators on one capacitor share (the window comparator oscillator,
//! `window.rs`, and the Schmitt-trigger oscillator, `schmitt.rs`): thresholds, the node, the
//! cycle and the transient circuit.
use crate::num::math;
use std::rc::Rc;

use super::super::osc::PhaseTiming;
use super::super::osc::{Cycle, Osc, View};
use super::super::ramp::{ramp_integral, ramp_time, steady};
use super::super::thresholds::schmitt_cmos;
use super::super::transient::circuit::{Circuit, End, Phase, rate, zero};
use super::{NodeFn, Overshoot, check_rails, is_past, overshoot};

/// Ideal window / current-starved Schmitt oscillator: T = 2·C·(V_hi − V_lo)/I (common practice:
/// charge balance C·ΔV = I·t over each of two equal ramps).
pub fn ideal_current(c: f64, i: f64, v_lo: f64, v_hi: f64) -> f64 {
    2.0 * c * (v_hi - v_lo) / i
}

/// Ideal RC Schmitt-trigger oscillator charging toward V_DD and discharging toward 0:
/// T = RC·[ln((V_DD − V_lo)/(V_DD − V_hi)) + ln(V_hi/V_lo)] (first-order RC response between two
/// thresholds; textbook astable, e.g. Sedra/Smith, Microelectronic Circuits).
pub fn ideal_rc(r: f64, c: f64, vdd: f64, v_lo: f64, v_hi: f64) -> f64 {
    r * c * (math::ln((vdd - v_lo) / (vdd - v_hi)) + math::ln(v_hi / v_lo))
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
    let (lo, hi) = (lo0 + v.vos_lo() + v.ref_shift("v_lo"), hi0 + v.vos_hi() + v.ref_shift("v_hi"));
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
    TwoLevel {
        c: &*n.c,
        up: &*n.up,
        dn: &*n.dn,
        d_hi: &|s: f64| v.delay_hi(s) + v.chain(n.latch),
        d_lo: &|s: f64| v.delay_lo(s) + v.chain(n.latch),
        lo: n.lo,
        hi: n.hi,
        rails: if n.rc { None } else { Some(v.env.vdd) },
        checked: true,
    }
    .cycle()
}

/// A two-threshold node as functions of its voltage: capacitance, charging and discharging
/// currents, the delay after each threshold at the slope there; the thresholds with offsets,
/// the supply if current sources must stay inside it, and whether the ramps check the current
/// and capacitance along the way (`ramp_time`) or the caller has done so (`ramp_integral`).
pub(crate) struct TwoLevel<'f, C: ?Sized, U: ?Sized, N: ?Sized, DH: ?Sized, DL: ?Sized> {
    pub c: &'f C,
    pub up: &'f U,
    pub dn: &'f N,
    pub d_hi: &'f DH,
    pub d_lo: &'f DL,
    pub lo: f64,
    pub hi: f64,
    pub rails: Option<f64>,
    pub checked: bool,
}

/// The overshoot after a crossing at `v_cross`, from `memo` if it was computed for the same
/// crossing (in the steady state every cycle crosses at the same voltages).
fn overshoot_at<C, I, D>(
    memo: &mut Option<(f64, Overshoot)>,
    c: &C,
    i: &I,
    v_cross: f64,
    d: &D,
) -> Result<Overshoot, String>
where
    C: Fn(f64) -> f64 + ?Sized,
    I: Fn(f64) -> f64 + ?Sized,
    D: Fn(f64) -> f64 + ?Sized,
{
    if let Some((k, e)) = *memo
        && k == v_cross
    {
        return Ok(e);
    }
    let e = overshoot(c, i, v_cross, d)?;
    *memo = Some((v_cross, e));
    Ok(e)
}

impl<C, U, N, DH, DL> TwoLevel<'_, C, U, N, DH, DL>
where
    C: Fn(f64) -> f64 + ?Sized,
    U: Fn(f64) -> f64 + ?Sized,
    N: Fn(f64) -> f64 + ?Sized,
    DH: Fn(f64) -> f64 + ?Sized,
    DL: Fn(f64) -> f64 + ?Sized,
{
    /// The cycle in periodic steady state. Where a cycle ends depends only on where the node
    /// crosses each threshold and on the overshoot there, not on the ramp times, so the
    /// steady-state iteration runs on those end points alone (each overshoot computed once per
    /// crossing voltage) and the two ramps are integrated once, for the last cycle.
    pub fn cycle(&self) -> Result<Cycle, String> {
        let (lo, hi) = (self.lo, self.hi);
        let (mut memo_a, mut memo_b) = (None, None);
        let ((x, past_a, ea, past_b, eb), iterations) = steady(
            |[x]| {
                let past_a = is_past(self.up, x, hi);
                let ea = overshoot_at(&mut memo_a, self.c, self.up, if past_a { x } else { hi }, self.d_hi)?;
                let past_b = is_past(self.dn, ea.v_end, lo);
                let eb = overshoot_at(&mut memo_b, self.c, self.dn, if past_b { ea.v_end } else { lo }, self.d_lo)?;
                Ok(([eb.v_end], (x, past_a, ea, past_b, eb)))
            },
            [lo],
        )?;
        let a = PhaseTiming {
            name: "charge",
            v_start: x,
            v_threshold: hi,
            v_end: ea.v_end,
            ramp: if past_a { 0.0 } else { self.ramp(self.up, x, hi).map_err(|e| format!("charge: {e}"))? },
            delay: ea.delay,
            slope: ea.slope,
        };
        let b = PhaseTiming {
            name: "discharge",
            v_start: ea.v_end,
            v_threshold: lo,
            v_end: eb.v_end,
            ramp: if past_b { 0.0 } else { self.ramp(self.dn, ea.v_end, lo).map_err(|e| format!("discharge: {e}"))? },
            delay: eb.delay,
            slope: eb.slope,
        };
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
        if let Some(vdd) = self.rails {
            check_rails(&cy, vdd)?;
        }
        Ok(cy)
    }

    fn ramp<I: Fn(f64) -> f64 + ?Sized>(&self, i: &I, v0: f64, v1: f64) -> Result<f64, String> {
        if self.checked { ramp_time(self.c, i, v0, v1) } else { ramp_integral(self.c, i, v0, v1) }
    }
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
