//! The parts of an oscillator behind small traits, so that explicit numbers and physics models
//! plug in alike: the timing capacitor C(V), the extra node capacitance of the switches, the
//! charging and discharging sources I(V), and the comparators (offset, input capacitance,
//! delay at a given ramp slope). Everything is evaluated at an `Env` (temperature, supply,
//! corner).
use std::fmt::Debug;
use std::sync::Arc;

use super::env::Env;
use super::keys::Params;
use crate::physics::capacitor::Capacitor;
use crate::physics::comparator::{Comparator, ComparatorSpec};
use crate::physics::junction::junction_cap;
use crate::physics::mirror::Mirror;
use crate::physics::resistor::Resistor;
use crate::physics::switch::Switch;

/// The timing capacitor.
pub trait CapPart: Send + Sync + Debug {
    /// Capacitance at zero volts, F (the ideal capacitor).
    fn nominal(&self, env: &Env) -> f64;
    /// Capacitance at node voltage `v`, F.
    fn at(&self, v: f64, env: &Env) -> f64;
}

/// Capacitance that switches and wiring add to the node, F, versus node voltage.
pub trait NodeCapPart: Send + Sync + Debug {
    fn at(&self, v: f64, env: &Env) -> f64;
}

/// A current source (mirror output) driving the node: magnitude of its current, A.
pub trait SourcePart: Send + Sync + Debug {
    /// The current of the ideal source (infinite output resistance), A.
    fn nominal(&self, env: &Env) -> f64;
    /// The current when the node is at `v_node`, A.
    fn at(&self, v_node: f64, env: &Env) -> f64;
    /// One-sided white noise density of the current from the source's own devices, A²/Hz
    /// (0 for a source given by numbers, whose noise is the `i_noise` key).
    fn noise_psd(&self) -> f64 {
        0.0
    }
}

/// A comparator (or trigger, or inverter) reading the node.
pub trait ComparatorPart: Send + Sync + Debug {
    /// Input-referred offset, V (moves the threshold).
    fn offset(&self, env: &Env) -> f64;
    /// Input capacitance at input common-mode `v_cm`, F.
    fn input_cap(&self, v_cm: f64, env: &Env) -> f64;
    /// Delay from the threshold crossing to the output edge for a ramp of `slope` V/s.
    fn delay(&self, slope: f64, env: &Env) -> f64;
    /// Variance of the input-referred noise at a decision from the comparator's own devices, V²
    /// (0 when given by numbers, whose noise is the `vn_cmp` key).
    fn noise_var(&self) -> f64 {
        0.0
    }
}

/// The parts of one oscillator.
#[derive(Clone, Debug)]
pub struct Parts {
    pub cap: Arc<dyn CapPart>,
    pub node: Arc<dyn NodeCapPart>,
    /// Charging (high-side) source.
    pub charge: Arc<dyn SourcePart>,
    /// Discharging (low-side) source.
    pub discharge: Arc<dyn SourcePart>,
    /// Comparator at the high threshold (or the only one).
    pub cmp_hi: Arc<dyn ComparatorPart>,
    /// Comparator at the low threshold (window; the Schmitt trigger's second threshold).
    pub cmp_lo: Arc<dyn ComparatorPart>,
    /// On-resistance of the reset switch (reset, ping-pong), Ω; 0 is an ideal switch.
    pub r_reset: f64,
    /// Thresholds (v_lo, v_hi) fixed by the parts (a process Schmitt trigger), else None.
    pub levels: Option<(f64, f64)>,
    /// The timing resistor (RC kinds).
    pub res: Option<Resistor>,
    /// Inverter threshold fixed by the parts (process inverters), V.
    pub v_th: Option<f64>,
}

impl Parts {
    /// Parts made from the explicit numbers of `p`; the comparators read the offset keys
    /// `(high, low)`, and the low one carries `c_in` too if `c_in_lo` (two comparators on the
    /// node; a single trigger or inverter counts its input once, on the high one).
    pub fn explicit(p: &Params, (hi, lo): (&str, &str), c_in_lo: bool) -> Result<Parts, String> {
        let i = p.get("i");
        let mirror = |high_side: bool, scale: f64| MirrorOut {
            i: i * scale,
            tc: p.get("tc_i"),
            r_out: p.get("r_out"),
            v_ds_ref: p.get("v_ds_ref"),
            high_side,
        };
        let c_in_lo = if c_in_lo { p.get("c_in") } else { 0.0 };
        Ok(Parts {
            cap: Arc::new(Capacitor::new(
                p.get("c"),
                p.get("c_vc1"),
                p.get("c_vc2"),
                p.get("tc_c"),
                0.0,
                super::env::T_REF_C,
            )?),
            node: Arc::new(SwitchJunctions {
                c_n: p.get("c_swn"),
                c_p: p.get("c_swp"),
                phi: p.get("sw_phi"),
                m: p.get("sw_m"),
            }),
            charge: Arc::new(mirror(true, 1.0)),
            discharge: Arc::new(mirror(false, 1.0 + p.get("i_mismatch"))),
            cmp_hi: explicit_comparator(p, hi, p.get("c_in"))?,
            cmp_lo: explicit_comparator(p, lo, c_in_lo)?,
            r_reset: p.get("r_reset"),
            levels: None,
            res: if p.has("r") {
                Some(Resistor::new(p.get("r"), p.get("tc_r"), 0.0, p.get("r_vc"), super::env::T_REF_C)?)
            } else {
                None
            },
            v_th: None,
        })
    }
}

