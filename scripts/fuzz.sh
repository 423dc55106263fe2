#!/usr/bin/env bash
# Builds the libFuzzer targets (tests/fuzz/) with clang, AddressSanitizer and
# UndefinedBehaviorSanitizer in build-fuzz, then gives each target a short smoke run.
#
#   bash scripts/fuzz.sh            # 30 s per target
#   bash scripts/fuzz.sh 600        # ten minutes per target
#   bash scripts/fuzz.sh 60 stl     # one target: job | stl
#
# Seeds: the sample jobs and the bad-input battery (job loader), tests/fuzz/seeds/stl (STL
# reader); the growing corpora stay in build-fuzz/corpus/. A crash, leak or timeout leaves its
# input in build-fuzz/artifacts/ and makes this script exit 1; keep it as a regression input in
# tests/data/fuzz-regressions/ (docs/testing.md).
set -euo pipefail
cd "$(dirname "$0")/.."
seconds=${1:-30}
shift || true
targets=("$@")
[ ${#targets[@]} -eq 0 ] && targets=(job stl)
build=${TRIMWRIGHT_FUZZ_DIR:-build-fuzz}
jobs=${TRIMWRIGHT_JOBS:-2}

cmake -S . -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DTRIMWRIGHT_FUZZ=ON -DTRIMWRIGHT_TESTS=OFF \
  -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ >/dev/null
cmake --build "$build" --target $(printf 'tw_fuzz_%s ' "${targets[@]}") -j"$jobs"

mkdir -p "$build/artifacts"
failed=()
for t in "${targets[@]}"; do
  corpus="$build/corpus/$t"
  mkdir -p "$corpus"
  seeds=()
  extra=()
  case "$t" in
    job)
      seeds=(samples samples/machines tests/bad tests/bad/include tests/bad/readings tests/data/fuzz-regressions)
      extra=(-dict=tests/fuzz/toml.dict -max_len=16384)
      ;;
    stl)
      seeds=(tests/fuzz/seeds/stl tests/data/fuzz-regressions)
      extra=(-max_len=65536)
      ;;
  esac
  echo "fuzz: tw_fuzz_$t for ${seconds} s"
  # -timeout: one input taking over 10 s is a finding; -rss_limit_mb: so is over 2 GB.
  if ! ASAN_OPTIONS=detect_leaks=1 UBSAN_OPTIONS=print_stacktrace=1 \
      "$build/tests/fuzz/tw_fuzz_$t" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
      -print_final_stats=1 -artifact_prefix="$build/artifacts/$t-" "${extra[@]}" "$corpus" "${seeds[@]}" \
      2>"$build/fuzz-$t.log"; then
    failed+=("$t")
  fi
  grep -E '^(stat::number_of_executed_units|stat::peak_rss_mb)|^#[0-9]+ +DONE' "$build/fuzz-$t.log" || true
done

if [ ${#failed[@]} -gt 0 ]; then
  echo "fuzz: findings in ${failed[*]}: see $build/fuzz-*.log and $build/artifacts/" >&2
  ls -l "$build/artifacts" >&2
  exit 1
fi
echo "fuzz: no findings (${targets[*]}, ${seconds} s each)"
