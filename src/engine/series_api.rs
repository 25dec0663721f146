//! Registration of `Series` with the scripting engine: construction, elementwise arithmetic,
//! comparisons giving masks, reductions, slicing, elementwise maths and `map` with a closure.
use super::value::{R, err, lift};
use crate::engine::api;
use rhai::{Array, Dynamic, Engine, FnPtr, NativeCallContext};

use super::value::to_f64;
use crate::num::{Series, math};

fn index(s: &Series, i: i64) -> R<usize> {
    let n = s.len() as i64;
    let k = if i < 0 { n + i } else { i };
    if k < 0 || k >= n {
        let valid =
            if n == 0 { "it is empty".to_string() } else { format!("valid: 0..={} or -{n}..=-1 from the end", n - 1) };
        return err(format!("index {i} is out of range for a Series of length {n} ({valid})"));
    }
    Ok(k as usize)
}

/// A Series from a script array of numbers.
pub fn from_array(a: &Array) -> R<Series> {
    a.iter()
        .enumerate()
        .map(|(k, v)| {
            to_f64(v).map_err(|_| format!("element {k} of the array is a {}, not a number", v.type_name()).into())
        })
        .collect()
}

/// An end of a span: a finite number.
fn end(f: &str, what: &str, v: &Dynamic) -> R<f64> {
    let x = to_f64(v).map_err(|_| format!("{f}: {what} must be a number, found {}", v.type_name()))?;
    if !x.is_finite() {
        return err(format!("{f}: {what} must be a finite number, got {x}"));
    }
    Ok(x)
}

/// A reduction that has no value for fewer than `need` elements is an error, not NaN.
fn reduce(s: &Series, what: &str, need: usize, f: impl Fn(&Series) -> f64) -> R<f64> {
    if s.len() < need {
        let n = s.len();
        return err(if need == 1 {
            format!("{what} of an empty series")
        } else {
            format!("{what} needs at least {need} elements; the series has {n}")
        });
    }
    Ok(f(s))
}

macro_rules! arith {
    ($engine:ident, $sig:literal, $sum:literal, $f:expr) => {{
        let f = $f;
        api::fun($engine, $sig, $sum, move |a: Series, b: Series| lift(a.zip_with(b, f)));
        api::fun($engine, $sig, $sum, move |a: Series, b: f64| a.map_in_place(|x| f(x, b)));
        api::fun($engine, $sig, $sum, move |a: Series, b: i64| a.map_in_place(|x| f(x, b as f64)));
        api::fun($engine, $sig, $sum, move |a: f64, b: Series| b.map_in_place(|y| f(a, y)));
        api::fun($engine, $sig, $sum, move |a: i64, b: Series| b.map_in_place(|y| f(a as f64, y)));
    }};
    ($engine:ident, $op:literal, $f:expr) => {{
        let f = $f;
        $engine.register_fn($op, move |a: Series, b: Series| lift(a.zip_with(b, f)));
        $engine.register_fn($op, move |a: Series, b: f64| a.map_in_place(|x| f(x, b)));
        $engine.register_fn($op, move |a: Series, b: i64| a.map_in_place(|x| f(x, b as f64)));
        $engine.register_fn($op, move |a: f64, b: Series| b.map_in_place(|y| f(a, y)));
        $engine.register_fn($op, move |a: i64, b: Series| b.map_in_place(|y| f(a as f64, y)));
    }};
}

/// A comparison gives a mask: 1.0 where it holds, 0.0 where not.
macro_rules! compare {
    ($engine:ident, $op:literal, $f:expr) => {{
        let f = $f;
        arith!($engine, $op, move |x: f64, y: f64| if f(x, y) { 1.0 } else { 0.0 });
    }};
}

macro_rules! unary {
    ($engine:ident, $sig:literal, $sum:literal, $f:expr) => {{
        api::fun($engine, $sig, $sum, |a: Series| a.map_in_place($f));
    }};
}

/// Most elements `span`, `span_log` and `zeros` make.
pub const MAX_LEN: i64 = 100_000_000;

