//! Registration of the physics layer: processes, transistors, switches, mirrors, comparators,
//! resistors and capacitors, as script objects with methods. Voltages V, currents A,
//! capacitances F, resistances Ω, times s, temperatures °C (`temp`). PMOS devices take
//! magnitudes (Vsg, Vsd) and give |Id|.
//!
//! Methods whose first argument is a voltage or current also accept a `Series` and then return
//! a `Series`, so a sweep is one native call.
use rhai::{Array, Dynamic, Engine, EvalAltResult, Map};

use super::docs::Doc;
use super::session::Shared;
use super::value::to_f64;
use crate::num::Series;
use crate::physics::capacitor::{Capacitor, MosCap};
use crate::physics::comparator::{pair_tradeoff, Comparator, ComparatorSpec, PairDesign};
use crate::physics::constants::{check_temp, thermal_voltage};
use crate::physics::junction::{self, junction_cap};
use crate::physics::mirror::{pair_mismatch, Mirror, MirrorKind};
use crate::physics::mismatch::pelgrom;
use crate::physics::mosfet::{Mos, MosType};
use crate::physics::process::Process;
use crate::physics::resistor::Resistor;
use crate::physics::switch::{Switch, SwitchKind};

type R<T> = Result<T, Box<EvalAltResult>>;

macro_rules! d {
    ($name:literal, $sig:literal, $sum:literal) => {
        Doc { name: $name, sig: $sig, summary: $sum }
    };
}

