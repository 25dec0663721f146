//! Oscillators whose parts are devices of a process (physics models): the timing capacitor of
//! a process capacitor type, current mirrors, switches, input-pair comparators, and the CMOS
//! Schmitt trigger's thresholds from the process threshold voltages.
use std::sync::Arc;

use super::keys::{Kind, Mode, Params};
use super::osc::{Origin, Osc};
use super::parasitic::Parasitic;
use super::parts::{ComparatorPart, FixedComparator, MirrorSource, Parts, SwitchSet};
use super::thresholds::{inverter_vm, schmitt_cmos};
use crate::physics::capacitor::Capacitor;
use crate::physics::comparator::{Comparator, PairDesign};
use crate::physics::mirror::{Mirror, MirrorKind};
use crate::physics::mosfet::{Mos, MosType};
use crate::physics::process::Process;
use crate::physics::resistor::Resistor;
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
}

/// An oscillator of `kind` built from `process`; `pairs` as for `osc`, with device sizes.
/// The supply and temperature default to those of the process object.
pub fn osc_from(process: &Process, kind: Kind, choices: Choices, pairs: &[(String, f64)]) -> Result<Osc, String> {
    process.capacitor(&choices.cap_type)?;
    if kind == Kind::RcInverter {
        process.resistor(&choices.res_type)?;
    }
    let mut pairs = pairs.to_vec();
    if !pairs.iter().any(|(k, _)| k == "vdd") {
        pairs.push(("vdd".into(), process.vdd));
    }
    if !pairs.iter().any(|(k, _)| k == "temp") {
        pairs.push(("temp".into(), process.temp));
    }
    Osc::from_origin(kind, &pairs, Arc::new(ProcessOrigin { process: process.clone(), choices }))
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
        let ct = self.process.capacitor(&self.choices.cap_type).ok();
        if p.kind == Kind::RcInverter {
            let vc = self.process.resistor(&self.choices.res_type).map(|l| l.vc).unwrap_or(0.0);
            return if vc != 0.0 { vec![Parasitic::ResVc] } else { vec![] };
        }
        let mut v = vec![Parasitic::SwitchCap, Parasitic::MirrorRout];
        if ct.is_some_and(|c| c.vc1 != 0.0 || c.vc2 != 0.0) {
            v.push(Parasitic::CapVc);
        }
        if p.kind != Kind::Schmitt {
            v.extend([Parasitic::InputCap, Parasitic::CmpDelay]);
        }
        if matches!(p.kind, Kind::Reset | Kind::PingPong) {
            v.push(Parasitic::Reset);
        }
        v
    }

    fn build(&self, p: &Params, corner: &str) -> Result<Parts, String> {
        let pr = self.at(p, corner)?;
        let kind = p.kind;
        let what = |e: String, part: &str| format!("osc_from(\"{}\"): {part}: {e}", kind.name());
        let ct = pr.capacitor(&self.choices.cap_type)?;
        let cap = Capacitor::new(p.get("c") * pr.cap_scale, ct.vc1, ct.vc2, ct.tc1, ct.tc2, pr.tnom)
            .map_err(|e| what(e, "capacitor"))?;
        if kind == Kind::RcInverter {
            return self.rc_inverter(&pr, p, cap);
        }
        let i = p.get("i");
        let (mw, ml) = (p.get("mirror_w"), p.get("mirror_l"));
        let margin = if self.choices.mirror == MirrorKind::WideSwing { WIDE_SWING_MARGIN } else { 0.0 };
        let mirror = |t: MosType| {
            Mirror::from_process(&pr, self.choices.mirror, t, i, 1.0, mw, ml, margin).map_err(|e| what(e, "mirror"))
        };
        let charge = MirrorSource { mirror: mirror(MosType::P)?, nominal: i };
        let discharge = MirrorSource { mirror: mirror(MosType::N)?, nominal: i * (1.0 + p.get("i_mismatch")) };
        let (sw, sl) = (p.get("sw_w"), p.get("sw_l"));
        let nsw = Switch::from_process(&pr, SwitchKind::N, sw, sw, sl).map_err(|e| what(e, "switch"))?;
        let psw = Switch::from_process(&pr, SwitchKind::P, 2.0 * sw, 2.0 * sw, sl).map_err(|e| what(e, "switch"))?;
        let v_lo = if p.has("v_lo") { p.get("v_lo") } else { 0.0 };
        let (node, r_reset) = match kind {
            Kind::Reset => (SwitchSet(vec![nsw.clone()]), nsw.with_on(true).ron(v_lo)),
            Kind::PingPong => (SwitchSet(vec![nsw.clone(), psw]), nsw.with_on(true).ron(v_lo)),
            _ => (SwitchSet(vec![nsw, psw]), 0.0),
        };
        if kind == Kind::Reset && p.get("t_reset") <= 0.0 {
            return Err("osc_from(\"reset\"): key 't_reset' (the reset pulse, s) is required: a process reset switch has a finite on-resistance".into());
        }
        let v_swing = if p.has("cmp_vsw") { p.get("cmp_vsw") } else { 0.5 * pr.vdd };
        let pair = |v_cm: f64, vos: &str| -> Result<Arc<dyn ComparatorPart>, String> {
            // An NMOS pair needs its common mode above mid-supply's headroom, a PMOS pair below.
            let t = if v_cm > 0.5 * pr.vdd { MosType::N } else { MosType::P };
            let d = PairDesign {
                kind: t,
                w: p.get("cmp_w"),
                l: p.get("cmp_l"),
                i_tail: p.get("cmp_itail"),
                c_load: p.get("cmp_cload"),
                tail_w: mw,
                tail_l: ml,
                v_cm,
                v_swing,
                t0: p.get("t_cmp"),
                offset: p.get(vos),
                hyst: 0.0,
            };
            Ok(Arc::new(Comparator::from_pair(&pr, &d).map_err(|e| what(e, "comparator"))?))
        };
        let (cmp_hi, cmp_lo, levels): (Arc<dyn ComparatorPart>, Arc<dyn ComparatorPart>, _) = match kind {
            Kind::Window => (pair(p.get("v_hi"), "vos_hi")?, pair(v_lo, "vos_lo")?, None),
            Kind::Reset | Kind::PingPong => {
                let c = pair(p.get("v_hi"), "vos")?;
                (c.clone(), c, None)
            }
            Kind::Schmitt => {
                let t0 = p.get("t_cmp");
                let n = Mos::from_process(&pr, MosType::N, sw, sl)?;
                let pm = Mos::from_process(&pr, MosType::P, sw, sl)?;
                let temp = p.get("temp");
                let levels = schmitt_cmos(pr.vdd, n.vt(temp), pm.vt(temp), p.get("ratio_n"), p.get("ratio_p"));
                (
                    Arc::new(FixedComparator { vos: p.get("vos_hi"), c_in: p.get("c_in"), t0 }),
                    Arc::new(FixedComparator { vos: p.get("vos_lo"), c_in: 0.0, t0 }),
                    Some(levels),
                )
            }
            Kind::RcInverter => return Err("internal: the rc-inverter parts are built separately".into()),
        };
        Ok(Parts {
            cap: Arc::new(cap),
            node: Arc::new(node),
            charge: Arc::new(charge),
            discharge: Arc::new(discharge),
            cmp_hi,
            cmp_lo,
            r_reset,
            levels,
            res: None,
            v_th: None,
        })
    }
}

