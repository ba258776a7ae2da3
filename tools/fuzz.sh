#!/usr/bin/env bash
# Builds the libFuzzer targets with clang (ASan + UBSan) and runs each for SECONDS seconds,
# seeded with every network and change set in networks/ and tests/.
#   tools/fuzz.sh [SECONDS]        default 60; corpora are kept in build-fuzz/corpus-*
# Crashes are written to build-fuzz/crashes/; minimise one with
#   build-fuzz/fuzz_network -minimize_crash=1 -runs=10000 CRASHFILE
set -euo pipefail
cd "$(dirname "$0")/.."
seconds=${1:-60}
CXX=clang++ cmake -S . -B build-fuzz -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DGRADELINE_TESTS=OFF -DGRADELINE_FUZZ=ON >/dev/null
cmake --build build-fuzz --target fuzz_network fuzz_changes
mkdir -p build-fuzz/corpus-network build-fuzz/corpus-changes build-fuzz/crashes
find networks tests -name '*.gln' -exec cp {} build-fuzz/corpus-network/ \;
find networks tests -name '*.chg' -exec cp {} build-fuzz/corpus-changes/ \;
cp tests/fuzz_regressions/network/* build-fuzz/corpus-network/ 2>/dev/null || true
cp tests/fuzz_regressions/changes/* build-fuzz/corpus-changes/ 2>/dev/null || true
status=0
for target in network changes; do
  echo "== fuzz_$target for $seconds s"
  set +e
  build-fuzz/fuzz_$target build-fuzz/corpus-$target -max_total_time="$seconds" -max_len=4096 \
    -timeout=10 -rss_limit_mb=2048 -artifact_prefix=build-fuzz/crashes/ -print_final_stats=1 \
    > build-fuzz/fuzz_$target.log 2>&1
  rc=$?
  set -e
  grep -E '^#[0-9]+ +DONE|stat::number_of_executed_units|stat::peak_rss|SUMMARY' \
    build-fuzz/fuzz_$target.log | tail -4
  if [ $rc -ne 0 ]; then
    echo "fuzz_$target FAILED (exit $rc); see build-fuzz/fuzz_$target.log and build-fuzz/crashes/"
    tail -40 build-fuzz/fuzz_$target.log
    status=1
  fi
done
exit $status