pub const DOCS: &[Doc] = &[
    // Constants and laws.
    d!("thermal_voltage", "thermal_voltage(temp: °C) -> V", "kT/q at temp (CODATA 2018 exact k and q); 25.85 mV at 26.85 °C"),
    d!("junction_cap", "junction_cap(cj0: F, v_reverse: V, phi: V, m) -> F", "depletion capacitance Cj0/(1+Vr/φ)^m (Sze), linearised beyond φ/2 forward"),
    d!("pelgrom", "pelgrom(a, w: m, l: m) -> float", "σ of a matched pair's difference A/√(WL) (Pelgrom 1989): A_VT in V·m gives V, A_β in m gives a fraction"),
    // Process.
    d!("process", "process(name: string) -> Process", "a built-in process; \"demo180\" is the generic 180 nm, 1.8 V demo (invented numbers)"),
    d!("process_file", "process_file(path: string) -> Process", "a process from a TOML file (docs/process-format.md), path relative to the script; recorded in the report's provenance"),
    d!("name", "p.name() -> string", "process name"),
    d!("vdd", "p.vdd() -> V", "supply of the process (or of its applied corner)"),
    d!("temp", "p.temp() -> °C", "temperature of the applied corner (tnom when none)"),
    d!("tnom", "p.tnom() -> °C", "temperature at which the process parameters are given"),
    d!("corner_name", "p.corner_name() -> string", "name of the applied corner, \"\" for nominal"),
    d!("corners", "p.corners() -> array", "names of the corners the process defines"),
    d!("corner", "p.corner(name: string) -> Process", "the process at a named corner: device shifts, R and C factors, supply and temperature"),
    d!("with_vdd", "p.with_vdd(vdd: V) -> Process", "the process at another supply (devices made from it use it)"),
    d!("with_temp", "p.with_temp(temp: °C) -> Process", "the process at another temperature (switches, mirrors, comparators made from it use it)"),
    d!("nmos", "p.nmos(w: m, l: m) -> Mos", "an NMOS transistor of the process"),
    d!("pmos", "p.pmos(w: m, l: m) -> Mos", "a PMOS transistor of the process (methods take magnitudes Vsg, Vsd and give |Id|)"),
    d!("mos_switch", "p.mos_switch(kind: \"n\"|\"p\", w: m, l: m) -> Switch", "an NMOS or PMOS switch (off; .on() for the on state)"),
    d!("mos_switch", "p.mos_switch(\"tg\", w_n: m, w_p: m, l: m) -> Switch", "a transmission gate of an NMOS of w_n and a PMOS of w_p"),
    d!("mos_switch", "mos_switch(#{ron: Ω, c_node: F, q_ch: C, c_ov: F, vdd: V}) -> Switch", "a switch from explicit numbers (c_node, q_ch, c_ov default 0; vdd 1.8)"),
    d!("mirror", "p.mirror(#{kind, type, i_ref: A, ratio, w: m, l: m, margin: V}) -> Mirror", "a current mirror: kind \"simple\"|\"cascode\"|\"wide-swing\", type \"n\" (sink) or \"p\" (source); ratio 1, margin 0.1 V by default"),
    d!("mirror", "mirror(#{i_out: A, rout: Ω, v_compliance: V, sigma}) -> Mirror", "a behavioural mirror from explicit numbers (sigma: σ of the ratio, default 0)"),
    d!("comparator", "p.comparator(#{type, w: m, l: m, i_tail: A, c_load: F, tail_w: m, tail_l: m, v_cm: V, v_swing: V, t0: s, offset: V, hyst: V}) -> Comparator", "a comparator from an input pair of the process (type \"n\"; tail 2u/2u; v_cm, v_swing vdd/2; t0, offset, hyst 0 by default)"),
    d!("comparator", "comparator(#{a0, gbw: Hz, slew: V/s, v_swing: V, t0: s, offset: V, sigma_offset: V, c_in: F, hyst: V}) -> Comparator", "a behavioural comparator from explicit numbers (a0, gbw, slew, v_swing required)"),
    d!("pair_tradeoff", "p.pair_tradeoff(#{comparator keys…, w_over_l, areas: Series (m²)}) -> map", "offset σ (V) and input capacitance (F, at v_cm) versus input-pair gate area: #{area, offset, cap} of Series"),
    d!("resistor", "p.resistor(layer: string, w: m, l: m) -> Resistor", "a resistor of a process layer, R0 = Rsh·L/W"),
    d!("resistor", "resistor(#{r: Ω, tc1: 1/K, tc2: 1/K², vc: 1/V, tnom: °C}) -> Resistor", "a resistor from explicit numbers (coefficients 0, tnom 27 °C by default)"),
    d!("capacitor", "p.capacitor(kind: string, w: m, l: m) -> Capacitor", "a capacitor of a process type (e.g. \"mim\"), C0 = Ca·WL + Cp·2(W+L)"),
    d!("capacitor", "capacitor(#{c: F, vc1: 1/V, vc2: 1/V², tc1: 1/K, tc2: 1/K², tnom: °C}) -> Capacitor", "a capacitor from explicit numbers (coefficients 0, tnom 27 °C by default)"),
    d!("moscap", "p.moscap(type: \"n\"|\"p\", w: m, l: m) -> MosCap", "a MOS capacitor: gate against tied source, drain and bulk"),
    // Transistor.
    d!("id", "m.id(vgs: V|Series, vds: V, temp: °C) -> A", "drain current, all regions (EKV 1995 interpolation) with CLM and temperature; source at bulk"),
    d!("ids", "m.ids(vg: V, vs: V, vd: V, temp: °C) -> A", "drain current with bulk-referred terminal voltages (body effect through the slope factor)"),
    d!("gm", "m.gm(vgs: V|Series, vds: V, temp: °C) -> S", "transconductance ∂Id/∂Vgs"),
    d!("gds", "m.gds(vgs: V|Series, vds: V, temp: °C) -> S", "output conductance ∂Id/∂Vds"),
    d!("ro", "m.ro(vgs: V|Series, vds: V, temp: °C) -> Ω", "output resistance 1/gds"),
    d!("gm_id", "m.gm_id(vgs: V|Series, vds: V, temp: °C) -> 1/V", "transconductance efficiency gm/Id"),
    d!("ic", "m.ic(vgs: V|Series, temp: °C) -> float", "inversion coefficient Id/I_spec in saturation (< 0.1 weak, > 10 strong)"),
    d!("vdsat", "m.vdsat(vgs: V|Series, temp: °C) -> V", "saturation voltage 2U_T√(IC+1/4)+3U_T (EKV-based, Binkley 2008)"),
    d!("vgs_for", "m.vgs_for(id: A|Series, vds: V, temp: °C) -> V", "gate-source voltage that gives the drain current id"),
    d!("ron", "m.ron(vgs: V|Series, temp: °C) -> Ω", "triode on-resistance at Vds = 0, source at bulk"),
    d!("vt", "m.vt(temp: °C) -> V", "threshold voltage (magnitude) at temp"),
    d!("beta", "m.beta(temp: °C) -> A/V²", "current factor µCox·W/L at temp"),
    d!("i_spec", "m.i_spec(temp: °C) -> A", "EKV specific current 2nβU_T²"),
    d!("caps", "m.caps(vgs: V, vds: V, temp: °C) -> map", "gate capacitances #{cgs, cgd, cgb, total} in F (Meyer, smoothed across regions, with overlaps)"),
    d!("cj", "m.cj(v_reverse: V|Series) -> F", "capacitance of one source/drain diffusion to bulk (area + sidewall, Sze law)"),
    d!("with_mismatch", "m.with_mismatch(dvt: V, dbeta) -> Mos", "the device with a mismatch sample: threshold magnitude + dvt, current factor × (1 + dbeta)"),
    d!("sigma_vt", "m.sigma_vt() -> V", "σ(ΔVT) of a pair of these devices (Pelgrom)"),
    d!("sigma_beta", "m.sigma_beta() -> float", "σ(Δβ/β) of a pair of these devices (Pelgrom)"),
    d!("w", "m.w() -> m", "drawn width"),
    d!("l", "m.l() -> m", "drawn length"),
    // Switch.
    d!("ron", "s.ron(v_sig: V|Series) -> Ω", "switch on-resistance at signal voltage v_sig (body effect included; TG: both in parallel)"),
    d!("node_cap", "s.node_cap(v_node: V|Series) -> F", "capacitance the switch adds to a node at v_node in its state (junction + gate side)"),
    d!("injection", "s.injection(v_sig: V|Series, c_node: F) -> V", "node step from channel charge injection at turn-off (half the channel charge; NMOS negative)"),
    d!("feedthrough", "s.feedthrough(c_node: F) -> V", "node step from clock feedthrough through the gate overlap at turn-off"),
    d!("pedestal", "s.pedestal(v_sig: V|Series, c_node: F) -> V", "injection plus feedthrough"),
    d!("on", "s.on() -> Switch", "the switch in its on state"),
    d!("off", "s.off() -> Switch", "the switch in its off state"),
    d!("at", "s.at(vdd: V, temp: °C) -> Switch", "the switch at another supply and temperature"),
    // Mirror.
    d!("i_out", "mi.i_out(v_out: V|Series) -> A", "output current magnitude at output node voltage v_out (from ground), with compliance and Rout"),
    d!("rout", "mi.rout(v_out: V|Series) -> Ω", "output resistance at v_out"),
    d!("compliance", "mi.compliance() -> V", "lowest headroom from the mirror's rail with the current within 1 % of its saturation line"),
    d!("compliance", "mi.compliance(tol) -> V", "the same within a fraction tol"),
    d!("systematic_error", "mi.systematic_error(v_out: V|Series) -> float", "Iout/(ratio·Iref) − 1 at v_out"),
    d!("sigma_ratio", "mi.sigma_ratio() -> float", "σ of the current ratio from Pelgrom mismatch"),
    d!("pair_mismatch", "pair_mismatch(high: Mirror, low: Mirror, v_node: V|Series) -> map", "charge (PMOS) versus discharge (NMOS) current: #{systematic, sigma} as fractions of their mean"),
    // Comparator.
    d!("delay", "c.delay(overdrive: V|Series) -> s", "delay after an input step of overdrive beyond the threshold (slew-limited and linear settling)"),
    d!("delay_ramp", "c.delay_ramp(slope: V/s|Series) -> s", "delay after the input crosses the threshold as a ramp (the oscillator case)"),
    d!("input_cap", "c.input_cap(v_cm: V|Series) -> F", "input capacitance at common mode v_cm"),
    d!("offset", "c.offset() -> V", "systematic input offset"),
    d!("sigma_offset", "c.sigma_offset() -> V", "random input offset σ (Pelgrom)"),
    d!("thresholds", "c.thresholds(v_ref: V) -> map", "#{falling, rising} switching thresholds with offset and hysteresis"),
    d!("a0", "c.a0() -> V/V", "DC gain"),
    d!("gbw", "c.gbw() -> Hz", "gain-bandwidth product"),
    d!("slew", "c.slew() -> V/s", "output slew rate"),
    d!("tau", "c.tau() -> s", "time constant of the single pole A0/(2π·GBW)"),
    // Resistor and capacitors.
    d!("r", "res.r(v: V|Series, temp: °C) -> Ω", "resistance at voltage v across it and temp: R0(1+TC1ΔT+TC2ΔT²)(1+VC|V|)"),
    d!("r0", "res.r0() -> Ω", "resistance at tnom and 0 V"),
    d!("sigma", "res.sigma() | cap.sigma() -> float", "σ(ΔR/R) or σ(ΔC/C) of a matched pair (Pelgrom-type matching coefficient)"),
    d!("c", "cap.c(v: V|Series, temp: °C) -> F", "capacitance at voltage v and temp: C0(1+VC1·V+VC2·V²)(1+TC1ΔT+TC2ΔT²); MosCap: gate C(V)"),
    d!("c0", "cap.c0() -> F", "capacitance at tnom and 0 V"),
];

