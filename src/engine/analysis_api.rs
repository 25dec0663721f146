//! Registration of the oscillator analyses: sensitivities, tempco and supply coefficient, the
//! tempco-cancelling key value, jitter and phase noise.
use rhai::{Array, Dynamic, Engine, Map};

use super::api;
use super::args::Opts;
use super::value::{R, lift, to_f64};
use crate::analysis::jitter::{Jitter, accumulated, jitter};
use crate::analysis::phase_noise::phase_noise;
use crate::analysis::sensitivity::sensitivity;
use crate::analysis::tempco::{Coefficient, cancel_tempco, supply_sensitivity, tempco};
use crate::num::Series;
use crate::timing::Osc;

fn f(x: f64) -> Dynamic {
    Dynamic::from_float(x)
}

fn sensitivity_rows(o: &Osc) -> R<Array> {
    let (_, rows, _) = lift(sensitivity(o))?;
    Ok(rows
        .iter()
        .map(|r| {
            let mut m = Map::new();
            m.insert("key".into(), Dynamic::from(r.key.to_string()));
            m.insert("value".into(), f(r.value));
            m.insert("unit".into(), Dynamic::from(r.unit.to_string()));
            m.insert("normalised".into(), r.normalised.map(f).unwrap_or_else(|| Dynamic::from("—".to_string())));
            m.insert("dt_dp".into(), f(r.absolute));
            Dynamic::from_map(m)
        })
        .collect())
}

fn coefficient_map(c: Coefficient, x_name: &str, scale: f64, unit: &str) -> Map {
    let mut m = Map::new();
    m.insert(x_name.into(), Dynamic::from(Series::from(c.x)));
    m.insert("period".into(), Dynamic::from(Series::from(c.period)));
    m.insert(unit.into(), f(c.box_coeff * scale));
    m.insert(format!("slope_{unit}").into(), f(c.slope * scale));
    m.insert(if x_name == "temp" { "period_27".into() } else { "period_nominal".into() }, f(c.nominal));
    m
}

fn jitter_map(j: &Jitter) -> Map {
    let mut m = Map::new();
    m.insert("period".into(), f(j.period));
    m.insert("sigma_period".into(), f(j.sigma_period));
    m.insert("sigma_c2c".into(), f(j.sigma_c2c));
    m.insert("sigma_v".into(), f(j.sigma_v));
    m.insert("from_devices".into(), Dynamic::from_bool(j.noise.from_devices));
    m.insert("diffusion".into(), f(j.diffusion));
    let mut c = Map::new();
    c.insert("current".into(), f(j.sigma_current));
    c.insert("threshold".into(), f(j.sigma_threshold));
    m.insert("contributions".into(), Dynamic::from_map(c));
    let ramps: Array = j
        .ramps
        .iter()
        .map(|r| {
            let mut q = Map::new();
            q.insert("name".into(), Dynamic::from(r.name.to_string()));
            q.insert("ramp".into(), f(r.ramp));
            q.insert("current".into(), f(r.current));
            q.insert("slope".into(), f(r.slope));
            q.insert("sigma".into(), f(r.sigma_current));
            Dynamic::from_map(q)
        })
        .collect();
    m.insert("ramps".into(), Dynamic::from_array(ramps));
    m
}

fn cycles_list(v: &Dynamic) -> R<Vec<usize>> {
    let xs: Vec<f64> = if let Some(s) = v.clone().try_cast::<Series>() {
        s.to_vec()
    } else if let Some(a) = v.clone().try_cast::<Array>() {
        a.iter()
            .map(|x| to_f64(x).map_err(|_| "jitter: 'cycles' must hold numbers".to_string()))
            .collect::<Result<_, _>>()?
    } else {
        return Err(
            format!("jitter: 'cycles' must be a Series or an array of cycle counts, found {}", v.type_name()).into()
        );
    };
    xs.iter()
        .map(|x| {
            if x.fract() == 0.0 && (1.0..=1e12).contains(x) {
                Ok(*x as usize)
            } else {
                Err(format!("jitter: each entry of 'cycles' must be a whole number in 1..=1e12, got {x}").into())
            }
        })
        .collect()
}

