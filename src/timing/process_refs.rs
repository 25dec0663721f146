//! References built from the devices of a process (`osc_from(..., #{reference: ..., thresholds:
//! ...})`): the current of a ΔVbe/R, Vbe/R, mixed or beta-multiplier reference on a resistor
//! layer of the process, and thresholds from a ladder, a bandgap made of the process's vertical
//! bipolar, or a device threshold voltage. Each gives the key's value at the operating point
//! over its nominal value (27 °C, the nominal process, the supply the oscillator was built at),
//! so corners, Monte Carlo draws and temperature move the reference as they move its devices.
use super::env::{Env, T_REF_C};
use super::osc::RefPoint;
use crate::num::math;
use crate::physics::constants::{K_B, Q_E, kelvin, thermal_voltage};
use crate::physics::mosfet::MosType;
use crate::physics::process::Process;
use crate::physics::reference::{Bipolar, constant_gm_starts};

/// The current reference of a process oscillator.
#[derive(Clone, Debug, PartialEq)]
pub enum CurrentChoice {
    /// ΔVbe/R on resistor layer `res_type`.
    Ptat { res_type: String },
    /// Vbe/R of the vertical bipolar on `res_type`.
    Ctat { res_type: String },
    /// `ptat` of the current at 27 °C from ΔVbe/R, the rest from Vbe/R, on one layer.
    Mix { ptat: f64, res_type: String },
    /// Beta multiplier on `res_type` with width ratio `k`.
    ConstantGm { res_type: String, k: f64 },
}

/// The threshold generator of a process oscillator (both thresholds).
#[derive(Clone, Debug, PartialEq)]
pub enum ThresholdChoice {
    /// Taps of a ladder across the supply.
    Ladder,
    /// Fractions of a first-order bandgap of the process's bipolar (zero tempco at 27 °C),
    /// with a residual tempco `tc` (1/K) and a supply rejection `psrr` (dB).
    Bandgap { tc: f64, psrr: f64 },
    /// Multiples of the threshold voltage of a `device` (Vt-referenced).
    Vt { device: MosType },
}

/// The reference choices of a process oscillator and the nominal numbers they are scaled
/// from, fixed when the oscillator was built.
#[derive(Clone, Debug, PartialEq)]
pub struct ProcRefs {
    pub current: Option<CurrentChoice>,
    pub thresholds: Option<ThresholdChoice>,
    nominal: Option<Nominal>,
}

/// What the references are at the nominal point.
#[derive(Clone, Debug, PartialEq)]
struct Nominal {
    vdd: f64,
    /// Current reference's output at 27 °C, the nominal process (relative units).
    i: f64,
    /// Threshold generator's output at 27 °C and `vdd` (relative units).
    v: f64,
}

/// Resistance of a layer relative to its tnom value at `temp_c`, with the corner's factor.
fn r_rel(pr: &Process, layer: &str, temp_c: f64) -> Result<f64, String> {
    let l = pr.resistor(layer)?;
    let dt = temp_c - pr.tnom;
    Ok(pr.res_scale * (1.0 + l.tc1 * dt + l.tc2 * dt * dt))
}

fn bipolar(pr: &Process) -> Result<&Bipolar, String> {
    pr.bipolar.as_ref().ok_or_else(|| {
        format!(
            "process '{}' has no [bipolar] section: a ctat, mix or bandgap reference needs its vertical bipolar",
            pr.name
        )
    })
}

/// First-order bandgap V_BG = Vbe + M·U_T with M such that dV_BG/dT = 0 at 27 °C (Gray, Hurst,
/// Lewis & Meyer §4.4.3; Vbe(T) of Tsividis 1980), V.
pub fn bandgap_voltage(b: &Bipolar, temp_c: f64) -> f64 {
    let m = -b.dvbe_dt(T_REF_C) / (K_B / Q_E);
    b.vbe(temp_c) + m * thermal_voltage(temp_c)
}

impl CurrentChoice {
    /// The reference's output in relative units (its shape over temperature and process).
    fn value(&self, pr: &Process, temp_c: f64) -> Result<f64, String> {
        let ptat = |layer: &str| Ok::<f64, String>(kelvin(temp_c) / r_rel(pr, layer, temp_c)?);
        let ctat = |layer: &str| Ok::<f64, String>(bipolar(pr)?.vbe(temp_c) / r_rel(pr, layer, temp_c)?);
        match self {
            CurrentChoice::Ptat { res_type } => ptat(res_type),
            CurrentChoice::Ctat { res_type } => ctat(res_type),
            CurrentChoice::Mix { ptat: f, res_type } => {
                // Weights such that the two parts are f and 1 − f of the output at 27 °C on the
                // nominal process (the only point where the weights are defined).
                Ok(f * ptat(res_type)? / kelvin(T_REF_C) + (1.0 - f) * ctat(res_type)? / bipolar(pr)?.vbe(T_REF_C))
            }
            CurrentChoice::ConstantGm { res_type, k } => {
                constant_gm_starts(*k)?;
                // I ∝ 1/(µCox·R²) (Razavi §12.3), µCox(T) = kp·(T/tnom)^−mu_exp.
                let kp = pr.nmos.kp * math::pow(kelvin(temp_c) / kelvin(pr.tnom), -pr.nmos.mu_exp);
                let r = r_rel(pr, res_type, temp_c)?;
                Ok(1.0 / (kp * r * r))
            }
        }
    }

