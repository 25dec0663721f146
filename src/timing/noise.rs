//! White noise sources of an oscillator, read from its noise keys: the charging current's
//! noise density, the comparators' input-referred noise over their noise bandwidth, and the
//! noise of the threshold references. Shared by the jitter analysis and the noisy transient,
//! so both see the same sources.
use super::keys::Kind;
use super::osc::Osc;

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
}

/// Equivalent noise bandwidth of a single pole at f_p: (π/2)·f_p (common practice).
pub fn single_pole_nbw(f_pole: f64) -> f64 {
    std::f64::consts::FRAC_PI_2 * f_pole
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
        Ok(Noise { i_noise: get("i_noise"), i_flicker_fc: get("i_flicker_fc"), vn_cmp, cmp_nbw, vn_ref: get("vn_ref") })
    }

    /// RMS threshold error at one decision: comparator noise over its bandwidth and the
    /// reference noise, uncorrelated, V.
    pub fn sigma_threshold(&self) -> f64 {
        (self.vn_cmp * self.vn_cmp * self.cmp_nbw + self.vn_ref * self.vn_ref).sqrt()
    }

    pub fn is_silent(&self) -> bool {
        self.i_noise == 0.0 && self.sigma_threshold() == 0.0
    }
}

/// Whether the node keeps the voltage it reached at a decision into the next phase (window,
/// Schmitt: a threshold error moves the start of the next ramp), or is reset (reset,
/// ping-pong: the error ends with the ramp).
pub fn carries_over(kind: Kind) -> bool {
    matches!(kind, Kind::Window | Kind::Schmitt)
}