pub fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Series>("Series");

    api::fun(
        engine,
        "span(a: float, b: float, n: int) -> Series",
        "n points from a to b inclusive, evenly spaced",
        |a: Dynamic, b: Dynamic, n: i64| -> R<Series> {
            let (a, b) = (end("span", "a", &a)?, end("span", "b", &b)?);
            if !(1..=MAX_LEN).contains(&n) {
                return err(format!("span: n must be in 1..={MAX_LEN}, got {n}"));
            }
            Ok(Series::span(a, b, n as usize))
        },
    );
    api::fun(
        engine,
        "span_log(a: float, b: float, n: int) -> Series",
        "n points from a to b inclusive, evenly spaced in log (a, b > 0)",
        |a: Dynamic, b: Dynamic, n: i64| -> R<Series> {
            let (a, b) = (end("span_log", "a", &a)?, end("span_log", "b", &b)?);
            if !(a > 0.0 && b > 0.0) {
                return err(format!("span_log needs both ends > 0, got a = {a} and b = {b}"));
            }
            if !(1..=MAX_LEN).contains(&n) {
                return err(format!("span_log: n must be in 1..={MAX_LEN}, got {n}"));
            }
            lift(Series::span_log(a, b, n as usize))
        },
    );
    api::fun(engine, "series(values: array) -> Series", "a Series from an array of numbers", |a: Array| from_array(&a));
    api::fun(engine, "series(values: array) -> Series", "a Series from an array of numbers", |s: Series| s);
    api::fun(engine, "zeros(n: int) -> Series", "n zeros", |n: i64| -> R<Series> {
        if !(0..=MAX_LEN).contains(&n) {
            return err(format!("zeros: n must be in 0..={MAX_LEN}, got {n}"));
        }
        Ok(Series::from(vec![0.0; n as usize]))
    });
    api::fun(engine, "s.to_array() -> array", "the Series as an array of floats", |s: &mut Series| -> Array {
        s.as_slice().iter().map(|x| Dynamic::from_float(*x)).collect()
    });
    engine.register_fn("to_string", |s: &mut Series| format_series(s));
    engine.register_fn("to_debug", |s: &mut Series| format_series(s));

    arith!(engine, "+", |x: f64, y: f64| x + y);
    arith!(engine, "-", |x: f64, y: f64| x - y);
    arith!(engine, "*", |x: f64, y: f64| x * y);
    arith!(engine, "/", |x: f64, y: f64| x / y);
    arith!(engine, "**", math::pow);
    arith!(
        engine,
        "pow(s: Series|float, p: float|Series) -> Series|float",
        "elementwise power; also s ** p",
        math::pow
    );
    api::fun(
        engine,
        "pow(s: Series|float, p: float|Series) -> Series|float",
        "elementwise power; also s ** p",
        math::pow,
    );
    api::fun(
        engine,
        "pow(s: Series|float, p: float|Series) -> Series|float",
        "elementwise power; also s ** p",
        |x: f64, y: i64| x.powi(y as i32),
    );
    engine.register_fn("-", |a: Series| a.map_in_place(|x| -x));
    engine.register_fn("+", |a: Series| a);
    compare!(engine, "<", |x: f64, y: f64| x < y);
    compare!(engine, "<=", |x: f64, y: f64| x <= y);
    compare!(engine, ">", |x: f64, y: f64| x > y);
    compare!(engine, ">=", |x: f64, y: f64| x >= y);
    engine.register_fn("==", |a: Series, b: Series| a == b);
    engine.register_fn("!=", |a: Series, b: Series| a != b);

    api::fun(engine, "exp(s: Series) -> Series", "elementwise e^x", |a: Series| a.apply(math::exp_slice));
    api::fun(engine, "ln(s: Series) -> Series", "elementwise natural logarithm", |a: Series| a.apply(math::ln_slice));
    unary!(engine, "log10(s: Series) -> Series", "elementwise base-10 logarithm", math::log10);
    unary!(engine, "sqrt(s: Series) -> Series", "elementwise square root", f64::sqrt);
    unary!(engine, "abs(s: Series) -> Series", "elementwise absolute value", f64::abs);

    // The language's own float functions call the platform's maths library; these forms take
    // precedence and give the same bits on every machine.
    api::fun(engine, "exp(x: float) -> float", "e^x", math::exp);
    api::fun(engine, "ln(x: float) -> float", "natural logarithm", math::ln);
    api::fun(engine, "log(x: float) -> float", "base-10 logarithm", math::log10);
    api::fun(engine, "log10(x: float) -> float", "base-10 logarithm", math::log10);

    api::fun(engine, "s.len() -> int", "number of elements", |s: &mut Series| s.len() as i64);
    api::fun(engine, "s.is_empty() -> bool", "true when the series has no elements", |s: &mut Series| s.is_empty());
    api::fun(engine, "s.sum() -> float", "sum of the elements", |s: &mut Series| s.sum());
    api::fun(engine, "s.mean() -> float", "arithmetic mean", |s: &mut Series| reduce(s, "mean", 1, Series::mean));
    api::fun(engine, "s.stdev() -> float", "sample standard deviation (divides by n − 1)", |s: &mut Series| {
        reduce(s, "stdev", 2, Series::stdev)
    });
    api::fun(engine, "s.min() -> float", "smallest element", |s: &mut Series| reduce(s, "min", 1, Series::min));
    api::fun(engine, "s.max() -> float", "largest element", |s: &mut Series| reduce(s, "max", 1, Series::max));
    api::fun(engine, "s.argmin() -> int", "index of the smallest element", |s: &mut Series| -> R<i64> {
        s.argmin().map(|k| k as i64).ok_or_else(|| "argmin of an empty (or all-NaN) series".into())
    });
    api::fun(engine, "s.argmax() -> int", "index of the largest element", |s: &mut Series| -> R<i64> {
        s.argmax().map(|k| k as i64).ok_or_else(|| "argmax of an empty (or all-NaN) series".into())
    });
    api::fun(
        engine,
        "s.quantile(p: float) -> float",
        "p-quantile, 0 ≤ p ≤ 1, linear interpolation (numpy default)",
        |s: &mut Series, p: Dynamic| -> R<f64> {
            let p =
                to_f64(&p).map_err(|_| format!("quantile: p must be a number in [0, 1], found {}", p.type_name()))?;
            s.quantile(p).map_err(|e| e.into())
        },
    );
    api::fun(engine, "mask.count() -> int", "number of non-zero elements", |s: &mut Series| {
        s.as_slice().iter().filter(|x| **x != 0.0).count() as i64
    });
    api::fun(
        engine,
        "s.select(mask: Series) -> Series",
        "elements where mask is non-zero (masks come from s > x, s <= t, …)",
        |s: &mut Series, mask: Series| lift(s.select(&mask)),
    );
    api::fun(
        engine,
        "s.slice(start: int, end: int) -> Series",
        "elements start..end (end excluded); also s[a..b]",
        |s: &mut Series, a: i64, b: i64| -> R<Series> {
            if a < 0 || b < a {
                return err(format!("slice({a}, {b}): need 0 <= start <= end"));
            }
            Ok(s.slice(a as usize, b as usize))
        },
    );
    engine.register_indexer_get(|s: &mut Series, i: i64| -> R<f64> { Ok(s.as_slice()[index(s, i)?]) });
    engine.register_indexer_set(|s: &mut Series, i: i64, v: Dynamic| -> R<()> {
        let k = index(s, i)?;
        s.make_mut()[k] = to_f64(&v)?;
        Ok(())
    });
    engine.register_indexer_get(|s: &mut Series, r: std::ops::Range<i64>| -> R<Series> {
        if r.start < 0 || r.end < r.start {
            return err(format!("range {}..{}: need 0 <= start <= end", r.start, r.end));
        }
        Ok(s.slice(r.start as usize, r.end as usize))
    });
    engine.register_indexer_get(|s: &mut Series, r: std::ops::RangeInclusive<i64>| -> R<Series> {
        let (a, b) = (*r.start(), *r.end());
        if a < 0 || b < a {
            return err(format!("range {a}..={b}: need 0 <= start <= end"));
        }
        Ok(s.slice(a as usize, b as usize + 1))
    });
    api::fun(
        engine,
        "s.map(f: fn(float) -> float) -> Series",
        "apply a function to every element",
        |ctx: NativeCallContext, s: &mut Series, f: FnPtr| -> R<Series> {
            let mut out = Vec::with_capacity(s.len());
            for &x in s.as_slice() {
                let y: Dynamic = f.call_within_context(&ctx, (x,))?;
                out.push(
                    to_f64(&y).map_err(|_| format!("map: the function returned a {}, not a number", y.type_name()))?,
                );
            }
            Ok(Series::from(out))
        },
    );
    // `for x in s { … }` iterates over the elements.
    engine.register_iterator::<Series>();
}

impl IntoIterator for Series {
    type Item = f64;
    type IntoIter = std::vec::IntoIter<f64>;
    fn into_iter(self) -> Self::IntoIter {
        self.to_vec().into_iter()
    }
}

/// Compact text form: the first few elements and the length.
pub fn format_series(s: &Series) -> String {
    let v = s.as_slice();
    let shown: Vec<String> = v.iter().take(6).map(|x| format!("{x:?}")).collect();
    let more = if v.len() > 6 { ", …" } else { "" };
    format!("Series[{}]({}{more})", v.len(), shown.join(", "))
}