/// Power drawn from the supply by the rising ramps: vdd·Σ I·t_rise / T.
fn ramp_power(o: &Osc, j: &Jitter) -> f64 {
    let q: f64 = j.ramps.iter().filter(|r| r.slope > 0.0).map(|r| r.current * r.ramp).sum();
    o.env.vdd * q / j.period
}

fn phase_noise_map(o: &Osc, offsets: &Series, power: Option<f64>) -> R<Map> {
    let j = lift(jitter(o))?;
    let p = power.unwrap_or_else(|| ramp_power(o, &j));
    let pn = lift(phase_noise(1.0 / j.period, j.diffusion, offsets.as_slice(), p, o.env.kelvin()))?;
    let mut m = Map::new();
    m.insert("offset".into(), Dynamic::from(offsets.clone()));
    m.insert("l_dbc".into(), Dynamic::from(Series::from(pn.l_dbc)));
    m.insert("bound_dbc".into(), Dynamic::from(Series::from(pn.bound_dbc)));
    m.insert("fom".into(), Dynamic::from(Series::from(pn.fom)));
    m.insert("fom_bound".into(), f(pn.fom_bound));
    m.insert("power".into(), f(pn.power));
    m.insert("beats_bound".into(), Dynamic::from_bool(pn.beats_bound));
    m.insert("corner".into(), f(pn.corner));
    Ok(m)
}

/// Most points a tempco or supply sweep takes.
const MAX_POINTS: i64 = 10_000;

