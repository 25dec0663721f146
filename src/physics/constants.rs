//! Physical constants and the thermal voltage.

/// Boltzmann constant, J/K (CODATA 2018, exact by the 2019 SI definition).
pub const K_B: f64 = 1.380649e-23;
/// Elementary charge, C (CODATA 2018, exact by the 2019 SI definition).
pub const Q_E: f64 = 1.602176634e-19;
/// 0 °C in kelvin (SI definition of the Celsius scale).
pub const ZERO_CELSIUS: f64 = 273.15;
/// Vacuum permittivity, F/m (CODATA 2018).
pub const EPS_0: f64 = 8.8541878128e-12;

/// Kelvin from degrees Celsius (SI definition of the Celsius scale).
pub fn kelvin(temp_c: f64) -> f64 {
    temp_c + ZERO_CELSIUS
}

/// Thermal voltage kT/q in volts at `temp_c` °C (definition, CODATA 2018 constants).
pub fn thermal_voltage(temp_c: f64) -> f64 {
    K_B * kelvin(temp_c) / Q_E
}

/// Temperatures a model accepts, °C: well beyond any qualification range, but not absurd.
pub const TEMP_RANGE_C: (f64, f64) = (-273.0, 400.0);

/// Check a script-level temperature, naming it in the error.
pub fn check_temp(temp_c: f64) -> Result<f64, String> {
    if temp_c.is_finite() && temp_c >= TEMP_RANGE_C.0 && temp_c <= TEMP_RANGE_C.1 {
        Ok(temp_c)
    } else {
        Err(format!("temp must be in {}..{} °C, got {temp_c}", TEMP_RANGE_C.0, TEMP_RANGE_C.1))
    }
}
