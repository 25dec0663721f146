//! Oscillators whose parts are devices of a process (physics models): the timing capacitor of
//! a process capacitor type, current mirrors, switches, input-pair comparators, and the CMOS
//! Schmitt trigger's thresholds from the process threshold voltages. Which devices a topology
//! uses is its own `Topology::process_parts`, built from the helpers of `Devices`.
use std::sync::Arc;

use super::env::Env;
use super::keys::{Kind, Mode, Params};
use super::osc::RefPoint;
use super::osc::{Origin, Osc};
use super::parasitic::Parasitic;
use super::parts::{ComparatorPart, MirrorSource, Parts, SwitchSet};
use super::process_refs::{CurrentChoice, ProcRefs, ThresholdChoice};
use super::reference::Reference;
use crate::physics::capacitor::Capacitor;
use crate::physics::comparator::{Comparator, PairDesign};
use crate::physics::mirror::{Mirror, MirrorKind};
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;
use crate::physics::switch::{Switch, SwitchKind};

/// Choices that are names rather than numbers.
#[derive(Clone, Debug)]
pub struct Choices {
    /// Process capacitor type of the timing capacitor (e.g. "mim").
    pub cap_type: String,
    pub mirror: MirrorKind,
    /// Process resistor layer of the timing resistor (RC kinds, e.g. "rpoly").
    pub res_type: String,
}

/// Wide-swing cascode bias margin above Vdsat, V (common practice: about 0.1 V).
const WIDE_SWING_MARGIN: f64 = 0.1;

pub struct ProcessOrigin {
    pub process: Process,
    pub choices: Choices,
    /// References made of the process's devices (`reference:`, `thresholds:` of osc_from).
    pub refs: ProcRefs,
}

/// An oscillator of `kind` built from `process`; `pairs` as for `osc`, with device sizes.
/// The supply and temperature default to those of the process object.
pub fn osc_from(process: &Process, kind: Kind, choices: Choices, pairs: &[(String, f64)]) -> Result<Osc, String> {
    osc_from_with(process, kind, choices, pairs, &[])
}

/// As `osc_from`, some keys given as references.
pub fn osc_from_with(
    process: &Process,
    kind: Kind,
    choices: Choices,
    pairs: &[(String, f64)],
    refs: &[(String, Reference)],
) -> Result<Osc, String> {
    osc_from_refs(process, kind, choices, pairs, refs, None, None)
}

/// As `osc_from_with`, with a current reference and a threshold generator made of the
/// process's devices.
pub fn osc_from_refs(
    process: &Process,
    kind: Kind,
    choices: Choices,
    pairs: &[(String, f64)],
    refs: &[(String, Reference)],
    current: Option<CurrentChoice>,
    thresholds: Option<ThresholdChoice>,
) -> Result<Osc, String> {
    process.capacitor(&choices.cap_type)?;
    kind.topology().check_choices(process, &choices)?;
    let mut pairs = pairs.to_vec();
    if !pairs.iter().any(|(k, _)| k == "vdd") {
        pairs.push(("vdd".into(), process.vdd));
    }
    if !pairs.iter().any(|(k, _)| k == "temp") {
        pairs.push(("temp".into(), process.temp));
    }
    let what = |e: String| format!("{}: {e}", kind.caller(Mode::Process));
    if let Some(
        CurrentChoice::Ptat { res_type }
        | CurrentChoice::Ctat { res_type }
        | CurrentChoice::Mix { res_type, .. }
        | CurrentChoice::ConstantGm { res_type, .. },
    ) = &current
    {
        process.resistor(res_type).map_err(what)?;
    }
    let vdd = pairs.iter().find(|(k, _)| k == "vdd").map_or(process.vdd, |(_, v)| *v);
    // The nominal point is the process as given (a corner applied to it is its nominal).
    let prefs = ProcRefs::pinned(current, thresholds, process, vdd).map_err(what)?;
    Osc::from_origin_with(
        kind,
        &pairs,
        refs,
        Arc::new(ProcessOrigin { process: process.clone(), choices, refs: prefs }),
    )
}

