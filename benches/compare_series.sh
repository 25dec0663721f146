#!/usr/bin/env bash
# Side-by-side: Series maths on 10^6 elements in a tickwork script against numpy, medians from
# one run on this machine, and the ratio (target: within 1.5x of numpy). Installs numpy with pip
# if it is missing.
set -euo pipefail
cd "$(dirname "$0")/.."
python3 -c "import numpy" 2>/dev/null || python3 -m pip install --quiet numpy
cargo bench --bench series -- --noplot >/dev/null
numpy=$(python3 benches/series_numpy.py)
python3 - "$numpy" <<'PY'
import json, sys
numpy = dict((l.split()[0], float(l.split()[1])) for l in sys.argv[1].splitlines())
for name in ["exp", "ln", "pow", "sum"]:
    est = json.load(open(f"target/criterion/series_1e6_maths/{name}/new/estimates.json"))
    t = est["median"]["point_estimate"] / 1e9
    print(f"{name:4s} on 1e6: tickwork {t*1e3:7.2f} ms   numpy {numpy[name]*1e3:7.2f} ms   ratio {t/numpy[name]:5.2f}x")
PY
