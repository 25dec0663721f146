//! Monte Carlo of an oscillator: `n` samples, each drawing its varied keys (and, for an
//! oscillator built from a process, the process's global spread and the devices' mismatch) from
//! its own random stream, evaluated in parallel; the periods, duties and drawn values in sample
//! order, their statistics and the yield inside a window.
//!
//! Reproducibility: sample i draws from ChaCha8 keyed by the run's seed, stream i, so a sample's
//! values depend only on (seed, i): the same bytes for any thread count and any split of the
//! sample range ([`McSpec::run`] evaluates a sub-range; [`MonteCarlo::concat`] joins ranges).
use std::ops::Range;
use std::sync::Arc;

use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;

use super::distribution::Distribution;
use super::parallel::map_range;
use super::stats::wilson;
use crate::timing::{Osc, Variant};

/// Most samples one run may take (10^7: about a minute of the slowest oscillator per core is
/// far beyond; a typo such as 1e9 is refused rather than run for hours).
pub const MAX_SAMPLES: u64 = 10_000_000;

/// Key of the Monte Carlo streams, mixed into the run's seed so that they differ from the
/// noisy transient's streams of the same seed ("MCSAMPLE" in ASCII).
const STREAM_KEY: u64 = 0x4d43_5341_4d50_4c45;

/// The random stream of sample `i` of a run with `seed`.
pub fn stream(seed: u64, i: u64) -> ChaCha8Rng {
    let mut r = ChaCha8Rng::seed_from_u64(seed ^ STREAM_KEY);
    r.set_stream(i);
    r
}

/// What a run draws and evaluates.
#[derive(Clone, Debug)]
pub struct McSpec {
    base: Osc,
    /// Keys spread by the script, in key-name order, each with its distribution.
    vary: Vec<(&'static str, Distribution)>,
    variant: Variant,
    pub n: u64,
    pub seed: u64,
}

/// One drawn quantity: what the report calls it, its unit, how it was drawn and for which
/// device.
#[derive(Clone, Debug, PartialEq)]
pub struct Drawn {
    pub name: String,
    pub unit: String,
    pub device: String,
    pub how: String,
    /// The value it spreads around.
    pub nominal: f64,
}

impl McSpec {
    /// A run of `n` samples of `base` with `vary` keys spread; the keys are checked here once.
    pub fn new(base: &Osc, vary: &[(String, Distribution)], n: u64, seed: u64) -> Result<McSpec, String> {
        if !(1..=MAX_SAMPLES).contains(&n) {
            return Err(format!("monte_carlo: 'n' must be an integer in 1..={MAX_SAMPLES}, got {n}"));
        }
        let mut vary: Vec<(String, Distribution)> = vary.to_vec();
        vary.sort_by(|a, b| a.0.cmp(&b.0));
        let keys: Vec<&str> = vary.iter().map(|(k, _)| k.as_str()).collect();
        let variant = base.variant(&keys).map_err(|e| format!("monte_carlo: 'vary': {e}"))?;
        let vary = variant.keys().iter().copied().zip(vary.iter().map(|(_, d)| *d)).collect();
        Ok(McSpec { base: base.clone(), vary, variant, n, seed })
    }

    /// The oscillator every sample starts from.
    pub fn base(&self) -> &Osc {
        &self.base
    }

    /// What each sample draws, in the order of [`Sample::values`].
    pub fn drawn(&self) -> Vec<Drawn> {
        self.vary
            .iter()
            .map(|(k, d)| Drawn {
                name: k.to_string(),
                unit: crate::timing::keys::def(k).map(|d| d.unit.to_string()).unwrap_or_default(),
                device: "key of the oscillator".into(),
                how: d.describe(),
                nominal: self.base.params.get(k),
            })
            .collect()
    }

    /// The values sample `i` draws (same order as `drawn`).
    pub fn draw(&self, i: u64) -> Vec<f64> {
        let mut rng = stream(self.seed, i);
        self.vary.iter().map(|(k, d)| d.draw(self.base.params.get(k), &mut rng)).collect()
    }

    /// Sample `i`'s period (s) and duty.
    fn eval(&self, i: u64) -> Result<Sample, String> {
        let values = self.draw(i);
        let (period, duty) = self.variant.eval(&values).map_err(|e| self.sample_error(i, &values, &e))?;
        Ok(Sample { values, period, duty })
    }

    fn sample_error(&self, i: u64, values: &[f64], e: &str) -> String {
        let drawn: Vec<String> = self.vary.iter().zip(values).map(|((k, _), v)| format!("{k} = {v:e}")).collect();
        format!("monte_carlo: sample {i} ({}) has no period: {e}", drawn.join(", "))
    }

    /// The oscillator of sample `i`, as a script could build it with `o.modified(...)`.
    pub fn sample_osc(&self, i: u64) -> Result<Osc, String> {
        if i >= self.n {
            return Err(format!("sample index {i} is outside the run's 0..{}", self.n));
        }
        let pairs: Vec<(String, f64)> = self.vary.iter().map(|(k, _)| k.to_string()).zip(self.draw(i)).collect();
        self.base.with(&pairs)
    }