impl ProcessOrigin {
    /// Two-inverter astable: the timing resistor of a process layer, the inverter threshold
    /// from the process devices at the operating temperature and supply.
    fn rc_inverter(&self, pr: &Process, p: &Params, cap: Capacitor) -> Result<Parts, String> {
        let ly = pr.resistor(&self.choices.res_type)?;
        let res = Resistor::new(p.get("r") * pr.res_scale, ly.tc1, ly.tc2, ly.vc, pr.tnom)
            .map_err(|e| format!("osc_from(\"rc-inverter\"): resistor: {e}"))?;
        let temp = p.get("temp");
        let n = Mos::from_process(pr, MosType::N, p.get("inv_wn"), p.get("inv_l"))?;
        let pm = Mos::from_process(pr, MosType::P, p.get("inv_wp"), p.get("inv_l"))?;
        let v_th = inverter_vm(pr.vdd, n.vt(temp), pm.vt(temp), pm.beta(temp) / n.beta(temp));
        let cmp: Arc<dyn ComparatorPart> =
            Arc::new(FixedComparator { vos: p.get("vos"), c_in: p.get("c_in"), t0: 0.0 });
        // The RC astable has no current sources; ideal placeholders keep the parts complete.
        let none =
            Arc::new(super::parts::MirrorOut { i: 0.0, tc: 0.0, r_out: f64::INFINITY, v_ds_ref: 0.0, high_side: true });
        Ok(Parts {
            cap: Arc::new(cap),
            node: Arc::new(SwitchSet(vec![])),
            charge: none.clone(),
            discharge: none,
            cmp_hi: cmp.clone(),
            cmp_lo: cmp,
            r_reset: 0.0,
            levels: None,
            res: Some(res),
            v_th: Some(v_th),
        })
    }
}
