#!/usr/bin/env bash
# Sets up (Debian packages), builds and opens the photolot workbench with the invented demo lot
# and its spec loaded. Extra arguments go to photolot (e.g. other logs or a workspace).
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
./scripts/build.sh
build=${PHOTOLOT_BUILD_DIR:-build}
if [ $# -eq 0 ]; then
  set -- sample-data/demo-lot.csv --spec sample-data/demo-spec.toml
fi
exec "$build/app/workbench/photolot" "$@"
