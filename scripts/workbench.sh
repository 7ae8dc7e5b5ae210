#!/usr/bin/env bash
# Sets up (Debian packages), builds the workbench and opens it with the invented demo lot and
# its spec loaded. Works from a fresh clone. Extra arguments go to photolot instead (other
# logs, a workspace, --spec FILE). PHOTOLOT_BUILD_DIR and PHOTOLOT_JOBS as for build.sh.
set -euo pipefail
cd "$(dirname "$0")/.."
./scripts/setup-debian.sh
# Only the program and what it links: the tests and benchmarks are for ./scripts/test.sh.
PHOTOLOT_TARGETS=photolot ./scripts/build.sh
build=${PHOTOLOT_BUILD_DIR:-build}
if [ $# -eq 0 ]; then
  set -- sample-data/demo-lot.csv --spec sample-data/demo-spec.toml
fi
if [ -z "${DISPLAY:-}" ] && [ -z "${WAYLAND_DISPLAY:-}" ] && [ -z "${QT_QPA_PLATFORM:-}" ]; then
  echo "workbench: no display (DISPLAY and WAYLAND_DISPLAY are unset). Run it in a desktop" \
       "session, or under a virtual one: xvfb-run -a ./scripts/workbench.sh" >&2
  exit 1
fi
exec "$build/app/workbench/photolot" "$@"
