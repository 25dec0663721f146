//! MOS switches (NMOS, PMOS, transmission gate): on-resistance versus signal, charge injection
//! and clock feedthrough at turn-off, and the capacitance a switch adds to the node it touches.
//! NMOS bulk at 0 V with gate at VDD when on; PMOS bulk at VDD with gate at 0 V when on.
use super::mosfet::{Mos, MosType};
use super::process::Process;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SwitchKind {
    N,
    P,
    Tg,
}

impl SwitchKind {
    pub fn parse(s: &str) -> Result<SwitchKind, String> {
        match s {
            "n" | "nmos" => Ok(SwitchKind::N),
            "p" | "pmos" => Ok(SwitchKind::P),
            "tg" => Ok(SwitchKind::Tg),
            _ => Err(format!("switch kind must be \"n\", \"p\" or \"tg\", got \"{s}\"")),
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
#[allow(clippy::large_enum_variant)]
enum Model {
    Devices {
        n: Option<Mos>,
        p: Option<Mos>,
    },
    /// Explicit numbers: constant on-resistance, node capacitance, channel charge, overlap.
    Explicit {
        ron: f64,
        c_node: f64,
        q_ch: f64,
        c_ov: f64,
    },
}

/// A switch in a given state (on or off) at a supply and temperature.
#[derive(Clone, Debug, PartialEq)]
pub struct Switch {
    pub kind: SwitchKind,
    model: Model,
    /// Supply (gate drive), V, and temperature, °C.
    pub vdd: f64,
    pub temp: f64,
    /// State used by `node_cap`.
    pub on: bool,
}

fn positive(name: &str, x: f64) -> Result<f64, String> {
    if x.is_finite() && x > 0.0 { Ok(x) } else { Err(format!("switch: {name} must be > 0, got {x}")) }
}

fn non_negative(name: &str, x: f64) -> Result<f64, String> {
    if x.is_finite() && x >= 0.0 { Ok(x) } else { Err(format!("switch: {name} must be ≥ 0, got {x}")) }
}

impl Switch {
    /// A switch of the process: NMOS or PMOS of W/L, or a transmission gate of an NMOS of
    /// `w` and a PMOS of `w_p` (both of length `l`); at the process's (corner) supply and temperature.
    pub fn from_process(pr: &Process, kind: SwitchKind, w: f64, w_p: f64, l: f64) -> Result<Switch, String> {
        let n = matches!(kind, SwitchKind::N | SwitchKind::Tg)
            .then(|| Mos::from_process(pr, MosType::N, w, l))
            .transpose()?;
        let pw = if kind == SwitchKind::P { w } else { w_p };
        let p = matches!(kind, SwitchKind::P | SwitchKind::Tg)
            .then(|| Mos::from_process(pr, MosType::P, pw, l))
            .transpose()?;
        Ok(Switch { kind, model: Model::Devices { n, p }, vdd: pr.vdd, temp: pr.temp, on: false })
    }

    /// A switch from explicit numbers: on-resistance Ω, node capacitance F, channel charge C
    /// (released at turn-off, half to each side), gate overlap capacitance to the node F.
    pub fn explicit(ron: f64, c_node: f64, q_ch: f64, c_ov: f64, vdd: f64) -> Result<Switch, String> {
        Ok(Switch {
            kind: SwitchKind::N,
            model: Model::Explicit {
                ron: positive("ron", ron)?,
                c_node: non_negative("c_node", c_node)?,
                q_ch: non_negative("q_ch", q_ch)?,
                c_ov: non_negative("c_ov", c_ov)?,
            },
            vdd: positive("vdd", vdd)?,
            temp: 27.0,
            on: false,
        })
    }

    /// The same switch at another supply (V) and temperature (°C).
    pub fn at(&self, vdd: f64, temp: f64) -> Result<Switch, String> {
        positive("vdd", vdd)?;
        super::constants::check_temp(temp)?;
        Ok(Switch { vdd, temp, ..self.clone() })
    }

    /// The same switch in the given state.
    pub fn with_on(&self, on: bool) -> Switch {
        Switch { on, ..self.clone() }
    }

    /// On-resistance at signal voltage v_sig: NMOS and PMOS channel conductances at Vds = 0
    /// with body effect (EKV, bulk-referred), in parallel for a transmission gate, Ω.
    pub fn ron(&self, v_sig: f64) -> f64 {
        match &self.model {
            Model::Explicit { ron, .. } => *ron,
            Model::Devices { n, p } => {
                let gn = n.as_ref().map_or(0.0, |m| 1.0 / m.ron_b(self.vdd, v_sig, self.temp));
                let gp = p.as_ref().map_or(0.0, |m| 1.0 / m.ron_b(self.vdd, self.vdd - v_sig, self.temp));
                1.0 / (gn + gp)
            }
        }
    }

    /// Capacitance the switch adds to a node at v_node in its present state: the diffusion
    /// junction (Sze law, reverse bias from the bulk) plus the gate capacitance on that side
    /// (overlap, and when on half the channel, Meyer at Vds = 0), gate at AC ground, F.
    pub fn node_cap(&self, v_node: f64) -> f64 {
        match &self.model {
            Model::Explicit { c_node, .. } => *c_node,
            Model::Devices { n, p } => {
                let vg = if self.on { self.vdd } else { 0.0 };
                let cn =
                    n.as_ref().map_or(0.0, |m| m.cj_diffusion(v_node) + m.caps_b(vg, v_node, v_node, self.temp).cgd);
                let vp = self.vdd - v_node;
                let cp = p.as_ref().map_or(0.0, |m| m.cj_diffusion(vp) + m.caps_b(vg, vp, vp, self.temp).cgd);
                cn + cp
            }
        }
    }

    /// Node step from charge injection at turn-off onto c_node: ΔV = ∓(Q_ch/2)/C with half of
    /// the channel charge to each side (Razavi, Design of Analog CMOS ICs, ch. 12: NMOS
    /// Q = W·L·Cox·(VDD − Vin − VTH)); NMOS pulls the node down, PMOS up, V (signed).
    pub fn injection(&self, v_sig: f64, c_node: f64) -> f64 {
        match &self.model {
            Model::Explicit { q_ch, .. } => -0.5 * q_ch / c_node,
            Model::Devices { n, p } => {
                let qn = n.as_ref().map_or(0.0, |m| m.channel_charge(self.vdd, v_sig, self.temp));
                let qp = p.as_ref().map_or(0.0, |m| m.channel_charge(self.vdd, self.vdd - v_sig, self.temp));
                0.5 * (qp - qn) / c_node
            }
        }
    }

    /// Node step from clock feedthrough through the gate overlap: ΔV = ∓VDD·Cov/(Cov + C)
    /// (Razavi, Design of Analog CMOS ICs, ch. 12), V (signed).
    pub fn feedthrough(&self, c_node: f64) -> f64 {
        let step = |c_ov: f64| self.vdd * c_ov / (c_ov + c_node);
        match &self.model {
            Model::Explicit { c_ov, .. } => -step(*c_ov),
            Model::Devices { n, p } => {
                let on = n.as_ref().map_or(0.0, |m| step(m.p.cgdo * m.w));
                let op = p.as_ref().map_or(0.0, |m| step(m.p.cgdo * m.w));
                op - on
            }
        }
    }

    /// Total turn-off pedestal: injection plus feedthrough, V (signed).
    pub fn pedestal(&self, v_sig: f64, c_node: f64) -> f64 {
        self.injection(v_sig, c_node) + self.feedthrough(c_node)
    }
}
