//! Ping-pong oscillator: two capacitors take turns; the active one is charged from its reset
//! level to the reference while the other is reset; one comparator, one reference.
use std::rc::Rc;

use super::super::from_process::{Choices, Devices, current_source_inherent};
use super::super::keys::Params;
use super::super::osc::{Cycle, Osc, View};
use super::super::parasitic::Parasitic;
use super::super::parts::{Parts, SwitchSet};
use super::super::ramp::{advance, steady};
use super::super::transient::circuit::{Circuit, End, Phase, rate, zero};
use super::reset::{ideal_args, v_reset};
use super::{NodeFn, Topology, check_rails, ramp_phase};
use crate::physics::process::Process;

pub struct PingPong;

impl Topology for PingPong {
    fn name(&self) -> &'static str {
        "pingpong"
    }
    fn keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "tc_i", "tc_c", "c_vc1", "c_vc2", "c_swn", "c_swp", "sw_phi",
            "sw_m", "c_in", "r_out", "v_ds_ref", "c_mismatch", "vos", "t_cmp", "cmp_gbw", "cmp_a0", "cmp_slew",
            "cmp_vsw", "t_latch", "t_logic", "t_sw", "r_reset", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn process_keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "mirror_w", "mirror_l", "sw_w", "sw_l", "cmp_w", "cmp_l",
            "cmp_itail", "cmp_cload", "cmp_vsw", "t_cmp", "vos", "c_mismatch", "t_latch", "t_logic", "t_sw", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn check_required(&self, p: &Params) -> Result<(), String> {
        p.need("i")?;
        p.need("v_hi")
    }
    /// Each capacitor has its NMOS reset switch and PMOS charge switch; one comparator.
    fn process_parts(&self, d: &Devices) -> Result<Parts, String> {
        let mirrors = d.mirrors()?;
        let (nsw, psw) = d.switches()?;
        let r_reset = nsw.with_on(true).ron(d.v_lo());
        let c = d.pair(d.p.get("v_hi"), "vos")?;
        Ok(d.current_parts(mirrors, SwitchSet(vec![nsw, psw]), r_reset, (c.clone(), c), None))
    }
    fn inherent(&self, process: &Process, choices: &Choices) -> Vec<Parasitic> {
        current_source_inherent(process, choices, &[Parasitic::InputCap, Parasitic::CmpDelay, Parasitic::Reset])
    }
    fn ideal_period(&self, o: &Osc) -> Result<f64, String> {
        ideal(o)
    }
    fn cycle(&self, v: &View) -> Result<Cycle, String> {
        cycle(v)
    }
    fn circuit<'a>(&self, v: &'a View<'_>) -> Result<Circuit<'a>, String> {
        circuit(v)
    }
}

/// Ideal period T = 2·C·(V_ref − V_reset)/I (common practice: two equal charge-balance ramps,
/// instant reset of the idle capacitor).
pub fn ideal_formula(c: f64, i: f64, v_reset: f64, v_ref: f64) -> f64 {
    2.0 * c * (v_ref - v_reset) / i
}

pub fn ideal(o: &Osc) -> Result<f64, String> {
    let (c, i, vl, vref) = ideal_args(o);
    Ok(ideal_formula(c, i, vl, vref))
}

/// The two nodes of the ping-pong oscillator under the mask of `v`.
pub(crate) struct Node<'a> {
    /// Reset level and reference with offset, V.
    pub vl: f64,
    pub vref: f64,
    /// Capacitance of A and B while active (with the comparator input) and while idle
    /// (switches only), F; B carries the capacitor mismatch.
    pub ca: NodeFn<'a>,
    pub cb: NodeFn<'a>,
    pub ca_idle: NodeFn<'a>,
    pub cb_idle: NodeFn<'a>,
    /// Charging current, A.
    pub up: NodeFn<'a>,
    /// Reset switch resistance, Ω (0: ideal reset), and the current it draws from an idle
    /// capacitor, A.
    pub r_reset: f64,
    pub discharge: NodeFn<'a>,
}

