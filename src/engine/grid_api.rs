//! Registration of the design-space analyses: the PVT grid (`o.pvt`) and the key value that
//! gives a target period or frequency (`o.solve`).
use rhai::{Array, Dynamic, Engine, Map};

use super::api;
use super::series_api::from_array;
use super::value::{R, lift, to_f64};
use crate::analysis::pvt::{MAX_POINTS, Pvt, pvt};
use crate::analysis::solve::{Target, solve};
use crate::num::Series;
use crate::timing::Osc;

/// Numbers of an option: a Series, an array of numbers or one number.
pub(crate) fn numbers(what: &str, key: &str, v: &Dynamic) -> R<Vec<f64>> {
    let xs = if let Some(s) = v.clone().try_cast::<Series>() {
        s.to_vec()
    } else if let Some(a) = v.clone().try_cast::<Array>() {
        from_array(&a).map_err(|e| format!("{what}: '{key}': {e}"))?.to_vec()
    } else {
        vec![to_f64(v).map_err(|_| {
            format!("{what}: '{key}' must be a Series, an array of numbers or a number, found {}", v.type_name())
        })?]
    };
    if let Some(x) = xs.iter().find(|x| !x.is_finite()) {
        return Err(format!("{what}: '{key}' holds {x}; every value must be a finite number").into());
    }
    Ok(xs)
}

/// The corners of `pvt`: an array of names or one name.
fn corner_list(v: &Dynamic) -> R<Vec<String>> {
    if let Ok(s) = v.clone().into_string() {
        return Ok(vec![s]);
    }
    let a = v
        .clone()
        .try_cast::<Array>()
        .ok_or_else(|| format!("pvt: 'corners' must be an array of corner names, found {}", v.type_name()))?;
    a.into_iter()
        .map(|c| c.into_string().map_err(|t| format!("pvt: 'corners' must hold names (strings), found {t}").into()))
        .collect()
}

/// Corners of the grid when none are given: the process corners that fix neither supply nor
/// temperature (the grid sets those), or "typical" for explicit numbers.
fn default_corners(o: &Osc) -> Vec<String> {
    let all = o.corners();
    let named: Vec<String> = all.iter().skip(1).filter(|c| o.corner_point(c).is_none()).cloned().collect();
    if named.is_empty() { all.into_iter().take(1).collect() } else { named }
}

/// A grid point as `#{value, corner, vdd, temp, index}`.
fn at_point(g: &Pvt, k: usize, value: f64) -> Dynamic {
    let p = &g.points[k];
    let mut m = Map::new();
    m.insert("value".into(), Dynamic::from_float(value));
    m.insert("corner".into(), Dynamic::from(p.corner.clone()));
    m.insert("vdd".into(), Dynamic::from_float(p.vdd));
    m.insert("temp".into(), Dynamic::from_float(p.temp));
    m.insert("index".into(), Dynamic::from_int(k as i64));
    Dynamic::from_map(m)
}

fn pvt_map(g: &Pvt) -> Map {
    let col = |f: &dyn Fn(&crate::analysis::pvt::PvtPoint) -> f64| -> Series { g.points.iter().map(f).collect() };
    let period = col(&|p| p.period);
    let frequency = col(&|p| p.frequency());
    let duty = col(&|p| p.duty);
    let error = Series::from(g.error_pct());
    let mut m = Map::new();
    m.insert("corner".into(), Dynamic::from_array(g.points.iter().map(|p| Dynamic::from(p.corner.clone())).collect()));
    m.insert("vdd".into(), Dynamic::from(col(&|p| p.vdd)));
    m.insert("temp".into(), Dynamic::from(col(&|p| p.temp)));
    let mut worst = Map::new();
    for (name, q) in [("period", &period), ("frequency", &frequency), ("duty", &duty), ("error_pct", &error)] {
        let (lo, hi) = Pvt::extremes(q.as_slice());
        let mut w = Map::new();
        w.insert("min".into(), at_point(g, lo, q.as_slice()[lo]));
        w.insert("max".into(), at_point(g, hi, q.as_slice()[hi]));
        if name == "error_pct" {
            let (e_lo, e_hi) = (q.as_slice()[lo], q.as_slice()[hi]);
            let (k, e) = if e_hi.abs() >= e_lo.abs() { (hi, e_hi) } else { (lo, e_lo) };
            w.insert("abs".into(), at_point(g, k, e));
        }
        worst.insert(name.into(), Dynamic::from_map(w));
    }
    m.insert("period".into(), Dynamic::from(period));
    m.insert("frequency".into(), Dynamic::from(frequency));
    m.insert("duty".into(), Dynamic::from(duty));
    m.insert("error_pct".into(), Dynamic::from(error));
    m.insert("nominal".into(), Dynamic::from_float(g.nominal));
    m.insert("worst".into(), Dynamic::from_map(worst));
    m
}

