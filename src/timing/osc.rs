//! An oscillator: kind, checked parameters, parts, operating point; its ideal and real period.
use std::sync::Arc;

use super::env::Env;
use super::keys::{Kind, Params};
use super::parasitic::{Mask, Parasitic};
use super::parts::Parts;
use super::topology;

/// Builds the parts from the parameters (explicit numbers, or physics models of a process).
pub type Builder = Arc<dyn Fn(&Params) -> Result<Parts, String> + Send + Sync>;

#[derive(Clone)]
pub struct Osc {
    pub params: Params,
    pub env: Env,
    pub parts: Parts,
    builder: Builder,
    /// What the parts are made of ("explicit numbers", or the process name).
    pub origin: String,
    /// Parasitics the parts carry whatever the keys say (physics-model parts).
    pub inherent: Vec<Parasitic>,
    /// Corners the origin knows; an explicit-number oscillator knows only "typical".
    pub corners: Vec<String>,
}

impl std::fmt::Debug for Osc {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "Osc({}, {:?}, {:?}, {})", self.kind().name(), self.params, self.env, self.origin)
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
        let builder: Builder = Arc::new(|p: &Params| Ok(Parts::explicit(p)));
        Osc::with_builder(kind, pairs, builder, "explicit numbers".into(), vec![], vec!["typical".into()])
    }

    /// An oscillator whose parts come from `builder` (e.g. physics models of a process).
    pub fn with_builder(
        kind: Kind,
        pairs: &[(String, f64)],
        builder: Builder,
        origin: String,
        inherent: Vec<Parasitic>,
        corners: Vec<String>,
    ) -> Result<Osc, String> {
        let params = Params::new(kind, pairs)?;
        let parts = builder(&params)?;
        let env = Env { temp_c: params.get("temp"), vdd: params.get("vdd"), corner: corners.first().cloned().unwrap_or_else(|| "typical".into()) };
        let o = Osc { params, env, parts, builder, origin, inherent, corners };
        o.check()?;
        Ok(o)
    }

    pub fn kind(&self) -> Kind {
        self.params.kind
    }

    /// The same oscillator with some keys changed.
    pub fn with(&self, pairs: &[(String, f64)]) -> Result<Osc, String> {
        let params = self.params.with(pairs)?;
        let parts = (self.builder)(&params)?;
        let env = Env { temp_c: params.get("temp"), vdd: params.get("vdd"), corner: self.env.corner.clone() };
        let o = Osc { params, env, parts, ..self.clone() };
        o.check()?;
        Ok(o)
    }

    /// The same oscillator at another temperature (°C), supply (V) and/or corner.
    pub fn at(&self, temp: Option<f64>, vdd: Option<f64>, corner: Option<&str>) -> Result<Osc, String> {
        let mut pairs = Vec::new();
        if let Some(t) = temp {
            pairs.push(("temp".to_string(), t));
        }
        if let Some(v) = vdd {
            pairs.push(("vdd".to_string(), v));
        }
        let mut o = self.with(&pairs)?;
        if let Some(c) = corner {
            if !self.corners.iter().any(|k| k == c) {
                return Err(format!(
                    "corner '{c}' is not known to this oscillator (parts from {}); known corners: {}",
                    self.origin,
                    self.corners.join(", ")
                ));
            }
            o.env.corner = c.to_string();
        }
        Ok(o)
    }

    /// Parasitics present in this oscillator (given a non-ideal value, or inherent to its parts),
    /// in build-up order.
    pub fn active(&self) -> Vec<Parasitic> {
        self.kind().parasitics().into_iter().filter(|p| self.params.sets(*p) || self.inherent.contains(p)).collect()
    }

    /// The textbook period of the topology from its basic keys.
    pub fn ideal_period(&self) -> Result<f64, String> {
        topology::ideal_period(self)
    }

    /// The cycle in periodic steady state with the parasitics of `mask` switched on.
    pub fn cycle(&self, mask: Mask) -> Result<Cycle, String> {
        let c = topology::cycle(&View { o: self, m: mask, env: &self.env })?;
        if !(c.period > 0.0 && c.period.is_finite()) {
            return Err(format!("osc(\"{}\"): the period came out as {} s", self.kind().name(), c.period));
        }
        Ok(c)
    }

    /// The period with every parasitic, s.
    pub fn period(&self) -> Result<f64, String> {
        Ok(self.cycle(Mask::ALL)?.period)
    }

    /// Relations between keys that single-key ranges cannot check.
    fn check(&self) -> Result<(), String> {
        let p = &self.params;
        let kind = self.kind().name();
        let vdd = self.env.vdd;
        if p.has("v_lo") || p.has("v_hi") {
            let (lo, hi) = (p.get("v_lo"), p.get("v_hi"));
            let lo = if lo.is_nan() { 0.0 } else { lo };
            if lo >= hi {
                return Err(format!("osc(\"{kind}\"): 'v_lo' = {lo} V must be below 'v_hi' = {hi} V"));
            }
            if hi > vdd {
                return Err(format!("osc(\"{kind}\"): 'v_hi' = {hi} V must not exceed 'vdd' = {vdd} V"));
            }
        }
        if self.kind() == Kind::RcInverter && p.has("v_th") && p.get("v_th") >= vdd {
            return Err(format!("osc(\"{kind}\"): 'v_th' = {} V must lie in (0, vdd = {vdd} V)", p.get("v_th")));
        }
        if self.kind() == Kind::Reset && p.get("r_reset") > 0.0 && p.get("t_reset") == 0.0 {
            return Err(format!("osc(\"{kind}\"): 'r_reset' > 0 needs a reset pulse 't_reset' > 0 to discharge the capacitor"));
        }
        Ok(())
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
        self.m.on(p) && (self.o.params.sets(p) || self.o.inherent.contains(&p))
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
    /// Charging current magnitude, A.
    pub fn i_ch(&self, v: f64) -> f64 {
        let s = &self.o.parts.charge;
        if self.on(Parasitic::MirrorRout) { s.at(v, self.env) } else { s.nominal(self.env) }
    }
    /// Discharging current magnitude, A; with the mismatch off it is scaled to the charging
    /// source's nominal current.
    pub fn i_dis(&self, v: f64) -> f64 {
        let s = &self.o.parts.discharge;
        let i = if self.on(Parasitic::MirrorRout) { s.at(v, self.env) } else { s.nominal(self.env) };
        if self.on(Parasitic::Mismatch) { i } else { i * self.o.parts.charge.nominal(self.env) / s.nominal(self.env) }
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
