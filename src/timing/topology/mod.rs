//! The topologies: one trait (`Topology`) and one list of them (`ALL`). Each topology lives in
//! its own file: its keys, the required-key check, its parts, the ideal (textbook) period, the
//! cycle with parasitics and its transient circuit. Adding one is a new file plus one line in
//! the `topologies!` list below.
pub(crate) mod two_level;

use std::rc::Rc;

use super::from_process::{Choices, Devices};
use super::keys::Params;
use super::osc::{Cycle, Osc, PhaseTiming, View};
use super::parasitic::Parasitic;
use super::parts::Parts;
use super::ramp::{advance, ramp_time};
use super::transient::circuit::Circuit;
use crate::physics::process::Process;

/// One relaxation topology. Everything that differs between topologies is here; everything
/// else (key table, masks, steady state, transient integrator, budget) is shared.
pub trait Topology: Sync {
    /// Script-level name, as in `osc("window", ...)`.
    fn name(&self) -> &'static str;
    /// Keys of `osc(name, ...)`, basic keys first (each defined in `keys::KEYS`).
    fn keys(&self) -> &'static [&'static str];
    /// Numeric keys of `osc_from(process, name, ...)`; empty if it cannot be built from a process.
    fn process_keys(&self) -> &'static [&'static str];
    /// Required keys and keys that exclude each other (`c` is checked for every topology).
    fn check_required(&self, p: &Params) -> Result<(), String>;
    /// Relations between keys of an assembled oscillator that single-key ranges cannot check
    /// (the thresholds' order and the supply are checked for every topology).
    fn check(&self, _o: &Osc) -> Result<(), String> {
        Ok(())
    }
    /// The parts from explicit numbers.
    fn explicit_parts(&self, p: &Params) -> Result<Parts, String> {
        Parts::explicit(p, ("vos", "vos"), false)
    }
    /// Errors in the name choices of `osc_from` found before any key is read.
    fn check_choices(&self, _process: &Process, _choices: &Choices) -> Result<(), String> {
        Ok(())
    }
    /// The parts from the devices of a process.
    fn process_parts(&self, d: &Devices) -> Result<Parts, String>;
    /// Parasitics that process parts carry whatever the keys say.
    fn inherent(&self, process: &Process, choices: &Choices) -> Vec<Parasitic>;
    /// The textbook period from the basic keys, s.
    fn ideal_period(&self, o: &Osc) -> Result<f64, String>;
    /// The cycle in periodic steady state under the mask of `v`.
    fn cycle(&self, v: &View) -> Result<Cycle, String>;
    /// The time-domain phases for `o.simulate`, with the defined start (`Circuit::start`).
    fn circuit<'a>(&self, v: &'a View<'_>) -> Result<Circuit<'a>, String>;
}

/// The list of topologies: `module::Type` per line, in the order scripts see them listed.
macro_rules! topologies {
    ($($m:ident :: $t:ident),* $(,)?) => {
        $(pub(crate) mod $m;)*
        /// Every topology.
        pub static ALL: &[&dyn Topology] = &[$(&$m::$t),*];
    };
}

topologies! {
    rc_inverter::RcInverter,
    schmitt::Schmitt,
    window::Window,
    reset::Reset,
    pingpong::PingPong,
}

/// A function of a node voltage (F, A or V/s) under an oscillator's view. Each topology
/// defines its nodes once (`node` in its file); the period model and the transient
/// simulation both read them, so the two cannot disagree on what sits on a node.
pub(crate) type NodeFn<'a> = Rc<dyn Fn(f64) -> f64 + 'a>;

/// One ramp from `v0` toward threshold `vth` under signed current `i`, then the delay chain
/// (`delay(slope)` of the slope at the threshold) during which the ramp runs on: the overshoot.
/// A start already beyond the threshold trips at once.
pub(crate) fn ramp_phase<C, I, D>(
    name: &'static str,
    c: &C,
    i: &I,
    v0: f64,
    vth: f64,
    delay: &D,
) -> Result<PhaseTiming, String>
where
    C: Fn(f64) -> f64 + ?Sized,
    I: Fn(f64) -> f64 + ?Sized,
    D: Fn(f64) -> f64 + ?Sized,
{
    let past = is_past(i, v0, vth);
    let ramp = if past { 0.0 } else { ramp_time(c, i, v0, vth).map_err(|e| format!("{name}: {e}"))? };
    let e = overshoot(c, i, if past { v0 } else { vth }, delay)?;
    Ok(PhaseTiming { name, v_start: v0, v_threshold: vth, v_end: e.v_end, ramp, delay: e.delay, slope: e.slope })
}

/// Whether a ramp under `i` starting at `v0` is already beyond its threshold `vth`.
pub(crate) fn is_past<I: Fn(f64) -> f64 + ?Sized>(i: &I, v0: f64, vth: f64) -> bool {
    if i(v0) > 0.0 { v0 >= vth } else { v0 <= vth }
}

/// What the delay chain does after a crossing at `v_cross`: the slope there, the delay at that
/// slope, and where the node is when the current turns over.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Overshoot {
    pub slope: f64,
    pub delay: f64,
    pub v_end: f64,
}

pub(crate) fn overshoot<C, I, D>(c: &C, i: &I, v_cross: f64, delay: &D) -> Result<Overshoot, String>
where
    C: Fn(f64) -> f64 + ?Sized,
    I: Fn(f64) -> f64 + ?Sized,
    D: Fn(f64) -> f64 + ?Sized,
{
    let slope = i(v_cross) / c(v_cross);
    let d = delay(slope);
    Ok(Overshoot { slope, delay: d, v_end: advance(c, i, v_cross, d)? })
}

/// Error if a current-source node leaves the supply range (the sources would saturate there,
/// which the model does not describe).
pub(crate) fn check_rails(c: &Cycle, vdd: f64) -> Result<(), String> {
    if c.v_peak > vdd || c.v_valley < 0.0 {
        return Err(format!(
            "the node swings from {:.4} V to {:.4} V, outside the supply 0…{vdd} V: the current sources would saturate (the delay chain is too slow for this ramp, or the thresholds sit too close to a rail)",
            c.v_valley, c.v_peak
        ));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::super::keys::{Kind, def};
    use super::ALL;

    #[test]
    fn the_list_is_consistent() {
        // Every named constant is in the list (Kind::topology relies on it).
        for k in [Kind::RcInverter, Kind::Schmitt, Kind::Window, Kind::Reset, Kind::PingPong] {
            assert_eq!(k.topology().name(), k.name());
        }
        for (n, t) in ALL.iter().enumerate() {
            assert!(ALL[..n].iter().all(|u| u.name() != t.name()), "{} listed twice", t.name());
            for key in t.keys().iter().chain(t.process_keys()) {
                assert!(def(key).is_some(), "{}: key '{key}' is not in keys::KEYS", t.name());
            }
            assert_eq!(t.keys()[0], "c", "{}: 'c' comes first", t.name());
        }
    }
}
