//! Behavioural comparator: a single-pole, slew-limited amplifier that must move its output by
//! `v_swing` to toggle, built either from explicit numbers or from a differential input pair of
//! the process. Input offset (systematic + Pelgrom), input capacitance versus common mode,
//! delay for a step and for a ramp, optional hysteresis, and the pair-area trade-off.
use crate::num::math;
use std::f64::consts::PI;

use super::mirror::{Mirror, MirrorKind};
use super::mismatch;
use super::mosfet::{Mos, MosType};
use super::noise;
use super::process::Process;
use crate::num::roots::brent;

/// Explicit description of a comparator.
#[derive(Clone, Debug, PartialEq)]
pub struct ComparatorSpec {
    /// DC gain (V/V) and gain-bandwidth product (Hz).
    pub a0: f64,
    pub gbw: f64,
    /// Slew rate of the output, V/s.
    pub slew: f64,
    /// Output change needed to toggle the next stage, V.
    pub v_swing: f64,
    /// Fixed delay of the following logic, s.
    pub t0: f64,
    /// Systematic input offset V, random offset σ V.
    pub offset: f64,
    pub sigma_offset: f64,
    /// Input capacitance, F (explicit comparators; pair comparators compute it).
    pub c_in: f64,
    /// Hysteresis (full width), V.
    pub hyst: f64,
}

impl ComparatorSpec {
    pub fn check(&self) -> Result<(), String> {
        let pos = |n: &str, x: f64| {
            if x.is_finite() && x > 0.0 { Ok(()) } else { Err(format!("comparator: {n} must be > 0, got {x}")) }
        };
        let nonneg = |n: &str, x: f64| {
            if x.is_finite() && x >= 0.0 { Ok(()) } else { Err(format!("comparator: {n} must be ≥ 0, got {x}")) }
        };
        if !(self.a0.is_finite() && self.a0 > 1.0) {
            return Err(format!("comparator: a0 must be > 1 V/V, got {}", self.a0));
        }
        pos("gbw", self.gbw)?;
        pos("slew", self.slew)?;
        pos("v_swing", self.v_swing)?;
        nonneg("t0", self.t0)?;
        if !self.offset.is_finite() {
            return Err(format!("comparator: offset must be a finite voltage, got {}", self.offset));
        }
        nonneg("sigma_offset", self.sigma_offset)?;
        nonneg("c_in", self.c_in)?;
        nonneg("hyst", self.hyst)
    }

    /// Time constant of the single pole: A0/(2π·GBW), s.
    pub fn tau(&self) -> f64 {
        self.a0 / (2.0 * PI * self.gbw)
    }
}

/// The input stage of a comparator built from the process.
#[derive(Clone, Debug, PartialEq)]
pub struct PairStage {
    pub pair: Mos,
    pub tail: Mirror,
    /// Drain voltage of the pair (own frame), V; supply V; temperature °C.
    pub v_drain: f64,
    pub vdd: f64,
    pub temp: f64,
    /// Gain from the input to the pair's drain on the input's side (Miller factor − 1).
    pub a_drain: f64,
}

/// How to build a comparator from a process.
#[derive(Clone, Debug, PartialEq)]
pub struct PairDesign {
    /// Input pair type, W, L (m); tail current A; load capacitance F at the output.
    pub kind: MosType,
    pub w: f64,
    pub l: f64,
    pub i_tail: f64,
    pub c_load: f64,
    /// Tail current source: simple mirror of W/L (m).
    pub tail_w: f64,
    pub tail_l: f64,
    /// Common mode at which gain and offset are evaluated, V.
    pub v_cm: f64,
    /// Output change to toggle (V), fixed logic delay (s), systematic offset (V), hysteresis (V).
    pub v_swing: f64,
    pub t0: f64,
    pub offset: f64,
    pub hyst: f64,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Comparator {
    pub spec: ComparatorSpec,
    pub stage: Option<PairStage>,
    /// One-sided input-referred white noise density of the input stage, V²/Hz (0: not modelled).
    pub vn_psd: f64,
}

impl Comparator {
    /// A comparator from explicit numbers.
    pub fn new(spec: ComparatorSpec) -> Result<Comparator, String> {
        spec.check()?;
        Ok(Comparator { spec, stage: None, vn_psd: 0.0 })
    }

