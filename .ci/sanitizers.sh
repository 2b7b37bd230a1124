#!/bin/sh
# The non-GUI suite (chem, core, cli, storage and print tests, the CLI's scripted checks) built with
# clang under ASan, UBSan with float-cast-overflow, and LeakSanitizer, then run. The same build
# dir holds the fuzz targets (.ci/fuzz.sh), so CI compiles the checked code once.
#   SAN_BUILD_DIR (default build-san), JOBS (default 2)
set -eu
cd "$(dirname "$0")/.."
B=${SAN_BUILD_DIR:-build-san}
start=$(date +%s)
if [ ! -f "$B/CMakeCache.txt" ]; then
  launcher=""
  command -v ccache >/dev/null 2>&1 && launcher="-DCMAKE_CXX_COMPILER_LAUNCHER=ccache"
  CC=clang CXX=clang++ cmake -S . -B "$B" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DPHASEPLAN_APP=OFF \
    -DPHASEPLAN_SANITIZE=ON -DPHASEPLAN_FUZZ=ON -DPHASEPLAN_WERROR=ON $launcher >/dev/null
fi
cmake --build "$B" -j"${JOBS:-2}"
# detect_leaks: LSan on; Qt's process-lifetime singletons are suppressed by name only.
export ASAN_OPTIONS="detect_leaks=1:abort_on_error=0:strict_string_checks=1:detect_stack_use_after_return=1"
export LSAN_OPTIONS="suppressions=$(pwd)/.ci/lsan.supp:print_suppressions=0"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1"
ctest --test-dir "$B" --output-on-failure -j"${JOBS:-2}" --timeout 1200
echo "sanitizers.sh: $(( $(date +%s) - start )) s"
