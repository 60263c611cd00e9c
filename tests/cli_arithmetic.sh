#!/usr/bin/env bash
# --arithmetic exact gives the published fractions exactly; an ill-conditioned
# beam is warned about with its cause in every report.
# Four equal spans under UDL: M_B = -3/28 wL^2 (T. G. Hicks, "Civil Engineering
# Formulas", 2nd ed., McGraw-Hill, 2010, Table 2.1, printed as 0.1071; from
# memory); with w = 0.1 and L = 0.3 exactly, -27/28000.
set -u
trivet="$1"; data="$2/precision"
out=$(mktemp -d); fail=0
"$trivet" check --arithmetic exact "$data/four-span-udl.json" --json "$out/r.json" >/dev/null 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: exact run exited $rc"; fail=1; }
for m in three-moment slope-deflection; do
  python3 - "$out/r.json" "$m" <<'PY' || fail=1
import json, sys
j = json.load(open(sys.argv[1]))
a = j["beams"][0]["results"]["loads"]["arithmetic"]["methods"][sys.argv[2]]
b = a["nodes"][1]["moment_left"]
assert a["arithmetic"] == "exact", a["arithmetic"]
assert b["fraction"] == "-27/28000", b
c = a["nodes"][2]["moment_left"]
assert c["fraction"] == "-9/14000", c   # -wL^2/14
print("ok:", sys.argv[2], b["fraction"], c["fraction"])
PY
done
"$trivet" check --reference exact "$data/four-span-udl.json" --json "$out/ref.json" >/dev/null 2>&1
python3 - "$out/ref.json" <<'PY' || fail=1
import json, sys
j = json.load(open(sys.argv[1]))
for name, m in j["beams"][0]["results"]["loads"]["arithmetic"]["methods"].items():
    d = m["double_rounding"]
    assert d["measured"], name
    assert min(d["correct_digits"].values()) > 12, (name, d)
print("ok: rounding measured for every method")
PY
"$trivet" check "$data/ill-conditioned.json" --json "$out/ill.json" --junit "$out/ill.xml" >"$out/ill.txt" 2>&1
grep -q "times stiffer" "$out/ill.txt" || { echo "FAIL: no warning on the console"; fail=1; }
grep -q "times stiffer" "$out/ill.json" || { echo "FAIL: no warning in the JSON"; fail=1; }
grep -q "times stiffer" "$out/ill.xml" || { echo "FAIL: no warning in the JUnit report"; fail=1; }
# The verification record in exact arithmetic still holds on every case.
"$trivet" selfcheck --arithmetic exact >"$out/self.txt" 2>&1 || { echo "FAIL: selfcheck --arithmetic exact exited $?"; tail -3 "$out/self.txt"; fail=1; }
grep -q "arithmetic: exact; correct digits" "$out/self.txt" || { echo "FAIL: selfcheck does not report the arithmetic"; fail=1; }
rm -rf "$out"
[ $fail = 0 ] && echo "arithmetic: all checks passed"
exit $fail