fn err<T>(msg: impl Into<String>) -> R<T> {
    Err(msg.into().into())
}

fn lift<T>(r: Result<T, String>) -> R<T> {
    r.map_err(|e| e.into())
}

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
            Some(v) => v.clone().into_string().map_err(|t| format!("{f}: key '{key}' must be a string, found {t}").into()),
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

fn pair_design(o: &mut Opts, p: &Process) -> R<PairDesign> {
    let kind = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("{}: key 'type': {e}", o.f)))?;
    Ok(PairDesign {
        kind,
        w: o.req("w")?,
        l: o.req("l")?,
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
    register_constants(engine);
    register_process(engine, session);
    register_mos(engine);
    register_switch(engine);
    register_mirror(engine);
    register_comparator(engine);
    register_passives(engine);
}

fn register_constants(engine: &mut Engine) {
    engine.register_fn("thermal_voltage", |t: Dynamic| -> R<f64> { Ok(thermal_voltage(temp(&t, "thermal_voltage")?)) });
    engine.register_fn("junction_cap", |cj0: Dynamic, vr: Dynamic, phi: Dynamic, m: Dynamic| -> R<Dynamic> {
        let f = "junction_cap";
        let (cj0, phi, m) = (num(&cj0, "junction_cap: cj0")?, num(&phi, "junction_cap: phi")?, num(&m, "junction_cap: m")?);
        lift(junction::check(cj0, phi, m).map_err(|e| format!("{f}: {e}")))?;
        each(&vr, "v_reverse", f, |v| Ok(junction_cap(cj0, v, phi, m)))
    });
    engine.register_fn("pelgrom", |a: Dynamic, w: Dynamic, l: Dynamic| -> R<f64> {
        let a = num(&a, "pelgrom: a")?;
        let (w, l) = (num(&w, "pelgrom: w")?, num(&l, "pelgrom: l")?);
        if a < 0.0 || w <= 0.0 || l <= 0.0 {
            return err(format!("pelgrom: need a ≥ 0, w > 0 m, l > 0 m; got a = {a}, w = {w}, l = {l}"));
        }
        Ok(pelgrom(a, w, l))
    });
}

fn register_process(engine: &mut Engine, session: &Shared) {
    engine.register_type_with_name::<Process>("Process");
    engine.register_fn("to_string", |p: &mut Process| process_text(p));
    engine.register_fn("to_debug", |p: &mut Process| process_text(p));
    engine.register_fn("process", |name: &str| lift(Process::builtin(name).map_err(|e| format!("process: {e}"))));
    let s = session.clone();
    engine.register_fn("process_file", move |path: &str| -> R<Process> {
        let text = s.lock().read_input(path).map_err(|e| format!("process_file: {e}"))?;
        lift(Process::from_toml(&text, path).map_err(|e| format!("process_file: {e}")))
    });
    engine.register_fn("name", |p: &mut Process| p.name.clone());
    engine.register_fn("vdd", |p: &mut Process| p.vdd);
    engine.register_fn("temp", |p: &mut Process| p.temp);
    engine.register_fn("tnom", |p: &mut Process| p.tnom);
    engine.register_fn("corner_name", |p: &mut Process| p.corner.clone());
    engine.register_fn("corners", |p: &mut Process| -> Array { p.corner_names().into_iter().map(Dynamic::from).collect() });
    engine.register_fn("corner", |p: &mut Process, name: &str| lift(p.at_corner(name).map_err(|e| format!("corner: {e}"))));
    engine.register_fn("with_vdd", |p: &mut Process, v: Dynamic| -> R<Process> {
        lift(p.with_vdd(num(&v, "with_vdd: vdd")?).map_err(|e| format!("with_vdd: {e}")))
    });
    engine.register_fn("with_temp", |p: &mut Process, t: Dynamic| -> R<Process> {
        lift(p.with_temp(num(&t, "with_temp: temp")?).map_err(|e| format!("with_temp: {e}")))
    });
    for (name, kind) in [("nmos", MosType::N), ("pmos", MosType::P)] {
        engine.register_fn(name, move |p: &mut Process, w: Dynamic, l: Dynamic| -> R<Mos> {
            let (w, l) = (num(&w, &format!("{name}: w"))?, num(&l, &format!("{name}: l"))?);
            lift(Mos::from_process(p, kind, w, l))
        });
    }
    engine.register_fn("mos_switch", |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<Switch> {
        let k = lift(SwitchKind::parse(kind).map_err(|e| format!("mos_switch: {e}")))?;
        if k == SwitchKind::Tg {
            return err("mos_switch: a transmission gate needs both widths: p.mos_switch(\"tg\", w_n, w_p, l)");
        }
        let (w, l) = (num(&w, "mos_switch: w")?, num(&l, "mos_switch: l")?);
        lift(Switch::from_process(p, k, w, w, l).map_err(|e| format!("mos_switch: {e}")))
    });
    engine.register_fn("mos_switch", |p: &mut Process, kind: &str, wn: Dynamic, wp: Dynamic, l: Dynamic| -> R<Switch> {
        if kind != "tg" {
            return err(format!("mos_switch: two widths are for kind \"tg\", got \"{kind}\""));
        }
        let (wn, wp, l) = (num(&wn, "mos_switch: w_n")?, num(&wp, "mos_switch: w_p")?, num(&l, "mos_switch: l")?);
        lift(Switch::from_process(p, SwitchKind::Tg, wn, wp, l).map_err(|e| format!("mos_switch: {e}")))
    });
    engine.register_fn("mirror", |p: &mut Process, m: Map| -> R<Mirror> {
        let mut o = Opts::new(&m, "mirror");
        let kind = lift(MirrorKind::parse(&o.text("kind", "simple")?).map_err(|e| format!("mirror: key 'kind': {e}")))?;
        let ty = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("mirror: key 'type': {e}")))?;
        let (i_ref, ratio) = (o.req("i_ref")?, o.or("ratio", 1.0)?);
        let (w, l, margin) = (o.req("w")?, o.req("l")?, o.or("margin", 0.1)?);
        o.finish()?;
        lift(Mirror::from_process(p, kind, ty, i_ref, ratio, w, l, margin))
    });
    engine.register_fn("comparator", |p: &mut Process, m: Map| -> R<Comparator> {
        let mut o = Opts::new(&m, "comparator");
        let d = pair_design(&mut o, p)?;
        o.finish()?;
        lift(Comparator::from_pair(p, &d))
    });
    engine.register_fn("pair_tradeoff", |p: &mut Process, m: Map| -> R<Map> {
        let mut o = Opts::new(&m, "pair_tradeoff");
        let d = pair_design(&mut o, p)?;
        let ratio = o.or("w_over_l", 4.0)?;
        let areas = match o.get("areas") {
            Some(v) => series_of(v, "pair_tradeoff: key 'areas'")?,
            None => return err("pair_tradeoff: key 'areas' is required (a Series of gate areas in m²)"),
        };
        o.finish()?;
        let (sig, cap) = lift(pair_tradeoff(p, &d, ratio, areas.as_slice()))?;
        let mut out = Map::new();
        out.insert("area".into(), Dynamic::from(areas));
        out.insert("offset".into(), Dynamic::from(Series::from(sig)));
        out.insert("cap".into(), Dynamic::from(Series::from(cap)));
        Ok(out)
    });
    engine.register_fn("resistor", |p: &mut Process, layer: &str, w: Dynamic, l: Dynamic| -> R<Resistor> {
        lift(Resistor::from_process(p, layer, num(&w, "resistor: w")?, num(&l, "resistor: l")?))
    });
    engine.register_fn("capacitor", |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<Capacitor> {
        lift(Capacitor::from_process(p, kind, num(&w, "capacitor: w")?, num(&l, "capacitor: l")?))
    });
    engine.register_fn("moscap", |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<MosCap> {
        let k = lift(MosType::parse(kind).map_err(|e| format!("moscap: {e}")))?;
        lift(MosCap::from_process(p, k, num(&w, "moscap: w")?, num(&l, "moscap: l")?))
    });
}