    /// Evaluate the samples of `range` (a sub-range of 0..n) on `threads` threads (0: all
    /// cores). Any split of 0..n, evaluated part by part and joined with
    /// [`MonteCarlo::concat`], gives the same result as one run of the whole range.
    pub fn run(self: &Arc<Self>, range: Range<u64>, threads: usize) -> Result<MonteCarlo, String> {
        if range.start > range.end || range.end > self.n {
            return Err(format!("sample range {range:?} is outside the run's 0..{}", self.n));
        }
        let samples = map_range(range.clone(), threads, "monte carlo", |i| self.eval(i))?;
        let k = self.vary.len();
        let mut values = vec![Vec::with_capacity(samples.len()); k];
        let mut period = Vec::with_capacity(samples.len());
        let mut duty = Vec::with_capacity(samples.len());
        for s in samples {
            for (col, v) in values.iter_mut().zip(&s.values) {
                col.push(*v);
            }
            period.push(s.period);
            duty.push(s.duty);
        }
        Ok(MonteCarlo { spec: self.clone(), range, values, period, duty })
    }
}

struct Sample {
    values: Vec<f64>,
    period: f64,
    duty: f64,
}

/// The result of a run (or of a sub-range of one).
#[derive(Clone, Debug)]
pub struct MonteCarlo {
    pub spec: Arc<McSpec>,
    /// Sample indices held, in order.
    pub range: Range<u64>,
    /// Drawn values, one column per entry of `spec.drawn()`.
    pub values: Vec<Vec<f64>>,
    /// Period (s) and duty of each sample.
    pub period: Vec<f64>,
    pub duty: Vec<f64>,
}

/// Summary of one quantity over the samples.
#[derive(Clone, Debug, PartialEq)]
pub struct Stats {
    pub n: usize,
    pub mean: f64,
    pub sigma: f64,
    pub min: f64,
    pub max: f64,
    /// Quantiles at 0.1 %, 1 %, 50 %, 99 %, 99.9 % (numpy's linear interpolation).
    pub q001: f64,
    pub q01: f64,
    pub q50: f64,
    pub q99: f64,
    pub q999: f64,
}

/// Statistics of `x`: mean, sample standard deviation (n − 1), extremes and quantiles.
pub fn stats(x: &[f64]) -> Stats {
    let s = crate::num::Series::from(x.to_vec());
    let mut v = x.to_vec();
    v.sort_by(|a, b| a.total_cmp(b));
    // Linear interpolation between order statistics (Hyndman & Fan 1996, definition 7; numpy's
    // default), on the sorted copy.
    let q = |p: f64| {
        if v.is_empty() {
            return f64::NAN;
        }
        let h = (v.len() - 1) as f64 * p;
        let (lo, hi) = (h.floor() as usize, h.ceil() as usize);
        v[lo] + (h - lo as f64) * (v[hi] - v[lo])
    };
    Stats {
        n: x.len(),
        mean: s.mean(),
        sigma: s.stdev(),
        min: s.min(),
        max: s.max(),
        q001: q(0.001),
        q01: q(0.01),
        q50: q(0.5),
        q99: q(0.99),
        q999: q(0.999),
    }
}

/// Fraction of samples inside a window, with its 95 % Wilson score interval.
#[derive(Clone, Debug, PartialEq)]
pub struct Yield {
    pub n: u64,
    pub pass: u64,
    pub fraction: f64,
    pub lo: f64,
    pub hi: f64,
    /// Indices of the samples outside the window.
    pub fails: Vec<u64>,
}

/// Confidence level of the yield interval.
pub const YIELD_LEVEL: f64 = 0.95;

impl MonteCarlo {
    /// Join the results of consecutive sub-ranges of one run, in order.
    pub fn concat(parts: Vec<MonteCarlo>) -> Result<MonteCarlo, String> {
        let mut it = parts.into_iter();
        let Some(mut out) = it.next() else { return Err("no parts to join".into()) };
        for p in it {
            if !Arc::ptr_eq(&p.spec, &out.spec) {
                return Err("the parts come from different Monte Carlo runs".into());
            }
            if p.range.start != out.range.end {
                return Err(format!("part {:?} does not follow {:?}", p.range, out.range));
            }
            out.range.end = p.range.end;
            for (a, b) in out.values.iter_mut().zip(p.values) {
                a.extend(b);
            }
            out.period.extend(p.period);
            out.duty.extend(p.duty);
        }
        Ok(out)
    }

    /// Number of samples held.
    pub fn len(&self) -> usize {
        self.period.len()
    }

    pub fn is_empty(&self) -> bool {
        self.period.is_empty()
    }

    /// Frequency of each sample, Hz.
    pub fn frequency(&self) -> Vec<f64> {
        self.period.iter().map(|t| 1.0 / t).collect()
    }

    /// The oscillator of sample `i` (a run-wide index).
    pub fn sample_osc(&self, i: u64) -> Result<Osc, String> {
        self.spec.sample_osc(i)
    }

    /// Samples of `x` (one value per sample, in order) inside [min, max] (either end open).
    pub fn yield_within(&self, x: &[f64], min: Option<f64>, max: Option<f64>) -> Yield {
        let inside = |v: f64| min.is_none_or(|m| v >= m) && max.is_none_or(|m| v <= m);
        let fails: Vec<u64> =
            x.iter().enumerate().filter(|(_, v)| !inside(**v)).map(|(k, _)| self.range.start + k as u64).collect();
        let n = x.len() as u64;
        let pass = n - fails.len() as u64;
        let (lo, hi) = wilson(pass, n, YIELD_LEVEL);
        Yield { n, pass, fraction: if n == 0 { f64::NAN } else { pass as f64 / n as f64 }, lo, hi, fails }
    }
}
