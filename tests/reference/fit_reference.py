"""Reference values for tests/suite/analysis_fit.rs: numpy.linalg.lstsq and
scipy.optimize.curve_fit on deterministic data with a fixed pseudo-noise pattern (no random
numbers, so the Rust test rebuilds the same data exactly). Run once; values pasted in the test.

    pip install numpy scipy && python3 tests/reference/fit_reference.py
"""
import numpy as np
from scipy import optimize, stats

np.set_printoptions(precision=17)

# 1. Period versus charging current of a window oscillator, T = a*C*dV/I + t_d, with a
#    deterministic disturbance of 2 ns amplitude (invented numbers).
k = np.arange(12)
i = 0.5e-6 + k * (1.5e-6 / 11)
x = 1e-12 * 0.6 / i
t = 2.02 * x + 35e-9 + 2e-9 * np.sin(1.7 * k)
X = np.column_stack([np.ones_like(x), x])
coef, res, rank, sv = np.linalg.lstsq(X, t, rcond=None)
r = t - X @ coef
dof = len(t) - 2
s2 = r @ r / dof
cov = s2 * np.linalg.inv(X.T @ X)
se = np.sqrt(np.diag(cov))
tq = stats.t.ppf(0.975, dof)
print("lstsq coef", repr(coef.tolist()))
print("lstsq stderr", repr(se.tolist()))
print("lstsq lo", repr((coef - tq * se).tolist()))
print("lstsq hi", repr((coef + tq * se).tolist()))
print("lstsq r2", repr(1 - (r @ r) / np.sum((t - t.mean()) ** 2)))

# 2. An exponential settling curve y = p0*exp(-x/p1) + p2 with a 0.01 disturbance.
k = np.arange(25)
xs = k * 0.4
ys = 2.0 * np.exp(-xs / 3.0) + 0.5 + 0.01 * np.sin(2.1 * k + 0.3)
popt, pcov = optimize.curve_fit(lambda x, a, b, c: a * np.exp(-x / b) + c, xs, ys, p0=[1.0, 1.0, 0.0])
se = np.sqrt(np.diag(pcov))
tq = stats.t.ppf(0.975, len(xs) - 3)
print("curve_fit popt", repr(popt.tolist()))
print("curve_fit stderr", repr(se.tolist()))
print("curve_fit lo", repr((popt - tq * se).tolist()))
print("curve_fit hi", repr((popt + tq * se).tolist()))
