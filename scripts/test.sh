#!/usr/bin/env bash
# Run every test of flatray: Rust (format, lints, unit, integration, property and
# doc tests, the docs themselves), the C test program (and valgrind when present),
# and the Python binding's pytest suite. Python test dependencies are installed
# into .venv by this script; nothing else needs installing by hand.
set -euo pipefail
cd "$(dirname "$0")/.."
root=$PWD

step() { printf '\n== %s\n' "$*"; }

step "Rust: format and lints"
cargo fmt --all -- --check
cargo clippy --all-targets -- -D warnings

step "Rust: tests (unit, integration, property, doc)"
cargo test

step "Rust: the same tests with libm maths (what no_std firmware uses)"
cargo test --features libm --tests --quiet

step "Firmware: no_std builds (no heap, no std, the whole C ABI)"
# The core as a no_std rlib on the host...
cargo rustc --quiet --lib --no-default-features --features libm --crate-type rlib
# ...and as a static library for a bare-metal Cortex-M target, when rustup can
# provide the target (one download of its core library).
fw_target=thumbv7em-none-eabihf
if command -v rustup >/dev/null 2>&1 && { rustup target list --installed | grep -qx "$fw_target" || rustup target add "$fw_target" >/dev/null 2>&1; }; then
  cargo build --quiet --release --lib --no-default-features --features libm,panic-handler --target "$fw_target" 2>&1 \
    | grep -v "dropping unsupported crate type" || true
  test -f "target/$fw_target/release/libflatray.a"
  echo "built target/$fw_target/release/libflatray.a"
else
  echo "rustup cannot provide $fw_target here: checked the host no_std rlib only"
fi

step "Rust: documentation builds without warnings"
RUSTDOCFLAGS="-D warnings" cargo doc --no-deps --quiet

step "Release library"
cargo build --release --lib

step "C: example and test program"
bash bindings/c/run.sh "$root/target/release"

step "Fuzzing: a short, repeatable run of every C ABI fuzz target (scripts/fuzz.sh SECONDS for longer)"
FLATRAY_FUZZ_RUNS="${FLATRAY_FUZZ_RUNS:-150000}" bash scripts/fuzz.sh

step "Python: binding and pytest suite"
if [ ! -x .venv/bin/python ]; then
  python3 -m venv .venv
fi
.venv/bin/python -m pip install --quiet --disable-pip-version-check -r bindings/python/requirements-test.txt
FLATRAY_LIBRARY="$root/target/release/libflatray.so" \
  .venv/bin/python -m pytest -q bindings/python/tests

printf '\nAll flatray tests passed.\n'