fn target(m: &Map) -> R<Target> {
    let only = |k: &str| m.len() == 1 && m.contains_key(k);
    let num = |k: &str, unit: &str| -> R<f64> {
        to_f64(&m[k]).map_err(|_| format!("solve: '{k}' must be a number ({unit}), found {}", m[k].type_name()).into())
    };
    let t = if only("period") {
        Target::Period(num("period", "s")?)
    } else if only("frequency") {
        Target::Frequency(num("frequency", "Hz")?)
    } else {
        let keys: Vec<&str> = m.keys().map(|k| k.as_str()).collect();
        return Err(format!(
            "solve: the target map must hold exactly one of period (s) or frequency (Hz), found #{{{}}}",
            keys.join(", ")
        )
        .into());
    };
    match t {
        Target::Period(x) | Target::Frequency(x) if !(x > 0.0 && x.is_finite()) => {
            Err(format!("solve: the target must be a positive finite number, got {x}").into())
        }
        _ => Ok(t),
    }
}

pub fn register(engine: &mut Engine) {
    api::fun(
        engine,
        "o.pvt(#{corners: array, vdd: V|Series, temp: °C|Series}) -> map",
        &format!(
            "the period with every parasitic at every combination of corner, supply and temperature (corner-major, temperature fastest; at most {MAX_POINTS} points), in parallel: #{{corner (array), vdd (Series, V), temp (Series, °C), period (s), frequency (Hz), duty, error_pct (against nominal, %), nominal (the period of o as given, s), worst}}; worst.<quantity> is #{{min, max}} (error_pct also abs, the largest magnitude), each #{{value, corner, vdd, temp, index}}; defaults: the process corners that fix neither supply nor temperature (osc_from; a corner that does has them replaced by the grid's), \"typical\" (the only corner of explicit numbers), o's own vdd and temp"
        ),
        |o: &mut Osc, m: Map| -> R<Map> {
            for k in m.keys() {
                if !["corners", "vdd", "temp"].contains(&k.as_str()) {
                    return Err(format!("pvt: unknown key '{k}'; the keys are corners, vdd, temp").into());
                }
            }
            let corners = match m.get("corners") {
                Some(v) => corner_list(v)?,
                None => default_corners(o),
            };
            let vdd = match m.get("vdd") {
                Some(v) => numbers("pvt", "vdd", v)?,
                None => vec![o.env.vdd],
            };
            let temp = match m.get("temp") {
                Some(v) => numbers("pvt", "temp", v)?,
                None => vec![o.env.temp_c],
            };
            Ok(pvt_map(&lift(pvt(o, &corners, &vdd, &temp))?))
        },
    );
    api::fun(
        engine,
        "o.solve(key: string, #{period: s}) -> float",
        "the value of one key (e.g. \"c\" or \"i\") that gives this period with every parasitic on; #{frequency: Hz} instead gives that frequency; searched outward from the key's present value (logarithmically for positive keys, within the key's range), then refined by Brent's method; an error names the range searched and the periods (frequencies) reached there when none gives the target",
        |o: &mut Osc, key: &str, m: Map| -> R<f64> { lift(solve(o, key, target(&m)?)) },
    );
}
