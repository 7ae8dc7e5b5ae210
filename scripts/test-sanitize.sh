#!/usr/bin/env bash
# Builds the whole project with AddressSanitizer + UndefinedBehaviorSanitizer into build-asan/
# (or $PHOTOLOT_ASAN_DIR) and runs every test under them. Run by CI after ./scripts/test.sh.
# The Qt programs (tests labelled "gui") run with LeakSanitizer off: Qt's own one-time
# allocations (fonts, platform plugin) are reported as leaks at exit; our code is leak-checked by
# every other test. Any sanitizer report fails the test that triggered it.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh >/dev/null
build=${PHOTOLOT_ASAN_DIR:-build-asan}
# The build lists each program's tests by running it (gtest_discover_tests): no leak check there.
ASAN_OPTIONS=detect_leaks=0 PHOTOLOT_BUILD_DIR=$build PHOTOLOT_JOBS=${PHOTOLOT_JOBS:-2} ./scripts/build.sh \
  -DPHOTOLOT_SANITIZE=ON -DPHOTOLOT_BUILD_BENCHMARKS=OFF -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DPHOTOLOT_BUILD_GUI=${PHOTOLOT_SANITIZE_GUI:-ON}
export QT_QPA_PLATFORM=offscreen
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
export ASAN_OPTIONS=strict_string_checks=1:detect_stack_use_after_return=1:check_initialization_order=1
ctest --test-dir "$build" --output-on-failure -j "${PHOTOLOT_JOBS:-2}" -LE gui
[ "${PHOTOLOT_SANITIZE_GUI:-ON}" = OFF ] && exit 0
ASAN_OPTIONS=$ASAN_OPTIONS:detect_leaks=0 \
  ctest --test-dir "$build" --output-on-failure -j "${PHOTOLOT_JOBS:-2}" -L gui
