//! Comparators: behavioural, from an input pair, and the pair-area trade-off.
use super::{Opts, R, each, err, finite, lift, num};
use crate::engine::api;
use crate::physics::comparator::{Comparator, ComparatorSpec};
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Comparator>("Comparator");
    let text = |c: &mut Comparator| {
        format!("Comparator(a0 {:.4}, gbw {:.4e} Hz, slew {:.4e} V/s)", c.spec.a0, c.spec.gbw, c.spec.slew)
    };
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    api::fun(
        engine,
        "comparator(#{a0, gbw: Hz, slew: V/s, v_swing: V, t0: s, offset: V, sigma_offset: V, c_in: F, hyst: V}) -> Comparator",
        "a behavioural comparator from explicit numbers (a0, gbw, slew, v_swing required)",
        |m: Map| -> R<Comparator> {
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
        },
    );
    api::fun(
        engine,
        "c.delay(overdrive: V|Series) -> s",
        "delay after an input step of overdrive beyond the threshold (slew-limited and linear settling)",
        |c: &mut Comparator, od: Dynamic| -> R<Dynamic> {
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
        },
    );
    api::fun(
        engine,
        "c.delay_ramp(slope: V/s|Series) -> s",
        "delay after the input crosses the threshold as a ramp (the oscillator case)",
        |c: &mut Comparator, s: Dynamic| -> R<Dynamic> {
            each(&s, "slope", "c.delay_ramp", |v| {
                if v <= 0.0 {
                    return err(format!("c.delay_ramp: slope must be > 0 V/s, got {v}"));
                }
                finite(c.delay_ramp(v), "c.delay_ramp")
            })
        },
    );
    api::fun(
        engine,
        "c.input_cap(v_cm: V|Series) -> F",
        "input capacitance at common mode v_cm",
        |c: &mut Comparator, v: Dynamic| -> R<Dynamic> {
            each(&v, "v_cm", "c.input_cap", |x| finite(c.input_cap(x), "c.input_cap"))
        },
    );
    api::fun(engine, "c.offset() -> V", "systematic input offset", |c: &mut Comparator| c.offset());
    api::fun(engine, "c.sigma_offset() -> V", "random input offset σ (Pelgrom)", |c: &mut Comparator| {
        c.sigma_offset()
    });
    api::fun(
        engine,
        "c.thresholds(v_ref: V) -> map",
        "#{falling, rising} switching thresholds with offset and hysteresis",
        |c: &mut Comparator, v: Dynamic| -> R<Map> {
            let (lo, hi) = c.thresholds(num(&v, "c.thresholds: v_ref")?);
            let mut out = Map::new();
            out.insert("falling".into(), Dynamic::from_float(lo));
            out.insert("rising".into(), Dynamic::from_float(hi));
            Ok(out)
        },
    );
    api::fun(engine, "c.a0() -> V/V", "DC gain", |c: &mut Comparator| c.spec.a0);
    api::fun(engine, "c.gbw() -> Hz", "gain-bandwidth product", |c: &mut Comparator| c.spec.gbw);
    api::fun(engine, "c.slew() -> V/s", "output slew rate", |c: &mut Comparator| c.spec.slew);
    api::fun(engine, "c.tau() -> s", "time constant of the single pole A0/(2π·GBW)", |c: &mut Comparator| {
        c.spec.tau()
    });
}
