//! References as values of keys: a current key (`i: ptat(750n)`) or a threshold key
//! (`v_hi: ladder(0.75)`, `v_lo: bandgap(0.4, ...)`) whose value moves with temperature and
//! supply the way its generator does. The key's plain number is the reference's nominal value
//! (27 °C, the supply it was set at); the period model uses the value at the operating point
//! when the reference's parasitic is on, and the nominal one when it is off ("ideal
//! reference"). The formulas are in `physics::reference`.
use super::env::T_REF_C;
use crate::num::si::eng_exact;
use crate::physics::constants::kelvin;
use crate::physics::reference::{self as law, Bipolar};

/// What a reference delivers.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quantity {
    Current,
    Voltage,
}

impl Quantity {
    pub fn unit(self) -> &'static str {
        match self {
            Quantity::Current => "A",
            Quantity::Voltage => "V",
        }
    }
}

/// How one term of a reference moves. Each gives a factor (or, for the absolute laws, a value)
/// at temperature `temp_c` and supply `vdd`; `vdd_nom` is the supply the reference was set at.
#[derive(Clone, Debug, PartialEq)]
pub enum Law {
    /// ΔVbe/R: I ∝ T/R(T), R(T) = R·(1 + tc1·ΔT + tc2·ΔT²); factor 1 at 27 °C.
    Ptat { r_tc1: f64, r_tc2: f64 },
    /// Linear factor 1 + tc·ΔT (a CTAT current given by its slope).
    Linear { tc: f64 },
    /// Vbe/R: I ∝ Vbe(T)/R(T) with Vbe of a process's vertical bipolar; factor 1 at 27 °C.
    Ctat { bip: Bipolar, r_tc1: f64, r_tc2: f64 },
    /// Beta multiplier: the absolute current 2(1 − 1/√K)²/(µCox(T)·(W/L)·R(T)²), A, with
    /// µCox(T) = kp·(T/300.15 K)^(−mu_exp).
    ConstantGm { kp: f64, mu_exp: f64, wl: f64, k: f64, r: f64, r_tc1: f64, r_tc2: f64 },
    /// A tap of a ladder across the supply: the value V_DD (the term's gain is the ratio).
    Ladder,
    /// A bandgap-style voltage: absolute value, V.
    Bandgap { v: f64, tc: f64, tc2: f64, psrr_db: f64 },
}

fn poly(tc1: f64, tc2: f64, temp_c: f64) -> f64 {
    let dt = temp_c - T_REF_C;
    1.0 + tc1 * dt + tc2 * dt * dt
}

impl Law {
    fn at(&self, temp_c: f64, vdd: f64, vdd_nom: f64) -> f64 {
        match self {
            Law::Ptat { r_tc1, r_tc2 } => kelvin(temp_c) / kelvin(T_REF_C) / poly(*r_tc1, *r_tc2, temp_c),
            Law::Linear { tc } => 1.0 + tc * (temp_c - T_REF_C),
            Law::Ctat { bip, r_tc1, r_tc2 } => bip.vbe(temp_c) / bip.vbe(T_REF_C) / poly(*r_tc1, *r_tc2, temp_c),
            Law::ConstantGm { kp, mu_exp, wl, k, r, r_tc1, r_tc2 } => {
                let kp_t = kp * crate::num::math::pow(kelvin(temp_c) / kelvin(T_REF_C), -mu_exp);
                law::constant_gm_current(kp_t, *wl, r * poly(*r_tc1, *r_tc2, temp_c), *k)
            }
            Law::Ladder => law::ladder(1.0, vdd),
            Law::Bandgap { v, tc, tc2, psrr_db } => law::bandgap(*v, *tc, *tc2, *psrr_db, temp_c, vdd - vdd_nom),
        }
    }

