//! Comparators: behavioural, from an input pair, and the pair-area trade-off.
use super::{Opts, R, each, err, finite, lift, num};
use crate::physics::comparator::{Comparator, ComparatorSpec};
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Comparator>("Comparator");
    let text = |c: &mut Comparator| {
        format!("Comparator(a0 {:.4}, gbw {:.4e} Hz, slew {:.4e} V/s)", c.spec.a0, c.spec.gbw, c.spec.slew)
    };
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
