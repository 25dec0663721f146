//! The evaluation path for many samples of one oscillator (Monte Carlo, sweeps): the keys to
//! vary are checked once, then each sample gives only its values, in the same order.
use super::keys::def;
use super::osc::Osc;
use super::parasitic::Mask;

/// One oscillator with some keys left open. `Send + Sync`: evaluated from worker threads.
#[derive(Clone, Debug)]
pub struct Variant {
    base: Osc,
    keys: Vec<&'static str>,
}

impl Osc {
    /// The evaluation path for samples that give `keys` (each a key of this oscillator's kind,
    /// at most once) new values.
    pub fn variant(&self, keys: &[&str]) -> Result<Variant, String> {
        let valid = self.kind().keys_for(self.params.mode);
        let mut out: Vec<&'static str> = Vec::with_capacity(keys.len());
        for k in keys {
            let Some(name) = valid.iter().copied().find(|n| n == k) else {
                return Err(format!("{}: unknown key '{k}'; valid keys are: {}", self.caller(), valid.join(", ")));
            };
            if out.contains(&name) {
                return Err(format!("{}: key '{k}' is varied twice", self.caller()));
            }
            debug_assert!(def(name).is_some());
            out.push(name);
        }
        Ok(Variant { base: self.clone(), keys: out })
    }
}

impl Variant {
    /// The keys each sample gives, in order.
    pub fn keys(&self) -> &[&'static str] {
        &self.keys
    }

    /// Period (s) and duty of the oscillator with these key values (same order as `keys`),
    /// every parasitic on: the same numbers as `o.with(pairs)?.cycle(Mask::ALL)`, and the same
    /// errors for values out of range.
    pub fn eval(&self, values: &[f64]) -> Result<(f64, f64), String> {
        if values.len() != self.keys.len() {
            return Err(format!("{} values for {} keys ({})", values.len(), self.keys.len(), self.keys.join(", ")));
        }
        let pairs: Vec<(String, f64)> = self.keys.iter().zip(values).map(|(k, v)| (k.to_string(), *v)).collect();
        let c = self.base.with(&pairs)?.cycle(Mask::ALL)?;
        Ok((c.period, c.duty))
    }
}

#[cfg(test)]
mod tests {
    use super::super::keys::Kind;
    use super::*;

    fn window() -> Osc {
        let p: Vec<(String, f64)> = [("c", 1e-12), ("i", 1e-6), ("v_lo", 0.4), ("v_hi", 1.2)]
            .iter()
            .map(|(k, v)| (k.to_string(), *v))
            .collect();
        Osc::new(Kind::Window, &p).unwrap()
    }

    #[test]
    fn keys_are_checked_once() {
        let o = window();
        let e = o.variant(&["c", "q"]).unwrap_err();
        assert!(e.contains("unknown key 'q'") && e.contains("valid keys are: c, i"), "{e}");
        assert!(o.variant(&["c", "c"]).unwrap_err().contains("varied twice"));
        let v = o.variant(&["i", "c"]).unwrap();
        assert_eq!(v.keys(), ["i", "c"]);
        assert!(v.eval(&[1e-6]).unwrap_err().contains("1 values for 2 keys"));
        assert!(v.eval(&[-1e-6, 1e-12]).unwrap_err().contains("key 'i'"));
        // 2·C·ΔV/I (charge balance) at the ideal window: 2·2 pF·0.8 V/1 µA = 3.2 µs
        let (t, d) = v.eval(&[1e-6, 2e-12]).unwrap();
        assert!((t - 3.2e-6).abs() < 1e-18 && (d - 0.5).abs() < 1e-12, "{t} {d}");
    }

    #[test]
    fn variant_is_send_and_sync() {
        fn check<T: Send + Sync>() {}
        check::<Variant>();
    }
}
