//! Current mirrors and the charge/discharge pair mismatch.
use super::{Opts, R, each, err, finite, lift, num};
use crate::engine::api;
use crate::num::Series;
use crate::physics::mirror::{Mirror, pair_mismatch};
use crate::physics::mosfet::MosType;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Mirror>("Mirror");
    let text =
        |m: &mut Mirror| format!("Mirror({:?}, {}, i_ref {} A, ratio {})", m.kind, m.polarity.name(), m.i_ref, m.ratio);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    api::fun(
        engine,
        "mirror(#{i_out: A, rout: Ω, v_compliance: V, sigma, type, vdd: V}) -> Mirror",
        "a behavioural mirror from explicit numbers (sigma: σ of the ratio, default 0); type \"p\" with vdd for a high-side source",
        |m: Map| -> R<Mirror> {
            let mut o = Opts::new(&m, "mirror");
            let (i, r, vc, s) = (o.req("i_out")?, o.req("rout")?, o.req("v_compliance")?, o.or("sigma", 0.0)?);
            let ty = lift(MosType::parse(&o.text("type", "n")?).map_err(|e| format!("mirror: key 'type': {e}")))?;
            let vdd = o.get("vdd").cloned();
            o.finish()?;
            let m = lift(Mirror::explicit(i, r, vc, s))?;
            match (ty, vdd) {
                (MosType::N, None) => Ok(m),
                (MosType::N, Some(_)) => err("mirror: key 'vdd' is for a sourcing mirror (type \"p\")"),
                (MosType::P, None) => err("mirror: a sourcing mirror (type \"p\") needs key 'vdd'"),
                (MosType::P, Some(v)) => lift(m.sourcing(num(&v, "mirror: key 'vdd'")?)),
            }
        },
    );
    api::fun(
        engine,
        "mi.i_out(v_out: V|Series) -> A",
        "output current magnitude at output node voltage v_out (from ground), with compliance and Rout",
        |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
            each(&v, "v_out", "mi.i_out", |x| finite(m.i_out(x), "mi.i_out"))
        },
    );
    api::fun(
        engine,
        "mi.rout(v_out: V|Series) -> Ω",
        "output resistance at v_out",
        |m: &mut Mirror, v: Dynamic| -> R<Dynamic> { each(&v, "v_out", "mi.rout", |x| finite(m.rout(x), "mi.rout")) },
    );
    api::fun(
        engine,
        "mi.systematic_error(v_out: V|Series) -> float",
        "Iout/(ratio·Iref) − 1 at v_out",
        |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
            each(&v, "v_out", "mi.systematic_error", |x| finite(m.systematic_error(x), "mi.systematic_error"))
        },
    );
    api::fun(
        engine,
        "mi.compliance() -> V",
        "lowest headroom from the mirror's rail with the current within 1 % of its saturation line",
        |m: &mut Mirror| -> R<f64> { lift(m.compliance(m.headroom(), 0.01)) },
    );
    api::fun(
        engine,
        "mi.compliance(tol) -> V",
        "the same within a fraction tol",
        |m: &mut Mirror, tol: Dynamic| -> R<f64> { lift(m.compliance(m.headroom(), num(&tol, "mi.compliance: tol")?)) },
    );
    api::fun(
        engine,
        "mi.compliance_rout(frac) -> V",
        "lowest headroom above which Rout stays at least frac (0..1) of its value at full headroom",
        |m: &mut Mirror, frac: Dynamic| -> R<f64> {
            lift(m.compliance_rout(m.headroom(), num(&frac, "mi.compliance_rout: frac")?))
        },
    );
    api::fun(engine, "mi.sigma_ratio() -> float", "σ of the current ratio from Pelgrom mismatch", |m: &mut Mirror| {
        m.sigma_ratio()
    });
    api::fun(
        engine,
        "pair_mismatch(high: Mirror, low: Mirror, v_node: V|Series) -> map",
        "charge (PMOS) versus discharge (NMOS) current: #{systematic, sigma} as fractions of their mean",
        |h: Mirror, l: Mirror, v: Dynamic| -> R<Map> {
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
        },
    );
}
