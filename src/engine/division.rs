//! `/` on two integers gives the true quotient as a float (`3/5` is 0.6, not 0): designers
//! write `v_lo: 3/5` and mean 0.6 V. Registered once here for `/` and `/=`; `%` stays the
//! integer remainder. Rhai's fast built-in operators bypass registered overloads for its own
//! types, so the engine runs with them off (cost measured in `benches/engine.rs`).
use rhai::{Dynamic, Engine, EvalAltResult, NativeCallContext};

/// The quotient of two integers, as a float; dividing by integer zero stays an error, as it
/// was (a float division by zero gives ±inf as IEEE 754 says, and scripts see that too).
fn quotient(a: i64, b: i64) -> Result<f64, Box<EvalAltResult>> {
    if b == 0 {
        return Err(format!("division by zero: {a}/0 has no value").into());
    }
    Ok(a as f64 / b as f64)
}

pub fn register(engine: &mut Engine) {
    engine.set_fast_operators(false);
    engine.register_fn("/", quotient);
    // `x /= n` with an integer `n`: an integer `x` becomes the float quotient; a float `x`
    // divides as before; any other type divides with its own `/`.
    engine.register_fn("/=", |ctx: NativeCallContext, x: &mut Dynamic, b: i64| -> Result<(), Box<EvalAltResult>> {
        if let Ok(a) = x.as_int() {
            *x = Dynamic::from_float(quotient(a, b)?);
            return Ok(());
        }
        if let Ok(a) = x.as_float() {
            *x = Dynamic::from_float(a / b as f64);
            return Ok(());
        }
        *x = ctx.call_native_fn::<Dynamic>("/", (x.clone(), b))?;
        Ok(())
    });
}