fn process_text(p: &Process) -> String {
    let c = if p.corner.is_empty() { String::new() } else { format!(", corner {}", p.corner) };
    format!("Process({}{c}, vdd {} V, temp {} °C)", p.name, p.vdd, p.temp)
}

fn register_mos(engine: &mut Engine) {
    engine.register_type_with_name::<Mos>("Mos");
    let text = |m: &mut Mos| format!("Mos({}, W {} µm, L {} µm)", m.kind.name(), m.w * 1e6, m.l * 1e6);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    macro_rules! iv {
        ($name:literal, $what:literal, $f:expr) => {
            engine.register_fn($name, |m: &mut Mos, x: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let (vds, t) = (num(&vds, &format!("{f}: vds"))?, temp(&t, f)?);
                let g = $f;
                each(&x, $what, f, |v| finite(g(&*m, v, vds, t), f))
            });
        };
    }
    iv!("id", "vgs", |m: &Mos, v, vds, t| m.id(v, vds, t));
    iv!("gm", "vgs", |m: &Mos, v, vds, t| m.gm(v, vds, t));
    iv!("gds", "vgs", |m: &Mos, v, vds, t| m.gds(v, vds, t));
    iv!("ro", "vgs", |m: &Mos, v, vds, t| m.ro(v, vds, t));
    iv!("gm_id", "vgs", |m: &Mos, v, vds, t| m.gm_id(v, vds, t));
    engine.register_fn("vgs_for", |m: &mut Mos, id: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
        let f = "m.vgs_for";
        let (vds, t) = (num(&vds, "m.vgs_for: vds")?, temp(&t, f)?);
        each(&id, "id", f, |i| lift(m.vgs_for(i, vds, t)))
    });
    engine.register_fn("ids", |m: &mut Mos, vg: Dynamic, vs: Dynamic, vd: Dynamic, t: Dynamic| -> R<f64> {
        let f = "m.ids";
        let (vg, vs, vd) = (num(&vg, "m.ids: vg")?, num(&vs, "m.ids: vs")?, num(&vd, "m.ids: vd")?);
        finite(m.ids(vg, vs, vd, temp(&t, f)?), f)
    });
    macro_rules! vt {
        ($name:literal, $f:expr) => {
            engine.register_fn($name, |m: &mut Mos, x: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let t = temp(&t, f)?;
                let g = $f;
                each(&x, "vgs", f, |v| finite(g(&*m, v, t), f))
            });
        };
    }
    vt!("ic", |m: &Mos, v, t| m.ic(v, t));
    vt!("vdsat", |m: &Mos, v, t| m.vdsat(v, t));
    vt!("ron", |m: &Mos, v, t| m.ron(v, t));
    engine.register_fn("vt", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.vt(temp(&t, "m.vt")?)) });
    engine.register_fn("beta", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.beta(temp(&t, "m.beta")?)) });
    engine.register_fn("i_spec", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.i_spec(temp(&t, "m.i_spec")?)) });
    engine.register_fn("caps", |m: &mut Mos, vgs: Dynamic, vds: Dynamic, t: Dynamic| -> R<Map> {
        let c = m.caps(num(&vgs, "m.caps: vgs")?, num(&vds, "m.caps: vds")?, temp(&t, "m.caps")?);
        let mut out = Map::new();
        for (k, v) in [("cgs", c.cgs), ("cgd", c.cgd), ("cgb", c.cgb), ("total", c.total())] {
            out.insert(k.into(), Dynamic::from_float(v));
        }
        Ok(out)
    });
    engine.register_fn("cj", |m: &mut Mos, vr: Dynamic| -> R<Dynamic> { each(&vr, "v_reverse", "m.cj", |v| Ok(m.cj_diffusion(v))) });
    engine.register_fn("with_mismatch", |m: &mut Mos, dvt: Dynamic, db: Dynamic| -> R<Mos> {
        lift(m.with_mismatch(num(&dvt, "m.with_mismatch: dvt")?, num(&db, "m.with_mismatch: dbeta")?))
    });
    engine.register_fn("sigma_vt", |m: &mut Mos| m.sigma_vt());
    engine.register_fn("sigma_beta", |m: &mut Mos| m.sigma_beta());
    engine.register_fn("w", |m: &mut Mos| m.w);
    engine.register_fn("l", |m: &mut Mos| m.l);
}

