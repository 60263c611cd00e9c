#!/usr/bin/env bash
# Builds the benchmarks, runs them, and writes the table into README.md
# between the "benchmarks:start" and "benchmarks:end" markers. Measures on
# this machine; speed targets are checked here, never in unit tests.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
dpkg-query -W -f='${Status}' libbenchmark-dev 2>/dev/null | grep -q "install ok installed" || \
  { export DEBIAN_FRONTEND=noninteractive; apt-get update -qq; apt-get install -y -qq libbenchmark-dev; }
cmake -S . -B build-bench -DCMAKE_BUILD_TYPE=Release -DTRIVET_BUILD_BENCHMARKS=ON -DTRIVET_BUILD_TESTS=OFF >/dev/null
cmake --build build-bench -j"$(nproc)" >/dev/null
bench=build-bench/tests/benchmarks/trivet_bench
gen=build-bench/tests/benchmarks/generate_library
trivet=build-bench/trivet
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT

# At least half a second per benchmark, so that the figures are those of
# warm memory (the first call at a million spans also pays the first touch
# of its pages; the whole-run rows below include it).
"$bench" --benchmark_filter='^(three_moment|slope_deflection|stiffness|thomas|typical)/' --benchmark_min_time=0.5 \
  --benchmark_format=console 2>/dev/null | sed 's/\x1b\[[0-9;]*m//g' > "$work/bench.txt"
# The three solvers together at a million spans take longer per call: five
# seconds of repeats, so the first (cold) call does not stand for them.
"$bench" --benchmark_filter='^all_three/' --benchmark_min_time=5 \
  --benchmark_format=console 2>/dev/null | sed 's/\x1b\[[0-9;]*m//g' >> "$work/bench.txt"
# And one call in a fresh process: it also pays the first touch of its memory.
"$bench" --benchmark_filter='^all_three/spans/1000000$' --benchmark_min_time=0.01 \
  --benchmark_format=console 2>/dev/null | sed 's/\x1b\[[0-9;]*m//g' |
  sed 's#^all_three/spans/1000000 #all_three/first_call/1000000 #' >> "$work/bench.txt"

# Whole runs: a library of 10,000 typical beams, and a 100,000-span beam.
"$gen" "$work/lib" 10000 1
"$gen" --long "$work/long.json" 100000 1
run() {  # run LABEL CMD... -> "| LABEL | seconds | MiB |", the median of three runs
  local label="$1"; shift
  local times=() kb=0 secs mem k
  for k in 1 2 3; do
    /usr/bin/time -f "%e %M" -o "$work/t" "$@" >/dev/null 2>&1 || true
    read -r secs mem < "$work/t"
    times+=("$secs")
    if [ "$mem" -gt "$kb" ]; then kb=$mem; fi
  done
  secs=$(printf '%s\n' "${times[@]}" | sort -n | sed -n 2p)
  echo "$secs" > "$work/last"
  printf '| %s | %s s (runs: %s) | %d MiB |\n' "$label" "$secs" "${times[*]}" $((kb / 1024))
}
{
  echo "Measured on $(nproc) cores ($(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ *//')), $(date -u +%Y-%m-%d), by \`scripts/benchmark.sh\`."
  echo
  echo "| whole run | wall time | peak memory |"
  echo "| --- | --- | --- |"
  run "10,000 typical beams, all methods, JSON + JUnit, --jobs 2" "$trivet" check "$work/lib" --jobs 2 --json "$work/a.json" --junit "$work/a.xml"
  two=$(cat "$work/last")
  run "10,000 typical beams, all methods, JSON + JUnit, --jobs 1" "$trivet" check "$work/lib" --jobs 1 --json "$work/b.json" --junit "$work/b.xml"
  one=$(cat "$work/last")
  echo "| speed-up of --jobs 2 over --jobs 1 (medians) | $(awk -v a="$one" -v b="$two" 'BEGIN { printf "%.2fx", a / b }') | |"
  run "100,000-span beam, all methods, --stations-per-span 1, JSON" "$trivet" check "$work/long.json" --stations-per-span 1 --json "$work/c.json"
  echo
  echo "| benchmark | time per iteration | per span (or unknown) | against Thomas |"
  echo "| --- | --- | --- | --- |"
  # "against Thomas": the method's time over a bare Thomas solve of the
  # same number of unknowns in the same run (unknowns per span: one support
  # moment or node rotation for three-moment and slope-deflection, a
  # deflection and a rotation per node for stiffness).
  awk '
    function ns(t) { if (t ~ /us$/) return t * 1000; if (t ~ /ms$/) return t * 1e6; if (t ~ /ns$/) return t + 0; return t + 0 }
    /^(three_moment|slope_deflection|stiffness|all_three|thomas|typical)\// {
      per = ""; for (i = 1; i <= NF; i++) if ($i ~ /^ns_per_span=/) { per = substr($i, 13) }
      name[++rows] = $1; time[rows] = $2 " " $3; perspan[rows] = per
      split($1, p, "/"); if (p[1] == "thomas") thomas[p[3]] = ns(per)
    }
    END {
      for (r = 1; r <= rows; r++) {
        split(name[r], p, "/"); k = p[1] == "stiffness" ? 2 : 1; ratio = ""
        if ((p[1] == "three_moment" || p[1] == "slope_deflection" || p[1] == "stiffness") && thomas[p[3]] > 0)
          ratio = sprintf("%.1fx", ns(perspan[r]) / (k * thomas[p[3]]))
        printf "| %s | %s | %s | %s |\n", name[r], time[r], perspan[r], ratio
      }
    }' "$work/bench.txt"
} > "$work/table.md"
cat "$work/table.md"
awk -v table="$work/table.md" '
  /<!-- benchmarks:start -->/ { print; while ((getline line < table) > 0) print line; skip = 1; next }
  /<!-- benchmarks:end -->/ { skip = 0 }
  !skip { print }' README.md > "$work/README.md"
cp "$work/README.md" README.md
