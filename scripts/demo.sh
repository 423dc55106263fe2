#!/usr/bin/env bash
# The README's demo command: installs missing Debian packages, builds, runs the built-in demo job.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh
bash scripts/build.sh -DTRIMWRIGHT_TESTS=OFF
./"${TRIMWRIGHT_BUILD_DIR:-build}"/trimwright demo --out "${1:-demo-out}"
