//! Charge-and-reset oscillator: one capacitor charged by a mirrored current up to a reference,
//! then reset by a switch; the finite reset pulse and switch resistance are parasitics.
use std::rc::Rc;

use super::super::from_process::{Choices, Devices, current_source_inherent};
use super::super::keys::Params;
use super::super::osc::{Cycle, Osc, PhaseTiming, View};
use super::super::parasitic::Parasitic;
use super::super::parts::{Parts, SwitchSet};
use super::super::ramp::{advance, steady};
use super::super::transient::circuit::{Circuit, End, F, Phase, rate, zero};
use super::{NodeFn, Topology, check_rails, ramp_phase};
use crate::physics::process::Process;

pub struct Reset;

impl Topology for Reset {
    fn name(&self) -> &'static str {
        "reset"
    }
    fn keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "tc_i", "tc_c", "c_vc1", "c_vc2", "c_swn", "c_swp", "sw_phi",
            "sw_m", "c_in", "r_out", "v_ds_ref", "vos", "t_cmp", "cmp_gbw", "cmp_a0", "cmp_slew", "cmp_vsw",
            "t_logic", "t_reset", "r_reset", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn process_keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "mirror_w", "mirror_l", "sw_w", "sw_l", "cmp_w", "cmp_l",
            "cmp_itail", "cmp_cload", "cmp_vsw", "t_cmp", "vos", "t_logic", "t_reset", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn check_required(&self, p: &Params) -> Result<(), String> {
        p.need("i")?;
        p.need("v_hi")
    }
    fn check(&self, o: &Osc) -> Result<(), String> {
        let p = &o.params;
        if p.get("r_reset") > 0.0 && p.get("t_reset") == 0.0 {
            return Err("'r_reset' > 0 needs a reset pulse 't_reset' > 0 to discharge the capacitor".to_string());
        }
        Ok(())
    }
    /// One NMOS reset switch on the node; one comparator at the reference.
    fn process_parts(&self, d: &Devices) -> Result<Parts, String> {
        let mirrors = d.mirrors()?;
        let (nsw, _) = d.switches()?;
        let r_reset = nsw.with_on(true).ron(d.v_lo());
        if d.p.get("t_reset") <= 0.0 {
            return Err("osc_from(\"reset\"): key 't_reset' (the reset pulse, s) is required: a process reset switch has a finite on-resistance".into());
        }
        let c = d.pair(d.p.get("v_hi"), "vos")?;
        Ok(d.current_parts(mirrors, SwitchSet(vec![nsw]), r_reset, (c.clone(), c), None))
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

/// Ideal period T = C·(V_ref − V_reset)/I (common practice: charge balance, instant reset).
pub fn ideal_formula(c: f64, i: f64, v_reset: f64, v_ref: f64) -> f64 {
    c * (v_ref - v_reset) / i
}

/// The reset level: `v_lo` if given, else ground (shared with the ping-pong oscillator).
pub(crate) fn v_reset(o: &Osc) -> f64 {
    if o.params.has("v_lo") { o.params.get("v_lo") } else { 0.0 }
}

/// The ideal formula's arguments (C, I, V_reset, V_ref) from the nominal parts; shared with
/// the ping-pong oscillator, whose capacitors charge the same way.
pub(crate) fn ideal_args(o: &Osc) -> (f64, f64, f64, f64) {
    (o.parts.cap.nominal(&o.env), o.parts.charge.nominal(&o.env), v_reset(o), o.params.get("v_hi"))
}

pub fn ideal(o: &Osc) -> Result<f64, String> {
    let (c, i, vl, vref) = ideal_args(o);
    Ok(ideal_formula(c, i, vl, vref))
}

/// The node of the charge-and-reset oscillator under the mask of `v`.
pub(crate) struct Node<'a> {
    /// Reset level and threshold with offset, V.
    pub vl: f64,
    pub vref: f64,
    /// Capacitance on the node: capacitor, switch junctions, comparator input, F.
    pub c: NodeFn<'a>,
    /// Charging current, A.
    pub up: NodeFn<'a>,
    /// Reset pulse length (s) and reset switch resistance (Ω); both 0 for an ideal reset.
    pub t_reset: f64,
    pub r_reset: f64,
    /// Current into the node during a resistive reset, A: the source keeps feeding the node,
    /// C·dV/dt = I(V) − (V − V_reset)/R.
    pub during: NodeFn<'a>,
}

