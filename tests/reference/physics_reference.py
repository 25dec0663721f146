#!/usr/bin/env python3
"""Reference values for tests/physics_reference.rs, computed independently with numpy/scipy.

Run:  python3 tests/reference/physics_reference.py
The printed values are pasted into tests/physics_reference.rs. Device parameters are those
of the built-in demo180 process (src/physics/demo180.toml, invented numbers), copied by hand.
"""
import numpy as np
from scipy import constants, integrate, optimize

# --- CODATA 2018 (scipy.constants) -------------------------------------------------------
print("# thermal voltage kT/q")
for t_k in (300.0, 233.15, 398.15):
    print(f"T = {t_k} K: {constants.k * t_k / constants.e!r}")

# --- EKV 1995 drain current, demo180 NMOS W = 2 µm, L = 0.5 µm, 27 °C ------------------
VTH0, KP, N, LAMBDA_L = 0.45, 300e-6, 1.35, 0.06e-6
W, L, TNOM = 2e-6, 0.5e-6, 27.0


def ut(temp_c):
    return constants.k * (temp_c + 273.15) / constants.e


def F(x):
    # ln^2(1 + e^(x/2)), via numpy's logaddexp for range safety
    return np.logaddexp(0.0, x / 2.0) ** 2


def ids(vg, vs, vd, temp_c=27.0, w=W, l=L, vth0=VTH0, kp=KP, n=N, mu_exp=1.5, tc=-1.0e-3):
    u = ut(temp_c)
    vt = vth0 + tc * (temp_c - TNOM)
    beta = kp * ((temp_c + 273.15) / (TNOM + 273.15)) ** (-mu_exp) * w / l
    i_s = 2 * n * beta * u * u
    vp = (vg - vt) / n
    return i_s * (F((vp - vs) / u) - F((vp - vd) / u)) * (1 + LAMBDA_L / l * (vd - vs))


print("# EKV Id(vgs, vds) at 27 °C and gm, gds by central differences (h = 1 µV)")
h = 1e-6
for vgs, vds in ((0.2, 0.9), (0.45, 0.9), (0.6, 0.05), (0.9, 0.9), (1.8, 0.3)):
    i = ids(vgs, 0, vds)
    gm = (ids(vgs + h, 0, vds) - ids(vgs - h, 0, vds)) / (2 * h)
    gds = (ids(vgs, 0, vds + h) - ids(vgs, 0, vds - h)) / (2 * h)
    print(f"({vgs}, {vds}, {i!r}, {gm!r}, {gds!r}),")

print("# Id at 125 °C and -40 °C, vgs = 0.6, vds = 0.9")
for t in (125.0, -40.0):
    print(f"{t}: {ids(0.6, 0, 0.9, t)!r}")

print("# vgs for id at vds = 0.9 V (scipy brentq)")
for i_target in (1e-9, 1e-6, 1e-4):
    v = optimize.brentq(lambda v: ids(v, 0, 0.9) - i_target, -1.0, 5.0, xtol=1e-14)
    print(f"({i_target!r}, {v!r}),")

# --- Cascode mirror output (demo180 NMOS 4 µm / 2 µm, Iref = 1 µA, ratio 1) ------------
print("# cascode mirror: iout(vout) by scipy brentq on the internal node")
W2, L2, IREF = 4e-6, 2e-6, 1e-6
dev = lambda vg, vs, vd: ids(vg, vs, vd, w=W2, l=L2)
vg1 = optimize.brentq(lambda v: dev(v, 0, v) - IREF, 0.0, 3.0, xtol=1e-15)
vb = optimize.brentq(lambda v: dev(v, vg1, v) - IREF, vg1, vg1 + 3.0, xtol=1e-15)
print(f"vg1 = {vg1!r}, vb = {vb!r}")
for vout in (0.3, 0.6, 1.0, 1.8):
    vx = optimize.brentq(lambda x: dev(vg1, 0, x) - dev(vb, x, vout), 0.0, vout, xtol=1e-15)
    print(f"({vout}, {dev(vg1, 0, vx)!r}),")

# --- Comparator delay: ODE solution (scipy solve_ivp, event at the output swing) -------
A0, GBW, SR, DV = 200.0, 50e6, 40e6, 0.9
TAU = A0 / (2 * np.pi * GBW)


def first_crossing(rhs, t_end):
    ev = lambda t, y: y[0] - DV
    ev.terminal, ev.direction = True, 1
    sol = integrate.solve_ivp(rhs, (0, t_end), [0.0], events=ev, rtol=1e-11, atol=1e-15, max_step=t_end / 2000)
    return sol.t_events[0][0]


print(f"# comparator step delay, A0 = {A0}, GBW = {GBW}, SR = {SR}, dv = {DV} (tau = {TAU!r})")
for vod in (0.006, 0.01, 0.05, 0.3):
    rhs = lambda t, y, vod=vod: [min((A0 * vod - y[0]) / TAU, SR)]
    print(f"({vod}, {first_crossing(rhs, 20 * TAU)!r}),")
print("# comparator ramp delay")
for s in (1e4, 1e6, 1e8):
    rhs = lambda t, y, s=s: [min((A0 * s * t - y[0]) / TAU, SR)]
    t_end = 10 * max(np.sqrt(2 * DV * TAU / (A0 * s)), DV / SR, TAU)
    print(f"({s!r}, {first_crossing(rhs, t_end)!r}),")

# --- Mirror-ratio mismatch: Monte Carlo of the EKV simple mirror ------------------------
print("# simple mirror ratio sigma, Monte Carlo (numpy, seed 1, 400000 pairs)")
AVT, ABETA = 5.0e-9, 1.0e-8
rng = np.random.default_rng(1)
n_mc = 400_000
area = W2 * L2
dvt = rng.normal(0, AVT / np.sqrt(2 * area), (2, n_mc))
db = rng.normal(0, ABETA / np.sqrt(2 * area), (2, n_mc))
vds_in = vg1
i_in = ids(vg1, 0, vds_in, w=W2, l=L2, vth0=VTH0 + dvt[0], kp=KP * (1 + db[0]))
i_out = ids(vg1, 0, vds_in, w=W2, l=L2, vth0=VTH0 + dvt[1], kp=KP * (1 + db[1]))
print(f"sigma = {np.std(i_out / i_in)!r}")