    /// A comparator built from an input pair of the process: gm at Id = I_tail/2, gain
    /// A0 = gm·(ro_pair ∥ ro_load) with ro_load = ro_pair, GBW = gm/(2π·C_load),
    /// slew = I_tail/C_load, all at the bias the tail actually delivers at v_cm (an error when it
    /// delivers less than half; Razavi ch. 5 and 9; common practice); offset σ from Pelgrom for
    /// the input pair and its load mirror (`pair_offset_sigma`). The load mirror is the
    /// complementary device of the pair's W/L, diode-connected on the input's side.
    pub fn from_pair(pr: &Process, d: &PairDesign) -> Result<Comparator, String> {
        let temp = pr.temp;
        let vdd = pr.vdd;
        if !(d.i_tail.is_finite() && d.i_tail > 0.0 && d.i_tail < 1.0) {
            return Err(format!("comparator: i_tail must be in 0..1 A (exclusive), got {}", d.i_tail));
        }
        if !(d.c_load.is_finite() && d.c_load > 0.0) {
            return Err(format!("comparator: c_load must be > 0 F, got {}", d.c_load));
        }
        if !(d.v_cm.is_finite() && d.v_cm >= 0.0 && d.v_cm <= vdd) {
            return Err(format!("comparator: v_cm must be in 0..{vdd} V (the supply), got {}", d.v_cm));
        }
        let pair = Mos::from_process(pr, d.kind, d.w, d.l)?;
        let load_kind = match d.kind {
            MosType::N => MosType::P,
            MosType::P => MosType::N,
        };
        let load = Mos::from_process(pr, load_kind, d.w, d.l)?;
        let id = 0.5 * d.i_tail;
        let v_load = load.diode_vgs(id, temp)?;
        let v_drain = vdd - v_load;
        if v_drain <= 0.0 {
            return Err(format!("comparator: the diode load needs {v_load:.3} V, more than the supply {vdd} V"));
        }
        // Tail: a simple mirror of the same type as the pair, input current i_tail.
        let tail = Mirror::from_process(pr, MirrorKind::Simple, d.kind, d.i_tail, 1.0, d.tail_w, d.tail_l, 0.0)?;
        let stage = PairStage { pair: pair.clone(), tail, v_drain, vdd, temp, a_drain: 1.0 };
        let v_cm = stage.frame(d.v_cm);
        let vs = stage.tail_node(v_cm);
        let (id_on, gm, _, gds) = pair.ids_derivs(v_cm, vs, v_drain, temp);
        if id_on.is_nan() || id_on < 0.5 * id {
            return Err(format!(
                "comparator: at v_cm = {} V the tail current source has no headroom (each input device carries {:.3e} A of the intended {id:.3e} A); {}",
                d.v_cm,
                id_on,
                match d.kind {
                    MosType::N => "raise v_cm or use a PMOS pair (type \"p\")",
                    MosType::P => "lower v_cm or use an NMOS pair (type \"n\")",
                }
            ));
        }
        let gm_id = gm / id_on;
        let a0 = gm / (2.0 * gds);
        // The load diode carries the current the pair really gets.
        let v_l = load.diode_vgs(id_on, temp)?;
        let (_, gm_load, _, _) = load.ids_derivs(v_l, 0.0, v_l, temp);
        let sigma_offset = pair_offset_sigma(
            mismatch::offset_sigma(gm_id, pair.sigma_vt(), pair.sigma_beta()),
            mismatch::offset_sigma(gm_load / id_on, load.sigma_vt(), load.sigma_beta()),
            gm_load / gm,
        );
        let spec = ComparatorSpec {
            a0,
            gbw: gm / (2.0 * PI * d.c_load),
            slew: 2.0 * id_on / d.c_load,
            v_swing: d.v_swing,
            t0: d.t0,
            offset: d.offset,
            sigma_offset,
            c_in: 0.0,
            hyst: d.hyst,
        };
        spec.check()?;
        Ok(Comparator { spec, stage: Some(stage), vn_psd: noise::pair_input_psd(gm, gm_load, temp) })
    }

