//! Processes: built-in and from TOML files, corners, operating point.
use super::super::session::Shared;
use super::{Opts, R, err, lift, num, pair_design, series_of};
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
    engine.register_fn("corners", |p: &mut Process| -> Array {
        p.corner_names().into_iter().map(Dynamic::from).collect()
    });
    engine.register_fn("corner", |p: &mut Process, name: &str| {
        lift(p.at_corner(name).map_err(|e| format!("corner: {e}")))
    });
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
    engine.register_fn(
        "mos_switch",
        |p: &mut Process, kind: &str, wn: Dynamic, wp: Dynamic, l: Dynamic| -> R<Switch> {
            if kind != "tg" {
                return err(format!("mos_switch: two widths are for kind \"tg\", got \"{kind}\""));
            }
            let (wn, wp, l) = (num(&wn, "mos_switch: w_n")?, num(&wp, "mos_switch: w_p")?, num(&l, "mos_switch: l")?);
            lift(Switch::from_process(p, SwitchKind::Tg, wn, wp, l).map_err(|e| format!("mos_switch: {e}")))
        },
    );
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
        let d = pair_design(&mut o, p, true)?;
        o.finish()?;
        lift(Comparator::from_pair(p, &d))
    });
    engine.register_fn("pair_tradeoff", |p: &mut Process, m: Map| -> R<Map> {
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
