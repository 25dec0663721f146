//! Operating point of an evaluation: temperature, supply, process corner.

/// Where an oscillator is evaluated. Temperatures are kept in °C here (the script-level unit)
/// and converted explicitly with `kelvin()` wherever a model needs an absolute temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Env {
    /// Temperature, °C.
    pub temp_c: f64,
    /// Supply voltage, V.
    pub vdd: f64,
    /// Process corner name ("typical" for explicit-number oscillators).
    pub corner: String,
}

/// Reference temperature of linear temperature coefficients, °C (common practice: 27 °C).
pub const T_REF_C: f64 = 27.0;

impl Env {
    /// Absolute temperature, K (0 °C = 273.15 K, SI definition).
    pub fn kelvin(&self) -> f64 {
        self.temp_c + 273.15
    }
    /// Linear temperature factor 1 + tc·(T − T_ref) (common practice: first-order tempco).
    pub fn tc_factor(&self, tc: f64) -> f64 {
        1.0 + tc * (self.temp_c - T_REF_C)
    }
}
