//! Capacitors: linear types with voltage and temperature coefficients, and MOS capacitors.
use super::mismatch;
use super::mosfet::{Mos, MosType};
use super::process::Process;

#[derive(Clone, Debug, PartialEq)]
pub struct Capacitor {
    /// Capacitance at tnom and zero voltage, F.
    pub c0: f64,
    /// Voltage coefficients 1/V, 1/V²; temperature coefficients 1/K, 1/K².
    pub vc1: f64,
    pub vc2: f64,
    pub tc1: f64,
    pub tc2: f64,
    /// Reference temperature, °C.
    pub tnom: f64,
    /// σ(ΔC/C) of a matched pair, fraction.
    pub sigma: f64,
}

impl Capacitor {
    /// A capacitor from explicit numbers (σ of a matched pair 0).
    pub fn new(c0: f64, vc1: f64, vc2: f64, tc1: f64, tc2: f64, tnom: f64) -> Result<Capacitor, String> {
        if !(c0.is_finite() && c0 > 0.0) {
            return Err(format!("capacitor: c must be > 0 F, got {}", crate::num::si::eng(c0, "F", 3)));
        }
        for (n, x, lim) in [("vc1", vc1, 0.1), ("vc2", vc2, 0.1), ("tc1", tc1, 1e-2), ("tc2", tc2, 1e-4)] {
            if !(x.is_finite() && x.abs() <= lim) {
                return Err(format!("capacitor: {n} must be in −{lim}..{lim}, got {x}"));
            }
        }
        super::constants::check_temp(tnom).map_err(|e| format!("capacitor: tnom: {e}"))?;
        Ok(Capacitor { c0, vc1, vc2, tc1, tc2, tnom, sigma: 0.0 })
    }

    /// A capacitor of a process type drawn W × L (m): C0 = Ca·W·L + Cp·2(W + L), times the
    /// corner's factor.
    pub fn from_process(pr: &Process, kind: &str, w: f64, l: f64) -> Result<Capacitor, String> {
        let ct = pr.capacitor(kind)?;
        for (n, x) in [("w", w), ("l", l)] {
            if !(x.is_finite() && x > 0.0 && x <= 1e-2) {
                return Err(format!(
                    "capacitor '{kind}': {n} must be in 0 … 10.0 mm (exclusive of 0), got {}",
                    super::mosfet::len(x)
                ));
            }
        }
        let c0 = (ct.c_area * w * l + ct.c_perim * 2.0 * (w + l)) * pr.cap_scale;
        let mut c = Capacitor::new(c0, ct.vc1, ct.vc2, ct.tc1, ct.tc2, pr.tnom)?;
        c.sigma = mismatch::pelgrom(ct.a_c, w, l);
        Ok(c)
    }

    /// C(V, T) = C0·(1 + VC1·V + VC2·V²)·(1 + TC1·ΔT + TC2·ΔT²), ΔT = T − Tnom (common practice), F.
    pub fn c(&self, v: f64, temp_c: f64) -> f64 {
        let dt = temp_c - self.tnom;
        self.c0 * (1.0 + self.vc1 * v + self.vc2 * v * v) * (1.0 + self.tc1 * dt + self.tc2 * dt * dt)
    }
}

/// A MOS capacitor: the gate of a device against its tied source, drain and bulk.
#[derive(Clone, Debug, PartialEq)]
pub struct MosCap {
    pub dev: Mos,
}

impl MosCap {
    pub fn from_process(pr: &Process, kind: MosType, w: f64, l: f64) -> Result<MosCap, String> {
        Ok(MosCap { dev: Mos::from_process(pr, kind, w, l)? })
    }

    /// C(V) of the gate at V (magnitude, from depletion at 0 V to strong inversion) against
    /// the tied terminals: total smoothed-Meyer gate capacitance at Vs = Vd = 0 (see
    /// `Mos::caps_b`); accumulation (V < 0) is not modelled, F.
    pub fn c(&self, v: f64, temp_c: f64) -> f64 {
        self.dev.caps_b(v, 0.0, 0.0, temp_c).total()
    }
}
