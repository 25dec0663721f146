//! Registration of the timing layer: `osc(kind, #{...})`, its methods (ideal period, period
//! with parasitics, cycle details, error budget, operating point) and `osc_keys(kind)`.
use super::value::{R, lift};
use crate::engine::api;
use rhai::{Array, Dynamic, Engine, Map};

use super::session::Shared;
use super::value::to_f64;
use crate::num::Series;
use crate::num::si::eng;
use crate::physics::mirror::MirrorKind;
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;
use crate::timing::budget::budget;
use crate::timing::from_process::{Choices, osc_from_refs};
use crate::timing::keys::{Dflt, Kind, Mode, def};
use crate::timing::process_refs::{CurrentChoice, ThresholdChoice};
use crate::timing::reference::Reference;
use crate::timing::transient::{
    MAX_CYCLES, MAX_POINTS_PER_PHASE, Options, RTOL, RTOL_RANGE, SETTLE_RTOL, Transient, simulate,
};
use crate::timing::{Cycle, Mask, Osc};

/// Keys given as numbers, and keys given as references.
type Values = (Vec<(String, f64)>, Vec<(String, Reference)>);

/// Numbers and references of an option map, each named in errors.
fn values(what: &str, m: &Map) -> R<Values> {
    let (mut nums, mut refs) = (Vec::new(), Vec::new());
    for (k, v) in m {
        if let Some(r) = v.clone().try_cast::<Reference>() {
            refs.push((k.to_string(), r));
        } else {
            let x = to_f64(v).map_err(|_| {
                let or = match k.as_str() {
                    "i" => " or a current reference such as ptat(750n)",
                    "v_lo" | "v_hi" => " or a threshold reference such as ladder(0.75)",
                    _ => "",
                };
                format!("{what}: key '{k}' must be a number{or}, found {}", v.type_name())
            })?;
            nums.push((k.to_string(), x));
        }
    }
    Ok((nums, refs))
}

fn kind(name: &str) -> R<Kind> {
    lift(Kind::parse(name))
}

fn cycle_map(c: &Cycle) -> Map {
    let mut m = Map::new();
    m.insert("period".into(), Dynamic::from_float(c.period));
    m.insert("frequency".into(), Dynamic::from_float(c.frequency()));
    m.insert("duty".into(), Dynamic::from_float(c.duty));
    m.insert("v_peak".into(), Dynamic::from_float(c.v_peak));
    m.insert("v_valley".into(), Dynamic::from_float(c.v_valley));
    m.insert("overshoot".into(), Dynamic::from_float(c.overshoot));
    m.insert("iterations".into(), Dynamic::from_int(c.iterations as i64));
    let phases: Array = c
        .phases
        .iter()
        .map(|p| {
            let mut q = Map::new();
            q.insert("name".into(), Dynamic::from(p.name.to_string()));
            for (k, v) in [
                ("v_start", p.v_start),
                ("v_threshold", p.v_threshold),
                ("v_end", p.v_end),
                ("ramp", p.ramp),
                ("delay", p.delay),
                ("slope", p.slope),
            ] {
                q.insert(k.into(), Dynamic::from_float(v));
            }
            Dynamic::from_map(q)
        })
        .collect();
    m.insert("phases".into(), Dynamic::from_array(phases));
    m
}

