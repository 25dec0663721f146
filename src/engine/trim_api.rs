//! Registration of the trim: `trim(mc, #{...})` (each Monte Carlo sample trimmed with an N-bit
//! code, then its residual over temperature and supply), the `Trim` result, and
//! `trim_size(mc, #{...})` (the fewest bits and the LSB that reach an accuracy at a yield).
use rhai::{Array, Dynamic, Engine, Map};

use super::api;
use super::grid_api::numbers;
use super::value::{R, err, lift, to_f64};
use crate::analysis::monte_carlo::{MonteCarlo, YIELD_LEVEL, stats};
use crate::analysis::stats::wilson;
use crate::analysis::trim::{MAX_BITS, SIZE_MAX_BITS, TRIM_KEYS, TrimSpec, Trimmed, trim, trim_size};
use crate::num::Series;
use crate::timing::Osc;

/// A trimmed population and the run-wide index of its first sample.
#[derive(Clone, Debug)]
pub struct Trim {
    pub t: Trimmed,
    pub first: u64,
}

fn pct(v: &[f64]) -> Series {
    v.iter().map(|x| x * 100.0).collect()
}

fn num(what: &str, m: &Map, key: &str, unit: &str) -> R<Option<f64>> {
    match m.get(key) {
        None => Ok(None),
        Some(v) => to_f64(v)
            .map(Some)
            .map_err(|_| format!("{what}: '{key}' must be a number ({unit}), found {}", v.type_name()).into()),
    }
}

fn sub_map(what: &str, m: &Map, key: &str) -> R<Map> {
    match m.get(key) {
        None => Ok(Map::new()),
        Some(v) => v
            .clone()
            .try_cast::<Map>()
            .ok_or_else(|| format!("{what}: '{key}' must be a map #{{temp, vdd}}, found {}", v.type_name()).into()),
    }
}

fn only(what: &str, m: &Map, keys: &[&str]) -> R<()> {
    for k in m.keys() {
        if !keys.contains(&k.as_str()) {
            return err(format!("{what}: unknown key '{k}'; the keys are {}", keys.join(", ")));
        }
    }
    Ok(())
}

/// The trim spec of `trim` / `trim_size` from the option map (bits and lsb only for `trim`).
fn spec(what: &str, base: &Osc, m: &Map, sized: bool) -> R<TrimSpec> {
    let key = match m.get("key") {
        None => {
            return err(format!("{what}: 'key' is required: the key the code trims, one of {}", TRIM_KEYS.join(", ")));
        }
        Some(v) => v.clone().into_string().map_err(|t| format!("{what}: 'key' must be a string, found {t}"))?,
    };
    let Some(key) = TRIM_KEYS.iter().copied().find(|k| *k == key) else {
        return err(format!("{what}: 'key' must be one of {}, got \"{key}\"", TRIM_KEYS.join(", ")));
    };
    let target = num(what, m, "target", "s")?
        .ok_or_else(|| format!("{what}: 'target' (the period to trim to, s) is required"))?;
    let at = sub_map(what, m, "at")?;
    only(&format!("{what}: at"), &at, &["temp", "vdd"])?;
    let at_t = num(what, &at, "temp", "°C")?.unwrap_or(base.env.temp_c);
    let at_v = num(what, &at, "vdd", "V")?.unwrap_or(base.env.vdd);
    let over = sub_map(what, m, "over")?;
    only(&format!("{what}: over"), &over, &["temp", "vdd"])?;
    let over_temp = match over.get("temp") {
        Some(v) => numbers(what, "over.temp", v)?,
        None => vec![at_t],
    };
    let over_vdd = match over.get("vdd") {
        Some(v) => numbers(what, "over.vdd", v)?,
        None => vec![at_v],
    };
    let (bits, lsb) = if sized {
        (1, 0.5)
    } else {
        let bits = match m.get("bits") {
            Some(v) => v
                .as_int()
                .map_err(|_| format!("{what}: 'bits' must be an integer in 1..={MAX_BITS}, found {}", v.type_name()))?,
            None => return err(format!("{what}: 'bits' (1..={MAX_BITS}) is required")),
        };
        if !(1..=MAX_BITS as i64).contains(&bits) {
            return err(format!("{what}: 'bits' must be an integer in 1..={MAX_BITS}, got {bits}"));
        }
        let lsb = num(what, m, "lsb", "fraction of the key")?
            .ok_or_else(|| format!("{what}: 'lsb' (the step per code, as a fraction of the key) is required"))?;
        (bits as u32, lsb)
    };
    Ok(TrimSpec { key, bits, lsb, target, at: (at_t, at_v), over_temp, over_vdd })
}

