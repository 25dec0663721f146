//! Resistors and capacitors.
use super::{Opts, R, each, finite, lift, temp};
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
    engine.register_fn("resistor", |m: Map| -> R<Resistor> {
        let mut o = Opts::new(&m, "resistor");
        let (r, tc1, tc2, vc, tnom) =
            (o.req("r")?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("vc", 0.0)?, o.or("tnom", 27.0)?);
        o.finish()?;
        lift(Resistor::new(r, tc1, tc2, vc, tnom))
    });
    engine.register_fn("capacitor", |m: Map| -> R<Capacitor> {
        let mut o = Opts::new(&m, "capacitor");
        let c = o.req("c")?;
        let (vc1, vc2, tc1, tc2, tnom) =
            (o.or("vc1", 0.0)?, o.or("vc2", 0.0)?, o.or("tc1", 0.0)?, o.or("tc2", 0.0)?, o.or("tnom", 27.0)?);
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
