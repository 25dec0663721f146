//! A sweep of one key: the period with every parasitic for each value, through the same
//! parallel map as the Monte Carlo (results in value order whatever the thread count).
use super::parallel::map_range;
use crate::timing::Osc;

/// Period (s) of `o` with `key` set to each of `values`, on `threads` threads (0: all cores).
pub fn sweep(o: &Osc, key: &str, values: &[f64], threads: usize) -> Result<Vec<f64>, String> {
    let v = o.variant(&[key])?;
    map_range(0..values.len() as u64, threads, "sweep", |k| v.eval(&[values[k as usize]]).map(|(t, _)| t))
}
