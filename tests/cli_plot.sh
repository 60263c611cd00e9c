#!/usr/bin/env bash
# trivet plot writes valid SVG and PNG files; a bad output name exits 2.
set -u
trivet="$1"; examples="$2"
out=$(mktemp -d); fail=0
if ! command -v gnuplot >/dev/null; then echo "SKIPPED: gnuplot is not installed"; exit 77; fi
"$trivet" plot "$examples/core-wall-beam.json" -o "$out/p.svg" || { echo "FAIL: svg exit $?"; fail=1; }
grep -q "</svg>" "$out/p.svg" || { echo "FAIL: not an SVG"; fail=1; }
"$trivet" plot "$examples/core-wall-beam.json" -o "$out/p.png" || { echo "FAIL: png exit $?"; fail=1; }
[ "$(head -c 8 "$out/p.png" | od -An -tx1 | tr -d ' \n')" = "89504e470d0a1a0a" ] || { echo "FAIL: not a PNG"; fail=1; }
"$trivet" plot "$examples/core-wall-beam.json" -o "$out/p.gif" 2>/dev/null; [ $? = 2 ] || { echo "FAIL: .gif accepted"; fail=1; }
"$trivet" plot "$examples/office-floor-dead-live.json" --case live -o "$out/live.svg" || { echo "FAIL: --case"; fail=1; }
# Influence lines: one file for one --influence, OUT-<quantity>-<where> for several; bad text exits 2.
"$trivet" plot "$examples/core-wall-beam.json" --influence moment@B -o "$out/i.svg" || { echo "FAIL: --influence exit $?"; fail=1; }
grep -q "Influence line: moment at B" "$out/i.svg" || { echo "FAIL: no influence title"; fail=1; }
"$trivet" plot "$examples/core-wall-beam.json" --influence moment@B --influence reaction@A -o "$out/j.png" || { echo "FAIL: two --influence"; fail=1; }
[ -s "$out/j-moment-B.png" ] && [ -s "$out/j-reaction-A.png" ] || { echo "FAIL: names of several influence plots"; fail=1; }
msg=$("$trivet" plot "$examples/core-wall-beam.json" --influence torque@B -o "$out/k.svg" 2>&1); rc=$?
[ $rc = 2 ] && echo "$msg" | grep -q -- "--influence" || { echo "FAIL: bad --influence: exit $rc: $msg"; fail=1; }
rm -rf "$out"
[ $fail = 0 ] && echo "plot: all checks passed"
exit $fail
