//! How a script value reads in a report line and as a REPL result: numbers as numbers,
//! strings inside collections quoted, arrays and maps element by element, and every object as
//! its own script-level text (its registered `to_string`), never a Rust type name.
use rhai::{Dynamic, Engine, NativeCallContext, Scope};

/// Text of `v`; `object` gives the text of a value of a registered type.
pub fn text(v: &Dynamic, object: &mut dyn FnMut(&Dynamic) -> String) -> String {
    let mut s = String::new();
    write(&mut s, v, object, false);
    s
}

fn write(s: &mut String, v: &Dynamic, object: &mut dyn FnMut(&Dynamic) -> String, nested: bool) {
    if let Ok(x) = v.as_float() {
        s.push_str(&format!("{x:?}"));
    } else if v.is_int() || v.is_bool() || v.is_char() || v.is_unit() {
        s.push_str(&v.to_string());
    } else if v.is_string() {
        let t = v.clone().into_string().unwrap_or_default();
        s.push_str(&if nested { format!("{t:?}") } else { t });
    } else if let Some(a) = v.clone().try_cast::<rhai::Array>() {
        s.push('[');
        for (k, x) in a.iter().enumerate() {
            if k > 0 {
                s.push_str(", ");
            }
            write(s, x, object, true);
        }
        s.push(']');
    } else if let Some(m) = v.clone().try_cast::<rhai::Map>() {
        s.push_str("#{");
        for (k, (key, x)) in m.iter().enumerate() {
            if k > 0 {
                s.push_str(", ");
            }
            s.push_str(key);
            s.push_str(": ");
            write(s, x, object, true);
        }
        s.push('}');
    } else {
        s.push_str(&object(v));
    }
}

/// Text of `v` inside a native function: objects through their registered `to_string`.
pub fn text_in(ctx: &NativeCallContext, v: &Dynamic) -> String {
    text(v, &mut |o| {
        ctx.call_fn::<String>("to_string", (o.clone(),))
            .unwrap_or_else(|_| ctx.engine().map_type_name(o.type_name()).to_string())
    })
}

/// Text of `v` outside any call (the REPL's result line): objects through their registered
/// `to_string`, evaluated by `engine`.
pub fn text_of(engine: &Engine, v: &Dynamic) -> String {
    text(v, &mut |o| {
        let mut scope = Scope::new();
        scope.push("shown_value", o.clone());
        engine
            .eval_with_scope::<String>(&mut scope, "to_string(shown_value)")
            .unwrap_or_else(|_| engine.map_type_name(o.type_name()).to_string())
    })
}

/// `print`, `to_string` and string interpolation of arrays and maps use the same text, so an
/// object inside a collection shows as itself there too.
pub fn register(engine: &mut Engine) {
    for name in ["print", "to_string", "to_debug"] {
        engine.register_fn(name, |ctx: NativeCallContext, a: &mut rhai::Array| {
            text_in(&ctx, &Dynamic::from_array(a.clone()))
        });
        engine.register_fn(name, |ctx: NativeCallContext, m: &mut rhai::Map| {
            text_in(&ctx, &Dynamic::from_map(m.clone()))
        });
    }
}