fn budget_map(o: &Osc) -> R<Map> {
    let b = lift(budget(o))?;
    let mut m = Map::new();
    let f = |x: f64| Dynamic::from_float(x);
    m.insert("kind".into(), Dynamic::from(o.kind().name().to_string()));
    for (k, v) in [
        ("ideal", b.ideal),
        ("full", b.full),
        ("total_error", b.total_error()),
        ("sum_alone", b.sum_alone),
        ("remainder", b.remainder),
        ("ideal_comparators", b.ideal_comparators),
        ("comparator_share", b.comparator_share()),
        ("ideal_delay_chain", b.ideal_delay_chain),
        ("delay_chain_share", b.delay_chain_share()),
    ] {
        m.insert(k.into(), f(v));
    }
    let labels: Array = b.rows.iter().map(|r| Dynamic::from(r.parasitic.label().to_string())).collect();
    let names: Array = b.rows.iter().map(|r| Dynamic::from(r.parasitic.name().to_string())).collect();
    let alone: Series = b.rows.iter().map(|r| r.alone).collect();
    let step: Series = b.rows.iter().map(|r| r.step).collect();
    let rows: Array = b
        .rows
        .iter()
        .map(|r| {
            let mut q = Map::new();
            q.insert("parasitic".into(), Dynamic::from(r.parasitic.label().to_string()));
            q.insert("alone".into(), f(r.alone));
            q.insert("alone_pct".into(), f(r.alone / b.ideal * 100.0));
            q.insert("step".into(), f(r.step));
            q.insert("step_pct".into(), f(r.step / b.ideal * 100.0));
            q.insert("cumulative".into(), f(r.cumulative));
            Dynamic::from_map(q)
        })
        .collect();
    m.insert("labels".into(), Dynamic::from_array(labels.clone()));
    m.insert("names".into(), Dynamic::from_array(names));
    m.insert("alone".into(), Dynamic::from(alone.clone()));
    m.insert("step".into(), Dynamic::from(step.clone()));
    m.insert("rows".into(), Dynamic::from_array(rows));
    // Waterfalls of the period error: each parasitic alone plus the interaction remainder, and
    // the sequential build-up; both end on the total error.
    let mut wl = labels.clone();
    wl.push(Dynamic::from("interaction remainder".to_string()));
    let mut wy = alone.to_vec();
    wy.push(b.remainder);
    let mut w = Map::new();
    w.insert("labels".into(), Dynamic::from_array(wl));
    w.insert("y".into(), Dynamic::from(Series::from(wy)));
    m.insert("waterfall".into(), Dynamic::from_map(w));
    let mut u = Map::new();
    u.insert("labels".into(), Dynamic::from_array(labels));
    u.insert("y".into(), Dynamic::from(step));
    m.insert("buildup".into(), Dynamic::from_map(u));
    Ok(m)
}

/// The cycle count of `simulate`: an integer (or an integral float) in 1..=MAX_CYCLES.
fn cycles_arg(v: &Dynamic) -> R<usize> {
    let bad = || format!("simulate: 'cycles' must be an integer in 1..={MAX_CYCLES}, got {v} ({})", v.type_name());
    let n = if let Ok(i) = v.as_int() {
        i
    } else if let Ok(x) = v.as_float() {
        if x.fract() != 0.0 || !x.is_finite() {
            return Err(bad().into());
        }
        x as i64
    } else {
        return Err(bad().into());
    };
    if !(1..=MAX_CYCLES as i64).contains(&n) {
        return Err(bad().into());
    }
    Ok(n as usize)
}

/// Options of `simulate`, each checked and named in errors.
fn sim_options(m: &Map, session_seed: u64) -> R<Options> {
    let mut o = Options::default();
    let mut noise = false;
    let mut seed = session_seed;
    for (k, v) in m {
        let num = |unit: &str| -> R<f64> {
            to_f64(v).map_err(|_| {
                format!("simulate: option '{k}' must be a number ({unit}), found {}", v.type_name()).into()
            })
        };
        match k.as_str() {
            "points_per_phase" => {
                let n = v.as_int().map_err(|_| {
                    format!("simulate: option 'points_per_phase' must be an integer, found {}", v.type_name())
                })?;
                if n < 0 {
                    return Err(format!("simulate: option 'points_per_phase' must be in 0..=10000, got {n}").into());
                }
                o.points_per_phase = Some(n as usize);
            }
            "v0" => o.v0 = Some(num("V")?),
            "v0_b" => o.v0_b = Some(num("V")?),
            "rtol" => o.rtol = Some(num("1")?),
            "noise" => {
                noise = v
                    .as_bool()
                    .map_err(|_| format!("simulate: option 'noise' must be true or false, found {}", v.type_name()))?
            }
            "seed" => {
                let n = v
                    .as_int()
                    .map_err(|_| format!("simulate: option 'seed' must be an integer, found {}", v.type_name()))?;
                if n < 0 {
                    return Err(format!("simulate: option 'seed' must be a non-negative integer, got {n}").into());
                }
                seed = n as u64;
            }
            other => {
                return Err(format!(
                    "simulate: unknown option '{other}'; the options are points_per_phase, v0, v0_b, rtol, noise, seed"
                )
                .into());
            }
        }
    }
    if noise {
        o.noise_seed = Some(seed);
    }
    Ok(o)
}

