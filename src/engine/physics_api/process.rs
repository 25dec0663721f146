//! Processes: built-in and from TOML files, corners, operating point.
use super::super::session::Shared;
use super::{Opts, R, err, lift, num, pair_design, series_of, temp};
use crate::engine::api;
use crate::num::Series;
use crate::physics::capacitor::{Capacitor, MosCap};
use crate::physics::comparator::{Comparator, pair_tradeoff};
use crate::physics::mirror::{Mirror, MirrorKind};
use crate::physics::mosfet::{Mos, MosType};
use crate::physics::process::Process;
use crate::physics::resistor::Resistor;
use crate::physics::switch::{Switch, SwitchKind};
use rhai::{Array, Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine, session: &Shared) {
    engine.register_type_with_name::<Process>("Process");
    engine.register_fn("to_string", |p: &mut Process| process_text(p));
    engine.register_fn("to_debug", |p: &mut Process| process_text(p));
    api::fun(
        engine,
        "process(name: string) -> Process",
        "a built-in process; \"demo180\" is the generic 180 nm, 1.8 V demo (invented numbers)",
        |name: &str| lift(Process::builtin(name).map_err(|e| format!("process: {e}"))),
    );
    let s = session.clone();
    api::fun(
        engine,
        "process_file(path: string) -> Process",
        "a process from a TOML file (docs/process-format.md), path relative to the script; recorded in the report's provenance",
        move |path: &str| -> R<Process> {
            let text = s.lock().read_input(path).map_err(|e| format!("process_file: {e}"))?;
            lift(Process::from_toml(&text, path).map_err(|e| format!("process_file: {e}")))
        },
    );
    api::fun(engine, "p.name() -> string", "process name", |p: &mut Process| p.name.clone());
    api::fun(engine, "p.vdd() -> V", "supply of the process (or of its applied corner)", |p: &mut Process| p.vdd);
    api::fun(
        engine,
        "p.vbe(temp: °C) -> V",
        "base–emitter voltage of the process's vertical bipolar at temp (Tsividis 1980: V_G0 − (T/T_r)(V_G0 − Vbe(T_r)) − η·U_T·ln(T/T_r)); needs a [bipolar] section",
        |p: &mut Process, t: Dynamic| -> R<f64> {
            let t = temp(&t, "p.vbe")?;
            match &p.bipolar {
                Some(b) => Ok(b.vbe(t)),
                None => Err(format!("p.vbe: process '{}' has no [bipolar] section", p.name).into()),
            }
        },
    );
    api::fun(engine, "p.temp() -> °C", "temperature of the applied corner (tnom when none)", |p: &mut Process| p.temp);
    api::fun(engine, "p.tnom() -> °C", "temperature at which the process parameters are given", |p: &mut Process| {
        p.tnom
    });
    api::fun(engine, "p.corner_name() -> string", "name of the applied corner, \"\" for nominal", |p: &mut Process| {
        p.corner.clone()
    });
    api::fun(engine, "p.corners() -> array", "names of the corners the process defines", |p: &mut Process| -> Array {
        p.corner_names().into_iter().map(Dynamic::from).collect()
    });
    api::fun(
        engine,
        "p.corner(name: string) -> Process",
        "the process at a named corner: device shifts, R and C factors, supply and temperature",
        |p: &mut Process, name: &str| lift(p.at_corner(name).map_err(|e| format!("corner: {e}"))),
    );
    api::fun(
        engine,
        "p.with_vdd(vdd: V) -> Process",
        "the process at another supply (devices made from it use it)",
        |p: &mut Process, v: Dynamic| -> R<Process> {
            lift(p.with_vdd(num(&v, "with_vdd: vdd")?).map_err(|e| format!("with_vdd: {e}")))
        },
    );
    api::fun(
        engine,
        "p.with_temp(temp: °C) -> Process",
        "the process at another temperature (switches, mirrors, comparators made from it use it)",
        |p: &mut Process, t: Dynamic| -> R<Process> {
            lift(p.with_temp(num(&t, "with_temp: temp")?).map_err(|e| format!("with_temp: {e}")))
        },
    );
    for (name, sig, summary, kind) in [
        ("nmos", "p.nmos(w: m, l: m) -> Mos", "an NMOS transistor of the process", MosType::N),
        (
            "pmos",
            "p.pmos(w: m, l: m) -> Mos",
            "a PMOS transistor of the process (methods take magnitudes Vsg, Vsd and give |Id|)",
            MosType::P,
        ),
    ] {
        api::fun(engine, sig, summary, move |p: &mut Process, w: Dynamic, l: Dynamic| -> R<Mos> {
            let (w, l) = (num(&w, &format!("{name}: w"))?, num(&l, &format!("{name}: l"))?);
            lift(Mos::from_process(p, kind, w, l))
        });
    }
    api::fun(
        engine,
        "p.mos_switch(kind: \"n\"|\"p\", w: m, l: m) -> Switch",
        "an NMOS or PMOS switch (off; .on() for the on state)",
        |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<Switch> {
            let k = lift(SwitchKind::parse(kind).map_err(|e| format!("mos_switch: {e}")))?;
            if k == SwitchKind::Tg {
                return err("mos_switch: a transmission gate needs both widths: p.mos_switch(\"tg\", w_n, w_p, l)");
            }
            let (w, l) = (num(&w, "mos_switch: w")?, num(&l, "mos_switch: l")?);
            lift(Switch::from_process(p, k, w, w, l).map_err(|e| format!("mos_switch: {e}")))
        },
    );
    api::fun(
        engine,
        "p.mos_switch(\"tg\", w_n: m, w_p: m, l: m) -> Switch",
        "a transmission gate of an NMOS of w_n and a PMOS of w_p",
        |p: &mut Process, kind: &str, wn: Dynamic, wp: Dynamic, l: Dynamic| -> R<Switch> {
            if kind != "tg" {
                return err(format!("mos_switch: two widths are for kind \"tg\", got \"{kind}\""));
            }
            let (wn, wp, l) = (num(&wn, "mos_switch: w_n")?, num(&wp, "mos_switch: w_p")?, num(&l, "mos_switch: l")?);
            lift(Switch::from_process(p, SwitchKind::Tg, wn, wp, l).map_err(|e| format!("mos_switch: {e}")))
        },
    );
    api::fun(
        engine,
        "p.mirror(#{kind, type, i_ref: A, ratio, w: m, l: m, margin: V}) -> Mirror",
        "a current mirror: kind \"simple\"|\"cascode\"|\"wide-swing\", type \"n\" (sink) or \"p\" (source); ratio 1, margin 0.1 V by default",
        |p: &mut Process, m: Map| -> R<Mirror> {
            let mut o = Opts::new(&m, "mirror");
            let kind =
                lift(MirrorKind::parse(&o.text("kind", "simple")?).map_err(|e| format!("mirror: key 'kind': {e}")))?;
            let ty = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("mirror: key 'type': {e}")))?;
            let (i_ref, ratio) = (o.req("i_ref")?, o.or("ratio", 1.0)?);
            let (w, l, margin) = (o.req("w")?, o.req("l")?, o.or("margin", 0.1)?);
            o.finish()?;
            lift(Mirror::from_process(p, kind, ty, i_ref, ratio, w, l, margin))
        },
    );
    api::fun(
        engine,
        "p.comparator(#{type, w: m, l: m, i_tail: A, c_load: F, tail_w: m, tail_l: m, v_cm: V, v_swing: V, t0: s, offset: V, hyst: V}) -> Comparator",
        "a comparator from an input pair of the process (type \"n\"; tail 2u/2u; v_cm, v_swing vdd/2; t0, offset, hyst 0 by default)",
        |p: &mut Process, m: Map| -> R<Comparator> {
            let mut o = Opts::new(&m, "comparator");
            let d = pair_design(&mut o, p, true)?;
            o.finish()?;
            lift(Comparator::from_pair(p, &d))
        },
    );
    api::fun(
        engine,
        "p.pair_tradeoff(#{comparator keys except w and l…, w_over_l, areas: Series (m²)}) -> map",
        "offset σ (V) and input capacitance (F, at v_cm) versus input-pair gate area at a fixed W/L (w_over_l, default 4): #{area, offset, cap} of Series",
        |p: &mut Process, m: Map| -> R<Map> {
            let mut o = Opts::new(&m, "pair_tradeoff");
            let d = pair_design(&mut o, p, false)?;
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
        },
    );
    api::fun(
        engine,
        "p.resistor(layer: string, w: m, l: m) -> Resistor",
        "a resistor of a process layer, R0 = Rsh·L/W",
        |p: &mut Process, layer: &str, w: Dynamic, l: Dynamic| -> R<Resistor> {
            lift(Resistor::from_process(p, layer, num(&w, "resistor: w")?, num(&l, "resistor: l")?))
        },
    );
    api::fun(
        engine,
        "p.capacitor(kind: string, w: m, l: m) -> Capacitor",
        "a capacitor of a process type (e.g. \"mim\"), C0 = Ca·WL + Cp·2(W+L)",
        |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<Capacitor> {
            lift(Capacitor::from_process(p, kind, num(&w, "capacitor: w")?, num(&l, "capacitor: l")?))
        },
    );
    api::fun(
        engine,
        "p.moscap(type: \"n\"|\"p\", w: m, l: m) -> MosCap",
        "a MOS capacitor: gate against tied source, drain and bulk",
        |p: &mut Process, kind: &str, w: Dynamic, l: Dynamic| -> R<MosCap> {
            let k = lift(MosType::parse(kind).map_err(|e| format!("moscap: {e}")))?;
            lift(MosCap::from_process(p, k, num(&w, "moscap: w")?, num(&l, "moscap: l")?))
        },
    );
}

fn process_text(p: &Process) -> String {
    let c = if p.corner.is_empty() { String::new() } else { format!(", corner {}", p.corner) };
    format!("Process({}{c}, vdd {} V, temp {} °C)", p.name, p.vdd, p.temp)
}
