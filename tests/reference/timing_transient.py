"""Reference values for tests/timing_transient.rs: the event times of a window-oscillator node
with a nonlinear C(V) (capacitor voltage coefficients plus NMOS and PMOS switch junctions),
charged and discharged by mirrors with finite output resistance and a 3 % low-side mismatch,
simulated in the time domain with scipy's solve_ivp (DOP853, event location) from the node at
the low threshold, charging. After each crossing the comparator decides TCMP later and the
latch, logic and switch act TCHAIN after that; the node keeps moving all the while.

Run once: python3 tests/reference/timing_transient.py  (scipy 1.17, numpy 2.4).
"""
from scipy.integrate import solve_ivp

C0, VC1, VC2 = 1e-12, 0.02, -0.005
CJN, CJP, PHI, M = 50e-15, 40e-15, 0.8, 0.5
I0, MISMATCH, ROUT, VDSREF = 1e-6, 0.03, 2e6, 0.6
VDD, VLO, VHI = 1.8, 0.2, 1.6
TCMP = 20e-9            # fixed comparator delay (t_cmp)
TCHAIN = 5e-9 + 2e-9 + 1e-9  # t_logic + t_latch + t_sw
OPT = dict(method="DOP853", rtol=1e-13, atol=1e-18)


def cap(v):
    return C0 * (1 + VC1 * v + VC2 * v * v) + CJN / (1 + v / PHI) ** M + CJP / (1 + (VDD - v) / PHI) ** M


def up(t, v):
    return [(I0 + ((VDD - v[0]) - VDSREF) / ROUT) / cap(v[0])]


def dn(t, v):
    return [-(I0 * (1 + MISMATCH) + (v[0] - VDSREF) / ROUT) / cap(v[0])]


def cross(level):
    f = lambda t, v: v[0] - level
    f.terminal = True
    return f


t, v = 0.0, VLO
for cycle in range(3):
    for name, rhs, level in (("charge", up, VHI), ("discharge", dn, VLO)):
        s = solve_ivp(rhs, (t, t + 1e-5), [v], events=cross(level), **OPT)
        tc = float(s.t_events[0][0])
        d = solve_ivp(rhs, (tc, tc + TCMP), [level], **OPT)
        td, vd = float(d.t[-1]), float(d.y[0][-1])
        w = solve_ivp(rhs, (td, td + TCHAIN), [vd], **OPT)
        t, v = float(w.t[-1]), float(w.y[0][-1])
        print(f"cycle {cycle} {name}: crossing {tc!r}, decision {td!r} (v = {vd!r}), switch {t!r} (v = {v!r})")
