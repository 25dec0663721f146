"""numpy side of benches/compare_series.sh: median seconds of exp, log, power and sum on the
same 10^6 points (0.5 to 2.5) the tickwork benchmark uses. Prints one 'name seconds' per line."""
import sys, timeit
import numpy as np

a = np.linspace(0.5, 2.5, 1_000_000)
cases = {"exp": lambda: np.exp(a), "ln": lambda: np.log(a), "pow": lambda: a ** 1.7, "sum": lambda: a.sum()}
for name, f in cases.items():
    t = timeit.repeat(f, number=10, repeat=15)
    print(name, sorted(t)[len(t) // 2] / 10)