    fn name(&self, gain: f64, unit: &str) -> String {
        let val = |x: f64| eng_exact(x, unit).trim_end().to_string();
        match self {
            Law::Ptat { .. } => format!("ptat({})", val(gain)),
            Law::Linear { tc } => format!("ctat({}, {tc} /K)", val(gain)),
            Law::Ctat { .. } => format!("vbe/r({})", val(gain)),
            Law::ConstantGm { .. } => format!("constant_gm({})", val(gain * self.at(T_REF_C, 1.8, 1.8))),
            Law::Ladder => format!("ladder({gain})"),
            Law::Bandgap { v, .. } => format!("bandgap({})", val(*v * gain)),
        }
    }
}

/// One term: gain × law.
#[derive(Clone, Debug, PartialEq)]
pub struct Term {
    pub gain: f64,
    pub law: Law,
}

/// A reference: the sum of its terms (a PTAT and a CTAT current mixed, or a single term).
#[derive(Clone, Debug, PartialEq)]
pub struct Reference {
    pub quantity: Quantity,
    pub terms: Vec<Term>,
    /// Supply the reference was set at, V (NaN until the oscillator pins it to its own vdd).
    pub vdd_nom: f64,
}

impl Reference {
    fn one(quantity: Quantity, gain: f64, law: Law) -> Reference {
        Reference { quantity, terms: vec![Term { gain, law }], vdd_nom: f64::NAN }
    }

    /// ΔVbe/R current of `i27` at 27 °C, with a resistor of tempcos `r_tc1`, `r_tc2`.
    pub fn ptat(i27: f64, r_tc1: f64, r_tc2: f64) -> Result<Reference, String> {
        check_current("ptat", i27)?;
        Ok(Reference::one(Quantity::Current, i27, Law::Ptat { r_tc1, r_tc2 }))
    }

    /// Current of `i27` at 27 °C falling (tc < 0) linearly with temperature.
    pub fn ctat(i27: f64, tc: f64) -> Result<Reference, String> {
        check_current("ctat", i27)?;
        if !(tc.is_finite() && (-1.0 / 200.0..=0.0).contains(&tc)) {
            return Err(format!(
                "ctat: tc = {tc} /K must be in −5e-3 … 0 /K (falling with temperature, positive up to 227 °C)"
            ));
        }
        Ok(Reference::one(Quantity::Current, i27, Law::Linear { tc }))
    }

    /// Vbe/R current of `i27` at 27 °C from a vertical bipolar.
    pub fn vbe_over_r(i27: f64, bip: Bipolar, r_tc1: f64, r_tc2: f64) -> Result<Reference, String> {
        check_current("ctat", i27)?;
        Ok(Reference::one(Quantity::Current, i27, Law::Ctat { bip, r_tc1, r_tc2 }))
    }

    /// Beta-multiplier reference (see `Law::ConstantGm`); errors for one that cannot start up.
    pub fn constant_gm(kp: f64, mu_exp: f64, wl: f64, k: f64, r: f64, r_tc1: f64) -> Result<Reference, String> {
        law::constant_gm_starts(k).map_err(|e| format!("constant_gm: {e}"))?;
        for (n, x) in [("kp", kp), ("w/l", wl), ("r", r)] {
            if !(x.is_finite() && x > 0.0) {
                return Err(format!("constant_gm: {n} must be > 0, got {x}"));
            }
        }
        let r = Reference::one(Quantity::Current, 1.0, Law::ConstantGm { kp, mu_exp, wl, k, r, r_tc1, r_tc2: 0.0 });
        check_current("constant_gm", r.nominal())?;
        Ok(r)
    }

    /// A ladder tap at `frac` of the supply.
    pub fn ladder(frac: f64) -> Result<Reference, String> {
        law::check_ladder(frac)?;
        Ok(Reference::one(Quantity::Voltage, frac, Law::Ladder))
    }

