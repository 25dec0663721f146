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

use super::docs::Doc;
use super::session::Shared;
use super::value::to_f64;
use crate::num::Series;
use crate::physics::comparator::PairDesign;
use crate::physics::constants::check_temp;
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;

macro_rules! d {
    ($name:literal, $sig:literal, $sum:literal) => {
        Doc { name: $name, sig: $sig, summary: $sum }
    };
}

pub const DOCS: &[Doc] = &[
    // Constants and laws.
    d!(
        "thermal_voltage",
        "thermal_voltage(temp: °C) -> V",
        "kT/q at temp (CODATA 2018 exact k and q); 25.85 mV at 26.85 °C"
    ),
    d!(
        "junction_cap",
        "junction_cap(cj0: F, v_reverse: V, phi: V, m) -> F",
        "depletion capacitance Cj0/(1+Vr/φ)^m (Sze), linearised beyond φ/2 forward"
    ),
    d!(
        "pelgrom",
        "pelgrom(a, w: m, l: m) -> float",
        "σ of a matched pair's difference A/√(WL) (Pelgrom 1989): A_VT in V·m gives V, A_β in m gives a fraction"
    ),
    // Process.
    d!(
        "process",
        "process(name: string) -> Process",
        "a built-in process; \"demo180\" is the generic 180 nm, 1.8 V demo (invented numbers)"
    ),
    d!(
        "process_file",
        "process_file(path: string) -> Process",
        "a process from a TOML file (docs/process-format.md), path relative to the script; recorded in the report's provenance"
    ),
    d!("name", "p.name() -> string", "process name"),
    d!("vdd", "p.vdd() -> V", "supply of the process (or of its applied corner)"),
    d!("temp", "p.temp() -> °C", "temperature of the applied corner (tnom when none)"),
    d!("tnom", "p.tnom() -> °C", "temperature at which the process parameters are given"),
    d!("corner_name", "p.corner_name() -> string", "name of the applied corner, \"\" for nominal"),
    d!("corners", "p.corners() -> array", "names of the corners the process defines"),
    d!(
        "corner",
        "p.corner(name: string) -> Process",
        "the process at a named corner: device shifts, R and C factors, supply and temperature"
    ),
    d!("with_vdd", "p.with_vdd(vdd: V) -> Process", "the process at another supply (devices made from it use it)"),
    d!(
        "with_temp",
        "p.with_temp(temp: °C) -> Process",
        "the process at another temperature (switches, mirrors, comparators made from it use it)"
    ),
    d!("nmos", "p.nmos(w: m, l: m) -> Mos", "an NMOS transistor of the process"),
    d!(
        "pmos",
        "p.pmos(w: m, l: m) -> Mos",
        "a PMOS transistor of the process (methods take magnitudes Vsg, Vsd and give |Id|)"
    ),
    d!(
        "mos_switch",
        "p.mos_switch(kind: \"n\"|\"p\", w: m, l: m) -> Switch",
        "an NMOS or PMOS switch (off; .on() for the on state)"
    ),
    d!(
        "mos_switch",
        "p.mos_switch(\"tg\", w_n: m, w_p: m, l: m) -> Switch",
        "a transmission gate of an NMOS of w_n and a PMOS of w_p"
    ),
    d!(
        "mos_switch",
        "mos_switch(#{ron: Ω, c_node: F, q_ch: C, c_ov: F, vdd: V}) -> Switch",
        "a switch from explicit numbers (c_node, q_ch, c_ov default 0; vdd 1.8)"
    ),
    d!(
        "mirror",
        "p.mirror(#{kind, type, i_ref: A, ratio, w: m, l: m, margin: V}) -> Mirror",
        "a current mirror: kind \"simple\"|\"cascode\"|\"wide-swing\", type \"n\" (sink) or \"p\" (source); ratio 1, margin 0.1 V by default"
    ),
    d!(
        "mirror",
        "mirror(#{i_out: A, rout: Ω, v_compliance: V, sigma, type, vdd: V}) -> Mirror",
        "a behavioural mirror from explicit numbers (sigma: σ of the ratio, default 0); type \"p\" with vdd for a high-side source"
    ),
    d!(
        "comparator",
        "p.comparator(#{type, w: m, l: m, i_tail: A, c_load: F, tail_w: m, tail_l: m, v_cm: V, v_swing: V, t0: s, offset: V, hyst: V}) -> Comparator",
        "a comparator from an input pair of the process (type \"n\"; tail 2u/2u; v_cm, v_swing vdd/2; t0, offset, hyst 0 by default)"
    ),
    d!(
        "comparator",
        "comparator(#{a0, gbw: Hz, slew: V/s, v_swing: V, t0: s, offset: V, sigma_offset: V, c_in: F, hyst: V}) -> Comparator",
        "a behavioural comparator from explicit numbers (a0, gbw, slew, v_swing required)"
    ),
    d!(
        "pair_tradeoff",
        "p.pair_tradeoff(#{comparator keys except w and l…, w_over_l, areas: Series (m²)}) -> map",
        "offset σ (V) and input capacitance (F, at v_cm) versus input-pair gate area at a fixed W/L (w_over_l, default 4): #{area, offset, cap} of Series"
    ),
    d!("resistor", "p.resistor(layer: string, w: m, l: m) -> Resistor", "a resistor of a process layer, R0 = Rsh·L/W"),
    d!(
        "resistor",
        "resistor(#{r: Ω, tc1: 1/K, tc2: 1/K², vc: 1/V, tnom: °C}) -> Resistor",
        "a resistor from explicit numbers (coefficients 0, tnom 27 °C by default)"
    ),
    d!(
        "capacitor",
        "p.capacitor(kind: string, w: m, l: m) -> Capacitor",
        "a capacitor of a process type (e.g. \"mim\"), C0 = Ca·WL + Cp·2(W+L)"
    ),
    d!(
        "capacitor",
        "capacitor(#{c: F, vc1: 1/V, vc2: 1/V², tc1: 1/K, tc2: 1/K², tnom: °C}) -> Capacitor",
        "a capacitor from explicit numbers (coefficients 0, tnom 27 °C by default)"
    ),
    d!(
        "moscap",
        "p.moscap(type: \"n\"|\"p\", w: m, l: m) -> MosCap",
        "a MOS capacitor: gate against tied source, drain and bulk"
    ),
    // Transistor.
    d!(
        "id",
        "m.id(vgs: V|Series, vds: V, temp: °C) -> A",
        "drain current, all regions (EKV 1995 interpolation) with CLM and temperature; source at bulk"
    ),
    d!(
        "ids",
        "m.ids(vg: V, vs: V, vd: V, temp: °C) -> A",
        "drain current with bulk-referred terminal voltages (body effect through the slope factor)"
    ),
    d!("gm", "m.gm(vgs: V|Series, vds: V, temp: °C) -> S", "transconductance ∂Id/∂Vgs"),
    d!("gds", "m.gds(vgs: V|Series, vds: V, temp: °C) -> S", "output conductance ∂Id/∂Vds"),
    d!("ro", "m.ro(vgs: V|Series, vds: V, temp: °C) -> Ω", "output resistance 1/gds"),
    d!("gm_id", "m.gm_id(vgs: V|Series, vds: V, temp: °C) -> 1/V", "transconductance efficiency gm/Id"),
    d!(
        "ic",
        "m.ic(vgs: V|Series, temp: °C) -> float",
        "inversion coefficient Id/I_spec in saturation (< 0.1 weak, > 10 strong)"
    ),
    d!(
        "vdsat",
        "m.vdsat(vgs: V|Series, temp: °C) -> V",
        "saturation voltage 2U_T√(IC+1/4)+3U_T (EKV-based, Binkley 2008)"
    ),
    d!(
        "vgs_for",
        "m.vgs_for(id: A|Series, vds: V, temp: °C) -> V",
        "gate-source voltage that gives the drain current id"
    ),
    d!("ron", "m.ron(vgs: V|Series, temp: °C) -> Ω", "triode on-resistance at Vds = 0, source at bulk"),
    d!("vt", "m.vt(temp: °C) -> V", "threshold voltage (magnitude) at temp"),
    d!("beta", "m.beta(temp: °C) -> A/V²", "current factor µCox·W/L at temp"),
    d!("i_spec", "m.i_spec(temp: °C) -> A", "EKV specific current 2nβU_T²"),
    d!(
        "caps",
        "m.caps(vgs: V, vds: V, temp: °C) -> map",
        "gate capacitances #{cgs, cgd, cgb, total} in F (Meyer, smoothed across regions, with overlaps)"
    ),
    d!(
        "cj",
        "m.cj(v_reverse: V|Series) -> F",
        "capacitance of one source/drain diffusion to bulk (area + sidewall, Sze law)"
    ),
    d!(
        "with_mismatch",
        "m.with_mismatch(dvt: V, dbeta) -> Mos",
        "the device with a mismatch sample: threshold magnitude + dvt, current factor × (1 + dbeta)"
    ),
    d!("sigma_vt", "m.sigma_vt() -> V", "σ(ΔVT) of a pair of these devices (Pelgrom)"),
    d!("sigma_beta", "m.sigma_beta() -> float", "σ(Δβ/β) of a pair of these devices (Pelgrom)"),
    d!("w", "m.w() -> m", "drawn width"),
    d!("l", "m.l() -> m", "drawn length"),
    // Switch.
    d!(
        "ron",
        "s.ron(v_sig: V|Series) -> Ω",
        "switch on-resistance at signal voltage v_sig (body effect included; TG: both in parallel)"
    ),
    d!(
        "node_cap",
        "s.node_cap(v_node: V|Series) -> F",
        "capacitance the switch adds to a node at v_node in its state (junction + gate side)"
    ),
    d!(
        "injection",
        "s.injection(v_sig: V|Series, c_node: F) -> V",
        "node step from channel charge injection at turn-off (half the channel charge; NMOS negative)"
    ),
    d!(
        "feedthrough",
        "s.feedthrough(c_node: F) -> V",
        "node step from clock feedthrough through the gate overlap at turn-off"
    ),
    d!("pedestal", "s.pedestal(v_sig: V|Series, c_node: F) -> V", "injection plus feedthrough"),
    d!("on", "s.on() -> Switch", "the switch in its on state"),
    d!("off", "s.off() -> Switch", "the switch in its off state"),
    d!("at", "s.at(vdd: V, temp: °C) -> Switch", "the switch at another supply and temperature"),
    // Mirror.
    d!(
        "i_out",
        "mi.i_out(v_out: V|Series) -> A",
        "output current magnitude at output node voltage v_out (from ground), with compliance and Rout"
    ),
    d!("rout", "mi.rout(v_out: V|Series) -> Ω", "output resistance at v_out"),
    d!(
        "compliance",
        "mi.compliance() -> V",
        "lowest headroom from the mirror's rail with the current within 1 % of its saturation line"
    ),
    d!("compliance", "mi.compliance(tol) -> V", "the same within a fraction tol"),
    d!(
        "compliance_rout",
        "mi.compliance_rout(frac) -> V",
        "lowest headroom above which Rout stays at least frac (0..1) of its value at full headroom"
    ),
    d!("systematic_error", "mi.systematic_error(v_out: V|Series) -> float", "Iout/(ratio·Iref) − 1 at v_out"),
    d!("sigma_ratio", "mi.sigma_ratio() -> float", "σ of the current ratio from Pelgrom mismatch"),
    d!(
        "pair_mismatch",
        "pair_mismatch(high: Mirror, low: Mirror, v_node: V|Series) -> map",
        "charge (PMOS) versus discharge (NMOS) current: #{systematic, sigma} as fractions of their mean"
    ),
    // Comparator.
    d!(
        "delay",
        "c.delay(overdrive: V|Series) -> s",
        "delay after an input step of overdrive beyond the threshold (slew-limited and linear settling)"
    ),
    d!(
        "delay_ramp",
        "c.delay_ramp(slope: V/s|Series) -> s",
        "delay after the input crosses the threshold as a ramp (the oscillator case)"
    ),
    d!("input_cap", "c.input_cap(v_cm: V|Series) -> F", "input capacitance at common mode v_cm"),
    d!("offset", "c.offset() -> V", "systematic input offset"),
    d!("sigma_offset", "c.sigma_offset() -> V", "random input offset σ (Pelgrom)"),
    d!(
        "thresholds",
        "c.thresholds(v_ref: V) -> map",
        "#{falling, rising} switching thresholds with offset and hysteresis"
    ),
    d!("a0", "c.a0() -> V/V", "DC gain"),
    d!("gbw", "c.gbw() -> Hz", "gain-bandwidth product"),
    d!("slew", "c.slew() -> V/s", "output slew rate"),
    d!("tau", "c.tau() -> s", "time constant of the single pole A0/(2π·GBW)"),
    // Resistor and capacitors.
    d!(
        "r",
        "res.r(v: V|Series, temp: °C) -> Ω",
        "resistance at voltage v across it and temp: R0(1+TC1ΔT+TC2ΔT²)(1+VC|V|)"
    ),
    d!("r0", "res.r0() -> Ω", "resistance at tnom and 0 V"),
    d!(
        "sigma",
        "res.sigma() | cap.sigma() -> float",
        "σ(ΔR/R) or σ(ΔC/C) of a matched pair (Pelgrom-type matching coefficient)"
    ),
    d!(
        "c",
        "cap.c(v: V|Series, temp: °C) -> F",
        "capacitance at voltage v and temp: C0(1+VC1·V+VC2·V²)(1+TC1ΔT+TC2ΔT²); MosCap: gate C(V)"
    ),
    d!("c0", "cap.c0() -> F", "capacitance at tnom and 0 V"),
];

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
