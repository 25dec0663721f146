#!/usr/bin/env bash
# Side-by-side: run the engine benchmarks once and print medians and the script/Rust ratio
# from criterion's estimates (same run, same machine, so the ratio is what to compare).
set -euo pipefail
cd "$(dirname "$0")/.."
cargo bench --bench engine -- --noplot "$@" >/dev/null
median() { python3 -c "import json,sys; print(json.load(open(sys.argv[1]))['median']['point_estimate'])" "$1"; }
crit=target/criterion
run=$(median "$crit/run_trivial_script/new/estimates.json")
rust=$(median "$crit/series_1e6_a_mul_b_plus_c_div_2/rust_loop/new/estimates.json")
script=$(median "$crit/series_1e6_a_mul_b_plus_c_div_2/script/new/estimates.json")
rust1=$(median "$crit/series_1e6_a_mul_b/rust_loop/new/estimates.json")
script1=$(median "$crit/series_1e6_a_mul_b/script/new/estimates.json")
fast=$(median "$crit/scalar_loop_1e5/fast_builtin_operators/new/estimates.json")
quot=$(median "$crit/scalar_loop_1e5/true_quotient/new/estimates.json")
python3 - "$run" "$rust" "$script" "$rust1" "$script1" "$fast" "$quot" <<'PY'
import sys
run, rust, script, rust1, script1, fast, quot = map(float, sys.argv[1:])
print(f"tickwork run, trivial script (median): {run/1e6:.2f} ms   (target < 20 ms)")
print(f"a*b + c/2 on 1e6 elements, Rust loop (median): {rust/1e6:.2f} ms")
print(f"a*b + c/2 on 1e6 elements, script    (median): {script/1e6:.2f} ms")
print(f"script / Rust loop: {script/rust:.2f}x   (target < 2x; the Rust loop fuses three operations into one pass)")
print(f"a*b on 1e6 elements, Rust loop (median): {rust1/1e6:.2f} ms")
print(f"a*b on 1e6 elements, script    (median): {script1/1e6:.2f} ms")
print(f"script / Rust loop, one operation: {script1/rust1:.2f}x   (target < 2x)")
print(f"scalar loop of 1e5 iterations, fast built-in operators (median): {fast/1e6:.2f} ms")
print(f"scalar loop of 1e5 iterations, true-quotient '/' (median): {quot/1e6:.2f} ms")
print(f"cost of the true-quotient '/' on scalar script code: {quot/fast:.2f}x")
PY