    /// Variance of the input-referred noise at a decision, V²: the white density over the
    /// noise bandwidth of the input's single pole at GBW/A0 (`noise::single_pole_nbw`).
    pub fn threshold_noise_var(&self) -> f64 {
        if self.vn_psd == 0.0 { 0.0 } else { self.vn_psd * noise::single_pole_nbw(self.spec.gbw / self.spec.a0) }
    }

    /// Systematic input offset, V.
    pub fn offset(&self) -> f64 {
        self.spec.offset
    }

    /// Random input offset σ, V.
    pub fn sigma_offset(&self) -> f64 {
        self.spec.sigma_offset
    }

    /// Switching thresholds (falling, rising) around the reference v_ref, including the
    /// systematic offset and half the hysteresis each way, V.
    pub fn thresholds(&self, v_ref: f64) -> (f64, f64) {
        let c = v_ref + self.spec.offset;
        (c - 0.5 * self.spec.hyst, c + 0.5 * self.spec.hyst)
    }

    /// Delay after an input step of `overdrive` beyond the threshold, s; infinite when
    /// A0·overdrive cannot move the output by v_swing.
    pub fn delay(&self, overdrive: f64) -> f64 {
        let s = &self.spec;
        self.spec.t0 + step_delay(s.a0, s.tau(), s.slew, s.v_swing, overdrive)
    }

    /// Delay after the input crosses the threshold as a ramp of slope_v_per_s (the relaxation
    /// oscillator case), s; infinite for a non-positive slope.
    pub fn delay_ramp(&self, slope_v_per_s: f64) -> f64 {
        let s = &self.spec;
        self.spec.t0 + ramp_delay(s.a0, s.tau(), s.slew, s.v_swing, slope_v_per_s)
    }

    /// Capacitance seen at one input at common mode v_cm (V), F. Pair comparators: half the
    /// gate–source capacitance (the common source follows half the input), the gate–drain
    /// capacitance with its Miller factor, and gate–bulk (Meyer, smoothed, at the bias where
    /// the tail's own current collapses when the common mode leaves no headroom).
    pub fn input_cap(&self, v_cm: f64) -> f64 {
        match &self.stage {
            None => self.spec.c_in,
            Some(st) => {
                let v = st.frame(v_cm);
                let vs = st.tail_node(v);
                let c = st.pair.caps_b(v, vs, st.v_drain, st.temp);
                0.5 * c.cgs + (1.0 + st.a_drain) * c.cgd + c.cgb
            }
        }
    }
}

impl PairStage {
    /// Voltage in the stage's own frame (from its rail), V.
    fn frame(&self, v: f64) -> f64 {
        match self.pair.kind {
            MosType::N => v,
            MosType::P => self.vdd - v,
        }
    }