fn transient_map(s: Transient) -> Map {
    let mut m = Map::new();
    let f = |x: f64| Dynamic::from_float(x);
    m.insert("t".into(), Dynamic::from(Series::from(s.t)));
    let mut vs = s.v.into_iter();
    if let Some(v) = vs.next() {
        m.insert("v".into(), Dynamic::from(Series::from(v)));
    }
    if let Some(v) = vs.next() {
        m.insert("v2".into(), Dynamic::from(Series::from(v)));
    }
    m.insert("names".into(), Dynamic::from_array(s.node_names.iter().map(|n| Dynamic::from(n.to_string())).collect()));
    // Labels repeat every cycle: one shared string per distinct label.
    let mut labels: std::collections::HashMap<(&str, &str), (Dynamic, Dynamic, Dynamic)> =
        std::collections::HashMap::new();
    let (mut what, mut phase, mut label) = (Array::new(), Array::new(), Array::new());
    for e in &s.events {
        let (w, p, l) = labels
            .entry((e.phase, e.kind.name()))
            .or_insert_with(|| {
                let w: rhai::ImmutableString = e.kind.name().into();
                let p: rhai::ImmutableString = e.phase.into();
                let l: rhai::ImmutableString = format!("{}: {}", e.phase, e.kind.name()).into();
                (w.into(), p.into(), l.into())
            })
            .clone();
        what.push(w);
        phase.push(p);
        label.push(l);
    }
    let mut ev = Map::new();
    ev.insert("t".into(), Dynamic::from(s.events.iter().map(|e| e.t).collect::<Series>()));
    ev.insert("v".into(), Dynamic::from(s.events.iter().map(|e| e.v).collect::<Series>()));
    ev.insert("what".into(), Dynamic::from_array(what));
    ev.insert("phase".into(), Dynamic::from_array(phase));
    ev.insert("label".into(), Dynamic::from_array(label));
    m.insert("events".into(), Dynamic::from_map(ev));
    m.insert("cycles".into(), Dynamic::from_int(s.periods.len() as i64));
    m.insert("periods".into(), Dynamic::from(Series::from(s.periods)));
    m.insert("duties".into(), Dynamic::from(Series::from(s.duties)));
    m.insert("period".into(), f(s.period));
    m.insert("frequency".into(), f(1.0 / s.period));
    m.insert("duty".into(), f(s.duty));
    m.insert("settle_cycles".into(), Dynamic::from_int(s.settle_cycles as i64));
    m.insert("v_min".into(), f(s.v_min));
    m.insert("v_max".into(), f(s.v_max));
    m.insert("steps".into(), Dynamic::from_int(s.steps as i64));
    m
}

fn describe(o: &Osc) -> String {
    let given: Vec<String> = o
        .params
        .given()
        .map(|(k, v)| {
            if let Some(r) = o.params.reference(k) {
                return format!("{k} = {}", r.describe());
            }
            let unit = def(k).map(|d| d.unit).unwrap_or("");
            match unit {
                "1" | "1/K" | "1/V" | "1/V²" | "V/K" | "°C" => format!("{k} = {v}"),
                _ => format!("{k} = {}", eng(v, unit, 4)),
            }
        })
        .collect();
    let mut given = given;
    for (k, n) in &o.refs.names {
        if o.params.reference(k).is_none() {
            given.push(format!("{k} from {n}"));
        }
    }
    format!(
        "{} oscillator ({}; {} °C, {} V, {}): {}",
        o.kind().name(),
        o.origin(),
        o.env.temp_c,
        o.env.vdd,
        o.env.corner,
        given.join(", ")
    )
}

