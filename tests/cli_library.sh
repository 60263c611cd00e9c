#!/usr/bin/env bash
# A library of 1,000 files with --jobs 2: a summary, a valid JUnit file and a
# JSON report in a stable order (the same as --jobs 1), exit code 2 for the
# one invalid file among them.
set -u
trivet="$1"; examples="$2"; invalid="$3"
lib=$(mktemp -d); res=$(mktemp -d); fail=0
i=0
while [ $i -lt 100 ]; do
  mkdir -p "$lib/block$i"
  for f in "$examples"/*.json; do cp "$f" "$lib/block$i/"; done
  i=$((i + 1))
done
cp "$invalid/negative-span.json" "$lib/block7/"
n=$(find "$lib" -name '*.json' | wc -l)
"$trivet" check "$lib" --jobs 2 --json "$res/r2.json" --junit "$res/r2.xml" >"$res/out.txt" 2>&1
rc=$?
[ $rc = 2 ] || { echo "FAIL: exit $rc, expected 2 (one invalid file)"; fail=1; }
grep -q "^summary: $n beams:" "$res/out.txt" || { echo "FAIL: no summary for $n beams"; tail -3 "$res/out.txt"; fail=1; }
"$trivet" check "$lib" --jobs 1 --json "$res/r1.json" >/dev/null 2>&1
cmp -s "$res/r1.json" "$res/r2.json" || { echo "FAIL: --jobs 1 and --jobs 2 reports differ"; fail=1; }
python3 - "$res/r2.json" "$res/r2.xml" "$n" <<'PY' || fail=1
import json, sys, xml.etree.ElementTree as ET
j = json.load(open(sys.argv[1])); n = int(sys.argv[3])
files = [b["file"] for b in j["beams"]]
assert len(files) == n, (len(files), n)
assert files == sorted(files), "beams not in a stable (sorted) order"
assert j["summary"]["invalid"] == 1 and j["summary"]["beams"] == n, j["summary"]
root = ET.parse(sys.argv[2]).getroot()
assert root.tag == "testsuites"
suites = root.findall("testsuite")
assert len(suites) == n
cases = root.findall("testsuite/testcase")
assert int(root.get("tests")) == len(cases)
assert int(root.get("errors")) == len(root.findall("testsuite/testcase/error")) == 1
print("ok:", n, "beams,", len(cases), "test cases")
PY
# Checking records: one page per beam, named after its path, the invalid
# one included (its errors); a folder that cannot be made is a report that
# could not be written.
"$trivet" check "$lib/block7" "$lib/block8" --record "$res/records" >/dev/null 2>"$res/rec.err"
want=$(find "$lib/block7" "$lib/block8" -name '*.json' | wc -l)
got=$(find "$res/records" -name '*.html' | wc -l)
[ "$got" = "$want" ] || { echo "FAIL: $got checking records for $want beams"; fail=1; }
grep -q "checking records written to" "$res/rec.err" || { echo "FAIL: no note of the records written"; cat "$res/rec.err"; fail=1; }
rec=$(find "$res/records" -name '*block7-negative-span.html' | head -1)
[ -n "$rec" ] && grep -q "Checking record" "$rec" && grep -q "invalid" "$rec" || { echo "FAIL: no record of the invalid beam"; fail=1; }
ls "$res/records" | grep -q '\.part$' && { echo "FAIL: a partial record was left"; fail=1; }
touch "$res/afile"
"$trivet" check "$lib/block8" --record "$res/afile/sub" >/dev/null 2>"$res/rec2.err"
rc=$?
[ $rc = 3 ] || [ $rc = 2 ] || { echo "FAIL: exit $rc when the records' folder cannot be made"; fail=1; }
grep -q "^trivet: --record: cannot make the folder" "$res/rec2.err" || { echo "FAIL: no reason for the folder"; cat "$res/rec2.err"; fail=1; }
rm -rf "$lib" "$res"
exit $fail
