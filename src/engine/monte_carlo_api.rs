//! Registration of the Monte Carlo: the distributions `normal`, `rel_normal`, `uniform`, the
//! run `monte_carlo(o, #{...})` and the `MonteCarlo` result (periods, duties, drawn values,
//! statistics, yield, each sample's oscillator).
use rhai::{Array, Dynamic, Engine, Map};

use super::api;
use super::session::Shared;
use super::value::{R, err, lift, to_f64};
use crate::analysis::distribution::Distribution;
use crate::analysis::monte_carlo::{MAX_SAMPLES, McSpec, MonteCarlo, Stats, YIELD_LEVEL, stats};
use crate::num::Series;
use crate::num::si::eng;
use crate::timing::Osc;

const OPTION_KEYS: &[&str] = &["n", "vary", "mismatch", "process"];

/// The sample count: an integer (or an integral float such as `10k`) in 1..=MAX_SAMPLES.
fn sample_count(v: &Dynamic) -> R<u64> {
    let bad = || format!("monte_carlo: 'n' must be an integer in 1..={MAX_SAMPLES}, got {v}");
    let x = if let Ok(i) = v.as_int() {
        i as f64
    } else if let Ok(x) = v.as_float() {
        x
    } else {
        return Err(format!("monte_carlo: 'n' must be an integer in 1..={MAX_SAMPLES}, found {}", v.type_name()).into());
    };
    if !(x.fract() == 0.0 && x >= 1.0 && x <= MAX_SAMPLES as f64) {
        return err(bad());
    }
    Ok(x as u64)
}

fn flag(m: &Map, key: &str) -> R<bool> {
    match m.get(key) {
        None => Ok(false),
        Some(v) => v
            .as_bool()
            .map_err(|_| format!("monte_carlo: '{key}' must be true or false, found {}", v.type_name()).into()),
    }
}

/// The spec of a run from the script's option map; errors name the key.
fn spec(o: &Osc, m: &Map, seed: u64) -> R<McSpec> {
    for k in m.keys() {
        if !OPTION_KEYS.contains(&k.as_str()) {
            return err(format!("monte_carlo: unknown key '{k}'; the keys are {}", OPTION_KEYS.join(", ")));
        }
    }
    let n = match m.get("n") {
        Some(v) => sample_count(v)?,
        None => return err(format!("monte_carlo: key 'n' (samples, 1..={MAX_SAMPLES}) is required")),
    };
    let mut vary = Vec::new();
    if let Some(v) = m.get("vary") {
        let Some(vm) = v.clone().try_cast::<Map>() else {
            return err(format!(
                "monte_carlo: 'vary' must be a map of key to distribution, e.g. #{{c: rel_normal(0.01)}}, found {}",
                v.type_name()
            ));
        };
        for (k, d) in &vm {
            let Some(d) = d.clone().try_cast::<Distribution>() else {
                return err(format!(
                    "monte_carlo: 'vary': key '{k}' must be a distribution (normal(mean, sigma), rel_normal(sigma), uniform(lo, hi)), found {}",
                    d.type_name()
                ));
            };
            vary.push((k.to_string(), d));
        }
    }
    let (mismatch, process) = (flag(m, "mismatch")?, flag(m, "process")?);
    if (mismatch || process) && o.params.mode == crate::timing::keys::Mode::Explicit {
        let which = if mismatch { "mismatch" } else { "process" };
        return err(format!(
            "monte_carlo: '{which}: true' draws the devices of a process, but {} is made of explicit numbers; build it with osc_from, or spread its keys in 'vary' (e.g. vos_hi: normal(0, 3m))",
            o.caller()
        ));
    }
    if mismatch || process {
        return err("monte_carlo: 'mismatch' and 'process' draws are not available yet; spread keys in 'vary'");
    }
    lift(McSpec::new(o, &vary, n, seed))
}

fn series(v: &[f64]) -> Dynamic {
    Dynamic::from(Series::from(v.to_vec()))
}

