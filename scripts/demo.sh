#!/usr/bin/env bash
# Sets up, builds and runs the main job on the bundled sample lot (invented demo data, see
# sample-data/README.md): both sessions of reel 417 are imported and merged, every unit's curve
# is fitted, the lot is judged against the demo purchase spec (ISO 2859-1 sampling), the
# conforming units are paired, and the table and summaries are printed. Written to out/: the
# results document (JSON), the unit table (CSV), the pick list of pairs (CSV) and the printed
# lot acceptance summary (PDF). Then the workbench is opened on the same lot when a display is
# available; otherwise the command that opens it is printed.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
./scripts/build.sh
build=${PHOTOLOT_BUILD_DIR:-build}
mkdir -p out
lot=(sample-data/demo-lot.csv sample-data/demo-lot-session2.csv)
spec=sample-data/demo-spec.toml
"$build/app/cli/photolot-cli" analyze "${lot[@]}" --spec "$spec" \
  --json out/demo-results.json --units-csv out/demo-units.csv \
  --pair --pairs-csv out/demo-pairs.csv \
  --report out/demo-summary.pdf --lot-id "REEL-417 (invented)"
echo
echo "demo: the results document is in out/demo-results.json (format: docs/results-format.md)"
echo "demo: the unit table is in out/demo-units.csv"
echo "demo: the pick list of matched pairs is in out/demo-pairs.csv"
echo "demo: the printed lot acceptance summary is in out/demo-summary.pdf"

workbench="$build/app/workbench/photolot"
open_cmd="$workbench --spec $spec ${lot[*]}"
if [ -x "$workbench" ] && { [ -n "${DISPLAY:-}" ] || [ -n "${WAYLAND_DISPLAY:-}" ]; }; then
  echo "demo: opening the workbench: $open_cmd"
  "$workbench" --spec "$spec" "${lot[@]}"
elif [ -x "$workbench" ]; then
  echo "demo: no display here; on a desktop, open the workbench with:"
  echo "    $open_cmd"
else
  echo "demo: the workbench ($workbench) is not built here (it needs the Qt parts,"
  echo "      PHOTOLOT_BUILD_GUI=ON); once it is, open it with:"
  echo "    $open_cmd"
fi
