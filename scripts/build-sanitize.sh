#!/usr/bin/env bash
# Configures and builds the instrumented build in build-sanitize/ (or $PHOTOLOT_SANITIZE_DIR):
# clang-14 with AddressSanitizer + UndefinedBehaviorSanitizer and libFuzzer's coverage, so that
# one build serves both the sanitizer run of the test suite (scripts/test-sanitize.sh) and the
# fuzz programs (scripts/fuzz.sh). Arguments are build targets (default: everything).
#
#   ./scripts/build-sanitize.sh                          # all of it
#   ./scripts/build-sanitize.sh fuzz_import fuzz_spec    # only those programs and what they need
#
# -O1 -g1: the optimisation the sanitizers are documented with, and line tables for their
# reports; quicker to compile than -O2 -g. PHOTOLOT_SANITIZE_GUI=OFF leaves the Qt parts out.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${PHOTOLOT_SANITIZE_DIR:-build-sanitize}
jobs=${PHOTOLOT_JOBS:-$(nproc)}
generator=()
command -v ninja >/dev/null && [ ! -f "$build/Makefile" ] && generator=(-G Ninja)
gui=()
[ -n "${PHOTOLOT_SANITIZE_GUI:-}" ] && gui=(-DPHOTOLOT_BUILD_GUI="$PHOTOLOT_SANITIZE_GUI")
CC=clang-14 CXX=clang++-14 cmake -S . -B "$build" "${generator[@]}" \
  -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g1" \
  -DPHOTOLOT_SANITIZE=ON -DPHOTOLOT_FUZZ=ON -DPHOTOLOT_BUILD_BENCHMARKS=OFF "${gui[@]}" >/dev/null
targets=()
for t in "$@"; do targets+=(--target "$t"); done
# The build lists each program's tests by running it (gtest_discover_tests): no leak check there.
ASAN_OPTIONS=detect_leaks=0 cmake --build "$build" -j "$jobs" "${targets[@]}"