fn stats_map(s: &Stats) -> Map {
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

/// The quantity a yield window applies to.
fn quantity(mc: &MonteCarlo, of: &str) -> R<Vec<f64>> {
    match of {
        "period" => Ok(mc.period.clone()),
        "frequency" => Ok(mc.frequency()),
        "duty" => Ok(mc.duty.clone()),
        other => err(format!("yield_within: 'of' must be \"period\", \"frequency\" or \"duty\", got \"{other}\"")),
    }
}

fn yield_map(mc: &MonteCarlo, m: &Map) -> R<Map> {
    let mut of = "period".to_string();
    let (mut min, mut max) = (None, None);
    for (k, v) in m {
        let num = || -> R<f64> {
            to_f64(v).map_err(|_| format!("yield_within: '{k}' must be a number, found {}", v.type_name()).into())
        };
        match k.as_str() {
            "min" => min = Some(num()?),
            "max" => max = Some(num()?),
            "of" => of = v.to_string(),
            other => return err(format!("yield_within: unknown key '{other}'; the keys are min, max, of")),
        }
    }
    if min.is_none() && max.is_none() {
        return err("yield_within: give 'min', 'max' or both (the window, in the unit of 'of')");
    }
    if let (Some(a), Some(b)) = (min, max)
        && a > b
    {
        return err(format!("yield_within: 'min' = {a} is above 'max' = {b}"));
    }
    let y = mc.yield_within(&quantity(mc, &of)?, min, max);
    let mut r = Map::new();
    r.insert("yield".into(), Dynamic::from_float(y.fraction));
    r.insert("lo".into(), Dynamic::from_float(y.lo));
    r.insert("hi".into(), Dynamic::from_float(y.hi));
    r.insert("n".into(), Dynamic::from_int(y.n as i64));
    r.insert("pass".into(), Dynamic::from_int(y.pass as i64));
    r.insert("fails".into(), Dynamic::from_array(y.fails.iter().map(|i| Dynamic::from_int(*i as i64)).collect()));
    r.insert(
        "method".into(),
        Dynamic::from(format!("Wilson score interval, {:.0} % (Wilson 1927)", YIELD_LEVEL * 100.0)),
    );
    Ok(r)
}

/// Every drawn quantity per sample, plus the sample index, period, frequency and duty.
fn samples_map(mc: &MonteCarlo) -> Map {
    let mut m = Map::new();
    for (d, col) in mc.spec.drawn().iter().zip(&mc.values) {
        m.insert(d.name.as_str().into(), series(col));
    }
    m.insert("index".into(), Dynamic::from(mc.range.clone().map(|i| i as f64).collect::<Series>()));
    m.insert("period".into(), series(&mc.period));
    m.insert("frequency".into(), series(&mc.frequency()));
    m.insert("duty".into(), series(&mc.duty));
    m
}

/// Columns of the drawn table, in order.
pub const DRAWN_COLUMNS: &[&str] = &["device", "quantity", "drawn from", "nominal", "sample mean", "sample sigma"];

/// What was drawn, one row per quantity: device, quantity, distribution, nominal and the
/// sample mean and σ (for `table`).
pub fn drawn_rows(mc: &MonteCarlo) -> Array {
    mc.spec
        .drawn()
        .iter()
        .zip(&mc.values)
        .map(|(d, col)| {
            let s = stats(col);
            let unit = if d.unit == "1" { "" } else { d.unit.as_str() };
            let mut r = Map::new();
            r.insert("device".into(), Dynamic::from(d.device.clone()));
            r.insert("quantity".into(), Dynamic::from(d.name.clone()));
            r.insert("drawn from".into(), Dynamic::from(d.how.clone()));
            r.insert("nominal".into(), Dynamic::from(eng(d.nominal, unit, 4)));
            r.insert("sample mean".into(), Dynamic::from(eng(s.mean, unit, 4)));
            r.insert("sample sigma".into(), Dynamic::from(eng(s.sigma, unit, 3)));
            Dynamic::from_map(r)
        })
        .collect()
}

fn describe(mc: &MonteCarlo) -> String {
    let s = stats(&mc.period);
    format!(
        "Monte Carlo of {}: {} samples (seed {}), period mean {}, sigma {}",
        mc.spec.base().caller(),
        mc.len(),
        mc.spec.seed,
        eng(s.mean, "s", 4),
        eng(s.sigma, "s", 3)
    )
}

pub fn register(engine: &mut Engine, session: &Shared) {
    engine.register_type_with_name::<Distribution>("Distribution");
    engine.register_fn("to_string", |d: &mut Distribution| d.describe());
    engine.register_fn("to_debug", |d: &mut Distribution| d.describe());
    engine.register_type_with_name::<MonteCarlo>("MonteCarlo");
    engine.register_fn("to_string", |mc: &mut MonteCarlo| describe(mc));
    engine.register_fn("to_debug", |mc: &mut MonteCarlo| describe(mc));

    api::fun(
        engine,
        "normal(mean, sigma) -> Distribution",
        "a key drawn as mean + sigma·N(0, 1), in the key's unit (sigma ≥ 0), for monte_carlo's vary",
        |mean: Dynamic, sigma: Dynamic| -> R<Distribution> {
            lift(Distribution::normal(to_f64(&mean)?, to_f64(&sigma)?))
        },
    );
    api::fun(
        engine,
        "rel_normal(sigma) -> Distribution",
        &format!(
            "a key drawn as its own value·(1 + sigma·N(0, 1)); sigma a fraction in [0, {}]",
            crate::analysis::distribution::REL_SIGMA_MAX
        ),
        |sigma: Dynamic| -> R<Distribution> { lift(Distribution::rel_normal(to_f64(&sigma)?)) },
    );
    api::fun(
        engine,
        "uniform(lo, hi) -> Distribution",
        "a key drawn uniformly from [lo, hi), in the key's unit",
        |lo: Dynamic, hi: Dynamic| -> R<Distribution> { lift(Distribution::uniform(to_f64(&lo)?, to_f64(&hi)?)) },
    );

    let s = session.clone();
    api::fun(
        engine,
        "monte_carlo(o: Oscillator, #{n, vary, mismatch, process}) -> MonteCarlo",
        &format!(
            "n samples (1..={MAX_SAMPLES}) of the oscillator, every parasitic on; vary: #{{key: distribution}} spreads keys; each sample draws from its own random stream of (--seed, sample index), so results are identical for any --threads and any split of the samples"
        ),
        move |o: Osc, m: Map| -> R<MonteCarlo> {
            let (seed, threads) = {
                let g = s.lock();
                (g.seed, g.threads)
            };
            let spec = std::sync::Arc::new(spec(&o, &m, seed)?);
            lift(spec.run(0..spec.n, threads))
        },
    );

    for (name, what) in [
        ("period", "period of each sample in sample order, s"),
        ("frequency", "frequency of each sample in sample order, Hz"),
        ("duty", "duty of each sample in sample order"),
    ] {
        let get = move |mc: &mut MonteCarlo| -> Series {
            match name {
                "period" => Series::from(mc.period.clone()),
                "frequency" => Series::from(mc.frequency()),
                _ => Series::from(mc.duty.clone()),
            }
        };
        engine.register_get(name, get);
        api::fun(engine, &format!("mc.{name}() -> Series"), &format!("{what} (also the property mc.{name})"), get);
    }
    api::fun(engine, "mc.n() -> int", "number of samples", |mc: &mut MonteCarlo| mc.len() as i64);
    api::fun(
        engine,
        "mc.samples() -> map",
        "map of Series, one element per sample: every drawn quantity by name, index, period (s), frequency (Hz), duty",
        |mc: &mut MonteCarlo| samples_map(mc),
    );
    api::fun(
        engine,
        "mc.stats() -> map",
        "#{n, mean, sigma, min, max, q001, q01, q50, q99, q999} of the period, s (sigma: sample standard deviation; qNNN: quantiles at 0.1 %, 1 %, 50 %, 99 %, 99.9 %)",
        |mc: &mut MonteCarlo| stats_map(&stats(&mc.period)),
    );
    api::fun(
        engine,
        "mc.yield_within(#{min, max, of}) -> map",
        "#{yield, lo, hi, n, pass, fails, method}: fraction of samples with the period (or of: \"frequency\", \"duty\") inside [min, max] (either may be left out), its 95 % Wilson score interval lo..hi, and the indices of the failing samples",
        |mc: &mut MonteCarlo, m: Map| yield_map(mc, &m),
    );
    api::fun(
        engine,
        "mc.drawn() -> array",
        "what was drawn, one row map per quantity: device, quantity, drawn from, nominal, sample mean, sample sigma (for table)",
        |mc: &mut MonteCarlo| drawn_rows(mc),
    );
    api::fun(
        engine,
        "mc.sample(i: int) -> Oscillator",
        "the oscillator of sample i (0-based) with its drawn values",
        |mc: &mut MonteCarlo, i: i64| -> R<Osc> {
            if i < 0 {
                return err(format!("sample: index must be in 0..{}, got {i}", mc.spec.n));
            }
            lift(mc.sample_osc(i as u64))
        },
    );
}