pub fn register(engine: &mut Engine) {
    api::fun(
        engine,
        "o.sensitivity() -> array",
        "every numeric key of the oscillator, ranked by contribution: #{key, value, unit, normalised (∂ln T/∂ln p, or \"—\" where the nominal is 0 and for temp), dt_dp (∂T/∂p, s per unit of the key)}; a table(...) shows it; fourth-order finite differences of the period with every parasitic",
        |o: &mut Osc| sensitivity_rows(o),
    );
    api::fun(
        engine,
        "o.tempco(#{t_min: °C, t_max: °C, n: int}) -> map",
        "period versus temperature: #{temp (Series, °C), period (Series, s), ppm_per_c (box method: (T_max − T_min)/(T(27 °C)·(t_max − t_min)), ppm/°C), slope_ppm_per_c (signed (1/T)·dT/dtemp at 27 °C), period_27 (s)}; defaults −40 … 125 °C, 34 points",
        |o: &mut Osc, m: Map| -> R<Map> {
            let mut a = Opts::new(&m, "tempco");
            let lo = a.or_in("t_min", "°C", -40.0)?;
            let hi = a.or_in("t_max", "°C", 125.0)?;
            let n = a.int_in("n", 2, MAX_POINTS, 34)? as usize;
            a.finish()?;
            Ok(coefficient_map(lift(tempco(o, lo, hi, n))?, "temp", 1e6, "ppm_per_c"))
        },
    );
    api::fun(
        engine,
        "o.supply_sensitivity(#{v_min: V, v_max: V, n: int}) -> map",
        "period versus supply: #{vdd (Series, V), period (Series, s), pct_per_v (box method about the period at the oscillator's vdd, %/V), slope_pct_per_v (signed slope at its vdd, %/V)}; defaults vdd ± 0.2 V, 21 points",
        |o: &mut Osc, m: Map| -> R<Map> {
            let v = o.env.vdd;
            let mut a = Opts::new(&m, "supply_sensitivity");
            let lo = a.or_in("v_min", "V", v - 0.2)?;
            let hi = a.or_in("v_max", "V", v + 0.2)?;
            let n = a.int_in("n", 2, MAX_POINTS, 21)? as usize;
            a.finish()?;
            Ok(coefficient_map(lift(supply_sensitivity(o, lo, hi, n))?, "vdd", 100.0, "pct_per_v"))
        },
    );
    api::fun(
        engine,
        "o.tempco_cancel(key: string) -> float",
        "the value of a key (e.g. \"tc_i\") for which the period's slope versus temperature at 27 °C is zero, searched inside the key's range (±0.01 for 1/K keys)",
        |o: &mut Osc, key: &str| -> R<f64> { lift(cancel_tempco(o, key, None)) },
    );
    api::fun(
        engine,
        "o.tempco_cancel(key: string, lo: float, hi: float) -> float",
        "as tempco_cancel(key), searched inside [lo, hi]",
        |o: &mut Osc, key: &str, lo: Dynamic, hi: Dynamic| -> R<f64> {
            let lo = to_f64(&lo).map_err(|_| "tempco_cancel: 'lo' must be a number")?;
            let hi = to_f64(&hi).map_err(|_| "tempco_cancel: 'hi' must be a number")?;
            if lo.is_nan() || hi.is_nan() || lo >= hi {
                return Err(format!("tempco_cancel: need lo < hi, got {lo} and {hi}").into());
            }
            lift(cancel_tempco(o, key, Some((lo, hi))))
        },
    );
    api::fun(
        engine,
        "o.jitter() -> map",
        "period jitter from the noise keys (i_noise A/√Hz, vn_cmp V/√Hz over cmp_nbw Hz, vn_ref V rms; Abidi–Meyer ramp treatment); for osc_from, the channel thermal noise of the mirror and comparator input-pair devices where i_noise or vn_cmp is not given: #{sigma_period, sigma_c2c (s), sigma_v (threshold σ, V), from_devices (bool), contributions #{current, threshold} (σ of the period from each alone, s), diffusion (s²/s), ramps (array of #{name, ramp, current, slope, sigma})}",
        |o: &mut Osc| -> R<Map> { Ok(jitter_map(&lift(jitter(o))?)) },
    );
    api::fun(
        engine,
        "o.jitter(#{cycles: Series|array, f_min: Hz}) -> map",
        "as o.jitter(), plus accumulated: σ of the N-th edge after a given one for each N in cycles (white sources and, with i_flicker_fc, the current's flicker noise above f_min, default 1 Hz), s",
        |o: &mut Osc, m: Map| -> R<Map> {
            let mut a = Opts::new(&m, "jitter");
            let f_min = a.or_in("f_min", "Hz", 1.0)?;
            let cycles = a.get("cycles");
            a.finish()?;
            let j = lift(jitter(o))?;
            let mut out = jitter_map(&j);
            if !(f_min > 0.0 && f_min.is_finite()) {
                return Err(format!("jitter: 'f_min' must be a positive frequency (Hz), got {f_min}").into());
            }
            if let Some(c) = cycles {
                let ns = cycles_list(c)?;
                let acc: Series = ns.iter().map(|n| accumulated(&j, *n, f_min)).collect();
                out.insert("cycles".into(), Dynamic::from(ns.iter().map(|n| *n as f64).collect::<Series>()));
                out.insert("accumulated".into(), Dynamic::from(acc));
            }
            Ok(out)
        },
    );
    api::fun(
        engine,
        "o.phase_noise(offsets: Series) -> map",
        "single-sideband phase noise from the jitter (Lorentzian of a diffusing phase, Demir et al. 2000): #{offset (Hz), l_dbc (dBc/Hz), bound_dbc (Navid–Lee–Dutton minimum 7.33·kT/P·(f0/f)², dBc/Hz), fom, fom_bound (dB), power (W), beats_bound, corner (Hz)}; power is the charge the ramps draw from the supply, vdd·Σ I·t_rise/T",
        |o: &mut Osc, offsets: Series| -> R<Map> { phase_noise_map(o, &offsets, None) },
    );
    api::fun(
        engine,
        "o.phase_noise(offsets: Series, #{power: W}) -> map",
        "as o.phase_noise(offsets), with the figure of merit and the bound referred to this power",
        |o: &mut Osc, offsets: Series, m: Map| -> R<Map> {
            let mut a = Opts::new(&m, "phase_noise");
            let p = a.or_in("power", "W", f64::NAN)?;
            a.finish()?;
            phase_noise_map(o, &offsets, Some(p))
        },
    );
}
