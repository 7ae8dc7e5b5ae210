#!/usr/bin/env bash
# Sets up, builds and runs the main job on the bundled sample lot (invented demo data, see
# sample-data/README.md): both sessions of reel 417 are imported and merged, every unit's curve
# is fitted, the table and the lot's counts are printed, and the results document (JSON) and
# the unit table (CSV) are written to out/.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
./scripts/build.sh
build=${PHOTOLOT_BUILD_DIR:-build}
mkdir -p out
"$build/app/cli/photolot-cli" analyze sample-data/demo-lot.csv sample-data/demo-lot-session2.csv \
  --json out/demo-results.json --units-csv out/demo-units.csv
echo
echo "demo: the results document is in out/demo-results.json (format: docs/results-format.md)"
echo "demo: the unit table is in out/demo-units.csv"
