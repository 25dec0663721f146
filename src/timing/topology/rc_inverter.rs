//! Two-inverter RC astable: inverter 1 (input X, output A), inverter 2 (input A, output B),
//! R from A to X, C from B to X. Each edge of B kicks X by ±V_DD through C; X then relaxes
//! through R toward A until it crosses the inverter threshold.
use crate::num::math;
use std::rc::Rc;

use std::sync::Arc;

use super::super::env::T_REF_C;
use super::super::from_process::{Choices, Devices};
use super::super::keys::Params;
use super::super::osc::{Cycle, Osc, View};
use super::super::parasitic::Parasitic;
use super::super::parts::{ComparatorPart, FixedComparator, MirrorOut, Parts, SwitchSet};
use super::super::ramp::steady;
use super::super::thresholds::inverter_vm;
use super::super::transient::circuit::{Circuit, End, Phase, rate, zero};
use super::{NodeFn, Topology, ramp_phase};
use crate::physics::mosfet::{Mos, MosType};
use crate::physics::process::Process;
use crate::physics::resistor::Resistor;

pub struct RcInverter;

impl Topology for RcInverter {
    fn name(&self) -> &'static str {
        "rc-inverter"
    }
    fn keys(&self) -> &'static [&'static str] {
        &[
            "c", "r", "vdd", "temp", "v_th", "vtn", "vtp", "ratio_pn", "tc_vt", "tc_r", "tc_c", "r_vc", "c_in", "vos",
            "t_logic",
        ]
    }
    fn process_keys(&self) -> &'static [&'static str] {
        &["c", "r", "vdd", "temp", "inv_wn", "inv_wp", "inv_l", "c_in", "vos", "t_logic"]
    }
    fn check_required(&self, p: &Params) -> Result<(), String> {
        p.need("r")?;
        if p.has("v_th") && (p.has("vtn") || p.has("vtp")) {
            return Err("give the threshold either as 'v_th' or through 'vtn'/'vtp', not both".to_string());
        }
        if p.has("vtn") != p.has("vtp") {
            return Err("'vtn' and 'vtp' go together".to_string());
        }
        Ok(())
    }
    fn check(&self, o: &Osc) -> Result<(), String> {
        let (p, vdd) = (&o.params, o.env.vdd);
        if p.has("v_th") && p.get("v_th") >= vdd {
            return Err(format!("'v_th' = {} V must lie in (0, vdd = {vdd} V)", p.get("v_th")));
        }
        Ok(())
    }
    fn check_choices(&self, process: &Process, choices: &Choices) -> Result<(), String> {
        process.resistor(&choices.res_type).map(|_| ())
    }
    /// The timing resistor of a process layer, the inverter threshold from the process devices
    /// at the operating temperature and supply.
    fn process_parts(&self, d: &Devices) -> Result<Parts, String> {
        let (pr, p) = (d.pr, d.p);
        let ly = pr.resistor(&d.choices.res_type)?;
        let res = Resistor::new(p.get("r") * pr.res_scale, ly.tc1, ly.tc2, ly.vc, pr.tnom)
            .map_err(|e| format!("osc_from(\"rc-inverter\"): resistor: {e}"))?;
        let temp = p.get("temp");
        let n = Mos::from_process(pr, MosType::N, p.get("inv_wn"), p.get("inv_l"))?;
        let pm = Mos::from_process(pr, MosType::P, p.get("inv_wp"), p.get("inv_l"))?;
        let v_th = inverter_vm(pr.vdd, n.vt(temp), pm.vt(temp), pm.beta(temp) / n.beta(temp));
        let cmp: Arc<dyn ComparatorPart> =
            Arc::new(FixedComparator { vos: p.get("vos"), c_in: p.get("c_in"), t0: 0.0 });
        // The RC astable has no current sources; ideal placeholders keep the parts complete.
        let none = Arc::new(MirrorOut { i: 0.0, tc: 0.0, r_out: f64::INFINITY, v_ds_ref: 0.0, high_side: true });
        Ok(Parts {
            cap: Arc::new(d.cap.clone()),
            node: Arc::new(SwitchSet(vec![])),
            charge: none.clone(),
            discharge: none,
            cmp_hi: cmp.clone(),
            cmp_lo: cmp,
            r_reset: 0.0,
            levels: None,
            res: Some(res),
            v_th: Some(v_th),
        })
    }
    fn inherent(&self, process: &Process, choices: &Choices) -> Vec<Parasitic> {
        let vc = process.resistor(&choices.res_type).map(|l| l.vc).unwrap_or(0.0);
        if vc != 0.0 { vec![Parasitic::ResVc] } else { vec![] }
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

/// Ideal period with inverter threshold V_T: T = RC·[ln((V_DD + V_T)/V_T) + ln((2·V_DD − V_T)/(V_DD − V_T))],
/// 2·ln 3·RC ≈ 2.2·RC at V_T = V_DD/2 (textbook CMOS two-inverter astable, first-order RC
/// response after each ±V_DD kick; the 2.2·RC figure is the usual application-note value).
pub fn ideal_formula(r: f64, c: f64, vdd: f64, vt: f64) -> f64 {
    r * c * (math::ln((vdd + vt) / vt) + math::ln((2.0 * vdd - vt) / (vdd - vt)))
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

/// Two-inverter RC astable, node X (input of the first inverter). Start: the timing capacitor
/// discharged with B high, so X = vdd, falling.
fn circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = node(v)?;
    let chain = v.chain(false);
    let (down, up) = (n.kick.clone(), n.kick.clone());
    let phases = vec![
        Phase {
            name: "X falls (A low)",
            rate: [rate(&n.fall, &n.c), zero()],
            end: End::Threshold { node: 0, level: n.vt, rising: false, cmp: zero(), chain },
            jump: Some(Box::new(move |[x, y]| [x - down(x), y])),
            no_early_trip: None,
            rest: None,
        },
        Phase {
            name: "X rises (A high)",
            rate: [rate(&n.rise, &n.c), zero()],
            end: End::Threshold { node: 0, level: n.vt, rising: true, cmp: zero(), chain },
            jump: Some(Box::new(move |[x, y]| [x + up(x), y])),
            no_early_trip: None,
            rest: None,
        },
    ];
    Ok(Circuit { phases, start: [v.env.vdd, 0.0], nodes: 1, node_names: ["X", ""], rails: None, duty_phase: 0 })
}