fn register_switch(engine: &mut Engine) {
    engine.register_type_with_name::<Switch>("Switch");
    let text = |s: &mut Switch| format!("Switch({:?}, {}, vdd {} V, temp {} °C)", s.kind, if s.on { "on" } else { "off" }, s.vdd, s.temp);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    engine.register_fn("mos_switch", |m: Map| -> R<Switch> {
        let mut o = Opts::new(&m, "mos_switch");
        let (ron, c, q, cov, vdd) = (o.req("ron")?, o.or("c_node", 0.0)?, o.or("q_ch", 0.0)?, o.or("c_ov", 0.0)?, o.or("vdd", 1.8)?);
        o.finish()?;
        lift(Switch::explicit(ron, c, q, cov, vdd))
    });
    engine.register_fn("ron", |s: &mut Switch, v: Dynamic| -> R<Dynamic> { each(&v, "v_sig", "s.ron", |x| finite(s.ron(x), "s.ron")) });
    engine.register_fn("node_cap", |s: &mut Switch, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_node", "s.node_cap", |x| finite(s.node_cap(x), "s.node_cap"))
    });
    let c_node = |c: &Dynamic, f: &str| -> R<f64> {
        let c = num(c, &format!("{f}: c_node"))?;
        if c <= 0.0 { err(format!("{f}: c_node must be > 0 F, got {c}")) } else { Ok(c) }
    };
    engine.register_fn("injection", move |s: &mut Switch, v: Dynamic, c: Dynamic| -> R<Dynamic> {
        let c = c_node(&c, "s.injection")?;
        each(&v, "v_sig", "s.injection", |x| Ok(s.injection(x, c)))
    });
    engine.register_fn("pedestal", move |s: &mut Switch, v: Dynamic, c: Dynamic| -> R<Dynamic> {
        let c = c_node(&c, "s.pedestal")?;
        each(&v, "v_sig", "s.pedestal", |x| Ok(s.pedestal(x, c)))
    });
    engine.register_fn("feedthrough", move |s: &mut Switch, c: Dynamic| -> R<f64> { Ok(s.feedthrough(c_node(&c, "s.feedthrough")?)) });
    engine.register_fn("on", |s: &mut Switch| s.with_on(true));
    engine.register_fn("off", |s: &mut Switch| s.with_on(false));
    engine.register_fn("at", |s: &mut Switch, vdd: Dynamic, t: Dynamic| -> R<Switch> {
        lift(s.at(num(&vdd, "s.at: vdd")?, num(&t, "s.at: temp")?).map_err(|e| format!("s.at: {e}")))
    });
}

