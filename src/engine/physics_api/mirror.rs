//! Current mirrors and the charge/discharge pair mismatch.
use super::{Opts, R, each, err, finite, lift, num};
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
    engine.register_fn("mirror", |m: Map| -> R<Mirror> {
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
    });
    engine.register_fn("i_out", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_out", "mi.i_out", |x| finite(m.i_out(x), "mi.i_out"))
    });
    engine.register_fn("rout", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_out", "mi.rout", |x| finite(m.rout(x), "mi.rout"))
    });
    engine.register_fn("systematic_error", |m: &mut Mirror, v: Dynamic| -> R<Dynamic> {
        each(&v, "v_out", "mi.systematic_error", |x| finite(m.systematic_error(x), "mi.systematic_error"))
    });
    engine.register_fn("compliance", |m: &mut Mirror| -> R<f64> { lift(m.compliance(m.headroom(), 0.01)) });
    engine.register_fn("compliance", |m: &mut Mirror, tol: Dynamic| -> R<f64> {
        lift(m.compliance(m.headroom(), num(&tol, "mi.compliance: tol")?))
    });
    engine.register_fn("compliance_rout", |m: &mut Mirror, frac: Dynamic| -> R<f64> {
        lift(m.compliance_rout(m.headroom(), num(&frac, "mi.compliance_rout: frac")?))
    });
    engine.register_fn("sigma_ratio", |m: &mut Mirror| m.sigma_ratio());
    engine.register_fn("pair_mismatch", |h: Mirror, l: Mirror, v: Dynamic| -> R<Map> {
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
    });
}
