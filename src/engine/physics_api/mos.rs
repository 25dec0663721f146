//! Transistors: currents, small-signal quantities, capacitances, mismatch.
use super::{R, each, finite, lift, num, temp};
use crate::physics::mosfet::Mos;
use rhai::{Dynamic, Engine, Map};

pub(super) fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Mos>("Mos");
    let text = |m: &mut Mos| format!("Mos({}, W {} µm, L {} µm)", m.kind.name(), m.w * 1e6, m.l * 1e6);
    engine.register_fn("to_string", text);
    engine.register_fn("to_debug", text);
    macro_rules! iv {
        ($name:literal, $what:literal, $f:expr) => {
            engine.register_fn($name, |m: &mut Mos, x: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let (vds, t) = (num(&vds, &format!("{f}: vds"))?, temp(&t, f)?);
                let g = $f;
                each(&x, $what, f, |v| finite(g(&*m, v, vds, t), f))
            });
        };
    }
    iv!("id", "vgs", |m: &Mos, v, vds, t| m.id(v, vds, t));
    iv!("gm", "vgs", |m: &Mos, v, vds, t| m.gm(v, vds, t));
    iv!("gds", "vgs", |m: &Mos, v, vds, t| m.gds(v, vds, t));
    iv!("ro", "vgs", |m: &Mos, v, vds, t| m.ro(v, vds, t));
    iv!("gm_id", "vgs", |m: &Mos, v, vds, t| m.gm_id(v, vds, t));
    engine.register_fn("vgs_for", |m: &mut Mos, id: Dynamic, vds: Dynamic, t: Dynamic| -> R<Dynamic> {
        let f = "m.vgs_for";
        let (vds, t) = (num(&vds, "m.vgs_for: vds")?, temp(&t, f)?);
        each(&id, "id", f, |i| lift(m.vgs_for(i, vds, t)))
    });
    engine.register_fn("ids", |m: &mut Mos, vg: Dynamic, vs: Dynamic, vd: Dynamic, t: Dynamic| -> R<f64> {
        let f = "m.ids";
        let (vg, vs, vd) = (num(&vg, "m.ids: vg")?, num(&vs, "m.ids: vs")?, num(&vd, "m.ids: vd")?);
        finite(m.ids(vg, vs, vd, temp(&t, f)?), f)
    });
    macro_rules! vt {
        ($name:literal, $f:expr) => {
            engine.register_fn($name, |m: &mut Mos, x: Dynamic, t: Dynamic| -> R<Dynamic> {
                let f = concat!("m.", $name);
                let t = temp(&t, f)?;
                let g = $f;
                each(&x, "vgs", f, |v| finite(g(&*m, v, t), f))
            });
        };
    }
    vt!("ic", |m: &Mos, v, t| m.ic(v, t));
    vt!("vdsat", |m: &Mos, v, t| m.vdsat(v, t));
    vt!("ron", |m: &Mos, v, t| m.ron(v, t));
    engine.register_fn("vt", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.vt(temp(&t, "m.vt")?)) });
    engine.register_fn("beta", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.beta(temp(&t, "m.beta")?)) });
    engine.register_fn("i_spec", |m: &mut Mos, t: Dynamic| -> R<f64> { Ok(m.i_spec(temp(&t, "m.i_spec")?)) });
    engine.register_fn("caps", |m: &mut Mos, vgs: Dynamic, vds: Dynamic, t: Dynamic| -> R<Map> {
        let c = m.caps(num(&vgs, "m.caps: vgs")?, num(&vds, "m.caps: vds")?, temp(&t, "m.caps")?);
        let mut out = Map::new();
        for (k, v) in [("cgs", c.cgs), ("cgd", c.cgd), ("cgb", c.cgb), ("total", c.total())] {
            out.insert(k.into(), Dynamic::from_float(v));
        }
        Ok(out)
    });
    engine.register_fn("cj", |m: &mut Mos, vr: Dynamic| -> R<Dynamic> {
        each(&vr, "v_reverse", "m.cj", |v| Ok(m.cj_diffusion(v)))
    });
    engine.register_fn("with_mismatch", |m: &mut Mos, dvt: Dynamic, db: Dynamic| -> R<Mos> {
        lift(m.with_mismatch(num(&dvt, "m.with_mismatch: dvt")?, num(&db, "m.with_mismatch: dbeta")?))
    });
    engine.register_fn("sigma_vt", |m: &mut Mos| m.sigma_vt());
    engine.register_fn("sigma_beta", |m: &mut Mos| m.sigma_beta());
    engine.register_fn("w", |m: &mut Mos| m.w);
    engine.register_fn("l", |m: &mut Mos| m.l);
}