impl ProcessOrigin {
    /// Name of the process as passed in: its applied corner, or "nominal".
    fn as_given(&self) -> &str {
        if self.process.corner.is_empty() { "nominal" } else { &self.process.corner }
    }

    fn at(&self, p: &Params, corner: &str) -> Result<Process, String> {
        let pr = if corner == self.as_given() { self.process.clone() } else { self.process.at_corner(corner)? };
        pr.with_temp(p.get("temp"))?.with_vdd(p.get("vdd"))
    }
}

impl Origin for ProcessOrigin {
    fn name(&self) -> String {
        format!("process {}", self.process.name)
    }
    fn mode(&self) -> Mode {
        Mode::Process
    }
    fn corners(&self) -> Vec<String> {
        let mut v = vec![self.as_given().to_string()];
        if self.process.corner.is_empty() {
            v.extend(self.process.corner_names());
        }
        v
    }
    fn corner_point(&self, corner: &str) -> Option<(f64, f64)> {
        let c = self.process.corners.get(corner)?;
        (c.temp != self.process.tnom || c.vdd != self.process.vdd).then_some((c.temp, c.vdd))
    }
    fn inherent(&self, p: &Params) -> Vec<Parasitic> {
        let mut v = p.kind.topology().inherent(&self.process, &self.choices);
        if self.refs.current.is_some() {
            v.push(Parasitic::CurrentRef);
        }
        if self.refs.thresholds.is_some() {
            v.push(Parasitic::ThresholdRef);
        }
        v
    }
    fn references(&self, p: &Params, env: &Env) -> Result<RefPoint, String> {
        let mut r = RefPoint::of_keys(p, env)?;
        if self.refs.current.is_some() && p.reference("i").is_some() {
            return Err("key 'i' holds a reference and 'reference' names another: give one of them".into());
        }
        if self.refs.thresholds.is_some() && (p.reference("v_lo").is_some() || p.reference("v_hi").is_some()) {
            return Err("a threshold key holds a reference and 'thresholds' names another: give one of them".into());
        }
        let pr = self.at(p, &env.corner)?;
        let key = |k: &str| if p.has(k) { p.get(k) } else { f64::NAN };
        self.refs.apply(&mut r, &pr, env, key("v_lo"), key("v_hi"))?;
        Ok(r)
    }
    fn on_process(&self, p: &Process) -> Result<Arc<dyn Origin>, String> {
        Ok(Arc::new(ProcessOrigin { process: p.clone(), choices: self.choices.clone(), refs: self.refs.clone() }))
    }

    fn build(&self, p: &Params, corner: &str) -> Result<Parts, String> {
        let pr = self.at(p, corner)?;
        let ct = pr.capacitor(&self.choices.cap_type)?;
        let cap = Capacitor::new(p.get("c") * pr.cap_scale, ct.vc1, ct.vc2, ct.tc1, ct.tc2, pr.tnom)
            .map_err(|e| format!("osc_from(\"{}\"): capacitor: {e}", p.kind.name()))?;
        p.kind.topology().process_parts(&Devices { pr: &pr, p, choices: &self.choices, cap })
    }
}

/// Parasitics a current-source topology built from a process carries: the switch junctions,
/// the mirrors' output characteristic, the capacitor's voltage coefficient if the process
/// capacitor type has one, and the topology's own `more`.
pub fn current_source_inherent(process: &Process, choices: &Choices, more: &[Parasitic]) -> Vec<Parasitic> {
    let ct = process.capacitor(&choices.cap_type).ok();
    let mut v = vec![Parasitic::SwitchCap, Parasitic::MirrorRout];
    if ct.is_some_and(|c| c.vc1 != 0.0 || c.vc2 != 0.0) {
        v.push(Parasitic::CapVc);
    }
    v.extend_from_slice(more);
    v
}

/// What a topology builds its process parts from: the process at the operating point (corner,
/// temperature, supply), the checked keys, the name choices and the timing capacitor.
pub struct Devices<'a> {
    pub pr: &'a Process,
    pub p: &'a Params,
    pub choices: &'a Choices,
    pub cap: Capacitor,
}

