#!/usr/bin/env bash
# Installs the Debian 12 packages upright needs to build, test and run its reference checks.
# Idempotent: installs only what is missing and says what it does. Needs root or sudo.
set -euo pipefail

packages=(
  build-essential cmake pkgconf git
  libbullet-dev          # Bullet 3.24, double-precision build via pkg-config bullet-float64
  libeigen3-dev          # Eigen 3.4
  libtinyxml2-dev        # model and scenario files
  libcli11-dev           # command line
  libexpected-dev        # Result/Status of fallible functions (tl::expected)
  nlohmann-json3-dev     # reading JSON (the manifests the report reads back)
  libnlopt-cxx-dev       # NLopt: the derivative-free search of `upright tune`
  libgtest-dev           # tests
  libslicot-dev liblapack-dev libblas-dev gfortran   # reference checks of the control solvers
  python3 python3-numpy python3-scipy                # reference checks of the control solvers
  chromium               # the report test renders the HTML report headless
  clang libclang-rt-14-dev   # fuzzing the file readers (libFuzzer with sanitizers, fuzz/)
)

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "setup: all ${#packages[@]} required packages are already installed"
  exit 0
fi

sudo=""
if [ "$(id -u)" -ne 0 ]; then
  command -v sudo >/dev/null || { echo "setup: need root or sudo to install: ${missing[*]}" >&2; exit 1; }
  sudo="sudo"
fi
echo "setup: installing ${#missing[@]} missing package(s): ${missing[*]}"
$sudo apt-get update -qq
DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}"
echo "setup: done"
