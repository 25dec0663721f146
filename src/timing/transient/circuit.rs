//! Each topology as time-domain phases: the node equations dV/dt = I(V)/C(V) of every phase,
//! what ends the phase (a comparator threshold, or a timed pulse), and what the switch action
//! does to the nodes (the capacitive kick of the RC inverter pair, an ideal reset). Each
//! topology builds its circuit (`Topology::circuit`, in its own file) from the same nodes and
//! masked `View` as its period model.
use super::stepper::{Rates, State};
use crate::timing::topology::NodeFn;

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

/// A node that does not move during a phase.
pub(crate) fn zero<'a>() -> F<'a> {
    Box::new(|_| 0.0)
}

/// `f(x)/c(x)`: the rate of change of a node, V/s.
pub(crate) fn rate<'a>(f: &NodeFn<'a>, c: &NodeFn<'a>) -> F<'a> {
    let (f, c) = (f.clone(), c.clone());
    Box::new(move |x| f(x) / c(x))
}
