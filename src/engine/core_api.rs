//! Core script functions: engineering formatting, section markers and `--set` overrides.
use super::value::R;
use crate::engine::api;
use rhai::{Dynamic, Engine};

use super::prepass::{OVERRIDE_FN, SECTION_FN};
use super::session::Shared;
use super::value::to_f64;
use crate::num::si::{eng, parse_number};

pub fn register(engine: &mut Engine, shared: &Shared) {
    let x_of = |x: &Dynamic| -> R<f64> {
        to_f64(x).map_err(|_| format!("eng: x must be a number, found {}", x.type_name()).into())
    };
    api::fun(
        engine,
        "eng(x: float) -> string",
        "engineering notation with an SI prefix, 3 significant digits: eng(4700) → \"4.70k\"",
        move |x: Dynamic| -> R<String> { Ok(eng(x_of(&x)?, "", 3)) },
    );
    api::fun(
        engine,
        "eng(x: float, unit: string) -> string",
        "with a unit: eng(3.33e-6, \"s\") → \"3.33 µs\"",
        move |x: Dynamic, unit: &str| -> R<String> { Ok(eng(x_of(&x)?, unit, 3)) },
    );
    api::fun(
        engine,
        "eng(x: float, unit: string, digits: int) -> string",
        "with a unit and 1..17 significant digits",
        move |x: Dynamic, unit: &str, digits: i64| -> R<String> {
            if !(1..=17).contains(&digits) {
                return Err(format!("eng: digits must be in 1..=17, got {digits}").into());
            }
            Ok(eng(x_of(&x)?, unit, digits as usize))
        },
    );
    // Floats print in the shortest form that reads back exactly, with an exponent when very
    // small or large (2e-12, not 0.000000000002).
    engine.register_fn("to_string", |x: f64| format!("{x:?}"));
    engine.register_fn("to_debug", |x: f64| format!("{x:?}"));
    api::fun(
        engine,
        "si(text: string) -> float",
        "parse a number with an SI suffix: si(\"2.2pF\") → 2.2e-12",
        |t: &str| -> R<f64> { parse_number(t).map_err(|e| e.into()) },
    );

    let s = shared.clone();
    api::fun(engine, "seed() -> int", "the run's random seed (--seed N, default 1)", move || s.lock().seed as i64);

    let s = shared.clone();
    engine.register_fn(SECTION_FN, move |n: i64| {
        let mut g = s.lock();
        g.current = (n.max(0) as usize).min(g.report.sections.len() - 1);
    });

    let s = shared.clone();
    engine.register_fn(OVERRIDE_FN, move |name: &str, default: Dynamic| -> R<Dynamic> {
        let mut g = s.lock();
        let Some(text) = g.overrides.get(name).cloned() else { return Ok(default) };
        g.used.insert(name.to_string());
        override_value(name, &text, &default).map_err(|e| e.into())
    });
}

/// The value of `--set NAME=TEXT`, of the same type as the script's own value for NAME.
fn override_value(name: &str, text: &str, default: &Dynamic) -> Result<Dynamic, String> {
    let bad = |what: &str| format!("--set {name}={text}: {name} is {what} in the script; '{text}' is not");
    if default.is_float() {
        match parse_number(text) {
            Ok(x) if x.is_finite() => Ok(Dynamic::from_float(x)),
            Ok(_) => Err(format!("--set {name}={text}: the value is beyond the float range (about ±1.8e308)")),
            Err(e) => Err(format!("--set {name}={text}: {e}")),
        }
    } else if default.is_int() {
        match text.parse::<i64>() {
            Ok(i) => Ok(Dynamic::from_int(i)),
            Err(_) => match parse_number(text) {
                Ok(x) if x.fract() == 0.0 && x.abs() < 9e15 => Ok(Dynamic::from_int(x as i64)),
                _ => Err(bad("an integer")),
            },
        }
    } else if default.is_bool() {
        match text {
            "true" => Ok(Dynamic::TRUE),
            "false" => Ok(Dynamic::FALSE),
            _ => Err(bad("true or false")),
        }
    } else if default.is_string() {
        Ok(Dynamic::from(text.to_string()))
    } else {
        Err(format!(
            "--set {name}: {name} is {} in the script; only numbers, integers, booleans and strings can be set",
            match default.type_name() {
                "array" => "an array".to_string(),
                t => format!("a {t}"),
            }
        ))
    }
}
