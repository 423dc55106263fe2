#!/usr/bin/env bash
# Builds the benchmarks (tests/bench/, Google Benchmark) in build-bench (RelWithDebInfo, -O2 as
# shipped) and runs them: each stage on the demo job and the samples, writers, chord tolerance.
#
#   bash scripts/bench.sh                       # every benchmark, 5 repetitions, medians
#   bash scripts/bench.sh --benchmark_filter=Demo   # extra arguments go to the benchmark binary
#
# The JSON results go to build-bench/bench.json; docs/performance.md records a run.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${TRIMWRIGHT_BENCH_DIR:-build-bench}
cmake -S . -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DTRIMWRIGHT_BENCH=ON -DTRIMWRIGHT_TESTS=OFF >/dev/null
cmake --build "$build" --target tw_bench -j"${TRIMWRIGHT_JOBS:-2}"
echo "machine: $(nproc) cores, $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ //'), $(date -u +%F)"
"$build/tests/bench/tw_bench" --benchmark_repetitions=5 --benchmark_report_aggregates_only=true \
  --benchmark_out="$build/bench.json" --benchmark_out_format=json "$@"
