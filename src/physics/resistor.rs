//! Resistors with temperature and voltage coefficients.
use super::mismatch;
use super::mosfet::len;
use super::process::Process;

#[derive(Clone, Debug, PartialEq)]
pub struct Resistor {
    /// Resistance at tnom and zero voltage, Ω.
    pub r0: f64,
    /// Temperature coefficients 1/K, 1/K²; voltage coefficient 1/V.
    pub tc1: f64,
    pub tc2: f64,
    pub vc: f64,
    /// Reference temperature, °C.
    pub tnom: f64,
    /// σ(ΔR/R) of a matched pair, fraction.
    pub sigma: f64,
}

impl Resistor {
    /// A resistor from explicit numbers (σ of a matched pair 0).
    pub fn new(r0: f64, tc1: f64, tc2: f64, vc: f64, tnom: f64) -> Result<Resistor, String> {
        if !(r0.is_finite() && r0 > 0.0) {
            return Err(format!("resistor: r must be > 0 Ω, got {r0}"));
        }
        for (n, x, lim) in [("tc1", tc1, 1e-2), ("tc2", tc2, 1e-4), ("vc", vc, 0.1)] {
            if !(x.is_finite() && x.abs() <= lim) {
                return Err(format!("resistor: {n} must be in −{lim}..{lim}, got {x}"));
            }
        }
        super::constants::check_temp(tnom).map_err(|e| format!("resistor: tnom: {e}"))?;
        Ok(Resistor { r0, tc1, tc2, vc, tnom, sigma: 0.0 })
    }

    /// A resistor of a process layer drawn W × L (m): R0 = Rsh·L/W, times the corner's factor.
    pub fn from_process(pr: &Process, layer: &str, w: f64, l: f64) -> Result<Resistor, String> {
        let ly = pr.resistor(layer)?;
        if !(w.is_finite() && w >= ly.wmin && w <= 1e-2) {
            return Err(format!("resistor '{layer}': w must be in {} … 10.0 mm, got {}", len(ly.wmin), len(w)));
        }
        if !(l.is_finite() && l > 0.0 && l <= 1.0) {
            return Err(format!("resistor '{layer}': l must be in 0 … 1 m (exclusive of 0), got {}", len(l)));
        }
        let mut r = Resistor::new(ly.rsh * l / w * pr.res_scale, ly.tc1, ly.tc2, ly.vc, pr.tnom)?;
        r.sigma = mismatch::pelgrom(ly.a_r, w, l);
        Ok(r)
    }

    /// R(V, T) = R0·(1 + TC1·ΔT + TC2·ΔT²)·(1 + VC·|V|), ΔT = T − Tnom (common practice), Ω.
    pub fn r(&self, v: f64, temp_c: f64) -> f64 {
        let dt = temp_c - self.tnom;
        self.r0 * (1.0 + self.tc1 * dt + self.tc2 * dt * dt) * (1.0 + self.vc * v.abs())
    }
}
