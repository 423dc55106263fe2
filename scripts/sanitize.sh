#!/usr/bin/env bash
# Builds the whole test suite with AddressSanitizer and UndefinedBehaviorSanitizer
# (-DTRIMWRIGHT_SANITIZE=ON, gcc) in build-asan and runs ctest there.
#
#   bash scripts/sanitize.sh              # every test, the [slow] sweeps with fewer requests
#   bash scripts/sanitize.sh -LE slow     # extra arguments go to ctest (here: skip the slow ones)
#
# Any sanitizer report fails the test that triggered it (halt_on_error; UBSan does not recover).
# Leaks inside system libraries we do not own (fontconfig, via Cairo) are suppressed in
# tests/lsan.supp, and UBSan's vptr check inside CGAL's arrangement iterators in
# tests/ubsan.supp; a report from trimwright's own code still fails.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${TRIMWRIGHT_ASAN_DIR:-build-asan}
jobs=${TRIMWRIGHT_JOBS:-2}
# Not -Werror: with the sanitizers' instrumentation gcc 12 reports -Wmaybe-uninitialized inside
# CGAL's headers (Epic_converter.h, a Circle_2 returned by value) that a plain build does not.
cmake -S . -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DTRIMWRIGHT_SANITIZE=ON -DTRIMWRIGHT_TESTS=ON \
  -DTRIMWRIGHT_WERROR=OFF >/dev/null
cmake --build "$build" -j"$jobs"
export ASAN_OPTIONS="detect_leaks=1:halt_on_error=1:abort_on_error=0:strict_string_checks=1:detect_stack_use_after_return=1:check_initialization_order=1"
export LSAN_OPTIONS="suppressions=$PWD/tests/lsan.supp:print_suppressions=0"
export UBSAN_OPTIONS="suppressions=$PWD/tests/ubsan.supp:print_stacktrace=1:halt_on_error=1"
# The property sweeps run about three times slower under the sanitizers: fewer requests.
export TRIMWRIGHT_SWEEP_COUNT=${TRIMWRIGHT_SWEEP_COUNT:-300}
cd "$build"
ctest --output-on-failure -j"$jobs" --timeout 3600 "$@"
