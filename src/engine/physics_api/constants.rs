//! Physical constants and device laws: thermal voltage, junction capacitance, Pelgrom.
use super::{R, each, err, lift, num, temp};
use crate::engine::api;
use crate::physics::constants::thermal_voltage;
use crate::physics::junction::{self, junction_cap};
use crate::physics::mismatch::pelgrom;
use rhai::{Dynamic, Engine};

pub(super) fn register(engine: &mut Engine) {
    api::fun(
        engine,
        "thermal_voltage(temp: °C) -> V",
        "kT/q at temp (CODATA 2018 exact k and q); 25.85 mV at 26.85 °C",
        |t: Dynamic| -> R<f64> { Ok(thermal_voltage(temp(&t, "thermal_voltage")?)) },
    );
    api::fun(
        engine,
        "junction_cap(cj0: F, v_reverse: V, phi: V, m) -> F",
        "depletion capacitance Cj0/(1+Vr/φ)^m (Sze), linearised beyond φ/2 forward",
        |cj0: Dynamic, vr: Dynamic, phi: Dynamic, m: Dynamic| -> R<Dynamic> {
            let f = "junction_cap";
            let (cj0, phi, m) =
                (num(&cj0, "junction_cap: cj0")?, num(&phi, "junction_cap: phi")?, num(&m, "junction_cap: m")?);
            lift(junction::check(cj0, phi, m).map_err(|e| format!("{f}: {e}")))?;
            each(&vr, "v_reverse", f, |v| Ok(junction_cap(cj0, v, phi, m)))
        },
    );
    api::fun(
        engine,
        "pelgrom(a, w: m, l: m) -> float",
        "σ of a matched pair's difference A/√(WL) (Pelgrom 1989): A_VT in V·m gives V, A_β in m gives a fraction",
        |a: Dynamic, w: Dynamic, l: Dynamic| -> R<f64> {
            let a = num(&a, "pelgrom: a")?;
            let (w, l) = (num(&w, "pelgrom: w")?, num(&l, "pelgrom: l")?);
            if a < 0.0 || w <= 0.0 || l <= 0.0 {
                return err(format!("pelgrom: need a ≥ 0, w > 0 m, l > 0 m; got a = {a}, w = {w}, l = {l}"));
            }
            Ok(pelgrom(a, w, l))
        },
    );
}
