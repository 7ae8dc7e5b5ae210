#!/usr/bin/env bash
# Sets up, builds and runs the main job on the bundled sample lot (invented demo data).
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
./scripts/build.sh
build=${PHOTOLOT_BUILD_DIR:-build}
mkdir -p out
"$build/app/cli/photolot-cli" analyze sample-data/demo-lot.csv --json out/demo-results.json --units-csv out/demo-units.csv
