//! Trim: each sample of a population gets the code of an N-bit trim on one key (`c` or `i`)
//! that brings its period closest to a target at the trim condition, on the real model (every
//! parasitic on); then its residual error over temperature and supply.
//!
//! Code → value law: a code k in 0 … 2^bits − 1 multiplies the key's own value by
//! 1 + lsb·(k − 2^(bits−1)); the centre code 2^(bits−1) leaves the key as built, the range is
//! 1 − lsb·2^(bits−1) … 1 + lsb·(2^(bits−1) − 1) (a binary-weighted array around the built
//! value, common practice for capacitor and current trims).
use super::parallel;
use crate::timing::Osc;

/// Keys a trim may act on.
pub const TRIM_KEYS: &[&str] = &["c", "i"];
/// Widest trim word.
pub const MAX_BITS: u32 = 16;

/// What to trim and where.
#[derive(Clone, Debug, PartialEq)]
pub struct TrimSpec {
    pub key: &'static str,
    pub bits: u32,
    /// Step of the key per code, as a fraction of its value.
    pub lsb: f64,
    /// Target period, s.
    pub target: f64,
    /// Trim condition: temperature (°C) and supply (V).
    pub at: (f64, f64),
    /// Temperatures (°C) and supplies (V) the residual is evaluated over (every combination).
    pub over_temp: Vec<f64>,
    pub over_vdd: Vec<f64>,
}

impl TrimSpec {
    /// The centre code, 2^(bits−1).
    pub fn mid(&self) -> i64 {
        1i64 << (self.bits - 1)
    }
    pub fn max_code(&self) -> i64 {
        (1i64 << self.bits) - 1
    }
    /// The factor on the key at code `k` (the code → value law of the module doc).
    pub fn factor(&self, k: i64) -> f64 {
        1.0 + self.lsb * (k - self.mid()) as f64
    }
    /// The factor range the codes reach.
    pub fn range(&self) -> (f64, f64) {
        (self.factor(0), self.factor(self.max_code()))
    }

    /// Checks of the numbers that do not need the population.
    pub fn check(&self) -> Result<(), String> {
        if !(1..=MAX_BITS).contains(&self.bits) {
            return Err(format!("trim: 'bits' must be in 1..={MAX_BITS}, got {}", self.bits));
        }
        if !(self.lsb > 0.0 && self.lsb.is_finite()) {
            return Err(format!("trim: 'lsb' must be a positive fraction of the key, got {}", self.lsb));
        }
        if self.factor(0) <= 0.0 {
            return Err(format!(
                "trim: with lsb = {} and {} bits the lowest code would make '{}' {} times its value; need lsb < {} (1/2^(bits−1))",
                self.lsb,
                self.bits,
                self.key,
                self.factor(0),
                1.0 / self.mid() as f64
            ));
        }
        if !(self.target > 0.0 && self.target.is_finite()) {
            return Err(format!("trim: 'target' must be a positive period (s), got {}", self.target));
        }
        if self.over_temp.is_empty() || self.over_vdd.is_empty() {
            return Err("trim: 'over' needs at least one temperature and one supply".into());
        }
        Ok(())
    }
}

/// A sample before the code is chosen: its oscillator at the trim condition and the factor on
/// the key that would give the target exactly.
#[derive(Clone, Debug)]
struct Needed {
    /// Relative period error before trim at the trim condition.
    before: f64,
    factor: f64,
}

/// The trimmed population.
#[derive(Clone, Debug, PartialEq)]
pub struct Trimmed {
    pub spec: TrimSpec,
    /// Code per sample.
    pub codes: Vec<i64>,
    /// The factor on the key that would give the target exactly (continuous trim), per sample.
    pub needed: Vec<f64>,
    /// Relative period error at the trim condition, before and after trim, per sample.
    pub before: Vec<f64>,
    pub at_error: Vec<f64>,
    /// Lowest and highest relative period error over the `over` grid after trim, per sample.
    pub err_min: Vec<f64>,
    pub err_max: Vec<f64>,
}

impl Trimmed {
    /// The error of largest magnitude over the grid, signed, per sample.
    pub fn worst(&self) -> Vec<f64> {
        self.err_min.iter().zip(&self.err_max).map(|(lo, hi)| if hi.abs() >= lo.abs() { *hi } else { *lo }).collect()
    }
    /// How many samples stay within [lo, hi] (relative error) at every grid point.
    pub fn inside(&self, lo: f64, hi: f64) -> usize {
        self.err_min.iter().zip(&self.err_max).filter(|(a, b)| **a >= lo && **b <= hi).count()
    }
}