pub(crate) fn node<'a>(v: &'a View<'_>) -> Result<Node<'a>, String> {
    let o = v.o;
    let vl = v_reset(o) + v.ref_shift("v_lo");
    let vref = o.params.get("v_hi") + v.vos_hi() + v.ref_shift("v_hi");
    if vref <= vl {
        return Err(format!("the threshold with offset, {vref:.4} V, is not above the reset level {vl} V"));
    }
    let (t_reset, r_reset) = if v.on(Parasitic::Reset) { (v.p("t_reset"), o.parts.r_reset) } else { (0.0, 0.0) };
    Ok(Node {
        vl,
        vref,
        c: Rc::new(move |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x)),
        up: Rc::new(move |x: f64| v.i_ch(x)),
        t_reset,
        r_reset,
        during: Rc::new(move |x: f64| v.i_ch(x) - (x - vl) / r_reset),
    })
}

pub fn cycle(v: &View) -> Result<Cycle, String> {
    let n = node(v)?;
    let (vl, vref, t_reset, r_reset) = (n.vl, n.vref, n.t_reset, n.r_reset);
    let d = |s: f64| v.delay_hi(s) + v.chain(false);
    let one = |x0: f64| {
        let a = ramp_phase("charge", &*n.c, &*n.up, x0, vref, &d)?;
        let next = if r_reset > 0.0 { advance(&*n.c, &*n.during, a.v_end, t_reset)? } else { vl };
        let b = PhaseTiming {
            name: "reset",
            v_start: a.v_end,
            v_threshold: vl,
            v_end: next,
            ramp: 0.0,
            delay: t_reset,
            slope: 0.0,
        };
        Ok::<_, String>((a, b))
    };
    let ((a, b), iterations) = steady(|[x]| one(x).map(|(a, b)| ([b.v_end], (a, b))), [vl])?;
    if b.v_end >= vref {
        return Err(format!(
            "the reset pulse leaves the node at {:.4} V, above the threshold {vref:.4} V: the reset is too short or its switch too weak",
            b.v_end
        ));
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
    check_rails(&cy, v.env.vdd)?;
    Ok(cy)
}

/// Charge-and-reset oscillator. Start: the node at the reset level, charging.
fn circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = node(v)?;
    let vl = n.vl;
    // An ideal switch sets the node to the reset level at once and holds it there; a resistive
    // one discharges it while the source keeps feeding it.
    let during: F<'a> = if n.r_reset > 0.0 { rate(&n.during, &n.c) } else { zero() };
    let phases = vec![
        Phase {
            name: "charge",
            rate: [rate(&n.up, &n.c), zero()],
            end: End::Threshold {
                node: 0,
                level: n.vref,
                rising: true,
                cmp: Box::new(move |s| v.delay_hi(s)),
                chain: v.chain(false),
            },
            jump: if n.r_reset > 0.0 { None } else { Some(Box::new(move |[_, y]| [vl, y])) },
            no_early_trip: Some(
                "the charge phase starts at or above its threshold: the reset pulse is too short or its switch too weak (or the start voltage v0 is above the threshold)",
            ),
            rest: None,
        },
        Phase {
            name: "reset",
            rate: [during, zero()],
            end: End::Timed(n.t_reset),
            jump: None,
            no_early_trip: None,
            rest: None,
        },
    ];
    Ok(Circuit {
        phases,
        start: [vl, 0.0],
        nodes: 1,
        node_names: ["node", ""],
        rails: Some((0.0, v.env.vdd)),
        duty_phase: 1,
    })
}
