//! An oscillator: kind, checked parameters, parts, operating point; its ideal and real period.
use std::sync::Arc;

use super::env::Env;
use super::keys::{Kind, Mode, Params};
use super::parasitic::{Mask, Parasitic};
use super::parts::Parts;
use super::reference::Reference;
use crate::physics::process::Process;

/// Where the parts come from: explicit numbers, or the devices of a process.
pub trait Origin: Send + Sync {
    /// What the parts are made of ("explicit numbers", or the process name).
    fn name(&self) -> String;
    fn mode(&self) -> Mode;
    /// The parts for these parameters at this corner.
    fn build(&self, p: &Params, corner: &str) -> Result<Parts, String>;
    /// Corners known; the first is the default.
    fn corners(&self) -> Vec<String>;
    /// Temperature (°C) and supply (V) a corner itself fixes, if any.
    fn corner_point(&self, corner: &str) -> Option<(f64, f64)>;
    /// Parasitics the parts carry whatever the keys say (physics-model parts).
    fn inherent(&self, p: &Params) -> Vec<Parasitic>;
    /// The same origin on another process (the same name choices), if it has a process.
    fn on_process(&self, p: &Process) -> Result<Arc<dyn Origin>, String>;
    /// The references at this operating point (default: the keys given as references).
    fn references(&self, p: &Params, env: &Env) -> Result<RefPoint, String> {
        RefPoint::of_keys(p, env)
    }
}

/// The references of an oscillator at its operating point: the factor on the charging and
/// discharging currents (the current reference's value over its nominal) and each threshold's
/// shift from its nominal value, V. All neutral for keys given as plain numbers.
#[derive(Clone, Debug, PartialEq)]
pub struct RefPoint {
    pub i_factor: f64,
    pub shift_lo: f64,
    pub shift_hi: f64,
    /// What each reference is, for descriptions: (key, description).
    pub names: Vec<(&'static str, String)>,
}

impl RefPoint {
    /// Every reference ideal.
    pub fn ideal() -> RefPoint {
        RefPoint { i_factor: 1.0, shift_lo: 0.0, shift_hi: 0.0, names: Vec::new() }
    }

    /// From the keys of `p` that hold references, at `env`.
    pub fn of_keys(p: &Params, env: &Env) -> Result<RefPoint, String> {
        let mut r = RefPoint::ideal();
        for (k, rf) in p.references() {
            r.apply(k, rf, env)?;
        }
        Ok(r)
    }

    /// Take key `k`'s reference `rf` into account at `env`.
    pub fn apply(&mut self, k: &'static str, rf: &Reference, env: &Env) -> Result<(), String> {
        let (nom, real) = (rf.nominal(), rf.at(env.temp_c, env.vdd));
        if !real.is_finite() {
            return Err(format!(
                "the reference of '{k}', {}, gives no value at {} °C, {} V",
                rf.describe(),
                env.temp_c,
                env.vdd
            ));
        }
        match k {
            "i" => {
                if real <= 0.0 {
                    return Err(format!(
                        "the current reference {} gives {} at {} °C: it has stopped (no positive current)",
                        rf.describe(),
                        crate::num::si::eng_exact(real, "A").trim_end(),
                        env.temp_c
                    ));
                }
                self.i_factor = real / nom;
            }
            "v_lo" => self.shift_lo = real - nom,
            "v_hi" => self.shift_hi = real - nom,
            _ => return Err(format!("internal: key '{k}' cannot hold a reference")),
        }
        self.names.push((k, rf.describe()));
        Ok(())
    }
}

struct Explicit;

impl Origin for Explicit {
    fn name(&self) -> String {
        "explicit numbers".into()
    }
    fn mode(&self) -> Mode {
        Mode::Explicit
    }
    fn build(&self, p: &Params, _corner: &str) -> Result<Parts, String> {
        p.kind.topology().explicit_parts(p)
    }
    fn corners(&self) -> Vec<String> {
        vec!["typical".into()]
    }
    fn corner_point(&self, _corner: &str) -> Option<(f64, f64)> {
        None
    }
    fn inherent(&self, _p: &Params) -> Vec<Parasitic> {
        vec![]
    }
    fn on_process(&self, _p: &Process) -> Result<Arc<dyn Origin>, String> {
        Err("this oscillator is made of explicit numbers, not of a process's devices; use osc_from".into())
    }
}

#[derive(Clone)]
pub struct Osc {
    pub params: Params,
    pub env: Env,
    pub parts: Parts,
    origin: Arc<dyn Origin>,
    /// Parasitics the parts carry whatever the keys say (physics-model parts).
    pub inherent: Vec<Parasitic>,
    /// Parasitics present (given a non-ideal value, or inherent), fixed at assembly: the masked
    /// accessors of `View` consult it on every evaluation of the node equations.
    present: Mask,
    /// The references at the operating point.
    pub refs: RefPoint,
}

impl std::fmt::Debug for Osc {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "Osc({}, {:?}, {:?}, {})", self.kind().name(), self.params, self.env, self.origin.name())
    }
}

