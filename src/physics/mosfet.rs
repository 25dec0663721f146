//! MOSFET: all-region drain current (EKV 1995 interpolation) with channel-length modulation
//! and temperature, small-signal parameters, smoothed Meyer gate capacitances and junction
//! capacitances. PMOS devices use magnitudes throughout (Vsg, Vsd, |Id|), so one set of
//! equations serves both types.
use super::constants::{kelvin, thermal_voltage};
use super::ekv;
use super::junction::junction_cap;
use super::mismatch;
use super::process::{MosParams, Process};
use crate::num::math;

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MosType {
    N,
    P,
}

impl MosType {
    pub fn parse(s: &str) -> Result<MosType, String> {
        match s {
            "n" | "nmos" | "N" => Ok(MosType::N),
            "p" | "pmos" | "P" => Ok(MosType::P),
            _ => Err(format!("device type must be \"n\" or \"p\", got \"{s}\"")),
        }
    }
    pub fn name(self) -> &'static str {
        match self {
            MosType::N => "nmos",
            MosType::P => "pmos",
        }
    }
}

/// One transistor of a given type and drawn size.
#[derive(Clone, Debug, PartialEq)]
pub struct Mos {
    pub kind: MosType,
    pub p: MosParams,
    /// Drawn width and length, m.
    pub w: f64,
    pub l: f64,
    /// Temperature at which `p` is given, °C.
    pub tnom: f64,
}

/// Gate capacitances of one bias point, F (intrinsic plus overlap).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct GateCaps {
    pub cgs: f64,
    pub cgd: f64,
    pub cgb: f64,
}

impl GateCaps {
    pub fn total(&self) -> f64 {
        self.cgs + self.cgd + self.cgb
    }
}

/// Largest drawn dimension accepted, m.
const MAX_DIM: f64 = 1e-2;

impl Mos {
    /// A device from explicit parameters; W and L are checked against the parameters' minima.
    pub fn new(kind: MosType, p: MosParams, w: f64, l: f64, tnom: f64) -> Result<Mos, String> {
        let name = kind.name();
        p.check().map_err(|e| format!("{name}: {e}"))?;
        super::constants::check_temp(tnom).map_err(|e| format!("{name}: tnom: {e}"))?;
        if !(w.is_finite() && w >= p.wmin && w <= MAX_DIM) {
            return Err(format!("{name}: w must be in {} … {}, got {}", len(p.wmin), len(MAX_DIM), len(w)));
        }
        if !(l.is_finite() && l >= p.lmin && l <= MAX_DIM) {
            return Err(format!("{name}: l must be in {} … {}, got {}", len(p.lmin), len(MAX_DIM), len(l)));
        }
        Ok(Mos { kind, p, w, l, tnom })
    }

    /// A device of the process (its applied corner included).
    pub fn from_process(pr: &Process, kind: MosType, w: f64, l: f64) -> Result<Mos, String> {
        let p = match kind {
            MosType::N => pr.nmos.clone(),
            MosType::P => pr.pmos.clone(),
        };
        Mos::new(kind, p, w, l, pr.tnom)
    }

    /// The same device with a random mismatch sample applied: threshold shifted by `dvt` (V, on
    /// the magnitude) and current factor scaled by (1 + `dbeta`) (Monte Carlo, Pelgrom 1989).
    pub fn with_mismatch(&self, dvt: f64, dbeta: f64) -> Result<Mos, String> {
        if !(dvt.is_finite() && dvt.abs() < 0.5) {
            return Err(format!("{}: dvt must be in −0.5..0.5 V, got {dvt}", self.kind.name()));
        }
        if !(dbeta.is_finite() && dbeta > -0.9 && dbeta < 10.0) {
            return Err(format!("{}: dbeta must be in −0.9..10, got {dbeta}", self.kind.name()));
        }
        let mut m = self.clone();
        m.p.vth0 += dvt;
        m.p.kp *= 1.0 + dbeta;
        Ok(m)
    }

    /// The same device with another width (mirror ratios).
    pub fn with_w(&self, w: f64) -> Result<Mos, String> {
        Mos::new(self.kind, self.p.clone(), w, self.l, self.tnom)
    }

