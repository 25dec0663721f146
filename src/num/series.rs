//! `Series`: an f64 vector with cheap clones (shared buffer, copy on write).
//!
//! Scripts pass whole vectors to native code; sharing the buffer means handing a Series to a
//! function costs nothing, and a temporary result is reused in place by the next operation.
use std::sync::Arc;

use super::math;

#[derive(Clone, Debug, PartialEq, Default)]
pub struct Series(Arc<Vec<f64>>);

impl From<Vec<f64>> for Series {
    fn from(v: Vec<f64>) -> Self {
        Series(Arc::new(v))
    }
}

impl FromIterator<f64> for Series {
    fn from_iter<I: IntoIterator<Item = f64>>(iter: I) -> Self {
        Series::from(iter.into_iter().collect::<Vec<_>>())
    }
}

impl Series {
    pub fn as_slice(&self) -> &[f64] {
        &self.0
    }
    pub fn len(&self) -> usize {
        self.0.len()
    }
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
    pub fn to_vec(&self) -> Vec<f64> {
        self.0.as_ref().clone()
    }
    /// Mutable access; copies the buffer only if it is shared.
    pub fn make_mut(&mut self) -> &mut Vec<f64> {
        Arc::make_mut(&mut self.0)
    }

    /// Apply `f` to the elements in place; copies the buffer first only if it is shared.
    pub fn apply(mut self, f: impl FnOnce(&mut [f64])) -> Series {
        f(self.make_mut());
        self
    }

    /// `n` points from `a` to `b` inclusive, evenly spaced. `n == 1` gives `[a]`.
    pub fn span(a: f64, b: f64, n: usize) -> Series {
        match n {
            0 => Series::default(),
            1 => Series::from(vec![a]),
            _ => {
                let step = (b - a) / (n - 1) as f64;
                // The last point is set exactly so that the end of the span is `b` bit for bit.
                (0..n).map(|k| if k == n - 1 { b } else { a + step * k as f64 }).collect()
            }
        }
    }

    /// `n` points from `a` to `b` inclusive, evenly spaced in log; needs a, b > 0.
    pub fn span_log(a: f64, b: f64, n: usize) -> Result<Series, String> {
        if !(a > 0.0 && b > 0.0) {
            return Err(format!("span_log needs both ends > 0, got {a} and {b}"));
        }
        let (la, lb) = (math::ln(a), math::ln(b));
        Ok(Series::span(la, lb, n)
            .as_slice()
            .iter()
            .enumerate()
            .map(|(k, x)| {
                if k == 0 {
                    a
                } else if k == n - 1 {
                    b
                } else {
                    math::exp(*x)
                }
            })
            .collect())
    }

    /// Elementwise unary map, reusing the buffer when it is not shared (a temporary) and
    /// writing a fresh one in a single pass otherwise.
    pub fn map_in_place(mut self, f: impl Fn(f64) -> f64) -> Series {
        match Arc::get_mut(&mut self.0) {
            Some(v) => {
                for x in v.iter_mut() {
                    *x = f(*x);
                }
                self
            }
            None => self.0.iter().map(|x| f(*x)).collect(),
        }
    }

    /// Elementwise binary operation of two equal-length series; reuses whichever buffer is free.
    pub fn zip_with(mut self, mut other: Series, f: impl Fn(f64, f64) -> f64) -> Result<Series, String> {
        if self.len() != other.len() {
            return Err(format!("series lengths differ: {} and {}", self.len(), other.len()));
        }
        if let Some(v) = Arc::get_mut(&mut self.0) {
            for (x, y) in v.iter_mut().zip(other.as_slice()) {
                *x = f(*x, *y);
            }
            Ok(self)
        } else if let Some(v) = Arc::get_mut(&mut other.0) {
            for (y, x) in v.iter_mut().zip(self.as_slice()) {
                *y = f(*x, *y);
            }
            Ok(other)
        } else {
            Ok(self.0.iter().zip(other.as_slice()).map(|(x, y)| f(*x, *y)).collect())
        }
    }

