#!/usr/bin/env bash
# Installs every package photolot needs to build, test and benchmark, from Debian's own
# archive, by name. Safe to run again: it installs only what is missing. Runs as root, or
# through sudo for another user.
set -euo pipefail

packages=(
  build-essential cmake ninja-build pkg-config git
  libceres-dev libeigen3-dev                       # the fits
  nlohmann-json3-dev libtomlplusplus-dev libcli11-dev libfmt-dev
  libboost-dev libboost-math-dev liblemon-dev      # statistics, matching
  qt6-base-dev qt6-svg-dev libqcustomplot-dev      # workbench, plots, PDF summary
  libgtest-dev libgmock-dev libbenchmark-dev       # tests and benchmarks
  libgsl-dev python3 python3-networkx              # outside references, tests only
  poppler-utils xvfb xauth                         # report text checks, screenshots
  clang libclang-rt-14-dev                         # fuzzing and sanitizers
)

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "setup: all ${#packages[@]} packages present"
  exit 0
fi

sudo=""
if [ "$(id -u)" -ne 0 ]; then
  command -v sudo >/dev/null || { echo "setup: run as root or install sudo" >&2; exit 1; }
  sudo="sudo"
fi
echo "setup: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
$sudo apt-get update -qq
$sudo apt-get install -y -qq --no-install-recommends "${missing[@]}"
