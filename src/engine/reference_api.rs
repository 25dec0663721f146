//! Registration of the references: `ptat`, `ctat`, `constant_gm` (current keys), `ladder`,
//! `bandgap` (threshold keys), the mix of two current references (`+`), and a reference's
//! value at an operating point.
use super::value::{R, lift, to_f64};
use crate::engine::api;
use crate::physics::constants::check_temp;
use crate::timing::reference::Reference;
use rhai::{Dynamic, Engine, Map};

/// A number argument named in errors.
fn number(v: &Dynamic, what: &str) -> R<f64> {
    to_f64(v).map_err(|_| format!("{what} must be a number, found {}", v.type_name()).into())
}

/// Options of a reference function: only the known keys, each a number.
fn options(m: &Map, f: &str, known: &[(&str, f64)]) -> R<Vec<f64>> {
    for k in m.keys() {
        if !known.iter().any(|(n, _)| *n == k.as_str()) {
            let names: Vec<&str> = known.iter().map(|(n, _)| *n).collect();
            return Err(format!("{f}: unknown key '{k}'; known keys: {}", names.join(", ")).into());
        }
    }
    known
        .iter()
        .map(|(n, d)| match m.get(*n) {
            None if d.is_nan() => Err(format!("{f}: key '{n}' is required").into()),
            None => Ok(*d),
            Some(v) => number(v, &format!("{f}: key '{n}'")),
        })
        .collect()
}

pub fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Reference>("Reference");
    let show = |r: &mut Reference| format!("Reference({})", r.describe());
    engine.register_fn("to_string", show);
    engine.register_fn("to_debug", show);
    api::fun(
        engine,
        "ptat(i27: A) -> Reference",
        "a current key's value from a ΔVbe/R reference: i27·T/300.15 K (proportional to absolute temperature, i27 at 27 °C), e.g. osc(\"window\", #{i: ptat(750n), ...})",
        |i: Dynamic| -> R<Reference> { lift(Reference::ptat(number(&i, "ptat: i27")?, 0.0, 0.0)) },
    );
    api::fun(
        engine,
        "ptat(i27: A, #{tc1: 1/K, tc2: 1/K²}) -> Reference",
        "as ptat(i27), the reference's resistor having temperature coefficients tc1, tc2 about 27 °C: i27·(T/300.15 K)/(1 + tc1·ΔT + tc2·ΔT²)",
        |i: Dynamic, m: Map| -> R<Reference> {
            let v = options(&m, "ptat", &[("tc1", 0.0), ("tc2", 0.0)])?;
            lift(Reference::ptat(number(&i, "ptat: i27")?, v[0], v[1]))
        },
    );
    api::fun(
        engine,
        "ctat(i27: A, tc: 1/K) -> Reference",
        "a current key's value falling with temperature: i27·(1 + tc·(T − 27 °C)), tc in −5e-3…0 /K; ptat(a) + ctat(b, tc) mixes the two",
        |i: Dynamic, tc: Dynamic| -> R<Reference> {
            lift(Reference::ctat(number(&i, "ctat: i27")?, number(&tc, "ctat: tc")?))
        },
    );
    api::fun(
        engine,
        "constant_gm(#{r: Ω, kp: A/V², w: m, l: m, k: 1, mu_exp: 1, tc_r: 1/K}) -> Reference",
        "a current key's value from a beta-multiplier reference: 2(1 − 1/√k)²/(kp·(w/l)·r²) (square law), kp falling as (T/300.15 K)^−mu_exp (default 1.5), r with tempco tc_r (default 0); k > 1 (the width ratio), else it cannot start up",
        |m: Map| -> R<Reference> {
            let f = "constant_gm";
            let v = options(
                &m,
                f,
                &[
                    ("r", f64::NAN),
                    ("kp", f64::NAN),
                    ("w", f64::NAN),
                    ("l", f64::NAN),
                    ("k", f64::NAN),
                    ("mu_exp", 1.5),
                    ("tc_r", 0.0),
                ],
            )?;
            if !(v[5].is_finite() && (0.0..=3.0).contains(&v[5])) {
                return Err(format!("{f}: key 'mu_exp' must be in 0…3, got {}", v[5]).into());
            }
            if !(v[6].is_finite() && v[6].abs() <= 0.01) {
                return Err(format!("{f}: key 'tc_r' must be in −0.01…0.01 /K, got {}", v[6]).into());
            }
            if !(v[3].is_finite() && v[3] > 0.0) {
                return Err(format!("{f}: key 'l' must be > 0 m, got {}", v[3]).into());
            }
            lift(Reference::constant_gm(v[1], v[5], v[2] / v[3], v[4], v[0], v[6]))
        },
    );
    api::fun(
        engine,
        "ladder(frac: float) -> Reference",
        "a threshold key's value from a resistor ladder across the supply: frac·vdd, frac strictly inside 0…1, e.g. v_hi: ladder(0.75)",
        |x: Dynamic| -> R<Reference> { lift(Reference::ladder(number(&x, "ladder: frac")?)) },
    );
    api::fun(
        engine,
        "bandgap(v: V) -> Reference",
        "a threshold key's value from a bandgap-style reference with no tempco and perfect supply rejection (as bandgap(v, #{}))",
        |v: Dynamic| -> R<Reference> { lift(Reference::bandgap(number(&v, "bandgap: v")?, 0.0, 0.0, f64::INFINITY)) },
    );
    api::fun(
        engine,
        "bandgap(v: V, #{tc: 1/K, tc2: 1/K², psrr: dB}) -> Reference",
        "a threshold key's value from a bandgap-style reference: v·(1 + tc·ΔT + tc2·ΔT²) + Δvdd·10^(−psrr/20), ΔT from 27 °C, Δvdd from the oscillator's supply when it was built (defaults tc 0, tc2 0, psrr infinite)",
        |v: Dynamic, m: Map| -> R<Reference> {
            let o = options(&m, "bandgap", &[("tc", 0.0), ("tc2", 0.0), ("psrr", f64::INFINITY)])?;
            lift(Reference::bandgap(number(&v, "bandgap: v")?, o[0], o[1], o[2]))
        },
    );
    engine.register_fn("+", |a: Reference, b: Reference| -> R<Reference> { lift(a.plus(&b)) });
    api::fun(
        engine,
        "r.nominal() -> float",
        "the reference's value at 27 °C and the supply it was set at (1.8 V until an oscillator sets it), A or V",
        |r: &mut Reference| r.nominal(),
    );
    api::fun(
        engine,
        "r.at(temp: °C, vdd: V) -> float",
        "the reference's value at temp and supply vdd, A or V",
        |r: &mut Reference, t: Dynamic, v: Dynamic| -> R<f64> {
            let t = lift(check_temp(number(&t, "r.at: temp")?).map_err(|e| format!("r.at: {e}")))?;
            let v = number(&v, "r.at: vdd")?;
            let r = r.pinned(1.8);
            Ok(r.at(t, v))
        },
    );
}