fn key_help(k: Kind, mode: Mode) -> Array {
    k.keys_for(mode)
        .iter()
        .filter_map(|n| def(n))
        .map(|d| {
            let dflt = match d.default {
                Dflt::Required => "required".to_string(),
                Dflt::Derived => "derived".to_string(),
                Dflt::Value(v) if v.is_infinite() => "default: ideal (infinite)".to_string(),
                Dflt::Value(v) => format!("default {v}"),
            };
            Dynamic::from(format!("{} ({}): {} [{dflt}]", d.name, d.unit, d.what))
        })
        .collect()
}

/// A choice map of `osc_from`: a name alone, or `#{kind: name, ...}`; the kind and the
/// remaining map, every key of it checked against `known`.
fn choice(what: &str, key: &str, v: Dynamic, known: &[&str]) -> R<(String, Map)> {
    if let Ok(s) = v.clone().into_string() {
        return Ok((s, Map::new()));
    }
    let Some(mut m) = v.clone().try_cast::<Map>() else {
        return Err(
            format!("{what}: key '{key}' must be a name or a map #{{kind: ...}}, found {}", v.type_name()).into()
        );
    };
    let kind = match m.remove("kind") {
        Some(k) => k.into_string().map_err(|t| format!("{what}: {key}: 'kind' must be a string, found {t}"))?,
        None => return Err(format!("{what}: {key}: 'kind' is required").into()),
    };
    for k in m.keys() {
        if !known.contains(&k.as_str()) {
            return Err(format!("{what}: {key}: unknown key '{k}'; known keys: kind, {}", known.join(", ")).into());
        }
    }
    Ok((kind, m))
}

fn current_choice(what: &str, v: Dynamic, res_default: &str) -> R<CurrentChoice> {
    let (kind, m) = choice(what, "reference", v, &["res_type", "ptat", "k"])?;
    let res_type = match m.get("res_type") {
        Some(r) => {
            r.clone().into_string().map_err(|t| format!("{what}: reference: 'res_type' must be a string, found {t}"))?
        }
        None => res_default.to_string(),
    };
    let num = |k: &str, d: f64| -> R<f64> {
        m.get(k).map_or(Ok(d), |x| to_f64(x).map_err(|_| format!("{what}: reference: '{k}' must be a number").into()))
    };
    Ok(match kind.as_str() {
        "ptat" => CurrentChoice::Ptat { res_type },
        "ctat" => CurrentChoice::Ctat { res_type },
        "mix" => {
            let f = num("ptat", 0.5)?;
            if !(0.0..=1.0).contains(&f) {
                return Err(
                    format!("{what}: reference: 'ptat' (the PTAT fraction at 27 °C) must be in 0…1, got {f}").into()
                );
            }
            CurrentChoice::Mix { ptat: f, res_type }
        }
        "constant_gm" => CurrentChoice::ConstantGm { res_type, k: num("k", 4.0)? },
        other => {
            return Err(
                format!("{what}: reference: unknown kind '{other}'; kinds: ptat, ctat, mix, constant_gm").into()
            );
        }
    })
}

fn threshold_choice(what: &str, v: Dynamic) -> R<ThresholdChoice> {
    let (kind, m) = choice(what, "thresholds", v, &["tc", "psrr", "device"])?;
    let num = |k: &str, d: f64| -> R<f64> {
        m.get(k).map_or(Ok(d), |x| to_f64(x).map_err(|_| format!("{what}: thresholds: '{k}' must be a number").into()))
    };
    Ok(match kind.as_str() {
        "ladder" => ThresholdChoice::Ladder,
        "bandgap" => {
            let (tc, psrr) = (num("tc", 0.0)?, num("psrr", f64::INFINITY)?);
            if tc.is_nan() || tc.abs() > 0.01 || psrr.is_nan() || psrr < 0.0 {
                return Err(format!(
                    "{what}: thresholds: tc must be in −0.01…0.01 /K and psrr ≥ 0 dB, got {tc}, {psrr}"
                )
                .into());
            }
            ThresholdChoice::Bandgap { tc, psrr }
        }
        "vt" => {
            let d = match m.get("device") {
                Some(x) => x
                    .clone()
                    .into_string()
                    .map_err(|t| format!("{what}: thresholds: 'device' must be a string, found {t}"))?,
                None => "nmos".into(),
            };
            ThresholdChoice::Vt { device: lift(MosType::parse(&d).map_err(|e| format!("{what}: thresholds: {e}")))? }
        }
        other => return Err(format!("{what}: thresholds: unknown kind '{other}'; kinds: ladder, bandgap, vt").into()),
    })
}

