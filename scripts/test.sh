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

step "Rust: documentation builds without warnings"
RUSTDOCFLAGS="-D warnings" cargo doc --no-deps --quiet

step "Release library"
cargo build --release --lib

step "C: example and test program"
bash bindings/c/run.sh "$root/target/release"

step "Python: binding and pytest suite"
if [ ! -x .venv/bin/python ]; then
  python3 -m venv .venv
fi
.venv/bin/python -m pip install --quiet --disable-pip-version-check -r bindings/python/requirements-test.txt
FLATRAY_LIBRARY="$root/target/release/libflatray.so" \
  .venv/bin/python -m pytest -q bindings/python/tests

printf '\nAll flatray tests passed.\n'
