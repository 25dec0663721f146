//! White noise sources of an oscillator: the charging and discharging currents' noise
//! density, the comparators' input-referred noise over their noise bandwidth, and the noise of
//! the threshold references. From the noise keys, or, for an oscillator built from a process,
//! from its devices (mirror and input-pair thermal noise) where the key is not given. Shared by
//! the jitter analysis and the noisy transient, so both see the same sources.
use super::keys::{Kind, Mode};
use super::osc::Osc;
pub use crate::physics::noise::single_pole_nbw;

/// The noise keys (none of them changes the period).
pub const NOISE_KEYS: [&str; 5] = ["i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref"];

#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Noise {
    /// One-sided white noise density of each charging or discharging current, A/√Hz.
    pub i_noise: f64,
    /// Flicker corner of the current noise, Hz (0: white only).
    pub i_flicker_fc: f64,
    /// One-sided input-referred white noise density of each comparator, V/√Hz.
    pub vn_cmp: f64,
    /// Equivalent noise bandwidth of the comparator input, Hz.
    pub cmp_nbw: f64,
    /// RMS noise of each threshold reference at a decision, V.
    pub vn_ref: f64,
    /// One-sided white noise density of the charging and of the discharging current, A²/Hz:
    /// `i_noise`², or the source devices' own noise.
    pub i_psd: [f64; 2],
    /// Threshold-noise variance of a rising and of a falling decision (the high and the low
    /// comparator), V²: comparator noise over its bandwidth plus the reference noise.
    pub v_var: [f64; 2],
    /// Whether some source comes from the devices of a process rather than from a key.
    pub from_devices: bool,
}

impl Noise {
    /// The noise keys of `o`. The comparator noise bandwidth defaults to that of its single
    /// pole, (π/2)·cmp_gbw/cmp_a0, when a gain-bandwidth is given.
    pub fn of(o: &Osc) -> Result<Noise, String> {
        let p = &o.params;
        let get = |k: &str| if o.kind().keys_for(p.mode).contains(&k) { p.get(k) } else { 0.0 };
        let vn_cmp = get("vn_cmp");
        let mut cmp_nbw = get("cmp_nbw");
        if vn_cmp > 0.0 && cmp_nbw == 0.0 {
            let gbw = get("cmp_gbw");
            if gbw.is_finite() && gbw > 0.0 {
                cmp_nbw = single_pole_nbw(gbw / get("cmp_a0"));
            } else {
                return Err(format!(
                    "{}: 'vn_cmp' needs the comparator's noise bandwidth: give 'cmp_nbw' (Hz), or 'cmp_gbw' (and 'cmp_a0') for a single-pole input",
                    o.caller()
                ));
            }
        }
        let (i_noise, vn_ref) = (get("i_noise"), get("vn_ref"));
        // A process oscillator's devices are the noise sources where no key overrides them.
        let devices = p.mode == Mode::Process;
        let dev_i = devices && !p.has("i_noise");
        let dev_v = devices && !p.has("vn_cmp");
        let parts = &o.parts;
        let i_psd = if dev_i {
            [parts.charge.noise_psd(), parts.discharge.noise_psd()]
        } else {
            [i_noise * i_noise, i_noise * i_noise]
        };
        let cmp = if dev_v {
            [parts.cmp_hi.noise_var(), parts.cmp_lo.noise_var()]
        } else {
            [vn_cmp * vn_cmp * cmp_nbw, vn_cmp * vn_cmp * cmp_nbw]
        };
        let v_var = cmp.map(|v| v + vn_ref * vn_ref);
        let from_devices = (dev_i && i_psd.iter().any(|x| *x > 0.0)) || (dev_v && cmp.iter().any(|x| *x > 0.0));
        Ok(Noise { i_noise, i_flicker_fc: get("i_flicker_fc"), vn_cmp, cmp_nbw, vn_ref, i_psd, v_var, from_devices })
    }

    /// Current noise density of the source driving a rising (charging) or falling ramp, A²/Hz.
    pub fn current_psd(&self, rising: bool) -> f64 {
        self.i_psd[if rising { 0 } else { 1 }]
    }

    /// RMS threshold error at a decision that ends a rising or a falling ramp: comparator
    /// noise over its bandwidth and the reference noise, uncorrelated, V.
    pub fn sigma_threshold(&self, rising: bool) -> f64 {
        self.v_var[if rising { 0 } else { 1 }].sqrt()
    }

    pub fn is_silent(&self) -> bool {
        self.i_psd.iter().chain(&self.v_var).all(|x| *x == 0.0)
    }
}

/// Whether the node keeps the voltage it reached at a decision into the next phase (window,
/// Schmitt: a threshold error moves the start of the next ramp), or is reset (reset,
/// ping-pong: the error ends with the ramp).
pub fn carries_over(kind: Kind) -> bool {
    matches!(kind, Kind::Window | Kind::Schmitt)
}