pub(crate) fn node<'a>(v: &'a View<'_>) -> Result<Node<'a>, String> {
    let o = v.o;
    let vl = v_reset(o) + v.ref_shift("v_lo");
    let vref = o.params.get("v_hi") + v.vos_hi() + v.ref_shift("v_hi");
    if vref <= vl {
        return Err(format!("the threshold with offset, {vref:.4} V, is not above the reset level {vl} V"));
    }
    let scale_b = if v.on(Parasitic::CapMismatch) { 1.0 + v.p("c_mismatch") } else { 1.0 };
    let r_reset = if v.on(Parasitic::Reset) { o.parts.r_reset } else { 0.0 };
    // The active capacitor carries the comparator input; the idle one only its switches.
    Ok(Node {
        vl,
        vref,
        ca: Rc::new(move |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x)),
        cb: Rc::new(move |x: f64| v.cap(x) * scale_b + v.node(x) + v.cin_hi(x)),
        ca_idle: Rc::new(move |x: f64| v.cap(x) + v.node(x)),
        cb_idle: Rc::new(move |x: f64| v.cap(x) * scale_b + v.node(x)),
        up: Rc::new(move |x: f64| v.i_ch(x)),
        r_reset,
        discharge: Rc::new(move |x: f64| -(x - vl) / r_reset),
    })
}

pub fn cycle(v: &View) -> Result<Cycle, String> {
    let n = node(v)?;
    let (vl, vref, r_reset) = (n.vl, n.vref, n.r_reset);
    let d = |s: f64| v.delay_hi(s) + v.chain(true);
    let one = |[xa, xb]: [f64; 2]| {
        let a = ramp_phase("capacitor A", &*n.ca, &*n.up, xa, vref, &d)?;
        let b = ramp_phase("capacitor B", &*n.cb, &*n.up, xb, vref, &d)?;
        // A resets while B is active, and B while A is active (the same A-phase length in the
        // steady state).
        let (na, nb) = if r_reset > 0.0 {
            (
                advance(&*n.ca_idle, &*n.discharge, a.v_end, b.ramp + b.delay)?,
                advance(&*n.cb_idle, &*n.discharge, b.v_end, a.ramp + a.delay)?,
            )
        } else {
            (vl, vl)
        };
        Ok::<_, String>((a, b, [na, nb]))
    };
    let ((a, b), iterations) = steady(|x| one(x).map(|(a, b, n)| (n, (a, b))), [vl, vl])?;
    let period = a.ramp + a.delay + b.ramp + b.delay;
    let cy = Cycle {
        period,
        duty: (a.ramp + a.delay) / period,
        v_peak: a.v_end.max(b.v_end),
        v_valley: a.v_start.min(b.v_start),
        overshoot: (a.v_end - a.v_threshold).max(b.v_end - b.v_threshold),
        phases: vec![a, b],
        iterations,
    };
    check_rails(&cy, v.env.vdd)?;
    Ok(cy)
}

/// Ping-pong oscillator, capacitors A (node 0) and B (node 1). Start: both at the reset level,
/// A charging.
fn circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = node(v)?;
    let (vl, r) = (n.vl, n.r_reset);
    // The idle capacitor is discharged through the reset switch, or held by an ideal one.
    let idle = |c: &NodeFn<'a>| if r > 0.0 { rate(&n.discharge, c) } else { zero() };
    let chain = v.chain(true);
    let phases = vec![
        Phase {
            name: "capacitor A",
            rate: [rate(&n.up, &n.ca), idle(&n.cb_idle)],
            end: End::Threshold { node: 0, level: n.vref, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain },
            jump: if r > 0.0 { None } else { Some(Box::new(move |[_, b]| [vl, b])) },
            no_early_trip: None,
            rest: if r > 0.0 { Some((1, vl)) } else { None },
        },
        Phase {
            name: "capacitor B",
            rate: [idle(&n.ca_idle), rate(&n.up, &n.cb)],
            end: End::Threshold { node: 1, level: n.vref, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain },
            jump: if r > 0.0 { None } else { Some(Box::new(move |[a, _]| [a, vl])) },
            no_early_trip: None,
            rest: if r > 0.0 { Some((0, vl)) } else { None },
        },
    ];
    Ok(Circuit {
        phases,
        start: [vl, vl],
        nodes: 2,
        node_names: ["capacitor A", "capacitor B"],
        rails: Some((0.0, v.env.vdd)),
        duty_phase: 0,
    })
}
