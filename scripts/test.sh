#!/usr/bin/env bash
# The README's test command: installs missing Debian packages, builds, runs every test via ctest.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup-deps.sh
werror=OFF
[ "${CI:-}" = "true" ] && werror=ON
bash scripts/build.sh -DTRIMWRIGHT_TESTS=ON -DTRIMWRIGHT_WERROR=$werror
cd "${TRIMWRIGHT_BUILD_DIR:-build}"
ctest --output-on-failure -j"$(nproc)"