    pub fn describe(&self) -> String {
        match self {
            CurrentChoice::Ptat { res_type } => format!("ptat on {res_type}"),
            CurrentChoice::Ctat { res_type } => format!("vbe/r on {res_type}"),
            CurrentChoice::Mix { ptat, res_type } => format!("mix of {ptat} ptat on {res_type}"),
            CurrentChoice::ConstantGm { res_type, k } => format!("constant_gm k = {k} on {res_type}"),
        }
    }
}

impl ThresholdChoice {
    /// The generator's output in relative units.
    fn value(&self, pr: &Process, temp_c: f64, vdd: f64) -> Result<f64, String> {
        match self {
            ThresholdChoice::Ladder => Ok(vdd),
            ThresholdChoice::Bandgap { tc, .. } => {
                Ok(bandgap_voltage(bipolar(pr)?, temp_c) * (1.0 + tc * (temp_c - T_REF_C)))
            }
            ThresholdChoice::Vt { device } => {
                let m = if *device == MosType::N { &pr.nmos } else { &pr.pmos };
                Ok(m.vth0 + m.tc_vth * (temp_c - pr.tnom))
            }
        }
    }

    pub fn describe(&self) -> String {
        match self {
            ThresholdChoice::Ladder => "ladder".into(),
            ThresholdChoice::Bandgap { tc, psrr } => format!("bandgap (tc {tc} /K, psrr {psrr} dB)"),
            ThresholdChoice::Vt { device } => format!("{} threshold voltage", device.name()),
        }
    }
}

impl ProcRefs {
    /// No reference of the process: the keys' own (or ideal) references.
    pub fn none() -> ProcRefs {
        ProcRefs { current: None, thresholds: None, nominal: None }
    }

    /// The choices with their nominal point fixed on `pr0` (the nominal process) at `vdd`.
    pub fn pinned(
        current: Option<CurrentChoice>,
        thresholds: Option<ThresholdChoice>,
        pr0: &Process,
        vdd: f64,
    ) -> Result<ProcRefs, String> {
        let i = match &current {
            Some(c) => c.value(pr0, T_REF_C)?,
            None => 1.0,
        };
        let v = match &thresholds {
            Some(t) => t.value(pr0, T_REF_C, vdd)?,
            None => 1.0,
        };
        if !(i.is_finite() && i > 0.0 && v.is_finite() && v > 0.0) {
            return Err("the reference gives no positive value at 27 °C on the nominal process".into());
        }
        Ok(ProcRefs { current, thresholds, nominal: Some(Nominal { vdd, i, v }) })
    }

    /// Apply the choices on `pr` (the process at the operating point) to `r`, for the nominal
    /// key values `v_lo`, `v_hi` (NaN when absent).
    pub fn apply(&self, r: &mut RefPoint, pr: &Process, env: &Env, v_lo: f64, v_hi: f64) -> Result<(), String> {
        let Some(n) = &self.nominal else { return Ok(()) };
        if let Some(c) = &self.current {
            let f = c.value(pr, env.temp_c)? / n.i;
            if !(f.is_finite() && f > 0.0) {
                return Err(format!(
                    "the current reference ({}) gives no positive current at {} °C",
                    c.describe(),
                    env.temp_c
                ));
            }
            r.i_factor = f;
            r.names.push(("i", c.describe()));
        }
        if let Some(t) = &self.thresholds {
            let f = t.value(pr, env.temp_c, env.vdd)? / n.v;
            let supply = match t {
                ThresholdChoice::Bandgap { psrr, .. } => (env.vdd - n.vdd) * math::pow(10.0, -psrr / 20.0),
                _ => 0.0,
            };
            if v_lo.is_finite() {
                r.shift_lo = v_lo * (f - 1.0) + supply;
            }
            if v_hi.is_finite() {
                r.shift_hi = v_hi * (f - 1.0) + supply;
            }
            r.names.push(("v_lo, v_hi", t.describe()));
        }
        Ok(())
    }
}
