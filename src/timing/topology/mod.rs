//! The five topologies: ideal (textbook) period and the cycle with parasitics.
pub(crate) mod pingpong;
pub(crate) mod rc_inverter;
pub(crate) mod reset;
pub(crate) mod two_level;

use std::rc::Rc;

use super::keys::Kind;
use super::osc::{Cycle, Osc, PhaseTiming, View};
use super::ramp::{advance, ramp_time};

/// A function of a node voltage (F, A or V/s) under an oscillator's view. Each topology
/// defines its nodes once (`node` in its file); the period model and the transient
/// simulation both read them, so the two cannot disagree on what sits on a node.
pub(crate) type NodeFn<'a> = Rc<dyn Fn(f64) -> f64 + 'a>;

pub fn ideal_period(o: &Osc) -> Result<f64, String> {
    match o.kind() {
        Kind::Window | Kind::Schmitt => two_level::ideal(o),
        Kind::RcInverter => rc_inverter::ideal(o),
        Kind::Reset => reset::ideal(o),
        Kind::PingPong => pingpong::ideal(o),
    }
}

pub fn cycle(v: &View) -> Result<Cycle, String> {
    match v.o.kind() {
        Kind::Window | Kind::Schmitt => two_level::cycle(v),
        Kind::RcInverter => rc_inverter::cycle(v),
        Kind::Reset => reset::cycle(v),
        Kind::PingPong => pingpong::cycle(v),
    }
}

/// One ramp from `v0` toward threshold `vth` under signed current `i`, then the delay chain
/// (`delay(slope)` of the slope at the threshold) during which the ramp runs on: the overshoot.
/// A start already beyond the threshold trips at once.
fn ramp_phase(
    name: &'static str,
    c: &dyn Fn(f64) -> f64,
    i: &dyn Fn(f64) -> f64,
    v0: f64,
    vth: f64,
    delay: &dyn Fn(f64) -> f64,
) -> Result<PhaseTiming, String> {
    let rising = i(v0) > 0.0;
    let past = if rising { v0 >= vth } else { v0 <= vth };
    let (ramp, v_cross) =
        if past { (0.0, v0) } else { (ramp_time(c, i, v0, vth).map_err(|e| format!("{name}: {e}"))?, vth) };
    let slope = i(v_cross) / c(v_cross);
    let d = delay(slope);
    let v_end = advance(c, i, v_cross, d)?;
    Ok(PhaseTiming { name, v_start: v0, v_threshold: vth, v_end, ramp, delay: d, slope })
}

/// Error if a current-source node leaves the supply range (the sources would saturate there,
/// which the model does not describe).
fn check_rails(c: &Cycle, vdd: f64) -> Result<(), String> {
    if c.v_peak > vdd || c.v_valley < 0.0 {
        return Err(format!(
            "the node swings from {:.4} V to {:.4} V, outside the supply 0…{vdd} V: the current sources would saturate (the delay chain is too slow for this ramp, or the thresholds sit too close to a rail)",
            c.v_valley, c.v_peak
        ));
    }
    Ok(())
}
