#!/usr/bin/env bash
# Run flatray's fuzz targets (fuzz/fuzz_targets/, libFuzzer via cargo-fuzz),
# each for a bounded time, and print how many inputs each executed.
#
# Usage: scripts/fuzz.sh [SECONDS_PER_TARGET] [TARGET...]
#   scripts/fuzz.sh              # every target, 30 s each
#   scripts/fuzz.sh 600 stack    # the stack target for 10 minutes
#   FLATRAY_FUZZ_RUNS=100000 scripts/fuzz.sh   # a fixed number of inputs from a
#                                # fixed seed instead (repeatable: the test command)
#
# Installs cargo-fuzz from crates.io when it is missing. cargo-fuzz passes
# nightly-only sanitizer flags; RUSTC_BOOTSTRAP=1 lets the stable toolchain
# accept them. A finding stops the run and leaves the input in
# fuzz/artifacts/TARGET/; reproduce it with `cargo fuzz run -O TARGET FILE`, fix
# it, and add the decoded case to tests/fuzz_regressions.rs.
set -euo pipefail
cd "$(dirname "$0")/.."
seconds="${1:-30}"
shift || true

if ! command -v cargo-fuzz >/dev/null 2>&1; then
  echo "installing cargo-fuzz (once)"
  cargo install --quiet --locked cargo-fuzz
fi
export RUSTC_BOOTSTRAP=1

targets=("$@")
if [ ${#targets[@]} -eq 0 ]; then
  mapfile -t targets < <(cargo fuzz list)
fi
for t in "${targets[@]}"; do
  mkdir -p "fuzz/corpus/$t"
  log="$(mktemp)"
  if [ -n "${FLATRAY_FUZZ_RUNS:-}" ]; then
    limit=(-runs="$FLATRAY_FUZZ_RUNS" -seed=1)
    what="from seed 1"
  else
    limit=(-max_total_time="$seconds")
    what="in ${seconds} s"
  fi
  if ! cargo fuzz run -O "$t" "fuzz/corpus/$t" -- "${limit[@]}" -max_len=512 \
      -print_final_stats=1 >"$log" 2>&1; then
    grep -E -A3 "panicked|ERROR" "$log" | head -20
    grep -E -A1 "Failing input|Reproduce with" "$log" || tail -20 "$log"
    echo "fuzz target $t found a problem (see above)" >&2
    exit 1
  fi
  runs=$(grep -o 'stat::number_of_executed_units: *[0-9]*' "$log" | grep -o '[0-9]*$' || echo "?")
  echo "fuzz target $t: $runs inputs $what, no finding"
  rm -f "$log"
done
