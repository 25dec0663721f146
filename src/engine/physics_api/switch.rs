//! MOS switches and transmission gates.
use super::{Opts, R, each, err, finite, lift, num};
use crate::engine::api;
use crate::physics::switch::Switch;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Switch>("Switch");
    let text = |s: &mut Switch| {
        format!("Switch({:?}, {}, vdd {} V, temp {} °C)", s.kind, if s.on { "on" } else { "off" }, s.vdd, s.temp)
    };
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    api::fun(
        engine,
        "mos_switch(#{ron: Ω, c_node: F, q_ch: C, c_ov: F, vdd: V}) -> Switch",
        "a switch from explicit numbers (c_node, q_ch, c_ov default 0; vdd 1.8)",
        |m: Map| -> R<Switch> {
            let mut o = Opts::new(&m, "mos_switch");
            let (ron, c, q, cov, vdd) =
                (o.req("ron")?, o.or("c_node", 0.0)?, o.or("q_ch", 0.0)?, o.or("c_ov", 0.0)?, o.or("vdd", 1.8)?);
            o.finish()?;
            lift(Switch::explicit(ron, c, q, cov, vdd))
        },
    );
    api::fun(
        engine,
        "sw.ron(v_sig: V|Series) -> Ω",
        "switch on-resistance at signal voltage v_sig (body effect included; TG: both in parallel)",
        |s: &mut Switch, v: Dynamic| -> R<Dynamic> { each(&v, "v_sig", "s.ron", |x| finite(s.ron(x), "s.ron")) },
    );
    api::fun(
        engine,
        "sw.node_cap(v_node: V|Series) -> F",
        "capacitance the switch adds to a node at v_node in its state (junction + gate side)",
        |s: &mut Switch, v: Dynamic| -> R<Dynamic> {
            each(&v, "v_node", "s.node_cap", |x| finite(s.node_cap(x), "s.node_cap"))
        },
    );
    let c_node = |c: &Dynamic, f: &str| -> R<f64> {
        let c = num(c, &format!("{f}: c_node"))?;
        if c <= 0.0 { err(format!("{f}: c_node must be > 0 F, got {c}")) } else { Ok(c) }
    };
    api::fun(
        engine,
        "sw.injection(v_sig: V|Series, c_node: F) -> V",
        "node step from channel charge injection at turn-off (half the channel charge; NMOS negative)",
        move |s: &mut Switch, v: Dynamic, c: Dynamic| -> R<Dynamic> {
            let c = c_node(&c, "s.injection")?;
            each(&v, "v_sig", "s.injection", |x| Ok(s.injection(x, c)))
        },
    );
    api::fun(
        engine,
        "sw.pedestal(v_sig: V|Series, c_node: F) -> V",
        "injection plus feedthrough",
        move |s: &mut Switch, v: Dynamic, c: Dynamic| -> R<Dynamic> {
            let c = c_node(&c, "s.pedestal")?;
            each(&v, "v_sig", "s.pedestal", |x| Ok(s.pedestal(x, c)))
        },
    );
    api::fun(
        engine,
        "sw.feedthrough(c_node: F) -> V",
        "node step from clock feedthrough through the gate overlap at turn-off",
        move |s: &mut Switch, c: Dynamic| -> R<f64> { Ok(s.feedthrough(c_node(&c, "s.feedthrough")?)) },
    );
    api::fun(engine, "sw.on() -> Switch", "the switch in its on state", |s: &mut Switch| s.with_on(true));
    api::fun(engine, "sw.off() -> Switch", "the switch in its off state", |s: &mut Switch| s.with_on(false));
    api::fun(
        engine,
        "sw.at(vdd: V, temp: °C) -> Switch",
        "the switch at another supply and temperature",
        |s: &mut Switch, vdd: Dynamic, t: Dynamic| -> R<Switch> {
            lift(s.at(num(&vdd, "s.at: vdd")?, num(&t, "s.at: temp")?).map_err(|e| format!("s.at: {e}")))
        },
    );
}
