#!/usr/bin/env bash
# Builds the test programs whose work runs on several threads (the lot fits' worker pool, the
# temperature fit, the pairing's shared passes, the determinism checks) with ThreadSanitizer
# (clang-14, in build-tsan/ or $PHOTOLOT_TSAN_DIR) and runs their tests under it. Run by CI
# after the AddressSanitizer stage (the two sanitizers cannot share a build). Any data race it
# reports stops the program and fails the stage. Only our code is instrumented: races inside
# the Debian libraries are out of its sight.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh >/dev/null
build=${PHOTOLOT_TSAN_DIR:-build-tsan}
jobs=${PHOTOLOT_JOBS:-$(nproc)}
generator=()
command -v ninja >/dev/null && [ ! -f "$build/Makefile" ] && generator=(-G Ninja)
CC=clang-14 CXX=clang++-14 cmake -S . -B "$build" "${generator[@]}" \
  -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g1" \
  -DCMAKE_CXX_FLAGS="-fsanitize=thread" -DCMAKE_EXE_LINKER_FLAGS="-fsanitize=thread" \
  -DPHOTOLOT_BUILD_GUI=OFF -DPHOTOLOT_BUILD_BENCHMARKS=OFF >/dev/null
programs=(test_fitting test_models test_pairing test_determinism)
targets=()
for t in "${programs[@]}"; do targets+=(--target "$t"); done
cmake --build "$build" -j "$jobs" "${targets[@]}"
export TSAN_OPTIONS=halt_on_error=1:second_deadlock_stack=1
for t in "${programs[@]}"; do
  program=$(find "$build/tests" -type f -name "$t" -perm -u+x | head -n 1)
  echo "threads: $t"
  "$program" --gtest_brief=1
done