/// `osc_from`: the name keys (cap_type, mirror) taken out, the rest numbers.
fn from_process(pr: &Process, k: &str, mut m: Map) -> R<Osc> {
    let kind = kind(k)?;
    let what = format!("osc_from(\"{k}\")");
    let mut name = |key: &str, default: &str| -> R<String> {
        match m.remove(key) {
            None => Ok(default.to_string()),
            Some(v) => v.into_string().map_err(|t| format!("{what}: key '{key}' must be a string, found {t}").into()),
        }
    };
    let cap_type = name("cap_type", "mim")?;
    let mirror =
        lift(MirrorKind::parse(&name("mirror", "cascode")?).map_err(|e| format!("{what}: key 'mirror': {e}")))?;
    let res_type = name("res_type", "rpoly")?;
    let current = match m.remove("reference") {
        None => None,
        Some(v) => Some(current_choice(&what, v, &res_type)?),
    };
    let thresholds = match m.remove("thresholds") {
        None => None,
        Some(v) => Some(threshold_choice(&what, v)?),
    };
    let (nums, refs) = values(&what, &m)?;
    lift(osc_from_refs(pr, kind, Choices { cap_type, mirror, res_type }, &nums, &refs, current, thresholds))
}

pub fn register(engine: &mut Engine, session: &Shared) {
    engine.register_type_with_name::<Osc>("Oscillator");
    engine.register_fn("to_string", |o: &mut Osc| describe(o));
    engine.register_fn("to_debug", |o: &mut Osc| describe(o));

    api::fun(
        engine,
        "osc(kind: string, params: map) -> Oscillator",
        "an oscillator from explicit numbers; kinds \"rc-inverter\", \"schmitt\", \"window\", \"reset\", \"pingpong\"; keys c (F), i (A), r (Ω), v_lo, v_hi, vdd (V), temp (°C) and one key per parasitic (default ideal); osc_keys(kind) lists them",
        |k: &str, m: Map| -> R<Osc> {
            let kind = kind(k)?;
            let (nums, refs) = values(&format!("osc(\"{k}\")"), &m)?;
            lift(Osc::new_with(kind, &nums, &refs))
        },
    );
    api::fun(
        engine,
        "osc_keys(kind: string) -> array",
        "the keys an oscillator kind accepts in osc(), each as \"name (unit): meaning [default]\"",
        |k: &str| -> R<Array> { Ok(key_help(kind(k)?, Mode::Explicit)) },
    );
    api::fun(
        engine,
        "osc_keys(kind: string, \"process\") -> array",
        "the numeric keys of osc_from() for that kind",
        |k: &str, mode: &str| -> R<Array> {
            match mode {
                "process" => Ok(key_help(kind(k)?, Mode::Process)),
                "explicit" => Ok(key_help(kind(k)?, Mode::Explicit)),
                _ => {
                    Err(format!("osc_keys: the second argument must be \"explicit\" or \"process\", got \"{mode}\"")
                        .into())
                }
            }
        },
    );
    api::fun(
        engine,
        "osc_from(process: Process|string, kind: string, params: map) -> Oscillator",
        "an oscillator whose parts are devices of a process (a process object, or a built-in name such as \"demo180\"): mirrors, switches, input-pair comparators, process capacitor; device sizes mirror_w, mirror_l, sw_w, sw_l, cmp_w, cmp_l (m), cmp_itail (A), cmp_cload (F); inverter sizes inv_wn, inv_wp, inv_l (m); names cap_type (default \"mim\"), res_type (default \"rpoly\") and mirror (\"simple\", \"cascode\", \"wide-swing\"; default \"cascode\"); reference: \"ptat\", \"ctat\" or #{kind: \"mix\", ptat: fraction} or #{kind: \"constant_gm\", k} (on res_type) moves i as that reference of the process's devices; thresholds: \"ladder\", \"bandgap\" (#{tc, psrr}) or #{kind: \"vt\", device} moves v_lo, v_hi; osc_keys(kind, \"process\") lists the keys",
        |pr: Process, k: &str, m: Map| -> R<Osc> { from_process(&pr, k, m) },
    );
    api::fun(
        engine,
        "osc_from(process: Process|string, kind: string, params: map) -> Oscillator",
        "an oscillator whose parts are devices of a process (a process object, or a built-in name such as \"demo180\"): mirrors, switches, input-pair comparators, process capacitor; device sizes mirror_w, mirror_l, sw_w, sw_l, cmp_w, cmp_l (m), cmp_itail (A), cmp_cload (F); inverter sizes inv_wn, inv_wp, inv_l (m); names cap_type (default \"mim\"), res_type (default \"rpoly\") and mirror (\"simple\", \"cascode\", \"wide-swing\"; default \"cascode\"); reference: \"ptat\", \"ctat\" or #{kind: \"mix\", ptat: fraction} or #{kind: \"constant_gm\", k} (on res_type) moves i as that reference of the process's devices; thresholds: \"ladder\", \"bandgap\" (#{tc, psrr}) or #{kind: \"vt\", device} moves v_lo, v_hi; osc_keys(kind, \"process\") lists the keys",
        |name: &str, k: &str, m: Map| -> R<Osc> { from_process(&lift(Process::builtin(name))?, k, m) },
    );
    api::fun(
        engine,
        "o.corners() -> array",
        "the corners the oscillator can be evaluated at (o.at(#{corner: name}))",
        |o: &mut Osc| -> Array { o.corners().into_iter().map(Dynamic::from).collect() },
    );

    api::fun(
        engine,
        "o.ideal_period() -> float",
        "the textbook period of the topology from its basic keys, s",
        |o: &mut Osc| -> R<f64> { lift(o.ideal_period()) },
    );
    api::fun(
        engine,
        "o.period() -> float",
        "the period with every parasitic, in periodic steady state, s",
        |o: &mut Osc| -> R<f64> { lift(o.period()) },
    );
    api::fun(engine, "o.frequency() -> float", "1 / period with every parasitic, Hz", |o: &mut Osc| -> R<f64> {
        Ok(lift(o.cycle(Mask::ALL))?.frequency())
    });
    api::fun(
        engine,
        "o.duty() -> float",
        "fraction of the period in the first phase (charging; capacitor A; the reset pulse for \"reset\")",
        |o: &mut Osc| -> R<f64> { Ok(lift(o.cycle(Mask::ALL))?.duty) },
    );
    api::fun(
        engine,
        "o.v_peak() -> float",
        "highest node voltage over the cycle, overshoot included, V",
        |o: &mut Osc| -> R<f64> { Ok(lift(o.cycle(Mask::ALL))?.v_peak) },
    );
    api::fun(
        engine,
        "o.overshoot() -> float",
        "largest excursion of the node beyond a threshold caused by the delay chain, V",
        |o: &mut Osc| -> R<f64> { Ok(lift(o.cycle(Mask::ALL))?.overshoot) },
    );
    api::fun(
        engine,
        "o.cycle() -> map",
        "period, frequency, duty, v_peak, v_valley (V), overshoot (V), iterations, phases (array of #{name, v_start, v_threshold, v_end, ramp, delay, slope})",
        |o: &mut Osc| -> R<Map> { Ok(cycle_map(&lift(o.cycle(Mask::ALL))?)) },
    );
    api::fun(
        engine,
        "o.budget() -> map",
        "error budget: ideal, full, total_error, remainder, ideal_comparators, comparator_share, ideal_delay_chain, delay_chain_share (s); rows (array of #{parasitic, alone, alone_pct, step, step_pct, cumulative} for table; pct = % of the ideal period); waterfall and buildup (#{labels, y} for plot kind \"bar\", waterfall: true)",
        |o: &mut Osc| -> R<Map> { budget_map(o) },
    );
    api::fun(engine, "o.kind() -> string", "the topology name", |o: &mut Osc| o.kind().name().to_string());
    api::fun(engine, "o.params() -> map", "the keys given, with their values", |o: &mut Osc| -> Map {
        o.params.given().map(|(k, v)| (k.into(), Dynamic::from_float(v))).collect()
    });

    api::fun(
        engine,
        "o.modified(params: map) -> Oscillator",
        "a copy of the oscillator with some keys changed (checked like osc); o itself is unchanged",
        |o: &mut Osc, m: Map| -> R<Osc> {
            let (nums, refs) = values("modified", &m)?;
            lift(o.with_all(&nums, &refs))
        },
    );
    api::fun(
        engine,
        "o.at(#{temp: °C, vdd: V, corner: string}) -> Oscillator",
        "the same oscillator at another operating point (any of the keys)",
        |o: &mut Osc, m: Map| -> R<Osc> {
            let mut temp = None;
            let mut vdd = None;
            let mut corner = None;
            for (k, v) in &m {
                match k.as_str() {
                    "temp" => {
                        temp =
                            Some(to_f64(v).map_err(|_| {
                                format!("at: key 'temp' must be a number (°C), found {}", v.type_name())
                            })?)
                    }
                    "vdd" => {
                        vdd = Some(
                            to_f64(v)
                                .map_err(|_| format!("at: key 'vdd' must be a number (V), found {}", v.type_name()))?,
                        )
                    }
                    "corner" => {
                        corner = Some(
                            v.clone()
                                .into_string()
                                .map_err(|t| format!("at: key 'corner' must be a string, found {t}"))?,
                        )
                    }
                    other => return Err(format!("at: unknown key '{other}'; the keys are temp, vdd, corner").into()),
                }
            }
            lift(o.at(temp, vdd, corner.as_deref()))
        },
    );
    api::fun(
        engine,
        "o.simulate(cycles: int) -> map",
        &format!(
            "behavioural transient run of 1..={MAX_CYCLES} cycles with every parasitic, from a defined start (window, schmitt: node at the low threshold; reset, pingpong: capacitors at the reset level; rc-inverter: capacitor discharged, X = vdd): t (s) and v (V; v2 = capacitor B for pingpong) Series of the waveform, names (the nodes), events (a map of parallel arrays, one element per event, so each goes straight to table or plot: #{{t (s), v (V), what (\"crossing\", \"decision\", \"switch\"), phase, label}}; event k is events.t[k], events.what[k], …), periods and duties (one per cycle), period (s) and duty of the steady state (mean of the last quarter of the cycles), frequency (Hz), settle_cycles (cycles more than {SETTLE_RTOL:e} off the steady period), v_min, v_max (V), steps"
        ),
        |o: &mut Osc, cycles: Dynamic| -> R<Map> {
            Ok(transient_map(lift(simulate(o, cycles_arg(&cycles)?, &Options::default()))?))
        },
    );
    let s = session.clone();
    api::fun(
        engine,
        "o.simulate(cycles: int, options: map) -> map",
        &format!(
            "as o.simulate(cycles), with options points_per_phase (0..={MAX_POINTS_PER_PHASE} waveform samples per phase; default 64, fewer for long runs), v0 (V, start voltage of the node, capacitor A or X), v0_b (V, start of pingpong capacitor B), rtol (integrator relative tolerance, {:e}..={:e}, default {RTOL:e}), noise (true: the white noise sources of the keys i_noise, vn_cmp with cmp_nbw, vn_ref in every ramp and decision, by exact first-passage sampling; reproducible with the run's --seed), seed (integer, replaces the run's seed for this call)",
            RTOL_RANGE.start(),
            RTOL_RANGE.end()
        ),
        move |o: &mut Osc, cycles: Dynamic, opts: Map| -> R<Map> {
            let seed = s.lock().seed;
            Ok(transient_map(lift(simulate(o, cycles_arg(&cycles)?, &sim_options(&opts, seed)?))?))
        },
    );
    let s = session.clone();
    api::fun(
        engine,
        "o.sweep(key: string, values: Series) -> Series",
        "period with every parasitic for each value of one key, s (evaluated in parallel on --threads)",
        move |o: &mut Osc, key: &str, values: Series| -> R<Series> {
            let threads = s.lock().threads;
            Ok(Series::from(lift(crate::analysis::sweep::sweep(o, key, values.as_slice(), threads))?))
        },
    );
}
