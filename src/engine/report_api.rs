//! Registration of the report functions: `show` (and, through the print hook, `print`).
use rhai::{Dynamic, Engine, EvalAltResult};

use super::docs::Doc;
use super::session::Shared;
use crate::num::si::eng;
use crate::num::Series;
use crate::report::Item;

type R<T> = Result<T, Box<EvalAltResult>>;

pub const DOCS: &[Doc] = &[
    Doc { name: "show", sig: "show(label: string, value)", summary: "a result line in the report and on the terminal" },
    Doc { name: "show", sig: "show(label: string, value: float, unit: string)", summary: "a result line, engineering-formatted with its unit" },
];

/// Text of a shown value.
fn value_text(v: &Dynamic, unit: &str) -> String {
    if let Some(x) = v.clone().try_cast::<f64>() {
        eng(x, unit, 3)
    } else if let Some(i) = v.clone().try_cast::<i64>() {
        if unit.is_empty() { i.to_string() } else { eng(i as f64, unit, 3) }
    } else if let Some(s) = v.clone().try_cast::<Series>() {
        if s.is_empty() {
            "empty series".into()
        } else {
            format!("n = {}, min {}, mean {}, max {}", s.len(), eng(s.min(), unit, 3), eng(s.mean(), unit, 3), eng(s.max(), unit, 3))
        }
    } else if v.is_string() {
        v.clone().into_string().unwrap_or_default()
    } else {
        v.to_string()
    }
}

pub fn register(engine: &mut Engine, shared: &Shared) {
    let s = shared.clone();
    engine.register_fn("show", move |label: &str, v: Dynamic| -> R<()> {
        show(&s, label, &v, "");
        Ok(())
    });
    let s = shared.clone();
    engine.register_fn("show", move |label: &str, v: Dynamic, unit: &str| -> R<()> {
        show(&s, label, &v, unit);
        Ok(())
    });
}

fn show(s: &Shared, label: &str, v: &Dynamic, unit: &str) {
    let value = value_text(v, unit);
    let mut g = s.lock();
    if g.echo {
        super::term::out(&format!("{label} = {value}"));
    }
    g.push(Item::Show { label: label.to_string(), value });
}
