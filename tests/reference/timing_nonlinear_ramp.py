"""Reference values for tests/timing_references.rs: a window-oscillator node with a nonlinear
C(V) (capacitor voltage coefficients plus NMOS and PMOS switch junctions) charged and
discharged by mirrors with finite output resistance, integrated independently with scipy
(quad for the ramp integral t = ∫ C(V)/I(V) dV, solve_ivp with event location for the time
domain, including the overshoot during a fixed delay and the periodic steady state).

Run once: python3 tests/reference/timing_nonlinear_ramp.py  (scipy 1.17, numpy 2.4).
"""
from scipy.integrate import quad, solve_ivp

C0, VC1, VC2 = 1e-12, 0.02, -0.005
CJN, CJP, PHI, M = 50e-15, 40e-15, 0.8, 0.5
I0, MISMATCH, ROUT, VDSREF = 1e-6, 0.03, 2e6, 0.6
VDD, VLO, VHI = 1.8, 0.2, 1.6
TD = 20e-9


def cap(v):
    return C0 * (1 + VC1 * v + VC2 * v * v) + CJN / (1 + v / PHI) ** M + CJP / (1 + (VDD - v) / PHI) ** M


def i_ch(v):
    return I0 + ((VDD - v) - VDSREF) / ROUT


def i_dis(v):
    return I0 * (1 + MISMATCH) + (v - VDSREF) / ROUT


def up(t, v):
    return [i_ch(v[0]) / cap(v[0])]


def dn(t, v):
    return [-i_dis(v[0]) / cap(v[0])]


# 1. the two ramp integrals
t_up, _ = quad(lambda v: cap(v) / i_ch(v), VLO, VHI, epsabs=0, epsrel=1e-13)
t_dn, _ = quad(lambda v: cap(v) / i_dis(v), VLO, VHI, epsabs=0, epsrel=1e-13)
print(f"t_up = {t_up!r}")
print(f"t_dn = {t_dn!r}")


# 2. the same ramp by time integration with event location
def cross(level):
    f = lambda t, v: v[0] - level
    f.terminal = True
    return f


s = solve_ivp(up, (0, 1e-5), [VLO], method="DOP853", rtol=1e-13, atol=1e-18, events=cross(VHI))
print(f"t_up_ode = {s.t_events[0][0]!r}")

# 3. periodic steady state with a fixed delay TD after each crossing: iterate cycles
valley = VLO
for _ in range(5):
    a = solve_ivp(up, (0, 1e-5), [valley], method="DOP853", rtol=1e-13, atol=1e-18, events=cross(VHI))
    ta = a.t_events[0][0]
    peak = solve_ivp(up, (0, TD), [VHI], method="DOP853", rtol=1e-13, atol=1e-18).y[0][-1]
    b = solve_ivp(dn, (0, 1e-5), [peak], method="DOP853", rtol=1e-13, atol=1e-18, events=cross(VLO))
    tb = b.t_events[0][0]
    valley = solve_ivp(dn, (0, TD), [VLO], method="DOP853", rtol=1e-13, atol=1e-18).y[0][-1]
period = ta + TD + tb + TD
print(f"v_peak = {peak!r}")
print(f"v_valley = {valley!r}")
print(f"period = {period!r}")
print(f"duty = {(ta + TD) / period!r}")
