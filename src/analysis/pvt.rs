//! The PVT grid: the period of one oscillator at every combination of process corner, supply
//! and temperature, its error against the oscillator's own operating point, and the worst case
//! of each quantity.
use super::parallel;
use crate::timing::{Mask, Osc};

/// One point of the grid.
#[derive(Clone, Debug, PartialEq)]
pub struct PvtPoint {
    pub corner: String,
    /// Supply, V.
    pub vdd: f64,
    /// Temperature, °C.
    pub temp: f64,
    /// Period with every parasitic, s.
    pub period: f64,
    pub duty: f64,
}

impl PvtPoint {
    pub fn frequency(&self) -> f64 {
        1.0 / self.period
    }
}

/// The whole grid, corner-major, then supply, then temperature (temperature varies fastest).
#[derive(Clone, Debug, PartialEq)]
pub struct Pvt {
    pub points: Vec<PvtPoint>,
    /// Period of the oscillator as given (its own corner, supply and temperature), s: the
    /// reference of `error_pct`.
    pub nominal: f64,
}

/// Largest grid the analysis takes (points), so a typo cannot start a day-long run.
pub const MAX_POINTS: usize = 1_000_000;

impl Pvt {
    /// Period error of each point against the nominal period, %.
    pub fn error_pct(&self) -> Vec<f64> {
        self.points.iter().map(|p| (p.period / self.nominal - 1.0) * 100.0).collect()
    }

    /// Index of the smallest and of the largest value of `q` over the grid (the first such
    /// point in grid order on ties).
    pub fn extremes(q: &[f64]) -> (usize, usize) {
        let mut lo = 0;
        let mut hi = 0;
        for (k, x) in q.iter().enumerate() {
            if *x < q[lo] {
                lo = k;
            }
            if *x > q[hi] {
                hi = k;
            }
        }
        (lo, hi)
    }
}

/// `o` at every (corner, vdd, temp) of the grid, every parasitic on. A corner must be one the
/// oscillator knows (`o.corners()`: the process's corners for `osc_from`, only "typical" for
/// explicit numbers); the grid's supply and temperature replace any a corner fixes itself.
pub fn pvt(o: &Osc, corners: &[String], vdd: &[f64], temp: &[f64]) -> Result<Pvt, String> {
    if corners.is_empty() || vdd.is_empty() || temp.is_empty() {
        return Err("pvt: corners, vdd and temp must each hold at least one value".into());
    }
    let n = corners.len().saturating_mul(vdd.len()).saturating_mul(temp.len());
    if n > MAX_POINTS {
        return Err(format!(
            "pvt: the grid has {n} points ({} corners × {} supplies × {} temperatures); at most {MAX_POINTS}",
            corners.len(),
            vdd.len(),
            temp.len()
        ));
    }
    let known = o.corners();
    for c in corners {
        if !known.contains(c) {
            return Err(format!(
                "pvt: corner '{c}' is not known to this {} (parts from {}); its corners are: {}",
                o.caller(),
                o.origin(),
                known.join(", ")
            ));
        }
    }
    let nominal = o.period()?;
    let (nv, nt) = (vdd.len(), temp.len());
    let points = parallel::map(n, "pvt", |k| {
        let (c, v, t) = (&corners[k / (nv * nt)], vdd[(k / nt) % nv], temp[k % nt]);
        let cy = o
            .at(Some(t), Some(v), Some(c))
            .and_then(|x| x.cycle(Mask::ALL))
            .map_err(|e| format!("pvt: at corner {c}, vdd = {v} V, temp = {t} °C: {e}"))?;
        Ok(PvtPoint { corner: c.clone(), vdd: v, temp: t, period: cy.period, duty: cy.duty })
    })?;
    Ok(Pvt { points, nominal })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    #[test]
    fn grid_order_is_corner_then_supply_then_temperature() {
        let o = crate::analysis::test_osc(Kind::Window, &[("tc_c", 100e-6)]);
        let g = pvt(&o, &["typical".into()], &[1.6, 2.0], &[-40.0, 27.0, 125.0]).unwrap();
        let order: Vec<(f64, f64)> = g.points.iter().map(|p| (p.vdd, p.temp)).collect();
        assert_eq!(order, [(1.6, -40.0), (1.6, 27.0), (1.6, 125.0), (2.0, -40.0), (2.0, 27.0), (2.0, 125.0)]);
        // T ∝ c·(1 + tc_c·(T − 27)) (linear capacitor tempco): +0.98 % at 125 °C.
        let e = g.error_pct();
        assert!((e[2] - 0.98).abs() < 1e-9 && e[1].abs() < 1e-12, "{e:?}");
        assert_eq!(Pvt::extremes(&e), (0, 2));
    }

    #[test]
    fn unknown_corner_lists_the_known_ones() {
        let o = crate::analysis::test_osc(Kind::Window, &[]);
        let e = pvt(&o, &["ss".into()], &[1.8], &[27.0]).unwrap_err();
        assert!(e.contains("corner 'ss'") && e.contains("its corners are: typical"), "{e}");
    }
}