fn run_trim(mc: &MonteCarlo, spec: &TrimSpec) -> R<Trim> {
    let first = mc.range.start;
    let sample = move |k: usize| mc.sample_osc(first + k as u64);
    Ok(Trim { t: lift(trim(mc.len(), &sample, spec))?, first })
}

fn stats_map(x: &[f64]) -> Map {
    let s = stats(x);
    let mut m = Map::new();
    m.insert("n".into(), Dynamic::from_int(s.n as i64));
    for (k, v) in [
        ("mean", s.mean),
        ("sigma", s.sigma),
        ("min", s.min),
        ("max", s.max),
        ("q001", s.q001),
        ("q01", s.q01),
        ("q50", s.q50),
        ("q99", s.q99),
        ("q999", s.q999),
    ] {
        m.insert(k.into(), Dynamic::from_float(v));
    }
    m
}

/// Fraction of samples whose error stays inside [lo, hi] (%) at every grid point, with its
/// Wilson interval and the failing samples' run-wide indices.
fn yield_map(t: &Trim, lo: f64, hi: f64) -> Map {
    let (a, b) = (lo / 100.0, hi / 100.0);
    let fails: Array =
        t.t.err_min
            .iter()
            .zip(&t.t.err_max)
            .enumerate()
            .filter(|(_, (x, y))| !(**x >= a && **y <= b))
            .map(|(k, _)| Dynamic::from_int((t.first + k as u64) as i64))
            .collect();
    let n = t.t.codes.len() as u64;
    let pass = n - fails.len() as u64;
    let (w_lo, w_hi) = wilson(pass, n, YIELD_LEVEL);
    let mut r = Map::new();
    r.insert("yield".into(), Dynamic::from_float(pass as f64 / n as f64));
    r.insert("lo".into(), Dynamic::from_float(w_lo));
    r.insert("hi".into(), Dynamic::from_float(w_hi));
    r.insert("n".into(), Dynamic::from_int(n as i64));
    r.insert("pass".into(), Dynamic::from_int(pass as i64));
    r.insert("fails".into(), Dynamic::from_array(fails));
    r.insert(
        "method".into(),
        Dynamic::from(format!("Wilson score interval, {:.0} % (Wilson 1927)", YIELD_LEVEL * 100.0)),
    );
    r
}

fn window(m: &Map) -> R<(f64, f64)> {
    only("yield_within", m, &["min", "max"])?;
    let lo = num("yield_within", m, "min", "%")?.unwrap_or(f64::NEG_INFINITY);
    let hi = num("yield_within", m, "max", "%")?.unwrap_or(f64::INFINITY);
    if lo.is_infinite() && hi.is_infinite() {
        return err("yield_within: give 'min', 'max' or both (the error window, %)");
    }
    if lo > hi {
        return err(format!("yield_within: 'min' = {lo} is above 'max' = {hi}"));
    }
    Ok((lo, hi))
}

fn describe(t: &Trim) -> String {
    let (lo, hi) = t.t.spec.range();
    format!(
        "Trim of '{}' on {} samples: {} bits, lsb {} (factor {lo:.4} … {hi:.4}), target {} s",
        t.t.spec.key,
        t.t.codes.len(),
        t.t.spec.bits,
        t.t.spec.lsb,
        t.t.spec.target
    )
}

const TRIM_KEYS_DOC: &str = "key (\"c\" or \"i\"), bits, lsb (step per code as a fraction of the key; code k multiplies it by 1 + lsb·(k − 2^(bits−1))), target (period, s), at (#{temp, vdd}, the trim condition; default the oscillator's own), over (#{temp: Series, vdd: Series}, every combination; default the trim condition)";

