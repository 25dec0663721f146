//! Each topology as time-domain phases: the node equations dV/dt = I(V)/C(V) of every phase,
//! what ends the phase (a comparator threshold, or a timed pulse), and what the switch action
//! does to the nodes (the capacitive kick of the RC inverter pair, an ideal reset). The parts
//! and parasitics are those of the period model, read through the same masked `View`.
use super::stepper::{Rates, State};
use crate::timing::keys::Kind;
use crate::timing::osc::View;
use crate::timing::topology::{NodeFn, pingpong, rc_inverter, reset, two_level};

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

/// `f(x)/c(x)`: the rate of change of a node, V/s.
fn rate<'a>(f: &NodeFn<'a>, c: &NodeFn<'a>) -> F<'a> {
    let (f, c) = (f.clone(), c.clone());
    Box::new(move |x| f(x) / c(x))
}

/// Window and Schmitt oscillators. Start: the node at the low threshold (with offset), charging.
fn two_level_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = two_level::node(v)?;
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

/// Two-inverter RC astable, node X (input of the first inverter). Start: the timing capacitor
/// discharged with B high, so X = vdd, falling.
fn rc_inverter_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = rc_inverter::node(v)?;
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

/// Charge-and-reset oscillator. Start: the node at the reset level, charging.
fn reset_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = reset::node(v)?;
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

/// Ping-pong oscillator, capacitors A (node 0) and B (node 1). Start: both at the reset level,
/// A charging.
fn pingpong_circuit<'a>(v: &'a View<'_>) -> Result<Circuit<'a>, String> {
    let n = pingpong::node(v)?;
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
