#!/usr/bin/env bash
# Build and run the C example and the C test program against a built flatray.
#
# Usage: bindings/c/run.sh [LIBDIR]
#   LIBDIR holds libflatray.so and libflatray.a (default: target/release of the
#   repository; build it first with `cargo build --release`).
#
# Runs, stopping at the first failure:
#   1. every test program bindings/c/test_*.c linked against the shared library
#      (with an rpath);
#   2. the example program, the same way;
#   3. every test program linked against the static library;
#   4. the shared-library tests under valgrind, when valgrind is installed
#      (valgrind.supp: rayon's pool threads, which live until exit).
# Outputs go to bindings/c/build/ (git-ignored).
set -euo pipefail

here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
libdir="${1:-$root/target/release}"
case "$libdir" in
/*) ;;
*) libdir="$root/$libdir" ;; # relative to the repository root
esac
if [ ! -d "$libdir" ]; then
    echo "run.sh: library directory not found: $libdir" >&2
    exit 2
fi
libdir="$(cd "$libdir" && pwd)"
for f in libflatray.so libflatray.a; do
    if [ ! -f "$libdir/$f" ]; then
        echo "run.sh: $libdir/$f is missing (run: cargo build --release)" >&2
        exit 2
    fi
done

build="$here/build"
mkdir -p "$build"
cc="${CC:-gcc}"
cflags=(-std=c99 -Wall -Wextra -Werror -pedantic -O1 -g -I "$root/include")
shared=(-L "$libdir" -lflatray "-Wl,-rpath,$libdir" -lm)
# What a Rust static library needs from the system on Linux (as printed by
# `cargo rustc --release -- --print native-static-libs`).
static=("$libdir/libflatray.a" -lgcc_s -lutil -lrt -lpthread -lm -ldl -lc)

tests=()
for src in "$here"/test_*.c; do
    tests+=("$(basename "$src" .c)")
done

echo "== compile (shared library: $libdir/libflatray.so)"
for t in "${tests[@]}"; do
    "$cc" "${cflags[@]}" -o "$build/$t" "$here/$t.c" "${shared[@]}"
done
"$cc" "${cflags[@]}" -o "$build/example" "$here/example.c" "${shared[@]}"

for t in "${tests[@]}"; do
    echo "== $t (shared library)"
    "$build/$t"
done

echo "== example"
"$build/example"

for t in "${tests[@]}"; do
    echo "== $t (static library: $libdir/libflatray.a)"
    "$cc" "${cflags[@]}" -o "$build/${t}_static" "$here/$t.c" "${static[@]}"
    if ldd "$build/${t}_static" 2>/dev/null | grep -q 'libflatray\.so'; then
        echo "run.sh: the static build links libflatray.so dynamically" >&2
        exit 1
    fi
    "$build/${t}_static"
done

if command -v valgrind >/dev/null 2>&1; then
    for t in "${tests[@]}"; do
        echo "== $t under valgrind (shared library)"
        valgrind --error-exitcode=1 --leak-check=full --quiet \
            --suppressions="$here/valgrind.supp" "$build/$t"
    done
    echo "valgrind: no errors"
else
    echo "== valgrind not installed: skipping the valgrind run"
fi

echo "== all C checks passed"
