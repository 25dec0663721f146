//! Current mirrors (simple, cascode, wide-swing cascode): output current versus output voltage
//! from the device equations, compliance, output resistance, systematic and random error, and
//! the mismatch of a charge (PMOS, high-side) / discharge (NMOS, low-side) pair.
//! NMOS mirrors sink current from the output node; PMOS mirrors source it from VDD. Currents
//! are magnitudes.
use super::mismatch;
use super::mosfet::{Mos, MosType};
use super::noise;
use super::process::Process;
use crate::num::math;
use crate::num::roots::brent;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MirrorKind {
    Simple,
    Cascode,
    WideSwing,
}

impl MirrorKind {
    pub fn parse(s: &str) -> Result<MirrorKind, String> {
        match s {
            "simple" => Ok(MirrorKind::Simple),
            "cascode" => Ok(MirrorKind::Cascode),
            "wide-swing" | "wide_swing" => Ok(MirrorKind::WideSwing),
            _ => Err(format!("mirror kind must be \"simple\", \"cascode\" or \"wide-swing\", got \"{s}\"")),
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
#[allow(clippy::large_enum_variant)]
enum Model {
    /// Behavioural: I0 at the compliance voltage, output resistance, σ of the ratio.
    Explicit { i0: f64, rout: f64, v_c: f64, sigma: f64 },
    Devices {
        /// Input (unit) device, output device (ratio × width), and their cascodes.
        m_in: Mos,
        m_out: Mos,
        c_out: Mos,
        /// Gate voltage of the bottom pair and of the cascodes (own frame, magnitudes), V.
        vg: f64,
        vb: f64,
    },
}

/// A current mirror, biased and at a given supply and temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Mirror {
    pub kind: MirrorKind,
    pub polarity: MosType,
    /// Input (reference) current A, output/input width ratio, supply V, temperature °C.
    pub i_ref: f64,
    pub ratio: f64,
    pub vdd: f64,
    pub temp: f64,
    model: Model,
}

impl Mirror {
    /// A mirror from explicit numbers: output current i0 (A) reached at the compliance voltage
    /// v_c (V), output resistance rout (Ω) above it, σ of the current ratio (fraction).
    pub fn explicit(i0: f64, rout: f64, v_c: f64, sigma: f64) -> Result<Mirror, String> {
        let chk = |name: &str, x: f64, lo: f64| -> Result<f64, String> {
            if x.is_finite() && x >= lo { Ok(x) } else { Err(format!("mirror: {name} must be ≥ {lo}, got {x}")) }
        };
        chk("i_out", i0, f64::MIN_POSITIVE)?;
        chk("rout", rout, f64::MIN_POSITIVE)?;
        chk("v_compliance", v_c, 1e-6)?;
        chk("sigma", sigma, 0.0)?;
        Ok(Mirror {
            kind: MirrorKind::Simple,
            polarity: MosType::N,
            i_ref: i0,
            ratio: 1.0,
            vdd: f64::INFINITY,
            temp: 27.0,
            model: Model::Explicit { i0, rout, v_c, sigma },
        })
    }

    /// The same behavioural mirror as a high-side source from a supply vdd (V): its output
    /// headroom is then vdd − v_out.
    pub fn sourcing(&self, vdd: f64) -> Result<Mirror, String> {
        if !matches!(self.model, Model::Explicit { .. }) {
            return Err(
                "mirror: only a behavioural mirror can be turned into a source; use type \"p\" for a device mirror"
                    .into(),
            );
        }
        if !(vdd.is_finite() && vdd > 0.0) {
            return Err(format!("mirror: vdd must be > 0 V, got {vdd}"));
        }
        Ok(Mirror { polarity: MosType::P, vdd, ..self.clone() })
    }

    /// A mirror of the process: unit device W/L (cascodes the same), output ratio × wider,
    /// input current i_ref; the wide-swing cascode biases the bottom pair `margin` volts
    /// above its saturation voltage. At the process's (corner) supply and temperature.
    #[allow(clippy::too_many_arguments)]
    pub fn from_process(
        pr: &Process,
        kind: MirrorKind,
        polarity: MosType,
        i_ref: f64,
        ratio: f64,
        w: f64,
        l: f64,
        margin: f64,
    ) -> Result<Mirror, String> {
        if !(i_ref.is_finite() && i_ref > 0.0 && i_ref < 1.0) {
            return Err(format!("mirror: i_ref must be in 0..1 A (exclusive), got {i_ref}"));
        }
        if !(ratio.is_finite() && (1e-3..=1e3).contains(&ratio)) {
            return Err(format!("mirror: ratio must be in 0.001..1000, got {ratio}"));
        }
        if !(margin.is_finite() && (0.0..=1.0).contains(&margin)) {
            return Err(format!("mirror: margin must be in 0..1 V, got {margin}"));
        }
        let temp = pr.temp;
        let m_in = Mos::from_process(pr, polarity, w, l)?;
        let m_out = m_in.with_w(w * ratio)?;
        let c_in = m_in.clone();
        let c_out = m_out.clone();
        let (vg, vb) = match kind {
            MirrorKind::Simple => (m_in.diode_vgs(i_ref, temp)?, 0.0),
            MirrorKind::Cascode => {
                let vg = m_in.diode_vgs(i_ref, temp)?;
                // Input cascode diode stacked on the input diode: gate = drain, source at vg.
                let vb = solve_gate(|v| c_in.ids(v, vg, v, temp), i_ref, vg)?;
                (vg, vb)
            }
            MirrorKind::WideSwing => {
                // Bottom input device at Vds = vx, vx = Vdsat + margin (fixed point), its gate
                // driven through the input cascode whose drain is that gate.
                let mut vx = 0.2;
                let mut vg = m_in.vgs_for(i_ref, vx, temp)?;
                for _ in 0..20 {
                    vx = m_in.vdsat(vg, temp) + margin;
                    vg = m_in.vgs_for(i_ref, vx, temp)?;
                }
                if vg <= vx {
                    return Err(format!(
                        "mirror: wide-swing bias impossible: the bottom gate ({vg:.3} V) is not above its drain ({vx:.3} V); reduce margin"
                    ));
                }
                let vb = solve_gate(|v| c_in.ids(v, vx, vg, temp), i_ref, vx)?;
                (vg, vb)
            }
        };
        Ok(Mirror {
            kind,
            polarity,
            i_ref,
            ratio,
            vdd: pr.vdd,
            temp,
            model: Model::Devices { m_in, m_out, c_out, vg, vb },
        })
    }

    /// Output voltage in the mirror's own frame (distance from its rail), V; its own inverse,
    /// so it also turns a headroom back into a node voltage.
    fn frame(&self, v_out: f64) -> f64 {
        match self.polarity {
            MosType::N => v_out,
            MosType::P => self.vdd - v_out,
        }
    }

    /// Output current magnitude at output node voltage v_out (V from ground): device equations
    /// with CLM, so triode collapse (compliance) and finite output resistance are included; the
    /// cascode's internal node is solved by Brent. Explicit mirrors: i0·(1 + (v − v_c)/(i0·rout))
    /// ·(1 − 100^(−v/v_c)), which is 1 % below the saturation line at v_c (common practice), A.
    pub fn i_out(&self, v_out: f64) -> f64 {
        let v = self.frame(v_out);
        match &self.model {
            Model::Explicit { i0, rout, v_c, .. } => {
                let line = i0 + (v - v_c) / rout;
                line * (1.0 - math::pow(100f64, -v / v_c))
            }
            Model::Devices { m_out, c_out, vg, vb, .. } => match self.kind {
                MirrorKind::Simple => m_out.id(*vg, v, self.temp),
                _ => {
                    let bottom = |x: f64| m_out.id(*vg, x, self.temp);
                    let top = |x: f64| c_out.ids(*vb, x, v, self.temp);
                    let (a, b) = if v >= 0.0 { (0.0, v) } else { (v, 0.0) };
                    let tol = 1e-15_f64.max(v.abs() * 1e-13);
                    match brent(|x| bottom(x) - top(x), a, b, tol, 200) {
                        Ok(x) => bottom(x),
                        Err(_) => 0.0,
                    }
                }
            },
        }
    }

    /// Output resistance at v_out: 1/(dIout/dVout), central difference of `i_out` over ±1 mV
    /// (common practice), Ω.
    pub fn rout(&self, v_out: f64) -> f64 {
        let h = 1e-3;
        let g = (self.i_out(v_out + h) - self.i_out(v_out - h)) / (2.0 * h);
        (1.0 / g).abs()
    }

    /// Compliance: the lowest output headroom (V from the mirror's rail) at which the current is
    /// within `tol` (fraction, e.g. 0.01) of the straight line through its saturation behaviour,
    /// extrapolated from `headroom_max` with the local output resistance (common practice), V.
    pub fn compliance(&self, headroom_max: f64, tol: f64) -> Result<f64, String> {
        if !(headroom_max.is_finite() && headroom_max > 0.0) {
            return Err(format!("mirror.compliance: headroom must be > 0 V, got {headroom_max}"));
        }
        if !(tol.is_finite() && tol > 0.0 && tol < 0.5) {
            return Err(format!("mirror.compliance: tol must be in 0..0.5 (a fraction), got {tol}"));
        }
        let at = |h: f64| self.i_out(self.frame(h));
        let d = 1e-3;
        let i_top = at(headroom_max);
        let g = (at(headroom_max) - at(headroom_max - d)) / d;
        let f = |h: f64| at(h) - (1.0 - tol) * (i_top - (headroom_max - h) * g);
        brent(f, 1e-6, headroom_max, 1e-7, 200).map_err(|e| format!("mirror.compliance: {e}"))
    }

    /// One-sided white noise density of the output current, A²/Hz: the channel thermal noise
    /// of the input and output devices at their bias (`noise::mirror_output_psd`); zero for a
    /// behavioural mirror, which has no devices.
    pub fn noise_psd(&self) -> f64 {
        match &self.model {
            Model::Explicit { .. } => 0.0,
            Model::Devices { m_in, m_out, vg, .. } => {
                let gm_in = m_in.gm(*vg, *vg, self.temp);
                let gm_out = m_out.gm(*vg, *vg, self.temp);
                noise::mirror_output_psd(gm_in, gm_out, self.ratio, self.temp)
            }
        }
    }

    /// Output-resistance compliance: the lowest headroom (V from the mirror's rail) above which
    /// Rout stays at least `frac` of its value at `headroom_max` (a cascode's Rout collapses
    /// below Vgs + Vdsat, Razavi ch. 5); scanned downward in 5 mV steps, then refined by Brent, V.
    pub fn compliance_rout(&self, headroom_max: f64, frac: f64) -> Result<f64, String> {
        if !(headroom_max.is_finite() && headroom_max > 0.0) {
            return Err(format!("mirror.compliance_rout: headroom must be > 0 V, got {headroom_max}"));
        }
        if !(frac.is_finite() && frac > 0.0 && frac < 1.0) {
            return Err(format!("mirror.compliance_rout: frac must be in 0..1 (exclusive), got {frac}"));
        }
        let r = |h: f64| self.rout(self.frame(h));
        let target = frac * r(headroom_max - 2e-3);
        let f = |h: f64| math::ln(r(h) / target);
        let step = 5e-3;
        let mut hi = headroom_max - 2e-3;
        while hi - step > 2e-3 {
            let lo = hi - step;
            if f(lo) < 0.0 {
                return brent(f, lo, hi, 1e-6, 200).map_err(|e| format!("mirror.compliance_rout: {e}"));
            }
            hi = lo;
        }
        Ok(hi)
    }

    /// Systematic error Iout/(ratio·Iref) − 1 at v_out (from the Vds difference between input
    /// and output devices), fraction.
    pub fn systematic_error(&self, v_out: f64) -> f64 {
        self.i_out(v_out) / (self.ratio * self.i_ref) - 1.0
    }

    /// σ of the output/input current ratio from Pelgrom mismatch of the bottom pair at the input
    /// bias; cascodes ignored (their mismatch is divided by their intrinsic gain, common
    /// practice), fraction.
    pub fn sigma_ratio(&self) -> f64 {
        match &self.model {
            Model::Explicit { sigma, .. } => *sigma,
            Model::Devices { m_in, m_out, vg, .. } => {
                let (a1, a2) = (m_in.w * m_in.l, m_out.w * m_out.l);
                let s_vt = mismatch::pelgrom_unequal(m_in.p.avt, a1, a2);
                let s_b = mismatch::pelgrom_unequal(m_in.p.abeta, a1, a2);
                let vds = match self.kind {
                    MirrorKind::Simple => *vg,
                    _ => m_in.vdsat(*vg, self.temp),
                };
                mismatch::current_sigma(m_in.gm_id(*vg, vds, self.temp), s_vt, s_b)
            }
        }
    }

    /// Gate voltage of the bottom pair and of the cascodes (0 for a simple mirror), magnitudes in
    /// the mirror's frame, V; None for a behavioural mirror.
    pub fn bias(&self) -> Option<(f64, f64)> {
        match &self.model {
            Model::Devices { vg, vb, .. } => Some((*vg, *vb)),
            Model::Explicit { .. } => None,
        }
    }

    /// Headroom over which to look for the compliance: the supply, or 10× the compliance
    /// voltage of a behavioural mirror, V.
    pub fn headroom(&self) -> f64 {
        match &self.model {
            Model::Explicit { v_c, .. } => 10.0 * v_c,
            Model::Devices { .. } => self.vdd,
        }
    }
}

/// Smallest-bracket solve of current(v) = id for a monotonic current, v above `lo`.
fn solve_gate(current: impl Fn(f64) -> f64, id: f64, lo: f64) -> Result<f64, String> {
    let f = |v: f64| current(v) - id;
    let mut hi = lo + 0.5;
    while f(hi) < 0.0 {
        hi += 0.5;
        if hi > lo + 20.0 {
            return Err(format!("mirror: cannot bias for {id} A (needs more than 20 V of gate drive)"));
        }
    }
    brent(f, lo, hi, 1e-12, 300).map_err(|e| format!("mirror bias: {e}"))
}

/// Mismatch of a charge (high-side PMOS) and discharge (low-side NMOS) current pair at the
/// node voltage v_node: (systematic (Ih − Il)/mean, random σ of that difference from both
/// mirrors' Pelgrom σ added in quadrature, common practice), fractions.
pub fn pair_mismatch(high: &Mirror, low: &Mirror, v_node: f64) -> (f64, f64) {
    let (ih, il) = (high.i_out(v_node), low.i_out(v_node));
    let sys = (ih - il) / (0.5 * (ih + il));
    (sys, (high.sigma_ratio().powi(2) + low.sigma_ratio().powi(2)).sqrt())
}