    /// Threshold magnitude at temp_c: VT0 + tc_vth·(T − Tnom) (linear tempco, common practice).
    pub fn vt(&self, temp_c: f64) -> f64 {
        self.p.vth0 + self.p.tc_vth * (temp_c - self.tnom)
    }

    /// Current factor β = µCox·W/L with µ ∝ (T/Tnom)^−mu_exp (Sze; common practice), A/V².
    pub fn beta(&self, temp_c: f64) -> f64 {
        self.p.kp * math::pow(kelvin(temp_c) / kelvin(self.tnom), -self.p.mu_exp) * self.w / self.l
    }

    /// Specific current I_spec = 2nβU_T² (Enz, Krummenacher, Vittoz 1995), A.
    pub fn i_spec(&self, temp_c: f64) -> f64 {
        let ut = thermal_voltage(temp_c);
        2.0 * self.p.n * self.beta(temp_c) * ut * ut
    }

    /// Channel-length modulation λ = lambda_l/L (common practice), 1/V.
    pub fn lambda(&self) -> f64 {
        self.p.lambda_l / self.l
    }

    /// Drain current and its derivatives (Id, ∂Id/∂Vg, ∂Id/∂Vs, ∂Id/∂Vd), voltages referred to
    /// the bulk: Id = I_spec·[F((Vp−Vs)/U_T) − F((Vp−Vd)/U_T)]·(1 + λ·Vds), Vp = (Vg − VT)/n
    /// (Enz, Krummenacher, Vittoz 1995; CLM factor as in Shichman–Hodges). Source and drain
    /// are symmetric: Vd < Vs gives a negative current.
    pub fn ids_derivs(&self, vg: f64, vs: f64, vd: f64, temp_c: f64) -> (f64, f64, f64, f64) {
        if vd < vs {
            let (i, dg, ds, dd) = self.ids_derivs(vg, vd, vs, temp_c);
            return (-i, -dg, -dd, -ds);
        }
        let ut = thermal_voltage(temp_c);
        let n = self.p.n;
        let is = self.i_spec(temp_c);
        let lam = self.lambda();
        let vp = (vg - self.vt(temp_c)) / n;
        let (xf, xr) = ((vp - vs) / ut, (vp - vd) / ut);
        let (ff, fr) = (ekv::f(xf), ekv::f(xr));
        let (dff, dfr) = (ekv::df(xf), ekv::df(xr));
        let m = 1.0 + lam * (vd - vs);
        let core = is * (ff - fr);
        let id = core * m;
        let dg = is * m * (dff - dfr) / (n * ut);
        let ds = -is * m * dff / ut - core * lam;
        let dd = is * m * dfr / ut + core * lam;
        (id, dg, ds, dd)
    }

    /// Drain current, bulk-referred terminal voltages, A.
    pub fn ids(&self, vg: f64, vs: f64, vd: f64, temp_c: f64) -> f64 {
        self.ids_derivs(vg, vs, vd, temp_c).0
    }

    /// Drain current with the source at the bulk, A.
    pub fn id(&self, vgs: f64, vds: f64, temp_c: f64) -> f64 {
        self.ids(vgs, 0.0, vds, temp_c)
    }

    /// Transconductance ∂Id/∂Vgs (analytic derivative of `ids`), S.
    pub fn gm(&self, vgs: f64, vds: f64, temp_c: f64) -> f64 {
        self.ids_derivs(vgs, 0.0, vds, temp_c).1
    }

    /// Output conductance ∂Id/∂Vds (analytic derivative of `ids`), S.
    pub fn gds(&self, vgs: f64, vds: f64, temp_c: f64) -> f64 {
        self.ids_derivs(vgs, 0.0, vds, temp_c).3
    }

    /// Output resistance 1/gds, Ω.
    pub fn ro(&self, vgs: f64, vds: f64, temp_c: f64) -> f64 {
        1.0 / self.gds(vgs, vds, temp_c)
    }

    /// gm/Id, 1/V.
    pub fn gm_id(&self, vgs: f64, vds: f64, temp_c: f64) -> f64 {
        let (id, gm, _, _) = self.ids_derivs(vgs, 0.0, vds, temp_c);
        gm / id
    }

