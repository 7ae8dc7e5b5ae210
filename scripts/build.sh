#!/usr/bin/env bash
# Configures and builds photolot into build/ (or $PHOTOLOT_BUILD_DIR). Used by the other scripts.
# PHOTOLOT_JOBS caps the parallel jobs (default: every core).
set -euo pipefail
cd "$(dirname "$0")/.."
build=${PHOTOLOT_BUILD_DIR:-build}
jobs=${PHOTOLOT_JOBS:-$(nproc)}
generator=()
command -v ninja >/dev/null && [ ! -f "$build/Makefile" ] && generator=(-G Ninja)
cmake -S . -B "$build" "${generator[@]}" -DCMAKE_BUILD_TYPE=Release "$@" >/dev/null
# PHOTOLOT_TARGETS="photolot test_workbench" builds only those (and what they need).
targets=()
for t in ${PHOTOLOT_TARGETS:-}; do targets+=(--target "$t"); done
cmake --build "$build" -j "$jobs" "${targets[@]}"
