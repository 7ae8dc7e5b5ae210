#!/usr/bin/env bash
# Configures and builds photolot into build/ (or $PHOTOLOT_BUILD_DIR). Used by the other scripts.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${PHOTOLOT_BUILD_DIR:-build}
jobs=${PHOTOLOT_JOBS:-$(nproc)}
generator=()
command -v ninja >/dev/null && [ ! -f "$build/Makefile" ] && generator=(-G Ninja)
cmake -S . -B "$build" "${generator[@]}" -DCMAKE_BUILD_TYPE=Release "$@" >/dev/null
cmake --build "$build" -j "$jobs"