/// One ramp of a cycle and the delay chain that ends it.
#[derive(Clone, Debug, PartialEq)]
pub struct PhaseTiming {
    pub name: &'static str,
    /// Node voltage at the start of the ramp, V.
    pub v_start: f64,
    /// Effective threshold (with offset), V.
    pub v_threshold: f64,
    /// Node voltage when the current turns over (threshold plus overshoot), V.
    pub v_end: f64,
    /// Ramp time to the threshold, s.
    pub ramp: f64,
    /// Delay chain after the crossing (comparator at the actual slope, latch, logic, switch;
    /// reset pulse for the reset kind), s.
    pub delay: f64,
    /// Node slope at the threshold, V/s.
    pub slope: f64,
}

/// A whole cycle in periodic steady state.
#[derive(Clone, Debug, PartialEq)]
pub struct Cycle {
    pub period: f64,
    /// Fraction of the period in the first phase (charging; cap A for ping-pong; the reset
    /// pulse for the reset kind).
    pub duty: f64,
    /// Highest and lowest node voltage over the cycle, V.
    pub v_peak: f64,
    pub v_valley: f64,
    /// Largest excursion beyond a threshold caused by the delay chain, V.
    pub overshoot: f64,
    pub phases: Vec<PhaseTiming>,
    /// Cycles iterated to reach the periodic steady state.
    pub iterations: usize,
}

impl Cycle {
    pub fn frequency(&self) -> f64 {
        1.0 / self.period
    }
}

impl Osc {
    /// An oscillator from explicit numbers.
    pub fn new(kind: Kind, pairs: &[(String, f64)]) -> Result<Osc, String> {
        Osc::from_origin(kind, pairs, Arc::new(Explicit))
    }

    /// An oscillator from explicit numbers, some keys given as references.
    pub fn new_with(kind: Kind, pairs: &[(String, f64)], refs: &[(String, Reference)]) -> Result<Osc, String> {
        Osc::from_origin_with(kind, pairs, refs, Arc::new(Explicit))
    }

    /// As `from_origin`, some keys given as references.
    pub fn from_origin_with(
        kind: Kind,
        pairs: &[(String, f64)],
        refs: &[(String, Reference)],
        origin: Arc<dyn Origin>,
    ) -> Result<Osc, String> {
        let params = Params::with_references(kind, origin.mode(), pairs, refs)?;
        let corner = origin.corners().first().cloned().unwrap_or_else(|| "typical".into());
        Osc::assemble(params, corner, origin)
    }

    /// An oscillator whose parts come from `origin` (e.g. physics models of a process).
    pub fn from_origin(kind: Kind, pairs: &[(String, f64)], origin: Arc<dyn Origin>) -> Result<Osc, String> {
        let params = Params::new_in(kind, origin.mode(), pairs)?;
        let corner = origin.corners().first().cloned().unwrap_or_else(|| "typical".into());
        Osc::assemble(params, corner, origin)
    }

    fn assemble(params: Params, corner: String, origin: Arc<dyn Origin>) -> Result<Osc, String> {
        let parts = origin.build(&params, &corner)?;
        let env = Env { temp_c: params.get("temp"), vdd: params.get("vdd"), corner };
        let inherent = origin.inherent(&params);
        let refs = origin.references(&params, &env).map_err(|e| format!("{}: {e}", params.kind.caller(params.mode)))?;
        let present = super::parasitic::ALL
            .iter()
            .filter(|p| params.sets(**p) || inherent.contains(p))
            .fold(Mask::NONE, |m, p| m.with(*p));
        let o = Osc { params, env, parts, origin, inherent, present, refs };
        o.check().map_err(|e| format!("{}: {e}", o.caller()))?;
        Ok(o)
    }

    pub fn kind(&self) -> Kind {
        self.params.kind
    }

    /// What the parts are made of.
    pub fn origin(&self) -> String {
        self.origin.name()
    }

    /// Corners this oscillator can be evaluated at.
    pub fn corners(&self) -> Vec<String> {
        self.origin.corners()
    }

    /// Temperature (°C) and supply (V) a corner fixes itself, if it does (a combined corner
    /// such as a slow-hot-low one).
    pub fn corner_point(&self, corner: &str) -> Option<(f64, f64)> {
        self.origin.corner_point(corner)
    }