    /// Inversion coefficient IC = i_f = F((Vgs − VT)/(nU_T)) (Enz/Vittoz; IC < 0.1 weak,
    /// > 10 strong inversion).
    pub fn ic(&self, vgs: f64, temp_c: f64) -> f64 {
        ekv::f((vgs - self.vt(temp_c)) / (self.p.n * thermal_voltage(temp_c)))
    }

    /// Saturation voltage 2U_T√(IC + 1/4) + 3U_T (Binkley, Tradeoffs and Optimization in Analog
    /// CMOS Design, 2008, EKV-based; from memory):
    /// (Vgs − VT)/n in strong inversion, about 4U_T in weak inversion, V.
    pub fn vdsat(&self, vgs: f64, temp_c: f64) -> f64 {
        let ut = thermal_voltage(temp_c);
        2.0 * ut * (self.ic(vgs, temp_c) + 0.25).sqrt() + 3.0 * ut
    }

    /// Vgs that gives drain current `id` at `vds` (Brent on the monotonic Id(Vgs)), V.
    pub fn vgs_for(&self, id: f64, vds: f64, temp_c: f64) -> Result<f64, String> {
        let name = self.kind.name();
        if !(id.is_finite() && id > 0.0) {
            return Err(format!("{name}.vgs_for: id must be > 0 A, got {id}"));
        }
        if !(vds.is_finite() && vds > 0.0) {
            return Err(format!("{name}.vgs_for: vds must be > 0 V, got {vds}"));
        }
        // Saturation estimate; the true Vgs is not below it because the reverse term only
        // subtracts current.
        let m = 1.0 + self.lambda() * vds;
        let lo =
            self.vt(temp_c) + self.p.n * thermal_voltage(temp_c) * ekv::f_inv(id / (self.i_spec(temp_c) * m)) - 1e-3;
        let f = |v: f64| self.id(v, vds, temp_c) - id;
        let mut hi = lo + 0.1;
        while f(hi) < 0.0 {
            hi += 2.0 * (hi - lo);
            if hi - lo > 100.0 {
                return Err(format!("{name}.vgs_for: {id} A is out of reach at vds = {vds} V"));
            }
        }
        crate::num::roots::brent(f, lo, hi, 1e-12, 200).map_err(|e| format!("{name}.vgs_for: {e}"))
    }

    /// Gate voltage of the device diode-connected (Vds = Vgs) carrying `id` (Brent), V.
    pub fn diode_vgs(&self, id: f64, temp_c: f64) -> Result<f64, String> {
        let name = self.kind.name();
        if !(id.is_finite() && id > 0.0) {
            return Err(format!("{name}.diode_vgs: id must be > 0 A, got {id}"));
        }
        let f = |v: f64| self.id(v, v, temp_c) - id;
        let mut hi = 0.5;
        while f(hi) < 0.0 {
            hi += 0.5;
            if hi > 20.0 {
                return Err(format!("{name}: {id} A needs more than 20 V of diode voltage"));
            }
        }
        crate::num::roots::brent(f, 0.0, hi, 1e-12, 300).map_err(|e| format!("{name}.diode_vgs: {e}"))
    }

    /// Small-signal on-resistance of the channel at Vds = 0, bulk-referred gate and channel
    /// voltages: 1/(∂Id/∂Vd) (EKV; 1/(β(Vgs − VT)) in strong inversion, Razavi ch. 2), Ω.
    pub fn ron_b(&self, vg: f64, v_ch: f64, temp_c: f64) -> f64 {
        let ut = thermal_voltage(temp_c);
        let vp = (vg - self.vt(temp_c)) / self.p.n;
        ut / (self.i_spec(temp_c) * ekv::df((vp - v_ch) / ut))
    }

    /// Triode on-resistance with the source at the bulk, Ω.
    pub fn ron(&self, vgs: f64, temp_c: f64) -> f64 {
        self.ron_b(vgs, 0.0, temp_c)
    }

