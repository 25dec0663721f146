//! Registration of the physics layer: processes, transistors, switches, mirrors, comparators,
//! resistors and capacitors, as script objects with methods. Voltages V, currents A,
//! capacitances F, resistances Ω, times s, temperatures °C (`temp`). PMOS devices take
//! magnitudes (Vsg, Vsd) and give |Id|.
//!
//! Methods whose first argument is a voltage or current also accept a `Series` and then return
//! a `Series`, so a sweep is one native call.
mod comparator;
mod constants;
mod mirror;
mod mos;
mod passives;
mod process;
mod switch;

use super::args::{Opts, num};
use super::value::{R, err, lift};
use rhai::{Array, Dynamic, Engine};

use super::session::Shared;
use crate::num::Series;
use crate::physics::comparator::PairDesign;
use crate::physics::constants::check_temp;
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;

fn temp(v: &Dynamic, f: &str) -> R<f64> {
    lift(check_temp(num(v, &format!("{f}: temp"))?).map_err(|e| format!("{f}: {e}")))
}

/// A finite result, or an error naming the function (never NaN silently).
fn finite(x: f64, f: &str) -> R<f64> {
    if x.is_nan() { err(format!("{f}: the model gave no value (NaN) at these arguments")) } else { Ok(x) }
}

/// Apply `g` to a number or to every element of a Series.
fn each(x: &Dynamic, what: &str, f: &str, g: impl Fn(f64) -> R<f64>) -> R<Dynamic> {
    if let Some(s) = x.clone().try_cast::<Series>() {
        let mut out = Vec::with_capacity(s.len());
        for (k, &v) in s.as_slice().iter().enumerate() {
            if !v.is_finite() {
                return err(format!("{f}: {what}[{k}] must be finite, got {v}"));
            }
            out.push(g(v)?);
        }
        Ok(Dynamic::from(Series::from(out)))
    } else {
        Ok(Dynamic::from_float(g(num(x, &format!("{f}: {what}"))?)?))
    }
}

/// A comparator design from an option map; `sized` false when the caller sets W and L itself.
fn pair_design(o: &mut Opts, p: &Process, sized: bool) -> R<PairDesign> {
    let kind = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("{}: key 'type': {e}", o.name())))?;
    let (w, l) = if sized { (o.req("w")?, o.req("l")?) } else { (1e-6, 1e-6) };
    Ok(PairDesign {
        kind,
        w,
        l,
        i_tail: o.req("i_tail")?,
        c_load: o.req("c_load")?,
        tail_w: o.or("tail_w", 2e-6)?,
        tail_l: o.or("tail_l", 2e-6)?,
        v_cm: o.or("v_cm", 0.5 * p.vdd)?,
        v_swing: o.or("v_swing", 0.5 * p.vdd)?,
        t0: o.or("t0", 0.0)?,
        offset: o.or("offset", 0.0)?,
        hyst: o.or("hyst", 0.0)?,
    })
}

fn series_of(v: &Dynamic, what: &str) -> R<Series> {
    if let Some(s) = v.clone().try_cast::<Series>() {
        Ok(s)
    } else if let Some(a) = v.clone().try_cast::<Array>() {
        super::series_api::from_array(&a)
    } else {
        Ok(Series::from(vec![num(v, what)?]))
    }
}

pub fn register(engine: &mut Engine, session: &Shared) {
    constants::register(engine);
    process::register(engine, session);
    mos::register(engine);
    switch::register(engine);
    mirror::register(engine);
    comparator::register(engine);
    passives::register(engine);
}