impl Devices<'_> {
    /// An error of one part, as `osc_from("kind"): part: message`.
    pub fn what(&self, e: String, part: &str) -> String {
        format!("osc_from(\"{}\"): {part}: {e}", self.p.kind.name())
    }

    /// The reset level: `v_lo` if given, else ground.
    pub fn v_lo(&self) -> f64 {
        if self.p.has("v_lo") { self.p.get("v_lo") } else { 0.0 }
    }

    /// Charging (PMOS) and discharging (NMOS, times 1 + i_mismatch) mirror outputs of the
    /// reference current `i`.
    pub fn mirrors(&self) -> Result<(MirrorSource, MirrorSource), String> {
        let (p, pr) = (self.p, self.pr);
        let i = p.get("i");
        let (mw, ml) = (p.get("mirror_w"), p.get("mirror_l"));
        let margin = if self.choices.mirror == MirrorKind::WideSwing { WIDE_SWING_MARGIN } else { 0.0 };
        let mirror = |t: MosType| {
            Mirror::from_process(pr, self.choices.mirror, t, i, 1.0, mw, ml, margin).map_err(|e| self.what(e, "mirror"))
        };
        let charge = MirrorSource { mirror: mirror(MosType::P)?, nominal: i };
        let discharge = MirrorSource { mirror: mirror(MosType::N)?, nominal: i * (1.0 + p.get("i_mismatch")) };
        Ok((charge, discharge))
    }

    /// The NMOS switch (sw_w × sw_l) and the PMOS switch (twice as wide) on the node.
    pub fn switches(&self) -> Result<(Switch, Switch), String> {
        let (sw, sl) = (self.p.get("sw_w"), self.p.get("sw_l"));
        let nsw = Switch::from_process(self.pr, SwitchKind::N, sw, sw, sl).map_err(|e| self.what(e, "switch"))?;
        let psw =
            Switch::from_process(self.pr, SwitchKind::P, 2.0 * sw, 2.0 * sw, sl).map_err(|e| self.what(e, "switch"))?;
        Ok((nsw, psw))
    }

    /// An input-pair comparator at common mode `v_cm` with the offset key `vos`.
    pub fn pair(&self, v_cm: f64, vos: &str) -> Result<Arc<dyn ComparatorPart>, String> {
        let (p, pr) = (self.p, self.pr);
        let v_swing = if p.has("cmp_vsw") { p.get("cmp_vsw") } else { 0.5 * pr.vdd };
        // An NMOS pair needs its common mode above mid-supply's headroom, a PMOS pair below.
        let t = if v_cm > 0.5 * pr.vdd { MosType::N } else { MosType::P };
        let d = PairDesign {
            kind: t,
            w: p.get("cmp_w"),
            l: p.get("cmp_l"),
            i_tail: p.get("cmp_itail"),
            c_load: p.get("cmp_cload"),
            tail_w: p.get("mirror_w"),
            tail_l: p.get("mirror_l"),
            v_cm,
            v_swing,
            t0: p.get("t_cmp"),
            offset: p.get(vos),
            hyst: 0.0,
        };
        Ok(Arc::new(Comparator::from_pair(pr, &d).map_err(|e| self.what(e, "comparator"))?))
    }

    /// The parts of a current-source topology.
    pub fn current_parts(
        &self,
        (charge, discharge): (MirrorSource, MirrorSource),
        node: SwitchSet,
        r_reset: f64,
        (cmp_hi, cmp_lo): (Arc<dyn ComparatorPart>, Arc<dyn ComparatorPart>),
        levels: Option<(f64, f64)>,
    ) -> Parts {
        Parts {
            cap: Arc::new(self.cap.clone()),
            node: Arc::new(node),
            charge: Arc::new(charge),
            discharge: Arc::new(discharge),
            cmp_hi,
            cmp_lo,
            r_reset,
            levels,
            res: None,
            v_th: None,
        }
    }
}
