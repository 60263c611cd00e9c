#!/usr/bin/env bash
# --against: a correct export passes; one printed with hogging-positive
# moments fails (exit 1) and the finding says so; declaring the convention
# makes it pass.
set -u
trivet="$1"; data="$2/against"
fail=0
"$trivet" check "$data/simple-udl.json" --against "$data/simple-udl-moments-ok.csv" >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: correct export exited $rc"; cat /tmp/trivet-against.out; fail=1; }
"$trivet" check "$data/simple-udl.json" --against "$data/simple-udl-moments-hogging.csv" --column x=Dist --column moment=Mz >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 1 ] || { echo "FAIL: sign-flipped export exited $rc, expected 1"; cat /tmp/trivet-against.out; fail=1; }
grep -q "hogging-positive" /tmp/trivet-against.out || { echo "FAIL: no finding about the sign convention"; cat /tmp/trivet-against.out; fail=1; }
# The table and the failing lines carry units and the table's digits (the
# closed form M = wL^2/8 = 45 kN*m at midspan: the file's own title).
grep -q "moment \[kN\*m\] *13 *11 *-90.000" /tmp/trivet-against.out ||
  { echo "FAIL: the against table has no unit or runaway digits"; cat /tmp/trivet-against.out; fail=1; }
grep -q "line 9, x = 3 m: moment theirs -45.000 kN\*m, ours 45.000 kN\*m" /tmp/trivet-against.out ||
  { echo "FAIL: a failing line has no unit"; cat /tmp/trivet-against.out; fail=1; }
# In other display units the numbers follow (1 kN*m = 1000 N*m); the JUnit
# message stays in the file's units, with them.
"$trivet" check "$data/simple-udl.json" --against "$data/simple-udl-moments-hogging.csv" --column x=Dist --column moment=Mz \
  --show-units moment=N*m --junit /tmp/trivet-against.xml >/tmp/trivet-against.out 2>&1
grep -q "moment \[N\*m\] *13 *11 *-90000" /tmp/trivet-against.out ||
  { echo "FAIL: --show-units does not reach the against table"; cat /tmp/trivet-against.out; fail=1; }
grep -q 'worst difference -90 kN\*m at x = 3 m (tolerance 0.45 kN\*m)' /tmp/trivet-against.xml ||
  { echo "FAIL: the JUnit message has no unit"; cat /tmp/trivet-against.xml; fail=1; }
"$trivet" check "$data/simple-udl.json" --against "$data/simple-udl-moments-hogging.csv" --column x=Dist --column moment=Mz --their-moment hogging-positive >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: declared hogging-positive export exited $rc"; cat /tmp/trivet-against.out; fail=1; }
"$trivet" check "$data/simple-udl.json" --against "$data/no-such.csv" >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 2 ] || { echo "FAIL: a missing CSV exited $rc, expected 2"; fail=1; }
# The exit code, the beam's status and the summary say the same thing.
"$trivet" check "$data/simple-udl.json" --against "$data/no-such.csv" --json /tmp/trivet-against.json >/dev/null 2>&1
grep -q '"status": "invalid"' /tmp/trivet-against.json && grep -q '"invalid": *1' /tmp/trivet-against.json \
  || { echo "FAIL: an unreadable CSV left the beam's status or the summary at agree"; fail=1; }
# Each --their-* option is checked by its own name, and refused without --against.
"$trivet" check "$data/simple-udl.json" --their-moment hogging-positive >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 2 ] || { echo "FAIL: --their-moment without --against exited $rc, expected 2"; fail=1; }
grep -q -- "--their-moment: applies to the file given with --against" /tmp/trivet-against.out ||
  { echo "FAIL: --their-moment without --against: no reason"; cat /tmp/trivet-against.out; fail=1; }
"$trivet" check "$data/simple-udl.json" --against "$data/simple-udl-moments-ok.csv" --their-moment hogging >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 2 ] || { echo "FAIL: --their-moment hogging exited $rc, expected 2"; fail=1; }
grep -q -- "trivet: --their-moment: " /tmp/trivet-against.out ||
  { echo "FAIL: a bad --their-moment is not named by its own option"; cat /tmp/trivet-against.out; fail=1; }
# A semicolon-separated export with decimal commas reads as the comma one does.
tr ',.' ';,' < "$data/simple-udl-moments-ok.csv" > /tmp/trivet-against-local.csv
"$trivet" check "$data/simple-udl.json" --against /tmp/trivet-against-local.csv >/tmp/trivet-against.out 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: a ';' and decimal-comma export exited $rc"; cat /tmp/trivet-against.out; fail=1; }
[ $fail = 0 ] && echo "against: all checks passed"
exit $fail
