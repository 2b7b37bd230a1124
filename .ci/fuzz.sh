#!/bin/sh
# Each libFuzzer target (tests/fuzz) for FUZZ_RUNS executions (default 20,000) under ASan, UBSan
# and float-cast-overflow, its corpus seeded from data/demo and tests/data. A finding stops the
# script with the reproducer in $B/fuzz-findings/.
#   SAN_BUILD_DIR (default build-san, shared with .ci/sanitizers.sh), FUZZ_RUNS, JOBS,
#   FUZZ_TARGETS (default: all seven, space-separated)
set -eu
cd "$(dirname "$0")/.."
B=${SAN_BUILD_DIR:-build-san}
RUNS=${FUZZ_RUNS:-20000}
start=$(date +%s)
if [ ! -f "$B/CMakeCache.txt" ]; then
  launcher=""
  command -v ccache >/dev/null 2>&1 && launcher="-DCMAKE_CXX_COMPILER_LAUNCHER=ccache"
  CC=clang CXX=clang++ cmake -S . -B "$B" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DPHASEPLAN_APP=OFF \
    -DPHASEPLAN_SANITIZE=ON -DPHASEPLAN_FUZZ=ON -DPHASEPLAN_WERROR=ON $launcher >/dev/null
fi
targets=${FUZZ_TARGETS:-"fuzz_solve fuzz_recipe fuzz_line fuzz_sequence fuzz_print_job fuzz_batch fuzz_database"}
cmake --build "$B" -j"${JOBS:-2}" --target $targets
seeds="$B/fuzz-seeds"
rm -rf "$seeds" && mkdir -p "$seeds/json" "$seeds/db" "$B/fuzz-findings"
# Seeds: every demo document, and each document inside the test tables (cases' "input"/"document").
python3 - "$seeds/json" data/demo tests/data <<'PY'
import json, os, sys
out, dirs = sys.argv[1], sys.argv[2:]
n = 0
def emit(doc):
    global n
    if isinstance(doc, dict) and doc:
        n += 1
        with open(os.path.join(out, "seed-%04d.json" % n), "w") as f:
            json.dump(doc, f)
def walk(x, depth=0):
    if depth > 4: return
    if isinstance(x, dict):
        for k in ("input", "document", "doc"):
            if isinstance(x.get(k), dict): emit(x[k])
        for v in x.values(): walk(v, depth + 1)
    elif isinstance(x, list):
        for v in x: walk(v, depth + 1)
for d in dirs:
    for name in sorted(os.listdir(d)):
        if name.endswith(".json"):
            with open(os.path.join(d, name)) as f:
                doc = json.load(f)
            emit(doc); walk(doc)
print("fuzz.sh: %d JSON seeds" % n)
PY
PHASEPLAN_FUZZ_WRITE_SEED="$seeds/db" "$B/fuzz_database" >/dev/null
export ASAN_OPTIONS="detect_leaks=1:abort_on_error=0"
export LSAN_OPTIONS="suppressions=$(pwd)/.ci/lsan.supp:print_suppressions=0"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1"
export QT_QPA_PLATFORM=offscreen
for t in $targets; do
  corpus="$B/fuzz-corpus/$t"
  mkdir -p "$corpus"
  seed="$seeds/json"
  max_len=65536
  # A database file is a few pages of 4 KiB: the seed (about 120 KB) must fit whole.
  [ "$t" = fuzz_database ] && { seed="$seeds/db"; max_len=262144; }
  t0=$(date +%s)
  "$B/$t" -runs="$RUNS" -max_len=$max_len -timeout=20 -rss_limit_mb=3072 -print_final_stats=1 \
    -artifact_prefix="$B/fuzz-findings/$t-" "$corpus" "$seed" >"$B/fuzz-$t.log" 2>&1 || {
      tail -40 "$B/fuzz-$t.log"; echo "fuzz.sh: $t found a problem (see $B/fuzz-findings/)"; exit 1; }
  echo "fuzz.sh: $t $(grep -o 'stat::number_of_executed_units: *[0-9]*' "$B/fuzz-$t.log" | grep -o '[0-9]*$') executions, $(( $(date +%s) - t0 )) s"
done
echo "fuzz.sh: $(( $(date +%s) - start )) s"
