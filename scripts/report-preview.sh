#!/usr/bin/env bash
# Renders page 1 (and the plot page) of the summary of the invented test lot to PNG, to look at
# the layout: docs/images/summary-page1.png and summary-page2.png. Needs poppler-utils.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${PHOTOLOT_BUILD_DIR:-build}
"$(dirname "$0")/build.sh" >/dev/null
cmake --build "$build" --target report_preview -j "${PHOTOLOT_JOBS:-2}" >/dev/null
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
QT_QPA_PLATFORM=offscreen "$build/tests/report/report_preview" "$out/summary.pdf" "$@"
mkdir -p docs/images
for page in 1 2; do
  pdftoppm -r 60 -png -f "$page" -l "$page" -singlefile "$out/summary.pdf" "$out/page"
  mv "$out/page.png" "docs/images/summary-page$page.png.tmp"
  mv "docs/images/summary-page$page.png.tmp" "docs/images/summary-page$page.png"
done
echo "wrote docs/images/summary-page1.png and summary-page2.png"
