"""Reference values of the 95 % Wilson score interval (Wilson 1927) for tests/suite/analysis_monte_carlo.rs.

Run once with statsmodels installed; the printed pairs are pasted beside the check.
    python3 tests/reference/wilson_reference.py
"""
from statsmodels.stats.proportion import proportion_confint

CASES = [(0, 10), (10, 10), (5, 10), (95, 100), (1, 1000), (500, 1000), (9990, 10000), (999_000, 1_000_000)]

for k, n in CASES:
    lo, hi = proportion_confint(k, n, alpha=0.05, method="wilson")
    print(f"({k}, {n}, {lo!r}, {hi!r}),")
