//! MOS switches and transmission gates.
use super::{Opts, R, each, err, finite, lift, num};
use crate::physics::switch::Switch;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Switch>("Switch");
    let text = |s: &mut Switch| {
        format!("Switch({:?}, {}, vdd {} V, temp {} °C)", s.kind, if s.on { "on" } else { "off" }, s.vdd, s.temp)
    };
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    engine.register_fn("mos_switch", |m: Map| -> R<Switch> {
        let mut o = Opts::new(&m, "mos_switch");
        let (ron, c, q, cov, vdd) =
            (o.req("ron")?, o.or("c_node", 0.0)?, o.or("q_ch", 0.0)?, o.or("c_ov", 0.0)?, o.or("vdd", 1.8)?);
        o.finish()?;
        lift(Switch::explicit(ron, c, q, cov, vdd))
    });
    engine.register_fn("ron", |s: &mut Switch, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_sig", "s.ron", |x| finite(s.ron(x), "s.ron"))
    });
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
    engine.register_fn("feedthrough", move |s: &mut Switch, c: Dynamic| -> R<f64> {
        Ok(s.feedthrough(c_node(&c, "s.feedthrough")?))
    });
    engine.register_fn("on", |s: &mut Switch| s.with_on(true));
    engine.register_fn("off", |s: &mut Switch| s.with_on(false));
    engine.register_fn("at", |s: &mut Switch, vdd: Dynamic, t: Dynamic| -> R<Switch> {
        lift(s.at(num(&vdd, "s.at: vdd")?, num(&t, "s.at: temp")?).map_err(|e| format!("s.at: {e}")))
    });
}