/// A comparator from explicit numbers: the physics layer's single-pole, slew-limited model when
/// a gain-bandwidth is given, else a fixed delay.
fn explicit_comparator(p: &Params, vos: &str, c_in: f64) -> Result<Arc<dyn ComparatorPart>, String> {
    let gbw = p.get("cmp_gbw");
    if gbw.is_infinite() {
        return Ok(Arc::new(FixedComparator { vos: p.get(vos), c_in, t0: p.get("t_cmp") }));
    }
    let v_swing = if p.has("cmp_vsw") { p.get("cmp_vsw") } else { 0.5 * p.get("vdd") };
    let slew = p.get("cmp_slew");
    let spec = ComparatorSpec {
        a0: p.get("cmp_a0"),
        gbw,
        // The physics model needs a finite slew rate; "unlimited" is the largest float.
        slew: if slew.is_finite() { slew } else { f64::MAX },
        v_swing,
        t0: p.get("t_cmp"),
        offset: p.get(vos),
        sigma_offset: 0.0,
        c_in,
        hyst: 0.0,
    };
    Ok(Arc::new(Comparator::new(spec)?))
}

impl CapPart for Capacitor {
    fn nominal(&self, env: &Env) -> f64 {
        self.c(0.0, env.temp_c)
    }
    fn at(&self, v: f64, env: &Env) -> f64 {
        self.c(v, env.temp_c)
    }
}

impl ComparatorPart for Comparator {
    fn offset(&self, _env: &Env) -> f64 {
        Comparator::offset(self)
    }
    fn input_cap(&self, v_cm: f64, _env: &Env) -> f64 {
        Comparator::input_cap(self, v_cm)
    }
    /// A falling ramp drives the comparator just as a rising one: the slope's magnitude counts.
    fn delay(&self, slope: f64, _env: &Env) -> f64 {
        self.delay_ramp(slope.abs())
    }
    fn noise_var(&self) -> f64 {
        self.threshold_noise_var()
    }
}

/// Process switches on the node (each in its off state: junction and overlap capacitance).
#[derive(Clone, Debug)]
pub struct SwitchSet(pub Vec<Switch>);

impl NodeCapPart for SwitchSet {
    fn at(&self, v: f64, _env: &Env) -> f64 {
        self.0.iter().map(|s| s.node_cap(v)).sum()
    }
}

/// A process mirror output: ideal value `nominal` (the reference current, times 1 + i_mismatch
/// on the low side); real value the device characteristic, scaled the same way.
#[derive(Clone, Debug)]
pub struct MirrorSource {
    pub mirror: Mirror,
    pub nominal: f64,
}

impl SourcePart for MirrorSource {
    fn nominal(&self, _env: &Env) -> f64 {
        self.nominal
    }
    fn at(&self, v_node: f64, _env: &Env) -> f64 {
        self.mirror.i_out(v_node) * self.nominal / (self.mirror.i_ref * self.mirror.ratio)
    }
    fn noise_psd(&self) -> f64 {
        self.mirror.noise_psd()
    }
}

/// Drain junctions of an NMOS switch (reverse bias V) and a PMOS switch (reverse bias vdd − V)
/// on the node.
#[derive(Clone, Debug)]
pub struct SwitchJunctions {
    pub c_n: f64,
    pub c_p: f64,
    pub phi: f64,
    pub m: f64,
}

impl NodeCapPart for SwitchJunctions {
    fn at(&self, v: f64, env: &Env) -> f64 {
        let mut c = 0.0;
        if self.c_n > 0.0 {
            c += junction_cap(self.c_n, v, self.phi, self.m);
        }
        if self.c_p > 0.0 {
            c += junction_cap(self.c_p, env.vdd - v, self.phi, self.m);
        }
        c
    }
}

/// A mirror output with finite output resistance: exactly `i` when its |Vds| is `v_ds_ref`,
/// and i + (|Vds| − v_ds_ref)/r_out otherwise (common practice: linear output conductance).
/// High side (PMOS, to vdd): |Vds| = vdd − V; low side (NMOS, to ground): |Vds| = V.
#[derive(Clone, Debug)]
pub struct MirrorOut {
    pub i: f64,
    pub tc: f64,
    pub r_out: f64,
    pub v_ds_ref: f64,
    pub high_side: bool,
}

impl SourcePart for MirrorOut {
    fn nominal(&self, env: &Env) -> f64 {
        self.i * env.tc_factor(self.tc)
    }
    fn at(&self, v_node: f64, env: &Env) -> f64 {
        let vds = if self.high_side { env.vdd - v_node } else { v_node };
        self.nominal(env) + (vds - self.v_ds_ref) / self.r_out
    }
}

/// A comparator with an offset, a constant input capacitance and a fixed delay.
#[derive(Clone, Debug)]
pub struct FixedComparator {
    pub vos: f64,
    pub c_in: f64,
    pub t0: f64,
}

impl ComparatorPart for FixedComparator {
    fn offset(&self, _env: &Env) -> f64 {
        self.vos
    }
    fn input_cap(&self, _v_cm: f64, _env: &Env) -> f64 {
        self.c_in
    }
    fn delay(&self, _slope: f64, _env: &Env) -> f64 {
        self.t0
    }
}
