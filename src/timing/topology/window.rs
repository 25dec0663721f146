//! Window comparator oscillator: one capacitor charged and discharged by mirrored currents
//! between two thresholds, each watched by its own comparator, an SR latch turning the current
//! over.
use super::super::from_process::{Choices, Devices, current_source_inherent};
use super::super::keys::Params;
use super::super::osc::{Cycle, Osc, View};
use super::super::parasitic::Parasitic;
use super::super::parts::{Parts, SwitchSet};
use super::super::transient::circuit::Circuit;
use super::Topology;
use super::two_level;
use crate::physics::process::Process;

pub struct Window;

impl Topology for Window {
    fn name(&self) -> &'static str {
        "window"
    }
    fn keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "tc_i", "tc_c", "c_vc1", "c_vc2", "c_swn", "c_swp", "sw_phi",
            "sw_m", "c_in", "r_out", "v_ds_ref", "i_mismatch", "vos_hi", "vos_lo", "t_cmp", "cmp_gbw", "cmp_a0",
            "cmp_slew", "cmp_vsw", "t_latch", "t_logic", "t_sw", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn process_keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "v_lo", "v_hi", "vdd", "temp", "mirror_w", "mirror_l", "sw_w", "sw_l", "cmp_w", "cmp_l",
            "cmp_itail", "cmp_cload", "cmp_vsw", "t_cmp", "i_mismatch", "vos_hi", "vos_lo", "t_latch", "t_logic",
            "t_sw", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn check_required(&self, p: &Params) -> Result<(), String> {
        p.need("i")?;
        p.need("v_lo")?;
        p.need("v_hi")
    }
    fn explicit_parts(&self, p: &Params) -> Result<Parts, String> {
        Parts::explicit(p, ("vos_hi", "vos_lo"), true)
    }
    fn process_parts(&self, d: &Devices) -> Result<Parts, String> {
        let mirrors = d.mirrors()?;
        let (nsw, psw) = d.switches()?;
        let cmps = (d.pair(d.p.get("v_hi"), "vos_hi")?, d.pair(d.v_lo(), "vos_lo")?);
        Ok(d.current_parts(mirrors, SwitchSet(vec![nsw, psw]), 0.0, cmps, None))
    }
    fn inherent(&self, process: &Process, choices: &Choices) -> Vec<Parasitic> {
        current_source_inherent(process, choices, &[Parasitic::InputCap, Parasitic::CmpDelay])
    }
    fn ideal_period(&self, o: &Osc) -> Result<f64, String> {
        two_level::ideal(o)
    }
    fn cycle(&self, v: &View) -> Result<Cycle, String> {
        two_level::cycle(v, true)
    }
    fn circuit<'a>(&self, v: &'a View<'_>) -> Result<Circuit<'a>, String> {
        two_level::circuit(v, true)
    }
}
