//! The parallel map the analyses run their evaluations through: one task per index on the
//! rayon pool, results in index order whatever the thread count, the first error by index
//! (not the first to finish), and a progress bar on a terminal for long work.
use std::io::IsTerminal;

use indicatif::{ProgressBar, ProgressStyle};
use rayon::prelude::*;

/// Work of at least this many evaluations shows a progress bar (when stderr is a terminal).
const BAR_FROM: usize = 200;

/// A progress bar for `n` steps of `what`: drawn on stderr when it is a terminal and the work
/// is long, hidden otherwise (so redirected runs and tests stay quiet).
pub fn progress(n: usize, what: &str) -> ProgressBar {
    if n < BAR_FROM || !std::io::stderr().is_terminal() {
        return ProgressBar::hidden();
    }
    let bar = ProgressBar::new(n as u64);
    if let Ok(style) = ProgressStyle::with_template("{msg} {wide_bar} {pos}/{len} {eta}") {
        bar.set_style(style);
    }
    bar.set_message(what.to_string());
    bar
}

/// `f(0) … f(n−1)` in parallel, in index order; the error of the lowest failing index.
pub fn map<T: Send>(n: usize, what: &str, f: impl Fn(usize) -> Result<T, String> + Sync) -> Result<Vec<T>, String> {
    let bar = progress(n, what);
    let out: Vec<Result<T, String>> = (0..n)
        .into_par_iter()
        .map(|k| {
            let r = f(k);
            bar.inc(1);
            r
        })
        .collect();
    bar.finish_and_clear();
    out.into_iter().collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keeps_index_order_and_reports_the_first_error_by_index() {
        let v = map(1000, "test", |k| Ok(k * k)).unwrap();
        assert!(v.iter().enumerate().all(|(k, x)| *x == k * k));
        let e = map(1000, "test", |k| if k % 300 == 299 { Err(format!("bad {k}")) } else { Ok(k) }).unwrap_err();
        assert_eq!(e, "bad 299");
    }
}
