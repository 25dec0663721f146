//! Resistors and capacitors.
use super::{Opts, R, each, finite, lift, temp};
use crate::engine::api;
use crate::physics::capacitor::{Capacitor, MosCap};
use crate::physics::resistor::Resistor;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
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
    api::fun(
        engine,
        "resistor(#{r: Ω, tc1: 1/K, tc2: 1/K², vc: 1/V, tnom: °C}) -> Resistor",
        "a resistor from explicit numbers (coefficients 0, tnom 27 °C by default)",
        |m: Map| -> R<Resistor> {
            let mut o = Opts::new(&m, "resistor");
            let (r, tc1, tc2, vc, tnom) =
                (o.req("r")?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("vc", 0.0)?, o.or("tnom", 27.0)?);
            o.finish()?;
            lift(Resistor::new(r, tc1, tc2, vc, tnom))
        },
    );
    api::fun(
        engine,
        "capacitor(#{c: F, vc1: 1/V, vc2: 1/V², tc1: 1/K, tc2: 1/K², tnom: °C}) -> Capacitor",
        "a capacitor from explicit numbers (coefficients 0, tnom 27 °C by default)",
        |m: Map| -> R<Capacitor> {
            let mut o = Opts::new(&m, "capacitor");
            let c = o.req("c")?;
            let (vc1, vc2, tc1, tc2, tnom) =
                (o.or("vc1", 0.0)?, o.or("vc2", 0.0)?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("tnom", 27.0)?);
            o.finish()?;
            lift(Capacitor::new(c, vc1, vc2, tc1, tc2, tnom))
        },
    );
    api::fun(
        engine,
        "res.r(v: V|Series, temp: °C) -> Ω",
        "resistance at voltage v across it and temp: R0(1+TC1ΔT+TC2ΔT²)(1+VC|V|)",
        |r: &mut Resistor, v: Dynamic, t: Dynamic| -> R<Dynamic> {
            let t = temp(&t, "res.r")?;
            each(&v, "v", "res.r", |x| finite(r.r(x, t), "res.r"))
        },
    );
    api::fun(engine, "res.r0() -> Ω", "resistance at tnom and 0 V", |r: &mut Resistor| r.r0);
    api::fun(
        engine,
        "res.sigma() -> float",
        "σ(ΔR/R) of a matched pair (Pelgrom-type matching coefficient)",
        |r: &mut Resistor| r.sigma,
    );
    api::fun(
        engine,
        "cap.c(v: V|Series, temp: °C) -> F",
        "capacitance at voltage v and temp: C0(1+VC1·V+VC2·V²)(1+TC1ΔT+TC2ΔT²)",
        |c: &mut Capacitor, v: Dynamic, t: Dynamic| -> R<Dynamic> {
            let t = temp(&t, "cap.c")?;
            each(&v, "v", "cap.c", |x| finite(c.c(x, t), "cap.c"))
        },
    );
    api::fun(engine, "cap.c0() -> F", "capacitance at tnom and 0 V", |c: &mut Capacitor| c.c0);
    api::fun(
        engine,
        "cap.sigma() -> float",
        "σ(ΔC/C) of a matched pair (Pelgrom-type matching coefficient)",
        |c: &mut Capacitor| c.sigma,
    );
    api::fun(
        engine,
        "mcap.c(v: V|Series, temp: °C) -> F",
        "gate capacitance of a MOS capacitor at gate voltage v and temp",
        |c: &mut MosCap, v: Dynamic, t: Dynamic| -> R<Dynamic> {
            let t = temp(&t, "moscap.c")?;
            each(&v, "v", "moscap.c", |x| finite(c.c(x, t), "moscap.c"))
        },
    );
}
