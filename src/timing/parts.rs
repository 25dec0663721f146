//! The parts of an oscillator behind small traits, so that explicit numbers and physics models
//! plug in alike: the timing capacitor C(V), the extra node capacitance of the switches, the
//! charging and discharging sources I(V), and the comparators (offset, input capacitance,
//! delay at a given ramp slope). Everything is evaluated at an `Env` (temperature, supply,
//! corner).
use std::fmt::Debug;
use std::sync::Arc;

use super::delay::{junction_cap, ramp_delay};
use super::env::Env;
use super::keys::Params;

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
}

/// A comparator (or trigger, or inverter) reading the node.
pub trait ComparatorPart: Send + Sync + Debug {
    /// Input-referred offset, V (moves the threshold).
    fn offset(&self, env: &Env) -> f64;
    /// Input capacitance at input common-mode `v_cm`, F.
    fn input_cap(&self, v_cm: f64, env: &Env) -> f64;
    /// Delay from the threshold crossing to the output edge for a ramp of `slope` V/s.
    fn delay(&self, slope: f64, env: &Env) -> f64;
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
}

impl Parts {
    /// Parts made from the explicit numbers of `p`.
    pub fn explicit(p: &Params) -> Parts {
        let i = p.get("i");
        let mirror = |high_side: bool, scale: f64| MirrorOut { i: i * scale, tc: p.get("tc_i"), r_out: p.get("r_out"), v_ds_ref: p.get("v_ds_ref"), high_side };
        let cmp = |vos: &str, c_in: f64| ExplicitComparator {
            vos: p.get(vos),
            c_in,
            t_fixed: p.get("t_cmp"),
            gbw: p.get("cmp_gbw"),
            v_sw: p.get("cmp_vsw"),
        };
        let (hi, lo) = match p.kind {
            super::keys::Kind::Window => ("vos_hi", "vos_lo"),
            super::keys::Kind::Schmitt => ("vos_hi", "vos_lo"),
            _ => ("vos", "vos"),
        };
        // The Schmitt trigger is one element: its input capacitance is counted once (on cmp_hi).
        let c_in_lo = if p.kind == super::keys::Kind::Window { p.get("c_in") } else { 0.0 };
        Parts {
            cap: Arc::new(LinearCap { c: p.get("c"), vc1: p.get("c_vc1"), vc2: p.get("c_vc2"), tc: p.get("tc_c") }),
            node: Arc::new(SwitchJunctions { c_n: p.get("c_swn"), c_p: p.get("c_swp"), phi: p.get("sw_phi"), m: p.get("sw_m") }),
            charge: Arc::new(mirror(true, 1.0)),
            discharge: Arc::new(mirror(false, 1.0 + p.get("i_mismatch"))),
            cmp_hi: Arc::new(cmp(hi, p.get("c_in"))),
            cmp_lo: Arc::new(cmp(lo, c_in_lo)),
        }
    }
}

/// Capacitor with voltage and temperature coefficients.
#[derive(Clone, Debug)]
pub struct LinearCap {
    pub c: f64,
    pub vc1: f64,
    pub vc2: f64,
    pub tc: f64,
}

impl CapPart for LinearCap {
    fn nominal(&self, env: &Env) -> f64 {
        self.c * env.tc_factor(self.tc)
    }
    /// C(V) = C0·(1 + vc1·V + vc2·V²) (common practice: polynomial voltage coefficient).
    fn at(&self, v: f64, env: &Env) -> f64 {
        self.nominal(env) * (1.0 + self.vc1 * v + self.vc2 * v * v)
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

/// A comparator described by numbers: offset, constant input capacitance, a fixed delay plus
/// the slope-dependent integrator delay of its first stage.
#[derive(Clone, Debug)]
pub struct ExplicitComparator {
    pub vos: f64,
    pub c_in: f64,
    pub t_fixed: f64,
    pub gbw: f64,
    /// NaN: half the supply.
    pub v_sw: f64,
}

impl ComparatorPart for ExplicitComparator {
    fn offset(&self, _env: &Env) -> f64 {
        self.vos
    }
    fn input_cap(&self, _v_cm: f64, _env: &Env) -> f64 {
        self.c_in
    }
    fn delay(&self, slope: f64, env: &Env) -> f64 {
        let v_sw = if self.v_sw.is_nan() { 0.5 * env.vdd } else { self.v_sw };
        self.t_fixed + ramp_delay(slope, self.gbw, v_sw)
    }
}
