#!/usr/bin/env bash
# `trivet selfcheck` end to end: the bundled cases hold (exit 0) with a JSON,
# JUnit and HTML record; one published value moved by one unit in its last
# printed digit beyond the tolerance makes it exit 1 and name that case.
# The case moved is Hicks, "Civil Engineering Formulas", Table 2.1, four
# equal spans: M_B printed -0.1071 wL^2 (its reference file gives the
# citation); -0.1073 lies beyond half a unit of the last digit.
set -u
trivet="$1"; cases="$2"
out=$(mktemp -d); fail=0
trap 'rm -rf "$out"' EXIT
cp -r "$cases" "$out/cases"

"$trivet" selfcheck --cases "$out/cases" --json "$out/r.json" --junit "$out/r.xml" --html "$out/r.html" >"$out/ok.txt" 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: selfcheck on the bundled cases exited $rc"; tail -5 "$out/ok.txt"; fail=1; }
n=$(ls "$out/cases"/*.json | wc -l)
[ "$n" -ge 30 ] || { echo "FAIL: only $n cases"; fail=1; }
grep -q "selfcheck: $n cited cases" "$out/ok.txt" || { echo "FAIL: the summary does not count $n cases"; fail=1; }
python3 - "$out/r.json" "$n" <<'PY' || fail=1
import json, sys
j = json.load(open(sys.argv[1]))
assert j["summary"]["cases"] == int(sys.argv[2]) and j["summary"]["cases_failed"] == 0, j["summary"]
for c in j["cases"]:
    assert c["source"], c["id"]           # every case says where its numbers come from
    assert c["holds"], c["id"]
PY
grep -q "hicks-continuous-4-spans-udl" "$out/r.html" || { echo "FAIL: the HTML record does not list the cases"; fail=1; }
grep -qi "caution" "$out/r.html" || { echo "FAIL: the HTML record has no caution"; fail=1; }
grep -q 'failures="0"' "$out/r.xml" || { echo "FAIL: the JUnit record has failures"; fail=1; }

f="$out/cases/hicks-continuous-4-spans-udl.json"
grep -q '"published": "-0.1071"' "$f" || { echo "FAIL: the four-span case no longer prints -0.1071"; exit 1; }
sed -i '0,/"published": "-0.1071"/s//"published": "-0.1073"/' "$f"  # the first of them only
"$trivet" selfcheck --cases "$out/cases" >"$out/bad.txt" 2>&1
rc=$?; [ $rc = 1 ] || { echo "FAIL: a moved value gave exit $rc, not 1"; fail=1; }
grep -q "hicks-continuous-4-spans-udl  \[FAILS\]" "$out/bad.txt" || { echo "FAIL: the failing case is not named"; grep -n FAIL "$out/bad.txt" | head; fail=1; }
[ "$(grep -c '\[FAILS\]' "$out/bad.txt")" = 1 ] || { echo "FAIL: other cases fail too"; fail=1; }
grep -q "(1 values out of tolerance)" "$out/bad.txt" || { echo "FAIL: not exactly one value out of tolerance"; tail -3 "$out/bad.txt"; fail=1; }
exit $fail
