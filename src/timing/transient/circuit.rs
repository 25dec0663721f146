//! Each topology as time-domain phases: the node equations dV/dt = I(V)/C(V) of every phase,
//! what ends the phase (a comparator threshold, or a timed pulse), and what the switch action
//! does to the nodes (the capacitive kick of the RC inverter pair, an ideal reset). The parts
//! and parasitics are those of the period model, read through the same masked `View`.
use super::stepper::{Rates, State};
use crate::timing::keys::Kind;
use crate::timing::osc::View;
use crate::timing::parasitic::Parasitic;
use crate::timing::topology::{rc_inverter, reset, two_level};

pub type F<'a> = Box<dyn Fn(f64) -> f64 + 'a>;

/// What ends a phase.
pub enum End<'a> {
    /// Node `node` crosses `level` (rising or falling); the comparator then decides after
    /// `cmp(slope)` (slope in V/s at the threshold) and the latch, logic and switch act `chain`
    /// seconds later, the phase's currents flowing all the while.
    Threshold { node: usize, level: f64, rising: bool, cmp: F<'a>, chain: f64 },
    /// A pulse of fixed length, s (the reset pulse).
    Timed(f64),
}

pub struct Phase<'a> {
    pub name: &'static str,
    /// dV/dt of each node during the phase, V/s.
    pub rate: [F<'a>; 2],
    pub end: End<'a>,
    /// Instantaneous change of the nodes at the switch action that ends the phase.
    pub jump: Option<Box<dyn Fn(State) -> State + 'a>>,
    /// If set, starting the phase already past its threshold is this error (instead of
    /// tripping at once).
    pub no_early_trip: Option<&'static str>,
    /// A node that relaxes onto a level during the phase (node, level in V).
    pub rest: Option<(usize, f64)>,
}

impl Rates for Phase<'_> {
    fn rates(&self, y: &State) -> State {
        [(self.rate[0])(y[0]), (self.rate[1])(y[1])]
    }
}

pub struct Circuit<'a> {
    pub phases: Vec<Phase<'a>>,
    /// Node voltages at t = 0 (the defined start), V.
    pub start: State,
    /// Nodes in use (1, or 2 for ping-pong) and their names.
    pub nodes: usize,
    pub node_names: [&'static str; 2],
    /// Range the nodes must stay in (current-source nodes: the supply), V.
    pub rails: Option<(f64, f64)>,
    /// Phase whose share of the cycle is the duty (as `Cycle::duty`).
    pub duty_phase: usize,
}

/// The idle ping-pong capacitor: discharged through the reset switch toward the reset level
/// (C·dV/dt = −(V − V_reset)/R), or held there by an ideal switch.
fn idle<'a>(r: f64, vl: f64, cap: impl Fn(f64) -> f64 + 'a) -> F<'a> {
    if r > 0.0 { Box::new(move |x| -(x - vl) / r / cap(x)) } else { zero() }
}

fn zero<'a>() -> F<'a> {
    Box::new(|_| 0.0)
}

/// The phases of `v.o`'s topology, seen through the mask of `v`.
pub fn build<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    match v.o.kind() {
        Kind::Window | Kind::Schmitt => two_level_circuit(v),
        Kind::RcInverter => rc_inverter_circuit(v),
        Kind::Reset => reset_circuit(v),
        Kind::PingPong => pingpong_circuit(v),
    }
}

/// Window and Schmitt oscillators. Start: the node at the low threshold (with offset), charging.
fn two_level_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let o = v.o;
    let (lo0, hi0) = two_level::thresholds(o);
    let (lo, hi) = (lo0 + v.vos_lo(), hi0 + v.vos_hi());
    two_level::check_levels(o, lo, hi)?;
    let vdd = v.env.vdd;
    let rc = two_level::rc_mode(o);
    let latch = o.kind() == Kind::Window;
    let c = move |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x) + v.cin_lo(x);
    let up = move |x: f64| if rc { (vdd - x) / v.res(vdd - x) } else { v.i_ch(x) };
    let dn = move |x: f64| if rc { -x / v.res(x) } else { -v.i_dis(x) };
    let phases = vec![
        Phase {
            name: "charge",
            rate: [Box::new(move |x| up(x) / c(x)), zero()],
            end: End::Threshold { node: 0, level: hi, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain: v.chain(latch) },
            jump: None,
            no_early_trip: None,
            rest: None,
        },
        Phase {
            name: "discharge",
            rate: [Box::new(move |x| dn(x) / c(x)), zero()],
            end: End::Threshold { node: 0, level: lo, rising: false, cmp: Box::new(move |s| v.delay_lo(s)), chain: v.chain(latch) },
            jump: None,
            no_early_trip: None,
            rest: None,
        },
    ];
    Ok(Circuit {
        phases,
        start: [lo, 0.0],
        nodes: 1,
        node_names: ["node", ""],
        rails: if rc { None } else { Some((0.0, vdd)) },
        duty_phase: 0,
    })
}