/// Period of `o` with the trim key scaled by `f`, relative to `target`, minus one.
fn rel_error(o: &Osc, key: &str, base: f64, f: f64, target: f64) -> Result<f64, String> {
    Ok(o.with(&[(key.to_string(), base * f)])?.period()? / target - 1.0)
}

/// Secant steps from the first-order factor; converged to 1e-12 of the period.
const SECANT_STEPS: usize = 12;

/// `f(0) … f(n−1)` on the parallel map, in order.
fn pmap<T: Send>(n: usize, f: impl Fn(usize) -> Result<T, String> + Sync) -> Result<Vec<T>, String> {
    parallel::map(n, "trim", f)
}

/// The factor on `key` that gives the target at the trim condition: secant iteration from the
/// first-order factor (T ∝ c, T ∝ 1/i), with Brent's method on a grown bracket if it stalls.
fn needed(o_at: &Osc, spec: &TrimSpec) -> Result<Needed, String> {
    let key = spec.key;
    let base = o_at.params.get(key);
    let g = |f: f64| rel_error(o_at, key, base, f, spec.target);
    let before = g(1.0)?;
    let first = if key == "i" { 1.0 + before } else { 1.0 / (1.0 + before) };
    let (mut f0, mut g0) = (1.0, before);
    let mut f1 = first;
    for _ in 0..SECANT_STEPS {
        let g1 = g(f1)?;
        if g1.abs() < 1e-12 {
            return Ok(Needed { before, factor: f1 });
        }
        if g1 == g0 {
            break;
        }
        let f2 = f1 - g1 * (f1 - f0) / (g1 - g0);
        if !(f2 > 0.0 && f2.is_finite()) {
            break;
        }
        (f0, g0, f1) = (f1, g1, f2);
    }
    let factor = crate::num::roots::brent(|f| g(f).unwrap_or(f64::NAN), 0.5 * first, 2.0 * first, 1e-13, 200)
        .map_err(|e| format!("no factor on '{key}' in {} … {} gives the target: {e}", 0.5 * first, 2.0 * first))?;
    Ok(Needed { before, factor })
}

/// A sample's oscillator, by index.
pub type Sample<'a> = &'a (dyn Fn(usize) -> Result<Osc, String> + Sync);

/// Trim samples `0 … n−1` of a population (`sample(k)` gives sample k's oscillator).
/// Errors when a sample needs a factor outside the code range (more than half an LSB beyond
/// it), naming how many and the range the population needs.
pub fn trim(n: usize, sample: Sample, spec: &TrimSpec) -> Result<Trimmed, String> {
    spec.check()?;
    let at = at_condition(n, sample, spec)?;
    let need: Vec<f64> = at.iter().map(|(_, nd)| nd.factor).collect();
    let (lo, hi) = spec.range();
    let half = 0.5 * spec.lsb;
    let outside = need.iter().filter(|f| **f < lo - half || **f > hi + half).count();
    if outside > 0 {
        let (need_lo, need_hi) = min_max(&need);
        return Err(format!(
            "trim: {outside} of {n} samples need '{}' scaled outside the trim range {lo:.4} … {hi:.4} ({} bits, lsb {}): the population needs {need_lo:.4} … {need_hi:.4}; use more bits or a larger lsb (trim_size finds the fewest)",
            spec.key, spec.bits, spec.lsb
        ));
    }
    finish(sample, &at, spec)
}

/// The codes and the residuals of a population whose needed factors are known.
fn finish(sample: Sample, at: &[(Osc, Needed)], spec: &TrimSpec) -> Result<Trimmed, String> {
    let per = pmap(at.len(), |k| {
        let (o_at, nd) = &at[k];
        let o = sample(k)?;
        codes_and_grid(&o, o_at, nd, spec).map_err(|e| format!("trim: sample {k}: {e}"))
    })?;
    Ok(Trimmed {
        spec: spec.clone(),
        codes: per.iter().map(|p| p.0).collect(),
        needed: at.iter().map(|(_, nd)| nd.factor).collect(),
        before: at.iter().map(|(_, nd)| nd.before).collect(),
        at_error: per.iter().map(|p| p.1).collect(),
        err_min: per.iter().map(|p| p.2).collect(),
        err_max: per.iter().map(|p| p.3).collect(),
    })
}