    /// A bandgap-style threshold `v` with tempco `tc` (1/K), curvature `tc2` (1/K²) and supply
    /// rejection `psrr_db`.
    pub fn bandgap(v: f64, tc: f64, tc2: f64, psrr_db: f64) -> Result<Reference, String> {
        if !(v.is_finite() && v > 0.0 && v <= 100.0) {
            return Err(format!("bandgap: v must be in (0, 100] V, got {v}"));
        }
        if !(tc.is_finite() && tc.abs() <= 0.01 && tc2.is_finite() && tc2.abs() <= 1e-4) {
            return Err(format!("bandgap: tc must be in −0.01 … 0.01 /K and tc2 in −1e-4 … 1e-4 /K², got {tc}, {tc2}"));
        }
        if !(psrr_db.is_finite() || psrr_db == f64::INFINITY) || psrr_db < 0.0 {
            return Err(format!("bandgap: psrr must be ≥ 0 dB, got {psrr_db}"));
        }
        Ok(Reference::one(Quantity::Voltage, 1.0, Law::Bandgap { v, tc, tc2, psrr_db }))
    }

    /// The sum of two references of the same quantity (a PTAT and a CTAT current mixed).
    pub fn plus(&self, other: &Reference) -> Result<Reference, String> {
        if self.quantity != other.quantity || self.quantity != Quantity::Current {
            return Err(
                "only current references add up (a PTAT and a CTAT current mixed): ptat(i1) + ctat(i2, tc)".into()
            );
        }
        let mut terms = self.terms.clone();
        terms.extend(other.terms.iter().cloned());
        Ok(Reference { quantity: self.quantity, terms, vdd_nom: f64::NAN })
    }

    /// The same reference pinned to the supply it was set at (only if not pinned yet).
    pub fn pinned(&self, vdd: f64) -> Reference {
        let mut r = self.clone();
        if r.vdd_nom.is_nan() {
            r.vdd_nom = vdd;
        }
        r
    }

    /// The same reference with every term scaled by `s` (a key given a new nominal value).
    pub fn scaled(&self, s: f64) -> Reference {
        let mut r = self.clone();
        for t in &mut r.terms {
            t.gain *= s;
        }
        r
    }

    /// Value at temperature `temp_c` and supply `vdd`.
    pub fn at(&self, temp_c: f64, vdd: f64) -> f64 {
        self.terms.iter().map(|t| t.gain * t.law.at(temp_c, vdd, self.vdd_nom)).sum()
    }

    /// Value at 27 °C and the supply it was set at: the key's nominal value.
    pub fn nominal(&self) -> f64 {
        let vdd = if self.vdd_nom.is_nan() { 1.8 } else { self.vdd_nom };
        self.terms.iter().map(|t| t.gain * t.law.at(T_REF_C, vdd, vdd)).sum()
    }

    /// How the reference reads in a description: `ptat(750 nA)`, `ladder(0.75)`, ...
    pub fn describe(&self) -> String {
        let parts: Vec<String> = self.terms.iter().map(|t| t.law.name(t.gain, self.quantity.unit())).collect();
        parts.join(" + ")
    }
}

fn check_current(what: &str, i: f64) -> Result<(), String> {
    if i.is_finite() && i > 0.0 && i <= 1.0 {
        Ok(())
    } else {
        Err(format!("{what}: the current at 27 °C must be in (0, 1] A, got {i}"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nominal_is_the_value_at_27_c() {
        let r = Reference::ptat(400e-9, 0.0, 0.0).unwrap().plus(&Reference::ctat(350e-9, -3e-3).unwrap()).unwrap();
        assert!((r.nominal() - 750e-9).abs() < 1e-21);
        assert!((r.at(27.0, 3.0) - 750e-9).abs() < 1e-21);
        let l = Reference::ladder(0.75).unwrap().pinned(1.8);
        assert!((l.nominal() - 1.35).abs() < 1e-15 && (l.at(-40.0, 2.0) - 1.5).abs() < 1e-15);
        assert!(Reference::ladder(1.0).is_err() && Reference::ladder(0.0).is_err());
        assert!(Reference::ladder(0.5).unwrap().plus(&Reference::ladder(0.2).unwrap()).is_err());
    }
}
