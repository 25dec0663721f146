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

use super::value::{R, err, lift};
use rhai::{Array, Dynamic, Engine, Map};

use super::session::Shared;
use super::value::to_f64;
use crate::num::Series;
use crate::physics::comparator::PairDesign;
use crate::physics::constants::check_temp;
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;

/// A finite number argument, named in the error.
fn num(v: &Dynamic, what: &str) -> R<f64> {
    let x = to_f64(v).map_err(|_| format!("{what} must be a number, found {}", v.type_name()))?;
    if !x.is_finite() {
        return err(format!("{what} must be finite, got {x}"));
    }
    Ok(x)
}

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

/// Strict reading of an option map: unknown keys are errors naming the function.
struct Opts<'a> {
    m: &'a Map,
    f: &'static str,
    used: Vec<&'static str>,
}

impl<'a> Opts<'a> {
    fn new(m: &'a Map, f: &'static str) -> Self {
        Opts { m, f, used: Vec::new() }
    }
    fn get(&mut self, key: &'static str) -> Option<&'a Dynamic> {
        self.used.push(key);
        self.m.get(key)
    }
    fn req(&mut self, key: &'static str) -> R<f64> {
        let f = self.f;
        match self.get(key) {
            Some(v) => num(v, &format!("{f}: key '{key}'")),
            None => err(format!("{f}: key '{key}' is required")),
        }
    }
    fn or(&mut self, key: &'static str, default: f64) -> R<f64> {
        let f = self.f;
        match self.get(key) {
            Some(v) => num(v, &format!("{f}: key '{key}'")),
            None => Ok(default),
        }
    }
    fn text(&mut self, key: &'static str, default: &str) -> R<String> {
        let f = self.f;
        match self.get(key) {
            None => Ok(default.to_string()),
            Some(v) => {
                v.clone().into_string().map_err(|t| format!("{f}: key '{key}' must be a string, found {t}").into())
            }
        }
    }
    fn finish(&self) -> R<()> {
        for k in self.m.keys() {
            if !self.used.contains(&k.as_str()) {
                return err(format!("{}: unknown key '{k}'; known keys: {}", self.f, self.used.join(", ")));
            }
        }
        Ok(())
    }
}

/// A comparator design from an option map; `sized` false when the caller sets W and L itself.
fn pair_design(o: &mut Opts, p: &Process, sized: bool) -> R<PairDesign> {
    let kind = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("{}: key 'type': {e}", o.f)))?;
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