/// Widest word `trim_size` tries.
pub const SIZE_MAX_BITS: u32 = 12;

/// The trim `trim_size` found: the fewest bits, the LSB for them, the factor range the
/// population needs, and the population trimmed with them.
#[derive(Clone, Debug, PartialEq)]
pub struct Sizing {
    pub bits: u32,
    pub lsb: f64,
    pub needed: (f64, f64),
    pub trimmed: Trimmed,
    /// Every word tried: (bits, lsb, samples inside the accuracy).
    pub tried: Vec<(u32, f64, usize)>,
}

/// The smallest LSB with which a `bits`-bit code covers factors `lo … hi` to within half an
/// LSB at either end (from the code → value law).
pub fn covering_lsb(bits: u32, lo: f64, hi: f64) -> f64 {
    let mid = (1u64 << (bits - 1)) as f64;
    let down = (1.0 - lo) / (mid + 0.5);
    let up = (hi - 1.0) / (mid - 0.5);
    down.max(up).max(f64::MIN_POSITIVE) * (1.0 + 1e-9)
}

/// The fewest bits (1 ..= SIZE_MAX_BITS) and the LSB that trim the population to within
/// ±`accuracy` (relative) over the grid for at least a fraction `want_yield` of the samples,
/// the code range covering every sample; `spec.bits` and `spec.lsb` are ignored. Each word is
/// tried in turn from one bit up, on the real model.
pub fn trim_size(n: usize, sample: Sample, spec: &TrimSpec, accuracy: f64, want_yield: f64) -> Result<Sizing, String> {
    if !(accuracy > 0.0 && accuracy.is_finite()) {
        return Err(format!("trim_size: 'accuracy' must be a positive percentage, got {}", accuracy * 100.0));
    }
    if !(want_yield > 0.0 && want_yield <= 1.0) {
        return Err(format!("trim_size: 'yield' must be in (0, 1], got {want_yield}"));
    }
    let probe = TrimSpec { bits: 1, lsb: 0.5, ..spec.clone() };
    probe.check().map_err(|e| e.replacen("trim:", "trim_size:", 1))?;
    let at = at_condition(n, sample, &probe)?;
    let need: Vec<f64> = at.iter().map(|(_, nd)| nd.factor).collect();
    let needed = min_max(&need);
    let want = (want_yield * n as f64).ceil() as usize;
    let mut tried = Vec::new();
    for bits in 1..=SIZE_MAX_BITS {
        let lsb = covering_lsb(bits, needed.0, needed.1);
        let s = TrimSpec { bits, lsb, ..spec.clone() };
        if s.check().is_err() {
            continue;
        }
        // With a step over four times the accuracy, the codes leave at most about half the
        // samples (whose needed factors spread over many steps) within ±accuracy: not worth
        // evaluating for a yield above one half.
        if want_yield > 0.5 && lsb > 4.0 * accuracy && bits < SIZE_MAX_BITS {
            tried.push((bits, lsb, 0));
            continue;
        }
        let t = finish(sample, &at, &s)?;
        let inside = t.inside(-accuracy, accuracy);
        tried.push((bits, lsb, inside));
        if inside >= want {
            return Ok(Sizing { bits, lsb, needed, trimmed: t, tried });
        }
    }
    let best = tried.iter().map(|t| t.2).max().unwrap_or(0);
    Err(format!(
        "trim_size: no trim of 1 … {SIZE_MAX_BITS} bits covering the population ('{}' × {:.4} … {:.4}) reaches ±{}% for {:.4} of the samples; the best keeps {best} of {n} inside: the spread over temperature and supply left after trim exceeds the accuracy",
        spec.key,
        needed.0,
        needed.1,
        accuracy * 100.0,
        want_yield
    ))
}

/// Each sample at the trim condition with its needed factor.
fn at_condition(n: usize, sample: Sample, spec: &TrimSpec) -> Result<Vec<(Osc, Needed)>, String> {
    pmap(n, |k| {
        let o = sample(k)?.at(Some(spec.at.0), Some(spec.at.1), None)?;
        let nd = needed(&o, spec).map_err(|e| format!("trim: sample {k}: {e}"))?;
        Ok((o, nd))
    })
}

