#!/usr/bin/env bash
# Installs every Debian 12 package trimwright needs to build, run and test, if any is missing.
# Run as root (or with sudo). Safe to run again: it installs only what is missing.
set -euo pipefail

packages=(
  # build
  build-essential cmake pkg-config ccache
  # libraries
  libcgal-dev libeigen3-dev libcli11-dev libtomlplusplus-dev nlohmann-json3-dev
  libcairo2-dev libfmt-dev libzip-dev zlib1g-dev fonts-dejavu-core
  # libzip-dev's CMake package names the zipcmp/zipmerge/ziptool programs; without them
  # find_package(libzip) fails (Debian 12 ships them as separate packages)
  zipcmp zipmerge ziptool
  # tests: an independent 3MF reader, an independent STL reader, PDF tools, NumPy reference
  catch2 lib3mf-dev admesh poppler-utils python3 python3-numpy
  # benchmarks, fuzzing and sanitizers
  libbenchmark-dev clang libclang-rt-14-dev
)

missing=()
for p in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$p")
  fi
done

if [ ${#missing[@]} -eq 0 ]; then
  echo "setup-deps: all ${#packages[@]} packages present"
  exit 0
fi

echo "setup-deps: installing ${missing[*]}"
if [ "$(id -u)" -ne 0 ]; then
  sudo=sudo
else
  sudo=
fi
export DEBIAN_FRONTEND=noninteractive
$sudo apt-get update -q
$sudo apt-get install -y -q --no-install-recommends "${missing[@]}"