pub fn register(engine: &mut Engine) {
    engine.register_type_with_name::<Trim>("Trim");
    engine.register_fn("to_string", |t: &mut Trim| describe(t));
    engine.register_fn("to_debug", |t: &mut Trim| describe(t));
    api::fun(
        engine,
        "trim(mc: MonteCarlo, #{key, bits, lsb, target, at, over}) -> Trim",
        &format!(
            "each sample's best code at the trim condition on the real model (every parasitic on), then its error over temperature and supply; options {TRIM_KEYS_DOC}; an error when the code range cannot cover every sample, naming how many fall outside and the range they need"
        ),
        |mc: MonteCarlo, m: Map| -> R<Trim> {
            only("trim", &m, &["key", "bits", "lsb", "target", "at", "over"])?;
            run_trim(&mc, &spec("trim", mc.spec.base(), &m, false)?)
        },
    );
    api::fun(
        engine,
        "trim_size(mc: MonteCarlo, #{key, target, at, over, within, yield}) -> map",
        &format!(
            "the fewest bits (1..={SIZE_MAX_BITS}) and the smallest LSB covering every sample that keep the error within ±within (%) over the grid for at least the fraction yield of the samples, each word tried on the real model: #{{bits, lsb, needed (#{{lo, hi}}, the factors on the key the samples need), yield (as t.yield_within), tried (array of #{{bits, lsb, pass}}), trim (the Trim)}}; key, target, at, over as for trim"
        ),
        |mc: MonteCarlo, m: Map| -> R<Map> {
            only("trim_size", &m, &["key", "target", "at", "over", "within", "yield"])?;
            let within =
                num("trim_size", &m, "within", "%")?.ok_or("trim_size: 'within' (the accuracy, ± %) is required")?;
            let want = num("trim_size", &m, "yield", "fraction")?.unwrap_or(0.99);
            let sp = spec("trim_size", mc.spec.base(), &m, true)?;
            let first = mc.range.start;
            let sample = |k: usize| mc.sample_osc(first + k as u64);
            let z = lift(trim_size(mc.len(), &sample, &sp, within / 100.0, want))?;
            let t = Trim { t: z.trimmed, first };
            let mut r = Map::new();
            r.insert("bits".into(), Dynamic::from_int(z.bits as i64));
            r.insert("lsb".into(), Dynamic::from_float(z.lsb));
            let mut nd = Map::new();
            nd.insert("lo".into(), Dynamic::from_float(z.needed.0));
            nd.insert("hi".into(), Dynamic::from_float(z.needed.1));
            r.insert("needed".into(), Dynamic::from_map(nd));
            r.insert("yield".into(), Dynamic::from_map(yield_map(&t, -within, within)));
            let tried: Array = z
                .tried
                .iter()
                .map(|(b, l, p)| {
                    let mut q = Map::new();
                    q.insert("bits".into(), Dynamic::from_int(*b as i64));
                    q.insert("lsb".into(), Dynamic::from_float(*l));
                    q.insert("pass".into(), Dynamic::from_int(*p as i64));
                    Dynamic::from_map(q)
                })
                .collect();
            r.insert("tried".into(), Dynamic::from_array(tried));
            r.insert("trim".into(), Dynamic::from(t));
            Ok(r)
        },
    );
    for (name, what) in [
        ("codes", "the code of each sample, in sample order"),
        ("worst_pct", "the error of largest magnitude over the over grid after trim, signed, per sample, %"),
        ("min_pct", "the lowest error over the grid after trim, per sample, %"),
        ("max_pct", "the highest error over the grid after trim, per sample, %"),
        ("at_pct", "the error at the trim condition after trim, per sample, %"),
        ("before_pct", "the error at the trim condition before trim (centre code), per sample, %"),
        ("needed", "the factor on the key that would give the target exactly, per sample"),
    ] {
        let get = move |t: &mut Trim| -> Series {
            match name {
                "codes" => t.t.codes.iter().map(|c| *c as f64).collect(),
                "worst_pct" => pct(&t.t.worst()),
                "min_pct" => pct(&t.t.err_min),
                "max_pct" => pct(&t.t.err_max),
                "at_pct" => pct(&t.t.at_error),
                "before_pct" => pct(&t.t.before),
                _ => Series::from(t.t.needed.clone()),
            }
        };
        engine.register_get(name, get);
        api::fun(engine, &format!("t.{name}() -> Series"), &format!("{what} (also the property t.{name})"), get);
    }
    api::fun(engine, "t.bits() -> int", "bits of the trim code", |t: &mut Trim| t.t.spec.bits as i64);
    api::fun(engine, "t.lsb() -> float", "step per code, as a fraction of the key", |t: &mut Trim| t.t.spec.lsb);
    api::fun(engine, "t.range() -> map", "#{lo, hi}: the factors on the key the codes reach", |t: &mut Trim| {
        let (lo, hi) = t.t.spec.range();
        let mut m = Map::new();
        m.insert("lo".into(), Dynamic::from_float(lo));
        m.insert("hi".into(), Dynamic::from_float(hi));
        m
    });
    api::fun(
        engine,
        "t.stats() -> map",
        "#{n, mean, sigma, min, max, q001, q01, q50, q99, q999} of the worst-case error after trim (worst_pct), %",
        |t: &mut Trim| stats_map(&pct(&t.t.worst()).to_vec()),
    );
    api::fun(
        engine,
        "t.yield_within(#{min, max}) -> map",
        "#{yield, lo, hi, n, pass, fails, method}: fraction of samples whose error after trim stays inside [min, max] (%) at every point of the grid, its 95 % Wilson score interval (as mc.yield_within), and the failing samples",
        |t: &mut Trim, m: Map| -> R<Map> {
            let (lo, hi) = window(&m)?;
            Ok(yield_map(t, lo, hi))
        },
    );
}