    /// Sum by pairwise summation (error O(log n · ε) instead of O(n · ε)), in numpy's
    /// arrangement, so sums agree with numpy's bit for bit.
    pub fn sum(&self) -> f64 {
        let v = self.as_slice();
        pairwise(0, v.len(), &|i| v[i])
    }
    pub fn mean(&self) -> f64 {
        if self.is_empty() { f64::NAN } else { self.sum() / self.len() as f64 }
    }
    /// Sample standard deviation (divides by n − 1), the usual estimator for Monte Carlo results.
    pub fn stdev(&self) -> f64 {
        let n = self.len();
        if n < 2 {
            return f64::NAN;
        }
        let m = self.mean();
        let v = self.as_slice();
        let ss = pairwise(0, n, &|i| (v[i] - m) * (v[i] - m));
        (ss / (n - 1) as f64).sqrt()
    }
    pub fn min(&self) -> f64 {
        self.0.iter().copied().fold(f64::NAN, f64::min)
    }
    pub fn max(&self) -> f64 {
        self.0.iter().copied().fold(f64::NAN, f64::max)
    }
    /// Index of the smallest element (first one on ties); None for an empty series.
    pub fn argmin(&self) -> Option<usize> {
        self.arg_by(|a, b| a < b)
    }
    pub fn argmax(&self) -> Option<usize> {
        self.arg_by(|a, b| a > b)
    }
    fn arg_by(&self, better: impl Fn(f64, f64) -> bool) -> Option<usize> {
        let mut best: Option<usize> = None;
        for (k, &x) in self.0.iter().enumerate() {
            if x.is_nan() {
                continue;
            }
            match best {
                Some(b) if !better(x, self.0[b]) => {}
                _ => best = Some(k),
            }
        }
        best
    }
    /// Quantile with linear interpolation between order statistics (numpy's default
    /// "linear" method, Hyndman & Fan 1996 definition 7). `p` in [0, 1].
    pub fn quantile(&self, p: f64) -> Result<f64, String> {
        if !(0.0..=1.0).contains(&p) {
            return Err(format!("quantile p must be in [0, 1], got {p}"));
        }
        if self.is_empty() {
            return Err("quantile of an empty series".into());
        }
        let mut v = self.to_vec();
        if v.iter().any(|x| x.is_nan()) {
            return Ok(f64::NAN);
        }
        v.sort_by(|a, b| a.partial_cmp(b).unwrap());
        let h = (v.len() - 1) as f64 * p;
        let lo = h.floor() as usize;
        let hi = h.ceil() as usize;
        Ok(v[lo] + (h - lo as f64) * (v[hi] - v[lo]))
    }
    /// Elements `[start, end)`; bounds are clamped to the series.
    pub fn slice(&self, start: usize, end: usize) -> Series {
        let end = end.min(self.len());
        let start = start.min(end);
        Series::from(self.0[start..end].to_vec())
    }
    /// Elements where `mask` is non-zero.
    pub fn select(&self, mask: &Series) -> Result<Series, String> {
        if mask.len() != self.len() {
            return Err(format!("mask length {} differs from series length {}", mask.len(), self.len()));
        }
        Ok(self.0.iter().zip(mask.as_slice()).filter(|(_, m)| **m != 0.0).map(|(x, _)| *x).collect())
    }
}

/// Σ f(i) for i in start..start+n by pairwise summation, arranged as numpy's `pairwise_sum`
/// (numpy/_core/src/umath/loops_utils.h.src): below 8 terms a plain loop, up to 128 terms eight
/// running sums combined as ((r0+r1)+(r2+r3))+((r4+r5)+(r6+r7)), above that the two halves
/// (the first a multiple of 8 long) summed separately.
pub fn pairwise(start: usize, n: usize, f: &impl Fn(usize) -> f64) -> f64 {
    if n < 8 {
        let mut res = 0.0;
        for i in start..start + n {
            res += f(i);
        }
        res
    } else if n <= 128 {
        let mut r = [0.0f64; 8];
        for (j, rj) in r.iter_mut().enumerate() {
            *rj = f(start + j);
        }
        let whole = n - n % 8;
        let mut i = 8;
        while i < whole {
            for (j, rj) in r.iter_mut().enumerate() {
                *rj += f(start + i + j);
            }
            i += 8;
        }
        let mut res = ((r[0] + r[1]) + (r[2] + r[3])) + ((r[4] + r[5]) + (r[6] + r[7]));
        for k in whole..n {
            res += f(start + k);
        }
        res
    } else {
        let mut half = n / 2;
        half -= half % 8;
        pairwise(start, half, f) + pairwise(start + half, n - half, f)
    }
}
