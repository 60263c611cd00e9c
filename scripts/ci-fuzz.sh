#!/usr/bin/env bash
# Builds the libFuzzer target (clang-14, -fsanitize=fuzzer,address,undefined)
# in build-fuzz and runs it for a bounded time over the reader and the whole
# check, seeded with examples/, the reference cases' beams and the corpus.
# Fails on any crash, hang (-timeout), out-of-memory, sanitizer report or leak.
# FUZZ_SECONDS (default 75) bounds the run.
set -euo pipefail
cd "$(dirname "$0")/.."
seconds="${FUZZ_SECONDS:-75}"
CXX_FUZZ="${CXX_FUZZ:-clang++-14}"
command -v "$CXX_FUZZ" >/dev/null || { echo "ci-fuzz: $CXX_FUZZ is missing (apt-get install clang-14 libclang-rt-14-dev)"; exit 1; }

flags="-fsanitize=fuzzer-no-link,address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer"
cmake -S . -B build-fuzz -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g1" -DCMAKE_CXX_COMPILER="$CXX_FUZZ" \
  -DCMAKE_CXX_FLAGS="$flags" -DCMAKE_EXE_LINKER_FLAGS="-fsanitize=address,undefined" \
  -DTRIVET_FUZZ=ON -DTRIVET_BUILD_TESTS=OFF >/dev/null
cmake --build build-fuzz -j2 --target trivet_fuzz

# Seeds: examples, the reference cases' "beam" members, the corpus.
seeds=build-fuzz/seeds
rm -rf "$seeds" build-fuzz/artifacts build-fuzz/work
mkdir -p "$seeds" build-fuzz/artifacts build-fuzz/work
cp examples/*.json tests/corpus/bad/*.json tests/corpus/good/*.json "$seeds"/
cp tests/corpus/fuzz-found/*.json "$seeds"/ 2>/dev/null || true
# Other programs' exports (--against), in every separator and decimal habit.
cp tests/data/against/*.csv "$seeds"/
# Spreadsheets and tables of claims (--against, --claims).
cp tests/data/sheets/*.xlsx tests/data/sheets/*.ods tests/data/sheets/*.csv "$seeds"/
for f in tests/data/against/*.csv; do tr ",." ";," < "$f" > "$seeds/semicolon-$(basename "$f")"; tr "," "\t" < "$f" > "$seeds/tab-$(basename "$f")"; done
python3 - "$seeds" references/cases/*.json <<'PY'
import json, os, sys
out = sys.argv[1]
for p in sys.argv[2:]:
    with open(p) as f:
        beam = json.load(f)["beam"]
    with open(os.path.join(out, "ref-" + os.path.basename(p)), "w") as f:
        json.dump(beam, f)
PY
echo "ci-fuzz: $(ls "$seeds" | wc -l) seeds, ${seconds} s"

export ASAN_OPTIONS="detect_leaks=1:abort_on_error=1:symbolize=1"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1"
set +e
build-fuzz/trivet_fuzz build-fuzz/work "$seeds" -dict=tests/fuzz/beam.dict \
  -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 -max_len=65536 \
  -artifact_prefix=build-fuzz/artifacts/ -print_final_stats=1 2>build-fuzz/fuzz.log
rc=$?
set -e
grep -E "^(stat::number_of_executed_units|stat::peak_rss_mb|#[0-9]+ +DONE)" build-fuzz/fuzz.log || true
found=$(ls build-fuzz/artifacts | wc -l)
if [ "$rc" -ne 0 ] || [ "$found" -ne 0 ]; then
  tail -60 build-fuzz/fuzz.log
  echo "ci-fuzz: FAILED (exit $rc; findings in build-fuzz/artifacts: $(ls build-fuzz/artifacts | tr '\n' ' '))"
  exit 1
fi
echo "ci-fuzz: no crash, hang, leak or sanitizer report in ${seconds} s"