fn min_max(x: &[f64]) -> (f64, f64) {
    x.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(*v), b.max(*v)))
}

/// The better of the two codes around the needed factor (clipped to the range), its error at
/// the trim condition, and the lowest and highest error over the grid with that code.
fn codes_and_grid(o: &Osc, o_at: &Osc, nd: &Needed, spec: &TrimSpec) -> Result<(i64, f64, f64, f64), String> {
    let key = spec.key;
    let base = o_at.params.get(key);
    let k_real = (nd.factor - 1.0) / spec.lsb + spec.mid() as f64;
    let k_lo = (k_real.floor() as i64).clamp(0, spec.max_code());
    let k_hi = (k_real.ceil() as i64).clamp(0, spec.max_code());
    let e_lo = rel_error(o_at, key, base, spec.factor(k_lo), spec.target)?;
    let (code, e_at) = if k_hi == k_lo {
        (k_lo, e_lo)
    } else {
        let e_hi = rel_error(o_at, key, base, spec.factor(k_hi), spec.target)?;
        if e_hi.abs() < e_lo.abs() { (k_hi, e_hi) } else { (k_lo, e_lo) }
    };
    let trimmed = o.with(&[(key.to_string(), o.params.get(key) * spec.factor(code))])?;
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in &spec.over_vdd {
        for t in &spec.over_temp {
            let e = trimmed.at(Some(*t), Some(*v), None)?.period()? / spec.target - 1.0;
            lo = lo.min(e);
            hi = hi.max(e);
        }
    }
    Ok((code, e_at, lo, hi))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    /// Samples of an ideal window whose capacitor spreads evenly over ±10 %, and `extra` keys.
    fn population(n: usize, extra: &'static [(&'static str, f64)]) -> impl Fn(usize) -> Result<Osc, String> + Sync {
        move |k| {
            let c = 1e-12 * (1.0 + 0.1 * (2.0 * k as f64 / (n - 1) as f64 - 1.0));
            let o = crate::analysis::test_osc(Kind::Window, extra);
            o.with(&[("c".to_string(), c)])
        }
    }

    fn spec(key: &'static str, bits: u32, lsb: f64) -> TrimSpec {
        // Ideal window at c = 1 pF: T = 2·C·ΔV/I = 2·1 pF·0.6 V/1 µA = 1.2 µs (charge balance).
        TrimSpec { key, bits, lsb, target: 1.2e-6, at: (27.0, 1.8), over_temp: vec![27.0], over_vdd: vec![1.8] }
    }

    #[test]
    fn ideal_capacitor_trim_picks_the_closed_form_code_within_half_an_lsb() {
        // T ∝ c exactly: the needed factor is target/T = 1/(1 + δ) and the best code is the
        // nearest one, round((1/(1 + δ) − 1)/lsb) + 2^(bits−1) (independent closed form).
        let n = 41;
        let s = spec("c", 5, 0.008);
        let t = trim(n, &population(n, &[]), &s).unwrap();
        for k in 0..n {
            let delta = 0.1 * (2.0 * k as f64 / (n - 1) as f64 - 1.0);
            let want = ((1.0 / (1.0 + delta) - 1.0) / 0.008).round() as i64 + 16;
            assert_eq!(t.codes[k], want, "sample {k}");
            assert!((t.needed[k] * (1.0 + delta) - 1.0).abs() < 1e-11);
            // At the trim condition the period error is (1 + δ)·f_code − 1, within ±LSB/2.
            assert!(t.at_error[k].abs() <= 0.5 * 0.008 * (1.0 + delta) + 1e-12, "sample {k}: {}", t.at_error[k]);
        }
    }

    #[test]
    fn residual_at_the_trim_condition_is_within_half_a_code_step_with_parasitics() {
        // With switch junctions, input capacitance, mirror output resistance and the delay
        // chain, the period is no longer proportional to c or 1/i; the nearest code still
        // leaves at most half the local code step (checked against the periods of the two
        // neighbouring codes, evaluated independently).
        const REAL: &[(&str, f64)] = &[
            ("c_swn", 5e-15),
            ("c_in", 10e-15),
            ("r_out", 50e6),
            ("vos_hi", 2e-3),
            ("t_logic", 1e-9),
            ("t_cmp", 5e-9),
        ];
        let n = 21;
        for (key, lsb) in [("c", 0.01), ("i", 0.01)] {
            let s = TrimSpec { target: 1.25e-6, ..spec(key, 6, lsb) };
            let pop = population(n, REAL);
            let t = trim(n, &pop, &s).unwrap();
            for k in 0..n {
                let o = pop(k).unwrap();
                let base = o.params.get(key);
                let e = |code: i64| rel_error(&o, key, base, s.factor(code), s.target).unwrap();
                let (here, down, up) = (e(t.codes[k]), e(t.codes[k] - 1), e(t.codes[k] + 1));
                assert_eq!(here, t.at_error[k]);
                assert!(here.abs() <= down.abs() && here.abs() <= up.abs(), "{key} sample {k}");
                let step = (up - down).abs() / 2.0;
                assert!(here.abs() <= 0.5 * step * (1.0 + 1e-9), "{key} sample {k}: {here} vs step {step}");
                if key == "c" {
                    // The parasitic capacitance does not scale with the code: a step below lsb.
                    assert!(here.abs() <= 0.5 * lsb * 1.2, "{key} sample {k}: {here}");
                }
            }
        }
    }

    #[test]
    fn a_range_that_cannot_cover_the_population_says_how_many_fall_outside() {
        // 3 bits of 2 %: factors 0.92 … 1.06 (plus half an LSB); the population needs
        // 1/1.1 … 1/0.9 = 0.909 … 1.111.
        let n = 41;
        let e = trim(n, &population(n, &[]), &spec("c", 3, 0.02)).unwrap_err();
        assert!(e.contains("of 41 samples need 'c' scaled outside the trim range 0.9200 … 1.0600"), "{e}");
        assert!(e.contains("the population needs 0.9091 … 1.1111"), "{e}");
        let e = trim(n, &population(n, &[]), &spec("c", 3, 0.3)).unwrap_err();
        assert!(e.contains("need lsb < 0.25"), "{e}");
    }

    #[test]
    fn residual_over_temperature_is_the_tempco_left_after_trim() {
        // A linear capacitor tempco tc_c moves the trimmed period by tc_c·(T − 27) (first-order
        // tempco, common practice): over −40 … 125 °C the error spans the trim-point error
        // −67·tc_c … +98·tc_c.
        let n = 11;
        let s = TrimSpec { over_temp: vec![-40.0, 27.0, 125.0], ..spec("c", 8, 0.002) };
        let t = trim(n, &population(n, &[("tc_c", 100e-6)]), &s).unwrap();
        for k in 0..n {
            let a = t.at_error[k];
            assert!((t.err_max[k] - ((1.0 + a) * (1.0 + 98.0 * 100e-6) - 1.0)).abs() < 1e-12, "{k}");
            assert!((t.err_min[k] - ((1.0 + a) * (1.0 - 67.0 * 100e-6) - 1.0)).abs() < 1e-12, "{k}");
        }
    }

    #[test]
    fn sizing_finds_the_fewest_bits_from_the_quantisation_bound() {
        // Needed factors 1/1.1 … 1/0.9. Covering LSB: 3 bits 0.1111/3.5 = 3.17 % (worst error
        // up to lsb/(2·0.909) = 1.75 %), 4 bits 0.1111/7.5 = 1.48 % (at most 0.81 %): within
        // ±1 % for every sample takes 4 bits.
        let n = 101;
        let z = trim_size(n, &population(n, &[]), &spec("c", 1, 0.1), 0.01, 1.0).unwrap();
        assert_eq!(z.bits, 4, "{:?}", z.tried);
        assert!((z.lsb - (1.0 / 0.9 - 1.0) / 7.5).abs() < 1e-9, "{}", z.lsb);
        assert_eq!(z.trimmed.inside(-0.01, 0.01), n);
        assert!(z.tried.iter().any(|t| t.0 == 3 && t.2 < n), "{:?}", z.tried);
        // An accuracy below what the spread over temperature leaves cannot be reached.
        let s = TrimSpec { over_temp: vec![-40.0, 125.0], ..spec("c", 1, 0.1) };
        let e = trim_size(n, &population(n, &[("tc_c", 100e-6)]), &s, 0.001, 0.9).unwrap_err();
        assert!(e.contains("exceeds the accuracy"), "{e}");
    }
}