    /// Inversion charge magnitude under the gate with source = drain = v_ch, bulk-referred:
    /// Q = 2nU_T·Cox·W·L·q, q = √(1/4 + i_f) − 1/2 (EKV 1995 charge model), C.
    /// Strong inversion: Cox·W·L·(Vg − VT − n·v_ch) (Razavi ch. 12).
    pub fn channel_charge(&self, vg: f64, v_ch: f64, temp_c: f64) -> f64 {
        let ut = thermal_voltage(temp_c);
        let vp = (vg - self.vt(temp_c)) / self.p.n;
        let q = ekv::charge(ekv::f((vp - v_ch) / ut));
        2.0 * self.p.n * ut * self.p.cox * self.w * self.l * q
    }

    /// Gate capacitances, bulk-referred: Meyer's intrinsic Cgs, Cgd (Meyer 1971) weighted by the
    /// inversion level 2q/(1 + 2q) so they vanish smoothly in weak inversion, with the
    /// overdrive taken as 2U_T√i_f (EKV, positive in every region); Cgb = (1 − weight)·Cox·WL·
    /// (n − 1)/n, oxide in series with depletion (EKV slope factor); plus overlaps Cgso·W, Cgdo·W.
    pub fn caps_b(&self, vg: f64, vs: f64, vd: f64, temp_c: f64) -> GateCaps {
        if vd < vs {
            let c = self.caps_b(vg, vd, vs, temp_c);
            // Overlaps belong to the physical terminals: swap intrinsic parts only.
            let (os, od) = (self.p.cgso * self.w, self.p.cgdo * self.w);
            return GateCaps { cgs: c.cgd - od + os, cgd: c.cgs - os + od, cgb: c.cgb };
        }
        let ut = thermal_voltage(temp_c);
        let n = self.p.n;
        let c_ox = self.p.cox * self.w * self.l;
        let vp = (vg - self.vt(temp_c)) / n;
        let i_f = ekv::f((vp - vs) / ut);
        let q = ekv::charge(i_f);
        let weight = 2.0 * q / (1.0 + 2.0 * q);
        let a = 2.0 * ut * i_f.sqrt();
        let b = (vd - vs).min(a);
        let (cgs_i, cgd_i) = if a > 0.0 {
            let d = 2.0 * a - b;
            (2.0 / 3.0 * c_ox * (1.0 - ((a - b) / d).powi(2)), 2.0 / 3.0 * c_ox * (1.0 - (a / d).powi(2)))
        } else {
            (0.0, 0.0)
        };
        GateCaps {
            cgs: weight * cgs_i + self.p.cgso * self.w,
            cgd: weight * cgd_i + self.p.cgdo * self.w,
            cgb: (1.0 - weight) * c_ox * (n - 1.0) / n,
        }
    }

    /// Gate capacitances with the source at the bulk, F.
    pub fn caps(&self, vgs: f64, vds: f64, temp_c: f64) -> GateCaps {
        self.caps_b(vgs, 0.0, vds, temp_c)
    }

    /// Capacitance of one source/drain diffusion to bulk at reverse bias v_reverse: bottom
    /// Cj·W·ldiff and sidewall Cjsw·(W + 2·ldiff), each Cj0/(1 + Vr/φ)^m (Sze), F.
    pub fn cj_diffusion(&self, v_reverse: f64) -> f64 {
        let area = self.w * self.p.ldiff;
        let perim = self.w + 2.0 * self.p.ldiff;
        junction_cap(self.p.cj * area, v_reverse, self.p.pb, self.p.mj)
            + junction_cap(self.p.cjsw * perim, v_reverse, self.p.pbsw, self.p.mjsw)
    }

    /// σ(ΔVT) of a pair of these devices (Pelgrom 1989), V.
    pub fn sigma_vt(&self) -> f64 {
        mismatch::pelgrom(self.p.avt, self.w, self.l)
    }

    /// σ(Δβ/β) of a pair of these devices (Pelgrom 1989), fraction.
    pub fn sigma_beta(&self) -> f64 {
        mismatch::pelgrom(self.p.abeta, self.w, self.l)
    }
}

/// A length for a message, in engineering notation: `220 nm`, `10.0 mm`.
pub(crate) fn len(x: f64) -> String {
    crate::num::si::eng(x, "m", 3)
}
