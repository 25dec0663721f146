//! Transistors: currents, small-signal quantities, capacitances, mismatch.
use super::{R, each, finite, lift, num, temp};
use crate::engine::api;
use crate::physics::mosfet::Mos;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Mos>("Mos");
    let text = |m: &mut Mos| format!("Mos({}, W {} µm, L {} µm)", m.kind.name(), m.w * 1e6, m.l * 1e6);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    macro_rules! iv {
        ($name:literal, $sig:literal, $sum:literal, $what:literal, $f:expr) => {
            api::fun(engine, $sig, $sum, |m: &mut Mos, x: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let (vds, t) = (num(&vds, &format!("{f}: vds"))?, temp(&t, f)?);
                let g = $f;
                each(&x, $what, f, |v| finite(g(&*m, v, vds, t), f))
            });
        };
    }
    iv!(
        "id",
        "m.id(vgs: V|Series, vds: V, temp: °C) -> A",
        "drain current, all regions (EKV 1995 interpolation) with CLM and temperature; source at bulk",
        "vgs",
        |m: &Mos, v, vds, t| m.id(v, vds, t)
    );
    iv!(
        "gm",
        "m.gm(vgs: V|Series, vds: V, temp: °C) -> S",
        "transconductance ∂Id/∂Vgs",
        "vgs",
        |m: &Mos, v, vds, t| m.gm(v, vds, t)
    );
    iv!(
        "gds",
        "m.gds(vgs: V|Series, vds: V, temp: °C) -> S",
        "output conductance ∂Id/∂Vds",
        "vgs",
        |m: &Mos, v, vds, t| m.gds(v, vds, t)
    );
    iv!(
        "ro",
        "m.ro(vgs: V|Series, vds: V, temp: °C) -> Ω",
        "output resistance 1/gds",
        "vgs",
        |m: &Mos, v, vds, t| m.ro(v, vds, t)
    );
    iv!(
        "gm_id",
        "m.gm_id(vgs: V|Series, vds: V, temp: °C) -> 1/V",
        "transconductance efficiency gm/Id",
        "vgs",
        |m: &Mos, v, vds, t| m.gm_id(v, vds, t)
    );
    api::fun(
        engine,
        "m.vgs_for(id: A|Series, vds: V, temp: °C) -> V",
        "gate-source voltage that gives the drain current id",
        |m: &mut Mos, id: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
            let f = "m.vgs_for";
            let (vds, t) = (num(&vds, "m.vgs_for: vds")?, temp(&t, f)?);
            each(&id, "id", f, |i| lift(m.vgs_for(i, vds, t)))
        },
    );
    api::fun(
        engine,
        "m.ids(vg: V, vs: V, vd: V, temp: °C) -> A",
        "drain current with bulk-referred terminal voltages (body effect through the slope factor)",
        |m: &mut Mos, vg: Dynamic, vs: Dynamic, vd: Dynamic, t: Dynamic| -> R<f64> {
            let f = "m.ids";
            let (vg, vs, vd) = (num(&vg, "m.ids: vg")?, num(&vs, "m.ids: vs")?, num(&vd, "m.ids: vd")?);
            finite(m.ids(vg, vs, vd, temp(&t, f)?), f)
        },
    );
    macro_rules! vt {
        ($name:literal, $sig:literal, $sum:literal, $f:expr) => {
            api::fun(engine, $sig, $sum, |m: &mut Mos, x: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let t = temp(&t, f)?;
                let g = $f;
                each(&x, "vgs", f, |v| finite(g(&*m, v, t), f))
            });
        };
    }
    vt!(
        "ic",
        "m.ic(vgs: V|Series, temp: °C) -> float",
        "inversion coefficient Id/I_spec in saturation (< 0.1 weak, > 10 strong)",
        |m: &Mos, v, t| m.ic(v, t)
    );
    vt!(
        "vdsat",
        "m.vdsat(vgs: V|Series, temp: °C) -> V",
        "saturation voltage 2U_T√(IC+1/4)+3U_T (EKV-based, Binkley 2008)",
        |m: &Mos, v, t| m.vdsat(v, t)
    );
    vt!(
        "ron",
        "m.ron(vgs: V|Series, temp: °C) -> Ω",
        "triode on-resistance at Vds = 0, source at bulk",
        |m: &Mos, v, t| m.ron(v, t)
    );
    api::fun(
        engine,
        "m.vt(temp: °C) -> V",
        "threshold voltage (magnitude) at temp",
        |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.vt(temp(&t, "m.vt")?)) },
    );
    api::fun(
        engine,
        "m.beta(temp: °C) -> A/V²",
        "current factor µCox·W/L at temp",
        |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.beta(temp(&t, "m.beta")?)) },
    );
    api::fun(
        engine,
        "m.i_spec(temp: °C) -> A",
        "EKV specific current 2nβU_T²",
        |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.i_spec(temp(&t, "m.i_spec")?)) },
    );
    api::fun(
        engine,
        "m.caps(vgs: V, vds: V, temp: °C) -> map",
        "gate capacitances #{cgs, cgd, cgb, total} in F (Meyer, smoothed across regions, with overlaps)",
        |m: &mut Mos, vgs: Dynamic, vds: Dynamic, t: Dynamic| -> R<Map> {
            let c = m.caps(num(&vgs, "m.caps: vgs")?, num(&vds, "m.caps: vds")?, temp(&t, "m.caps")?);
            let mut out = Map::new();
            for (k, v) in [("cgs", c.cgs), ("cgd", c.cgd), ("cgb", c.cgb), ("total", c.total())] {
                out.insert(k.into(), Dynamic::from_float(v));
            }
            Ok(out)
        },
    );
    api::fun(
        engine,
        "m.cj(v_reverse: V|Series) -> F",
        "capacitance of one source/drain diffusion to bulk (area + sidewall, Sze law)",
        |m: &mut Mos, vr: Dynamic| -> R<Dynamic> { each(&vr, "v_reverse", "m.cj", |v| Ok(m.cj_diffusion(v))) },
    );
    api::fun(
        engine,
        "m.with_mismatch(dvt: V, dbeta) -> Mos",
        "the device with a mismatch sample: threshold magnitude + dvt, current factor × (1 + dbeta)",
        |m: &mut Mos, dvt: Dynamic, db: Dynamic| -> R<Mos> {
            lift(m.with_mismatch(num(&dvt, "m.with_mismatch: dvt")?, num(&db, "m.with_mismatch: dbeta")?))
        },
    );
    api::fun(engine, "m.sigma_vt() -> V", "σ(ΔVT) of a pair of these devices (Pelgrom)", |m: &mut Mos| m.sigma_vt());
    api::fun(engine, "m.sigma_beta() -> float", "σ(Δβ/β) of a pair of these devices (Pelgrom)", |m: &mut Mos| {
        m.sigma_beta()
    });
    api::fun(engine, "m.w() -> m", "drawn width", |m: &mut Mos| m.w);
    api::fun(engine, "m.l() -> m", "drawn length", |m: &mut Mos| m.l);
}