    /// Common-source (tail) node for input common mode v (own frame): both halves' current
    /// equals the tail mirror's output at that node (Brent), V.
    pub fn tail_node(&self, v: f64) -> f64 {
        let tail_at = |x: f64| match self.pair.kind {
            MosType::N => self.tail.i_out(x),
            MosType::P => self.tail.i_out(self.vdd - x),
        };
        let f = |x: f64| 2.0 * self.pair.ids(v, x, self.v_drain, self.temp) - tail_at(x);
        let hi = v.min(self.v_drain).max(0.0);
        if hi <= 0.0 || f(hi) >= 0.0 {
            return hi;
        }
        brent(f, 0.0, hi, 1e-9, 200).unwrap_or(0.0)
    }
}

/// Input-referred offset σ of a differential pair with a current-mirror load: the pair's own σ
/// and the load pair's σ referred to the input by gm_load/gm_pair, in quadrature
/// (Razavi, Design of Analog CMOS ICs, ch. 14; Pelgrom 1989), V.
pub fn pair_offset_sigma(sigma_pair: f64, sigma_load: f64, gm_ratio: f64) -> f64 {
    (sigma_pair.powi(2) + (gm_ratio * sigma_load).powi(2)).sqrt()
}

/// Delay for an overdrive step of a single-pole amplifier (gain a0, time constant tau) whose
/// output rate is limited to `slew`: slewing while (A0·Vod − v)/τ > SR, then exponential
/// settling, until the output has moved dv (Johns & Martin, Analog IC Design, ch. 10; Razavi
/// ch. 9 — piecewise slew/linear model), s.
pub fn step_delay(a0: f64, tau: f64, slew: f64, dv: f64, vod: f64) -> f64 {
    let target = a0 * vod;
    if target.is_nan() || target <= dv {
        return f64::INFINITY;
    }
    // Output level below which the linear rate exceeds the slew rate.
    let v1 = target - slew * tau;
    if v1 >= dv {
        dv / slew
    } else if v1 > 0.0 {
        v1 / slew + tau * math::ln((target - v1) / (target - dv))
    } else {
        -tau * math::ln_1p(-dv / target)
    }
}

/// Delay for an input ramp of slope s crossing the threshold at t = 0, for the same
/// single-pole slew-limited amplifier: linear response v = A0·s·(t − τ(1 − e^{−t/τ})) until its
/// rate A0·s·(1 − e^{−t/τ}) reaches the slew rate, then rising at the slew rate, until the
/// output has moved dv (solved by Brent; ODE dv/dt = min((A0·s·t − v)/τ, SR)), s.
pub fn ramp_delay(a0: f64, tau: f64, slew: f64, dv: f64, slope: f64) -> f64 {
    if slope.is_nan() || slope <= 0.0 {
        return f64::INFINITY;
    }
    let k = a0 * slope;
    if !k.is_finite() {
        // An instant step of unbounded size: slewing from the start.
        return dv / slew;
    }
    let lin = |t: f64| k * (t - tau * (-math::exp_m1(-t / tau)));
    // Time the linear rate reaches the slew rate (never when A0·s ≤ SR).
    let t_s = if k > slew { -tau * math::ln_1p(-slew / k) } else { f64::INFINITY };
    let v_s = if t_s.is_finite() { lin(t_s) } else { f64::INFINITY };
    if v_s <= dv {
        return t_s + (dv - v_s) / slew;
    }
    // Linear phase: lin(t) is increasing and convex; bracket the crossing.
    let mut hi = (2.0 * dv / k * tau).sqrt().max(dv / k);
    for _ in 0..2000 {
        if lin(hi) >= dv {
            break;
        }
        hi *= 2.0;
    }
    brent(|t| lin(t) - dv, 0.0, hi, hi * 1e-13, 300).unwrap_or(hi)
}

/// Offset σ and input capacitance (at v_cm) of pair comparators whose input devices have the
/// given gate areas (m²) at a fixed W/L ratio `w_over_l`, the rest of the design as `base`:
/// the area trade-off (Pelgrom 1989: σ ∝ 1/√area, capacitance ∝ area). Returns (σ V, C F).
pub fn pair_tradeoff(
    pr: &Process,
    base: &PairDesign,
    w_over_l: f64,
    areas: &[f64],
) -> Result<(Vec<f64>, Vec<f64>), String> {
    if !(w_over_l.is_finite() && w_over_l > 0.0) {
        return Err(format!("pair_tradeoff: w_over_l must be > 0, got {w_over_l}"));
    }
    let mut sig = Vec::with_capacity(areas.len());
    let mut cap = Vec::with_capacity(areas.len());
    for (k, &a) in areas.iter().enumerate() {
        if !(a.is_finite() && a > 0.0) {
            return Err(format!("pair_tradeoff: area {k} must be > 0 m², got {a}"));
        }
        let d = PairDesign { w: (a * w_over_l).sqrt(), l: (a / w_over_l).sqrt(), ..base.clone() };
        let c = Comparator::from_pair(pr, &d).map_err(|e| format!("pair_tradeoff: area {a} m²: {e}"))?;
        sig.push(c.sigma_offset());
        cap.push(c.input_cap(base.v_cm));
    }
    Ok((sig, cap))
}
