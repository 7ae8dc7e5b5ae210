#!/usr/bin/env bash
# Builds the libFuzzer targets (clang-14, ASan + UBSan) in the sanitizer build (build-sanitize/
# or $PHOTOLOT_SANITIZE_DIR; scripts/build-sanitize.sh) and runs each for a bounded time,
# starting from its seed corpus in tests/fuzz/corpus/<target>/. Run by CI after the sanitizer
# stage, whose build it reuses: only the fuzz programs' own files are compiled again.
#
#   ./scripts/fuzz.sh                 # every target, 60 s each (as CI runs it)
#   ./scripts/fuzz.sh 3600 import     # one target for an hour (docs/hardening.md)
#
# New inputs found go to a scratch corpus (not into the tree). A crash stops the run, leaves the
# input as crash-* in the scratch folder (printed) and fails the script: fix the bug, then copy
# the input to tests/fuzz/regressions/<target>/ so test_fuzz replays it from then on.
set -euo pipefail
cd "$(dirname "$0")/.."
seconds=${1:-${PHOTOLOT_FUZZ_SECONDS:-60}}
shift || true
targets=("$@")
[ ${#targets[@]} -eq 0 ] && targets=(import spec results workspace)
build=${PHOTOLOT_SANITIZE_DIR:-build-sanitize}
./scripts/build-sanitize.sh "${targets[@]/#/fuzz_}"
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
status=0
for t in "${targets[@]}"; do
  mkdir -p "$work/$t" "$work/crash-$t"
  echo "fuzz: $t for ${seconds} s"
  if ! "$build/tests/fuzz/fuzz_$t" "$work/$t" "tests/fuzz/corpus/$t" \
      -max_total_time="$seconds" -max_len=65536 -rss_limit_mb=2048 -timeout=10 \
      -artifact_prefix="$work/crash-$t/" -print_final_stats=1 2>"$work/$t.log"; then
    tail -n 40 "$work/$t.log" >&2
    kept=$(mktemp -d)
    cp -r "$work/crash-$t/." "$kept/"
    echo "fuzz: $t failed; its input is kept in $kept" >&2
    status=1
  else
    grep -E "^stat::(number_of_executed_units|peak_rss_mb)" "$work/$t.log" | sed "s/^/fuzz: $t /"
  fi
done
exit $status
