#!/usr/bin/env python3
"""Reference values for tests/suite/timing_generators.rs, computed independently with scipy.

Run:  python3 tests/reference/reference_generators.py
The printed values are pasted beside the checks. The beta multiplier is solved from its loop
equation (not from the closed form the code uses); Vbe(T) comes from the diode law with
the saturation current's temperature law (not from Tsividis's closed form the code uses).
"""
import numpy as np
from scipy import constants, optimize

def ut(temp_c):
    return constants.k * (temp_c + 273.15) / constants.e

# --- PTAT: ΔVbe = U_T·ln N (CODATA constants) ------------------------------------------
print("# delta_vbe(N = 8)")
for t in (-40.0, 27.0, 125.0):
    print(f"{t} °C: {ut(t) * np.log(8.0)!r}")

# --- Beta multiplier: sqrt(2I/β) − sqrt(2I/(Kβ)) = I·R solved for I > 0 ------------------
print("# beta multiplier, kp = 300e-6, W/L = 10, R = 100e3, K = 4")
kp, wl, r, k = 300e-6, 10.0, 100e3, 4.0
beta = kp * wl
f = lambda i: np.sqrt(2 * i / beta) - np.sqrt(2 * i / (k * beta)) - i * r
i = optimize.brentq(f, 1e-12, 1e-3, xtol=1e-30, rtol=1e-15)
print(f"I = {i!r}")

# --- Vbe(T) from the diode law: Vbe = U_T·ln(Ic/Is), Is ∝ T^XTI·exp(−q·VG0/kT), Ic ∝ T^α ---
print("# Vbe(T) of vbe_ref = 0.65 V at 27 °C, vg0 = 1.17 V, XTI = 3.5, alpha = 0.5 (eta = 3)")
vbe_r, vg0, xti, alpha, tr = 0.65, 1.17, 3.5, 0.5, 300.15
kq = constants.k / constants.e
ic_over_is_r = np.exp(vbe_r / (kq * tr))
for t in (-40.0, 125.0):
    tk = t + 273.15
    ratio = ic_over_is_r * (tk / tr) ** alpha / ((tk / tr) ** xti * np.exp(vg0 / kq * (1 / tr - 1 / tk)))
    print(f"{t} °C: {kq * tk * np.log(ratio)!r}")
