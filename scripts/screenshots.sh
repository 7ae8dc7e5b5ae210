#!/usr/bin/env bash
# Takes the screenshots in docs/images/ : the workbench opens the invented demo lot with its
# spec under a virtual X display (Xvfb), saves a picture of each view and of the import dialog,
# and quits. Needs a build (./scripts/build.sh) and xvfb-run (scripts/setup-debian.sh).
set -euo pipefail
cd "$(dirname "$0")/.."
build=${PHOTOLOT_BUILD_DIR:-build}
out=docs/images
mkdir -p "$out"
settings=$(mktemp -d)
trap 'rm -rf "$settings"' EXIT
# A fresh settings folder: no recent files or window layout of whoever runs this.
XDG_CONFIG_HOME="$settings" xvfb-run -a -s "-screen 0 1600x1000x24" \
  "$build/app/workbench/photolot" sample-data/demo-lot.csv --spec sample-data/demo-spec.toml \
  --snapshot "$out"
ls -1 "$out"/workbench-*.png
