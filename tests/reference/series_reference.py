"""Reference values for tests/series_math.rs, computed once with numpy.

Run: python3 tests/reference/series_reference.py
The printed values are pasted into the Rust test beside the check they serve.
"""
import numpy as np

x = np.array([3.1, -0.4, 2.7, 9.9, 0.05, 4.4, 4.4, -2.2, 7.5, 1.0])
print("mean", repr(np.mean(x)))
print("stdev_ddof1", repr(np.std(x, ddof=1)))
for p in (0.0, 0.1, 0.25, 0.5, 0.9, 1.0):
    print("quantile", p, repr(np.quantile(x, p)))  # numpy default method 'linear'
print("argmin", int(np.argmin(x)), "argmax", int(np.argmax(x)))
y = np.abs(x) + 0.5
print("sum_exp_neg", repr(np.sum(np.exp(-y))))
print("sum_ln", repr(np.sum(np.log(y))))
print("sum_log10", repr(np.sum(np.log10(y))))
print("sum_sqrt", repr(np.sum(np.sqrt(y))))
print("sum_pow_1_5", repr(np.sum(y ** 1.5)))
print("linspace", repr(list(np.linspace(1e-3, 2.0, 5))))
print("geomspace", repr(list(np.geomspace(1e-9, 1e-3, 4))))
print("expr_sum", repr(np.sum((y * 2.5 - 1.0) / (y + 3.0))))
