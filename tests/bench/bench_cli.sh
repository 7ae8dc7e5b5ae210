#!/usr/bin/env bash
# End-to-end timing of photolot-cli analyze on a simulated 10,000-unit lot (12 levels):
# import + fit + results document, as a user runs it. Prints the best and median wall time of
# several runs per variant, and each variant's ratio to the first, measured in this one run
# (the machine may be shared and noisy: compare ratios, not runs on different days).
#
#   tests/bench/bench_cli.sh [build-folder] [runs]      (default: build, 7)
set -euo pipefail
cd "$(dirname "$0")/../.."
build=${1:-build}
runs=${2:-7}
cli="$build/app/cli/photolot-cli"
[ -x "$cli" ] || { echo "bench_cli: build photolot-cli first ($cli not found)" >&2; exit 1; }
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT

"$cli" simulate --units 10000 --seed 1 --levels 0.5,1,2,5,10,20,50,100,200,500,1000,2000 \
  --dark --censor-above 20M --outliers 0.002 --out "$work/lot.csv" >/dev/null
echo "lot: 10000 units x 12 levels + 1 dark reading, $(wc -c <"$work/lot.csv") bytes; $runs runs each; $(nproc) cores"

# "wall cpu" seconds of one command (bash's own time: real, and user + sys).
time_s() {
  local TIMEFORMAT='%3R %3U %3S' t
  t=$({ time "$@" >/dev/null 2>&1; } 2>&1)
  awk '{ printf "%.3f %.3f\n", $1, $2 + $3 }' <<<"$t"
}

first_cpu=""
variant() {
  local name=$1
  shift
  local rows=""
  for _ in $(seq "$runs"); do rows+="$(time_s "$@")"$'\n'; done
  local mid=$(((runs + 1) / 2))
  local wall cpu
  wall=$(printf '%s' "$rows" | awk '{ print $1 }' | sort -n | sed -n "${mid}p")
  cpu=$(printf '%s' "$rows" | awk '{ print $2 }' | sort -n | sed -n "${mid}p")
  [ -n "$first_cpu" ] || first_cpu=$cpu
  awk -v n="$name" -v w="$wall" -v c="$cpu" -v f="$first_cpu" \
    'BEGIN { printf "%-44s median wall %6.3f s  cpu %6.3f s  cpu ratio %.2f\n", n, w, c, c / f }'
}

variant "analyze --quiet (no files written)" "$cli" analyze "$work/lot.csv" --quiet
variant "analyze --quiet --json" "$cli" analyze "$work/lot.csv" --quiet --json "$work/r.json"
variant "analyze --json --units-csv (table printed)" "$cli" analyze "$work/lot.csv" \
  --json "$work/r.json" --units-csv "$work/u.csv"
variant "analyze --quiet --json --residuals" "$cli" analyze "$work/lot.csv" --quiet \
  --json "$work/residuals.json" --residuals
variant "analyze --quiet --json --model power-law --temperature off" "$cli" analyze \
  "$work/lot.csv" --quiet --json "$work/r.json" --model power-law --temperature off
variant "analyze --quiet --json --threads 1" "$cli" analyze "$work/lot.csv" --quiet \
  --json "$work/r.json" --threads 1
variant "analyze --quiet --model choose" "$cli" analyze "$work/lot.csv" --quiet --model choose
variant "analyze --quiet --model choose --threads 1" "$cli" analyze "$work/lot.csv" --quiet \
  --model choose --threads 1
echo "results document: $(wc -c <"$work/r.json") bytes; with --residuals $(wc -c <"$work/residuals.json") bytes"
