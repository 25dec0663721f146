#!/usr/bin/env bash
# Side-by-side: 10^4 cycles of the transient with and without noise, medians and ratio from
# one run of `cargo bench --bench noise` (same run, same machine).
set -euo pipefail
cd "$(dirname "$0")/.."
cargo bench --bench noise -- --noplot "$@" >/dev/null
median() { python3 -c "import json,sys; print(json.load(open(sys.argv[1]))['median']['point_estimate'])" "$1"; }
crit=target/criterion/transient_1e4_cycles
quiet=$(median "$crit/quiet/new/estimates.json")
noisy=$(median "$crit/noisy/new/estimates.json")
python3 - "$quiet" "$noisy" <<'PY'
import sys
quiet, noisy = map(float, sys.argv[1:])
print(f"transient, 1e4 cycles, quiet (median): {quiet/1e6:.2f} ms")
print(f"transient, 1e4 cycles, noisy (median): {noisy/1e6:.2f} ms")
print(f"noisy / quiet: {noisy/quiet:.2f}x   (target < 2x)")
PY