/// Two-inverter RC astable, node X (input of the first inverter). Start: the timing capacitor
/// discharged with B high, so X = vdd, falling.
fn rc_inverter_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let o = v.o;
    let vdd = v.env.vdd;
    let vt = rc_inverter::threshold(o) + v.vos_hi();
    if !(vt > 0.0 && vt < vdd) {
        return Err(format!("osc(\"rc-inverter\"): the threshold with its shift, {vt:.4} V, must lie in (0, vdd = {vdd} V)"));
    }
    let c0 = o.parts.cap.nominal(v.env);
    // X sees C (to B) plus the inverter input capacitance to ground; an edge of B divides
    // between them (charge sharing, as in the period model).
    let c = move |x: f64| c0 + v.cin_hi(x);
    let kick = move |x: f64| vdd * c0 / c(x);
    let chain = v.chain(false);
    let phases = vec![
        Phase {
            name: "X falls (A low)",
            rate: [Box::new(move |x| -x / v.res(x) / c(x)), zero()],
            end: End::Threshold { node: 0, level: vt, rising: false, cmp: zero(), chain },
            jump: Some(Box::new(move |[x, y]| [x - kick(x), y])),
            no_early_trip: None,
            rest: None,
        },
        Phase {
            name: "X rises (A high)",
            rate: [Box::new(move |x| (vdd - x) / v.res(vdd - x) / c(x)), zero()],
            end: End::Threshold { node: 0, level: vt, rising: true, cmp: zero(), chain },
            jump: Some(Box::new(move |[x, y]| [x + kick(x), y])),
            no_early_trip: None,
            rest: None,
        },
    ];
    Ok(Circuit { phases, start: [vdd, 0.0], nodes: 1, node_names: ["X", ""], rails: None, duty_phase: 0 })
}

/// Charge-and-reset oscillator. Start: the node at the reset level, charging.
fn reset_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let o = v.o;
    let vl = reset::v_reset(o);
    let vref = o.params.get("v_hi") + v.vos_hi();
    if vref <= vl {
        return Err(format!("osc(\"reset\"): the threshold with offset, {vref:.4} V, is not above the reset level {vl} V"));
    }
    let c = move |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x);
    let (t_reset, r_reset) = if v.on(Parasitic::Reset) { (v.p("t_reset"), o.parts.r_reset) } else { (0.0, 0.0) };
    // An ideal switch sets the node to the reset level at once and holds it there; a resistive
    // one discharges it while the source keeps feeding it: C·dV/dt = I(V) − (V − V_reset)/R.
    let during: F<'a> = if r_reset > 0.0 { Box::new(move |x| (v.i_ch(x) - (x - vl) / r_reset) / c(x)) } else { zero() };
    let phases = vec![
        Phase {
            name: "charge",
            rate: [Box::new(move |x| v.i_ch(x) / c(x)), zero()],
            end: End::Threshold { node: 0, level: vref, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain: v.chain(false) },
            jump: if r_reset > 0.0 { None } else { Some(Box::new(move |[_, y]| [vl, y])) },
            no_early_trip: Some("osc(\"reset\"): the charge phase starts at or above its threshold: the reset pulse is too short or its switch too weak (or the start voltage v0 is above the threshold)"),
            rest: None,
        },
        Phase { name: "reset", rate: [during, zero()], end: End::Timed(t_reset), jump: None, no_early_trip: None, rest: None },
    ];
    Ok(Circuit { phases, start: [vl, 0.0], nodes: 1, node_names: ["node", ""], rails: Some((0.0, v.env.vdd)), duty_phase: 1 })
}

/// Ping-pong oscillator, capacitors A (node 0) and B (node 1). Start: both at the reset level,
/// A charging.
fn pingpong_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let o = v.o;
    let vl = reset::v_reset(o);
    let vref = o.params.get("v_hi") + v.vos_hi();
    if vref <= vl {
        return Err(format!("osc(\"pingpong\"): the threshold with offset, {vref:.4} V, is not above the reset level {vl} V"));
    }
    let scale_b = if v.on(Parasitic::CapMismatch) { 1.0 + v.p("c_mismatch") } else { 1.0 };
    // The active capacitor carries the comparator input; the idle one only its switches.
    let ca = move |x: f64| v.cap(x) + v.node(x) + v.cin_hi(x);
    let cb = move |x: f64| v.cap(x) * scale_b + v.node(x) + v.cin_hi(x);
    let ca_idle = move |x: f64| v.cap(x) + v.node(x);
    let cb_idle = move |x: f64| v.cap(x) * scale_b + v.node(x);
    let r = if v.on(Parasitic::Reset) { o.parts.r_reset } else { 0.0 };
    let chain = v.chain(true);
    let phases = vec![
        Phase {
            name: "capacitor A",
            rate: [Box::new(move |x| v.i_ch(x) / ca(x)), idle(r, vl, cb_idle)],
            end: End::Threshold { node: 0, level: vref, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain },
            jump: if r > 0.0 { None } else { Some(Box::new(move |[_, b]| [vl, b])) },
            no_early_trip: None,
            rest: if r > 0.0 { Some((1, vl)) } else { None },
        },
        Phase {
            name: "capacitor B",
            rate: [idle(r, vl, ca_idle), Box::new(move |x| v.i_ch(x) / cb(x))],
            end: End::Threshold { node: 1, level: vref, rising: true, cmp: Box::new(move |s| v.delay_hi(s)), chain },
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
