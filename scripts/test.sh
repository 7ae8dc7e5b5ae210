#!/usr/bin/env bash
# Sets up (Debian packages), builds and runs every test. This is the README's test command and
# what CI runs.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
./scripts/build.sh
export QT_QPA_PLATFORM=offscreen
ctest --test-dir "${PHOTOLOT_BUILD_DIR:-build}" --output-on-failure -j "$(nproc)"