    /// The same oscillator with some keys changed.
    pub fn with(&self, pairs: &[(String, f64)]) -> Result<Osc, String> {
        Osc::assemble(self.params.with(pairs)?, self.env.corner.clone(), self.origin.clone())
    }

    /// The same oscillator with some keys changed, some given new references.
    pub fn with_all(&self, pairs: &[(String, f64)], refs: &[(String, Reference)]) -> Result<Osc, String> {
        Osc::assemble(self.params.with_all(pairs, refs)?, self.env.corner.clone(), self.origin.clone())
    }

    /// The same oscillator (kind, keys, name choices, corner) rebuilt on another process, e.g.
    /// one whose parameters a Monte Carlo draw has moved.
    pub fn on_process(&self, p: &Process) -> Result<Osc, String> {
        let origin = self.origin.on_process(p).map_err(|e| format!("{}: {e}", self.caller()))?;
        let known = origin.corners();
        let corner = match known.first() {
            Some(first) if !known.contains(&self.env.corner) => first.clone(),
            _ => self.env.corner.clone(),
        };
        Osc::assemble(self.params.clone(), corner, origin)
    }

    /// The same oscillator at another temperature (°C), supply (V) and/or corner. A corner that
    /// fixes its own temperature and supply brings them along unless they are given here.
    pub fn at(&self, temp: Option<f64>, vdd: Option<f64>, corner: Option<&str>) -> Result<Osc, String> {
        let mut corner_name = self.env.corner.clone();
        let (mut temp, mut vdd) = (temp, vdd);
        if let Some(c) = corner {
            let known = self.origin.corners();
            if !known.iter().any(|k| k == c) {
                return Err(format!(
                    "corner '{c}' is not known to this oscillator (parts from {}); known corners: {}",
                    self.origin.name(),
                    known.join(", ")
                ));
            }
            if let Some((t, v)) = self.origin.corner_point(c) {
                temp = temp.or(Some(t));
                vdd = vdd.or(Some(v));
            }
            corner_name = c.to_string();
        }
        let mut pairs = Vec::new();
        if let Some(t) = temp {
            pairs.push(("temp".to_string(), t));
        }
        if let Some(v) = vdd {
            pairs.push(("vdd".to_string(), v));
        }
        Osc::assemble(self.params.with(&pairs)?, corner_name, self.origin.clone())
    }

    /// Parasitics present in this oscillator (given a non-ideal value, or inherent to its parts),
    /// in build-up order.
    pub fn active(&self) -> Vec<Parasitic> {
        self.kind().parasitics().into_iter().filter(|p| self.params.sets(*p) || self.inherent.contains(p)).collect()
    }

    /// The textbook period of the topology from its basic keys.
    pub fn ideal_period(&self) -> Result<f64, String> {
        self.kind().topology().ideal_period(self).map_err(|e| format!("{}: {e}", self.caller()))
    }

    /// The cycle in periodic steady state with the parasitics of `mask` switched on.
    pub fn cycle(&self, mask: Mask) -> Result<Cycle, String> {
        let c =
            self.kind().topology().cycle(&View { o: self, m: mask, env: &self.env }).map_err(|e| self.explain(e))?;
        if !(c.period > 0.0 && c.period.is_finite()) {
            return Err(format!("{}: the period came out as {} s", self.caller(), c.period));
        }
        Ok(c)
    }

    /// How a script names this oscillator in messages: `osc("window")` or `osc_from("window")`.
    pub fn caller(&self) -> String {
        self.kind().caller(self.params.mode)
    }

    /// A model error as the user should read it: which oscillator, and for a ramp that never
    /// reaches its threshold, the keys that shape the current into the node.
    fn explain(&self, e: String) -> String {
        let mut msg = format!("{}: {e}", self.caller());
        if e.contains("stops:") {
            let keys = self.params.given_in(&[Parasitic::MirrorRout, Parasitic::Mismatch, Parasitic::ResVc]);
            if !keys.is_empty() {
                msg.push_str(&format!("; the keys that shape that current are {}", keys.join(", ")));
            }
        }
        msg
    }

    /// The period with every parasitic, s.
    pub fn period(&self) -> Result<f64, String> {
        Ok(self.cycle(Mask::ALL)?.period)
    }

    /// Relations between keys that single-key ranges cannot check.
    fn check(&self) -> Result<(), String> {
        let p = &self.params;
        let vdd = self.env.vdd;
        if p.has("v_lo") || p.has("v_hi") {
            let (lo, hi) = (p.get("v_lo") + self.refs.shift_lo, p.get("v_hi") + self.refs.shift_hi);
            let lo = if lo.is_nan() { 0.0 } else { lo };
            if lo >= hi {
                return Err(format!("'v_lo' = {lo} V must be below 'v_hi' = {hi} V"));
            }
            if hi > vdd {
                return Err(format!("'v_hi' = {hi} V must not exceed 'vdd' = {vdd} V"));
            }
        }
        self.kind().topology().check(self)
    }
}

