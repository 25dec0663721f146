//! Schmitt-trigger oscillator: one capacitor between the two switching points of a CMOS Schmitt
//! trigger, charged by mirrored currents (current-starved, key `i`) or through a resistor
//! (RC, key `r`).
use std::sync::Arc;

use super::super::from_process::{Choices, Devices, current_source_inherent};
use super::super::keys::{Mode, Params};
use super::super::osc::{Cycle, Osc, View};
use super::super::parasitic::Parasitic;
use super::super::parts::{FixedComparator, Parts, SwitchSet};
use super::super::thresholds::schmitt_cmos;
use super::super::transient::circuit::Circuit;
use super::Topology;
use super::two_level;
use crate::physics::mosfet::{Mos, MosType};
use crate::physics::process::Process;

pub struct Schmitt;

impl Topology for Schmitt {
    fn name(&self) -> &'static str {
        "schmitt"
    }
    fn keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "r", "v_lo", "v_hi", "vdd", "temp", "vtn", "vtp", "ratio_n", "ratio_p", "tc_vt", "tc_i", "tc_r",
            "tc_c", "r_vc", "c_vc1", "c_vc2", "c_swn", "c_swp", "sw_phi", "sw_m", "c_in", "r_out", "v_ds_ref",
            "i_mismatch", "vos_hi", "vos_lo", "t_cmp", "cmp_gbw", "cmp_a0", "cmp_slew", "cmp_vsw", "t_logic", "t_sw", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn process_keys(&self) -> &'static [&'static str] {
        &[
            "c", "i", "vdd", "temp", "ratio_n", "ratio_p", "mirror_w", "mirror_l", "sw_w", "sw_l", "c_in",
            "i_mismatch", "vos_hi", "vos_lo", "t_cmp", "t_logic", "t_sw", "i_noise", "i_flicker_fc", "vn_cmp", "cmp_nbw", "vn_ref",
        ]
    }
    fn check_required(&self, p: &Params) -> Result<(), String> {
        match (p.has("i"), p.has("r")) {
            (true, true) => return Err("give either 'i' (current-starved) or 'r' (RC), not both".to_string()),
            (false, false) => return Err("key 'i' (current-starved) or 'r' (RC) is required".to_string()),
            _ => {}
        }
        let explicit = p.has("v_lo") || p.has("v_hi");
        let derived = p.has("vtn") || p.has("vtp");
        if p.mode == Mode::Process {
            return p.need("i");
        }
        if explicit && derived {
            return Err("give the thresholds either as 'v_lo'/'v_hi' or through 'vtn'/'vtp', not both".to_string());
        }
        if derived {
            p.need("vtn")?;
            p.need("vtp")?;
        } else {
            p.need("v_lo")?;
            p.need("v_hi")?;
        }
        if p.has("r") {
            for k in ["r_out", "i_mismatch", "c_swn", "c_swp", "tc_i"] {
                if p.has(k) {
                    return Err(format!("key '{k}' applies to current charging ('i'), not to RC charging ('r')"));
                }
            }
        } else if p.has("tc_r") {
            return Err("key 'tc_r' applies to RC charging ('r'), not to current charging ('i')".to_string());
        }
        Ok(())
    }
    fn explicit_parts(&self, p: &Params) -> Result<Parts, String> {
        Parts::explicit(p, ("vos_hi", "vos_lo"), false)
    }
    /// The trigger is one element with a fixed delay; its switching points come from the
    /// process threshold voltages of the switch-sized devices.
    fn process_parts(&self, d: &Devices) -> Result<Parts, String> {
        let p = d.p;
        let mirrors = d.mirrors()?;
        let (nsw, psw) = d.switches()?;
        let (sw, sl) = (p.get("sw_w"), p.get("sw_l"));
        let t0 = p.get("t_cmp");
        let n = Mos::from_process(d.pr, MosType::N, sw, sl)?;
        let pm = Mos::from_process(d.pr, MosType::P, sw, sl)?;
        let temp = p.get("temp");
        let levels = schmitt_cmos(d.pr.vdd, n.vt(temp), pm.vt(temp), p.get("ratio_n"), p.get("ratio_p"));
        let cmps = (
            Arc::new(FixedComparator { vos: p.get("vos_hi"), c_in: p.get("c_in"), t0 }) as _,
            Arc::new(FixedComparator { vos: p.get("vos_lo"), c_in: 0.0, t0 }) as _,
        );
        Ok(d.current_parts(mirrors, SwitchSet(vec![nsw, psw]), 0.0, cmps, Some(levels)))
    }
    fn inherent(&self, process: &Process, choices: &Choices) -> Vec<Parasitic> {
        current_source_inherent(process, choices, &[])
    }
    fn ideal_period(&self, o: &Osc) -> Result<f64, String> {
        two_level::ideal(o)
    }
    fn cycle(&self, v: &View) -> Result<Cycle, String> {
        two_level::cycle(v, false)
    }
    fn circuit<'a>(&self, v: &'a View<'_>) -> Result<Circuit<'a>, String> {
        two_level::circuit(v, false)
    }
}
