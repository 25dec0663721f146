//! Conversions between script values and Rust numbers, with errors that name what was found.
use rhai::{Dynamic, EvalAltResult};

/// The result type of a native script function; the engine adds file:line:col to the error.
pub type R<T> = Result<T, Box<EvalAltResult>>;

/// A script error with this message.
pub fn err<T>(msg: impl Into<String>) -> R<T> {
    Err(msg.into().into())
}

/// A plain-Rust result as a script result.
pub fn lift<T>(r: Result<T, String>) -> R<T> {
    r.map_err(|e| e.into())
}

/// A number (float or int) as f64.
pub fn to_f64(v: &Dynamic) -> Result<f64, Box<EvalAltResult>> {
    if let Some(x) = v.clone().try_cast::<f64>() {
        Ok(x)
    } else if let Some(i) = v.clone().try_cast::<i64>() {
        Ok(i as f64)
    } else {
        Err(format!("expected a number, found {}", v.type_name()).into())
    }
}
