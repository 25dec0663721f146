//! The parallel map every many-sample analysis runs through (Monte Carlo, sweeps): a range of
//! indices evaluated on a pool of N threads, results in index order, and a progress bar on a
//! terminal. Each result depends only on its index, so the output is the same bytes whatever
//! the thread count or however the range is split.
use std::ops::Range;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use rayon::prelude::*;

/// Largest thread count accepted.
pub const MAX_THREADS: usize = 256;

/// How many threads a run uses: 0 means all cores.
pub fn threads_or_all(threads: usize) -> usize {
    if threads == 0 { std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1) } else { threads }
}

/// Below this many items a bar would only flicker.
const BAR_MIN: u64 = 2000;

/// `f(i)` for every i of `range`, in order, on `threads` threads (0: all cores), with a
/// progress bar labelled `what` when stderr is a terminal (indicatif hides it otherwise).
/// The first error (lowest index) is returned.
pub fn map_range<T, F>(range: Range<u64>, threads: usize, what: &str, f: F) -> Result<Vec<T>, String>
where
    T: Send,
    F: Fn(u64) -> Result<T, String> + Sync,
{
    let n = range.end.saturating_sub(range.start);
    let bar = if n >= BAR_MIN {
        let b = ProgressBar::with_draw_target(Some(n), ProgressDrawTarget::stderr());
        if let Ok(s) = ProgressStyle::with_template("{msg} {wide_bar} {pos}/{len} ({eta})") {
            b.set_style(s);
        }
        b.set_message(what.to_string());
        b
    } else {
        ProgressBar::hidden()
    };
    // Chunks of indices keep the bar's updates (an atomic add) rare.
    const CHUNK: u64 = 256;
    let chunks: Vec<Range<u64>> = (0..n.div_ceil(CHUNK))
        .map(|k| range.start + k * CHUNK..(range.start + (k + 1) * CHUNK).min(range.end))
        .collect();
    let work = || -> Vec<Result<Vec<T>, String>> {
        chunks
            .into_par_iter()
            .map(|c| {
                let len = c.end - c.start;
                let out = c.map(&f).collect::<Result<Vec<T>, String>>();
                bar.inc(len);
                out
            })
            .collect()
    };
    // Inside a worker of a batch run (scripts in parallel) the batch's pool is shared, so that
    // N scripts with Monte Carlo runs do not start N × N threads.
    let parts = if rayon::current_thread_index().is_some() {
        work()
    } else {
        rayon::ThreadPoolBuilder::new()
            .num_threads(threads_or_all(threads).min(MAX_THREADS))
            .build()
            .map_err(|e| format!("cannot start the worker threads: {e}"))?
            .install(work)
    };
    bar.finish_and_clear();
    let mut out = Vec::with_capacity(n as usize);
    for p in parts {
        out.extend(p?);
    }
    Ok(out)
}

/// `f(0) … f(n−1)` in parallel on all cores (or the pool this runs in), in index order; the
/// error of the lowest failing index.
pub fn map<T: Send>(n: usize, what: &str, f: impl Fn(usize) -> Result<T, String> + Sync) -> Result<Vec<T>, String> {
    map_range(0..n as u64, 0, what, |k| f(k as usize))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn order_and_errors_do_not_depend_on_threads() {
        let f = |i: u64| if i == 700 || i == 900 { Err(format!("bad {i}")) } else { Ok(i * i) };
        let one: Vec<u64> = map_range(0..600, 1, "t", f).unwrap();
        let two: Vec<u64> = map_range(0..600, 2, "t", f).unwrap();
        assert_eq!(one, two);
        assert_eq!(one[599], 599 * 599);
        let part: Vec<u64> = map_range(100..200, 2, "t", f).unwrap();
        assert_eq!(part[..], one[100..200]);
        assert_eq!(map_range(0..1000, 2, "t", f).unwrap_err(), "bad 700");
        assert!(map_range(5..5, 2, "t", f).unwrap().is_empty());
    }
}