fn register_mirror(engine: &mut Engine) {
    engine.register_type_with_name::<Mirror>("Mirror");
    let text = |m: &mut Mirror| format!("Mirror({:?}, {}, i_ref {} A, ratio {})", m.kind, m.polarity.name(), m.i_ref, m.ratio);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    engine.register_fn("mirror", |m: Map| -> R<Mirror> {
        let mut o = Opts::new(&m, "mirror");
        let (i, r, vc, s) = (o.req("i_out")?, o.req("rout")?, o.req("v_compliance")?, o.or("sigma", 0.0)?);
        o.finish()?;
        lift(Mirror::explicit(i, r, vc, s))
    });
    engine.register_fn("i_out", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> { each(&v, "v_out", "mi.i_out", |x| finite(m.i_out(x), "mi.i_out")) });
    engine.register_fn("rout", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> { each(&v, "v_out", "mi.rout", |x| finite(m.rout(x), "mi.rout")) });
    engine.register_fn("systematic_error", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_out", "mi.systematic_error", |x| finite(m.systematic_error(x), "mi.systematic_error"))
    });
    engine.register_fn("compliance", |m: &mut Mirror| -> R<f64> { lift(m.compliance(m.headroom(), 0.01)) });
    engine.register_fn("compliance", |m: &mut Mirror, tol: Dynamic| -> R<f64> { lift(m.compliance(m.headroom(), num(&tol, "mi.compliance: tol")?)) });
    engine.register_fn("sigma_ratio", |m: &mut Mirror| m.sigma_ratio());
    engine.register_fn("pair_mismatch", |h: Mirror, l: Mirror, v: Dynamic| -> R<Map> {
        let f = "pair_mismatch";
        let (sys, sig) = if let Some(s) = v.clone().try_cast::<Series>() {
            let (a, b): (Vec<f64>, Vec<f64>) = s.as_slice().iter().map(|&x| pair_mismatch(&h, &l, x)).unzip();
            (Dynamic::from(Series::from(a)), Dynamic::from(Series::from(b)))
        } else {
            let (a, b) = pair_mismatch(&h, &l, num(&v, "pair_mismatch: v_node")?);
            (Dynamic::from_float(finite(a, f)?), Dynamic::from_float(b))
        };
        let mut out = Map::new();
        out.insert("systematic".into(), sys);
        out.insert("sigma".into(), sig);
        Ok(out)
    });
}

