//! Error budget of the period: what each parasitic costs alone, the sequential build-up from
//! the ideal to the real circuit, the interaction remainder, and the share of the comparators
//! and of the delay chain.
use super::osc::Osc;
use super::parasitic::{Mask, Parasitic};

/// One parasitic's line in the budget. Times in s.
#[derive(Clone, Debug, PartialEq)]
pub struct BudgetRow {
    pub parasitic: Parasitic,
    /// Period with only this parasitic on, minus the ideal period.
    pub alone: f64,
    /// Increase of the period when this parasitic is added to the ones above it in the
    /// build-up order.
    pub step: f64,
    /// Period after adding it.
    pub cumulative: f64,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Budget {
    /// Textbook period, s.
    pub ideal: f64,
    /// Period with every parasitic, s.
    pub full: f64,
    pub rows: Vec<BudgetRow>,
    /// Σ alone.
    pub sum_alone: f64,
    /// (full − ideal) − Σ alone: what the parasitics do together beyond their separate effects.
    pub remainder: f64,
    /// Period with everything real but ideal comparators (no offset, input capacitance or
    /// comparator delay), s.
    pub ideal_comparators: f64,
    /// Period with everything real but a zero-delay chain (comparator, latch, logic, switch), s.
    pub ideal_delay_chain: f64,
}

impl Budget {
    pub fn total_error(&self) -> f64 {
        self.full - self.ideal
    }
    /// full − ideal_comparators: the part of the error the comparators own.
    pub fn comparator_share(&self) -> f64 {
        self.full - self.ideal_comparators
    }
    /// full − ideal_delay_chain: the part of the error the delay chain owns.
    pub fn delay_chain_share(&self) -> f64 {
        self.full - self.ideal_delay_chain
    }
}

/// The budget of `o` at its operating point.
pub fn budget(o: &Osc) -> Result<Budget, String> {
    let ideal = o.ideal_period()?;
    let full = o.cycle(Mask::ALL)?.period;
    let active = o.active();
    let mut rows = Vec::with_capacity(active.len());
    let mut mask = Mask::NONE;
    let mut prev = ideal;
    for &p in &active {
        let alone = o.cycle(Mask::only(p)).map_err(|e| format!("{} alone: {e}", p.label()))?.period - ideal;
        mask = mask.with(p);
        // The last step is the full circuit itself, so the build-up closes on `full` exactly.
        let cumulative = if mask_is_full(&active, mask) { full } else { o.cycle(mask)?.period };
        rows.push(BudgetRow { parasitic: p, alone, step: cumulative - prev, cumulative });
        prev = cumulative;
    }
    let sum_alone: f64 = rows.iter().map(|r| r.alone).sum();
    let remainder = (full - ideal) - sum_alone;
    let drop = |f: fn(Parasitic) -> bool| active.iter().filter(|p| f(**p)).fold(Mask::ALL, |m, p| m.without(*p));
    let ideal_comparators = o.cycle(drop(Parasitic::is_comparator))?.period;
    let ideal_delay_chain = o.cycle(drop(Parasitic::is_delay))?.period;
    Ok(Budget { ideal, full, rows, sum_alone, remainder, ideal_comparators, ideal_delay_chain })
}

fn mask_is_full(active: &[Parasitic], m: Mask) -> bool {
    active.iter().all(|p| m.on(*p))
}