/// An oscillator seen through a mask: each accessor gives the real value when its parasitic is
/// on and the ideal one when it is off.
pub struct View<'a> {
    pub o: &'a Osc,
    pub m: Mask,
    pub env: &'a Env,
}

impl View<'_> {
    pub fn on(&self, p: Parasitic) -> bool {
        self.m.on(p) && self.o.present.on(p)
    }
    pub fn p(&self, key: &str) -> f64 {
        self.o.params.get(key)
    }
    /// Timing capacitor, F.
    pub fn cap(&self, v: f64) -> f64 {
        if self.on(Parasitic::CapVc) { self.o.parts.cap.at(v, self.env) } else { self.o.parts.cap.nominal(self.env) }
    }
    /// Switch capacitance on the node, F.
    pub fn node(&self, v: f64) -> f64 {
        if self.on(Parasitic::SwitchCap) { self.o.parts.node.at(v, self.env) } else { 0.0 }
    }
    pub fn cin_hi(&self, v: f64) -> f64 {
        if self.on(Parasitic::InputCap) { self.o.parts.cmp_hi.input_cap(v, self.env) } else { 0.0 }
    }
    pub fn cin_lo(&self, v: f64) -> f64 {
        if self.on(Parasitic::InputCap) { self.o.parts.cmp_lo.input_cap(v, self.env) } else { 0.0 }
    }
    /// The current reference's value over its nominal (1 with the reference ideal).
    pub fn i_ref(&self) -> f64 {
        if self.on(Parasitic::CurrentRef) { self.o.refs.i_factor } else { 1.0 }
    }
    /// A threshold's shift from its nominal value by its reference, V (0 with it ideal).
    pub fn ref_shift(&self, key: &str) -> f64 {
        if !self.on(Parasitic::ThresholdRef) {
            return 0.0;
        }
        match key {
            "v_lo" => self.o.refs.shift_lo,
            "v_hi" => self.o.refs.shift_hi,
            _ => 0.0,
        }
    }
    /// Charging current magnitude, A.
    pub fn i_ch(&self, v: f64) -> f64 {
        let s = &self.o.parts.charge;
        self.i_ref() * if self.on(Parasitic::MirrorRout) { s.at(v, self.env) } else { s.nominal(self.env) }
    }
    /// Discharging current magnitude, A; with the mismatch off it is scaled to the charging
    /// source's nominal current.
    pub fn i_dis(&self, v: f64) -> f64 {
        let s = &self.o.parts.discharge;
        let i = if self.on(Parasitic::MirrorRout) { s.at(v, self.env) } else { s.nominal(self.env) };
        self.i_ref()
            * if self.on(Parasitic::Mismatch) {
                i
            } else {
                i * self.o.parts.charge.nominal(self.env) / s.nominal(self.env)
            }
    }
    pub fn vos_hi(&self) -> f64 {
        if self.on(Parasitic::Offset) { self.o.parts.cmp_hi.offset(self.env) } else { 0.0 }
    }
    pub fn vos_lo(&self) -> f64 {
        if self.on(Parasitic::Offset) { self.o.parts.cmp_lo.offset(self.env) } else { 0.0 }
    }
    pub fn delay_hi(&self, slope: f64) -> f64 {
        if self.on(Parasitic::CmpDelay) { self.o.parts.cmp_hi.delay(slope, self.env) } else { 0.0 }
    }
    pub fn delay_lo(&self, slope: f64) -> f64 {
        if self.on(Parasitic::CmpDelay) { self.o.parts.cmp_lo.delay(slope, self.env) } else { 0.0 }
    }
    /// Latch, logic and switch delay after the comparator, s.
    /// Timing resistance with `v` across it, Ω.
    pub fn res(&self, v: f64) -> f64 {
        match &self.o.parts.res {
            Some(r) => r.r(if self.on(Parasitic::ResVc) { v } else { 0.0 }, self.env.temp_c),
            None => f64::NAN,
        }
    }
    pub fn chain(&self, latch: bool) -> f64 {
        let mut t = 0.0;
        if self.on(Parasitic::LogicDelay) {
            t += self.p("t_logic") + if latch { self.p("t_latch") } else { 0.0 };
        }
        if self.on(Parasitic::SwitchDelay) {
            t += self.p("t_sw");
        }
        t
    }
}