fn register_comparator(engine: &mut Engine) {
    engine.register_type_with_name::<Comparator>("Comparator");
    let text = |c: &mut Comparator| format!("Comparator(a0 {:.4}, gbw {:.4e} Hz, slew {:.4e} V/s)", c.spec.a0, c.spec.gbw, c.spec.slew);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    engine.register_fn("comparator", |m: Map| -> R<Comparator> {
        let mut o = Opts::new(&m, "comparator");
        let spec = ComparatorSpec {
            a0: o.req("a0")?,
            gbw: o.req("gbw")?,
            slew: o.req("slew")?,
            v_swing: o.req("v_swing")?,
            t0: o.or("t0", 0.0)?,
            offset: o.or("offset", 0.0)?,
            sigma_offset: o.or("sigma_offset", 0.0)?,
            c_in: o.or("c_in", 0.0)?,
            hyst: o.or("hyst", 0.0)?,
        };
        o.finish()?;
        lift(Comparator::new(spec))
    });
    engine.register_fn("delay", |c: &mut Comparator, od: Dynamic| -> R<Dynamic> {
        each(&od, "overdrive", "c.delay", |v| {
            let t = c.delay(v);
            if t.is_finite() {
                Ok(t)
            } else {
                err(format!(
                    "c.delay: overdrive {v} V never toggles the output: it needs more than v_swing/a0 = {:.4e} V",
                    c.spec.v_swing / c.spec.a0
                ))
            }
        })
    });
    engine.register_fn("delay_ramp", |c: &mut Comparator, s: Dynamic| -> R<Dynamic> {
        each(&s, "slope", "c.delay_ramp", |v| {
            if v <= 0.0 {
                return err(format!("c.delay_ramp: slope must be > 0 V/s, got {v}"));
            }
            finite(c.delay_ramp(v), "c.delay_ramp")
        })
    });
    engine.register_fn("input_cap", |c: &mut Comparator, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_cm", "c.input_cap", |x| finite(c.input_cap(x), "c.input_cap"))
    });
    engine.register_fn("offset", |c: &mut Comparator| c.offset());
    engine.register_fn("sigma_offset", |c: &mut Comparator| c.sigma_offset());
    engine.register_fn("thresholds", |c: &mut Comparator, v: Dynamic| -> R<Map> {
        let (lo, hi) = c.thresholds(num(&v, "c.thresholds: v_ref")?);
        let mut out = Map::new();
        out.insert("falling".into(), Dynamic::from_float(lo));
        out.insert("rising".into(), Dynamic::from_float(hi));
        Ok(out)
    });
    engine.register_fn("a0", |c: &mut Comparator| c.spec.a0);
    engine.register_fn("gbw", |c: &mut Comparator| c.spec.gbw);
    engine.register_fn("slew", |c: &mut Comparator| c.spec.slew);
    engine.register_fn("tau", |c: &mut Comparator| c.spec.tau());
}

