#!/usr/bin/env bash
# Builds the whole project with AddressSanitizer + UndefinedBehaviorSanitizer (clang-14, in
# build-sanitize/ or $PHOTOLOT_SANITIZE_DIR: see scripts/build-sanitize.sh) and runs every test
# under them. Run by CI after ./scripts/test.sh. PHOTOLOT_SANITIZE_GUI=OFF leaves the Qt parts
# out. Every test is leak-checked, the Qt ones too (their one-time allocations are still
# reachable at exit, which LeakSanitizer does not report). Any sanitizer report fails the test
# that triggered it.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh >/dev/null
build=${PHOTOLOT_SANITIZE_DIR:-build-sanitize}
./scripts/build-sanitize.sh
export QT_QPA_PLATFORM=offscreen
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
export ASAN_OPTIONS=strict_string_checks=1:detect_stack_use_after_return=1:check_initialization_order=1
ctest --test-dir "$build" --output-on-failure -j "${PHOTOLOT_JOBS:-$(nproc)}"