fn register_passives(engine: &mut Engine) {
    engine.register_type_with_name::<Resistor>("Resistor");
    engine.register_type_with_name::<Capacitor>("Capacitor");
    engine.register_type_with_name::<MosCap>("MosCap");
    let rt = |r: &mut Resistor| format!("Resistor({} Ω)", r.r0);
    engine.register_fn("to_string", rt);
    engine.register_fn("to_debug", rt);
    let ct = |c: &mut Capacitor| format!("Capacitor({} F)", c.c0);
    engine.register_fn("to_string", ct);
    engine.register_fn("to_debug", ct);
    let mt = |c: &mut MosCap| format!("MosCap({}, W {} µm, L {} µm)", c.dev.kind.name(), c.dev.w * 1e6, c.dev.l * 1e6);
    engine.register_fn("to_string", mt);
    engine.register_fn("to_debug", mt);
    engine.register_fn("resistor", |m: Map| -> R<Resistor> {
        let mut o = Opts::new(&m, "resistor");
        let (r, tc1, tc2, vc, tnom) = (o.req("r")?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("vc", 0.0)?, o.or("tnom", 27.0)?);
        o.finish()?;
        lift(Resistor::new(r, tc1, tc2, vc, tnom))
    });
    engine.register_fn("capacitor", |m: Map| -> R<Capacitor> {
        let mut o = Opts::new(&m, "capacitor");
        let c = o.req("c")?;
        let (vc1, vc2, tc1, tc2, tnom) = (o.or("vc1", 0.0)?, o.or("vc2", 0.0)?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("tnom", 27.0)?);
        o.finish()?;
        lift(Capacitor::new(c, vc1, vc2, tc1, tc2, tnom))
    });
    engine.register_fn("r", |r: &mut Resistor, v: Dynamic, t: Dynamic| -> R<Dynamic> {
        let t = temp(&t, "res.r")?;
        each(&v, "v", "res.r", |x| finite(r.r(x, t), "res.r"))
    });
    engine.register_fn("r0", |r: &mut Resistor| r.r0);
    engine.register_fn("sigma", |r: &mut Resistor| r.sigma);
    engine.register_fn("c", |c: &mut Capacitor, v: Dynamic, t: Dynamic| -> R<Dynamic> {
        let t = temp(&t, "cap.c")?;
        each(&v, "v", "cap.c", |x| finite(c.c(x, t), "cap.c"))
    });
    engine.register_fn("c0", |c: &mut Capacitor| c.c0);
    engine.register_fn("sigma", |c: &mut Capacitor| c.sigma);
    engine.register_fn("c", |c: &mut MosCap, v: Dynamic, t: Dynamic| -> R<Dynamic> {
        let t = temp(&t, "moscap.c")?;
        each(&v, "v", "moscap.c", |x| finite(c.c(x, t), "moscap.c"))
    });
}
